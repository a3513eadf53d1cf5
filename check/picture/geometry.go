package picture

import (
	"fmt"
	"image/color"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"circa/check/geom"
	"circa/lang"
)

// Geometry is a loop's layout in the equipment frame (x forward, y left, z
// up), in metres, as placed from coordinates, runs and rises.
type Geometry struct {
	Loop       string
	Nodes      []GeomNode
	Components []GeomComponent
}

// GeomNode is one placed node.
type GeomNode struct {
	Name string
	Pos  [3]float64
	// Known is false when only the node's elevation is known (it was
	// reached through rises); x and y are then borrowed from a neighbour.
	Known bool
}

// GeomComponent is one component drawn as the straight chord from its
// inlet to its outlet (a reservoir: its node).
type GeomComponent struct {
	Name     string
	Kind     string
	From, To [3]float64
}

// GeometryOf places loop l.
func GeometryOf(l *lang.Loop) (*Geometry, error) {
	if l == nil {
		return nil, fmt.Errorf("no loop")
	}
	lay := geom.Place(l)
	g := &Geometry{Loop: l.Name}
	pos := func(n *lang.Node) ([3]float64, bool) {
		if n == nil || n.Index < 0 || n.Index >= len(lay.Pos) {
			return [3]float64{}, false
		}
		p := lay.Pos[n.Index]
		return [3]float64{finite(p[0]), finite(p[1]), finite(p[2])}, true
	}
	for _, n := range l.Nodes {
		p, _ := pos(n)
		g.Nodes = append(g.Nodes, GeomNode{Name: n.Name, Pos: p, Known: lay.Known[n.Index]})
	}
	for _, c := range l.Components {
		from, ok := pos(c.From)
		if !ok {
			continue
		}
		to := from
		if c.Kind != lang.Reservoir {
			if to, ok = pos(c.To); !ok {
				continue
			}
		}
		g.Components = append(g.Components, GeomComponent{Name: c.Name, Kind: c.Kind.String(), From: from, To: to})
	}
	return g, nil
}

// Figure draws the side view (x–z) and the front view (y–z) at the same
// scale on both axes: evaporators and condensers thick and labelled, other
// components thin, nodes as dots and reservoirs as squares.
func (g *Geometry) Figure() (*Figure, error) {
	if g == nil || len(g.Nodes) == 0 {
		return nil, fmt.Errorf("no geometry")
	}
	side, sideRec := newPanel("side view (from the right)", "x, forward (m)", "z, up (m)")
	front, frontRec := newPanel("front view (from ahead)", "y, left (m)", "z, up (m)")
	// Common scale: the largest extent of x, y and z.
	lo, hi := [3]float64{math.Inf(1), math.Inf(1), math.Inf(1)}, [3]float64{math.Inf(-1), math.Inf(-1), math.Inf(-1)}
	for _, n := range g.Nodes {
		for k := 0; k < 3; k++ {
			lo[k], hi[k] = math.Min(lo[k], n.Pos[k]), math.Max(hi[k], n.Pos[k])
		}
	}
	span := 0.0
	for k := 0; k < 3; k++ {
		span = math.Max(span, hi[k]-lo[k])
	}
	if !(span > 0) {
		span = 1
	}
	span *= 1.25
	kinds := []struct {
		kind  string
		width vg.Length
		color color.Color
		label string
	}{
		{"evaporator", 4, style(0), "evaporator (heated)"},
		{"condenser", 4, style(2), "condenser (cooled)"},
		{"pipe", 1.5, color.Gray{Y: 90}, "pipe"},
		{"bend", 1.5, style(3), "bend"},
		{"fitting", 1.5, style(4), "fitting"},
	}
	leg := newLegend(sideRec, 0, 1, 2, 3)
	for vi, view := range []struct {
		p    *plot.Plot
		rec  *PanelLayout
		h, v int
	}{{side, sideRec, 0, 2}, {front, frontRec, 1, 2}} {
		seen := map[string]bool{}
		var names []string
		var mids plotter.XYs
		var segs []plotter.XYs
		for _, c := range g.Components {
			if c.Kind == "reservoir" {
				s, err := plotter.NewScatter(plotter.XYs{{X: c.From[view.h], Y: c.From[view.v]}})
				if err != nil {
					return nil, err
				}
				s.Shape, s.Radius, s.Color = draw.BoxGlyph{}, vg.Points(5), style(5)
				view.p.Add(s)
				if !seen["reservoir"] && vi == 0 {
					leg.Add("reservoir", s)
				}
				segs = append(segs, plotter.XYs{{X: c.From[view.h], Y: c.From[view.v]}})
				seen["reservoir"] = true
				continue
			}
			k := kinds[2]
			for _, kk := range kinds {
				if kk.kind == c.Kind {
					k = kk
				}
			}
			seg := plotter.XYs{{X: c.From[view.h], Y: c.From[view.v]}, {X: c.To[view.h], Y: c.To[view.v]}}
			segs = append(segs, seg)
			ln, err := plotter.NewLine(seg)
			if err != nil {
				return nil, err
			}
			ln.Color, ln.Width = k.color, vg.Points(float64(k.width))
			view.p.Add(ln)
			if !seen[c.Kind] && vi == 0 {
				leg.Add(k.label, ln)
			}
			seen[c.Kind] = true
			if c.Kind == "evaporator" || c.Kind == "condenser" {
				mids = append(mids, plotter.XY{X: (c.From[view.h] + c.To[view.h]) / 2, Y: (c.From[view.v] + c.To[view.v]) / 2})
				names = append(names, c.Name)
			}
		}
		// Nodes.
		var pts plotter.XYs
		for _, n := range g.Nodes {
			pts = append(pts, plotter.XY{X: n.Pos[view.h], Y: n.Pos[view.v]})
		}
		s, err := plotter.NewScatter(pts)
		if err != nil {
			return nil, err
		}
		s.Radius = vg.Points(2)
		view.p.Add(s)
		if vi == 0 {
			leg.Add("node", s)
			leg.Avoid(segs...)
			view.p.Add(leg)
		}
		view.p.Add(&labels{rec: view.rec, pts: mids, texts: names, style: textStyle(8), mark: 3, legend: map[bool]*legendBox{true: leg}[vi == 0]})
		ch := (lo[view.h] + hi[view.h]) / 2
		cv := (lo[view.v] + hi[view.v]) / 2
		view.p.X.Min, view.p.X.Max = ch-span/2, ch+span/2
		view.p.Y.Min, view.p.Y.Max = cv-span/2, cv+span/2
	}
	return &Figure{Name: "geometry", Title: fmt.Sprintf("Geometry of loop %s", g.Loop),
		rows: [][]*plot.Plot{{side, front}}, recs: []*PanelLayout{sideRec, frontRec}, width: 24 * vg.Centimeter, height: 13 * vg.Centimeter}, nil
}
