package flow

import (
	"errors"
	"math"

	"gonum.org/v1/gonum/mat"

	"circa/check/correlate"
	"circa/check/rootfind"
	"circa/check/sparse"
)

// Bracketing grid for the single-loop mass flow, kg/s. The grid ends at
// flowMax; a loop whose excess head is still positive there is searched
// further, a decade at a time, up to flowCeiling (see ringRoots).
const (
	flowMin       = 1e-6
	flowMax       = 10.0
	flowCeiling   = 1e5
	gridPerDecade = 5
)

// eval holds one evaluation of the network at given cycle flows.
type eval struct {
	mb []float64 // branch flows along each branch's reference direction
	xj []float64 // junction qualities
	dp []float64 // p_from − p_to per branch
	e  []float64 // excess head per cycle
	pj []float64 // junction pressures under local saturation (see junctionPressures)
}

func (s *state) newEval() *eval {
	n := s.net
	return &eval{mb: make([]float64, len(n.branches)), xj: make([]float64, n.nj),
		dp: make([]float64, len(n.branches)), e: make([]float64, len(n.cycles)),
		pj: make([]float64, len(s.pj))}
}

// copyFrom makes ev a copy of o (of the same network).
func (ev *eval) copyFrom(o *eval) {
	copy(ev.mb, o.mb)
	copy(ev.xj, o.xj)
	copy(ev.dp, o.dp)
	copy(ev.e, o.e)
	copy(ev.pj, o.pj)
}

// branchFlows sets the branch flows from the cycle flows.
func (s *state) branchFlows(f []float64, ev *eval) {
	for bi := range ev.mb {
		var m float64
		for _, t := range s.net.byBranch[bi] {
			m += t.c * f[t.i]
		}
		ev.mb[bi] = m
	}
}

// branchOutX follows quality through branch bi at flow m from inlet xin.
func (s *state) branchOutX(bi int, m, xin float64) float64 {
	b := &s.net.branches[bi]
	x := xin
	if m >= 0 {
		for _, i := range b.active {
			x = s.outletX(b.legs[i].ci, m, x)
		}
	} else {
		for k := len(b.active) - 1; k >= 0; k-- {
			x = s.outletX(b.legs[b.active[k]].ci, m, x)
		}
	}
	return x
}

// coldest is the lowest condenser outlet quality, the starting guess for
// every junction's enthalpy.
func (s *state) coldest() float64 {
	x := 0.0
	for _, ci := range s.net.conds {
		if s.xCond[ci] < x {
			x = s.xCond[ci]
		}
	}
	return x
}

// mix finds the junction qualities for the branch flows in ev.mb: each
// junction takes the flow-weighted mean of what arrives.
func (s *state) mix(ev *eval) {
	n := s.net
	x0 := s.coldest()
	for j := range ev.xj {
		ev.xj[j] = x0
	}
	num := make([]float64, n.nj)
	den := make([]float64, n.nj)
	for sweep := 0; sweep < 400; sweep++ {
		for j := range num {
			num[j], den[j] = 0, 0
		}
		for bi, b := range n.branches {
			m := ev.mb[bi]
			up, down := b.from, b.to
			if m < 0 {
				up, down = down, up
			}
			am := math.Abs(m)
			if am == 0 {
				continue
			}
			num[down] += am * s.branchOutX(bi, m, ev.xj[up])
			den[down] += am
		}
		change := 0.0
		for j := range ev.xj {
			if den[j] == 0 {
				continue
			}
			v := num[j] / den[j]
			change = math.Max(change, math.Abs(v-ev.xj[j]))
			ev.xj[j] = v
		}
		if change <= 1e-13*(1+math.Abs(x0)) {
			return
		}
	}
}

// branchDP marches branch bi at flow m from its upstream junction quality
// xin and returns p_from − p_to along its reference direction. visit, when
// not nil, receives every component's result in flow order.
func (s *state) branchDP(bi int, m, xin float64, visit func(ci int, dir, m, xin, xout float64, q parts)) float64 {
	dp, _ := s.branchParts(bi, m, xin, visit)
	return dp
}

