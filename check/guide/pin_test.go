package guide

import (
	"context"
	"fmt"
	"math"
	"strings"
	"testing"

	"circa/check/flow"
	"circa/lang"
)

// pinLoop is a water loop under vacuum (saturation 40 °C) whose condenser
// sits lift above the evaporator inlet: its liquid column shifts the
// saturation temperature there by about 5 K at lift ≈ 0.23 m, where
// saturation_state auto switches from the single state to local
// saturation. At local saturation the inlet is subcooled, the flow a third
// of the single state's, and the exit quality under the loss reserve's
// added losses more than twice as high: with exit_quality 0.0015 the loss
// reserve holds below the switch and fails above it.
func pinLoop(lift float64) string {
	return fmt.Sprintf(`param lift = %g m

loop v {
  fluid water
  saturation 40 degC
  node a at (0, 0, 0) m
  node b at (0, 0, 0.1) m
  node c at (0, 0, lift) m
  node d at (-0.3, 0, lift) m
  evaporator evap from a to b { length 0.1 m; bore 20 mm; heat 300 W }
  pipe riser from b to c { length lift - 0.1 m; bore 20 mm }
  condenser cond from c to d { length 0.3 m; bore 20 mm }
  pipe down from d to a { length lift + 0.3 m; run (0.3, 0, -lift) m; bore 20 mm }
}
limits { exit_quality 0.0015 }
case nominal { heat evap 300 W }
`, lift)
}

func pinCase(t *testing.T, lift float64) flow.CaseResult {
	t.Helper()
	res, err := flow.Estimate(lang.LoadSource("pin.loop", []byte(pinLoop(lift)), nil), flow.Options{NoTilt: true})
	if err != nil {
		t.Fatal(err)
	}
	return res.Loops[0].Cases[0]
}

// TestRangeEndNotAtStateSwitch: the range of lift is searched in the
// state the design as written got (single, at 0.15 m), so its upper end
// is not the height where the variants' own liquid column would switch
// saturation_state auto to local saturation and the loss reserve jump;
// the end past that height says so, with what it gives in its own state.
func TestRangeEndNotAtStateSwitch(t *testing.T) {
	// The switch, by bisection on the column shift (circa's own rule,
	// flow.AutoLocalShift).
	lo, hi := 0.15, 0.6
	if pinCase(t, lo).SatState != "single" || pinCase(t, hi).SatState != "local" {
		t.Fatal("the loop does not switch state between 0.15 and 0.6 m")
	}
	for range 40 {
		if mid := (lo + hi) / 2; pinCase(t, mid).SatState == "local" {
			hi = mid
		} else {
			lo = mid
		}
	}
	sw := hi
	below, above := pinCase(t, sw*0.99), pinCase(t, sw*1.01)
	use := func(c flow.CaseResult) float64 {
		for _, m := range c.Margins {
			if m.Margin == flow.MarginHead {
				return m.Use
			}
		}
		t.Fatalf("no loss reserve in %+v", c.Margins)
		return 0
	}
	if !(use(below) < 1 && use(above) > 1) {
		t.Fatalf("the loss reserve does not jump over its limit at the switch (%.3g m): use %.3g below, %.3g above", sw, use(below), use(above))
	}
	m := lang.LoadSource("pin.loop", []byte(pinLoop(0.15)), nil)
	g, err := Compute(context.Background(), m, Options{Flow: flow.Options{NoTilt: true}})
	if err != nil {
		t.Fatal(err)
	}
	r := g.Params[0].Range
	if r == nil || !r.Feasible || !r.Contains {
		t.Fatalf("lift range %+v", r)
	}
	if math.Abs(r.High.Value-sw) < 0.02*sw {
		t.Errorf("the range of lift ends at %.4g m, at the switch of saturation state (%.4g m): %+v", r.High.Value, sw, r.High)
	}
	if r.High.Value > sw && !strings.Contains(r.High.Note, "local state") {
		t.Errorf("the upper end %.4g m, past the switch at %.4g m, has no note on the state: %q", r.High.Value, sw, r.High.Note)
	}
	if r.Low.Value < sw && r.Low.Note != "" {
		t.Errorf("the lower end %.4g m, below the switch, has a note: %q", r.Low.Value, r.Low.Note)
	}
	// In its own state (local) the loss reserve fails there, as it does
	// just past the switch.
	if r.High.Value > sw && !strings.Contains(r.High.Note, "in its own state loss reserve") {
		t.Errorf("the upper end's note does not give its own state's loss reserve: %q", r.High.Note)
	}
	t.Logf("switch %.4g m; range %+v %+v", sw, *r.Low, *r.High)
	if r.High.Value > sw && math.Abs(r.High.Switch-sw) > 0.01*(r.High.Value-0.15) {
		t.Errorf("the upper end locates the switch at %.4g m, the column shift at %.4g m", r.High.Switch, sw)
	}
	// Without the own state's estimate the note only says it differs.
	g2, err := Compute(context.Background(), m, Options{Flow: flow.Options{NoTilt: true}, NoOwnState: true})
	if err != nil {
		t.Fatal(err)
	}
	r2 := g2.Params[0].Range
	if r2 == nil || !r2.Feasible || r2.High.Value != r.High.Value || !strings.Contains(r2.High.Note, "local state") || strings.Contains(r2.High.Note, "in its own state") {
		t.Errorf("with NoOwnState: %+v", r2)
	}
	if g2.Estimates >= g.Estimates {
		t.Errorf("NoOwnState ran %d estimates, the guidance with the own state %d", g2.Estimates, g.Estimates)
	}
}

// TestFileStateNotPinned: a file that names its saturation state keeps
// it in every variant (no pin, no note).
func TestFileStateNotPinned(t *testing.T) {
	m := lang.LoadSource("pin.loop", []byte(pinLoop(0.15)+"methods { saturation_state single }\n"), nil)
	g, err := Compute(context.Background(), m, Options{Flow: flow.Options{NoTilt: true}})
	if err != nil {
		t.Fatal(err)
	}
	r := g.Params[0].Range
	if r == nil || !r.Feasible {
		t.Fatalf("lift range %+v", r)
	}
	if r.Low.Note != "" || r.High.Note != "" {
		t.Errorf("notes with saturation_state single: %q %q", r.Low.Note, r.High.Note)
	}
}
