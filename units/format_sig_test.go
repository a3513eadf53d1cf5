package units

import "testing"

// TestSigDecimals: the decimals that write a magnitude to n figures count
// from the value rounded to n figures (9.996 to three figures is 10.0).
func TestSigDecimals(t *testing.T) {
	for _, c := range []struct {
		a    float64
		n, d int
	}{{9.996, 3, 1}, {9.994, 3, 2}, {0.0425, 3, 4}, {4.25, 4, 3}, {1234.5, 3, 0}, {1e-3, 1, 3}} {
		if got := SigDecimals(c.a, c.n); got != c.d {
			t.Errorf("SigDecimals(%g, %d) = %d, want %d", c.a, c.n, got, c.d)
		}
	}
}
