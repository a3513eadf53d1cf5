package picture

import (
	"bytes"
	"encoding/xml"
	"image/png"
	"io"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"circa/check/flow"
	"circa/lang"
)

// examplePath names a fixture in testdata/plot: frozen copies of the
// shipped examples (rack-door, ferry-cabinet, forestry-inverter), so that
// the expected values do not move when the examples are edited.
func examplePath(name string) string {
	fixture := map[string]string{"rack-door": "rack", "ferry-cabinet": "cabinet", "forestry-inverter": "inverter"}[name]
	return filepath.Join("..", "..", "testdata", "plot", fixture+".loop")
}

func loadExample(t *testing.T, name string) *lang.Model {
	t.Helper()
	m := lang.Load(examplePath(name), nil)
	for _, d := range m.Diags {
		if d.Severity == lang.Error {
			t.Fatalf("%s: %s", name, d.Message())
		}
	}
	return m
}

// loadEdited loads an example with one piece of its text replaced, so a
// test can ask the estimator about a changed case directly.
func loadEdited(t *testing.T, name, old, new string) *lang.Model {
	t.Helper()
	src, err := os.ReadFile(examplePath(name))
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Contains(src, []byte(old)) {
		t.Fatalf("%s has no %q", name, old)
	}
	src = bytes.Replace(src, []byte(old), []byte(new), 1)
	m := lang.LoadSource(examplePath(name), src, nil)
	for _, d := range m.Diags {
		if d.Severity == lang.Error {
			t.Fatalf("edited %s: %s", name, d.Message())
		}
	}
	return m
}

func near(a, b, rel float64) bool {
	return math.Abs(a-b) <= rel*math.Max(math.Abs(a), math.Abs(b)) || a == b
}

// estimateCase runs the estimator on one case of m and returns it.
func estimateCase(t *testing.T, m *lang.Model, name string, tilt bool) flow.CaseResult {
	t.Helper()
	res, err := flow.Estimate(m, flow.Options{Case: name, NoTilt: !tilt})
	if err != nil || len(res.Loops) == 0 || len(res.Loops[0].Cases) != 1 {
		t.Fatalf("estimate of case %s: %v", name, err)
	}
	return res.Loops[0].Cases[0]
}

