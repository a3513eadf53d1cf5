package guide

import (
	"context"
	"encoding/json"
	"errors"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"circa/check/flow"
	"circa/lang"
)

func load(t testing.TB, path, src string) *lang.Model {
	t.Helper()
	return lang.LoadSource(path, []byte(src), lang.OSFS{})
}

func handSource(t testing.TB) string {
	t.Helper()
	text, err := os.ReadFile("../../testdata/flow/hand.loop")
	if err != nil {
		t.Fatal(err)
	}
	return string(text)
}

// A parameter no expression names, and one named only by another such,
// influence no estimate; neither gets a range.
func TestInertParams(t *testing.T) {
	src := "param label_height = 2 m\nparam unused = 3 m\nparam derived = unused * 2\n" + handSource(t)
	g, err := Compute(context.Background(), load(t, "../../testdata/flow/inert.loop", src), Options{})
	if err != nil {
		t.Fatal(err)
	}
	for _, name := range []string{"label_height", "unused", "derived"} {
		p := paramOf(t, g, name)
		if p.Influences || p.Range != nil || len(p.Sensitivities) != 0 {
			t.Errorf("%s: %+v", name, p)
		}
	}
}

// A file with errors gets no guidance, and says so.
func TestErrorsGetNoGuidance(t *testing.T) {
	src := strings.Replace(handSource(t), "length 1 m", "length 1 kg", 1)
	g, err := Compute(context.Background(), load(t, "../../testdata/flow/bad.loop", src), Options{})
	if err != nil {
		t.Fatal(err)
	}
	if g.Message == "" || !strings.Contains(g.Message, "errors") || len(g.Params) != 0 || len(g.Loops) != 0 {
		t.Errorf("%+v", g)
	}
}

func TestCancelled(t *testing.T) {
	m := handLoop(t, "exit_quality 0.12")
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := Compute(ctx, m, Options{}); !errors.Is(err, context.Canceled) {
		t.Errorf("cancelled: %v", err)
	}
}

// chargeUse estimates the loop of m with charge ch in case cs and returns
// the charge margin's use.
func chargeUse(t *testing.T, m *lang.Model, ch float64, cs string) float64 {
	t.Helper()
	mv := *m
	lv := *m.Loops[0]
	lv.Charge.SI = ch
	mv.Loops = []*lang.Loop{&lv}
	lr := flow.EstimateLoop(&mv, &lv, flow.Options{NoTilt: true, Case: cs})
	for _, mg := range lr.Cases[0].Margins {
		if mg.Margin == flow.MarginCharge {
			return mg.Use
		}
	}
	t.Fatalf("no charge margin in case %s", cs)
	return 0
}

// The charge range's ends are where the charge margin reaches its limit:
// just outside either end the estimate warns in the case named, just inside
// it does not; and the charge's sensitivities agree with a central
// difference of the estimate within 1 %.
func TestChargeRange(t *testing.T) {
	m := lang.Load("../../testdata/examples/rack-door.loop", nil)
	g, err := Compute(context.Background(), m, Options{Params: []string{}})
	if err != nil {
		t.Fatal(err)
	}
	c := g.Loops[0].Charge
	if c == nil || c.Range == nil || !c.Range.Feasible || !c.Range.Contains {
		t.Fatalf("charge %+v", c)
	}
	if !strings.HasPrefix(c.Range.Low.Reason, "evaporator starved") || !strings.HasPrefix(c.Range.High.Reason, "reservoir overfull") {
		t.Errorf("reasons %q, %q", c.Range.Low.Reason, c.Range.High.Reason)
	}
	for _, tc := range []struct {
		b      *Bound
		factor float64
		fails  bool
	}{
		{c.Range.Low, 0.999, true}, {c.Range.Low, 1.001, false},
		{c.Range.High, 1.001, true}, {c.Range.High, 0.999, false},
	} {
		if use := chargeUse(t, m, tc.b.Value*tc.factor, tc.b.Limit.Case); (use > 1) != tc.fails {
			t.Errorf("charge %g (end × %g) in case %s: use %g", tc.b.Value*tc.factor, tc.factor, tc.b.Limit.Case, use)
		}
	}
	if len(c.Sensitivities) == 0 {
		t.Fatal("no charge sensitivities")
	}
	ch := m.Loops[0].Charge.SI
	for _, s := range c.Sensitivities {
		h := 1e-3 * ch
		d := (chargeUse(t, m, ch+h, s.Case) - chargeUse(t, m, ch-h, s.Case)) / (2 * h)
		if s.Unit != "kg" || math.Abs(s.PerUnit-d) > 0.01*math.Abs(d) {
			t.Errorf("charge %s: %g per %s, central difference %g", s.Where.Describe(), s.PerUnit, s.Unit, d)
		}
	}
}

