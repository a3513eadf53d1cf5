package check

import "circa/lang"

// Graph is a loop's flow graph: nodes joined by components directed along
// the flow. Reservoirs hang off a node and are not edges.
//
// Indices are int32 and the per-node lists share one array: a large loop's
// graph is a few machine words per node and component, not a slice header
// per node and list.
type Graph struct {
	Loop *lang.Loop
	// Edges lists the components with two valid ends, by Component.Index.
	Edges []int32
	// lists holds, node after node, the components leaving the node, those
	// entering it and the reservoirs hanging off it; node v's lists start at
	// off[3v], off[3v+1] and off[3v+2] and end where the next begins.
	lists []int32
	off   []int32
	// Piece numbers the connected pieces by Node.Index (-1: no component
	// joins the node); NPieces counts them.
	Piece   []int32
	NPieces int
	// Parent is, by Node.Index, the component that reaches the node in a
	// breadth-first spanning forest (-1 at each piece's root), and Depth its
	// depth in that forest.
	Parent []int32
	Depth  []int32
	// Order lists the nodes in the order the forest reached them.
	Order []int32
	// Chords are the components outside the spanning forest: each closes
	// one independent cycle (a cycle basis).
	Chords []int
	// OnCycle says, by Component.Index, whether the component lies on a
	// directed cycle, i.e. whether steady flow through it can return.
	OnCycle []bool
	// Hanging says, by Component.Index, whether the component lies in a
	// tree hanging off the loop's cycles; HangingReservoir whether that tree
	// holds a reservoir.
	Hanging          []bool
	HangingReservoir []bool
}

// Out lists the components leaving node v, by ascending Component.Index.
func (g *Graph) Out(v int) []int32 { return g.list(3 * v) }

// In lists the components entering node v, by ascending Component.Index.
func (g *Graph) In(v int) []int32 { return g.list(3*v + 1) }

// Reservoirs lists the reservoirs hanging off node v.
func (g *Graph) Reservoirs(v int) []int32 { return g.list(3*v + 2) }

// Ends counts the component ends at node v (a component from v to v
// counts twice).
func (g *Graph) Ends(v int) int { return len(g.joined(v)) }

// joined lists the components leaving node v, then those entering it: the
// two lists lie one after the other.
func (g *Graph) joined(v int) []int32 {
	a, b := g.off[3*v], g.off[3*v+2]
	return g.lists[a:b:b]
}

func (g *Graph) list(k int) []int32 {
	a, b := g.off[k], g.off[k+1]
	return g.lists[a:b:b]
}

func validEnd(l *lang.Loop, n *lang.Node) bool {
	return n != nil && n.Index >= 0 && n.Index < len(l.Nodes) && l.Nodes[n.Index] == n
}

// NewGraph builds a loop's graph in time linear in its size.
func NewGraph(l *lang.Loop) *Graph {
	nn, nc := len(l.Nodes), len(l.Components)
	g := &Graph{Loop: l,
		Piece: make([]int32, nn), Parent: make([]int32, nn), Depth: make([]int32, nn),
		OnCycle: make([]bool, nc), Hanging: make([]bool, nc), HangingReservoir: make([]bool, nc),
	}
	// The lists are counted first, then filled in component order.
	g.off = make([]int32, 3*nn+1)
	edges := 0
	for _, c := range l.Components {
		if c.Kind == lang.Reservoir {
			if validEnd(l, c.From) {
				g.off[3*c.From.Index+2+1]++
			}
			continue
		}
		if validEnd(l, c.From) && validEnd(l, c.To) {
			g.off[3*c.From.Index+1]++
			g.off[3*c.To.Index+1+1]++
			edges++
		}
	}
	for k := 1; k < len(g.off); k++ {
		g.off[k] += g.off[k-1]
	}
	g.lists = make([]int32, g.off[len(g.off)-1])
	// next is where each list's next entry goes: the start of the list
	// after it once filled, so off itself serves, shifted back after.
	next := g.off[:len(g.off)-1]
	g.Edges = make([]int32, 0, edges)
	for i, c := range l.Components {
		if c.Kind == lang.Reservoir {
			if validEnd(l, c.From) {
				k := 3*c.From.Index + 2
				g.lists[next[k]] = int32(i)
				next[k]++
			}
			continue
		}
		if !validEnd(l, c.From) || !validEnd(l, c.To) {
			continue
		}
		g.Edges = append(g.Edges, int32(i))
		k := 3 * c.From.Index
		g.lists[next[k]] = int32(i)
		next[k]++
		k = 3*c.To.Index + 1
		g.lists[next[k]] = int32(i)
		next[k]++
	}
	// Each list's start moved to the next one's: shift them back.
	copy(g.off[1:], g.off[:len(g.off)-1])
	g.off[0] = 0
	g.forest()
	g.cycles()
	g.prune()
	return g
}

// Other returns the far end of component ci seen from node u.
func (g *Graph) Other(ci, u int) int {
	c := g.Loop.Components[ci]
	if c.From.Index == u {
		return c.To.Index
	}
	return c.From.Index
}