// TestCirculationMatchesEstimator compares points of the plotted sweep with
// the estimator run on the file edited to that load.
func TestCirculationMatchesEstimator(t *testing.T) {
	m := loadExample(t, "rack-door")
	c, err := CirculationOf(m, m.Loops[0], Options{})
	if err != nil {
		t.Fatal(err)
	}
	if c.Case != "hot_aisle" || len(c.Sweep) != 30 {
		t.Fatalf("swept case %s with %d points, want the nominal hot_aisle with 30", c.Case, len(c.Sweep))
	}
	// The nominal case has 1.2 kW on the plate.
	for _, tc := range []struct {
		scale float64
		text  string
	}{{0.5, "0.6 kW"}, {1, "1.2 kW"}, {1.5, "1.8 kW"}, {0.05, "60 W"}} {
		var p *LoadPoint
		for i := range c.Sweep {
			if math.Abs(c.Sweep[i].Scale-tc.scale) < 1e-9 {
				p = &c.Sweep[i]
			}
		}
		if p == nil {
			t.Fatalf("no sweep point at %g", tc.scale)
		}
		edited := loadEdited(t, "rack-door", "case hot_aisle nominal {\n  heat plate 1.2 kW", "case hot_aisle nominal {\n  heat plate "+tc.text)
		cr := estimateCase(t, edited, "hot_aisle", false)
		if !near(p.Heat, cr.Heat, 1e-12) || p.Circulates != cr.Circulates || !near(p.MassFlow, cr.MassFlow, 1e-9) {
			t.Errorf("at %s: plotted Q %g W, ṁ %g kg/s; estimator Q %g W, ṁ %g kg/s", tc.text, p.Heat, p.MassFlow, cr.Heat, cr.MassFlow)
		}
		if x := exitQuality(cr); !near(p.ExitQuality, x, 1e-9) {
			t.Errorf("at %s: plotted exit quality %g, estimator %g", tc.text, p.ExitQuality, x)
		}
		var stable, unstable int
		for _, r := range cr.Roots {
			if r.Stable {
				stable++
			} else {
				unstable++
			}
		}
		if stable != len(p.Stable) || unstable != len(p.Unstable) {
			t.Errorf("at %s: plotted %d stable and %d unstable balances, estimator %d and %d", tc.text, len(p.Stable), len(p.Unstable), stable, unstable)
		}
	}
	// Every case's operating point.
	if len(c.Cases) != len(m.Cases) {
		t.Fatalf("%d case points for %d cases", len(c.Cases), len(m.Cases))
	}
	for _, cp := range c.Cases {
		cr := estimateCase(t, m, cp.Case, false)
		if !near(cp.MassFlow, cr.MassFlow, 1e-9) || !near(cp.Heat, cr.Heat, 1e-12) {
			t.Errorf("case %s: plotted (%g W, %g kg/s), estimator (%g W, %g kg/s)", cp.Case, cp.Heat, cp.MassFlow, cr.Heat, cr.MassFlow)
		}
	}
	// Exit quality rises with load at the estimate: more heat on a flow that
	// does not grow as fast (a heated channel's energy balance, x = Q/(ṁ·h_lv)
	// above saturation).
	for i := 1; i < len(c.Sweep); i++ {
		if c.Sweep[i].Circulates && c.Sweep[i-1].Circulates && !(c.Sweep[i].ExitQuality > c.Sweep[i-1].ExitQuality) {
			t.Errorf("exit quality falls from %g to %g between %g and %g of the load", c.Sweep[i-1].ExitQuality, c.Sweep[i].ExitQuality, c.Sweep[i-1].Scale, c.Sweep[i].Scale)
		}
	}
}

// TestBudgetMatchesEstimator compares the bars with the estimator's
// per-component pressure changes, and checks that around the closed loop
// the gravity gain balances the losses (the steady loop momentum balance:
// the pressure returns to its starting value).
func TestBudgetMatchesEstimator(t *testing.T) {
	for _, name := range []string{"rack-door", "forestry-inverter", "ferry-cabinet"} {
		m := loadExample(t, name)
		b, err := BudgetOf(m, m.Loops[0], "")
		if err != nil {
			t.Fatal(err)
		}
		cr := estimateCase(t, m, m.Nominal.Name, false)
		if len(b.Items) != len(cr.Components) || !b.Circulates {
			t.Fatalf("%s: %d bars for %d components (circulates %v)", name, len(b.Items), len(cr.Components), b.Circulates)
		}
		var g, losses float64
		for i, it := range b.Items {
			cs := cr.Components[i]
			if it.Name != cs.Component || it.Gravity != cs.DpGravity || it.Friction != cs.DpFriction || it.Local != cs.DpLocal || it.Accel != cs.DpAccel {
				t.Errorf("%s: bar %+v, estimator %+v", name, it, cs)
			}
			g += it.Gravity
			losses += it.Friction + it.Local + it.Accel
		}
		if b.Network != (name == "ferry-cabinet") {
			t.Errorf("%s: network %v", name, b.Network)
		}
		if b.Network {
			// Parallel branches: the flow-weighted totals stand for the loop.
			g, losses = b.Total.Gravity, b.Total.Friction+b.Total.Local+b.Total.Accel
		} else if !near(g, b.Total.Gravity, 1e-9) {
			t.Errorf("%s: total gravity %g, sum of bars %g", name, b.Total.Gravity, g)
		}
		if !(g > 0) || math.Abs(g-losses) > 1e-3*g {
			t.Errorf("%s: gravity gain %g Pa does not balance the losses %g Pa around the loop", name, g, losses)
		}
		// The drawn budget: every term a drop, as the estimator's budget,
		// the whole loop's adding up to zero.
		for i, it := range b.Items {
			if it.Drops != cr.Components[i].Budget {
				t.Errorf("%s: drawn drops %+v, estimator %+v", name, it.Drops, cr.Components[i].Budget)
			}
		}
		d := b.Total.Drops
		if sum := d.Friction + d.Gravity + d.Acceleration + d.AreaChange + d.Local; math.Abs(sum) > 1e-6*(math.Abs(d.Friction)+math.Abs(d.Gravity)) {
			t.Errorf("%s: whole-loop drops add up to %g Pa, not zero", name, sum)
		}
	}
}