// TestFluidRanking runs the hand-worked loop at a saturation temperature of
// 500 K with every built-in fluid. Those whose range ends below it
// (the refrigerants and ammonia, critical below 440 K) are ranked last as
// not covering; water's saturation pressure there is 2.63889776 MPa
// (IAPWS-IF97, Table 35), against a design pressure of 30 bar.
func TestFluidRanking(t *testing.T) {
	src := strings.Replace(handSource(t), "saturation 50 °C", "saturation 500 K\n  design_pressure 30 bar\n  charge 3 kg", 1)
	m := load(t, "../../testdata/flow/hot.loop", src)
	for _, d := range m.Diags {
		t.Fatal(d.Message())
	}
	g, err := Compute(context.Background(), m, Options{Fluids: true, Params: []string{}, Flow: flow.Options{NoTilt: true}})
	if err != nil {
		t.Fatal(err)
	}
	fs := g.Loops[0].Fluids
	byName := map[string]Fluid{}
	seenOutside := false
	for i, f := range fs {
		byName[f.Fluid] = f
		if !f.Covers {
			seenOutside = true
			if f.Reason == "" {
				t.Errorf("%s: no reason", f.Fluid)
			}
		} else if seenOutside {
			t.Errorf("%s covers the cases but is ranked after one that does not", f.Fluid)
		}
		if i > 0 && f.Covers && fs[i-1].Covers && f.Stop == "" && fs[i-1].Stop == "" && f.Use < fs[i-1].Use {
			t.Errorf("%s (use %g) ranked after %s (use %g)", f.Fluid, f.Use, fs[i-1].Fluid, fs[i-1].Use)
		}
	}
	for _, n := range []string{"R134a", "R1234yf", "R245fa", "Ammonia"} {
		if f, ok := byName[n]; !ok || f.Covers {
			t.Errorf("%s: %+v, want not covering 500 K", n, f)
		}
	}
	w, ok := byName["water"]
	if !ok || !w.Covers || w.Safety != "A1" {
		t.Fatalf("water %+v", w)
	}
	const psat = 2.63889776e6 // Pa, IAPWS-IF97 Table 35 at 500 K
	if math.Abs(w.SaturationPressure-psat) > 1e-4*psat || w.HottestCase != "nominal" {
		t.Errorf("water at 500 K: %g Pa in case %q, want %g", w.SaturationPressure, w.HottestCase, psat)
	}
	if math.Abs(w.PressureUse-psat/30e5) > 1e-4 || w.DesignPressure != 30e5 {
		t.Errorf("pressure use %g against %g Pa, want %g", w.PressureUse, w.DesignPressure, psat/30e5)
	}
	if w.Charge == nil || !(w.Charge.Low < w.Charge.High) {
		t.Errorf("water charge range %+v", w.Charge)
	}
	own := 0
	for _, f := range fs {
		if f.Current {
			own++
			if f.Table == "" {
				t.Errorf("the loop's own fluid is its table, not %s", f.Fluid)
			}
		}
	}
	if own != 1 {
		t.Errorf("%d fluids marked as the loop's own", own)
	}
}

// A value the structural checks reject ends the range: the riser cannot be
// shorter than the 1 m its nodes' coordinates rise. The search runs without
// those checks and finds it when it checks the range's ends.
func TestRangeEndsWhereGeometryFails(t *testing.T) {
	src := strings.Replace(handSource(t), "pipe riser from b to c { length 1 m;", "pipe riser from b to c { length riser_length;", 1)
	m := load(t, "../../testdata/flow/riser.loop", "param riser_length = 1.5 m\n"+src)
	for _, d := range m.Diags {
		t.Fatal(d.Message())
	}
	g, err := Compute(context.Background(), m, Options{})
	if err != nil {
		t.Fatal(err)
	}
	r := paramOf(t, g, "riser_length").Range
	if r == nil || !r.Feasible || r.Low.Stop != StopInvalid || !strings.Contains(r.Low.Reason, "riser") {
		t.Fatalf("range %+v, low %+v", r, r.Low)
	}
	// The geometry checks allow 1 mm (check/geometry.go, riseTol).
	if r.Low.Value < 0.999 || r.Low.Value > 1.002 {
		t.Errorf("shortest riser %g m, want 1 m less the 1 mm the checks allow", r.Low.Value)
	}
}

