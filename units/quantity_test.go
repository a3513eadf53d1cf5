package units

import (
	"math"
	"strings"
	"testing"
)

func q(v float64, u string) Quantity { return MustParse(u).Quantity(v) }

func TestArithmetic(t *testing.T) {
	// 20 degC + 5 K = 25 degC = 298.15 K (SI definition of the Celsius scale).
	s, err := Add(q(20, "degC"), q(5, "K"))
	if err != nil || !s.AbsTemp || !near(s.SI, 298.15, 1e-14) {
		t.Errorf("20 degC + 5 K = %+v, %v", s, err)
	}
	// 30 degC - 20 degC = 10 K, a difference.
	d, err := Sub(q(30, "degC"), q(20, "degC"))
	if err != nil || d.AbsTemp || !near(d.SI, 10, 1e-12) {
		t.Errorf("30 degC - 20 degC = %+v, %v", d, err)
	}
	// 86 degF - 68 degF = 18 degF_diff = 10 K (NIST SP 811 (2008) B.9: 1 degF interval = 5/9 K).
	d, err = Sub(q(86, "degF"), q(68, "degF"))
	if err != nil || d.AbsTemp || !near(d.SI, 10, 1e-12) {
		t.Errorf("86 degF - 68 degF = %+v, %v", d, err)
	}
	if _, err := Add(q(20, "degC"), q(30, "degC")); err == nil || !strings.Contains(err.Error(), "two absolute temperatures") {
		t.Errorf("degC + degC: %v", err)
	}
	if _, err := Sub(q(5, "K"), q(20, "degC")); err == nil {
		t.Error("difference - absolute temperature: want an error")
	}
	if _, err := Add(q(1, "m"), q(1, "bar")); err == nil || err.Error() != "cannot add a length and a pressure" {
		t.Errorf("m + bar: %v", err)
	}
	// 2 m * 3 m = 6 m2
	p, err := Mul(q(2, "m"), q(3, "m"))
	if err != nil || p.Dim != Area || p.SI != 6 {
		t.Errorf("2 m * 3 m = %+v, %v", p, err)
	}
	if _, err := Mul(q(20, "degC"), q(2, "m")); err == nil {
		t.Error("degC * m: want an error")
	}
	if p, err := Mul(q(20, "degC"), q(2, "")); err != nil || !p.AbsTemp || !near(p.SI, 2*293.15, 1e-14) {
		t.Errorf("20 degC * 2 = %+v, %v", p, err)
	}
	if p, err := Mul(q(20, "K"), q(2, "m")); err != nil || p.Dim != (Dim{Th: 1, L: 1}) {
		t.Errorf("K * m = %+v, %v", p, err)
	}
	// 1 kW / 10 K = 100 W/K
	c, err := Div(q(1, "kW"), q(10, "K"))
	if err != nil || c.Dim != Conductance || !near(c.SI, 100, 1e-15) {
		t.Errorf("1 kW / 10 K = %+v, %v", c, err)
	}
	if _, err := Div(q(1, "W"), q(0, "K")); err == nil || !strings.Contains(err.Error(), "division by zero") {
		t.Errorf("1 W / 0 K: %v", err)
	}
	a, err := Pow(q(3, "m"), 2)
	if err != nil || a.Dim != Area || a.SI != 9 {
		t.Errorf("(3 m)^2 = %+v, %v", a, err)
	}
	if _, err := Pow(q(0, "m"), -1); err == nil {
		t.Error("(0 m)^-1: want an error")
	}
	if _, err := Pow(q(20, "degC"), 2); err == nil {
		t.Error("(20 degC)^2: want an error")
	}
	if _, err := Pow(q(1e200, "m"), 3); err == nil {
		t.Error("(1e200 m)^3 overflows: want an error")
	}
	if _, err := Mul(q(1e200, "m"), q(1e200, "m")); err == nil {
		t.Error("overflow: want an error")
	}
	if _, err := Pow(Quantity{SI: 2, Dim: Dim{L: 100}}, 2); err == nil {
		t.Error("exponent overflow: want an error")
	}
	if _, err := Add(Quantity{SI: math.NaN()}, Quantity{}); err == nil {
		t.Error("NaN operand: want an error")
	}
	if n := Neg(q(2, "m")); n.SI != -2 || n.Dim != Length {
		t.Errorf("Neg = %+v", n)
	}
}

