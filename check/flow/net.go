package flow

import (
	"fmt"
	"math"
	"slices"

	"circa/check/geom"
	"circa/lang"
)

// comp is one flow component prepared for the solver.
type comp struct {
	c          *lang.Component
	name       string
	kind       lang.Kind
	L, D, A    float64
	rr, K      float64
	disp       geom.Vec3 // inlet→outlet displacement, equipment frame
	heatedFrom float64   // heated interval [heatedFrom, heatedTo] as fractions of L
	heatedTo   float64
}

// leg is a component as a branch traverses it: sign +1 along its declared
// direction, −1 against it.
type leg struct {
	ci   int
	sign float64
}

// branch is a chain of components between two junctions (or, for a plain
// ring, from one node round to itself).
type branch struct {
	legs     []leg
	from, to int     // junction numbers
	active   []int   // indices in legs of the components that change the quality
	chains   []chain // runs of passive legs collapsed, in leg order
}

// network is a loop reduced to branches and fundamental cycles.
type network struct {
	loop     *lang.Loop
	comps    []comp
	byIndex  []int // Component.Index → comps index, −1 for reservoirs and unused
	res      []*lang.Component
	resVap   []bool // by res index: hung from a vapour-line node, so it holds no liquid
	branches []branch
	nj       int // junctions
	// cycles lists cycle k's branches with the coefficient of cycle flow k
	// in each branch flow, by ascending branch; byBranch lists the same
	// coefficients by branch, by ascending cycle; chord is the branch of
	// each cycle that no other cycle passes (coefficient 1), whose flow is
	// the cycle's flow.
	cycles   [][]term
	byBranch [][]term
	chord    []int
	ground   []bool // by junction: the one of its connected part whose pressure the sparse systems fix
	ring     bool   // a single loop without junctions
	conds    []int  // comps indices of the condensers
	// dispU are the distinct displacements of the components, dlenU their
	// lengths, and dispIdx each component's (by comps index).
	dispU   []geom.Vec3
	dlenU   []float64
	dispIdx []int32
}

