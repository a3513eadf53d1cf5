package guide

import (
	"context"
	"math"
	"os"
	"strings"
	"testing"

	"circa/check/flow"
	"circa/lang"
)

// handLoop is testdata/flow/hand.loop, the homogeneous loop worked by hand
// in check/flow (constant properties ρl = 1000, ρv = 10 kg/m³, h_lv = 1 MJ/kg;
// homogeneous void and friction; heater and cooler level; 1 m riser and
// downcomer of 100 mm bore; its losses are the riser orifice alone, tube
// friction below 0.01 %), with the orifice's loss coefficient a parameter
// and the limits given.
func handLoop(t testing.TB, limits string) *lang.Model {
	t.Helper()
	text, err := os.ReadFile("../../testdata/flow/hand.loop")
	if err != nil {
		t.Fatal(err)
	}
	src := strings.Replace(string(text), "loss 40324.84", "loss orifice", 1)
	if src == string(text) {
		t.Fatal("hand.loop no longer has the orifice this test varies")
	}
	src = "param orifice = 40324.84\n" + strings.Replace(src, "case nominal", "limits { "+limits+" }\ncase nominal", 1)
	m := lang.LoadSource("../../testdata/flow/hand-guide.loop", []byte(src), lang.OSFS{})
	for _, d := range m.Diags {
		t.Fatalf("%s", d.Message())
	}
	return m
}

func paramOf(t testing.TB, g *Guidance, name string) *Param {
	t.Helper()
	for i := range g.Params {
		if g.Params[i].Param == name {
			return &g.Params[i]
		}
	}
	t.Fatalf("no parameter %s in %+v", name, g.Params)
	return nil
}

// TestHandLoopOrificeBound checks the largest orifice loss coefficient that
// keeps the heater's exit quality within 0.12 against the closed-form
// balance of the homogeneous loop, head g·H·(ρl − ρh) = riser outlet loss
// K·G²·v_h/2:
//
//	x = 0.12 at 5 kW needs ṁ = 5000/(0.12·1e6) = 0.041667 kg/s;
//	A = π/4·0.1² = 7.8540e-3 m², G = ṁ/A = 5.30516 kg/(m²s);
//	v_h = 0.001 + 0.12·(0.1 − 0.001) = 0.01288 m³/kg, ρh = 77.640 kg/m³;
//	head = 9.80665·1·(1000 − 77.640) = 9045.26 Pa;
//	G²·v_h/2 = 28.1448·0.01288/2 = 0.181252 Pa;
//	K = 9045.26/0.181252 = 49904.3.
//
// A smaller orifice only lowers the exit quality: the range is unbounded
// below. The loss-reserve margin is switched off (head_ratio 1).
func TestHandLoopOrificeBound(t *testing.T) {
	m := handLoop(t, "exit_quality 0.12; head_ratio 1")
	g, err := Compute(context.Background(), m, Options{})
	if err != nil {
		t.Fatal(err)
	}
	p := paramOf(t, g, "orifice")
	r := p.Range
	if !p.Influences || r == nil || !r.Feasible || !r.Contains {
		t.Fatalf("orifice: %+v", p)
	}
	const want = 49904.3 // the arithmetic above
	if math.Abs(r.High.Value-want) > 0.002*want {
		t.Errorf("largest orifice %g, want %g within 0.2 %%", r.High.Value, want)

	}
	if w := r.High.Limit; w.Margin != flow.MarginExitQuality || w.Component != "heater" || w.Case != "nominal" {
		t.Errorf("upper limit %+v, want the heater's exit quality in case nominal", w)
	}
	if !r.Low.Unbounded {
		t.Errorf("lower end %+v, want unbounded", r.Low)
	}
}

// TestHandLoopReserveBound: with the default head_ratio 1.5 the loss-reserve
// margin solves the loop with the losses 1.5 times the estimate, which for
// this loop is the orifice 1.5 times as large; the heater then reaches 0.12
// at K·1.5 = 49904.3, the bound above, so K = 49904.3/1.5 = 33269.5. The
// orifice as written (40324.84) is outside the range.
func TestHandLoopReserveBound(t *testing.T) {
	m := handLoop(t, "exit_quality 0.12")
	g, err := Compute(context.Background(), m, Options{})
	if err != nil {
		t.Fatal(err)
	}
	r := paramOf(t, g, "orifice").Range
	if r == nil || !r.Feasible || r.Contains {
		t.Fatalf("orifice: %+v", r)
	}
	const want = 33269.5 // 49904.3/1.5, the arithmetic above
	if math.Abs(r.High.Value-want) > 0.002*want {
		t.Errorf("largest orifice %g, want %g within 0.2 %%", r.High.Value, want)

	}
	if r.High.Limit.Margin != flow.MarginHead || r.Limit.Margin != flow.MarginHead || !(r.Use > 1) {
		t.Errorf("limits %+v / %+v (use %g), want the loss reserve", r.High.Limit, r.Limit, r.Use)
	}
	if !r.Low.Unbounded {
		t.Errorf("lower end %+v, want unbounded", r.Low)
	}
}

// TestRangeEndsAtSeveralBalances varies the return's subcooling of
// testdata/flow/ledinegg.loop, the throttled homogeneous loop worked by hand
// in check/flow (TestLedineggLoop: constant properties, c_p,l = 4 kJ/(kg K),
// h_lv = 1 MJ/kg, v_lv/v_l = 99; three balances at 50 K of subcooling). Its
// excess head can rise with flow, and so give several balances, only when
// S = s·v_lv/v_l > 9 with s = c_p,l·ΔT_sub/h_lv: S = 0.396·ΔT_sub, so
// ΔT_sub > 22.7 K. From 10 K (one balance) the range must end, for several
// balances, between 22.7 K and 50 K. The loss reserve is switched off and
// the exit-quality limit loosened so that no margin ends it first.
func TestRangeEndsAtSeveralBalances(t *testing.T) {
	text, err := os.ReadFile("../../testdata/flow/ledinegg.loop")
	if err != nil {
		t.Fatal(err)
	}
	src := strings.Replace(string(text), "subcool 50 K", "subcool subcooling", 1)
	src = "param subcooling = 10 K\n" + strings.Replace(src, "case nominal", "limits { head_ratio 1; exit_quality 0.99 }\ncase nominal", 1)
	m := lang.LoadSource("../../testdata/flow/ledinegg-guide.loop", []byte(src), lang.OSFS{})
	for _, d := range m.Diags {
		t.Fatal(d.Message())
	}
	g, err := Compute(context.Background(), m, Options{Flow: flow.Options{NoTilt: true}})
	if err != nil {
		t.Fatal(err)
	}
	r := paramOf(t, g, "subcooling").Range
	if r == nil || !r.Feasible || !r.Contains {
		t.Fatalf("range %+v", r)
	}
	if r.High.Stop != StopSeveralBalances || !strings.Contains(r.High.Reason, "3 roots") {
		t.Fatalf("upper end %+v, want several balances", r.High)
	}
	if v := r.High.Value; v < 22.7 || v > 50 {
		t.Errorf("several balances from %g K, want between 22.7 and 50 K", v)
	}
}