func TestCheck(t *testing.T) {
	tests := []struct {
		q    Quantity
		u    string
		need Need
		want string // "" for no error
	}{
		{q(1, "m"), "m", Need{Dim: Length}, ""},
		{q(1, "bar"), "bar", Need{Dim: Length}, "expected a length, found a pressure (bar)"},
		{q(20, "degC"), "degC", Need{Dim: Temperature, Difference: true},
			"expected a temperature difference, found an absolute temperature (degC); write K or degC_diff"},
		{q(20, "degF"), "°F", Need{Dim: Temperature, Difference: true},
			"expected a temperature difference, found an absolute temperature (°F); write K or degF_diff"},
		{q(5, "K"), "K", Need{Dim: Temperature, Difference: true}, ""},
		{q(5, "degC_diff"), "degC_diff", Need{Dim: Temperature, Difference: true}, ""},
		{q(20, "degC"), "degC", Need{Dim: Temperature}, ""},
		{q(300, "K"), "K", Need{Dim: Temperature}, ""},
		{q(20, "degC_diff"), "degC_diff", Need{Dim: Temperature},
			"expected an absolute temperature, found a temperature difference (degC_diff); write K, degC or degF"},
		{q(20, "degF_diff"), "Δ°F", Need{Dim: Temperature},
			"expected an absolute temperature, found a temperature difference (Δ°F); write K, degC or degF"},
		{q(3, ""), "", Need{Dim: Length}, "expected a length, found a dimensionless number; add a unit such as m"},
		{q(3, "W/m2"), "W/m2", Need{Dim: HeatTransferCoefficient},
			"expected a heat transfer coefficient, found a heat flux (W/m2)"},
		{q(3, "m2/s"), "m2/s", Need{Dim: Length}, "expected a length, found a quantity of m²/s (m2/s)"},
		{q(20, "degC"), "degC", Need{Dim: Length}, "expected a length, found an absolute temperature (degC)"},
		{Quantity{SI: math.Inf(1), Dim: Length}, "m", Need{Dim: Length}, "value is not a finite number"},
	}
	for _, tc := range tests {
		err := Check(tc.q, tc.u, tc.need)
		got := ""
		if err != nil {
			got = err.Error()
		}
		if got != tc.want {
			t.Errorf("Check(%+v, %q, %+v) = %q, want %q", tc.q, tc.u, tc.need, got, tc.want)
		}
	}
}

func TestFormat(t *testing.T) {
	tests := []struct {
		si   float64
		u    string
		want string
	}{
		{0.012, "mm", "12 mm"},
		{293.15, "degC", "20 degC"},          // SI definition of the Celsius scale
		{293.15, "degF", "68 degF"},          // NIST SP 811 (2008) B.9
		{101325, "Pa", "101325 Pa"},          // standard atmosphere, exact
		{101325, "bar(g)", "0 bar(g)"},       // gauge zero is one standard atmosphere
		{101325 + 2e5, "bar(g)", "2 bar(g)"}, // 2 bar above the standard atmosphere
		{1e-9, "m", "1e-9 m"},
		{123456789, "W", "1.2346e8 W"},
		{0.5, "", "0.5"},
		{0.25, "%", "25 %"},
		{1.234567, "m", "1.2346 m"},
		{-0.0001, "m", "-1e-4 m"},
		{0.2930710701722222, "Btu/h", "1 Btu/h"}, // NIST SP 811 (2008) B.8: 1 Btu_IT/h = 0.293 071 1 W
	}
	if got := Format(0.5, Unit{}); got != "0.5" {
		t.Errorf("Format with the zero Unit = %q, want 0.5", got)
	}
	for _, tc := range tests {
		if got := Format(tc.si, MustParse(tc.u)); got != tc.want {
			t.Errorf("Format(%g, %q) = %q, want %q", tc.si, tc.u, got, tc.want)
		}
	}
}

func TestCommon(t *testing.T) {
	for d, texts := range commonTexts {
		us := Common(d)
		if len(us) != len(texts) {
			t.Errorf("Common(%v) has %d units, want %d", d, len(us), len(texts))
			continue
		}
		if d != Dimensionless && d != Temperature && (us[0].Factor != 1 || us[0].Offset != 0) {
			t.Errorf("Common(%v)[0] = %q is not the coherent SI unit", d, us[0].Text)
		}
		for _, u := range us {
			if u.Dim != d {
				t.Errorf("Common(%v) holds %q of dimension %v", d, u.Text, u.Dim)
			}
		}
	}
	if c := Common(Dim{L: 2, T: -1}); len(c) != 1 || c[0].Text != "m2/s" || c[0].Factor != 1 {
		t.Errorf("Common(m²/s) = %+v", c)
	}
	got := Common(Pressure)
	got[0].Text = "changed"
	if Common(Pressure)[0].Text != "Pa" {
		t.Error("Common returns shared storage")
	}
}

// Sig keeps the trailing zeros of n significant figures; values from
// %.3g beside them (0.1 beside 0.172) read as known to fewer figures.
func TestSig(t *testing.T) {
	for _, c := range []struct {
		v    float64
		n    int
		want string
	}{
		{0.1, 3, "0.100"}, {3.2, 3, "3.20"}, {50, 3, "50.0"}, {4.23, 3, "4.23"},
		{9.996, 3, "10.0"}, {99.96, 3, "100"}, {1234.6, 3, "1235"}, {-0.0001, 3, "-0.000100"},
		{-0.0004, 1, "-0.0004"}, {-0.00004, 2, "-4.0e-05"}, {-1e-9, 3, "-1.00e-09"}, {0, 3, "0.00"},
		{-0.0001e-3, 2, "-1.0e-07"}, {-0.04, 1, "-0.04"}, {-0.004, 1, "-0.004"}, {0.3764, 3, "0.376"},
	} {
		if got := Sig(c.v, c.n); got != c.want {
			t.Errorf("Sig(%g, %d) = %q, want %q", c.v, c.n, got, c.want)
		}
	}
	if got := Sig(-0.0004, 0); got != "-0.0004" {
		t.Errorf("Sig(-0.0004, 0) = %q", got)
	}
	if got := Sig(-1e-300*1e-300, 3); got != "0.00" {
		t.Errorf("Sig(-0) = %q", got)
	}
}