// branchGrav is the gravity term Σ ∫ρ_m b·ŝ ds of branch bi along the flow
// at flow m from its upstream junction quality xin.
func (s *state) branchGrav(bi int, m, xin float64) float64 {
	if s.local && s.net.ring {
		var g float64
		s.branchDPLocal(bi, m, func(ci int, dir, m, xin, xout float64, q parts) { g += q.grav })
		return g
	}
	t := *s
	t.gravOnly = true
	_, g := t.branchParts(bi, m, xin, nil)
	return g
}

// branchParts is branchDP that also returns the branch's gravity term
// along the flow.
func (s *state) branchParts(bi int, m, xin float64, visit func(ci int, dir, m, xin, xout float64, q parts)) (dp, grav float64) {
	if s.local && s.net.ring {
		return s.branchDPLocal(bi, m, visit), 0
	}
	b := &s.net.branches[bi]
	x := xin
	var loss float64
	// Local saturation in a network: the pressure is marched from the
	// upstream junction's (see junctionPressures).
	local, p := s.local, 0.0
	if local {
		up := b.from
		if m < 0 {
			up = b.to
		}
		p = s.pj[up]
	}
	// Momentum flux leaving the previous component: the step to the next
	// component's inlet (an area change) counts as its acceleration, so
	// the acceleration terms telescope along the branch. A single loop
	// closes on itself: its first component steps from the last one's
	// outlet, which is at the starting quality.
	prev, havePrev := 0.0, false
	if s.net.ring && len(b.legs) > 0 {
		last := b.legs[len(b.legs)-1].ci
		if m < 0 {
			last = b.legs[0].ci
		}
		prev, havePrev = s.momentum(last, m, xin), true
	}
	step := func(lg leg, dir float64) {
		if local {
			s.pIn[lg.ci] = p
		}
		xo, q := s.march(lg.ci, dir, m, x, nil)
		if havePrev {
			q.acc = q.mOut - prev
		}
		prev, havePrev = q.mOut, true
		if local {
			p -= q.loss()
			if lg.ci == s.refCond {
				s.pRef = p
			}
		}
		if visit != nil {
			visit(lg.ci, dir, m*lg.sign, x, xo, q)
		}
		loss += q.loss()
		grav += q.grav
		x = xo
	}
	// A collapsed chain stands for its legs while the quality is liquid
	// and no caller needs them one by one.
	chained := func(c *chain) bool {
		if visit != nil || x > 0 {
			return false
		}
		q, first, last := s.chainLiquid(b, c, m, x)
		if havePrev {
			q.acc = last - prev
		} else {
			q.acc = last - first
		}
		if local {
			// Local saturation: the chain stays one liquid tube only while
			// the liquid is below saturation at both its ends.
			sat0, _ := s.satAt(p)
			sat1, _ := s.satAt(p - q.loss())
			if s.localX(x, sat0) > 0 || s.localX(x, sat1) > 0 {
				return false
			}
			p -= q.loss()
		}
		prev, havePrev = last, true
		loss += q.loss()
		grav += q.grav
		return true
	}
	if m >= 0 {
		next := 0
		for i := 0; i < len(b.legs); i++ {
			if next < len(b.chains) && b.chains[next].from == i {
				c := &b.chains[next]
				next++
				if chained(c) {
					i = c.to - 1
					continue
				}
			}
			step(b.legs[i], b.legs[i].sign)
		}
		return loss, grav
	}
	next := len(b.chains) - 1
	for i := len(b.legs) - 1; i >= 0; i-- {
		if next >= 0 && b.chains[next].to-1 == i {
			c := &b.chains[next]
			next--
			if chained(c) {
				i = c.from
				continue
			}
		}
		step(b.legs[i], -b.legs[i].sign)
	}
	return -loss, grav
}

