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
