package correlate_test

import (
	"fmt"

	"circa/check/correlate"
)

// A component's tube, mass flux and properties are bound once; each cell
// then evaluates the void fraction and friction gradient at its quality.
func ExampleFriction_Prepare() {
	p := correlate.Props{RhoL: 1147, RhoV: 50.1, MuL: 1.61e-4, MuV: 1.24e-5, Sigma: 6.1e-3}
	const G, D, g = 300.0, 0.01, 9.80665
	pf := correlate.Friction{}.Prepare(G, D, 0, p, g) // Müller-Steinhagen & Heck, Churchill
	for _, x := range []float64{0, 0.1, 0.3} {
		a := correlate.VoidFraction(correlate.RouhaniAxelsson, x, G, p, g, 1)
		fmt.Printf("x=%.1f  alpha=%.3f  dp/dz=%.0f Pa/m\n", x, a, pf.Gradient(x))
	}
	// Output:
	// x=0.0  alpha=0.000  dp/dz=103 Pa/m
	// x=0.1  alpha=0.558  dp/dz=341 Pa/m
	// x=0.3  alpha=0.772  dp/dz=790 Pa/m
}