// TestTiltMatchesEstimator compares swept points with the estimator run on
// the file edited to that attitude, and the plotted critical angles with
// where the swept flow stops.
func TestTiltMatchesEstimator(t *testing.T) {
	m := loadExample(t, "forestry-inverter")
	tl, err := TiltOf(m, m.Loops[0], "", 0)
	if err != nil {
		t.Fatal(err)
	}
	if len(tl.PitchSweep) != 73 || len(tl.RollSweep) != 73 {
		t.Fatalf("%d pitch and %d roll points, want 73 each (2.5° steps over ±90°)", len(tl.PitchSweep), len(tl.RollSweep))
	}
	at := func(pts []TiltPoint, d float64) TiltPoint {
		for _, p := range pts {
			if math.Abs(deg(p.Angle)-d) < 1e-6 {
				return p
			}
		}
		t.Fatalf("no point at %g°", d)
		return TiltPoint{}
	}
	for _, tc := range []struct {
		field string
		d     float64
		pts   []TiltPoint
	}{{"pitch", 30, tl.PitchSweep}, {"pitch", -20, tl.PitchSweep}, {"roll", 15, tl.RollSweep}, {"pitch", 0, tl.PitchSweep}} {
		edited := loadEdited(t, "forestry-inverter", "case level_work nominal {\n", "case level_work nominal {\n  "+tc.field+" "+formatDeg(tc.d)+" deg\n")
		cr := estimateCase(t, edited, "level_work", false)
		p := at(tc.pts, tc.d)
		if p.Circulates != cr.Circulates || !near(p.MassFlow, cr.MassFlow, 1e-6) {
			t.Errorf("%s %g°: plotted ṁ %g kg/s, estimator %g kg/s", tc.field, tc.d, p.MassFlow, cr.MassFlow)
		}
		worst := 0.0
		for _, mg := range cr.Margins {
			if attitudeMargin(mg.Margin) {
				worst = math.Max(worst, mg.Use)
			}
		}
		if !near(p.WorstUse, worst, 1e-6) {
			t.Errorf("%s %g°: plotted worst use %g, estimator %g", tc.field, tc.d, p.WorstUse, worst)
		}
	}
	// The critical angles bracket where the sweep stops circulating.
	check := func(name string, pts []TiltPoint, crit *float64, sign float64) {
		if crit == nil {
			return
		}
		for _, p := range pts {
			beyond := sign*(p.Angle-*crit) > 1e-9
			inside := sign*p.Angle >= 0 && sign*(*crit-p.Angle) > 1e-9
			if beyond && p.Circulates {
				// Flow may resume far beyond a limit; only the next grid point must have stopped.
				if sign*(p.Angle-*crit) < 2.5*math.Pi/180 {
					t.Errorf("%s: circulates at %.1f°, beyond the critical %.1f°", name, deg(p.Angle), deg(*crit))
				}
			}
			if inside && !p.Circulates {
				t.Errorf("%s: no circulation at %.1f°, before the critical %.1f°", name, deg(p.Angle), deg(*crit))
			}
		}
	}
	check("pitch up", tl.PitchSweep, tl.PitchUp, 1)
	check("pitch down", tl.PitchSweep, tl.PitchDown, -1)
	check("roll left", tl.RollSweep, tl.RollLeft, 1)
	check("roll right", tl.RollSweep, tl.RollRight, -1)
	if tl.PitchUp == nil && tl.PitchDown == nil && tl.RollLeft == nil && tl.RollRight == nil {
		t.Error("no critical angle at all for the inverter loop")
	}
}

