package flow

import (
	"errors"
	"math"

	"gonum.org/v1/gonum/mat"

	"circa/lang"
)

// Bracketing grid for the single-loop mass flow, kg/s.
const (
	flowMin       = 1e-6
	flowMax       = 10.0
	gridPerDecade = 5
)

// eval holds one evaluation of the network at given cycle flows.
type eval struct {
	mb []float64 // branch flows along each branch's reference direction
	xj []float64 // junction qualities
	dp []float64 // p_from − p_to per branch
	e  []float64 // excess head per cycle
}

func (s *state) newEval() *eval {
	n := s.net
	return &eval{mb: make([]float64, len(n.branches)), xj: make([]float64, n.nj),
		dp: make([]float64, len(n.branches)), e: make([]float64, len(n.cycles))}
}

// branchFlows sets the branch flows from the cycle flows.
func (s *state) branchFlows(f []float64, ev *eval) {
	for bi := range ev.mb {
		var m float64
		for k, c := range s.net.cycles {
			m += c[bi] * f[k]
		}
		ev.mb[bi] = m
	}
}

// branchOutX follows quality through branch bi at flow m from inlet xin.
func (s *state) branchOutX(bi int, m, xin float64) float64 {
	b := &s.net.branches[bi]
	x := xin
	if m >= 0 {
		for _, lg := range b.legs {
			x = s.outletX(lg.ci, m, x)
		}
	} else {
		for i := len(b.legs) - 1; i >= 0; i-- {
			x = s.outletX(b.legs[i].ci, m, x)
		}
	}
	return x
}

