package picture

import (
	"fmt"
	"image/color"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"circa/check/vary"
	"circa/units"
)

// VaryFigure draws a parameter sweep of one loop: each margin's use of its
// limit, in its worst case, against the parameter, with the limit at 100 %
// and the file's own value marked. A sweep of two parameters draws the
// limiting margin's use against the first, one line per value of the
// second. Points without circulation or an estimate leave gaps.
func VaryFigure(r *vary.Result, loop string) (*Figure, error) {
	if r == nil || len(r.Params) == 0 || len(r.Points) == 0 {
		return nil, fmt.Errorf("no sweep")
	}
	px := r.Params[0]
	toX := func(si float64) float64 { return si }
	xlabel := px.Param
	if u, err := units.Parse(px.Unit); px.Unit != "" && err == nil {
		toX = func(si float64) float64 { return u.FromSI(si) }
		xlabel = fmt.Sprintf("%s (%s)", px.Param, units.Pretty(u.Text))
	} else if px.Dimension != "dimensionless number" {
		xlabel = fmt.Sprintf("%s (SI)", px.Param)
	}
	panel, rec := newPanel("", xlabel, "use of the limit (%)")
	leg := newLegend(rec, 1, 0, 3, 2)
	type series struct {
		name string
		runs []plotter.XYs
	}
	var all []series
	// line splits the points of one line into runs between gaps.
	line := func(name string, ys []float64, ok []bool, xs []float64) series {
		s := series{name: name}
		var run plotter.XYs
		for i := range xs {
			if !ok[i] {
				if len(run) > 0 {
					s.runs = append(s.runs, run)
				}
				run = nil
				continue
			}
			run = append(run, plotter.XY{X: xs[i], Y: ys[i]})
		}
		if len(run) > 0 {
			s.runs = append(s.runs, run)
		}
		return s
	}
	xs := make([]float64, len(px.Values))
	for i, v := range px.Values {
		xs[i] = finite(toX(v))
	}
	at := func(i, j int) *vary.Point {
		for k := range r.Points {
			p := &r.Points[k]
			if p.Index[0] == i && (len(p.Index) == 1 || p.Index[1] == j) {
				return p
			}
		}
		return nil
	}
	loopAt := func(p *vary.Point) *vary.Loop {
		if p == nil || p.Error != "" {
			return nil
		}
		for k := range p.Loops {
			if p.Loops[k].Loop == loop && len(p.Loops[k].NoCirculation) == 0 {
				return &p.Loops[k]
			}
		}
		return nil
	}
	if len(r.Params) == 1 {
		for _, name := range r.MarginNames(loop) {
			ys, ok := make([]float64, len(xs)), make([]bool, len(xs))
			for i := range xs {
				if l := loopAt(at(i, 0)); l != nil {
					for _, mg := range l.Margins {
						if mg.Margin == name {
							ys[i], ok[i] = finite(100*mg.Use), true
						}
					}
				}
			}
			all = append(all, line(name, ys, ok, xs))
		}
	} else {
		py := r.Params[1]
		for j, w := range py.Written {
			ys, ok := make([]float64, len(xs)), make([]bool, len(xs))
			for i := range xs {
				if l := loopAt(at(i, j)); l != nil && l.Limiting != nil {
					ys[i], ok[i] = finite(100*l.Limiting.Use), true
				}
			}
			all = append(all, line(fmt.Sprintf("limiting margin, %s = %s", py.Param, w), ys, ok, xs))
		}
	}
	maxY := 100.0
	drawn := 0
	for k, s := range all {
		if len(s.runs) == 0 {
			continue
		}
		for i, run := range s.runs {
			for _, p := range run {
				maxY = math.Max(maxY, p.Y)
			}
			ln, err := plotter.NewLine(run)
			if err != nil {
				return nil, err
			}
			ln.Color, ln.Width = style(k), vg.Points(1.6)
			panel.Add(ln)
			dots, err := plotter.NewScatter(run)
			if err != nil {
				return nil, err
			}
			dots.Color, dots.Radius, dots.Shape = style(k), vg.Points(1.8), draw.CircleGlyph{}
			panel.Add(dots)
			if i == 0 {
				leg.Add(s.name, ln, dots)
			}
			leg.Avoid(run)
		}
		drawn++
	}
	if drawn == 0 {
		return nil, fmt.Errorf("loop %s has no margin at any point of the sweep", loop)
	}
	lo, hi := xs[0], xs[len(xs)-1]
	if lo > hi {
		lo, hi = hi, lo
	}
	pad := 0.04 * (hi - lo)
	panel.X.Min, panel.X.Max = lo-pad, hi+pad
	panel.Y.Min = 0
	// Headroom for the legend, one line per entry.
	panel.Y.Max = maxY * (1.15 + 0.07*float64(len(leg.entries)))
	panel.Add(&limitLine{rec: rec, at: 100, name: "limit (100 %)", line: limitStyle, style: textStyle(8), legend: leg})
	if fv := px.FileValue; fv != nil {
		if x := toX(*fv); x >= panel.X.Min && x <= panel.X.Max {
			panel.Add(&limitLine{rec: rec, at: x, vertical: true, name: "file: " + px.FileWritten,
				line: draw.LineStyle{Color: color.Gray{Y: 110}, Width: vg.Points(1), Dashes: dashed}, style: textStyle(8), legend: leg})
		}
	}
	panel.Add(leg)
	name, title := "vary-"+px.Param, fmt.Sprintf("Margins of loop %s against %s", loop, px.Param)
	if len(r.Params) == 2 {
		name += "-" + r.Params[1].Param
		title = fmt.Sprintf("Limiting margin of loop %s against %s and %s", loop, px.Param, r.Params[1].Param)
	}
	return &Figure{Name: name, Title: title, rows: [][]*plot.Plot{{panel}}, recs: []*PanelLayout{rec},
		width: 18 * vg.Centimeter, height: 12 * vg.Centimeter}, nil
}
