package units

import (
	"errors"
	"slices"
	"strings"
	"testing"

	"gonum.org/v1/gonum/unit"
)

// TestSpellings checks that ASCII and Unicode spellings of a unit parse to
// the same unit, with the same canonical text.
func TestSpellings(t *testing.T) {
	groups := [][]string{
		{"W/(m2*K)", "W/(m2 K)", "W/(m²·K)", "W/(m^2*K)", "W/m2/K", "W/m²/K", "W⋅m⁻²⋅K⁻¹", "W*m^-2*K^-1", "W / (m2 * K)", "W/(m²×K)"},
		{"um", "µm", "μm"},
		{"degC", "°C", "℃"},
		{"degF", "°F", "℉"},
		{"degR", "°R"},
		{"deg", "°"},
		{"degC_diff", "Δ°C", "ΔdegC"},
		{"1/s", "s^-1", "s⁻¹", "Hz"},
		{"m3", "m³", "m^3"},
		{"Pa*s", "Pa s", "Pa·s", "N*s/m2", "kg/(m*s)"},
		{"bar(g)", "barg"},
		{"bar(a)", "bara"},
		{"psig", "psi(g)"},
		{"gn", "g0", "g_n"},
		{"L", "l", "dm3"},
		{"mL", "ml", "cm3"},
		{"h", "hr"},
		{"lb", "lbm"},
		{"m/s2", "m/s^2", "m/s²", "m*s^-2", "m s^-2"},
		{"kWh", "kW*h"},
	}
	for _, g := range groups {
		first, err := Parse(g[0])
		if err != nil {
			t.Errorf("Parse(%q): %v", g[0], err)
			continue
		}
		for _, s := range g[1:] {
			u, err := Parse(s)
			if err != nil {
				t.Errorf("Parse(%q): %v", s, err)
				continue
			}
			if u.Dim != first.Dim || !near(u.Factor, first.Factor, 1e-14) || u.Offset != first.Offset ||
				u.Affine != first.Affine || u.Gauge != first.Gauge {
				t.Errorf("Parse(%q) = %+v, want the same as %q = %+v", s, u, g[0], first)
			}
		}
	}
}

func TestCanonicalText(t *testing.T) {
	tests := map[string]string{
		"W/(m² K)":  "W/(m2*K)",
		"W/m2/K":    "W/(m2*K)",
		"µm":        "um",
		"°C":        "degC",
		"barg":      "bar(g)",
		"psi(g)":    "psig",
		"kPa(g)":    "kPa(g)",
		"s⁻¹":       "1/s",
		"Pa s":      "Pa*s",
		"m*m":       "m2",
		"":          "",
		"1":         "",
		"%":         "%",
		"%^2":       "%^2",
		"°":         "deg",
		"g0":        "gn",
		"kg·m/s²":   "kg*m/s2",
		"Btu/h":     "Btu/h",
		"  kg/s  ":  "kg/s",
		"W/(m*°C)":  "W/(m*degC)",
		"(m/s)^2":   "m2/s2",
		"1/(m*s)":   "1/(m*s)",
		"J/(kg K)":  "J/(kg*K)",
		"kJ/kg/K":   "kJ/(kg*K)",
		"mm2":       "mm2",
		"daN":       "daN",
		"ΔdegF":     "degF_diff",
		"lbm/ft^3":  "lb/ft3",
		"m3/h":      "m3/h",
		"W/cm²":     "W/cm2",
		"kg m/s^2":  "kg*m/s2",
		"N·m":       "N*m",
		"(W)":       "W",
		"((m))":     "m",
		"m/s/s":     "m/s2",
		"MPa(a)":    "MPa(a)",
		"ppm":       "ppm",
		"mrad":      "mrad",
		"kHz":       "kHz",
		"mol/s":     "mol/s",
		"lb/(h)":    "lb/h",
		"Btu/lb/°F": "Btu/(lb*degF)",
	}
	for in, want := range tests {
		u, err := Parse(in)
		if err != nil {
			t.Errorf("Parse(%q): %v", in, err)
			continue
		}
		if u.Text != want {
			t.Errorf("Parse(%q).Text = %q, want %q", in, u.Text, want)
		}
		// The canonical text parses back to the same unit.
		v, err := Parse(u.Text)
		if err != nil || v.Dim != u.Dim || !near(v.Factor, u.Factor, 1e-14) || v.Offset != u.Offset {
			t.Errorf("Parse(%q) = %+v, %v; want %+v", u.Text, v, err, u)
		}
	}
}

