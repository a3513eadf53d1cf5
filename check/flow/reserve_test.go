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