func formatDeg(d float64) string { return strconv.FormatFloat(d, 'f', -1, 64) }

// TestGeometryCoordinates checks node positions against the coordinates
// written in the example (rack-door: coil_top at (-0.2 m, 0 m, lift + 0.3 m)
// with lift = 1.2 m).
func TestGeometryCoordinates(t *testing.T) {
	m := loadExample(t, "rack-door")
	g, err := GeometryOf(m.Loops[0])
	if err != nil {
		t.Fatal(err)
	}
	want := map[string][3]float64{
		"base": {0, 0, 0}, "plate_top": {0, 0, 0.35}, "coil_top": {-0.2, 0, 1.5}, "coil_bottom": {-0.2, 0, 1.2},
	}
	for _, n := range g.Nodes {
		w, ok := want[n.Name]
		if !ok {
			t.Errorf("unexpected node %s", n.Name)
			continue
		}
		for k := 0; k < 3; k++ {
			if math.Abs(n.Pos[k]-w[k]) > 1e-12 {
				t.Errorf("node %s at %v, want %v", n.Name, n.Pos, w)
			}
		}
	}
	kinds := map[string]string{}
	for _, c := range g.Components {
		kinds[c.Name] = c.Kind
	}
	if kinds["plate"] != "evaporator" || kinds["coil"] != "condenser" || kinds["sump"] != "reservoir" || len(kinds) != 5 {
		t.Errorf("components %v", kinds)
	}
}

// svgTexts parses an SVG document and returns its text content; it fails
// on anything that is not well-formed XML with an <svg> root.
func svgTexts(t *testing.T, b []byte) string {
	t.Helper()
	d := xml.NewDecoder(bytes.NewReader(b))
	var root string
	var text strings.Builder
	for {
		tok, err := d.Token()
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatalf("SVG is not well-formed XML: %v", err)
		}
		switch x := tok.(type) {
		case xml.StartElement:
			if root == "" {
				root = x.Name.Local
			}
		case xml.CharData:
			text.Write(x)
			text.WriteByte('\n')
		}
	}
	if root != "svg" {
		t.Fatalf("root element %q, want svg", root)
	}
	return text.String()
}

// TestShippedExamples draws every shipped example: four valid figures each.
func TestShippedExamples(t *testing.T) {
	files, _ := filepath.Glob(filepath.Join("..", "..", "testdata", "examples", "*.loop"))
	if len(files) == 0 {
		t.Fatal("no examples")
	}
	for _, f := range files {
		m := lang.Load(f, nil)
		figs, errs := Figures(m, Options{})
		if len(errs) > 0 || len(figs) != 4*len(m.Loops) {
			t.Errorf("%s: %d figures, errors %v", f, len(figs), errs)
		}
		for _, fg := range figs {
			var b bytes.Buffer
			if err := fg.Render(&b, "svg"); err != nil {
				t.Errorf("%s: %v", fg.Name, err)
			}
			svgTexts(t, b.Bytes())
			checkLayout(t, filepath.Base(f)+" "+fg.Name, fg)
		}
	}
}

