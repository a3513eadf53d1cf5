package picture

import (
	"fmt"
	"math"
	"slices"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"circa/check/flow"
	"circa/lang"
)

// Options adjust the figures.
type Options struct {
	// Case is the case the circulation curve sweeps, the budget shows and
	// the tilt envelope starts from ("": the nominal case).
	Case string
	// Scales are the fractions of the case's heat loads the circulation
	// curve evaluates (nil: 5 % to 150 % in steps of 5 %).
	Scales []float64
	// TiltStep is the angle step of the tilt envelope in radians (0: 2.5°).
	TiltStep float64
}

func (o Options) scales() []float64 {
	if len(o.Scales) > 0 {
		return o.Scales
	}
	var s []float64
	for i := 1; i <= 30; i++ {
		s = append(s, float64(i)*0.05)
	}
	return s
}

// Circulation is the circulation curve of one loop: the case's heat loads
// scaled, each evaluated at the case's attitude, and every case's operating
// point.
type Circulation struct {
	Loop  string
	Case  string // the swept case
	Sweep []LoadPoint
	Cases []CasePoint
	// ExitQualityLimit is the exit-quality limit the margins use (0 when
	// no case has one).
	ExitQualityLimit float64
}

// LoadPoint is the estimate at one fraction of the swept case's loads.
type LoadPoint struct {
	Scale       float64 // fraction of the case's loads
	Heat        float64 // total evaporator load, W
	Circulates  bool
	MassFlow    float64   // the estimate (stable balance of highest flow), kg/s; 0 without circulation
	ExitQuality float64   // highest evaporator outlet quality at the estimate
	Stable      []float64 // mass flow of every stable balance found, kg/s
	Unstable    []float64 // mass flow of every statically unstable balance (dE/dṁ > 0), kg/s
}

// CasePoint is one case's operating point.
type CasePoint struct {
	Case        string
	Heat        float64 // W
	Circulates  bool
	MassFlow    float64 // kg/s
	ExitQuality float64
}

// caseOf returns the named case, or the nominal one for "".
func caseOf(m *lang.Model, name string) (*lang.Case, error) {
	if m == nil {
		return nil, fmt.Errorf("no model")
	}
	if name == "" {
		if m.Nominal == nil {
			return nil, fmt.Errorf("the file has no case")
		}
		return m.Nominal, nil
	}
	if c := m.Case(name); c != nil {
		return c, nil
	}
	var names []string
	for _, c := range m.Cases {
		names = append(names, c.Name)
	}
	return nil, fmt.Errorf("no case %q (cases: %v)", name, names)
}

// scaledCase returns a copy of c with every evaporator of l loaded at s
// times its load in c (the case's heat, else the evaporator's own).
func scaledCase(c *lang.Case, l *lang.Loop, s float64, name string) *lang.Case {
	sc := *c
	sc.Name = name
	sc.Nominal = false
	sc.Heat = nil
	for _, comp := range l.Components {
		if comp.Kind != lang.Evaporator {
			continue
		}
		q := comp.Heat.SI
		for _, h := range c.Heat {
			if h.Comp == comp {
				q = h.Value.SI
			}
		}
		sc.Heat = append(sc.Heat, lang.CompValue{Comp: comp, Value: lang.Value{SI: finite(q * s), Set: true}})
	}
	return &sc
}

// withCases returns a shallow copy of m whose cases are cs.
func withCases(m *lang.Model, cs []*lang.Case) *lang.Model {
	mm := *m
	mm.Cases = cs
	mm.Nominal = nil
	if len(cs) > 0 {
		mm.Nominal = cs[0]
	}
	return &mm
}

func exitQuality(cr flow.CaseResult) float64 {
	// Below 0 when every outlet is subcooled (local saturation at a light
	// load): the plot shows it rather than a flat zero.
	x := math.Inf(-1)
	for _, c := range cr.Components {
		if c.Kind == "evaporator" && c.XOut > x {
			x = c.XOut
		}
	}
	if math.IsInf(x, -1) {
		return 0
	}
	return finite(x)
}

