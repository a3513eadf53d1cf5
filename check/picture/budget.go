package picture

import (
	"fmt"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"

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
	b := &Budget{Loop: l.Name, Case: cr.Case, Network: lr.Network, Circulates: cr.Circulates, MassFlow: finite(cr.MassFlow), Reason: cr.Reason}
	for _, cs := range cr.Components {
		b.Items = append(b.Items, BudgetItem{Name: cs.Component, Kind: cs.Kind, Gravity: finite(cs.DpGravity),
			Friction: finite(cs.DpFriction), Local: finite(cs.DpLocal), Accel: finite(cs.DpAccel)})
	}
	t := cr.Totals
	name := "whole loop"
	if lr.Network {
		name = "whole loop\n(branches by flow)"
	}
	b.Total = BudgetItem{Name: name, Gravity: finite(t.Gravity), Friction: finite(t.Friction),
		Local: finite(t.Local), Accel: finite(t.Accel)}
	return b, nil
}

// Figure draws the budget as grouped bars: per component and for the whole
// loop, the gravity gain against the friction, local and acceleration
// losses.
func (b *Budget) Figure() (*Figure, error) {
	if b == nil {
		return nil, fmt.Errorf("no budget data")
	}
	items := append(append([]BudgetItem(nil), b.Items...), b.Total)
	max := 0.0
	for _, it := range items {
		for _, v := range []float64{it.Gravity, it.Friction, it.Local, it.Accel} {
			max = math.Max(max, math.Abs(v))
		}
	}
	ps, pu := scaleOf(max, "Pa", "kPa")
	title := fmt.Sprintf("case %s: ṁ = %.1f g/s", b.Case, b.MassFlow*1e3)
	if !b.Circulates {
		title = fmt.Sprintf("case %s: no circulation (%s)", b.Case, b.Reason)
	}
	p := newPanel(title, "", fmt.Sprintf("pressure change along the flow (%s)", pu))
	names := make([]string, len(items))
	for i, it := range items {
		names[i] = it.Name
		if it.Kind != "" {
			names[i] = it.Name + "\n(" + it.Kind + ")"
		}
	}
	series := []struct {
		label string
		get   func(BudgetItem) float64
	}{
		{"gravity gain (driving head)", func(it BudgetItem) float64 { return it.Gravity }},
		{"friction loss", func(it BudgetItem) float64 { return it.Friction }},
		{"local loss", func(it BudgetItem) float64 { return it.Local }},
		{"acceleration loss", func(it BudgetItem) float64 { return it.Accel }},
	}
	w := vg.Points(math.Min(14, 300/float64(len(items)*len(series))))
	for k, s := range series {
		vals := make(plotter.Values, len(items))
		for i, it := range items {
			vals[i] = s.get(it) * ps
		}
		bar, err := plotter.NewBarChart(vals, w)
		if err != nil {
			return nil, err
		}
		bar.Color = style(k)
		bar.LineStyle.Width = 0
		bar.Offset = w * vg.Length(float64(k)-float64(len(series)-1)/2)
		p.Add(bar)
		p.Legend.Add(s.label, bar)
	}
	zero, err := plotter.NewLine(plotter.XYs{{X: -0.5, Y: 0}, {X: float64(len(items)) - 0.5, Y: 0}})
	if err != nil {
		return nil, err
	}
	zero.Width = vg.Points(0.8)
	p.Add(zero)
	p.NominalX(names...)
	lo, hi := 0.0, 0.0
	for _, it := range items {
		for _, v := range []float64{it.Gravity, it.Friction, it.Local, it.Accel} {
			lo, hi = math.Min(lo, v*ps), math.Max(hi, v*ps)
		}
	}
	pad := 0.08 * (hi - lo)
	if !(pad > 0) {
		pad = 1
	}
	p.Y.Min, p.Y.Max = lo-pad, hi+0.45*(hi-lo)+pad // room above the bars for the legend
	p.X.Tick.Label.Font.Size = vg.Points(9)
	width := vg.Length(math.Max(18, 3.2*float64(len(items)))) * vg.Centimeter
	return &Figure{Name: "budget", Title: fmt.Sprintf("Pressure budget of loop %s", b.Loop),
		rows: [][]*plot.Plot{{p}}, width: width, height: 13 * vg.Centimeter}, nil
}
