package correlate

import (
	"math"
	"testing"
)

// TestFrictionFluidsGrid checks the two-phase gradients (Pa/m) over
// qualities from 0.01 to 0.95 and flows whose liquid-only Reynolds number
// runs from turbulent (84900) to laminar (707), against the open-source
// fluids library (C. Bell), Debian python3-fluids 1.0.22:
// fluids.two_phase.Friedel(m, x, rhol, rhog, mul, mug, sigma, D),
// Muller_Steinhagen_Heck(m, x, rhol, rhog, mul, mug, D) and
// Lockhart_Martinelli(m, x, rhol, rhog, mul, mug, D), smooth tube D = 0.05 m,
// ρl 915, ρv 2.67 kg/m³, μl 180e-6, μv 14e-6 Pa·s, σ 0.0487 N/m (the
// Ghiaasiaan (2007) Example 4 properties). fluids takes the Colebrook factor
// (Clamond's solution) for Friedel and Müller-Steinhagen–Heck, and
// 64/Re below Re = 2000 and 0.184 Re^−0.2 above for Lockhart–Martinelli.
func TestFrictionFluidsGrid(t *testing.T) {
	p := Props{RhoL: 915, RhoV: 2.67, MuL: 180e-6, MuV: 14e-6, Sigma: 0.0487}
	const D = 0.05
	for _, c := range [][5]float64{
		// m (kg/s), x, Friedel, Müller-Steinhagen–Heck, Lockhart–Martinelli
		{0.6, 0.01, 169.3850541, 98.54103669, 107.4589322},
		{0.6, 0.3, 1698.531796, 2252.574817, 1833.039313},
		{0.6, 0.7, 3881.275039, 5131.417048, 3467.782322},
		{0.6, 0.95, 5185.547377, 6242.138849, 3996.542758},
		{0.05, 0.01, 3.075704329, 1.123186139, 0.8443268961},
		{0.05, 0.3, 29.17660567, 25.0326211, 20.92403975},
		{0.05, 0.7, 57.94933227, 56.99339188, 39.58453845},
		{0.05, 0.95, 69.72891767, 69.32973633, 45.90900788},
		{0.005, 0.01, 0.1159201812, 0.02159706592, 0.02452626673},
		{0.005, 0.3, 1.040102728, 0.4328561722, 0.3182690547},
		{0.005, 0.7, 1.771818155, 0.9830746932, 0.7061430184},
		{0.005, 0.95, 1.834187176, 1.195850164, 0.8327971605},
	} {
		G, x := c[0]/(math.Pi/4*D*D), c[1]
		near(t, "Friedel", Friction{Method: Friedel, SinglePhase: Colebrook}.Gradient(G, x, D, 0, p, gn), c[2], 1e-6)
		near(t, "Müller-Steinhagen–Heck", Friction{Method: MullerSteinhagenHeck, SinglePhase: Colebrook}.Gradient(G, x, D, 0, p, gn), c[3], 1e-6)
		near(t, "Lockhart–Martinelli", Friction{Method: LockhartMartinelliChisholm, SinglePhase: BlasiusLaminar}.Gradient(G, x, D, 0, p, gn), c[4], 1e-6)
	}
}

// TestVoidFluidsGrid checks the void fractions over qualities from 0.01 to
// 0.95 at two flows against the open-source fluids library (C. Bell),
// Debian python3-fluids 1.0.22: fluids.two_phase_voidage.Zivi(x, rhol, rhog),
// Chisholm_voidage(x, rhol, rhog) and Rouhani_1(x, rhol, rhog, sigma, m, D)
// (g = 9.80665), for ρl 800, ρv 2.5 kg/m³, σ 0.02 N/m, D = 0.3 m. (fluids'
// Rouhani_2 is a different form from the horizontal variant used here, so
// that one is checked by hand in TestVoidFractionChecks.)
func TestVoidFluidsGrid(t *testing.T) {
	p := Props{RhoL: 800, RhoV: 2.5, Sigma: 0.02}
	for _, c := range [][5]float64{
		// m (kg/s), x, Zivi, Chisholm, Rouhani–Axelsson (vertical)
		{1, 0.01, 0.3209144538, 0.6122668279, 0.2409759691},
		{1, 0.1, 0.8386642369, 0.8610884812, 0.6906848067},
		{1, 0.7, 0.9909225692, 0.9803364013, 0.9323196565},
		{1, 0.95, 0.99887628, 0.997140269, 0.9885932688},
		{0.05, 0.01, 0.3209144538, 0.6122668279, 0.01879987822},
		{0.05, 0.1, 0.8386642369, 0.8610884812, 0.1693134328},
		{0.05, 0.7, 0.9909225692, 0.9803364013, 0.7782726749},
		{0.05, 0.95, 0.99887628, 0.997140269, 0.9637526177},
	} {
		G, x := c[0]/(math.Pi/4*0.3*0.3), c[1]
		near(t, "Zivi", VoidFraction(Zivi, x, G, p, gn, 1), c[2], 1e-8)
		near(t, "Chisholm", VoidFraction(ChisholmSlip, x, G, p, gn, 1), c[3], 1e-8)
		near(t, "Rouhani–Axelsson vertical", VoidFraction(RouhaniAxelssonVertical, x, G, p, gn, 1), c[4], 1e-8)
	}
}