// buildNetwork validates the loop's geometry and reduces it to branches and
// cycles. Problems are returned as findings; a nil network means the loop
// cannot be estimated.
func buildNetwork(l *lang.Loop, lay *geom.Layout) (*network, []Finding) {
	var fs []Finding
	bad := func(c *lang.Component, format string, args ...any) {
		fs = append(fs, Finding{Rule: RuleGeometry, Severity: "error", Component: c.Name,
			Message: fmt.Sprintf(format, args...)})
	}
	n := &network{loop: l, byIndex: make([]int, len(l.Components))}
	deg := make([]int32, len(l.Nodes))
	// The components are counted first: a large loop's list grown by
	// appending was its size again in copies.
	nflow := 0
	for _, c := range l.Components {
		if c.Kind != lang.Reservoir {
			nflow++
		}
	}
	n.comps = make([]comp, 0, nflow)
	// The vapour line is marked only for a loop with a reservoir.
	var vap []bool
	for i, c := range l.Components {
		n.byIndex[i] = -1
		if c.Kind == lang.Reservoir {
			if vap == nil {
				vap = l.VapourNodes()
			}
			n.res = append(n.res, c)
			n.resVap = append(n.resVap, c.From != nil && c.From.Index >= 0 && c.From.Index < len(vap) && vap[c.From.Index])
			continue
		}
		if c.From == nil || c.To == nil || c.From.Index < 0 || c.To.Index < 0 ||
			c.From.Index >= len(l.Nodes) || c.To.Index >= len(l.Nodes) {
			bad(c, "%s %s is not connected at both ends; the loop cannot be estimated", c.Kind, c.Name)
			continue
		}
		L := c.Length.SI
		D := c.Diameter()
		A := c.Area() * c.ChannelCount() // identical channels in parallel: one channel's mass flux
		short := c.Kind == lang.Bend || c.Kind == lang.Fitting
		switch {
		case !finite(L) || L < 0:
			bad(c, "%s %s has length %.5g m; a length must be zero or more", c.Kind, c.Name, L)
		case L == 0 && !short:
			bad(c, "%s %s has no length; the estimate needs its length along the flow", c.Kind, c.Name)
		case !finite(D) || D <= 0:
			bad(c, "%s %s has no positive bore or hydraulic diameter", c.Kind, c.Name)
		case !finite(A) || A <= 0:
			bad(c, "%s %s has no positive flow area", c.Kind, c.Name)
		}
		if c.Loss.SI < 0 || !finite(c.Loss.SI) {
			bad(c, "%s %s has a negative loss coefficient %.5g", c.Kind, c.Name, c.Loss.SI)
		}
		cp := comp{c: c, name: c.Name, kind: c.Kind, L: L, D: D, A: A, K: c.Loss.SI, heatedTo: 1}
		if D > 0 {
			cp.rr = c.Roughness.SI / D
		}
		if lay != nil && i < len(lay.Source) {
			cp.disp = lay.Disp(i)
		} else {
			cp.disp = geom.Vec3{0, 0, c.Rise.SI}
		}
		if c.Kind == lang.Evaporator && c.HeatedLength.Set && L > 0 {
			h := c.HeatedLength.SI
			if !(h > 0) || h > L || !finite(h) {
				bad(c, "evaporator %s has heated length %.5g m; it must lie in (0, %.5g] m, its length", c.Name, h, L)
			} else {
				cp.heatedFrom = (1 - h/L) / 2
				cp.heatedTo = 1 - cp.heatedFrom
			}
		}
		n.byIndex[i] = len(n.comps)
		n.comps = append(n.comps, cp)
		deg[c.From.Index]++
		if c.To.Index != c.From.Index {
			deg[c.To.Index]++
		}
	}
	if len(fs) > 0 {
		return nil, fs
	}
	if len(n.comps) == 0 {
		return nil, []Finding{{Rule: RuleGeometry, Severity: "error", Message: fmt.Sprintf("loop %s has no components to circulate through", l.Name)}}
	}
	for i, d := range deg {
		if d == 1 {
			return nil, []Finding{{Rule: RuleGeometry, Severity: "error",
				Message: fmt.Sprintf("node %s of loop %s is an open end; the loop is not closed and cannot be estimated", l.Nodes[i].Name, l.Name)}}
		}
	}
	// Junctions: nodes where three or more components meet.
	jn := make([]int32, len(l.Nodes))
	for i := range jn {
		jn[i] = -1
	}
	for i, d := range deg {
		if d >= 3 {
			jn[i] = int32(n.nj)
			n.nj++
		}
	}
	// The comps indices by node, every node's in one array from off[v] to
	// off[v+1]: a list of its own per node was a slice header and an
	// allocation per node of a large loop.
	nn := len(l.Nodes)
	off := make([]int32, nn+1)
	for v, d := range deg {
		off[v+1] = off[v] + d
	}
	all := make([]int32, off[nn])
	next := off[:nn] // each list's next entry; then the start of the next list
	for ci, cp := range n.comps {
		u, v := cp.c.From.Index, cp.c.To.Index
		all[next[u]] = int32(ci)
		next[u]++
		if v != u {
			all[next[v]] = int32(ci)
			next[v]++
		}
	}
	copy(off[1:], off[:nn])
	off[0] = 0
	adj := func(v int) []int32 { return all[off[v]:off[v+1]] }
	used := make([]bool, len(n.comps))
	// walk follows a chain from node u through component ci until a junction
	// (or back to stop).
	walk := func(u, ci, stop int) branch {
		var b branch
		for {
			used[ci] = true
			cp := n.comps[ci]
			v, s := cp.c.To.Index, 1.0
			if cp.c.From.Index != u {
				v, s = cp.c.From.Index, -1
			}
			b.legs = append(b.legs, leg{ci, s})
			u = v
			if jn[u] >= 0 || u == stop {
				b.to = u
				return b
			}
			next := -1
			for _, cj := range adj(u) {
				if !used[cj] {
					next = int(cj)
					break
				}
			}
			if next < 0 {
				b.to = u
				return b
			}
			ci = next
		}
	}
	if n.nj == 0 {
		// Plain rings; more than one ring in one loop is not one loop.
		start := n.comps[0].c.From.Index
		for _, cp := range n.comps {
			if cp.kind == lang.Condenser {
				start = cp.c.To.Index
				break
			}
		}
		first := -1
		for _, ci := range adj(start) {
			if n.comps[ci].c.From.Index == start {
				first = int(ci)
				break
			}
		}
		if first < 0 {
			first = int(adj(start)[0])
		}
		b := walk(start, first, start)
		b.from, b.to = 0, 0
		n.branches = []branch{b}
		for ci := range used {
			if !used[ci] {
				return nil, []Finding{{Rule: RuleGeometry, Severity: "error",
					Message: fmt.Sprintf("loop %s falls apart into separate rings (component %s is not on the ring through %s)", l.Name, n.comps[ci].name, n.comps[first].name)}}
			}
		}
		n.nj = 1
		n.ring = true
	} else {
		for u := range l.Nodes {
			if jn[u] < 0 {
				continue
			}
			for _, ci := range adj(u) {
				if used[ci] {
					continue
				}
				b := walk(u, int(ci), -1)
				b.from = int(jn[u])
				if jn[b.to] < 0 {
					return nil, []Finding{{Rule: RuleGeometry, Severity: "error",
						Message: fmt.Sprintf("loop %s: the chain from junction %s ends at node %s, which is not a junction", l.Name, l.Nodes[u].Name, l.Nodes[b.to].Name)}}
				}
				b.to = int(jn[b.to])
				n.branches = append(n.branches, b)
			}
		}
		for ci := range used {
			if !used[ci] {
				return nil, []Finding{{Rule: RuleGeometry, Severity: "error",
					Message: fmt.Sprintf("component %s of loop %s is on a ring not joined to the rest", n.comps[ci].name, l.Name)}}
			}
		}
	}
	// Orient each branch along the majority of its components' declared
	// directions, so positive branch flow is the declared flow.
	for bi := range n.branches {
		b := &n.branches[bi]
		var s float64
		for _, lg := range b.legs {
			s += lg.sign * math.Max(n.comps[lg.ci].L, 1e-3)
		}
		if s < 0 {
			rev := make([]leg, len(b.legs))
			for i, lg := range b.legs {
				rev[len(b.legs)-1-i] = leg{lg.ci, -lg.sign}
			}
			b.legs = rev
			b.from, b.to = b.to, b.from
		}
	}
	seen := map[[3]uint64]int32{} // by bits: −0 and NaN stay apart
	n.dispIdx = make([]int32, len(n.comps))
	for ci := range n.comps {
		cp := &n.comps[ci]
		if cp.kind == lang.Condenser {
			n.conds = append(n.conds, ci)
		}
		key := [3]uint64{math.Float64bits(cp.disp[0]), math.Float64bits(cp.disp[1]), math.Float64bits(cp.disp[2])}
		u, ok := seen[key]
		if !ok {
			u = int32(len(n.dispU))
			seen[key] = u
			n.dispU = append(n.dispU, cp.disp)
			n.dlenU = append(n.dlenU, cp.disp.Norm())
		}
		n.dispIdx[ci] = u
	}
	n.collapseChains()
	n.ground = n.groundJunctions()
	if f, ok := n.tooLarge(); !ok {
		return nil, []Finding{f}
	}
	n.cycles, n.chord = fundamentalCycles(n.nj, n.branches)
	n.byBranch = make([][]term, len(n.branches))
	for k, c := range n.cycles {
		for _, t := range c {
			n.byBranch[t.i] = append(n.byBranch[t.i], term{k, t.c})
		}
	}
	if len(n.cycles) == 0 {
		return nil, []Finding{{Rule: RuleGeometry, Severity: "error", Message: fmt.Sprintf("loop %s has no closed path to circulate round", l.Name)}}
	}
	return n, nil
}

