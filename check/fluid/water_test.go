package fluid

import (
	"errors"
	"math"
	"testing"
)

// near fails unless got is within rel (relative) of want.
func near(t *testing.T, what string, got, want, rel float64) {
	t.Helper()
	if math.IsNaN(got) || math.Abs(got-want) > rel*math.Abs(want) {
		t.Errorf("%s = %.10g, want %.10g (relative tolerance %.1g, off by %.2g)", what, got, want, rel, (got-want)/want)
	}
}

// The published IF97 values have nine significant figures; 5e-9 relative
// accepts the printed rounding and nothing more.
const if97Tol = 5e-9

func TestIF97Region4(t *testing.T) {
	// IAPWS R7-97(2012) IF97, Table 35: saturation pressure, MPa.
	for _, c := range []struct{ T, p float64 }{
		{300, 0.353658941e-2}, // IF97 Table 35
		{500, 0.263889776e1},  // IF97 Table 35
		{600, 0.123443146e2},  // IF97 Table 35
	} {
		near(t, "psat", if97Psat(c.T)/1e6, c.p, if97Tol)
	}
	// IAPWS R7-97(2012) IF97, Table 36: saturation temperature, K.
	for _, c := range []struct{ p, T float64 }{
		{0.1, 0.372755919e3}, // IF97 Table 36
		{1, 0.453035632e3},   // IF97 Table 36
		{10, 0.584149488e3},  // IF97 Table 36
	} {
		near(t, "Tsat", if97Tsat(c.p*1e6), c.T, if97Tol)
	}
}

func TestIF97Region1(t *testing.T) {
	// IAPWS R7-97(2012) IF97, Table 5: T K, p MPa -> v m³/kg, h kJ/kg, cp kJ/(kg K).
	for _, c := range []struct{ T, p, v, h, cp float64 }{
		{300, 3, 0.100215168e-2, 0.115331273e3, 0.417301218e1},  // IF97 Table 5
		{300, 80, 0.971180894e-3, 0.184142828e3, 0.401008987e1}, // IF97 Table 5
		{500, 3, 0.120241800e-2, 0.975542239e3, 0.465580682e1},  // IF97 Table 5
	} {
		v, h, cp := if97Region1(c.T, c.p*1e6)
		near(t, "region 1 v", v, c.v, if97Tol)
		near(t, "region 1 h", h/1e3, c.h, if97Tol)
		near(t, "region 1 cp", cp/1e3, c.cp, if97Tol)
	}
}

func TestIF97Region2(t *testing.T) {
	// IAPWS R7-97(2012) IF97, Table 15: T K, p MPa -> v m³/kg, h kJ/kg, cp kJ/(kg K).
	for _, c := range []struct{ T, p, v, h, cp float64 }{
		{300, 0.0035, 0.394913866e2, 0.254991145e4, 0.191300162e1}, // IF97 Table 15
		{700, 0.0035, 0.923015898e2, 0.333568375e4, 0.208141274e1}, // IF97 Table 15
		{700, 30, 0.542946619e-2, 0.263149474e4, 0.103505092e2},    // IF97 Table 15
	} {
		v, h, cp := if97Region2(c.T, c.p*1e6)
		near(t, "region 2 v", v, c.v, if97Tol)
		near(t, "region 2 h", h/1e3, c.h, if97Tol)
		near(t, "region 2 cp", cp/1e3, c.cp, if97Tol)
	}
}

func TestWaterViscosity(t *testing.T) {
	// IAPWS R12-08, Table 4 (μ₂ = 1): T K, ρ kg/m³ -> μ µPa·s, printed to 9 or 8 digits.
	for _, c := range []struct{ T, rho, mu float64 }{
		{298.15, 998, 889.735100},   // R12-08 Table 4
		{298.15, 1200, 1437.649467}, // R12-08 Table 4
		{373.15, 1000, 307.883622},  // R12-08 Table 4
		{433.15, 1, 14.538324},      // R12-08 Table 4
		{433.15, 1000, 217.685358},  // R12-08 Table 4
		{873.15, 1, 32.619287},      // R12-08 Table 4
		{873.15, 100, 35.802262},    // R12-08 Table 4
		{873.15, 600, 77.430195},    // R12-08 Table 4
		{1173.15, 1, 44.217245},     // R12-08 Table 4
		{1173.15, 100, 47.640433},   // R12-08 Table 4
		{1173.15, 400, 64.154608},   // R12-08 Table 4
	} {
		// Half a unit in the last printed place (1e-6 µPa·s) relative to the smallest value.
		near(t, "viscosity", waterViscosity(c.rho, c.T)*1e6, c.mu, 5e-7/c.mu+1e-9)
	}
}