// TestFiguresRender renders every figure of every fixture as SVG and PNG.
func TestFiguresRender(t *testing.T) {
	wantText := map[string][]string{
		"circulation": {"heat load Q (W)", "mass flow ṁ (g/s)", "exit quality x (–)", "hot_aisle"},
		"budget":      {"pressure drop along the flow (kPa)", "friction", "gravity (hydrostatic)", "flow-area change", "whole loop", "downcomer"},
		"tilt":        {"angle (°)", "mass flow ṁ (g/s)", "worst margin use (–)", "pitch swept", "roll swept"},
		"geometry":    {"x, forward (m)", "z, up (m)", "y, left (m)", "plate", "coil"},
	}
	for _, name := range []string{"rack-door", "ferry-cabinet", "forestry-inverter"} {
		figs, errs := Figures(loadExample(t, name), Options{})
		for _, err := range errs {
			t.Errorf("%s: %v", name, err)
		}
		if len(figs) != 4 {
			t.Fatalf("%s: %d figures, want 4", name, len(figs))
		}
		for _, f := range figs {
			var svg, pngb bytes.Buffer
			if err := f.Render(&svg, "svg"); err != nil {
				t.Fatalf("%s: %v", f.Name, err)
			}
			text := svgTexts(t, svg.Bytes())
			checkLayout(t, name+" "+f.Name, f)
			if name == "rack-door" {
				kind := f.Name[strings.LastIndex(f.Name, "-")+1:]
				for _, w := range wantText[kind] {
					if !strings.Contains(text, w) {
						t.Errorf("%s: no text %q in the SVG", f.Name, w)
					}
				}
			}
			if err := f.Render(&pngb, "png"); err != nil {
				t.Fatalf("%s: %v", f.Name, err)
			}
			img, err := png.Decode(bytes.NewReader(pngb.Bytes()))
			if err != nil || img.Bounds().Dx() < 300 {
				t.Errorf("%s: PNG %v", f.Name, err)
			}
			if dir := os.Getenv("CIRCA_FIGURES"); dir != "" {
				os.WriteFile(filepath.Join(dir, f.Name+".png"), pngb.Bytes(), 0o644)
				os.WriteFile(filepath.Join(dir, f.Name+".svg"), svg.Bytes(), 0o644)
			}
		}
	}
}

// TestUnstableDashed draws a circulation curve with an unstable branch and
// checks that the SVG has a dashed line.
func TestUnstableDashed(t *testing.T) {
	c := &Circulation{Loop: "l", Case: "c"}
	for i := 1; i <= 10; i++ {
		q := float64(i) * 100
		lp := LoadPoint{Scale: float64(i) / 10, Heat: q, Circulates: true, MassFlow: 0.02 + 0.001*float64(i), ExitQuality: 0.01 * float64(i)}
		lp.Stable = []float64{lp.MassFlow}
		if i >= 4 && i <= 7 {
			lp.Unstable = []float64{0.005 + 0.0005*float64(i)}
		}
		c.Sweep = append(c.Sweep, lp)
	}
	var with, without bytes.Buffer
	f, err := c.Figure()
	if err != nil {
		t.Fatal(err)
	}
	f.Render(&with, "svg")
	for i := range c.Sweep {
		c.Sweep[i].Unstable = nil
	}
	f, _ = c.Figure()
	f.Render(&without, "svg")
	svgTexts(t, with.Bytes())
	if !strings.Contains(with.String(), "stroke-dasharray") || strings.Contains(without.String(), "stroke-dasharray") {
		t.Error("the unstable branch should be the only dashed line")
	}
	if !strings.Contains(with.String(), "unstable balance") {
		t.Error("no legend entry for the unstable branch")
	}
}

