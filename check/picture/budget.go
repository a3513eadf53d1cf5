package picture

import (
	"fmt"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"circa/check/flow"
	"circa/lang"
)

// Budget is the pressure budget around a loop in one case: for each
// component, the pressure gained by gravity along the flow (negative where
// the flow rises through a light mixture) and the friction, local and
// acceleration losses, all in Pa; Total sums them over the loop, where the
// net gravity gain is the driving head and balances the losses. In a
// network of parallel branches Total weights each component by its share of
// the loop flow, so the branches add like one loop.
type Budget struct {
	Loop       string
	Case       string
	Network    bool
	Circulates bool
	MassFlow   float64 // kg/s
	Reason     string  // why the loop does not circulate
	Items      []BudgetItem
	Total      BudgetItem
}

// BudgetItem is one component's share of the budget (or the loop's total).
type BudgetItem struct {
	Name     string
	Kind     string
	Gravity  float64 // gravity gain along the flow, Pa
	Friction float64 // Pa
	Local    float64 // Pa
	Accel    float64 // Pa
	// Drops is the same budget with every term a drop along the flow, the
	// acceleration split into phase change and flow-area change: what the
	// figure draws, as the estimate's tables print it.
	Drops flow.Budget
}

// BudgetOf estimates the pressure budget of loop l in the named case (""
// for the nominal one).
func BudgetOf(m *lang.Model, l *lang.Loop, caseName string) (*Budget, error) {
	if l == nil {
		return nil, fmt.Errorf("no loop")
	}
	c, err := caseOf(m, caseName)
	if err != nil {
		return nil, err
	}
	lr := flow.EstimateLoop(m, l, flow.Options{Case: c.Name, NoTilt: true})
	if len(lr.Cases) != 1 {
		return nil, fmt.Errorf("loop %s cannot be estimated: %s", l.Name, findingText(lr.Findings))
	}
	cr := lr.Cases[0]
	if !cr.Circulates {
		// A budget of no flow is an empty figure.
		return nil, fmt.Errorf("case %s does not circulate (%s): no pressure budget to draw", cr.Case, cr.Reason)
	}
	b := &Budget{Loop: l.Name, Case: cr.Case, Network: lr.Network, Circulates: cr.Circulates, MassFlow: finite(cr.MassFlow), Reason: cr.Reason}
	for _, cs := range cr.Components {
		b.Items = append(b.Items, BudgetItem{Name: cs.Component, Kind: cs.Kind, Gravity: finite(cs.DpGravity),
			Friction: finite(cs.DpFriction), Local: finite(cs.DpLocal), Accel: finite(cs.DpAccel), Drops: cs.Budget})
	}
	t := cr.Totals
	name := "whole loop"
	if lr.Network {
		name = "whole loop\n(branches by flow)"
	}
	b.Total = BudgetItem{Name: name, Gravity: finite(t.Gravity), Friction: finite(t.Friction),
		Local: finite(t.Local), Accel: finite(t.Accel), Drops: t.Budget}
	return b, nil
}

