package units

import (
	"math"
	"testing"
)

// near reports whether got matches want to rel relative tolerance.
func near(got, want, rel float64) bool {
	if want == 0 {
		return math.Abs(got) <= rel
	}
	return math.Abs(got-want) <= rel*math.Abs(want)
}

// TestConversions converts one of each unit to SI and compares it with a
// published factor. NIST SP 811 (2008) Appendix B.8 gives factors rounded
// to 7 significant digits unless exact, so inexact ones are checked to 5e-7.
func TestConversions(t *testing.T) {
	const exact = 1e-15
	const nist = 5e-7
	tests := []struct {
		unit string
		want float64 // SI value of 1 unit
		rel  float64
	}{
		// length
		{"m", 1, exact},
		{"mm", 1e-3, exact},     // SI prefix milli, SI Brochure (9th ed.) Table 7
		{"cm", 1e-2, exact},     // SI prefix centi, SI Brochure Table 7
		{"km", 1e3, exact},      // SI prefix kilo, SI Brochure Table 7
		{"um", 1e-6, exact},     // SI prefix micro, SI Brochure Table 7
		{"in", 0.0254, exact},   // NIST SP 811 (2008) B.8: inch = 2.54 E-02 m, exact (1959 agreement)
		{"ft", 0.3048, exact},   // NIST SP 811 (2008) B.8: foot = 3.048 E-01 m, exact (1959 agreement)
		{"mil", 2.54e-5, exact}, // NIST SP 811 (2008) B.8: mil = 2.54 E-05 m, exact (from memory)
		// area and volume
		{"ft2", 9.290304e-2, exact}, // NIST SP 811 (2008) B.8: square foot = 9.290 304 E-02 m2, exact (from memory)
		{"L", 1e-3, exact},          // NIST SP 811 (2008) B.8: liter = 1.0 E-03 m3, exact
		{"mL", 1e-6, exact},         // SI prefix milli on the litre
		{"ft3", 2.831685e-2, nist},  // NIST SP 811 (2008) B.8: cubic foot = 2.831 685 E-02 m3 (from memory)
		// mass
		{"kg", 1, exact},
		{"g", 1e-3, exact},        // SI Brochure: gram = 1e-3 kg
		{"mg", 1e-6, exact},       // SI prefix milli on the gram
		{"lb", 0.45359237, exact}, // NIST SP 811 (2008) B.8: pound (avoirdupois) = 4.535 9237 E-01 kg, exact (1959 agreement)
		{"oz", 2.834952e-2, nist}, // NIST SP 811 (2008) B.8: ounce (avoirdupois) = 2.834 952 E-02 kg (from memory)
		// time
		{"min", 60, exact},  // NIST SP 811 (2008) B.8: minute = 6.0 E+01 s
		{"h", 3600, exact},  // NIST SP 811 (2008) B.8: hour = 3.6 E+03 s
		{"ms", 1e-3, exact}, // SI prefix milli on the second
		// pressure
		{"Pa", 1, exact},
		{"kPa", 1e3, exact},
		{"MPa", 1e6, exact},
		{"bar", 1e5, exact},           // NIST SP 811 (2008) B.8: bar = 1.0 E+05 Pa, exact
		{"mbar", 1e2, exact},          // NIST SP 811 (2008) B.8: millibar = 1.0 E+02 Pa, exact
		{"atm", 101325, exact},        // NIST SP 811 (2008) B.8: standard atmosphere = 1.013 25 E+05 Pa, exact
		{"psi", 6.894757e3, nist},     // NIST SP 811 (2008) B.8: pound-force per square inch = 6.894 757 E+03 Pa
		{"lbf/in2", 6.894757e3, nist}, // same, written out
		// power and energy
		{"W", 1, exact},
		{"kW", 1e3, exact},
		{"J", 1, exact},
		{"kJ", 1e3, exact},
		{"Wh", 3.6e3, exact},         // NIST SP 811 (2008) B.8: watt hour = 3.6 E+03 J, exact
		{"kWh", 3.6e6, exact},        // NIST SP 811 (2008) B.8: kilowatt hour = 3.6 E+06 J, exact
		{"Btu", 1.055056e3, nist},    // NIST SP 811 (2008) B.8: British thermal unit_IT = 1.055 056 E+03 J
		{"Btu/h", 2.930711e-1, nist}, // NIST SP 811 (2008) B.8: Btu_IT per hour = 2.930 711 E-01 W
		// mass flow
		{"kg/s", 1, exact},
		{"g/s", 1e-3, exact},
		{"kg/h", 1.0 / 3600, 1e-15},
		{"lb/h", 1.259979e-4, nist}, // NIST SP 811 (2008) B.8: pound per hour = 1.259 979 E-04 kg/s
		// specific energy and heat
		{"J/kg", 1, exact},
		{"kJ/kg", 1e3, exact},
		{"Btu/lb", 2.326e3, 1e-12},         // NIST SP 811 (2008) B.8: Btu_IT per pound = 2.326 E+03 J/kg, exact (from memory)
		{"Btu/(lb*degF)", 4.1868e3, 1e-12}, // NIST SP 811 (2008) B.8: Btu_IT per pound degree Fahrenheit = 4.1868 E+03 J/(kg K), exact (from memory)
		// thermal
		{"W/K", 1, exact},
		{"W/(m2 K)", 1, exact},
		{"Btu/(h*ft2*degF)", 5.678263, nist}, // NIST SP 811 (2008) B.8: Btu_IT/(h ft2 degF) = 5.678 263 W/(m2 K) (from memory)
		{"Btu/(h*ft*degF)", 1.730735, nist},  // NIST SP 811 (2008) B.8: Btu_IT ft/(h ft2 degF) = 1.730 735 W/(m K) (from memory)
		{"Btu/(h*ft2)", 3.154591, nist},      // NIST SP 811 (2008) B.8: Btu_IT/(h ft2) = 3.154 591 W/m2 (from memory)
		// force, viscosity, surface tension
		{"N", 1, exact},
		{"lbf", 4.448222, nist}, // NIST SP 811 (2008) B.8: pound-force = 4.448 222 N (from memory)
		{"mN/m", 1e-3, exact},
		{"Pa s", 1, exact},
		{"mPa s", 1e-3, exact},
		{"cP", 1e-3, exact}, // NIST SP 811 (2008) B.8: centipoise = 1.0 E-03 Pa s, exact
		{"P", 0.1, exact},   // NIST SP 811 (2008) B.8: poise = 1.0 E-01 Pa s, exact
		// acceleration
		{"m/s2", 1, exact},
		{"m/s^2", 1, exact},
		{"gn", 9.80665, exact},  // 3rd CGPM (1901): standard acceleration of gravity 9.806 65 m/s2, exact
		{"g0", 9.80665, exact},  // 3rd CGPM (1901), alternative spelling
		{"g_n", 9.80665, exact}, // 3rd CGPM (1901), alternative spelling
		// density
		{"lb/ft3", 1.601846e1, nist}, // NIST SP 811 (2008) B.8: pound per cubic foot = 1.601 846 E+01 kg/m3 (from memory)
		// angle
		{"rad", 1, exact},
		{"deg", 1.745329e-2, nist}, // NIST SP 811 (2008) B.8: degree = 1.745 329 E-02 rad (from memory)
		{"°", 1.745329e-2, nist},   // same, written with the degree sign
		// dimensionless
		{"%", 0.01, exact}, // percent = 1e-2 (SI Brochure, 9th ed., 5.4.7)
		{"ppm", 1e-6, exact},
		{"", 1, exact},
		{"1", 1, exact},
		// temperature differences and plain scales
		{"K", 1, exact},
		{"degC_diff", 1, exact},         // ITS-90 / SI: a Celsius degree equals a kelvin
		{"degF_diff", 5.0 / 9.0, 1e-15}, // NIST SP 811 (2008) B.8: degree Fahrenheit (interval) = 5/9 K
		{"degR", 5.0 / 9.0, 1e-15},      // NIST SP 811 (2008) B.8: degree Rankine = 5/9 K
	}
	for _, tc := range tests {
		u, err := Parse(tc.unit)
		if err != nil {
			t.Errorf("Parse(%q): %v", tc.unit, err)
			continue
		}
		if got := u.ToSI(1); !near(got, tc.want, tc.rel) {
			t.Errorf("1 %s = %.10g SI, want %.10g", tc.unit, got, tc.want)
		}
	}
}

