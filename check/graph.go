package check

import "circa/lang"

// Graph is a loop's flow graph: nodes joined by components directed along
// the flow. Reservoirs hang off a node and are not edges.
type Graph struct {
	Loop *lang.Loop
	// Edges lists the components with two valid ends, by Component.Index.
	Edges []int
	// Out and In list, by Node.Index, the components leaving and entering it.
	Out, In [][]int
	// Reservoirs lists, by Node.Index, the reservoirs hanging off it.
	Reservoirs [][]int
	// Ends counts, by Node.Index, the component ends at the node.
	Ends []int
	// Piece numbers the connected pieces by Node.Index (-1: no component
	// joins the node); NPieces counts them.
	Piece   []int
	NPieces int
	// Parent is, by Node.Index, the component that reaches the node in a
	// breadth-first spanning forest (-1 at each piece's root), and Depth its
	// depth in that forest.
	Parent []int
	Depth  []int
	// Order lists the nodes in the order the forest reached them.
	Order []int
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

func validEnd(l *lang.Loop, n *lang.Node) bool {
	return n != nil && n.Index >= 0 && n.Index < len(l.Nodes) && l.Nodes[n.Index] == n
}

// NewGraph builds a loop's graph in time linear in its size.
func NewGraph(l *lang.Loop) *Graph {
	nn, nc := len(l.Nodes), len(l.Components)
	g := &Graph{Loop: l,
		Out: make([][]int, nn), In: make([][]int, nn), Reservoirs: make([][]int, nn), Ends: make([]int, nn),
		Piece: make([]int, nn), Parent: make([]int, nn), Depth: make([]int, nn),
		OnCycle: make([]bool, nc), Hanging: make([]bool, nc), HangingReservoir: make([]bool, nc),
	}
	// The lists of every node share one array, counted first and then
	// filled: a list of its own for each node was an allocation or two
	// per node of a large loop.
	nOut, nIn, nRes := make([]int32, nn), make([]int32, nn), make([]int32, nn)
	edges, total := 0, 0
	for _, c := range l.Components {
		if c.Kind == lang.Reservoir {
			if validEnd(l, c.From) {
				nRes[c.From.Index]++
				total++
			}
			continue
		}
		if validEnd(l, c.From) && validEnd(l, c.To) {
			nOut[c.From.Index]++
			nIn[c.To.Index]++
			edges++
			total += 2
		}
	}
	all := make([]int, 0, total)
	for v := range nn {
		for _, list := range [...]struct {
			dst *[]int
			n   int32
		}{{&g.Out[v], nOut[v]}, {&g.In[v], nIn[v]}, {&g.Reservoirs[v], nRes[v]}} {
			if list.n > 0 {
				// Full slice expressions, so that no list grows into
				// the next.
				*list.dst = all[len(all) : len(all) : len(all)+int(list.n)]
				all = all[:len(all)+int(list.n)]
			}
		}
	}
	g.Edges = make([]int, 0, edges)
	for i, c := range l.Components {
		if c.Kind == lang.Reservoir {
			if validEnd(l, c.From) {
				g.Reservoirs[c.From.Index] = append(g.Reservoirs[c.From.Index], i)
			}
			continue
		}
		if !validEnd(l, c.From) || !validEnd(l, c.To) {
			continue
		}
		g.Edges = append(g.Edges, i)
		g.Out[c.From.Index] = append(g.Out[c.From.Index], i)
		g.In[c.To.Index] = append(g.In[c.To.Index], i)
		g.Ends[c.From.Index]++
		g.Ends[c.To.Index]++
	}
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
	g.Order = make([]int, 0, nn)
	for i := range g.Piece {
		g.Piece[i], g.Parent[i] = -1, -1
	}
	for s := 0; s < nn; s++ {
		if g.Piece[s] >= 0 || g.Ends[s] == 0 {
			continue
		}
		g.Piece[s] = g.NPieces
		head := len(g.Order)
		g.Order = append(g.Order, s)
		for head < len(g.Order) {
			u := g.Order[head]
			head++
			for _, list := range [2][]int{g.Out[u], g.In[u]} {
				for _, ci := range list {
					v := g.Other(ci, u)
					if g.Piece[v] >= 0 {
						continue
					}
					g.Piece[v], g.Parent[v], g.Depth[v] = g.NPieces, ci, g.Depth[u]+1
					inTree[ci] = true
					g.Order = append(g.Order, v)
				}
			}
		}
		g.NPieces++
	}
	for _, ci := range g.Edges {
		if !inTree[ci] {
			g.Chords = append(g.Chords, ci)
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
			p := g.Parent[u]
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
			p := g.Parent[v]
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
	index := make([]int, nn)
	low := make([]int, nn)
	onStack := make([]bool, nn)
	scc := make([]int, nn)
	for i := range index {
		index[i] = -1
	}
	// A search goes at most nn deep, and a loop's chain of nodes does.
	stack := make([]int, 0, nn)
	type frame struct{ v, next int }
	call := make([]frame, 0, nn)
	counter, nscc := 0, 0
	for s := 0; s < nn; s++ {
		if index[s] >= 0 {
			continue
		}
		call = append(call[:0], frame{s, 0})
		index[s], low[s] = counter, counter
		counter++
		stack = append(stack, s)
		onStack[s] = true
		for len(call) > 0 {
			f := &call[len(call)-1]
			v := f.v
			if f.next < len(g.Out[v]) {
				w := g.Loop.Components[g.Out[v][f.next]].To.Index
				f.next++
				if index[w] < 0 {
					index[w], low[w] = counter, counter
					counter++
					stack = append(stack, w)
					onStack[w] = true
					call = append(call, frame{w, 0})
				} else if onStack[w] && index[w] < low[v] {
					low[v] = index[w]
				}
				continue
			}
			if low[v] == index[v] {
				for {
					w := stack[len(stack)-1]
					stack = stack[:len(stack)-1]
					onStack[w] = false
					scc[w] = nscc
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
		g.OnCycle[ci] = scc[c.From.Index] == scc[c.To.Index]
	}
}

// prune peels the trees that hang off the loop's cycles, leaf by leaf.
func (g *Graph) prune() {
	nn := len(g.Loop.Nodes)
	deg := append([]int(nil), g.Ends...)
	res := make([]bool, nn) // the subtree peeled into the node holds a reservoir
	gone := make([]bool, len(g.Loop.Components))
	var queue []int
	for v := 0; v < nn; v++ {
		res[v] = len(g.Reservoirs[v]) > 0
		if deg[v] == 1 {
			queue = append(queue, v)
		}
	}
	for len(queue) > 0 {
		v := queue[0]
		queue = queue[1:]
		if deg[v] != 1 {
			continue
		}
		for _, list := range [2][]int{g.Out[v], g.In[v]} {
			for _, ci := range list {
				if gone[ci] {
					continue
				}
				gone[ci] = true
				g.Hanging[ci] = true
				g.HangingReservoir[ci] = res[v]
				u := g.Other(ci, v)
				deg[v]--
				deg[u]--
				res[u] = res[u] || res[v]
				if deg[u] == 1 {
					queue = append(queue, u)
				}
			}
		}
	}
}
