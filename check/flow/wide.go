package flow

import (
	"math"

	"circa/check/sparse"
)

// Newton's steps of a wide network. In cycle flows the Jacobian CᵀMC (C the
// cycles, M the branches' pressure-drop sensitivities) is dense whenever
// the cycles share a branch, as parallel branches share their return: its
// LU costs O(cycles³), 11 s at 2,000 cycles. The same step is the solution
// of a sparse system over the branch flow changes dṁ, the junction
// pressures π and the junction qualities dx:
//
//	S_b dṁ_b + T_b dx_up(b) − π_from(b) + π_to(b) = −Δp_b   (each branch)
//	Σ_b A_jb dṁ_b = 0                                       (each junction's mass)
//	D_j dx_j − Σ_in V_b dx_up(b) − Σ_in (U_b − x_j sgn ṁ_b) dṁ_b = 0   (its mixing)
//
// with one junction's pressure of each connected part fixed instead of its
// (redundant) mass balance. Since the branch flows that conserve mass at
// every junction are the circulations Cf, and the branch pressure vectors
// orthogonal to every cycle are the junction pressure differences Aᵀπ,
// this gives dṁ = C·df with CᵀMC df = e = −CᵀΔp: the dense step, and each
// cycle's step df_k is its chord's dṁ. Eliminating the branch unknowns
// first, which the sparse LU's pivot order does, leaves a system the size
// of the junctions.

// sparseMinCycles is the number of cycles from which a network takes its
// Newton steps and its start over branches and junctions: below it the
// dense cycle Jacobian is as fast and gives the results it always did.
var sparseMinCycles = 48

// wide reports whether the network's steps take the sparse system.
func (n *network) wide() bool {
	return !n.ring && len(n.cycles) >= sparseMinCycles
}

// groundJunctions marks one junction of each connected part of the
// junction graph, whose pressure the sparse systems fix.
func (n *network) groundJunctions() []bool {
	adj := make([][]int, n.nj)
	for _, b := range n.branches {
		adj[b.from] = append(adj[b.from], b.to)
		adj[b.to] = append(adj[b.to], b.from)
	}
	g := make([]bool, n.nj)
	seen := make([]bool, n.nj)
	for r := range seen {
		if seen[r] {
			continue
		}
		g[r] = true
		flood(adj, r, seen)
	}
	return g
}

// flood marks in seen every junction that adjacency lists adj connect to
// junction r, r included.
func flood(adj [][]int, r int, seen []bool) {
	seen[r] = true
	for q := []int{r}; len(q) > 0; {
		u := q[len(q)-1]
		q = q[:len(q)-1]
		for _, v := range adj[u] {
			if !seen[v] {
				seen[v] = true
				q = append(q, v)
			}
		}
	}
}

// branchJacobian assembles the sparse system of a Newton step at ev (see
// the comment at the top of this file), with the same difference steps as
// the dense Jacobian.
func (s *state) branchJacobian(ev *eval) *sparse.Matrix {
	n := s.net
	copy(s.pj, ev.pj) // the branches march from ev's junction pressures
	nb, nj := len(n.branches), n.nj
	ground := n.ground
	pi := func(j int) int { return nb + j }
	xq := func(j int) int { return nb + nj + j }
	den := make([]float64, nj)
	for bi, b := range n.branches {
		down := b.to
		if ev.mb[bi] < 0 {
			down = b.from
		}
		den[down] += math.Abs(ev.mb[bi])
	}
	a := sparse.NewMatrix(nb + 2*nj)
	for bi, b := range n.branches {
		m := ev.mb[bi]
		up, down := b.from, b.to
		if m < 0 {
			up, down = down, up
		}
		x := ev.xj[up]
		h, hx := jacobianSteps(m, x)
		a.Add(bi, bi, (s.branchDP(bi, m+h, x, nil)-ev.dp[bi])/h)
		if den[up] > 0 {
			// The inlet quality moves with the flows only at a junction
			// something flows into.
			a.Add(bi, xq(up), (s.branchDP(bi, m, x+hx, nil)-ev.dp[bi])/hx)
		}
		if b.from != b.to {
			a.Add(bi, pi(b.from), -1)
			a.Add(bi, pi(b.to), 1)
			if !ground[b.from] {
				a.Add(pi(b.from), bi, 1)
			}
			if !ground[b.to] {
				a.Add(pi(b.to), bi, -1)
			}
		}
		if den[down] > 0 {
			am := math.Abs(m)
			X := s.branchOutX(bi, m, x)
			U := (math.Abs(m+h)*s.branchOutX(bi, m+h, x) - am*X) / h
			V := am * (s.branchOutX(bi, m, x+hx) - X) / hx
			a.Add(xq(down), xq(up), -V)
			a.Add(xq(down), bi, -(U - ev.xj[down]*math.Copysign(1, m)))
		}
	}
	for j := 0; j < nj; j++ {
		if ground[j] {
			a.Add(pi(j), pi(j), 1)
		}
		if den[j] > 0 {
			a.Add(xq(j), xq(j), den[j])
		} else {
			a.Add(xq(j), xq(j), 1)
		}
	}
	return a
}

// branchStep sets df to the Newton step of the factorised sparse system at
// ev: each cycle's step is its chord's change of flow.
func (s *state) branchStep(ev *eval, lu *sparse.LU, df []float64) {
	n := s.net
	b := make([]float64, len(n.branches)+2*n.nj)
	for bi := range n.branches {
		b[bi] = -ev.dp[bi]
	}
	x := lu.Solve(b)
	for k, bi := range n.chord {
		df[k] = x[bi]
	}
}

// wideSplit is denseSplit over branches and junctions: the branch flows m
// nearest q = qb/qTot on the heated branches, with weights W, that conserve
// mass at every junction, are m = q + W⁻¹Aᵀπ with the weighted Laplacian
// A W⁻¹ Aᵀ π = −A q; each cycle's flow is its chord's.
func (s *state) wideSplit(qb []float64, qTot float64, unit []float64) bool {
	n := s.net
	ground := n.ground
	nb := len(n.branches)
	w := make([]float64, nb)
	q := make([]float64, nb)
	for bi := range n.branches {
		w[bi] = 1e-3
		if qb[bi] > 0 && qTot > 0 {
			w[bi], q[bi] = 1, qb[bi]/qTot
		}
	}
	// The dense equations' ε·|f|² is ε·ṁ² on each chord: with it the chord
	// weighs w + ε and aims at w·q/(w + ε).
	for _, bi := range n.chord {
		q[bi] = w[bi] * q[bi] / (w[bi] + 1e-9)
		w[bi] += 1e-9
	}
	a := sparse.NewMatrix(n.nj)
	rhs := make([]float64, n.nj)
	for bi, b := range n.branches {
		u, v := b.from, b.to
		if u == v {
			continue
		}
		g := 1 / w[bi]
		if !ground[u] {
			a.Add(u, u, g)
			a.Add(u, v, -g)
			rhs[u] -= q[bi]
		}
		if !ground[v] {
			a.Add(v, v, g)
			a.Add(v, u, -g)
			rhs[v] += q[bi]
		}
	}
	for j, g := range ground {
		if g {
			a.Add(j, j, 1)
		}
	}
	var lu sparse.LU
	if lu.Factorize(a) != nil {
		return false
	}
	p := lu.Solve(rhs)
	for k, bi := range n.chord {
		b := n.branches[bi]
		unit[k] = q[bi] + (p[b.from]-p[b.to])/w[bi]
	}
	return true
}
