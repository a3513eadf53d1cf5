package check

import (
	"testing"

	"circa/lang"
)

// A charge range's ends keep the same decimals, three significant figures
// of the larger end, so a trailing zero is not dropped from one end only.
func TestSigAsRange(t *testing.T) {
	for _, c := range []struct {
		lo, hi   float64
		wlo, whi string
	}{
		{0.11, 0.15, "0.110 kg", "0.150 kg"},
		{0.348, 0.397, "0.348 kg", "0.397 kg"},
		{0.0415, 0.9996, "0.04 kg", "1.00 kg"},
		{12, 150, "12 kg", "150 kg"},
	} {
		lo, hi := sigAsRange(c.lo, c.hi, lang.Value{}, "kg")
		if lo != c.wlo || hi != c.whi {
			t.Errorf("sigAsRange(%g, %g) = %q, %q, want %q, %q", c.lo, c.hi, lo, hi, c.wlo, c.whi)
		}
	}
}