// momentum is the momentum flux G²[x²/(ρv α) + (1−x)²/(ρl (1−α))] of
// component ci at flow m and quality x, Pa.
func (s *state) momentum(ci int, m, x float64) float64 {
	G := math.Abs(m) / s.net.comps[ci].A
	if x <= 0 {
		rho, _ := s.liquid(x)
		return G * G / rho
	}
	return correlate.AccelerationTerm(G, x, s.voidAt(x, G, s.cosInc[ci]), s.p)
}

// evaluate fills ev for cycle flows f.

func (s *state) evaluate(f []float64, ev *eval) {
	s.branchFlows(f, ev)
	s.mix(ev)
	if s.local && !s.net.ring {
		s.junctionPressures(ev)
		copy(ev.pj, s.pj)
	}
	for bi, b := range s.net.branches {
		up := b.from
		if ev.mb[bi] < 0 {
			up = b.to
		}
		ev.dp[bi] = s.branchDP(bi, ev.mb[bi], ev.xj[up], nil)
	}
	for k, c := range s.net.cycles {
		var e float64
		for _, t := range c {
			e -= t.c * ev.dp[t.i]
		}
		ev.e[k] = e
	}
}

// root is one operating point of a single loop.
type root struct {
	m, slope float64
	f        []float64 // a network's cycle flows at the balance (nil for a single loop)
}

// brent finds a root of f in [a, b] where f(a) and f(b) differ in sign.
func brent(f func(float64) float64, a, b, fa, fb, tol float64) float64 {
	g := func(x float64) (float64, struct{}, bool) { return f(x), struct{}{}, true }
	pa, pb := rootfind.Point[struct{}]{X: a, F: fa}, rootfind.Point[struct{}]{X: b, F: fb}
	return rootfind.Brent(g, pa, pb, rootfind.Options{Tol: tol}).Root.X
}

// flowGrid returns the logarithmic bracketing grid.
func flowGrid() []float64 {
	n := int(math.Round(math.Log10(flowMax/flowMin)*gridPerDecade)) + 1
	g := make([]float64, n)
	for i := range g {
		g[i] = flowMin * math.Pow(10, float64(i)/gridPerDecade)
	}
	return g
}

var grid = flowGrid()

// excessHead is a single loop's excess head as a function of its mass
// flow, evaluated in ev.
func (s *state) excessHead(ev *eval) func(m float64) float64 {
	f := []float64{0}
	return func(m float64) float64 {
		f[0] = m
		s.evaluate(f, ev)
		return ev.e[0]
	}
}

// ringRoots brackets and refines every root of the single loop's excess
// head on the flow grid; it also returns the excess head at the bottom of
// the grid. When the excess head is still positive at the top of the grid
// (a boiler-scale loop circulates more than 10 kg/s), the search goes on
// above it on the same logarithmic steps until the excess head turns
// negative or the flow reaches flowCeiling.
func (s *state) ringRoots(ev *eval) ([]root, float64) {
	E := s.excessHead(ev)
	g := s.ringGrid()
	roots, e0 := findRoots(E, g)
	top := g[len(g)-1]
	if E(top) > 0 {
		roots = append(roots, extendRoots(E, top)...)
	}
	return roots, e0
}

// highestStableRoot is the stable root of highest flow that ringRoots
// finds (false: none). It searches the grid from the top down and stops at
// that root: the brackets, refinements and slopes it takes are ringRoots'
// own, so the root is the same to the bit.
func (s *state) highestStableRoot(ev *eval) (float64, bool) {
	E := s.excessHead(ev)
	g := s.ringGrid()
	n := len(g)
	next, eNext := g[n-1], E(g[n-1])
	if eNext > 0 {
		// Beyond the grid: the full search goes on above it.
		roots, _ := s.ringRoots(ev)
		for i := len(roots) - 1; i >= 0; i-- {
			if roots[i].slope < 0 {
				return roots[i].m, true
			}
		}
		return 0, false
	}
	for i := n - 2; i >= 0; i-- {
		m, e := g[i], E(g[i])
		if (eNext > 0) != (e > 0) {
			r := brent(E, m, next, e, eNext, 1e-12*next)
			h := 1e-6 * r
			if slope := (E(r+h) - E(r-h)) / (2 * h); slope < 0 {
				return r, true
			}
		}
		next, eNext = m, e
	}
	return 0, false
}

