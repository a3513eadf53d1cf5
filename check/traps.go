package check

import (
	"math"

	"circa/check/geom"
	"circa/lang"
)

// Traps in the nominal case: a high point in the liquid line collects
// vapour, a low point in the vapour line collects liquid. Heights are taken
// along the nominal case's body force. The liquid line is every component
// reachable from a condenser outlet, and leading to an evaporator inlet,
// without passing through an evaporator or condenser; the vapour line the
// same from evaporator outlets to condenser inlets. Every path through the
// line, from where it starts to where it ends, is checked, across the
// junctions it passes; each high or low point is reported once, with its
// largest climb and fall over the paths through it. A line with a cycle is
// walked path by path instead (up to maxTrapPaths paths), and a point is
// told with the climb and fall of the first path that shows it. Windings
// inside one component are not seen.

// trapTol is the least rise and fall that make a hump (common practice:
// smaller humps are within the tolerance of a layout drawing).
const trapTol = 5e-3

// maxTrapPaths bounds the paths walked through one line; a network with
// more (many parallel branches in series) is checked on its first paths.
const maxTrapPaths = 4096

func init() {
	Register(&Rule{ID: "downcomer-high-point", Category: CategoryTraps, Severity: lang.Warning,
		Summary:   "the liquid line climbs and falls again: a high point collects vapour",
		Rationale: "Vapour bubbles or flash gas in the liquid return rise to a local high point and gather there; the pocket throttles or blocks the return of liquid to the evaporator. Every path through the liquid line is followed across the junctions it passes, so a hump that climbs in one branch and falls in the next, past a split or a merge, is found too; each high point is reported once, on the component that climbs into it, with its largest climb and fall over the paths through it.",
		Example:   "pipe down1 from coil_out to hump { rise 0.1 m ... }\npipe down2 from hump to base { rise -1.3 m ... }",
		Fix:       "Run the liquid line downhill all the way, or vent the high point to the vapour side.",
		Run:       func(c *Context) { traps(c, true) }})
	Register(&Rule{ID: "riser-low-point", Category: CategoryTraps, Severity: lang.Warning,
		Summary:   "the vapour line falls and climbs again: a low point collects liquid",
		Rationale: "Liquid entrained or condensed in the riser drains to a local low point and gathers there; the liquid plug must be pushed up by the vapour, adding head and causing surging. Every path through the vapour line is followed across the junctions it passes, so a dip that falls in one branch and climbs in the next, past a split or a merge, is found too.",
		Example:   "pipe up1 from plate_out to dip { rise -0.1 m ... }\npipe up2 from dip to coil_in { rise 1.3 m ... }",
		Fix:       "Run the vapour line uphill all the way from the evaporator to the condenser.",
		Run:       func(c *Context) { traps(c, false) }})
}

// lineSet marks the components between the outlets of one kind and the
// inlets of the other.
func lineSet(g *Graph, from, to lang.Kind) []bool {
	l := g.Loop
	nc := len(l.Components)
	pass := func(ci int) bool {
		k := l.Components[ci].Kind
		return k != lang.Evaporator && k != lang.Condenser
	}
	fwd, bwd := make([]bool, nc), make([]bool, nc)
	seenF, seenB := make([]bool, len(l.Nodes)), make([]bool, len(l.Nodes))
	var qf, qb []int
	for _, ci := range g.Edges {
		c := l.Components[ci]
		if c.Kind == from && !seenF[c.To.Index] {
			seenF[c.To.Index] = true
			qf = append(qf, c.To.Index)
		}
		if c.Kind == to && !seenB[c.From.Index] {
			seenB[c.From.Index] = true
			qb = append(qb, c.From.Index)
		}
	}
	for len(qf) > 0 {
		u := qf[0]
		qf = qf[1:]
		for _, ci := range g.Out(u) {
			if !pass(int(ci)) || fwd[ci] {
				continue
			}
			fwd[ci] = true
			if v := l.Components[ci].To.Index; !seenF[v] {
				seenF[v] = true
				qf = append(qf, v)
			}
		}
	}
	for len(qb) > 0 {
		u := qb[0]
		qb = qb[1:]
		for _, ci := range g.In(u) {
			if !pass(int(ci)) || bwd[ci] {
				continue
			}
			bwd[ci] = true
			if v := l.Components[ci].From.Index; !seenB[v] {
				seenB[v] = true
				qb = append(qb, v)
			}
		}
	}
	for i := range fwd {
		fwd[i] = fwd[i] && bwd[i]
	}
	return fwd
}

