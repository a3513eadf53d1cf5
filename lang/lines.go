package lang

// VapourNodes marks, by node index, the nodes of the vapour line: the
// evaporators' outlets, the condensers' inlets, and every node on a path
// from the one to the other that passes no evaporator or condenser (the
// riser). In operation they hold vapour or a two-phase mix, not liquid.
func (l *Loop) VapourNodes() []bool {
	n := len(l.Nodes)
	fwd, bwd := make([]bool, n), make([]bool, n)
	valid := func(nd *Node) bool { return nd != nil && nd.Index >= 0 && nd.Index < n && l.Nodes[nd.Index] == nd }
	var qf, qb []int
	for _, c := range l.Components {
		if !valid(c.From) || !valid(c.To) {
			continue
		}
		if c.Kind == Evaporator && !fwd[c.To.Index] {
			fwd[c.To.Index] = true
			qf = append(qf, c.To.Index)
		}
		if c.Kind == Condenser && !bwd[c.From.Index] {
			bwd[c.From.Index] = true
			qb = append(qb, c.From.Index)
		}
	}
	// The components that pass, by the node they leave and the node they
	// enter, so that each walk is linear in the size of the loop.
	succ, pred := make([][]int, n), make([][]int, n)
	for _, c := range l.Components {
		if c.Kind != Evaporator && c.Kind != Condenser && c.Kind != Reservoir && valid(c.From) && valid(c.To) {
			succ[c.From.Index] = append(succ[c.From.Index], c.To.Index)
			pred[c.To.Index] = append(pred[c.To.Index], c.From.Index)
		}
	}
	spread := func(q []int, next [][]int, seen []bool) {
		for len(q) > 0 {
			u := q[0]
			q = q[1:]
			for _, v := range next[u] {
				if !seen[v] {
					seen[v] = true
					q = append(q, v)
				}
			}
		}
	}
	spread(qf, succ, fwd)
	spread(qb, pred, bwd)
	out := make([]bool, n)
	for _, c := range l.Components {
		if !valid(c.From) || !valid(c.To) {
			continue
		}
		switch c.Kind {
		case Evaporator:
			out[c.To.Index] = true
		case Condenser:
			out[c.From.Index] = true
		}
	}
	for i := range out {
		out[i] = out[i] || (fwd[i] && bwd[i])
	}
	return out
}