// extendRoots continues findRoots above the grid's top m (where the excess
// head is positive) until a balance is found or flowCeiling is passed.
func extendRoots(E func(float64) float64, m float64) []root {
	step := math.Pow(10, 1.0/gridPerDecade)
	for m < flowCeiling {
		next := m * step
		en := E(next)
		if !finite(en) {
			return nil
		}
		if en <= 0 {
			roots, _ := findRoots(E, []float64{m, next})
			return roots
		}
		m = next
	}
	return nil
}

// refinePerDecade is the density of the bracketing grid over the boiling
// band of a loop with a subcooled return.
const refinePerDecade = 20

// ringGrid is the bracketing grid of a single loop. With a subcooled return
// the excess head is not monotone between the flow at which the heat just
// dries the fluid out (x = 1) and the flow at which the heated side stays
// liquid (x = 0): the two-phase losses, ∝ ṁ²·(v_l + x·v_lv), fall as the
// quality drops while the head collapses only near x = 0. Two balances can
// then lie within one step of the coarse grid, so that band gets a finer
// grid ending exactly at the saturation flow, where E has a kink. The band
// is taken from the total heat and the coldest condenser outlet.
func (s *state) ringGrid() []float64 {
	var q float64
	for _, h := range s.heat {
		q += h
	}
	sub := -s.coldest()
	if !(q > 0) || !(sub > 0) || !(s.p.Hlv > 0) {
		return grid
	}
	hi := q / (s.p.Hlv * sub)       // heated side just saturated
	lo := q / (s.p.Hlv * (1 + sub)) // heated side just dry
	hi = math.Min(hi, flowMax)
	lo = math.Max(lo/2, flowMin)
	if !(hi > lo) || !finite(hi) {
		return grid
	}
	n := int(math.Ceil(math.Log10(hi/lo) * refinePerDecade))
	n = min(n, 4*refinePerDecade)
	extra := make([]float64, 0, n+1)
	for k := 0; k <= n; k++ {
		extra = append(extra, hi*math.Pow(lo/hi, float64(k)/float64(max(n, 1))))
	}
	return mergeGrid(grid, extra)
}

// mergeGrid merges the ascending grid g with the descending points extra,
// dropping points closer than a part in 10⁹ to one already taken.
func mergeGrid(g, extra []float64) []float64 {
	out := make([]float64, 0, len(g)+len(extra))
	i, j := 0, len(extra)-1
	for i < len(g) || j >= 0 {
		var v float64
		if j < 0 || i < len(g) && g[i] <= extra[j] {
			v = g[i]
			i++
		} else {
			v = extra[j]
			j--
		}
		if n := len(out); n > 0 && v <= out[n-1]*(1+1e-9) {
			continue
		}
		out = append(out, v)
	}
	return out
}

// findRoots brackets the roots of E between consecutive points of the
// ascending grid g, refines each by Brent's method and takes its slope by
// central differences.
func findRoots(E func(float64) float64, g []float64) ([]root, float64) {
	var roots []root
	prevM, prevE := g[0], E(g[0])
	e0 := prevE
	for _, m := range g[1:] {
		e := E(m)
		if (e > 0) != (prevE > 0) {
			r := brent(E, prevM, m, prevE, e, 1e-12*m)
			h := 1e-6 * r
			slope := (E(r+h) - E(r-h)) / (2 * h)
			roots = append(roots, root{m: r, slope: slope})
		}
		prevM, prevE = m, e
	}
	return roots, e0
}

