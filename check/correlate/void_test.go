package correlate

import (
	"math"
	"testing"
)

// TestVoidFractionAt: the by-reference form gives VoidFraction's value to
// the bit for every method, across qualities, flows, body forces and
// inclinations, and for unusable properties.
func TestVoidFractionAt(t *testing.T) {
	bad := r134a40
	bad.RhoV = 0
	for _, m := range allVoid {
		for _, p := range []Props{r134a40, bad} {
			for _, x := range []float64{-0.1, 0, 1e-9, 0.01, 0.3, 0.999, 1, 1.2} {
				for _, G := range []float64{0, 50, 400} {
					for _, a := range []float64{0, 9.80665, 30} {
						for _, c := range []float64{0, 0.05, 1} {
							want := VoidFraction(m, x, G, p, a, c)
							got := VoidFractionAt(m, x, G, &p, a, c)
							if math.Float64bits(got) != math.Float64bits(want) {
								t.Errorf("%s x=%g G=%g a=%g cos=%g: %v, VoidFraction %v", m, x, G, a, c, got, want)
							}
						}
					}
				}
			}
		}
	}
}