// trapsByWalk makes every line checked by the walk of its paths (tests).
var trapsByWalk = false

func traps(c *Context, liquid bool) {
	g, l, lay := c.Graph, c.Loop, c.Layout
	from, to := lang.Condenser, lang.Evaporator
	if !liquid {
		from, to = lang.Evaporator, lang.Condenser
	}
	in := lineSet(g, from, to)
	down := geom.BodyForce(c.Model.Nominal).Unit().Scale(-1)
	if down == (geom.Vec3{}) {
		return
	}
	// Height of each node along the body force.
	height := func(v int) float64 { return lay.Pos[v].Dot(down) }
	nin := make([]int, len(l.Nodes))
	outs := make([][]int, len(l.Nodes))
	for ci, ok := range in {
		if !ok {
			continue
		}
		comp := l.Components[ci]
		outs[comp.From.Index] = append(outs[comp.From.Index], ci)
		nin[comp.To.Index]++
	}
	if !trapsByWalk && humps(c, liquid, in, outs, nin, height) {
		return
	}
	reported := make([]bool, len(l.Nodes))
	paths := 0
	onPath := make([]bool, len(l.Nodes))
	var comps, nodes []int
	// walk extends the path at node v depth first; a path ends where the line
	// ends (no line component leaves v) or would close on itself.
	var walk func(v int)
	walk = func(v int) {
		if paths >= maxTrapPaths {
			return
		}
		onPath[v] = true
		nodes = append(nodes, v)
		ext := false
		for _, ci := range outs[v] {
			if w := l.Components[ci].To.Index; !onPath[w] {
				ext = true
				comps = append(comps, ci)
				walk(w)
				comps = comps[:len(comps)-1]
			}
		}
		if !ext && len(comps) > 0 {
			paths++
			checkRun(c, liquid, comps, nodes, height, reported)
		}
		nodes = nodes[:len(nodes)-1]
		onPath[v] = false
	}
	for v := range l.Nodes {
		if nin[v] == 0 && len(outs[v]) > 0 {
			walk(v)
		}
	}
}

// checkRun reports the humps (liquid) or dips (vapour) of one path:
// an interior node that the run climbs to by more than trapTol from its
// lowest point before and falls from by more than trapTol to its lowest
// point after (mirrored for dips). Nodes already reported are skipped and
// newly reported ones marked.
func checkRun(c *Context, liquid bool, comps, nodes []int, height func(int) float64, reported []bool) {
	n := len(nodes)
	if n < 3 {
		return
	}
	h := make([]float64, n)
	for i, v := range nodes {
		h[i] = height(v)
		if !liquid {
			h[i] = -h[i] // a dip is a hump upside down
		}
	}
	pre := make([]float64, n) // lowest before and at i
	suf := make([]float64, n) // lowest at and after i
	pre[0], suf[n-1] = h[0], h[n-1]
	for i := 1; i < n; i++ {
		pre[i] = min(pre[i-1], h[i])
	}
	for i := n - 2; i >= 0; i-- {
		suf[i] = min(suf[i+1], h[i])
	}
	for i := 1; i < n-1; i++ {
		// A local top: higher than the previous node, not lower than the next
		// (the first node of a plateau).
		if !(h[i] > h[i-1]) || h[i] < h[i+1] {
			continue
		}
		j := i + 1
		for j < n-1 && h[j] == h[i] {
			j++
		}
		if h[j] > h[i] {
			continue // the plateau climbs on: not a top
		}
		climb, fall := h[i]-pre[i], h[i]-suf[i]
		if climb <= trapTol || fall <= trapTol || reported[nodes[i]] {
			continue
		}
		reported[nodes[i]] = true
		reportTrap(c, liquid, nodes[i], comps[i-1], comps[i], climb, fall)
	}
}

