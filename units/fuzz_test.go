package units

import (
	"errors"
	"math"
	"testing"
)

// FuzzParse checks that Parse never panics, that errors lie inside the
// input, that conversions round-trip, and that the canonical text parses
// back to the same unit.
func FuzzParse(f *testing.F) {
	for _, s := range []string{"W/(m²·K)", "kg/s", "bar(g)", "degC", "s⁻¹", "Pa s", "kgs", "(m", "m^-2", "µm"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		u, err := Parse(s)
		if err != nil {
			var e *Error
			if !errors.As(err, &e) {
				t.Fatalf("Parse(%q) error %T, want *Error", s, err)
			}
			if e.Offset < 0 || e.End < e.Offset || e.End > len(s) {
				t.Fatalf("Parse(%q) span [%d,%d) outside input of %d bytes", s, e.Offset, e.End, len(s))
			}
			if e.Msg == "" {
				t.Fatalf("Parse(%q) empty message", s)
			}
			return
		}
		if !(u.Factor > 0) || math.IsInf(u.Factor, 0) || math.IsNaN(u.Offset) || math.IsInf(u.Offset, 0) {
			t.Fatalf("Parse(%q) = %+v: bad factor", s, u)
		}
		for _, x := range []float64{0, 1, -1, 273.15, 1e5, 1e-3} {
			got := u.FromSI(u.ToSI(x))
			if math.Abs(got-x) > 1e-9*math.Max(1, math.Abs(x))*math.Max(1, math.Abs(u.Offset/u.Factor)) {
				t.Fatalf("%q: FromSI(ToSI(%g)) = %g", s, x, got)
			}
		}
		v, err := Parse(u.Text)
		if err != nil {
			t.Fatalf("canonical text %q of %q does not parse: %v", u.Text, s, err)
		}
		if v.Dim != u.Dim || !near(v.Factor, u.Factor, 1e-12) || v.Offset != u.Offset || v.Affine != u.Affine || v.Gauge != u.Gauge {
			t.Fatalf("canonical text %q of %q parses to %+v, want %+v", u.Text, s, v, u)
		}
		_ = Format(1, u)
	})
}