// ringCirculation is the single loop's circulation condition: the excess
// head at the bottom of the grid when positive, else the largest excess
// head on the grid (positive when a balance exists higher up).
func (s *state) ringCirculation(ev *eval) float64 {
	f := []float64{0}
	best := math.Inf(-1)
	for _, m := range grid {
		f[0] = m
		s.evaluate(f, ev)
		if e := ev.e[0]; e > 0 {
			return e
		} else if e > best || math.IsInf(best, -1) {
			best = e
		}
	}
	if math.IsNaN(best) || math.IsInf(best, -1) {
		return -1
	}
	return best
}

var errNoConverge = errors.New("network solution did not converge")

// solveNetwork solves every cycle's momentum balance by Newton's method with
// a backtracking line search, started from one cycle at a time.
func (s *state) solveNetwork(ev *eval, start []float64) ([]float64, int, error) {
	if start != nil {
		if f, it, err := s.newton(ev, append([]float64(nil), start...), nil); err == nil {
			return f, it, nil
		}
	}
	f := s.networkStart(ev)
	f2, it, err := s.newton(ev, append([]float64(nil), f...), nil)
	if err == nil || len(s.net.cycles) > 12 {
		return f2, it, err
	}
	s.cycleSweeps(ev, f)
	return s.newton(ev, f, nil)
}

// networkStart is the single-loop estimate of a network: the flow is split
// among the heated branches in proportion to their heat (the least-squares
// circulation with that split), and its size is the stable root of the
// circulation's net driving power Σ f_k E_k, a single loop's excess head
// weighted by the flow pattern.
func (s *state) networkStart(ev *eval) []float64 {
	n := s.net
	nc := len(n.cycles)
	var qTot float64
	for _, h := range s.heat {
		qTot += h
	}
	// Heat carried by each branch.
	qb := make([]float64, len(n.branches))
	for bi, b := range n.branches {
		for _, lg := range b.legs {
			qb[bi] += s.heat[lg.ci]
		}
	}
	unit := make([]float64, nc)
	split := s.denseSplit
	if n.wide() {
		split = s.wideSplit
	}
	if !split(qb, qTot, unit) {
		for k := range unit {
			unit[k] = 1 / float64(nc)
		}
	}
	f := make([]float64, nc)
	power := func(m float64) float64 {
		for k := range f {
			f[k] = m * unit[k]
		}
		s.evaluate(f, ev)
		var p float64
		for k, e := range ev.e {
			p += unit[k] * e
		}
		return p
	}
	// From the top of the grid down: the first sign change is the balance
	// of highest flow.
	best := 0.0
	hi := len(grid) - 1
	pm, pp := grid[hi], power(grid[hi])
	for i := hi - 1; i >= 0; i-- {
		m := grid[i]
		p := power(m)
		if p > 0 && pp <= 0 {
			best = brent(power, m, pm, p, pp, 1e-9*m)
			break
		}
		pm, pp = m, p
	}
	for k := range f {
		f[k] = best * unit[k]
	}
	return f
}

// denseSplit sets unit to the flow split of networkStart, the cycle flows
// per unit loop flow whose branch flows come nearest to carrying each
// heated branch's share qb/qTot of the heat, by the normal equations in
// cycle flows (false: they could not be solved).
func (s *state) denseSplit(qb []float64, qTot float64, unit []float64) bool {
	n := s.net
	nc := len(n.cycles)
	// Normal equations (CᵀWC + εI) f = CᵀW q, W = 1 on heated branches and
	// a small weight elsewhere so the split is defined everywhere.
	A := mat.NewSymDense(nc, nil)
	rhs := mat.NewVecDense(nc, nil)
	for bi := range n.branches {
		w := 1e-3
		q := 0.0
		if qb[bi] > 0 && qTot > 0 {
			w, q = 1, qb[bi]/qTot
		}
		bc := n.byBranch[bi]
		for i, tk := range bc {
			k, ck := tk.i, tk.c
			rhs.SetVec(k, rhs.AtVec(k)+w*ck*q)
			for _, tl := range bc[i:] {
				A.SetSym(k, tl.i, A.At(k, tl.i)+w*ck*tl.c)
			}
		}
	}
	for k := 0; k < nc; k++ {
		A.SetSym(k, k, A.At(k, k)+1e-9)
	}
	var dir mat.VecDense
	var ch mat.Cholesky
	if !ch.Factorize(A) || ch.SolveVecTo(&dir, rhs) != nil {
		return false
	}
	for k := range unit {
		unit[k] = dir.AtVec(k)
	}
	return true
}