func TestParseErrors(t *testing.T) {
	tests := []struct {
		in       string
		off, end int
		msg      string // substring
		suggest  string // first suggestion, if any
	}{
		{"kgs", 0, 3, `unknown unit "kgs"; did you mean "kg/s"?`, "kg/s"},
		{"W/(m2 Kx)", 6, 8, `unknown unit "Kx"`, ""},
		{"delta_degC", 0, 10, `unknown unit "delta_degC"; a temperature difference is written K or degC_diff`, "degC_diff"},
		{"KPA", 0, 3, `did you mean "kPa"?`, "kPa"},
		{"kPag", 0, 4, `did you mean "kPa(g)"?`, "kPa(g)"},
		{"degc", 0, 4, `did you mean "degC"?`, "degC"},
		{"W/(m2*K", 2, 3, `unclosed "("`, ""},
		{"W/m2*K)", 6, 7, `unmatched ")"`, ""},
		{"(m", 0, 1, `unclosed "("`, ""},
		{"()", 0, 2, `empty parentheses`, ""},
		{"kdegC", 0, 5, `the prefix "k" cannot be used with "degC"`, ""},
		{"mkg", 0, 3, `the prefix "m" cannot be used with "kg"`, ""},
		{"kpsi", 0, 4, `the prefix "k" cannot be used with "psi"`, ""},
		{"s-1", 0, 3, `"s-1" is ambiguous; write s^-1 or 1/s`, ""},
		{"kg/m-3", 3, 6, `ambiguous`, ""},
		{"m.s", 1, 2, `not "."`, ""},
		{"W/", 1, 2, `expected a unit after "/"`, ""},
		{"W//m", 1, 2, `expected a unit after "/"`, ""},
		{"*m", 0, 1, `unexpected "*"`, ""},
		{"2 m", 0, 1, `a number cannot be part of a unit`, ""},
		{"m^", 1, 2, `expected a whole number after "^"`, ""},
		{"m^0.5", 1, 5, `fractional powers`, ""},
		{"m^0", 1, 3, `power of zero`, ""},
		{"m2^3", 1, 3, `only one power`, ""},
		{"m^99", 1, 4, `too large`, ""},
		{"m(g)", 0, 4, `not a pressure unit`, ""},
		{"bar(g)/s", 0, 6, `cannot be part of a compound unit`, ""},
		{"kg·(m", 4, 5, `unclosed "("`, ""},
		{"m#", 1, 2, `unexpected "#"`, ""},
	}
	for _, tc := range tests {
		_, err := Parse(tc.in)
		var e *Error
		if !errors.As(err, &e) {
			t.Errorf("Parse(%q) error = %v, want *Error", tc.in, err)
			continue
		}
		if e.Offset != tc.off || e.End != tc.end {
			t.Errorf("Parse(%q) span = [%d,%d), want [%d,%d) (%s)", tc.in, e.Offset, e.End, tc.off, tc.end, e.Msg)
		}
		if !strings.Contains(e.Msg, tc.msg) {
			t.Errorf("Parse(%q) message %q, want it to contain %q", tc.in, e.Msg, tc.msg)
		}
		if tc.suggest != "" && (len(e.Suggestions) == 0 || e.Suggestions[0] != tc.suggest) {
			t.Errorf("Parse(%q) suggestions %q, want %q first", tc.in, e.Suggestions, tc.suggest)
		}
	}
}

// TestGravityIsNotGram guards the rule that "g" always means the gram.
func TestGravityIsNotGram(t *testing.T) {
	if u := MustParse("g"); u.Dim != Mass || u.Factor != 1e-3 {
		t.Errorf("g = %+v, want the gram", u)
	}
	if u := MustParse("gn"); u.Dim != Acceleration {
		t.Errorf("gn = %+v, want an acceleration", u)
	}
}

