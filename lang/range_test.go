package lang

import (
	"strings"
	"testing"
)

// Values far past anything a passive loop holds are refused where they are
// written, before the estimate turns them into meaningless numbers.
func TestModelRange(t *testing.T) {
	loop := func(cond, heat string) string {
		return "loop l {\n  fluid water\n  node a\n  node b\n" +
			"  evaporator e from a to b { length 1 m; bore 200 mm; heat " + heat + " }\n" +
			"  condenser k from b to a { length 1 m; bore 200 mm; conductance " + cond + "; sink 20 degC }\n}\n"
	}
	for _, c := range []struct {
		src, want string
	}{
		{loop("1e308 W/K", "1 kW"), "1e308 W/K is out of the model's range"},
		{loop("1 kW/K", "1e30 kW"), "1e30 kW is out of the model's range"},
		{loop("1 kW/K", "-1e30 kW"), "-1e30 kW is out of the model's range"},
		{loop("1 kW/K", "1 kW") + "case c {\n  heat e 1e20 W\n}\n", "1e20 W is out of the model's range"},
	} {
		m := LoadSource("r.loop", []byte(c.src), memFS{})
		found := false
		for _, d := range m.Diags {
			if d.Rule == "model-range" {
				found = found || strings.Contains(d.Message(), c.want)
			}
		}
		if !found {
			t.Errorf("%q: no %q in %v", c.src, c.want, messages(m.Diags))
		}
	}
	// Large but real: a boiler-scale 380 kW load, a 100 MW/K conductance.
	m := LoadSource("ok.loop", []byte(loop("100 MW/K", "380 kW")), memFS{})
	for _, d := range m.Diags {
		if d.Rule == "model-range" {
			t.Errorf("real values refused: %s", d.Message())
		}
	}
}