// cycleSweeps improves f one cycle at a time, the others held, on a signed
// grid: a slower start for networks the single-loop start does not suit.
func (s *state) cycleSweeps(ev *eval, f []float64) {
	nc := len(s.net.cycles)
	for pass := 0; pass < 2; pass++ {
		for k := 0; k < nc; k++ {
			E := func(v float64) float64 {
				f[k] = v
				s.evaluate(f, ev)
				return ev.e[k]
			}
			best, bestAbs := f[k], math.Inf(1)
			signed := make([]float64, 0, 2*len(grid))
			for i := len(grid) - 1; i >= 0; i -= 2 {
				signed = append(signed, -grid[i])
			}
			for i := 0; i < len(grid); i += 2 {
				signed = append(signed, grid[i])
			}
			pv, pe := signed[0], E(signed[0])
			found := false
			for _, v := range signed[1:] {
				e := E(v)
				if (e > 0) != (pe > 0) && pe > 0 {
					r := brent(E, pv, v, pe, e, 1e-9*math.Max(math.Abs(v), 1e-9))
					if !found || math.Abs(r) > bestAbs {
						best, bestAbs = r, math.Abs(r)
					}
					found = true
				}
				pv, pe = v, e
			}
			f[k] = best
		}
	}
}

// sensitivity holds the work arrays of the Jacobian.
type sensitivity struct {
	S, T, U, V []float64 // per branch: ∂dp/∂m, ∂dp/∂x_in, ∂(|m|X)/∂m, |m|∂X/∂x_in
	up         []int     // upstream junction per branch
	K          *mat.Dense
	B          *mat.Dense
	G          mat.Dense
}

func newSensitivity(nb, nj, nc int) *sensitivity {
	return &sensitivity{S: make([]float64, nb), T: make([]float64, nb), U: make([]float64, nb), V: make([]float64, nb),
		up: make([]int, nb), K: mat.NewDense(nj, nj, nil), B: mat.NewDense(nj, nc, nil)}
}

// jacobianSteps are the difference steps of a branch's flow m and inlet
// quality x.
func jacobianSteps(m, x float64) (h, hx float64) {
	h = 1e-6 * math.Max(math.Abs(m), 1e-5)
	if m < 0 {
		h = -h
	}
	return h, 1e-6 * math.Max(math.Abs(x), 1e-3)
}