// CirculationOf estimates the circulation curve of loop l of m.
func CirculationOf(m *lang.Model, l *lang.Loop, o Options) (*Circulation, error) {
	if l == nil {
		return nil, fmt.Errorf("no loop")
	}
	base, err := caseOf(m, o.Case)
	if err != nil {
		return nil, err
	}
	scales := o.scales()
	cs := make([]*lang.Case, len(scales))
	for i, s := range scales {
		cs[i] = scaledCase(base, l, s, fmt.Sprintf("%s at %.0f %%", base.Name, 100*s))
	}
	lr := flow.EstimateLoop(withCases(m, cs), l, flow.Options{NoTilt: true})
	if len(lr.Cases) != len(cs) {
		return nil, fmt.Errorf("loop %s cannot be estimated: %s", l.Name, findingText(lr.Findings))
	}
	out := &Circulation{Loop: l.Name, Case: base.Name}
	for i, cr := range lr.Cases {
		lp := LoadPoint{Scale: scales[i], Heat: finite(cr.Heat), Circulates: cr.Circulates}
		if cr.Circulates {
			lp.MassFlow = finite(cr.MassFlow)
			lp.ExitQuality = exitQuality(cr)
		}
		for _, r := range cr.Roots {
			if r.Stable {
				lp.Stable = append(lp.Stable, finite(r.MassFlow))
			} else {
				lp.Unstable = append(lp.Unstable, finite(r.MassFlow))
			}
		}
		out.Sweep = append(out.Sweep, lp)
	}
	if !slices.ContainsFunc(out.Sweep, func(p LoadPoint) bool { return p.Circulates }) {
		return nil, fmt.Errorf("the loop circulates at no load from %.0f %% to %.0f %% of case %s: no circulation curve to draw",
			100*scales[0], 100*scales[len(scales)-1], base.Name)
	}
	all := flow.EstimateLoop(m, l, flow.Options{NoTilt: true})
	for _, cr := range all.Cases {
		cp := CasePoint{Case: cr.Case, Heat: finite(cr.Heat), Circulates: cr.Circulates}
		if cr.Circulates {
			cp.MassFlow = finite(cr.MassFlow)
			cp.ExitQuality = exitQuality(cr)
		}
		out.Cases = append(out.Cases, cp)
		for _, mg := range cr.Margins {
			if mg.Margin == flow.MarginExitQuality && mg.Limit > 0 {
				out.ExitQualityLimit = finite(mg.Limit)
			}
		}
	}
	return out, nil
}

func findingText(fs []flow.Finding) string {
	if len(fs) == 0 {
		return "no result"
	}
	return fs[0].Message
}