// TestTemperatureScales checks the offset scales against their definitions.
func TestTemperatureScales(t *testing.T) {
	tests := []struct {
		unit string
		v    float64
		k    float64
	}{
		{"degC", 0, 273.15},      // SI definition of the Celsius scale: t/degC = T/K - 273.15
		{"degC", 20, 293.15},     // same definition
		{"degC", -273.15, 0},     // absolute zero
		{"°C", 100, 373.15},      // same definition, Unicode spelling
		{"℃", 100, 373.15},       // same definition, single-character spelling
		{"degF", 68, 293.15},     // NIST SP 811 (2008) B.9: T/K = (t/degF + 459.67)/1.8 (from memory)
		{"degF", 32, 273.15},     // same: ice point
		{"degF", -40, 233.15},    // same: -40 degF = -40 degC
		{"°F", 212, 373.15},      // same: steam point
		{"degR", 491.67, 273.15}, // NIST SP 811 (2008) B.9: T/K = (T/degR)/1.8 (from memory)
		{"K", 300, 300},
	}
	for _, tc := range tests {
		u := MustParse(tc.unit)
		if got := u.ToSI(tc.v); !near(got, tc.k, 1e-12) && math.Abs(got-tc.k) > 1e-12 {
			t.Errorf("%g %s = %.12g K, want %.12g", tc.v, tc.unit, got, tc.k)
		}
		if back := u.FromSI(tc.k); math.Abs(back-tc.v) > 1e-9 {
			t.Errorf("%g K in %s = %.12g, want %g", tc.k, tc.unit, back, tc.v)
		}
	}
	if !MustParse("degC").Affine || !MustParse("degF").Affine {
		t.Error("degC and degF must be affine")
	}
	for _, s := range []string{"K", "degR", "degC_diff", "degF_diff", "W/(m*degC)"} {
		if u := MustParse(s); u.Affine || u.Offset != 0 {
			t.Errorf("%s: Affine=%v Offset=%g, want a plain scale", s, u.Affine, u.Offset)
		}
	}
	// In a compound unit a Celsius degree is an interval: W/(m*degC) = W/(m*K).
	if a, b := MustParse("W/(m*degC)"), MustParse("W/(m*K)"); a.Factor != b.Factor || a.Dim != b.Dim {
		t.Errorf("W/(m*degC) = %+v, want %+v", a, b)
	}
}

