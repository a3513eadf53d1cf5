package flow

import (
	"math"
	"os"
	"strings"
	"testing"
)

// TestLossReserve checks the loss-reserve margin on the hand-worked
// homogeneous loop, whose losses are its riser orifice alone (tube friction
// is below 0.01 %, see TestHandWorkedHomogeneous): solving it with the
// losses twice the estimate must give the same loop as doubling the
// orifice's loss coefficient in the file, and a heater exit quality above
// the stated limit is reported.
func TestLossReserve(t *testing.T) {
	text, err := os.ReadFile("../../testdata/flow/hand.loop")
	if err != nil {
		t.Fatal(err)
	}
	src := strings.Replace(string(text), "case nominal", "limits { head_ratio 2; exit_quality 0.12 }\ncase nominal", 1)
	doubled := strings.Replace(string(text), "loss 40324.84", "loss 80649.68", 1)
	if doubled == string(text) {
		t.Fatal("hand.loop no longer has the orifice loss this test doubles")
	}
	c := only(t, estimate(t, load(t, src), Options{NoTilt: true}))
	d := only(t, estimate(t, load(t, doubled), Options{NoTilt: true}))
	var m *Margin
	for i := range c.Margins {
		if c.Margins[i].Margin == MarginHead {
			m = &c.Margins[i]
		}
	}
	if m == nil {
		t.Fatalf("no %s margin in %+v", MarginHead, c.Margins)
	}
	want := d.Components[0].XOut // the heater's exit quality with the orifice doubled
	if math.Abs(m.Value-want) > 0.005*want {
		t.Errorf("exit quality with losses ×2: %g, with the orifice doubled in the file %g", m.Value, want)
	}
	if m.Component != "heater" || m.Limit != 0.12 {
		t.Errorf("margin at %q against %g, want the heater against 0.12", m.Component, m.Limit)
	}
	// As estimated the heater exits at 0.1 (within the 0.12 limit);
	// doubled losses cut the flow and raise it above the limit.
	if !(c.Components[0].XOut <= 0.12 && want > 0.12) {
		t.Fatalf("test loop no longer straddles the limit: %g as estimated, %g doubled", c.Components[0].XOut, want)
	}
	found := false
	for _, f := range c.Findings {
		if f.Rule == RuleHead {
			found = true
			if !strings.Contains(f.Message, "heater") || !strings.Contains(f.Message, "above the limit 0.12") {
				t.Errorf("finding %q lacks the evaporator or the limit", f.Message)
			}
		}
	}
	if !found {
		t.Errorf("no %s finding", RuleHead)
	}
	// With the default factor (1.5) and limit (0.5) the loop has reserve.
	c = only(t, estimate(t, load(t, string(text)), Options{NoTilt: true}))
	for _, f := range c.Findings {
		if f.Rule == RuleHead {
			t.Errorf("unexpected %s finding with the defaults: %s", RuleHead, f.Message)
		}
	}
}

// A reservoir hung from the vapour line holds vapour: it adds its volume at
// vapour density to the inventory and nothing to the liquid the reservoirs
// can store; the same reservoir on the downcomer stores 0.1 L of liquid.
func TestReservoirOnVapourLine(t *testing.T) {
	src := `
loop l {
  fluid R134a
  saturation 30 °C
  node a at (0, 0, 0) m
  node b at (0, 0, 0.2) m
  node t at (0, 0, 1.3) m
  node c at (0, 0, 1.2) m
  node d at (0, 0, 1.0) m
  evaporator e from a to b { length 0.2 m; rise 0.2 m; bore 10 mm; heat 150 W }
  pipe up from b to t { length 1.1 m; bore 10 mm }
  pipe over from t to c { length 0.2 m; bore 10 mm }
  condenser k from c to d { length 0.3 m; bore 10 mm }
  pipe down from d to a { length 1.1 m; bore 10 mm }
  reservoir tank at NODE { volume 0.1 L }
}
case run { heat e 150 W }
`
	vap := only(t, estimate(t, load(t, strings.Replace(src, "NODE", "t", 1)), Options{NoTilt: true}))
	liq := only(t, estimate(t, load(t, strings.Replace(src, "NODE", "d", 1)), Options{NoTilt: true}))
	if vap.Totals.Reservoirs != 0 {
		t.Errorf("reservoir on the vapour line stores %g kg of liquid, want 0", vap.Totals.Reservoirs)
	}
	// R134a saturated liquid at 30 °C: 1187.5 kg/m³ (Tillner-Roth and Baehr
	// 1994, from memory); 0.1 L holds about 0.119 kg.
	if got := liq.Totals.Reservoirs; math.Abs(got-0.11875) > 0.002 {
		t.Errorf("reservoir on the downcomer stores %g kg, want about 0.119 kg", got)
	}
	// The vapour in the tank (about 37.5 kg/m³ · 0.1 L = 3.75 g) is part of
	// the inventory.
	if d := vap.Totals.Inventory - liq.Totals.Inventory; d < 0.002 || d > 0.006 {
		t.Errorf("vapour-line reservoir adds %g kg to the inventory, want about 0.004 kg", d)
	}
}