func TestKnownParse(t *testing.T) {
	k := Known()
	if len(k) < 60 {
		t.Fatalf("Known() has %d entries", len(k))
	}
	for _, s := range k {
		if _, err := Parse(s); err != nil {
			t.Errorf("Known() entry %q does not parse: %v", s, err)
		}
	}
	for _, want := range []string{"m", "mm", "kPa", "bar(g)", "psig", "degC", "°C", "µm", "gn", "%", "kWh", "cP"} {
		if !slices.Contains(k, want) {
			t.Errorf("Known() lacks %q", want)
		}
	}
}

func TestSuggest(t *testing.T) {
	tests := map[string]string{
		"kgs":    "kg/s",
		"Kpa":    "kPa",
		"mmm":    "mm",
		"degf":   "degF",
		"psgi":   "psig",
		"Wm2K":   "W/(m2*K)",
		"kgK":    "kg*K",
		"degree": "deg",
		"btu":    "Btu",
		"delta":  "",
	}
	for in, want := range tests {
		got := Suggest(in)
		if len(got) > 3 {
			t.Errorf("Suggest(%q) = %q, more than 3", in, got)
		}
		if want == "" {
			continue
		}
		if len(got) == 0 || got[0] != want {
			t.Errorf("Suggest(%q) = %q, want %q first", in, got, want)
		}
	}
	if got := Suggest("zzzzzz"); len(got) != 0 {
		t.Errorf("Suggest(zzzzzz) = %q, want none", got)
	}
}

func TestDimString(t *testing.T) {
	tests := map[Dim]string{
		Dimensionless:           "1",
		Length:                  "m",
		Area:                    "m²",
		Frequency:               "1/s",
		Pressure:                "kg/(m·s²)",
		HeatTransferCoefficient: "kg/(s³·K)",
		{L: 2, M: 1, T: -1}:     "m²·kg/s",
		Angle:                   "rad",
	}
	for d, want := range tests {
		if got := d.String(); got != want {
			t.Errorf("%#v.String() = %q, want %q", d, got, want)
		}
	}
}

func TestName(t *testing.T) {
	tests := map[Dim]string{
		Length:                  "a length",
		Pressure:                "a pressure",
		HeatFlux:                "a heat flux",
		Dimensionless:           "a dimensionless number",
		HeatTransferCoefficient: "a heat transfer coefficient",
		Energy:                  "an energy",
		{L: 2, T: -1}:           "a quantity of m²/s",
	}
	for d, want := range tests {
		if got := Name(d); got != want {
			t.Errorf("Name(%v) = %q, want %q", d, got, want)
		}
	}
	// Every named dimension has a name of its own.
	seen := map[string]bool{}
	for _, d := range []Dim{Dimensionless, Length, Area, Volume, Mass, Time, Temperature, Pressure, Power, Energy,
		MassFlow, SpecificEnergy, Conductance, HeatTransferCoefficient, HeatFlux, Angle, Acceleration, Velocity,
		Density, Viscosity, ThermalConductivity, SurfaceTension, SpecificHeat, Force, Frequency} {
		n := Name(d)
		if strings.HasPrefix(n, "a quantity of") || seen[n] {
			t.Errorf("Name(%v) = %q is not a distinct name", d, n)
		}
		seen[n] = true
	}
}

func TestGonum(t *testing.T) {
	// gonum's own unit for a pascal must have the dimension we call Pressure.
	pa := unit.New(1, unit.Dimensions{unit.MassDim: 1, unit.LengthDim: -1, unit.TimeDim: -2})
	if got := DimFromGonum(pa.Dimensions()); got != Pressure {
		t.Errorf("DimFromGonum(Pa) = %v", got)
	}
	for _, d := range []Dim{Dimensionless, HeatTransferCoefficient, Angle, {I: 1, N: -2, J: 3}} {
		if back := DimFromGonum(d.ToGonum()); back != d {
			t.Errorf("round trip of %v gave %v", d, back)
		}
	}
	if got := unit.New(1, HeatFlux.ToGonum()).Dimensions(); len(got) != 2 || got[unit.MassDim] != 1 || got[unit.TimeDim] != -3 {
		t.Errorf("HeatFlux.ToGonum() = %v", got)
	}
}
