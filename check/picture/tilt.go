package picture

import (
	"fmt"
	"math"
	"slices"
	"sort"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"circa/check/flow"
	"circa/lang"
)

// Tilt is the tilt envelope of a loop around one case: the estimate with
// the pitch swept (roll kept at the case's) and with the roll swept (pitch
// kept), and the critical angles where circulation stops. Angles are in
// radians.
type Tilt struct {
	Loop        string
	Case        string
	Pitch, Roll float64 // the case's own attitude
	PitchSweep  []TiltPoint
	RollSweep   []TiltPoint
	// Critical attitudes found by the estimator's search from the case (nil:
	// none within half a turn of it).
	PitchUp, PitchDown, RollLeft, RollRight *float64
	// CaseFails names the attitude-dependent margin that already reaches
	// its limit at the case's own attitude ("" when none does).
	CaseFails string
}

// TiltPoint is the estimate at one angle.
type TiltPoint struct {
	Angle      float64 // rad
	Circulates bool
	MassFlow   float64 // kg/s
	// WorstUse is the largest fraction of a design limit used (1: at the
	// limit) at this attitude, over the margins that depend on the
	// circulation (AttitudeMargins); the charge, pressure and condenser
	// margins do not change with attitude and are left out, and the loss
	// reserve (a second solve per point) is not evaluated on sweeps.
	WorstUse float64
	// Worst names that margin and its component ("exit_quality cold_plate").
	Worst string
}

// AttitudeMargins are the margins TiltPoint.WorstUse takes into account.
var AttitudeMargins = []string{flow.MarginExitQuality, flow.MarginCHF, flow.MarginFlooding, flow.MarginWall, flow.MarginJunction}

func attitudeMargin(name string) bool {
	for _, m := range AttitudeMargins {
		if m == name {
			return true
		}
	}
	return false
}

// TiltOf estimates the tilt envelope of loop l around the named case (""
// for the nominal one), every step radians from −90° to 90°.
func TiltOf(m *lang.Model, l *lang.Loop, caseName string, step float64) (*Tilt, error) {
	if l == nil {
		return nil, fmt.Errorf("no loop")
	}
	c, err := caseOf(m, caseName)
	if err != nil {
		return nil, err
	}
	if !(step > 0) || step > math.Pi/4 {
		step = 2.5 * math.Pi / 180
	}
	var angles []float64
	n := int(math.Round(math.Pi / step))
	for i := 0; i <= n; i++ {
		angles = append(angles, -math.Pi/2+float64(i)*math.Pi/float64(n))
	}
	t := &Tilt{Loop: l.Name, Case: c.Name, Pitch: finite(c.Pitch.SI), Roll: finite(c.Roll.SI)}
	// The case's own point leads each sweep; only the pitch sweep's is
	// read (its margins and tilt limits), so the roll sweep skips its tilt
	// search, and of the one read only what is read is kept, not every
	// component's state.
	sweep := func(sw *flow.Sweep, noTilt bool) ([]TiltPoint, *flow.CaseResult, error) {
		lr := flow.EstimateLoop(m, l, flow.Options{Case: c.Name, Sweep: sw, SweepMargins: true, NoTilt: noTilt})
		if len(lr.Cases) != len(angles)+1 {
			return nil, nil, fmt.Errorf("loop %s cannot be estimated: %s", l.Name, findingText(lr.Findings))
		}
		var pts []TiltPoint
		for i, cr := range lr.Cases[1:] {
			tp := TiltPoint{Angle: angles[i], Circulates: cr.Circulates}
			if cr.Circulates {
				tp.MassFlow = finite(cr.MassFlow)
			}
			for _, mg := range cr.Margins {
				if !attitudeMargin(mg.Margin) {
					continue
				}
				if u := finite(mg.Use); u > tp.WorstUse || tp.Worst == "" {
					tp.WorstUse = math.Max(tp.WorstUse, u)
					tp.Worst = strings.TrimSpace(mg.Margin + " " + mg.Component)
				}
			}
			pts = append(pts, tp)
		}
		base := flow.CaseResult{Circulates: lr.Cases[0].Circulates, Margins: lr.Cases[0].Margins, Tilt: lr.Cases[0].Tilt}
		return pts, &base, nil
	}
	var base *flow.CaseResult
	if t.PitchSweep, base, err = sweep(&flow.Sweep{Pitch: angles}, false); err != nil {
		return nil, err
	}
	if t.RollSweep, _, err = sweep(&flow.Sweep{Roll: angles}, true); err != nil {
		return nil, err
	}
	circ := func(p TiltPoint) bool { return p.Circulates }
	if !slices.ContainsFunc(t.PitchSweep, circ) && !slices.ContainsFunc(t.RollSweep, circ) {
		return nil, fmt.Errorf("case %s circulates at no pitch or roll: no tilt figure to draw", c.Name)
	}
	worst := 0.0
	for _, mg := range base.Margins {
		if attitudeMargin(mg.Margin) && mg.Use >= 1 && mg.Use > worst {
			worst, t.CaseFails = mg.Use, strings.TrimSpace(mg.Margin+" "+mg.Component)
		}
	}
	if !base.Circulates {
		t.CaseFails = "circulation stops"
	}
	if tl := base.Tilt; tl != nil {
		t.PitchUp, t.PitchDown, t.RollLeft, t.RollRight = finitePtr(tl.PitchUp), finitePtr(tl.PitchDown), finitePtr(tl.RollLeft), finitePtr(tl.RollRight)
	}
	return t, nil
}