// Figure draws the circulation curve: mass flow (top) and exit quality
// (bottom) against heat load; the estimate solid, statically unstable
// balances dashed, the cases as labelled points.
func (c *Circulation) Figure() (*Figure, error) {
	if c == nil || len(c.Sweep) == 0 {
		return nil, fmt.Errorf("no circulation data")
	}
	maxQ := 0.0
	for _, p := range c.Sweep {
		maxQ = math.Max(maxQ, p.Heat)
	}
	for _, p := range c.Cases {
		maxQ = math.Max(maxQ, p.Heat)
	}
	qs, qu := scaleOf(maxQ, "W", "kW")
	xlabel := fmt.Sprintf("heat load Q (%s)", qu)

	top, topRec := newPanel("", xlabel, "mass flow ṁ (g/s)")
	bottom, bottomRec := newPanel("", xlabel, "exit quality x (–)")
	topLeg, bottomLeg := newLegend(topRec, 0, 1, 3, 2), newLegend(bottomRec, 0, 1, 3, 2)

	// Stable estimate, in runs of consecutive circulating points.
	var flowRuns, qualRuns []plotter.XYs
	var fr, qr plotter.XYs
	for _, p := range c.Sweep {
		if !p.Circulates {
			if len(fr) > 0 {
				flowRuns, qualRuns = append(flowRuns, fr), append(qualRuns, qr)
			}
			fr, qr = nil, nil
			continue
		}
		fr = append(fr, plotter.XY{X: p.Heat * qs, Y: p.MassFlow * 1e3})
		qr = append(qr, plotter.XY{X: p.Heat * qs, Y: p.ExitQuality})
	}
	if len(fr) > 0 {
		flowRuns, qualRuns = append(flowRuns, fr), append(qualRuns, qr)
	}
	for i := range flowRuns {
		lf, err := plotter.NewLine(flowRuns[i])
		if err != nil {
			return nil, err
		}
		lf.Color, lf.Width = style(0), vg.Points(1.8)
		top.Add(lf)
		lq, err := plotter.NewLine(qualRuns[i])
		if err != nil {
			return nil, err
		}
		lq.Color, lq.Width = style(0), vg.Points(1.8)
		bottom.Add(lq)
		if i == 0 {
			topLeg.Add(fmt.Sprintf("estimate, loads of %s scaled", c.Case), lf)
			bottomLeg.Add(fmt.Sprintf("estimate, loads of %s scaled", c.Case), lq)
		}
		topLeg.Avoid(flowRuns[i])
		bottomLeg.Avoid(qualRuns[i])
	}
	// Unstable balances: dashed through the first unstable root of each load.
	var un plotter.XYs
	var unAll plotter.XYs
	for _, p := range c.Sweep {
		for k, u := range p.Unstable {
			unAll = append(unAll, plotter.XY{X: p.Heat * qs, Y: u * 1e3})
			if k == 0 {
				un = append(un, plotter.XY{X: p.Heat * qs, Y: u * 1e3})
			}
		}
	}
	if len(un) > 0 {
		lu, err := plotter.NewLine(un)
		if err != nil {
			return nil, err
		}
		lu.Color, lu.Width, lu.Dashes = style(1), vg.Points(1.4), dashed
		top.Add(lu)
		topLeg.Add("unstable balance (dE/dṁ > 0)", lu)
		topLeg.Avoid(un, unAll)
		if len(unAll) > len(un) {
			su, err := plotter.NewScatter(unAll)
			if err != nil {
				return nil, err
			}
			su.Color, su.Shape, su.Radius = style(1), draw.RingGlyph{}, vg.Points(2)
			top.Add(su)
		}
	}
	// Other stable balances (low-flow branch), as small dots.
	var other plotter.XYs
	for _, p := range c.Sweep {
		for _, s := range p.Stable {
			if math.Abs(s-p.MassFlow) > 1e-9*math.Max(1, s) {
				other = append(other, plotter.XY{X: p.Heat * qs, Y: s * 1e3})
			}
		}
	}
	if len(other) > 0 {
		so, err := plotter.NewScatter(other)
		if err != nil {
			return nil, err
		}
		so.Color, so.Radius = style(0), vg.Points(1.5)
		top.Add(so)
		topLeg.Add("other stable balance", so)
		topLeg.Avoid(other)
	}
	// Cases.
	var pf, pq plotter.XYs
	var names []string
	for _, p := range c.Cases {
		if !p.Circulates {
			continue
		}
		pf = append(pf, plotter.XY{X: p.Heat * qs, Y: p.MassFlow * 1e3})
		pq = append(pq, plotter.XY{X: p.Heat * qs, Y: p.ExitQuality})
		names = append(names, p.Case)
	}
	// The exit-quality limit, kept inside the axes.
	if lim := c.ExitQualityLimit; lim > 0 {
		bottom.Add(&limitLine{rec: bottomRec, at: lim, name: fmt.Sprintf("exit-quality limit %g", lim),
			line: limitStyle, style: textStyle(8), legend: bottomLeg})
	}
	var caseLabels []*labels
	if len(pf) > 0 {
		for _, pair := range []struct {
			panel *plot.Plot
			rec   *PanelLayout
			leg   *legendBox
			xy    plotter.XYs
		}{{top, topRec, topLeg, pf}, {bottom, bottomRec, bottomLeg, pq}} {
			s, err := plotter.NewScatter(pair.xy)
			if err != nil {
				return nil, err
			}
			s.Color, s.Shape, s.Radius = style(2), draw.BoxGlyph{}, vg.Points(3)
			pair.panel.Add(s)
			pair.leg.Add("cases", s)
			pair.leg.Avoid(pair.xy)
			caseLabels = append(caseLabels, &labels{rec: pair.rec, pts: pair.xy, texts: names, style: textStyle(8), mark: 3, legend: pair.leg})
		}
	}
	if len(flowRuns) == 0 && len(pf) == 0 {
		top.Title.Text = "no circulation at any load"
	}
	maxF, maxX := 0.0, 0.0
	for _, p := range c.Sweep {
		maxF = math.Max(maxF, p.MassFlow*1e3)
		maxX = math.Max(maxX, p.ExitQuality)
		for _, u := range append(append([]float64(nil), p.Stable...), p.Unstable...) {
			maxF = math.Max(maxF, u*1e3)
		}
	}
	for _, p := range c.Cases {
		maxF = math.Max(maxF, p.MassFlow*1e3)
		maxX = math.Max(maxX, p.ExitQuality)
	}
	if !(maxF > 0) {
		maxF = 1
	}
	if !(maxX > 0) {
		maxX = 0.1
	}
	maxX = math.Max(maxX, c.ExitQualityLimit)
	for _, p := range []*plot.Plot{top, bottom} {
		p.X.Min, p.X.Max = 0, maxQ*qs*1.12 // room for the case labels
		p.Y.Min = 0
	}
	// Headroom for the legend and the labels of cases that share a load.
	top.Y.Max, bottom.Y.Max = maxF*1.3, maxX*1.3
	for _, lb := range caseLabels {
		if lb.rec == topRec {
			top.Add(lb)
		} else {
			bottom.Add(lb)
		}
	}
	top.Add(topLeg)
	bottom.Add(bottomLeg)
	return &Figure{Name: "circulation", Title: fmt.Sprintf("Circulation of loop %s", c.Loop),
		rows: [][]*plot.Plot{{top}, {bottom}}, recs: []*PanelLayout{topRec, bottomRec}, width: 18 * vg.Centimeter, height: 18 * vg.Centimeter}, nil
}