func TestErrors(t *testing.T) {
	m := loadExample(t, "rack-door")
	if _, err := CirculationOf(m, m.Loops[0], Options{Case: "no_such"}); err == nil || !strings.Contains(err.Error(), "hot_aisle") {
		t.Errorf("unknown case: %v", err)
	}
	if _, err := BudgetOf(m, nil, ""); err == nil {
		t.Error("nil loop accepted")
	}
	if _, err := TiltOf(nil, m.Loops[0], "", 0); err == nil {
		t.Error("nil model accepted")
	}
	if _, err := GeometryOf(nil); err == nil {
		t.Error("nil loop accepted")
	}
	var f *Figure
	if err := f.Render(io.Discard, "svg"); err == nil {
		t.Error("nil figure rendered")
	}
	figs, _ := Figures(m, Options{})
	if err := figs[0].Render(io.Discard, "gif"); err == nil {
		t.Error("gif accepted")
	}
	// A file without cases still gets its geometry; one without a fluid gets
	// reasons, not a panic.
	src := "loop l {\n  node a\n  node b\n  pipe p from a to b { length 1 m; rise 1 m; bore 8 mm }\n  condenser c from b to a { length 1 m; rise -1 m; bore 8 mm }\n}\n"
	m2 := lang.LoadSource("x.loop", []byte(src), nil)
	figs, errs := Figures(m2, Options{})
	if len(figs) != 1 || len(errs) != 0 {
		t.Errorf("no cases: %d figures, errors %v", len(figs), errs)
	}
	m3 := lang.LoadSource("x.loop", []byte(src+"case k { sink 20 °C }\n"), nil)
	figs, errs = Figures(m3, Options{})
	for _, f := range figs {
		if err := f.Render(io.Discard, "svg"); err != nil {
			t.Errorf("%s: %v", f.Name, err)
		}
	}
	if len(figs)+len(errs) != 4 {
		t.Errorf("broken loop: %d figures and %d errors, want 4 in all", len(figs), len(errs))
	}
}

// TestLedineggCurveDashed sweeps the heat of testdata/flow/ledinegg.loop,
// whose excess head has three roots at its nominal 10 kW (hand-worked in
// check/flow's TestLedineggLoop). With the orifice loss the only loss, E > 0
// exactly where y(y+S)²/(1+y)² exceeds a threshold ∝ Q² (y = x·v_lv/v_l,
// S = 19.8); that function has a local minimum 70.9 and maximum 109.4, and
// the threshold is 88.6 at 10 kW, so an unstable middle balance exists for
// loads of 89 % to 111 % of nominal and none at 50 % or 150 % (the same
// arithmetic). The plotted curve must carry that branch as a dashed line.
func TestLedineggCurveDashed(t *testing.T) {
	m := lang.Load(filepath.Join("..", "..", "testdata", "flow", "ledinegg.loop"), nil)
	for _, d := range m.Diags {
		if d.Severity == lang.Error {
			t.Fatalf("ledinegg.loop: %s", d.Message())
		}
	}
	render := func(scales []float64) (*Circulation, string) {
		c, err := CirculationOf(m, m.Loops[0], Options{Scales: scales})
		if err != nil {
			t.Fatal(err)
		}
		f, err := c.Figure()
		if err != nil {
			t.Fatal(err)
		}
		var b bytes.Buffer
		f.Render(&b, "svg")
		svgTexts(t, b.Bytes())
		return c, b.String()
	}
	c, svg := render(nil)
	for _, p := range c.Sweep {
		inBand := p.Scale > 0.91 && p.Scale < 1.09 // inside 89 % to 111 %, the arithmetic above
		outBand := p.Scale < 0.88 || p.Scale > 1.12
		if outBand && len(p.Unstable) != 0 {
			t.Errorf("at %.0f %%: unstable balances %v, want none", 100*p.Scale, p.Unstable)
		}
		if !inBand {
			continue
		}
		if len(p.Unstable) != 1 || len(p.Stable) != 2 {
			t.Errorf("at %.0f %%: %d stable, %d unstable balances, want 2 and 1", 100*p.Scale, len(p.Stable), len(p.Unstable))
			continue
		}
		if !(p.Unstable[0] > p.Stable[0] && p.Unstable[0] < p.Stable[1] && p.MassFlow == p.Stable[1]) {
			t.Errorf("at %.0f %%: stable %v, unstable %v, estimate %g: want the unstable one between and the upper one as the estimate", 100*p.Scale, p.Stable, p.Unstable, p.MassFlow)
		}
	}
	if !strings.Contains(svg, "stroke-dasharray") || !strings.Contains(svg, "unstable balance") {
		t.Error("the unstable branch is not drawn dashed with its legend entry")
	}
	if _, svg := render([]float64{0.5, 0.75, 1.25, 1.5}); strings.Contains(svg, "stroke-dasharray") {
		t.Error("a dashed line where no balance is unstable")
	}
}