func finitePtr(p *float64) *float64 {
	if p == nil || math.IsNaN(*p) || math.IsInf(*p, 0) {
		return nil
	}
	v := *p
	return &v
}

// Figure draws the envelope: mass flow (top) and the worst margin use
// (bottom) against pitch and roll, with the critical angles as vertical
// dashed lines and the case's attitude marked.
func (t *Tilt) Figure() (*Figure, error) {
	if t == nil || len(t.PitchSweep) == 0 {
		return nil, fmt.Errorf("no tilt data")
	}
	top, topRec := newPanel(fmt.Sprintf("around case %s (pitch %.1f°, roll %.1f°)", t.Case, deg(t.Pitch), deg(t.Roll)),
		"angle (°)", "mass flow ṁ (g/s)")
	bottom, bottomRec := newPanel("", "angle (°)", "worst margin use (–)")
	topLeg, bottomLeg := newLegend(topRec, 1, 0, 3, 2), newLegend(bottomRec, 1, 0, 3, 2)
	bottom.Title.Text = "exit quality, CHF, flooding and wall temperature margins"
	bottom.Title.TextStyle.Font.Size = vg.Points(9)
	maxFlow, maxUse := 0.0, 1.0
	for k, sw := range []struct {
		name string
		pts  []TiltPoint
	}{{"pitch", t.PitchSweep}, {"roll", t.RollSweep}} {
		var fl, use plotter.XYs
		for _, p := range sw.pts {
			fl = append(fl, plotter.XY{X: deg(p.Angle), Y: p.MassFlow * 1e3})
			if p.Circulates {
				use = append(use, plotter.XY{X: deg(p.Angle), Y: p.WorstUse})
				maxUse = math.Max(maxUse, p.WorstUse)
			}
			maxFlow = math.Max(maxFlow, p.MassFlow*1e3)
		}
		lf, err := plotter.NewLine(fl)
		if err != nil {
			return nil, err
		}
		lf.Color, lf.Width = style(k), vg.Points(1.8)
		top.Add(lf)
		topLeg.Add(sw.name+" swept", lf)
		topLeg.Avoid(fl)
		if len(use) > 0 {
			su, err := plotter.NewScatter(use)
			if err != nil {
				return nil, err
			}
			su.Color, su.Radius = style(k), vg.Points(1.8)
			if k == 1 {
				su.Shape = draw.RingGlyph{}
			}
			bottom.Add(su)
			bottomLeg.Add(sw.name+" swept", su)
			clipped := make(plotter.XYs, len(use))
			for i, u := range use {
				clipped[i] = plotter.XY{X: u.X, Y: math.Min(u.Y, 5)}
			}
			bottomLeg.Avoid(clipped)
		}
	}
	if maxFlow <= 0 {
		maxFlow = 1
	}
	if maxUse > 5 {
		maxUse = 5 // keep the limit line readable; larger uses are off the chart
	}
	// Critical angles, named at the top of their lines.
	for k, crit := range [][2]*float64{{t.PitchUp, t.PitchDown}, {t.RollLeft, t.RollRight}} {
		for _, a := range crit {
			if a == nil || math.Abs(deg(*a)) > 90 {
				continue // beyond the axes: the estimate's text names it
			}
			top.Add(&limitLine{rec: topRec, at: deg(*a), vertical: true, name: fmt.Sprintf("%.1f°", deg(*a)),
				line: draw.LineStyle{Color: style(k), Width: vg.Points(1), Dashes: dashed}, style: textStyle(8), legend: topLeg})
		}
	}
	// The case's attitude.
	if cp, err := plotter.NewScatter(plotter.XYs{{X: deg(t.Pitch), Y: flowAt(t.PitchSweep, t.Pitch) * 1e3},
		{X: deg(t.Roll), Y: flowAt(t.RollSweep, t.Roll) * 1e3}}); err == nil {
		cp.Shape, cp.Radius, cp.Color = draw.BoxGlyph{}, vg.Points(3), style(2)
		top.Add(cp)
		topLeg.Add("case "+t.Case, cp)
	}
	bottom.Add(&limitLine{rec: bottomRec, at: 1, name: "limit reached (use 1)",
		line: limitStyle, style: textStyle(8), legend: bottomLeg})
	for _, p := range []*plot.Plot{top, bottom} {
		p.X.Min, p.X.Max = -90, 90
		p.X.Tick.Marker = angleTicks{}
		p.Y.Min = 0
	}
	top.Y.Max = maxFlow * 1.45 // room for the legend and the angle labels
	bottom.Y.Max = maxUse * 1.3
	top.Add(topLeg)
	bottom.Add(bottomLeg)
	return &Figure{Name: "tilt", Title: fmt.Sprintf("Tilt envelope of loop %s", t.Loop),
		rows: [][]*plot.Plot{{top}, {bottom}}, recs: []*PanelLayout{topRec, bottomRec}, width: 18 * vg.Centimeter, height: 18 * vg.Centimeter}, nil
}

