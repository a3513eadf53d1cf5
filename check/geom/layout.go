package geom

import (
	"math"
	"slices"

	"circa/lang"
)

// Source says where a component's displacement came from.
type Source uint8

const (
	FromRise   Source = iota // (0, 0, rise): only the elevation change is known
	FromRun                  // the component's run vector
	FromCoords               // both end nodes have coordinates
)

// Layout places a loop's nodes in the equipment frame (x forward, y left,
// z up), in metres.
//
// A tube may wind: its length may exceed the straight inlet→outlet chord.
// Only the chord matters for gravity: for a uniform body force b the
// hydrostatic integral ∫ b·ŝ ds along any path equals b·Disp. So the
// elevation change along a component is taken from Disp (Δz = Disp[2] when
// level, b·Disp in general) and the length is used for friction only; Disp's
// direction is the chord's, not the local tube direction.
type Layout struct {
	Pos   []Vec3 // by Node.Index
	Known []bool // position known in 3-D (coordinates, or reached through runs/coordinates from such a node)
	ZOnly []bool // only the elevation is known (reached through rises); x and y are copied from the node it was reached from
	// Piece numbers the connected pieces of the loop, by Node.Index. Positions
	// are comparable only within one piece, unless both nodes have coordinates.
	Piece []int32
	// Source says, by Component.Index, where Disp comes from.
	Source []Source
	loop   *lang.Loop
}

// Horizontal says whether the horizontal part of component i's Disp is
// known: it is unless Disp came from the rise alone.
func (lay *Layout) Horizontal(i int) bool { return lay.Source[i] != FromRise }

// Disp returns the inlet→outlet displacement of the component of index i:
// from the end nodes' coordinates, else the run, else (0, 0, rise);
// reservoirs (0, 0, rise). It is worked out from the component when asked:
// a list of them was three words per component of a large loop, kept for
// the whole check.
func (lay *Layout) Disp(i int) Vec3 {
	d, _ := displacement(lay.loop.Components[i])
	return d
}

// Place lays out a loop. Nodes with coordinates keep them; the others are
// reached by walking components (either way along them) from placed nodes,
// first through components whose full displacement is known, then through
// rises only. A piece of the loop with no coordinates at all is placed from
// its first node at the origin. Place never fails; it returns nil for a nil
// loop.
func Place(l *lang.Loop) *Layout {
	if l == nil {
		return nil
	}
	nn, nc := len(l.Nodes), len(l.Components)
	lay := &Layout{
		Pos: make([]Vec3, nn), Known: make([]bool, nn), ZOnly: make([]bool, nn), Piece: make([]int32, nn),
		Source: make([]Source, nc), loop: l,
	}
	// The component indices touching each node, all lists in one array
	// (counted first), node v's from off[v] to off[v+1]: a list of its own
	// for each node was an allocation or two per node of a large loop.
	joins := func(c *lang.Component) bool {
		return c.To != nil && c.From != nil && validNode(l, c.From) && validNode(l, c.To)
	}
	off := make([]int32, nn+1)
	for _, c := range l.Components {
		if joins(c) {
			off[c.From.Index+1]++
			if c.To.Index != c.From.Index {
				off[c.To.Index+1]++
			}
		}
	}
	for v := 1; v <= nn; v++ {
		off[v] += off[v-1]
	}
	all := make([]int32, off[nn])
	next := off[:nn] // each list's next entry; then the start of the next list
	for i, c := range l.Components {
		_, lay.Source[i] = displacement(c)
		if !joins(c) {
			continue
		}
		all[next[c.From.Index]] = int32(i)
		next[c.From.Index]++
		if c.To.Index != c.From.Index {
			all[next[c.To.Index]] = int32(i)
			next[c.To.Index]++
		}
	}
	copy(off[1:], off[:nn])
	off[0] = 0
	adj := func(v int) []int32 { return all[off[v]:off[v+1]] }
	placed := make([]bool, nn)
	// A walk queues each node once at most: the queue never outgrows nn.
	queue := make([]int32, 0, nn)
	var reached []int32 // nodes placed by walk since it was last cleared
	for i, n := range l.Nodes {
		if n.At.Set {
			lay.Pos[i] = finiteVec(Vec3{n.At.X, n.At.Y, n.At.Z})
			lay.Known[i], placed[i] = true, true
			queue = append(queue, int32(i))
		}
	}
	// walk spreads from the queue through components; full says whether only
	// components with a known horizontal part may be crossed.
	walk := func(full bool) {
		for h := 0; h < len(queue); h++ {
			u := int(queue[h])
			for _, ci := range adj(u) {
				if full && !lay.Horizontal(int(ci)) {
					continue
				}
				c := l.Components[ci]
				d, _ := displacement(c)
				v := c.To.Index
				if v == u {
					v, d = c.From.Index, d.Scale(-1)
				}
				if placed[v] {
					continue
				}
				placed[v] = true
				reached = append(reached, int32(v))
				p := lay.Pos[u].Add(d)
				if full && lay.Known[u] {
					lay.Known[v] = true
				} else {
					lay.ZOnly[v] = true
					if !lay.Horizontal(int(ci)) {
						p[0], p[1] = lay.Pos[u][0], lay.Pos[u][1]
					}
				}
				lay.Pos[v] = p
				queue = append(queue, int32(v))
			}
		}
		queue = queue[:0]
	}
	walk(true)
	for i := range l.Nodes {
		if placed[i] {
			queue = append(queue, int32(i))
		}
	}
	walk(false)
	for i := range l.Nodes {
		if placed[i] {
			continue
		}
		// A piece without coordinates: its first node is the origin. The
		// rise-only walk restarts from the nodes the full walk placed, in
		// index order. Nodes of the pieces placed before are left out: each
		// had all its components crossed already, so they would add nothing,
		// and visiting them for every new piece would make Place quadratic
		// in a loop of many unconnected nodes.
		placed[i], lay.Known[i] = true, true
		queue = append(queue[:0], int32(i))
		reached = append(reached[:0], int32(i))
		walk(true)
		slices.Sort(reached)
		queue = append(queue[:0], reached...)
		walk(false)
	}
	// Number the pieces.
	for i := range lay.Piece {
		lay.Piece[i] = -1
	}
	var piece int32
	stack := queue[:0]
	for i := range l.Nodes {
		if lay.Piece[i] >= 0 {
			continue
		}
		stack = append(stack[:0], int32(i))
		lay.Piece[i] = piece
		for len(stack) > 0 {
			u := int(stack[len(stack)-1])
			stack = stack[:len(stack)-1]
			for _, ci := range adj(u) {
				c := l.Components[ci]
				for _, v := range [2]int{c.From.Index, c.To.Index} {
					if lay.Piece[v] < 0 {
						lay.Piece[v] = piece
						stack = append(stack, int32(v))
					}
				}
			}
		}
		piece++
	}
	return lay
}