// coldest is the lowest condenser outlet quality, the starting guess for
// every junction's enthalpy.
func (s *state) coldest() float64 {
	x := 0.0
	for ci, cp := range s.net.comps {
		if cp.kind == lang.Condenser && s.xCond[ci] < x {
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
	b := &s.net.branches[bi]
	x := xin
	var loss float64
	step := func(lg leg, dir float64) {
		xo, q := s.march(lg.ci, dir, m, x, nil)
		if visit != nil {
			visit(lg.ci, dir, m*lg.sign, x, xo, q)
		}
		loss += q.loss()
		x = xo
	}
	if m >= 0 {
		for _, lg := range b.legs {
			step(lg, lg.sign)
		}
		return loss
	}
	for i := len(b.legs) - 1; i >= 0; i-- {
		step(b.legs[i], -b.legs[i].sign)
	}
	return -loss
}

// evaluate fills ev for cycle flows f.
func (s *state) evaluate(f []float64, ev *eval) {
	s.branchFlows(f, ev)
	s.mix(ev)
	for bi, b := range s.net.branches {
		up := b.from
		if ev.mb[bi] < 0 {
			up = b.to
		}
		ev.dp[bi] = s.branchDP(bi, ev.mb[bi], ev.xj[up], nil)
	}
	for k, c := range s.net.cycles {
		var e float64
		for bi, cb := range c {
			if cb != 0 {
				e -= cb * ev.dp[bi]
			}
		}
		ev.e[k] = e
	}
}

// root is one operating point of a single loop.
type root struct {
	m, slope float64
}

// brent finds a root of f in [a, b] where f(a) and f(b) differ in sign
// (Brent 1973, Algorithms for Minimization without Derivatives, ch. 4).
func brent(f func(float64) float64, a, b, fa, fb, tol float64) float64 {
	c, fc := a, fa
	d := b - a
	e := d
	for i := 0; i < 100; i++ {
		if (fb > 0) == (fc > 0) {
			c, fc = a, fa
			d = b - a
			e = d
		}
		if math.Abs(fc) < math.Abs(fb) {
			a, b, c = b, c, b
			fa, fb, fc = fb, fc, fb
		}
		t := 2*1e-15*math.Abs(b) + 0.5*tol
		mid := 0.5 * (c - b)
		if math.Abs(mid) <= t || fb == 0 {
			return b
		}
		if math.Abs(e) >= t && math.Abs(fa) > math.Abs(fb) {
			var p, q float64
			sv := fb / fa
			if a == c {
				p = 2 * mid * sv
				q = 1 - sv
			} else {
				q0 := fa / fc
				r := fb / fc
				p = sv * (2*mid*q0*(q0-r) - (b-a)*(r-1))
				q = (q0 - 1) * (r - 1) * (sv - 1)
			}
			if p > 0 {
				q = -q
			} else {
				p = -p
			}
			if 2*p < math.Min(3*mid*q-math.Abs(t*q), math.Abs(e*q)) {
				e = d
				d = p / q
			} else {
				d = mid
				e = d
			}
		} else {
			d = mid
			e = d
		}
		a, fa = b, fb
		if math.Abs(d) > t {
			b += d
		} else if mid > 0 {
			b += t
		} else {
			b -= t
		}
		fb = f(b)
	}
	return b
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

// ringRoots brackets and refines every root of the single loop's excess
// head on the flow grid.
func (s *state) ringRoots(ev *eval) ([]root, float64) {
	f := []float64{0}
	E := func(m float64) float64 {
		f[0] = m
		s.evaluate(f, ev)
		return ev.e[0]
	}
	var roots []root
	prevM, prevE := grid[0], E(grid[0])
	e0 := prevE
	for _, m := range grid[1:] {
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

// circulates reports whether the single loop's excess head is positive
// anywhere on the grid (a root exists, since it is negative at high flow).
func (s *state) circulates(ev *eval) bool {
	f := []float64{0}
	for _, m := range grid {
		f[0] = m
		s.evaluate(f, ev)
		if ev.e[0] > 0 {
			return true
		}
	}
	return false
}

var errNoConverge = errors.New("network solution did not converge")

// solveNetwork solves every cycle's momentum balance by Newton's method with
// a backtracking line search, started from one cycle at a time.
func (s *state) solveNetwork(ev *eval, start []float64) ([]float64, int, error) {
	if start != nil {
		if f, it, err := s.newton(ev, append([]float64(nil), start...)); err == nil {
			return f, it, nil
		}
	}
	n := s.net
	nc := len(n.cycles)
	f := make([]float64, nc)
	// Start: each cycle alone, the others held, on a signed grid.
	for pass := 0; pass < 2; pass++ {
		for k := 0; k < nc; k++ {
			E := func(v float64) float64 {
				f[k] = v
				s.evaluate(f, ev)
				return ev.e[k]
			}
			best, bestAbs := 0.0, math.Inf(1)
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
				if (e > 0) != (pe > 0) && pe > 0 == (v > pv) {
					r := brent(E, pv, v, pe, e, 1e-9*math.Max(math.Abs(v), 1e-9))
					if !found || math.Abs(r) > bestAbs {
						best, bestAbs = r, math.Abs(r)
					}
					found = true
				}
				pv, pe = v, e
			}
			if !found {
				best = 0
			}
			f[k] = best
		}
	}
	return s.newton(ev, f)
}

// newton drives the cycle momentum balances to zero from f.
func (s *state) newton(ev *eval, f []float64) ([]float64, int, error) {
	n := s.net
	nc := len(n.cycles)
	scale := 1.0
	for ci := range n.comps {
		scale = math.Max(scale, math.Abs(s.bDisp[ci])*s.p.RhoL)
	}
	tol := 1e-9 * scale
	J := mat.NewDense(nc, nc, nil)
	rhs := mat.NewVecDense(nc, nil)
	var dx mat.VecDense
	trial := make([]float64, nc)
	norm := func(e []float64) float64 {
		var s float64
		for _, v := range e {
			s += v * v
		}
		return s
	}
	slopes := make([]float64, len(n.branches))
	for it := 0; it < 60; it++ {
		s.evaluate(f, ev)
		r0 := norm(ev.e)
		worst := 0.0
		for _, v := range ev.e {
			worst = math.Max(worst, math.Abs(v))
		}
		if worst <= tol {
			return f, it, nil
		}
		// Branch slopes d(p_from − p_to)/dm at the present inlet states.
		for bi, b := range n.branches {
			m := ev.mb[bi]
			up := b.from
			if m < 0 {
				up = b.to
			}
			h := 1e-6 * math.Max(math.Abs(m), 1e-5)
			if m < 0 {
				h = -h
			}
			slopes[bi] = (s.branchDP(bi, m+h, ev.xj[up], nil) - ev.dp[bi]) / h
		}
		for k := 0; k < nc; k++ {
			rhs.SetVec(k, ev.e[k])
			for l := 0; l < nc; l++ {
				var v float64
				for bi := range n.branches {
					ck, cl := n.cycles[k][bi], n.cycles[l][bi]
					if ck != 0 && cl != 0 {
						v += ck * cl * slopes[bi]
					}
				}
				J.Set(k, l, v) // −dE_k/df_l
			}
		}
		if err := dx.SolveVec(J, rhs); err != nil {
			return f, it, errNoConverge
		}
		lambda := 1.0
		ok := false
		for ls := 0; ls < 30; ls++ {
			for k := range f {
				trial[k] = f[k] + lambda*dx.AtVec(k)
			}
			s.evaluate(trial, ev)
			if norm(ev.e) < r0*(1-1e-4*lambda) || norm(ev.e) == 0 {
				ok = true
				break
			}
			lambda /= 2
		}
		if !ok {
			return f, it, errNoConverge
		}
		copy(f, trial)
	}
	s.evaluate(f, ev)
	for _, v := range ev.e {
		if math.Abs(v) > tol {
			return f, 60, errNoConverge
		}
	}
	return f, 60, nil
}