// flowAt returns the swept mass flow at the angle nearest a.
func flowAt(pts []TiltPoint, a float64) float64 {
	best, d := 0.0, math.Inf(1)
	for _, p := range pts {
		if e := math.Abs(p.Angle - a); e < d {
			best, d = p.MassFlow, e
		}
	}
	return best
}

// angleTicks marks every 30° with a label and every 10° without.
type angleTicks struct{}

func (angleTicks) Ticks(min, max float64) []plot.Tick {
	var ts []plot.Tick
	for a := -90.0; a <= 90; a += 10 {
		if a < min-1e-9 || a > max+1e-9 {
			continue
		}
		t := plot.Tick{Value: a}
		if int(a)%30 == 0 {
			t.Label = fmt.Sprintf("%.0f", a)
		}
		ts = append(ts, t)
	}
	return ts
}

// TiltFailure is where, going one way from a case's attitude, the first
// attitude-dependent margin reaches its limit or circulation stops.
type TiltFailure struct {
	Axis   string  // "pitch" or "roll"
	Sign   int     // +1: increasing angle, −1: decreasing
	Angle  float64 // rad; the first swept angle that fails
	What   string  // the margin and component, or "circulation stops"
	Found  bool    // false: nothing fails up to ±90°
	AtCase bool    // the case's own attitude already fails
}

// FirstFailures scans the envelope outward from the case's attitude, in
// both directions of pitch and of roll, to the first swept angle where a
// margin reaches its limit (use ≥ 1) or circulation stops. The answer is
// as fine as the sweep's step.
func (t *Tilt) FirstFailures() []TiltFailure {
	var out []TiltFailure
	for _, sw := range []struct {
		axis string
		pts  []TiltPoint
		from float64
	}{{"pitch", t.PitchSweep, t.Pitch}, {"roll", t.RollSweep, t.Roll}} {
		for _, sign := range []int{1, -1} {
			f := TiltFailure{Axis: sw.axis, Sign: sign, Angle: float64(sign) * math.Pi / 2}
			if t.CaseFails != "" {
				f.Found, f.AtCase, f.Angle, f.What = true, true, sw.from, t.CaseFails
				out = append(out, f)
				continue
			}
			pts := append([]TiltPoint(nil), sw.pts...)
			sort.Slice(pts, func(i, j int) bool { return float64(sign)*pts[i].Angle < float64(sign)*pts[j].Angle })
			for _, p := range pts {
				if float64(sign)*(p.Angle-sw.from) < -1e-9 {
					continue
				}
				if !p.Circulates || p.WorstUse >= 1 {
					f.Found, f.Angle = true, p.Angle
					f.What = p.Worst
					if !p.Circulates {
						f.What = "circulation stops"
					}
					break
				}
			}
			out = append(out, f)
		}
	}
	return out
}
