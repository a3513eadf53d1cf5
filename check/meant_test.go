package check

import (
	"strings"
	"testing"

	"circa/check/fluid"
	"circa/lang"
)

// TestMeantHintScale: a fluid-range finding offers the other temperature
// scale only where that reading is inside the fluid's range and the
// written one is far past it. Water's range ends at 646 K (372.85 °C),
// short of its critical point 647.096 K (IAPWS R7-97(2012) IF97): a loop
// written at 373 °C is run too hot, not a slip for 373 K. 380 K is above
// R134a's critical temperature, so "380 degC" cannot mean 380 K either;
// "300 degC" for R134a is the slip the hint is for (300 K = 26.85 °C).
func TestMeantHintScale(t *testing.T) {
	r134a, _ := fluid.Lookup("R134a")
	if tc := r134a.Info().Tc; !(380 > tc) {
		t.Fatalf("R134a's critical temperature %g K: the case below no longer tests a reading past it", tc)
	}
	for _, c := range []struct {
		fluid, sat string
		hint       bool
	}{
		{"water", "373 degC", false},
		{"R134a", "380 degC", false},
		{"R134a", "300 degC", true},
	} {
		src := "loop l {\n  fluid " + c.fluid + "\n  saturation " + c.sat + "\n" + `  node a at (0, 0, 0) m
  node b at (0, 0, 0.3) m
  node c at (0, 0, 1.3) m
  node d at (-0.3, 0, 1.3) m
  evaporator e from a to b { length 0.3 m; bore 20 mm; heat 1 kW }
  pipe up from b to c { length 1 m; bore 20 mm }
  condenser k from c to d { length 0.3 m; bore 20 mm }
  pipe down from d to a { length 1.5 m; run (0.3, 0, -1.3) m; bore 20 mm }
}
`
		m := lang.LoadSource("t.loop", []byte(src), lang.OSFS{})
		var hits []lang.Diagnostic
		for _, d := range Run(m, Options{NoTilt: true}) {
			if d.Rule == "fluid-range" {
				hits = append(hits, d)
			}
		}
		if len(hits) != 1 {
			t.Fatalf("%s at %s: %d fluid-range findings", c.fluid, c.sat, len(hits))
		}
		d := hits[0]
		if got := strings.Contains(d.Message(), "probably meant") || len(d.Fixes) > 0; got != c.hint {
			t.Errorf("%s at %s: hint %v, want %v: %s (fixes %v)", c.fluid, c.sat, got, c.hint, d.Message(), d.Fixes)
		}
	}
}