// jacobian sets J = −∂E/∂f at ev. Each branch's pressure drop depends on
// its own flow and on its upstream junction's quality; junction qualities
// depend on the flows through the mixing balance D_j x_j = Σ |m_b| X_b,
// which is linearised and solved for dx/df.
func (s *state) jacobian(ev *eval, J *mat.Dense, w *sensitivity) {
	n := s.net
	copy(s.pj, ev.pj) // the branches march from ev's junction pressures
	nc := len(n.cycles)
	for bi, b := range n.branches {
		m := ev.mb[bi]
		up := b.from
		if m < 0 {
			up = b.to
		}
		w.up[bi] = up
		x := ev.xj[up]
		h, hx := jacobianSteps(m, x)
		am := math.Abs(m)
		X := s.branchOutX(bi, m, x)
		w.U[bi] = (math.Abs(m+h)*s.branchOutX(bi, m+h, x) - am*X) / h
		w.V[bi] = am * (s.branchOutX(bi, m, x+hx) - X) / hx
	}
	// Mixing: D_j dx_j − Σ_in v_b dx_up(b) = Σ_in (u_b − x_j sgn m_b) dm_b.
	w.K.Zero()
	w.B.Zero()
	den := make([]float64, n.nj)
	for bi, b := range n.branches {
		down := b.to
		if ev.mb[bi] < 0 {
			down = b.from
		}
		den[down] += math.Abs(ev.mb[bi])
	}
	for bi, b := range n.branches {
		m := ev.mb[bi]
		down := b.to
		if m < 0 {
			down = b.from
		}
		if den[down] == 0 {
			continue
		}
		w.K.Set(down, w.up[bi], w.K.At(down, w.up[bi])-w.V[bi])
		coef := w.U[bi] - ev.xj[down]*math.Copysign(1, m)
		for _, t := range n.byBranch[bi] {
			w.B.Set(down, t.i, w.B.At(down, t.i)+coef*t.c)
		}
	}
	for j := 0; j < n.nj; j++ {
		if den[j] == 0 {
			w.K.Set(j, j, 1)
			for k := 0; k < nc; k++ {
				w.B.Set(j, k, 0)
			}
			continue
		}
		w.K.Set(j, j, w.K.At(j, j)+den[j])
	}
	if err := w.G.Solve(w.K, w.B); err != nil {
		w.G.Reset()
		w.G.ReuseAs(n.nj, nc)
	}
	// Each branch's pressure-drop sensitivities: to its flow always, to
	// its inlet quality only where that quality moves with the flows (a
	// junction fed only by a condenser's outlet keeps its quality, and the
	// term would be multiplied by zero).
	for bi := range n.branches {
		m, x := ev.mb[bi], ev.xj[w.up[bi]]
		h, hx := jacobianSteps(m, x)
		w.S[bi] = (s.branchDP(bi, m+h, x, nil) - ev.dp[bi]) / h
		w.T[bi] = 0
		for l := 0; l < nc; l++ {
			if w.G.At(w.up[bi], l) != 0 {
				w.T[bi] = (s.branchDP(bi, m, x+hx, nil) - ev.dp[bi]) / hx
				break
			}
		}
	}
	// d dp_b/df_l = S_b C_bl + T_b G_{up(b), l};  J_kl = Σ_b C_bk d dp_b/df_l.
	J.Zero()
	row := make([]float64, nc)
	for bi := range n.branches {
		for l := 0; l < nc; l++ {
			row[l] = w.T[bi] * w.G.At(w.up[bi], l)
		}
		for _, t := range n.byBranch[bi] {
			row[t.i] = w.S[bi]*t.c + w.T[bi]*w.G.At(w.up[bi], t.i)
		}
		for _, t := range n.byBranch[bi] {
			for l := 0; l < nc; l++ {
				J.Set(t.i, l, J.At(t.i, l)+t.c*row[l])
			}
		}
	}
}

// jacobianCache is a factorised Jacobian of the cycle balances kept for
// reuse: while a step with it still cuts the residual fast (the chord
// method), Newton's iteration skips forming and factorising a new one. The
// tilt search carries it from one attitude to the next, where the Jacobian
// barely changes.
type jacobianCache struct {
	lu    mat.LU
	sp    sparse.LU // a large network's (see sparseMinCycles)
	valid bool
}

// staleCut is how much a step with a reused Jacobian must reduce the
// squared residual (to a quarter: the residual halves) to be kept.
const staleCut = 0.25

// solveWarm solves the network from start, reusing jc, and failing that
// (with cold) from the single-loop start. Unlike solveNetwork it does not
// try the slow cycle sweeps: the tilt search calls it many times, some near
// attitudes where no balance exists.
func (s *state) solveWarm(ev *eval, start []float64, jc *jacobianCache, cold bool) ([]float64, error) {
	if start != nil {
		f, _, err := s.newton(ev, append([]float64(nil), start...), jc)
		if err == nil || !cold {
			return f, err
		}
	}
	jc.valid = false
	f, _, err := s.newton(ev, s.networkStart(ev), jc)
	return f, err
}

