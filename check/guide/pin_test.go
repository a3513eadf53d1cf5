package guide

import (
	"context"
	"fmt"
	"math"
	"os"
	"strconv"
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
	// Past the switch the variants' own state is local, in which the
	// loss reserve fails: the range ends at the switch, located in the
	// own state to the search's tolerance (0.1 %, axis.tol), and says so.
	if math.Abs(r.High.Value-sw) > 1.1e-3*sw {
		t.Errorf("the range of lift ends at %.4g m, not at the switch of saturation state (%.4g m): %+v", r.High.Value, sw, r.High)
	}
	if !r.High.Own || !strings.Contains(r.High.Note, "ends at the switch of saturation state") || !strings.Contains(r.High.Note, "local state, in which loss reserve") {
		t.Errorf("the upper end's note does not say the range ends at the switch, the loss reserve failing in the local state: %+v", r.High)
	}
	if r.Low.Value < sw && r.Low.Note != "" {
		t.Errorf("the lower end %.4g m, below the switch, has a note: %q", r.Low.Value, r.Low.Note)
	}
	t.Logf("switch %.4g m; range %+v %+v", sw, *r.Low, *r.High)
	// The switch is located on the pinned estimates' column shift, to
	// 1/1000 of the interval searched (here up to 100 times the lift
	// as written).
	if math.Abs(r.High.Switch-sw) > 0.1*sw {
		t.Errorf("the upper end locates the switch at %.4g m, the column shift at %.4g m", r.High.Switch, sw)
	}
	// Without the own state's estimate the note only says it differs.
	g2, err := Compute(context.Background(), m, Options{Flow: flow.Options{NoTilt: true}, NoOwnState: true})
	if err != nil {
		t.Fatal(err)
	}
	r2 := g2.Params[0].Range
	// nor searches it: the end stays the pinned search's, past the switch.
	if r2 == nil || !r2.Feasible || r2.High.Value <= sw || r2.High.Own || !strings.Contains(r2.High.Note, "local state") || strings.Contains(r2.High.Note, "in its own state") {
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

// TestRangeBeyondStateSwitch: forestry-inverter's roof range with the
// charge re-set is searched in the single state of the value as written,
// in which no charge limit is met up to the farthest value searched; but
// the tall variants' own liquid column has saturation_state auto estimate
// them at local saturation, where the charge window closes. The range's
// upper end is that own-state limit: a brute scan of the file's text with
// roof rewritten, each variant estimated as the file would have it alone
// (unpinned), locates it, and the end agrees to the search's tolerance
// (0.1 % of the value, axis.tol).
func TestRangeBeyondStateSwitch(t *testing.T) {
	if testing.Short() {
		t.Skip("a scan of some hundred estimates")
	}
	const path, decl = "../../testdata/examples/forestry-inverter.loop", "param roof = 0.9 m"
	src, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	m := lang.LoadSource(path, src, lang.OSFS{})
	g, err := Compute(context.Background(), m, Options{Params: []string{"roof"}})
	if err != nil {
		t.Fatal(err)
	}
	r := paramOf(t, g, "roof").Recharged
	if r == nil || !r.Feasible {
		t.Fatalf("roof range with the charge re-set: %+v", r)
	}
	hi := r.High
	t.Logf("range %.4g .. %.4g m; high end %+v; %d estimates", r.Low.Value, hi.Value, *hi, g.Estimates)
	// Feasible as the file alone would be estimated, the charge re-set:
	// every margin but the charge, and some charge suits every case.
	rech := func(w Where) bool { return w.Margin != flow.MarginCharge }
	ok := func(x float64) bool {
		text := strings.Replace(string(src), decl, "param roof = "+strconv.FormatFloat(x, 'g', -1, 64)+" m", 1)
		res, err := flow.Estimate(lang.LoadSource(path, []byte(text), lang.OSFS{}), flow.Options{})
		if err != nil {
			t.Fatal(err)
		}
		s, _ := summarize(res, x, rech)
		return s.Feasible()
	}
	// From the range's lower end outward in steps of 0.5 m to the first
	// infeasible height, then bisection to 1e-4 of the value.
	lo := r.Low.Value * 1.01
	if !ok(lo) {
		t.Fatalf("%.4g m, just inside the lower end, is infeasible", lo)
	}
	up := 0.0
	for x := math.Ceil(lo*2) / 2; x <= 100; x += 0.5 {
		if !ok(x) {
			up = x
			break
		}
		lo = x
	}
	if up == 0 {
		t.Fatalf("no own-state limit up to 100 m: the scan disagrees with the premise of the test")
	}
	for up-lo > 1e-4*up {
		if mid := (lo + up) / 2; ok(mid) {
			lo = mid
		} else {
			up = mid
		}
	}
	t.Logf("brute scan: own-state limit at %.5g m", lo)
	if hi.Unbounded || !hi.Own {
		t.Fatalf("the upper end is not searched in the own state: %+v", *hi)
	}
	if math.Abs(hi.Value-lo) > 1.1e-3*lo {
		t.Errorf("the upper end is %.5g m, the own-state limit by scan %.5g m", hi.Value, lo)
	}
	if hi.Limit.Margin != MarginChargeWindow {
		t.Errorf("the upper end's limit is %+v, the scan ends where no charge suits every case", hi.Limit)
	}
	if !(hi.Switch > r.Low.Value && hi.Switch < hi.Value) {
		t.Errorf("the switch %.4g m is not inside the range %.4g .. %.4g m", hi.Switch, r.Low.Value, hi.Value)
	}
	if !strings.Contains(hi.Note, "beyond the switch follows the local state") {
		t.Errorf("the note does not say the range beyond the switch is the local state's: %q", hi.Note)
	}
}