// humps reports the humps (liquid) or dips (vapour) of a line without
// cycles in time linear in its size, as checkRun would find them on every
// path through it: a node is a top of some path when it climbs from a
// lower node and goes on level or down, and its largest climb and fall
// over all paths through it are the lowest heights before and after it,
// found by one pass forward and one back in topological order. It returns
// false, having reported nothing, when the line has a cycle; the walk of
// every path then checks it.
func humps(c *Context, liquid bool, in []bool, outs [][]int, nin []int, height func(int) float64) bool {
	l := c.Loop
	nn := len(l.Nodes)
	h := make([]float64, nn)
	for v := range h {
		h[v] = height(v)
		if !liquid {
			h[v] = -h[v]
		}
	}
	// Topological order from the starts, each in node order and depth
	// first, so the reports come in the order a walk meets them.
	left := append([]int(nil), nin...)
	order := make([]int, 0, nn)
	var stack []int
	for v := nn - 1; v >= 0; v-- {
		if nin[v] == 0 && len(outs[v]) > 0 {
			stack = append(stack, v)
		}
	}
	for len(stack) > 0 {
		v := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		order = append(order, v)
		for k := len(outs[v]) - 1; k >= 0; k-- {
			w := l.Components[outs[v][k]].To.Index
			if left[w]--; left[w] == 0 {
				stack = append(stack, w)
			}
		}
	}
	for v := range left {
		if left[v] > 0 {
			return false // a cycle
		}
	}
	inf := math.Inf(1)
	// minB: the lowest height on a path from a start to v, v included.
	minB := make([]float64, nn)
	for _, v := range order {
		if nin[v] == 0 {
			minB[v] = h[v]
		}
	}
	for v := range minB {
		if nin[v] > 0 {
			minB[v] = inf
		}
	}
	for _, v := range order {
		for _, ci := range outs[v] {
			w := l.Components[ci].To.Index
			minB[w] = min(minB[w], minB[v], h[w])
		}
	}
	// minA: the lowest height on a path from v to an end, v included; plat:
	// the same for a path on which v is the top's level, which goes on
	// level and then down (or ends level), +Inf when none does; platVia:
	// the component that leaves v on it.
	minA := make([]float64, nn)
	plat := make([]float64, nn)
	platVia := make([]int, nn)
	for k := len(order) - 1; k >= 0; k-- {
		v := order[k]
		minA[v], plat[v], platVia[v] = h[v], inf, -1
		if len(outs[v]) == 0 {
			plat[v] = h[v]
		}
		for _, ci := range outs[v] {
			w := l.Components[ci].To.Index
			minA[v] = min(minA[v], minA[w])
			var p float64
			switch {
			case h[w] < h[v]:
				p = minA[w]
			case h[w] == h[v]:
				p = plat[w]
			default:
				continue
			}
			if p < plat[v] {
				plat[v], platVia[v] = p, ci
			}
		}
	}
	for _, v := range order {
		if nin[v] == 0 || len(outs[v]) == 0 || platVia[v] < 0 {
			continue
		}
		// The climb: the lowest start before v among its lower neighbours.
		before, low := -1, inf
		for _, ci := range c.Graph.In(v) {
			if !in[ci] {
				continue
			}
			u := l.Components[ci].From.Index
			if h[u] < h[v] && minB[u] < low {
				before, low = int(ci), minB[u]
			}
		}
		if before < 0 {
			continue
		}
		climb, fall := h[v]-low, h[v]-plat[v]
		if climb <= trapTol || fall <= trapTol {
			continue
		}
		reportTrap(c, liquid, v, before, platVia[v], climb, fall)
	}
	return true
}

// reportTrap reports the hump or dip at node v, entered by component bi and
// left by ai.
func reportTrap(c *Context, liquid bool, v, bi, ai int, climb, fall float64) {
	l := c.Loop
	node := l.Nodes[v]
	before, after := l.Components[bi], l.Components[ai]
	var d *lang.Diagnostic
	if liquid {
		d = c.Reportf(compLoc(before), "the liquid line climbs %s to node %s and then falls %s: vapour collects at this high point (nominal case)",
			q(climb, "m"), node.Name, q(fall, "m"))
	} else {
		d = c.Reportf(compLoc(before), "the vapour line falls %s to node %s and then climbs %s: liquid collects at this low point (nominal case)",
			q(climb, "m"), node.Name, q(fall, "m"))
	}
	d.Related = append(d.Related, lang.Related{Loc: node.NameLoc(), Message: "node " + node.Name},
		related(after, "%s %s leaves it", after.Kind, after.Name))
}