// Each field refuses a value that cannot be physically right, at the
// value's text, saying what it may be. The bounds are definitions, not
// estimates: absolute zero is 0 K = −273.15 °C (SI Brochure, 9th ed.,
// BIPM 2019, §2.3.1), vapour quality is a mass fraction in [0, 1], and
// magnitudes (charge, absolute pressure, resistances, conductances, loss
// coefficients, subcooling) cannot be negative. Ratios below 1 are
// possible but weaker than the estimate (common practice: 1.5 to 2).
func TestFieldRange(t *testing.T) {
	type where int
	const (
		inLoop where = iota
		inEvap
		inCond
		inCase
		inLimits
	)
	src := func(w where, stmt string) string {
		pick := func(at where, def string) string {
			if w == at {
				return def + "\n    " + stmt
			}
			return def
		}
		return "param sc = -100 K\nparam two = 2\n" +
			"loop l {\n  fluid water\n  " + pick(inLoop, "charge 0.5 kg") + "\n  node a\n  node b\n" +
			"  evaporator e from a to b {\n    length 1 m\n    rise 0.5 m\n    bore 10 mm\n    heat 1 kW\n    " + pick(inEvap, "wall_limit 90 degC") + "\n  }\n" +
			"  condenser k from b to a {\n    length 1 m\n    rise -0.5 m\n    bore 10 mm\n    " + pick(inCond, "sink 20 degC") + "\n  }\n}\n" +
			"case c {\n  " + pick(inCase, "yaw 0 deg") + "\n}\n" +
			"limits {\n  " + pick(inLimits, "exit_quality 0.5") + "\n}\n"
	}
	for _, c := range []struct {
		w       where
		stmt    string
		rule    string
		at      string // the text the finding must cover
		message string
	}{
		{inLoop, "design_pressure -2 bar(g)", "bad-value", "-2 bar(g)", "design_pressure must be above 0 bar absolute"},
		{inLoop, "saturation -300 degC", "bad-value", "-300 degC", "saturation must be above absolute zero"},
		{inEvap, "heat -2 kW", "bad-value", "-2 kW", "heat must be zero or more"},
		{inCase, "heat e -0.5 kW", "bad-value", "-0.5 kW", "heat must be zero or more"},
		{inCase, "heat e (1 kW - two * 1 kW)", "bad-value", "(1 kW - two * 1 kW)", "heat must be zero or more (an evaporator takes heat in), not (1 kW - two * 1 kW) = -1000 W (from param two)"},
		{inEvap, "loss -0.5", "bad-value", "-0.5", "loss must be zero or more"},
		{inEvap, "heat_flux -3 W/cm2", "bad-value", "-3 W/cm2", "heat_flux must be more than 0 W/m²"},
		{inEvap, "roughness_boiling 0 um", "bad-value", "0 um", "roughness_boiling must be more than 0 µm"},
		{inEvap, "junction_limit -300 degC", "bad-value", "-300 degC", "junction_limit must be above absolute zero"},
		{inEvap, "junction_to_case -0.1 K/W", "bad-value", "-0.1 K/W", "junction_to_case must be zero or more, not -0.1 K/W"},
		{inEvap, "spreading_resistance -1 K/W", "bad-value", "-1 K/W", "spreading_resistance must be zero or more"},
		{inEvap, "wall_limit -280 degC", "bad-value", "-280 degC", "wall_limit must be above absolute zero"},
		{inCond, "conductance -5 W/K", "bad-value", "-5 W/K", "conductance must be zero or more, not -5 W/K"},
		{inCond, "subcool -3 K", "bad-value", "-3 K", "subcool must be zero or more"},
		{inCond, "outlet -274 degC", "bad-value", "-274 degC", "outlet must be above absolute zero"},
		{inCond, "coolant_htc 0 W/(m2 K)", "bad-value", "0 W/(m2 K)", "coolant_htc must be more than 0 W/(m² K)"},
		{inCase, "sink -500 degC", "bad-value", "-500 degC", "sink must be above absolute zero"},
		{inCase, "sink k -500 degC", "bad-value", "-500 degC", "sink must be above absolute zero"},
		{inCase, "pitch 120 deg", "bad-value", "120 deg", "pitch must be within ±90°"},
		{inCase, "roll -200 deg", "bad-value", "-200 deg", "roll must be within ±180°"},
		{inCase, "yaw 4 rad", "bad-value", "4 rad", "yaw must be within ±180°"},
		{inCase, "saturation -274 degC", "bad-value", "-274 degC", "saturation must be above absolute zero"},
		{inLimits, "exit_quality 1.2", "bad-value", "1.2", "exit_quality must be more than 0 and at most 1"},
		{inLimits, "flooding 0", "bad-value", "0", "flooding must be more than 0 and at most 1"},
		{inLimits, "chf_ratio -2", "bad-value", "-2", "chf_ratio must be more than 0"},
		{inLimits, "chf_ratio 0.8", "unusual-value", "0.8", "chf_ratio 0.8 is unusual"},
		{inLimits, "head_ratio 0", "bad-value", "0", "head_ratio must be more than 0"},
		{inLimits, "head_ratio 0.5", "unusual-value", "0.5", "head_ratio 0.5 is unusual"},
		{inLimits, "tilt_margin -1 deg", "bad-value", "-1 deg", "tilt_margin must be zero or more"},
		{inLimits, "wall_margin -2 K", "bad-value", "-2 K", "wall_margin must be zero or more"},
		{inLimits, "saturation_max -300 degC", "bad-value", "-300 degC", "saturation_max must be above absolute zero"},
		// From a parameter: at the use, naming the parameter and its value.
		{inCond, "subcool sc", "bad-value", "sc", "subcool must be zero or more (the outlet liquid is at or below its saturation temperature), not sc = -100 K (from param sc)"},
		{inLimits, "exit_quality two / 4 + 0.8", "bad-value", "two / 4 + 0.8", "not two / 4 + 0.8 = 1.3 (from param two)"},
	} {
		text := src(c.w, c.stmt)
		m := LoadSource("f.loop", []byte(text), memFS{})
		want := strings.Index(text, c.stmt) + strings.Index(c.stmt, c.at)
		if !strings.HasSuffix(c.stmt, " "+c.at) {
			t.Fatalf("%s: the value is not %q", c.stmt, c.at)
		}
		var got []string
		for _, d := range m.Diags {
			if d.Rule == "bad-value" || d.Rule == "unusual-value" || d.Rule == "model-range" {
				got = append(got, d.Rule+": "+d.Message())
			}
		}
		if len(got) != 1 {
			t.Errorf("%s: want one finding, got %q (all: %v)", c.stmt, got, messages(m.Diags))
			continue
		}
		for _, d := range m.Diags {
			if d.Rule != c.rule {
				continue
			}
			if d.Loc.Span != (Span{want, want + len(c.at)}) {
				t.Errorf("%s: finding at %v (%q), want %q", c.stmt, d.Loc.Span, text[d.Loc.Span.Start:d.Loc.Span.End], c.at)
			}
			if !strings.Contains(d.Message(), c.message) {
				t.Errorf("%s: message %q lacks %q", c.stmt, d.Message(), c.message)
			}
		}
	}
	// What the examples write is accepted: at-limit values included.
	for _, ok := range []string{"subcool 0 K", "conductance 0 W/K", "loss 0"} {
		m := LoadSource("ok.loop", []byte(src(inCond, ok)), memFS{})
		for _, d := range m.Diags {
			if d.Rule == "bad-value" || d.Rule == "unusual-value" {
				t.Errorf("%s refused: %s", ok, d.Message())
			}
		}
	}
	for _, ok := range []string{"exit_quality 1", "chf_ratio 1", "head_ratio 1", "tilt_margin 0 deg", "wall_margin 0 K"} {
		m := LoadSource("ok.loop", []byte(src(inLimits, ok)), memFS{})
		for _, d := range m.Diags {
			if d.Rule == "bad-value" || d.Rule == "unusual-value" {
				t.Errorf("%s refused: %s", ok, d.Message())
			}
		}
	}
}