// Figure draws the budget as grouped bars: per component and for the whole
// loop, the pressure drop along the flow by friction, gravity, acceleration
// by phase change, flow-area change and local losses, each bar with its
// value. Every term is a drop (positive where the pressure falls), so the
// bars of a group add up to its total and the whole loop's to zero.
func (b *Budget) Figure() (*Figure, error) {
	if b == nil {
		return nil, fmt.Errorf("no budget data")
	}
	items := append(append([]BudgetItem(nil), b.Items...), b.Total)
	series := []struct {
		label string
		get   func(flow.Budget) float64
	}{
		{"friction", func(d flow.Budget) float64 { return d.Friction }},
		{"gravity (hydrostatic)", func(d flow.Budget) float64 { return d.Gravity }},
		{"acceleration (phase change)", func(d flow.Budget) float64 { return d.Acceleration }},
		{"flow-area change", func(d flow.Budget) float64 { return d.AreaChange }},
		{"local", func(d flow.Budget) float64 { return d.Local }},
	}
	max := 0.0
	for _, it := range items {
		for _, s := range series {
			max = math.Max(max, math.Abs(s.get(it.Drops)))
		}
	}
	ps, pu := scaleOf(max, "Pa", "kPa")
	title := fmt.Sprintf("case %s: ṁ = %.1f g/s", b.Case, b.MassFlow*1e3)
	if !b.Circulates {
		title = fmt.Sprintf("case %s: no circulation (%s)", b.Case, b.Reason)
	}
	p, rec := newPanel(title, "", fmt.Sprintf("pressure drop along the flow (%s)", pu))
	leg := newLegend(rec, 1, 0)
	names := make([]string, len(items))
	for i, it := range items {
		names[i] = it.Name
		if it.Kind != "" {
			names[i] = it.Name + "\n(" + it.Kind + ")"
		}
	}
	width := vg.Length(math.Max(18, 3.4*float64(len(items)))) * vg.Centimeter
	// Bars fill about 70 % of each group's share of the width.
	w := vg.Length(math.Min(13, 0.7*float64(width)*0.85/float64(len(items)*len(series))))
	var valPts plotter.XYs
	var valTexts []string
	var above []float64
	lo, hi := 0.0, 0.0
	for k, s := range series {
		vals := make(plotter.Values, len(items))
		for i, it := range items {
			vals[i] = s.get(it.Drops) * ps
			lo, hi = math.Min(lo, vals[i]), math.Max(hi, vals[i])
		}
		bar, err := plotter.NewBarChart(vals, w)
		if err != nil {
			return nil, err
		}
		bar.Color = style(k)
		bar.LineStyle.Width = 0
		bar.Offset = w * vg.Length(float64(k)-float64(len(series)-1)/2)
		p.Add(bar)
		leg.Add(s.label, bar)
		// Each bar's value at its end; x in bar units from the group centre.
		for i, v := range vals {
			valPts = append(valPts, plotter.XY{X: float64(i), Y: v})
			valTexts = append(valTexts, barValue(v))
			above = append(above, map[bool]float64{true: 1, false: -1}[v >= 0])
		}
	}
	zero, err := plotter.NewLine(plotter.XYs{{X: -0.5, Y: 0}, {X: float64(len(items)) - 0.5, Y: 0}})
	if err != nil {
		return nil, err
	}
	zero.Width = vg.Points(0.8)
	p.Add(zero)
	p.NominalX(names...)
	pad := 0.12 * (hi - lo)
	if !(pad > 0) {
		pad = 1
	}
	p.Y.Min, p.Y.Max = lo-pad, hi+0.55*(hi-lo)+pad // room above the bars for the legend
	p.Y.Tick.Marker = niceTicks{}
	p.X.Tick.Label.Font.Size = vg.Points(9)
	p.Add(&barValues{labels: labels{rec: rec, pts: valPts, texts: valTexts, style: textStyle(6.5), above: above, legend: leg},
		groups: len(items), series: len(series), width: w})
	p.Add(leg)
	return &Figure{Name: "budget", Title: fmt.Sprintf("Pressure budget of loop %s", b.Loop),
		rows: [][]*plot.Plot{{p}}, recs: []*PanelLayout{rec}, width: width, height: 13 * vg.Centimeter}, nil
}

// barValue writes a bar's value with two significant digits at least;
// a bar too short to see gets no value ("").
func barValue(v float64) string {
	a := math.Abs(v)
	switch {
	case a < 0.005:
		return ""
	case a >= 100:
		return fmt.Sprintf("%.0f", v)
	case a >= 10:
		return fmt.Sprintf("%.1f", v)
	}
	return fmt.Sprintf("%.2f", v)
}

// barValues labels each bar at its end; it places the labels as labels
// does, from the bar's own x within its group.
type barValues struct {
	labels
	groups, series int
	width          vg.Length
}

func (bv *barValues) Plot(c draw.Canvas, plt *plot.Plot) {
	trX, _ := plt.Transforms(&c)
	// Shift each point by its bar's offset, in data units.
	unit := float64(trX(1) - trX(0))
	_, trY := plt.Transforms(&c)
	lb := bv.labels
	lb.pts = append(plotter.XYs(nil), bv.pts...)
	lb.extra = nil
	for j := range lb.pts {
		k := j / bv.groups
		off := float64(bv.width) * (float64(k) - float64(bv.series-1)/2)
		lb.pts[j].X += off / unit
		// The bar itself, kept clear by every value.
		x, y0, y1 := trX(lb.pts[j].X), trY(0), trY(lb.pts[j].Y)
		if y1 < y0 {
			y0, y1 = y1, y0
		}
		lb.extra = append(lb.extra, vg.Rectangle{Min: vg.Point{X: x - bv.width/2, Y: y0}, Max: vg.Point{X: x + bv.width/2, Y: y1}})
	}
	lb.Plot(c, plt)
}