// TestGauge checks gauge and absolute pressure spellings.
func TestGauge(t *testing.T) {
	const atm = 101325 // NIST SP 811 (2008) B.8: standard atmosphere, exact
	tests := []struct {
		unit  string
		v, pa float64
		gauge bool
	}{
		{"bar(g)", 1, 1e5 + atm, true},
		{"barg", 1, 1e5 + atm, true},
		{"bar(a)", 1, 1e5, false},
		{"bara", 1, 1e5, false},
		{"kPa(g)", 0, atm, true},
		{"kPa(a)", 100, 1e5, false},
		{"MPa(g)", 1, 1e6 + atm, true},
		{"Pa(g)", 0, atm, true},
		{"psig", 14.7, 14.7*6894.757293168361 + atm, true}, // psi from NIST SP 811 (2008) B.8 (lbf/in2 from exact inch and pound)
		{"psia", 14.7, 14.7 * 6894.757293168361, false},
		{"psi(g)", 1, 6894.757293168361 + atm, true},
		{"mbar(g)", 10, 1e3 + atm, true},
	}
	for _, tc := range tests {
		u, err := Parse(tc.unit)
		if err != nil {
			t.Errorf("Parse(%q): %v", tc.unit, err)
			continue
		}
		if u.Gauge != tc.gauge || u.Dim != Pressure {
			t.Errorf("%s: Gauge=%v Dim=%v", tc.unit, u.Gauge, u.Dim)
		}
		if got := u.ToSI(tc.v); !near(got, tc.pa, 1e-12) {
			t.Errorf("%g %s = %.10g Pa, want %.10g", tc.v, tc.unit, got, tc.pa)
		}
		if back := u.FromSI(tc.pa); math.Abs(back-tc.v) > 1e-9*math.Max(1, math.Abs(tc.v)) {
			t.Errorf("%g Pa in %s = %.12g, want %g", tc.pa, tc.unit, back, tc.v)
		}
	}
}