func validNode(l *lang.Loop, n *lang.Node) bool {
	return n.Index >= 0 && n.Index < len(l.Nodes) && l.Nodes[n.Index] == n
}

func finite(x float64) float64 {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return 0
	}
	return x
}

func finiteVec(v Vec3) Vec3 { return Vec3{finite(v[0]), finite(v[1]), finite(v[2])} }

// displacement returns a component's inlet→outlet displacement and where it
// came from. A missing rise counts as level.
func displacement(c *lang.Component) (Vec3, Source) {
	if c.From != nil && c.To != nil && c.From.At.Set && c.To.At.Set {
		a, b := c.From.At, c.To.At
		return finiteVec(Vec3{b.X - a.X, b.Y - a.Y, b.Z - a.Z}), FromCoords
	}
	if c.Run.Set && c.To != nil {
		return finiteVec(Vec3{c.Run.X, c.Run.Y, c.Run.Z}), FromRun
	}
	return Vec3{0, 0, finite(c.Rise.SI)}, FromRise
}

// HeatedSpan returns where an evaporator's heated section lies along it, as
// fractions of its length from the inlet: the heated length starts at the
// inlet and the rest is an unheated exit. Other components, and evaporators
// heated over their whole length (or with an unusable heated length), give
// (0, 1).
func HeatedSpan(c *lang.Component) (from, to float64) {
	if c.Kind != lang.Evaporator || !c.HeatedLength.Set || !(c.Length.SI > 0) {
		return 0, 1
	}
	f := c.HeatedLength.SI / c.Length.SI
	if !(f > 0) || f >= 1 || math.IsInf(f, 0) {
		return 0, 1
	}
	return 0, f
}

// ThermalCentre returns the heat-weighted mean position of the heated
// (k = Evaporator) or cooled (k = Condenser) sections of a loop: each
// evaporator counts at the middle of its heated section (see HeatedSpan),
// each condenser at its midpoint, both placed along the inlet→outlet chord.
// loads gives each component's weight (its heat load; the sign is ignored);
// when loads is nil or every weight is zero the components count equally.
// It reports false when the loop has no component of kind k.
func ThermalCentre(lay *Layout, l *lang.Loop, k lang.Kind, loads func(*lang.Component) float64) (Vec3, bool) {
	if lay == nil || l == nil {
		return Vec3{}, false
	}
	var sum, eq Vec3
	var w, n float64
	for _, c := range l.Components {
		if c.Kind != k || c.From == nil || !validNode(l, c.From) || c.Index < 0 || c.Index >= len(lay.Source) {
			continue
		}
		f0, f1 := HeatedSpan(c)
		p := lay.Pos[c.From.Index].Add(lay.Disp(c.Index).Scale((f0 + f1) / 2))
		q := 1.0
		if loads != nil {
			q = math.Abs(finite(loads(c)))
		}
		sum = sum.Add(p.Scale(q))
		w += q
		eq = eq.Add(p)
		n++
	}
	switch {
	case n == 0:
		return Vec3{}, false
	case w > 0 && !math.IsInf(w, 0):
		return finiteVec(sum.Scale(1 / w)), true
	}
	return eq.Scale(1 / n), true
}