// newton drives the cycle momentum balances to zero from f, with a
// backtracking line search. jc, when not nil, holds a Jacobian to start
// with, is reused while it cuts the residual fast, and receives the last
// one factorised; without it every step forms a new Jacobian. Without an
// error it returns with ev evaluated at the flows it returns.
func (s *state) newton(ev *eval, f []float64, jc *jacobianCache) ([]float64, int, error) {
	n := s.net
	nc := len(n.cycles)
	scale := math.Max(1, s.maxBDisp*s.p.RhoL)
	rel := 1e-9
	if s.looseTol > 0 {
		rel = s.looseTol
	}
	tol := rel * scale
	reuse := jc != nil
	if !reuse {
		jc = &jacobianCache{}
	}
	wide := n.wide()
	var J *mat.Dense
	if !wide {
		J = mat.NewDense(nc, nc, nil)
	}
	rhs := mat.NewVecDense(nc, nil)
	var dx mat.VecDense
	trial := make([]float64, nc)
	step := make([]float64, nc)
	norm := func(e []float64) float64 {
		var s float64
		for _, v := range e {
			s += v * v
		}
		return s
	}
	var sens *sensitivity
	var at *eval // the evaluation at f while a step is tried
	evaluated := false
	steps, halvings := 60, 30
	if s.newtonCap > 0 {
		steps, halvings = s.newtonCap, min(s.newtonCap, 4)
	}
	for it := 0; it < steps; it++ {
		if !evaluated {
			s.evaluate(f, ev)
		}
		evaluated = false
		r0 := norm(ev.e)
		worst := 0.0
		for _, v := range ev.e {
			worst = math.Max(worst, math.Abs(v))
		}
		if worst <= tol {
			return f, it, nil
		}
		fresh := !jc.valid
		var err error
		if fresh {
			if wide {
				err = jc.sp.Factorize(s.branchJacobian(ev))
			} else {
				if sens == nil {
					sens = newSensitivity(len(n.branches), n.nj, nc)
				}
				s.jacobian(ev, J, sens)
				jc.lu.Factorize(J)
			}
			jc.valid = true
		}
		if wide {
			if err == nil {
				s.branchStep(ev, &jc.sp, step)
			}
		} else {
			for k := 0; k < nc; k++ {
				rhs.SetVec(k, ev.e[k])
			}
			err = jc.lu.SolveVecTo(&dx, false, rhs)
			if err == nil {
				for k := range step {
					step[k] = dx.AtVec(k)
				}
			}
		}
		if err != nil {
			jc.valid = false
			if fresh {
				return f, it, errNoConverge
			}
			evaluated = true // ev still holds the residual at f
			continue
		}
		if at == nil {
			at = s.newEval()
		}
		at.copyFrom(ev)
		lambda := 1.0
		ok := false
		for ls := 0; ls < halvings; ls++ {
			for k := range f {
				trial[k] = f[k] + lambda*step[k]
			}
			s.evaluate(trial, ev)
			r := norm(ev.e)
			if !fresh {
				// A reused Jacobian must earn its keep with the full step.
				ok = r < staleCut*r0
				break
			}
			if r < r0*(1-1e-4*lambda) || r == 0 {
				ok = true
				break
			}
			lambda /= 2
		}
		if !ok {
			jc.valid = false
			if fresh {
				return f, it, errNoConverge
			}
			ev.copyFrom(at) // the residual at f, for a fresh Jacobian
			evaluated = true
			continue
		}
		copy(f, trial)
		evaluated = true // ev holds the residual at the new f
		jc.valid = jc.valid && reuse
	}
	s.evaluate(f, ev)
	for _, v := range ev.e {
		if math.Abs(v) > tol {
			return f, steps, errNoConverge
		}
	}
	return f, steps, nil
}
