package picture

import (
	"fmt"
	"image/color"
	"io"
	"math"
	"strconv"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/plotutil"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	_ "gonum.org/v1/plot/vg/vgimg" // png
	_ "gonum.org/v1/plot/vg/vgsvg" // svg
)

// Formats are the output formats Render accepts.
var Formats = []string{"svg", "png"}

// Figure is a drawn figure: one or more panels in a grid of rows.
type Figure struct {
	// Name is a short file-name stem ("circulation", "budget", "tilt", "geometry").
	Name   string
	Title  string
	rows   [][]*plot.Plot
	recs   []*PanelLayout // filled as the panels are drawn
	width  vg.Length
	height vg.Length
}

// Render writes the figure in format ("svg" or "png").
func (f *Figure) Render(w io.Writer, format string) error {
	format = strings.ToLower(format)
	ok := false
	for _, x := range Formats {
		ok = ok || x == format
	}
	if !ok {
		return fmt.Errorf("unknown figure format %q (want %s)", format, strings.Join(Formats, " or "))
	}
	if f == nil || len(f.rows) == 0 {
		return fmt.Errorf("empty figure")
	}
	c, err := draw.NewFormattedCanvas(f.width, f.height, format)
	if err != nil {
		return err
	}
	dc := draw.New(c)
	// Title across the top.
	top := vg.Length(0)
	if f.Title != "" {
		sty := draw.TextStyle{Color: color.Black, Font: font.From(plot.DefaultFont, vg.Points(13)),
			XAlign: draw.XCenter, YAlign: draw.YTop, Handler: plot.DefaultTextHandler}
		dc.FillText(sty, vg.Point{X: (dc.Min.X + dc.Max.X) / 2, Y: dc.Max.Y - vg.Points(6)}, f.Title)
		top = vg.Points(26)
	}
	body := draw.Crop(dc, 0, 0, 0, -top)
	cols := 0
	for _, r := range f.rows {
		if len(r) > cols {
			cols = len(r)
		}
	}
	tiles := draw.Tiles{Rows: len(f.rows), Cols: cols, PadX: vg.Points(18), PadY: vg.Points(12),
		PadTop: vg.Points(4), PadBottom: vg.Points(4), PadLeft: vg.Points(4), PadRight: vg.Points(10)}
	grid := make([][]*plot.Plot, len(f.rows))
	for i, r := range f.rows {
		grid[i] = make([]*plot.Plot, cols)
		copy(grid[i], r)
	}
	canvases := plot.Align(grid, tiles, body)
	for i := range grid {
		for j, p := range grid[i] {
			if p != nil {
				p.Draw(canvases[i][j])
			}
		}
	}
	_, err = c.WriteTo(w)
	return err
}

// newPanel returns a plot with the house look: labelled axes, a grid and a
// legend at the top right; rec receives its layout when it is drawn.
func newPanel(title, xlabel, ylabel string) (*plot.Plot, *PanelLayout) {
	p := plot.New()
	rec := &PanelLayout{}
	p.Add(recorder{rec})
	p.Title.Text = title
	p.X.Label.Text = xlabel
	p.Y.Label.Text = ylabel
	p.X.Tick.Marker = plainTicks{}
	p.Y.Tick.Marker = plainTicks{}
	p.Add(plotter.NewGrid())
	p.Legend.Top = true
	p.Legend.Left = false
	p.Legend.TextStyle.Font.Size = vg.Points(9)
	p.Legend.Padding = vg.Points(1.5)
	return p, rec
}

// style returns the i-th line colour of the default palette.
func style(i int) color.Color { return plotutil.Color(i) }

var dashed = []vg.Length{vg.Points(6), vg.Points(4)}

// limitStyle draws a design limit: solid and dark red, since dashes mark
// statically unstable balances.
var limitStyle = draw.LineStyle{Color: color.RGBA{R: 170, A: 255}, Width: vg.Points(1.2)}

// finite replaces NaN and ±Inf by 0 so no non-finite number reaches a
// figure or a caller.
func finite(x float64) float64 {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return 0
	}
	return x
}

// scaleOf picks a display unit for values of magnitude up to max: the SI
// unit, or its kilo multiple from 2000 up.
func scaleOf(max float64, unit, kunit string) (float64, string) {
	if math.Abs(max) >= 2000 {
		return 1e-3, kunit
	}
	return 1, unit
}

func deg(rad float64) float64 { return rad * 180 / math.Pi }

// plainTicks are gonum's default tick positions labelled with as few
// digits as each value needs ("50", "2.5"), instead of a common precision.
type plainTicks struct{}

func (plainTicks) Ticks(min, max float64) []plot.Tick {
	ts := plot.DefaultTicks{}.Ticks(min, max)
	for i := range ts {
		if ts[i].Label != "" {
			v := ts[i].Value
			if math.Abs(v) < 1e-9*math.Max(math.Abs(min), math.Abs(max)) {
				v = 0
			}
			ts[i].Label = strconv.FormatFloat(v, 'f', -1, 64)
			if len(ts[i].Label) > 8 {
				ts[i].Label = strconv.FormatFloat(v, 'g', 4, 64)
			}
		}
	}
	return ts
}
