package picture

import (
	"image/color"
	"math"
	"strconv"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// TextBox is a piece of text a figure placed itself (a label, a value on a
// bar, a limit's name) and the rectangle it covers, in points with y up.
type TextBox struct {
	Text string
	Rect vg.Rectangle
}

// Mark is a limit or reference line a figure drew, from end to end.
type Mark struct {
	Name     string
	From, To vg.Point
}

// PanelLayout is where one panel of a drawn figure put its data area, its
// legend, the texts it placed and its limit lines, so that a test can
// check that nothing overlaps and nothing falls outside the axes.
type PanelLayout struct {
	Data   vg.Rectangle
	Legend vg.Rectangle // zero without a legend
	Texts  []TextBox
	Marks  []Mark
}

// Layout is the layout of every panel of a figure, in drawing order.
type Layout struct {
	Panels []PanelLayout
}

// Layout draws the figure (discarding the drawing) and returns where its
// panels put their texts, legends and limit lines.
func (f *Figure) Layout() (*Layout, error) {
	if err := f.Render(discard{}, "svg"); err != nil {
		return nil, err
	}
	l := &Layout{}
	for _, r := range f.recs {
		l.Panels = append(l.Panels, *r)
	}
	return l, nil
}

type discard struct{}

func (discard) Write(p []byte) (int, error) { return len(p), nil }

// Overlaps reports whether two rectangles share more than a hairline.
func Overlaps(a, b vg.Rectangle) bool {
	const eps = 0.01
	return a.Min.X < b.Max.X-eps && b.Min.X < a.Max.X-eps && a.Min.Y < b.Max.Y-eps && b.Min.Y < a.Max.Y-eps
}

// Inside reports whether r lies within outer (to a hairline).
func Inside(r, outer vg.Rectangle) bool {
	const eps = 0.01
	return r.Min.X >= outer.Min.X-eps && r.Max.X <= outer.Max.X+eps && r.Min.Y >= outer.Min.Y-eps && r.Max.Y <= outer.Max.Y+eps
}

// recorder notes a panel's data area when the panel is drawn; it is the
// first plotter of every panel.
type recorder struct{ rec *PanelLayout }

func (r recorder) Plot(c draw.Canvas, _ *plot.Plot) {
	*r.rec = PanelLayout{Data: c.Rectangle}
}

func textStyle(size float64) draw.TextStyle {
	return draw.TextStyle{Color: color.Black, Font: font.From(plot.DefaultFont, vg.Points(size)), Handler: plot.DefaultTextHandler}
}

// drawText writes txt with its box's lower left corner at at, and returns
// the box.
func drawText(c draw.Canvas, sty draw.TextStyle, at vg.Point, txt string) vg.Rectangle {
	sty.XAlign, sty.YAlign = draw.XLeft, draw.YBottom
	r := sty.Rectangle(txt)
	c.FillText(sty, vg.Point{X: at.X - r.Min.X, Y: at.Y - r.Min.Y}, txt)
	return vg.Rectangle{Min: at, Max: vg.Point{X: at.X + r.Size().X, Y: at.Y + r.Size().Y}}
}

// legendBox is a legend drawn inside the data area on a white ground, in
// the corner that hides the fewest data points.
type legendBox struct {
	rec     *PanelLayout
	entries []legendEntry
	style   draw.TextStyle
	series  []plotter.XYs // data to keep clear
	corners []int         // preferred order: 0 top left, 1 top right, 2 bottom left, 3 bottom right
}

type legendEntry struct {
	text   string
	thumbs []plot.Thumbnailer
}

func newLegend(rec *PanelLayout, corners ...int) *legendBox {
	if len(corners) == 0 {
		corners = []int{1, 0, 3, 2}
	}
	return &legendBox{rec: rec, style: textStyle(8.5), corners: corners}
}

// Add adds an entry.
func (l *legendBox) Add(text string, thumbs ...plot.Thumbnailer) {
	l.entries = append(l.entries, legendEntry{text, thumbs})
}

// Avoid adds data the legend should not cover.
func (l *legendBox) Avoid(xy ...plotter.XYs) { l.series = append(l.series, xy...) }

const (
	legendPad   = vg.Length(3)
	legendThumb = vg.Length(16)
	legendInset = vg.Length(4)
)

func (l *legendBox) lineHeight() vg.Length {
	e := l.style.FontExtents()
	return vg.Length(e.Height) + 1
}

func (l *legendBox) size() (w, h vg.Length) {
	for _, e := range l.entries {
		w = vg.Length(math.Max(float64(w), float64(l.style.Width(e.text))))
	}
	w += legendThumb + 4 + 2*legendPad
	h = vg.Length(len(l.entries))*l.lineHeight() + 2*legendPad
	return
}

// rect is where the legend goes on the data canvas c.
func (l *legendBox) rect(c draw.Canvas, plt *plot.Plot) vg.Rectangle {
	if l == nil || len(l.entries) == 0 {
		return vg.Rectangle{}
	}
	w, h := l.size()
	d := c.Rectangle
	at := func(corner int) vg.Rectangle {
		var r vg.Rectangle
		if corner%2 == 0 {
			r.Min.X = d.Min.X + legendInset
		} else {
			r.Min.X = d.Max.X - legendInset - w
		}
		if corner < 2 {
			r.Min.Y = d.Max.Y - legendInset - h
		} else {
			r.Min.Y = d.Min.Y + legendInset
		}
		r.Max = vg.Point{X: r.Min.X + w, Y: r.Min.Y + h}
		return r
	}
	trX, trY := plt.Transforms(&c)
	best, bestN := at(l.corners[0]), -1
	for _, k := range l.corners {
		r := at(k)
		n := 0
		for _, s := range l.series {
			for i, p := range s {
				pts := []plotter.XY{p}
				if i > 0 {
					for f := 0.25; f < 1; f += 0.25 {
						pts = append(pts, plotter.XY{X: s[i-1].X + f*(p.X-s[i-1].X), Y: s[i-1].Y + f*(p.Y-s[i-1].Y)})
					}
				}
				for _, q := range pts {
					x, y := trX(q.X), trY(q.Y)
					if x >= r.Min.X && x <= r.Max.X && y >= r.Min.Y && y <= r.Max.Y {
						n++
					}
				}
			}
		}
		if bestN < 0 || n < bestN {
			best, bestN = r, n
		}
	}
	return best
}

func (l *legendBox) Plot(c draw.Canvas, plt *plot.Plot) {
	if len(l.entries) == 0 {
		return
	}
	r := l.rect(c, plt)
	c.FillPolygon(color.White, []vg.Point{r.Min, {X: r.Max.X, Y: r.Min.Y}, r.Max, {X: r.Min.X, Y: r.Max.Y}})
	c.StrokeLines(draw.LineStyle{Color: color.Gray{Y: 170}, Width: vg.Points(0.5)},
		[]vg.Point{r.Min, {X: r.Max.X, Y: r.Min.Y}, r.Max, {X: r.Min.X, Y: r.Max.Y}, r.Min})
	lh := l.lineHeight()
	y := r.Max.Y - legendPad
	for _, e := range l.entries {
		icon := &draw.Canvas{Canvas: c.Canvas, Rectangle: vg.Rectangle{
			Min: vg.Point{X: r.Min.X + legendPad, Y: y - lh + 1}, Max: vg.Point{X: r.Min.X + legendPad + legendThumb, Y: y - 1}}}
		for _, t := range e.thumbs {
			t.Thumbnail(icon)
		}
		h := l.style.Rectangle(e.text).Size().Y
		drawText(c, l.style, vg.Point{X: r.Min.X + legendPad + legendThumb + 4, Y: y - lh + (lh-h)/2}, e.text)
		y -= lh
	}
	l.rec.Legend = r
}

// labels places texts next to data points without overlapping each other,
// the points' marks, the legend or the texts placed before; a label moved
// away from its point gets a thin leader line.
type labels struct {
	rec    *PanelLayout
	pts    plotter.XYs
	texts  []string
	style  draw.TextStyle
	mark   vg.Length // half-size of the marks at the points
	legend *legendBox
	// above prefers places above (positive values) or below (negative)
	// the point, per label; nil: beside it.
	above []float64
	// extra are more rectangles to keep clear, in canvas units.
	extra []vg.Rectangle
}

func (lb *labels) Plot(c draw.Canvas, plt *plot.Plot) {
	trX, trY := plt.Transforms(&c)
	var obstacles []vg.Rectangle
	if lr := lb.legend.rect(c, plt); lr != (vg.Rectangle{}) {
		obstacles = append(obstacles, lr)
	}
	for _, t := range lb.rec.Texts {
		obstacles = append(obstacles, t.Rect)
	}
	obstacles = append(obstacles, lb.extra...)
	pts := make([]vg.Point, len(lb.pts))
	for i, p := range lb.pts {
		pts[i] = vg.Point{X: trX(p.X), Y: trY(p.Y)}
		m := lb.mark
		obstacles = append(obstacles, vg.Rectangle{Min: vg.Point{X: pts[i].X - m, Y: pts[i].Y - m}, Max: vg.Point{X: pts[i].X + m, Y: pts[i].Y + m}})
	}
	lead := draw.LineStyle{Color: color.Gray{Y: 110}, Width: vg.Points(0.4)}
	for i, txt := range lb.texts {
		if txt == "" {
			continue
		}
		sz := lb.style.Rectangle(txt).Size()
		p := pts[i]
		gap := lb.mark + 2
		place := func(x, y vg.Length) vg.Rectangle {
			return vg.Rectangle{Min: vg.Point{X: x, Y: y}, Max: vg.Point{X: x + sz.X, Y: y + sz.Y}}
		}
		var cands []vg.Rectangle
		up := 0.0
		if lb.above != nil {
			up = lb.above[i]
		}
		switch {
		case up > 0:
			cands = append(cands, place(p.X-sz.X/2, p.Y+gap), place(p.X-sz.X/2, p.Y+gap+sz.Y), place(p.X-sz.X/2, p.Y+gap+2*sz.Y))
		case up < 0:
			cands = append(cands, place(p.X-sz.X/2, p.Y-gap-sz.Y), place(p.X-sz.X/2, p.Y-gap-2*sz.Y), place(p.X-sz.X/2, p.Y-gap-3*sz.Y))
		}
		cands = append(cands,
			place(p.X+gap, p.Y-sz.Y/2), place(p.X-gap-sz.X, p.Y-sz.Y/2),
			place(p.X+gap, p.Y+gap/2), place(p.X+gap, p.Y-gap/2-sz.Y),
			place(p.X-sz.X/2, p.Y+gap), place(p.X-sz.X/2, p.Y-gap-sz.Y),
			place(p.X-gap-sz.X, p.Y+gap/2), place(p.X-gap-sz.X, p.Y-gap/2-sz.Y))
		// Stacked beside the point, further out, with a leader line.
		for k := 1; k <= 16; k++ {
			dy := vg.Length(k) * (sz.Y + 1)
			for _, side := range []vg.Length{1, -1} {
				x := p.X + 3*gap
				if side < 0 {
					x = p.X - 3*gap - sz.X
				}
				cands = append(cands, place(x, p.Y-sz.Y/2+dy), place(x, p.Y-sz.Y/2-dy))
			}
		}
		best, bestCost := cands[0], math.Inf(1)
		for k, r := range cands {
			cost := float64(k) * 1e-6
			if !Inside(r, c.Rectangle) {
				cost += 1e6
			}
			for _, o := range obstacles {
				if Overlaps(r, o) {
					cost += 1e3 + overlapArea(r, o)
				}
			}
			if cost < bestCost {
				best, bestCost = r, cost
			}
			if cost < 1 {
				break
			}
		}
		if !nearPoint(best, p, gap+sz.Y) {
			// A leader from the point to the nearer side of the text.
			x := best.Min.X
			if p.X > best.Max.X {
				x = best.Max.X
			}
			c.StrokeLine2(lead, p.X, p.Y, x, (best.Min.Y+best.Max.Y)/2)
		}
		drawText(c, lb.style, best.Min, txt)
		lb.rec.Texts = append(lb.rec.Texts, TextBox{txt, best})
		obstacles = append(obstacles, best)
	}
}

func overlapArea(a, b vg.Rectangle) float64 {
	w := math.Min(float64(a.Max.X), float64(b.Max.X)) - math.Max(float64(a.Min.X), float64(b.Min.X))
	h := math.Min(float64(a.Max.Y), float64(b.Max.Y)) - math.Max(float64(a.Min.Y), float64(b.Min.Y))
	if w <= 0 || h <= 0 {
		return 0
	}
	return w * h
}

// nearPoint reports whether a text box touches the neighbourhood of p.
func nearPoint(r vg.Rectangle, p vg.Point, d vg.Length) bool {
	return r.Min.X-d <= p.X && p.X <= r.Max.X+d && r.Min.Y-d <= p.Y && p.Y <= r.Max.Y+d
}

// limitLine draws a horizontal (or vertical) limit across the data area,
// with its name at the end of the line.
type limitLine struct {
	rec      *PanelLayout
	at       float64 // data value
	vertical bool
	name     string
	line     draw.LineStyle
	style    draw.TextStyle
	legend   *legendBox
}

func (l *limitLine) Plot(c draw.Canvas, plt *plot.Plot) {
	trX, trY := plt.Transforms(&c)
	d := c.Rectangle
	var from, to vg.Point
	if l.vertical {
		x := trX(l.at)
		from, to = vg.Point{X: x, Y: d.Min.Y}, vg.Point{X: x, Y: d.Max.Y}
	} else {
		y := trY(l.at)
		from, to = vg.Point{X: d.Min.X, Y: y}, vg.Point{X: d.Max.X, Y: y}
	}
	c.StrokeLine2(l.line, from.X, from.Y, to.X, to.Y)
	l.rec.Marks = append(l.rec.Marks, Mark{l.name, from, to})
	if l.name == "" {
		return
	}
	sz := l.style.Rectangle(l.name).Size()
	var cands []vg.Rectangle
	box := func(x, y vg.Length) vg.Rectangle {
		return vg.Rectangle{Min: vg.Point{X: x, Y: y}, Max: vg.Point{X: x + sz.X, Y: y + sz.Y}}
	}
	if l.vertical {
		for _, f := range []vg.Length{1, 0.75, 0.5, 0.25, 0} {
			y := d.Min.Y + 2 + f*(d.Size().Y-sz.Y-4)
			cands = append(cands, box(from.X+2, y), box(from.X-2-sz.X, y))
		}
	} else {
		cands = []vg.Rectangle{box(d.Max.X-sz.X-3, from.Y+1.5), box(d.Max.X-sz.X-3, from.Y-1.5-sz.Y), box(d.Min.X+3, from.Y+1.5), box(d.Min.X+3, from.Y-1.5-sz.Y)}
	}
	lr := l.legend.rect(c, plt)
	best := cands[0]
	for _, r := range cands {
		if Inside(r, d) {
			best = r // inside at least, should all else fail
			break
		}
	}
	for _, r := range cands {
		ok := Inside(r, d) && (lr == (vg.Rectangle{}) || !Overlaps(r, lr))
		for _, t := range l.rec.Texts {
			ok = ok && !Overlaps(r, t.Rect)
		}
		if ok {
			best = r
			break
		}
	}
	drawText(c, l.style, best.Min, l.name)
	l.rec.Texts = append(l.rec.Texts, TextBox{l.name, best})
}

// niceTicks labels every major tick at a round step (1, 2, 2.5 or 5 times
// a power of ten) chosen for five to eight labels, with a minor tick
// between.
type niceTicks struct{}

func (niceTicks) Ticks(min, max float64) []plot.Tick {
	if !(max > min) {
		return []plot.Tick{{Value: min, Label: plainLabel(min, 1)}}
	}
	// The largest round step that still gives five labels.
	mag := math.Pow(10, math.Floor(math.Log10(max-min)))
	step := mag / 10
	for _, f := range []float64{10, 5, 2.5, 2, 1, 0.5, 0.25, 0.2, 0.1} {
		s := f * mag / 10
		if math.Floor(max/s+1e-9)-math.Ceil(min/s-1e-9)+1 >= 5 {
			step = s
			break
		}
	}
	var ts []plot.Tick
	for v := math.Ceil(min/step-1e-9) * step; v <= max+1e-9*step; v += step {
		x := v
		if math.Abs(x) < 1e-9*step {
			x = 0
		}
		ts = append(ts, plot.Tick{Value: x, Label: plainLabel(x, step)})
		if m := x + step/2; m <= max {
			ts = append(ts, plot.Tick{Value: m})
		}
	}
	if first := math.Ceil(min/step-1e-9)*step - step/2; first >= min {
		ts = append(ts, plot.Tick{Value: first})
	}
	return ts
}

// plainLabel writes v rounded to the decimals step needs, without
// trailing zeros.
func plainLabel(v, step float64) string {
	dec := 0
	for s := step; dec < 6 && math.Abs(s-math.Round(s)) > 1e-9*math.Max(1, math.Abs(s)); s *= 10 {
		dec++
	}
	p := math.Pow(10, float64(dec))
	return strconv.FormatFloat(math.Round(v*p)/p, 'f', -1, 64)
}