// forest builds the breadth-first spanning forest and the chords.
func (g *Graph) forest() {
	nn := len(g.Loop.Nodes)
	inTree := make([]bool, len(g.Loop.Components))
	g.Order = make([]int32, 0, nn)
	for i := range g.Piece {
		g.Piece[i], g.Parent[i] = -1, -1
	}
	for s := 0; s < nn; s++ {
		if g.Piece[s] >= 0 || g.Ends(s) == 0 {
			continue
		}
		piece := int32(g.NPieces)
		g.Piece[s] = piece
		head := len(g.Order)
		g.Order = append(g.Order, int32(s))
		for head < len(g.Order) {
			u := int(g.Order[head])
			head++
			for _, ci := range g.joined(u) {
				v := g.Other(int(ci), u)
				if g.Piece[v] >= 0 {
					continue
				}
				g.Piece[v], g.Parent[v], g.Depth[v] = piece, ci, g.Depth[u]+1
				inTree[ci] = true
				g.Order = append(g.Order, int32(v))
			}
		}
		g.NPieces++
	}
	for _, ci := range g.Edges {
		if !inTree[ci] {
			g.Chords = append(g.Chords, int(ci))
		}
	}
}

// Step is one component of a path, walked along (+1) or against (−1) the flow.
type Step struct {
	Comp int
	Sign int
}

// Cycle returns the independent cycle closed by a chord: the chord along
// the flow, then the forest path from its outlet back to its inlet.
func (g *Graph) Cycle(chord int) []Step {
	c := g.Loop.Components[chord]
	path := []Step{{chord, 1}}
	// Walk both ends up to their common ancestor: the outlet's side is walked
	// forward from the outlet, the inlet's side is collected and reversed.
	u, v := c.To.Index, c.From.Index
	var tail []Step
	for u != v {
		if g.Depth[u] >= g.Depth[v] {
			p := int(g.Parent[u])
			if p < 0 {
				break
			}
			sign := -1 // walking from u towards the root
			if g.Loop.Components[p].From.Index == u {
				sign = 1
			}
			path = append(path, Step{p, sign})
			u = g.Other(p, u)
		} else {
			p := int(g.Parent[v])
			if p < 0 {
				break
			}
			sign := 1 // walking from the root side down to v
			if g.Loop.Components[p].From.Index == v {
				sign = -1
			}
			tail = append(tail, Step{p, sign})
			v = g.Other(p, v)
		}
	}
	for i := len(tail) - 1; i >= 0; i-- {
		path = append(path, tail[i])
	}
	return path
}

// cycles finds the components on directed cycles: those whose ends lie in
// the same strongly connected component (Tarjan's algorithm, iterative).
func (g *Graph) cycles() {
	nn := len(g.Loop.Nodes)
	// index is -1 for a node not reached yet, its visiting order while it
	// is on the stack, and -2-k once it is in strongly connected component
	// k: a node reached and not yet in a component is on the stack.
	index := make([]int32, nn)
	low := make([]int32, nn)
	for i := range index {
		index[i] = -1
	}
	// A search goes at most nn deep, and a loop's chain of nodes does.
	stack := make([]int32, 0, nn)
	type frame struct{ v, next int32 }
	call := make([]frame, 0, nn)
	var counter, nscc int32
	for s := 0; s < nn; s++ {
		if index[s] != -1 {
			continue
		}
		call = append(call[:0], frame{int32(s), 0})
		index[s], low[s] = counter, counter
		counter++
		stack = append(stack, int32(s))
		for len(call) > 0 {
			f := &call[len(call)-1]
			v := f.v
			if out := g.Out(int(v)); int(f.next) < len(out) {
				w := g.Loop.Components[out[f.next]].To.Index
				f.next++
				if index[w] == -1 {
					index[w], low[w] = counter, counter
					counter++
					stack = append(stack, int32(w))
					call = append(call, frame{int32(w), 0})
				} else if index[w] >= 0 && index[w] < low[v] {
					low[v] = index[w]
				}
				continue
			}
			if low[v] == index[v] {
				for {
					w := stack[len(stack)-1]
					stack = stack[:len(stack)-1]
					index[w] = -2 - nscc
					if w == v {
						break
					}
				}
				nscc++
			}
			call = call[:len(call)-1]
			if len(call) > 0 {
				if p := call[len(call)-1].v; low[v] < low[p] {
					low[p] = low[v]
				}
			}
		}
	}
	for _, ci := range g.Edges {
		c := g.Loop.Components[ci]
		g.OnCycle[ci] = index[c.From.Index] == index[c.To.Index]
	}
}

// prune peels the trees that hang off the loop's cycles, leaf by leaf.
func (g *Graph) prune() {
	nn := len(g.Loop.Nodes)
	deg := make([]int32, nn)
	res := make([]bool, nn) // the subtree peeled into the node holds a reservoir
	gone := make([]bool, len(g.Loop.Components))
	var queue []int32
	for v := 0; v < nn; v++ {
		deg[v] = int32(g.Ends(v))
		res[v] = len(g.Reservoirs(v)) > 0
		if deg[v] == 1 {
			queue = append(queue, int32(v))
		}
	}
	for h := 0; h < len(queue); h++ {
		v := int(queue[h])
		if deg[v] != 1 {
			continue
		}
		for _, ci := range g.joined(v) {
			if gone[ci] {
				continue
			}
			gone[ci] = true
			g.Hanging[ci] = true
			g.HangingReservoir[ci] = res[v]
			u := g.Other(int(ci), v)
			deg[v]--
			deg[u]--
			res[u] = res[u] || res[v]
			if deg[u] == 1 {
				queue = append(queue, int32(u))
			}
		}
	}
}