// An absolute temperature is searched on its own scale (kelvin) and its
// change "per 10 %" is per 10 K.
func TestTemperatureParam(t *testing.T) {
	src := "param sat = 50 degC\n" + strings.Replace(handSource(t), "saturation 50 °C", "saturation sat", 1)
	src = strings.Replace(src, "case nominal", "limits { exit_quality 0.12; saturation_max 90 degC }\ncase nominal", 1)
	m := load(t, "../../testdata/flow/sat.loop", src)
	for _, d := range m.Diags {
		t.Fatal(d.Message())
	}
	g, err := Compute(context.Background(), m, Options{Flow: flow.Options{NoTilt: true}})
	if err != nil {
		t.Fatal(err)
	}
	p := paramOf(t, g, "sat")
	if p.Unit != "degC" || !p.Influences || p.Range == nil || len(p.Sensitivities) == 0 {
		t.Fatalf("%+v", p)
	}
	for _, s := range p.Sensitivities {
		if math.Abs(s.PerTenPercent-10*s.PerUnit) > 1e-12*math.Abs(s.PerUnit) {
			t.Errorf("%s: %g per 10 K, %g per degC", s.Where.Describe(), s.PerTenPercent, s.PerUnit)
		}
	}
}

// Guidance never fails on a model the estimate takes: an empty file, a file
// of parameters alone, a loop without cases or charge, and every test loop.
func TestRobust(t *testing.T) {
	srcs := map[string]string{
		"empty.loop":  "",
		"params.loop": "param a = 1 m\nparam b = a * 2\n",
		"nocase.loop": strings.Replace(handSource(t), "case nominal { heat heater 5 kW }", "", 1),
		"zero.loop":   "param sub = 0 K\n" + strings.Replace(handSource(t), "conductance 1000 W/K;", "conductance 1000 W/K; subcool sub;", 1),
	}
	files, _ := filepath.Glob("../../testdata/flow/*.loop")
	for _, f := range files {
		b, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		srcs[filepath.Base(f)] = string(b)
	}
	for name, src := range srcs {
		m := load(t, filepath.Join("../../testdata/flow", "robust-"+name), src)
		g, err := Compute(context.Background(), m, Options{Flow: flow.Options{NoTilt: true}})
		if err != nil {
			t.Errorf("%s: %v", name, err)
			continue
		}
		if _, err := json.Marshal(g); err != nil {
			t.Errorf("%s: %v", name, err)
		}
		for _, p := range g.Params {
			if r := p.Range; r != nil && r.Feasible && (r.Low == nil || r.High == nil || r.Low.Value > r.High.Value) {
				t.Errorf("%s: %s range %+v", name, p.Param, r)
			}
		}
	}
}

// Where the charge as written ends a range, the range with the charge re-set
// reaches further; inside it, beyond the plain range, the file estimated
// afresh through its text has every margin but the charge within its limit
// and cases whose charge ranges overlap.
func TestRecharged(t *testing.T) {
	const path = "../../testdata/examples/rack-door.loop"
	src, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	m := load(t, path, string(src))
	g, err := Compute(context.Background(), m, Options{Params: []string{"lift"}, Flow: flow.Options{NoTilt: true}})
	if err != nil {
		t.Fatal(err)
	}
	p := paramOf(t, g, "lift")
	r, rr := p.Range, p.Recharged
	if r == nil || !r.Feasible || r.Low.Limit.Margin != flow.MarginCharge {
		t.Fatalf("the rack door's lift range no longer ends at the charge: %+v", r)
	}
	if rr == nil || !rr.Feasible || !(rr.Low.Value < r.Low.Value) {
		t.Fatalf("recharged %+v, plain low end %g", rr, r.Low.Value)
	}
	x := 0.5 * (rr.Low.Value + r.Low.Value)
	text := strings.Replace(string(src), "param lift = 1.2 m", "param lift = "+strconv.FormatFloat(x, 'g', -1, 64)+" m", 1)
	res, err := flow.Estimate(load(t, path, text), flow.Options{NoTilt: true})
	if err != nil {
		t.Fatal(err)
	}
	l := res.Loops[0]
	if l.ChargeRange == nil || l.ChargeRange.Low > l.ChargeRange.High {
		t.Errorf("lift %g m: no charge suits every case: %+v", x, l.ChargeRange)
	}
	for _, c := range l.Cases {
		for _, mg := range c.Margins {
			if mg.Margin != flow.MarginCharge && mg.Use > 1 {
				t.Errorf("lift %g m: %s in case %s uses %g", x, mg.Margin, c.Case, mg.Use)
			}
		}
	}
}
