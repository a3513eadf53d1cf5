package flow

import (
	"fmt"
	"math"
	"strings"
	"testing"
)

// bundle is the rectangular ring of flow_test.go with every component made
// of CHANNELS identical tubes; HEAT and UA are the whole component's.
const bundle = `
loop r {
  fluid R134a
  node a at (0, 0, 0) m
  node b at (0, 0, 0.3) m
  node c at (0, 0, 1.3) m
  node d at (-0.3, 0, 1.3) m
  evaporator evap from a to b { length 0.3 m; bore 4 mm; channels CHANNELS; heat HEAT; wetted_area 40 cm2; wall_limit 90 degC }
  pipe riser from b to c { length 1 m; bore 6 mm; channels CHANNELS; loss 1 }
  condenser cond from c to d { length 0.3 m; bore 4 mm; channels CHANNELS; conductance UA; sink 25 degC }
  pipe down from d to a { length 1.5 m; run (0.3, 0, -1.3) m; bore 4 mm; channels CHANNELS; loss 1 }
}
case nominal { heat evap HEAT }
`

// N identical channels in parallel, each at one channel's conditions (heat
// and conductance per channel held), carry exactly N times one channel's flow:
// every channel sees the same mass flux, quality and pressure drop, so the
// momentum balance of the bundle at N·ṁ is that of one channel at ṁ
// (continuity over parallel identical passages; no correlation enters).
func TestChannelsScaleFlow(t *testing.T) {
	run := func(n int) *CaseResult {
		src := strings.NewReplacer("CHANNELS", fmt.Sprint(n),
			"HEAT", fmt.Sprintf("%d W", 150*n), "UA", fmt.Sprintf("%d W/K", 20*n)).Replace(bundle)
		return only(t, estimate(t, load(t, src), Options{NoTilt: true}))
	}
	one := run(1)
	if !one.Circulates || !(one.MassFlow > 0) {
		t.Fatalf("one channel does not circulate: %s", one.Reason)
	}
	for _, n := range []int{2, 7, 24} {
		c := run(n)
		if rel := math.Abs(c.MassFlow/(float64(n)*one.MassFlow) - 1); rel > 1e-6 {
			t.Errorf("%d channels: mass flow %.9g kg/s, want %d × %.9g (rel. error %.2g)", n, c.MassFlow, n, one.MassFlow, rel)
		}
		if rel := math.Abs(c.SatTemperature/one.SatTemperature - 1); rel > 1e-9 {
			t.Errorf("%d channels: saturation %.6f K, want %.6f K", n, c.SatTemperature, one.SatTemperature)
		}
		if rel := math.Abs(c.Totals.Inventory/(float64(n)*one.Totals.Inventory) - 1); rel > 1e-5 {
			t.Errorf("%d channels: inventory %.6g kg, want %d × %.6g", n, c.Totals.Inventory, n, one.Totals.Inventory)
		}
		// Each channel holds 1/N of the inventory and carries 1/N of the
		// flow: the time round the loop does not depend on N.
		if rel := math.Abs(c.Totals.Transit/one.Totals.Transit - 1); !(one.Totals.Transit > 0) || rel > 1e-5 {
			t.Errorf("%d channels: transit time %.6g s, one channel %.6g s", n, c.Totals.Transit, one.Totals.Transit)
		}
		if rel := math.Abs(c.Totals.Transit*c.MassFlow/c.Totals.Inventory - 1); rel > 1e-9 {
			t.Errorf("%d channels: transit time %.6g s is not the inventory %.6g kg over the flow %.6g kg/s", n, c.Totals.Transit, c.Totals.Inventory, c.MassFlow)
		}
		for i, cs := range c.Components {
			o := one.Components[i]
			if rel := math.Abs(cs.MassFlux/o.MassFlux - 1); rel > 1e-6 {
				t.Errorf("%d channels: %s mass flux %.6g, one channel %.6g", n, cs.Component, cs.MassFlux, o.MassFlux)
			}
			if math.Abs(cs.VoidMean-o.VoidMean) > 1e-6 {
				t.Errorf("%d channels: %s mean void %.6g, one channel %.6g", n, cs.Component, cs.VoidMean, o.VoidMean)
			}
		}
		for _, m := range c.Margins {
			for _, o := range one.Margins {
				if o.Margin == m.Margin && o.Component == m.Component && math.Abs(m.Use-o.Use) > 1e-5*math.Max(1, math.Abs(o.Use)) {
					t.Errorf("%d channels: margin %s of %s uses %.6g, one channel %.6g", n, m.Margin, m.Component, m.Use, o.Use)
				}
			}
		}
	}
}
