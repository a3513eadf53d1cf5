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

// An evaporator with its device's stack prints the junction per case, and
// the hot-surface caution names the device case.
func TestJunctionInText(t *testing.T) {
	src := `
loop r {
  fluid R134a
  node a at (0, 0, 0) m
  node b at (0, 0, 0.3) m
  node c at (0, 0, 1.3) m
  node d at (-0.3, 0, 1.3) m
  evaporator evap from a to b { length 0.3 m; bore 10 mm; heat 300 W; wetted_area 0.01 m2; junction_to_case 0.05 K/W; interface_resistance 0.05 K/W; junction_limit 100 degC }
  pipe riser from b to c { length 1 m; bore 12 mm }
  condenser cond from c to d { length 0.3 m; bore 10 mm; conductance 150 W/K; sink 25 degC }
  pipe down from d to a { length 1.5 m; run (0.3, 0, -1.3) m; bore 8 mm }
}
`
	m := lang.LoadSource("chip.loop", []byte(src), lang.OSFS{})
	res, err := flow.Estimate(m, flow.Options{NoTilt: true})
	if err != nil {
		t.Fatal(err)
	}
	j := res.Loops[0].Cases[0].Components[0].Junction
	if j == nil {
		t.Fatal("no junction")
	}
	var b bytes.Buffer
	EstimateText(&b, res, nil)
	// 300 W × (0.05 + 0.05) K/W = 30 K above the wall; 15 K for the case.
	want := "  junction on evap: " + temperature(j.Wall+30) + " (device case " + temperature(j.Wall+15) + ", wall " + temperature(j.Wall) + "; 0.1 K/W)\n"
	if !strings.Contains(b.String(), want) {
		t.Errorf("missing %q in\n%s", want, b.String())
	}
	if !strings.Contains(b.String(), "junction_temperature") {
		t.Errorf("no junction margin row:\n%s", b.String())
	}
	found := false
	for _, c := range specificCautions(m, res) {
		found = found || strings.Contains(c, "the device case on evaporator evap about "+temperature(j.Case))
	}
	if !found {
		t.Errorf("cautions name no device case: %q", specificCautions(m, res))
	}
}