// term is a nonzero coefficient c at index i of a sparse vector.
type term struct {
	i int
	c float64
}

// MaxEstimateCycles is the most independent cycles a network may have to
// be estimated. The estimate's work grows about linearly with them (the
// Newton steps are sparse), but every step marches every branch, the tilt
// search and the margins solve the network again many times, and the
// language server would spend tens of seconds on each edit of such a file:
// past it the estimate is skipped with a finding that says so.
const MaxEstimateCycles = 10000

// tooLarge counts the network's independent cycles (branches − junctions +
// connected parts) before they are built; false with a finding when they
// are more than MaxEstimateCycles.
func (n *network) tooLarge() (Finding, bool) {
	parts := 0
	for _, g := range n.ground {
		if g {
			parts++
		}
	}
	nc := len(n.branches) - n.nj + parts
	if nc <= MaxEstimateCycles {
		return Finding{}, true
	}
	return Finding{Rule: RuleTooLarge, Severity: "warning", Value: float64(nc), Limit: MaxEstimateCycles,
		Message: fmt.Sprintf("network too large for the estimate: loop %s has %d independent cycles, more than the %d the estimate takes; the estimate was skipped (the structural rules still ran)",
			n.loop.Name, nc, MaxEstimateCycles)}, false
}

// fundamentalCycles returns the cycle basis of a spanning tree: one cycle per
// branch outside the tree (its chord), as coefficients on the branch flows.
func fundamentalCycles(nj int, bs []branch) ([][]term, []int) {
	type edge struct{ b, other int }
	adj := make([][]edge, nj)
	for bi, b := range bs {
		adj[b.from] = append(adj[b.from], edge{bi, b.to})
		if b.to != b.from {
			adj[b.to] = append(adj[b.to], edge{bi, b.from})
		}
	}
	parent := make([]int, nj) // branch to the parent, −1 at a root
	up := make([]int, nj)     // parent junction
	depth := make([]int, nj)  //
	seen := make([]bool, nj)  //
	inTree := make([]bool, len(bs))
	for r := 0; r < nj; r++ {
		if seen[r] {
			continue
		}
		seen[r], parent[r], up[r] = true, -1, -1
		q := []int{r}
		for len(q) > 0 {
			u := q[0]
			q = q[1:]
			for _, e := range adj[u] {
				if seen[e.other] {
					continue
				}
				seen[e.other] = true
				parent[e.other], up[e.other], depth[e.other] = e.b, u, depth[u]+1
				inTree[e.b] = true
				q = append(q, e.other)
			}
		}
	}
	// pathUp adds coefficient s·(direction from u towards the root) of every
	// tree branch on u's path up to ancestor a.
	var cycles [][]term
	var chords []int
	c := make([]float64, len(bs)) // the cycle's coefficients, zero between cycles
	var touched []int
	add := func(bi int, v float64) {
		if c[bi] == 0 {
			touched = append(touched, bi)
		}
		c[bi] += v
	}
	for bi, b := range bs {
		if inTree[bi] {
			continue
		}
		touched = touched[:0]
		add(bi, 1)
		// The cycle goes along b from b.from to b.to, then back through the
		// tree from b.to to b.from.
		u, v := b.to, b.from
		for depth[u] > depth[v] {
			add(parent[u], treeSign(bs, parent[u], u))
			u = up[u]
		}
		var tail []int
		for depth[v] > depth[u] {
			tail = append(tail, v)
			v = up[v]
		}
		for u != v {
			add(parent[u], treeSign(bs, parent[u], u))
			u = up[u]
			tail = append(tail, v)
			v = up[v]
		}
		for _, w := range tail {
			// Going down from up[w] to w.
			add(parent[w], -treeSign(bs, parent[w], w))
		}
		slices.Sort(touched)
		cyc := make([]term, 0, len(touched))
		for _, i := range touched {
			if c[i] != 0 {
				cyc = append(cyc, term{i, c[i]})
			}
			c[i] = 0
		}
		cycles = append(cycles, cyc)
		chords = append(chords, bi)
	}
	return cycles, chords
}

// treeSign is +1 when going from child junction u to its parent follows
// branch bi's reference direction.
func treeSign(bs []branch, bi, u int) float64 {
	if bs[bi].from == u {
		return 1
	}
	return -1
}

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