func TestWaterConductivity(t *testing.T) {
	// IAPWS R15-11, Table 4 (λ₂ = 0): T K, ρ kg/m³ -> λ mW/(m·K).
	for _, c := range []struct{ T, rho, k float64 }{
		{298.15, 0, 18.4341883},    // R15-11 Table 4
		{298.15, 998, 607.712868},  // R15-11 Table 4
		{298.15, 1200, 799.038144}, // R15-11 Table 4
		{873.15, 0, 79.1034659},    // R15-11 Table 4
	} {
		near(t, "conductivity", waterConductivity(c.rho, c.T)*1e3, c.k, if97Tol)
	}
}

func TestWaterSurfaceTension(t *testing.T) {
	// IAPWS R1-76(2014), Table 1: T K -> σ mN/m, printed to 0.01 mN/m.
	for _, c := range []struct{ T, sigma float64 }{
		{273.16, 75.65}, // R1-76(2014) Table 1
		{283.15, 74.22}, // R1-76(2014) Table 1
		{293.15, 72.74}, // R1-76(2014) Table 1
		{303.15, 71.19}, // R1-76(2014) Table 1
		{323.15, 67.94}, // R1-76(2014) Table 1
		{373.15, 58.91}, // R1-76(2014) Table 1
		{473.15, 37.67}, // R1-76(2014) Table 1
		{523.15, 26.04}, // R1-76(2014) Table 1
		{573.15, 14.36}, // R1-76(2014) Table 1
		{623.15, 3.67},  // R1-76(2014) Table 1
		{643.15, 0.39},  // R1-76(2014) Table 1
	} {
		got := waterSurfaceTension(c.T) * 1e3
		if math.Abs(got-c.sigma) > 0.005 {
			t.Errorf("σ(%g K) = %.4f mN/m, want %.2f (printed to 0.01)", c.T, got, c.sigma)
		}
	}
}

// TestWaterSaturationIAPWS95 compares the IF97 saturated states with the
// scientific formulation IAPWS-95. IF97 is consistent with IAPWS-95 on the
// saturation line to a few hundredths of a percent in pressure and density
// and a few tenths of a kJ/kg in enthalpy (from memory); the deviations seen
// are at most 0.017 % (p at 450 K) and 0.13 kJ/kg (h' at 450 K). The
// tolerances are 0.05 % in pressure and densities and 0.2 kJ/kg in enthalpy.
func TestWaterSaturationIAPWS95(t *testing.T) {
	w := water{}
	// IAPWS-95 release, Table 8: T K -> p kPa, ρ', ρ'' kg/m³, h', h'' kJ/kg.
	for _, c := range []struct{ T, p, rl, rv, hl, hv float64 }{
		{275, 0.698451167, 999.887406, 0.00550664919, 7.75972202, 2504.28995}, // IAPWS-95 Table 8
		{450, 932.203564, 890.341250, 4.81200360, 749.161585, 2774.41078},     // IAPWS-95 Table 8
	} {
		s, err := w.Direct(c.T)
		if err != nil {
			t.Fatal(err)
		}
		near(t, "p", s.P/1e3, c.p, 5e-4)
		near(t, "ρ'", s.RhoL, c.rl, 5e-4)
		near(t, "ρ''", s.RhoV, c.rv, 5e-4)
		if math.Abs(s.HL/1e3-c.hl) > 0.2 || math.Abs(s.HV/1e3-c.hv) > 0.2 {
			t.Errorf("h'(%g K), h'' = %.6f, %.6f kJ/kg, want %.6f, %.6f", c.T, s.HL/1e3, s.HV/1e3, c.hl, c.hv)
		}
	}
	// IAPWS-95 Table 8 also lists 625 K, inside IF97 region 3, which this range
	// stops short of: it must be refused, not answered from regions 1 and 2.
	var re *RangeError
	if _, err := w.Direct(625); !errors.As(err, &re) {
		t.Errorf("Direct(625 K) error = %v, want *RangeError", err)
	}
}
