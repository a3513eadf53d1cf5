package output

import (
	"bytes"
	"strings"
	"testing"

	"circa/check/flow"
	"circa/lang"
)

// A case that slows a condenser's fan and warms its sink says so under its
// heading, each value beside the condenser's own.
func TestOverridesInText(t *testing.T) {
	src := `
loop r {
  fluid R134a
  node a at (0, 0, 0) m
  node b at (0, 0, 0.3) m
  node c at (0, 0, 1.3) m
  node d at (-0.3, 0, 1.3) m
  evaporator evap from a to b { length 0.3 m; bore 10 mm; heat 300 W }
  pipe riser from b to c { length 1 m; bore 12 mm }
  condenser cond from c to d { length 0.3 m; bore 10 mm; conductance 150 W/K; sink 25 degC }
  pipe down from d to a { length 1.5 m; run (0.3, 0, -1.3) m; bore 8 mm }
}
case running { heat evap 300 W }
case standing { heat evap 250 W; conductance cond 40 W/K; sink cond 35 degC }
`
	m := lang.LoadSource("fan.loop", []byte(src), lang.OSFS{})
	for _, d := range m.Diags {
		if d.Severity == lang.Error {
			t.Fatal(d.Message())
		}
	}
	res, err := flow.Estimate(m, flow.Options{NoTilt: true})
	if err != nil {
		t.Fatal(err)
	}
	var b bytes.Buffer
	EstimateText(&b, res, nil)
	out := b.String()
	want := "  this case: heat evap 250 W (own 300 W); sink cond 35.0 °C (own 25.0 °C); conductance cond 40 W/K (own 150 W/K)\n"
	if !strings.Contains(out, want) {
		t.Errorf("missing %q in\n%s", want, out)
	}
	if strings.Count(out, "this case:") != 1 {
		t.Errorf("the running case, which overrides nothing, has a line too:\n%s", out)
	}
}
