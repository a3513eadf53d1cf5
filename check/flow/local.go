package flow

import (
	"math"

	"circa/check/correlate"
	"circa/check/fluid"
	"circa/lang"
)

// Local saturation (methods { saturation_state local }), single loops only:
// the pressure is marched around the loop from the condenser outlet, where
// it is the saturation pressure of the case, and every cell takes the
// saturated state at its own pressure. The enthalpy march is unchanged: x is
// the enthalpy measured from the reference state, (h − h_f,0)/h_lv,0, and the
// local quality is (h − h_f(p))/h_lv(p). Liquid below its local saturation
// temperature is subcooled whatever the reference says; a mixture rising
// into lower pressure flashes.

// legDir is a component in flow order with its direction of traversal.
type legDir struct {
	ci  int
	dir float64
}

// ringOrder lists the ring's components in flow order at flow m, starting
// after the first condenser (so the condenser is last).
func (s *state) ringOrder(bi int, m float64) []legDir {
	b := &s.net.branches[bi]
	seq := make([]legDir, 0, len(b.legs))
	if m >= 0 {
		for _, lg := range b.legs {
			seq = append(seq, legDir{lg.ci, lg.sign})
		}
	} else {
		for i := len(b.legs) - 1; i >= 0; i-- {
			seq = append(seq, legDir{b.legs[i].ci, -b.legs[i].sign})
		}
	}
	for i, ld := range seq {
		if s.net.comps[ld.ci].kind == lang.Condenser {
			return append(seq[i+1:], seq[:i+1]...)
		}
	}
	return seq
}

// branchDPLocal is branchDP for a single loop in local mode.
func (s *state) branchDPLocal(bi int, m float64, visit func(ci int, dir, m, xin, xout float64, q parts)) float64 {
	seq := s.ringOrder(bi, m)
	if len(seq) == 0 {
		return 0
	}
	cond := seq[len(seq)-1].ci
	x := s.xCond[cond]
	p := s.sat.P
	prev := s.momentum(cond, m, x)
	var loss float64
	for _, ld := range seq {
		s.pIn[ld.ci] = p
		xo, q := s.marchLocal(ld.ci, ld.dir, m, x, nil)
		q.acc = q.mOut - prev
		prev = q.mOut
		if visit != nil {
			visit(ld.ci, ld.dir, m*ld.dir, x, xo, q)
		}
		loss += q.loss()
		p -= q.loss()
		x = xo
	}
	if m < 0 {
		return -loss
	}
	return loss
}

// satAt is the saturated state and correlation properties at pressure p
// (clamped to the fluid's range).
func (s *state) satAt(p float64) (fluid.Sat, correlate.Props) {
	sat, err := s.fl.AtP(p)
	if err != nil {
		pmin, _ := s.fl.AtT(s.info.Tmin)
		pmax, _ := s.fl.AtT(s.info.Tmax)
		if p < pmin.P {
			sat = pmin
		} else {
			sat = pmax
		}
	}
	pr := s.p
	pr.RhoL, pr.RhoV, pr.MuL, pr.MuV, pr.Sigma, pr.KL, pr.CpL, pr.Hlv = sat.RhoL, sat.RhoV, sat.MuL, sat.MuV, sat.Sigma, sat.KL, sat.CpL, sat.Hlv
	if s.info.Pc > 0 {
		pr.ReducedPressure = sat.P / s.info.Pc
	}
	return sat, pr
}

// localX is the local quality of reference enthalpy x at the saturated
// state sat.
func (s *state) localX(x float64, sat fluid.Sat) float64 {
	h := s.sat.HL + x*s.sat.Hlv
	return (h - sat.HL) / sat.Hlv
}

// cellLocal evaluates one cell of reference enthalpy x at local state
// (sat, pl): friction gradient, void, mixture and homogeneous densities and
// the local quality. Liquid keeps the density and viscosity of its own
// temperature.
func (s *state) cellLocal(cp *comp, G, x, cosInc float64, sat fluid.Sat, pl correlate.Props) (dpdz, alpha, rhoM, rhoH, xl float64) {
	xl = s.localX(x, sat)
	switch {
	case xl <= 0:
		rho, mu := s.liquid(math.Min(x, 0))
		return s.liquidGradient(G, cp.D, cp.rr, rho, mu), 0, rho, rho, xl
	case xl >= 1:
		pf := s.fric.Prepare(G, cp.D, cp.rr, pl, s.bmag)
		return pf.Gradient(1), 1, pl.RhoV, pl.RhoV, xl
	}
	pf := s.fric.Prepare(G, cp.D, cp.rr, pl, s.bmag)
	alpha = correlate.VoidFraction(s.void, xl, G, pl, s.bmag, cosInc)
	return pf.Gradient(xl), alpha, correlate.MixtureDensity(alpha, pl), correlate.HomogeneousDensity(xl, pl), xl
}

// momLocal is the momentum flux at reference enthalpy x and local state.
func (s *state) momLocal(G, x, cosInc float64, sat fluid.Sat, pl correlate.Props) (mom, rhoH float64) {
	xl := s.localX(x, sat)
	if xl <= 0 {
		rho, _ := s.liquid(math.Min(x, 0))
		return G * G / rho, rho
	}
	alpha := correlate.VoidFraction(s.void, xl, G, pl, s.bmag, cosInc)
	return correlate.AccelerationTerm(G, xl, alpha, pl), correlate.HomogeneousDensity(xl, pl)
}

// marchLocal is march in local mode: component ci from its inlet pressure
// s.pIn[ci]. Recorded cells carry the local quality.
func (s *state) marchLocal(ci int, dir float64, m, xin float64, rec func(cellRec)) (float64, parts) {
	cp := &s.net.comps[ci]
	am := math.Abs(m)
	G := am / cp.A
	xout := s.outletX(ci, am, xin)
	bd := s.bDisp[ci] * dir
	cosInc := s.cosInc[ci]
	n := s.cells
	if cp.L == 0 {
		n = 1
	}
	ds := cp.L / float64(n)
	dg := bd / float64(n)
	var q parts
	p := s.pIn[ci]
	if rec == nil && xout == xin && xin <= 0 && !localCellByCell {
		if q, ok := s.liquidTubeLocal(cp, G, xin, bd, p); ok {
			return xout, q
		}
	}
	satI, plI := s.satAt(p)
	q.mIn, _ = s.momLocal(G, xin, cosInc, satI, plI)
	dpPrev := 0.0
	for k := 0; k < n; k++ {
		xm := 0.5 * (s.faceX(cp, dir, xin, xout, k, n) + s.faceX(cp, dir, xin, xout, k+1, n))
		if cp.L == 0 {
			xm = xin
		}
		sat, pl := s.satAt(p - 0.5*dpPrev)
		dpdz, alpha, rhoM, rhoH, xl := s.cellLocal(cp, G, xm, cosInc, sat, pl)
		q.fric += dpdz * ds
		q.grav += rhoM * dg
		d := dpdz*ds - rhoM*dg
		if s.lossScale > 0 && s.lossScale != 1 {
			d = s.lossScale*dpdz*ds - rhoM*dg
		}
		p -= d
		dpPrev = d
		if rec != nil {
			rec(cellRec{x: xl, alpha: alpha, rhoM: rhoM, rhoH: rhoH, ds: ds})
		}
	}
	satO, plO := s.satAt(p)
	var rhoHOut float64
	q.mOut, rhoHOut = s.momLocal(G, xout, cosInc, satO, plO)
	q.acc = q.mOut - q.mIn
	q.local = cp.K * G * G / (2 * rhoHOut)
	return xout, s.scaled(q)
}

// localCellByCell, set by tests only, marches every tube cell by cell.
var localCellByCell bool

// liquidTubeLocal is marchLocal for a tube of liquid at reference enthalpy
// x ≤ 0 that neither heats nor cools it: density, viscosity and so the
// pressure gradient are the same in every cell, and the pressure is linear
// along the tube. Since the saturated liquid's enthalpy rises with the
// pressure, the liquid stays below its local saturation everywhere when it
// does at the lower of the tube's end pressures: then one saturation lookup
// replaces one per cell, and the parts are those the cells sum to. ok is
// false where the liquid may flash inside the tube.
func (s *state) liquidTubeLocal(cp *comp, G, x, bd, pIn float64) (parts, bool) {
	rho, mu := s.liquid(x)
	dpdz := s.liquidGradient(G, cp.D, cp.rr, rho, mu)
	q := parts{fric: dpdz * cp.L, grav: rho * bd}
	d := q.fric - q.grav
	if s.lossScale > 0 && s.lossScale != 1 {
		d = s.lossScale*q.fric - q.grav
	}
	sat, _ := s.satAt(math.Min(pIn, pIn-d))
	if !(s.localX(x, sat) <= 0) {
		return parts{}, false
	}
	q.mIn = G * G / rho
	q.mOut = q.mIn
	q.local = cp.K * G * G / (2 * rho)
	return s.scaled(q), true
}

// faceX is the reference enthalpy at cell face k of n: linear in the heated
// fraction passed in an evaporator, linear in length elsewhere.
func (s *state) faceX(cp *comp, dir, xin, xout float64, k, n int) float64 {
	f := float64(k) / float64(n)
	if cp.kind == lang.Evaporator {
		lo, hi := cp.heatedFrom, cp.heatedTo
		if dir < 0 {
			lo, hi = 1-hi, 1-lo
		}
		switch {
		case f <= lo:
			return xin
		case f >= hi:
			return xout
		}
		return xin + (xout-xin)*(f-lo)/(hi-lo)
	}
	return xin + (xout-xin)*f
}

// localStates fills each component's local-saturation state from the
// marched pressures. In local mode the pressures are those the march used
// and the reported qualities become the local ones; in single mode the
// pressures follow from the components' pressure changes, so the report
// shows what the single state leaves out.
func (s *state) localStates(m float64, states []ComponentState) {
	p := s.sat.P
	for _, ld := range s.ringOrder(0, m) {
		if s.local {
			p = s.pIn[ld.ci]
		}
		p = s.localState(ld.ci, ld.dir, p, &states[ld.ci])
	}
}

// localStatesNet is localStates for a network in local mode, each
// component from the inlet pressure its branch's march gave it; dirs holds
// each component's direction of traversal.
func (s *state) localStatesNet(dirs []float64, states []ComponentState) {
	for ci := range states {
		if dirs[ci] != 0 {
			s.localState(ci, dirs[ci], s.pIn[ci], &states[ci])
		}
	}
}

// localState fills component ci's local-saturation state from its inlet
// pressure p and returns its outlet pressure.
func (s *state) localState(ci int, dir, p float64, cs *ComponentState) float64 {
	pOut := p - cs.DpTotal
	satI, _ := s.satAt(p)
	satO, _ := s.satAt(pOut)
	xin, xout := cs.XIn, cs.XOut
	ls := &LocalState{PressureIn: p, SatTempIn: satI.T, SatTempOut: satO.T,
		XIn: s.localX(xin, satI), XOut: s.localX(xout, satO)}
	if cs.Kind == lang.Evaporator.String() {
		if ls.XIn < 0 {
			ls.SubcoolingIn = -ls.XIn * satI.Hlv / satI.CpL
		}
		ls.BoilingOnset = s.boilingOnset(ci, dir, xin, xout, p, pOut)
	}
	if s.local {
		cs.XIn, cs.XOut = ls.XIn, ls.XOut
		s.localOutlet(ci, cs, xout, pOut)
	}
	cs.Local = ls
	return pOut
}

// boilingOnset finds where the local quality of an evaporator crosses zero,
// m from its inlet, with the pressure taken linear between its inlet and
// outlet values; nil when it does not cross inside.
func (s *state) boilingOnset(ci int, dir, xin, xout, pIn, pOut float64) *float64 {
	cp := &s.net.comps[ci]
	xl := func(f float64) float64 {
		sat, _ := s.satAt(pIn + (pOut-pIn)*f)
		const n = 1 << 20
		return s.localX(s.faceX(cp, dir, xin, xout, int(f*n+0.5), n), sat)
	}
	if !(xl(0) < 0 && xl(1) > 0) {
		return nil
	}
	lo, hi := 0.0, 1.0
	for i := 0; i < 50; i++ {
		mid := (lo + hi) / 2
		if xl(mid) < 0 {
			lo = mid
		} else {
			hi = mid
		}
	}
	z := (lo + hi) / 2 * cp.L
	return &z
}

// localOutlet sets the outlet void fraction and phase velocities of a
// component at its local outlet state.
func (s *state) localOutlet(ci int, cs *ComponentState, xout, pOut float64) {
	sat, pl := s.satAt(pOut)
	xl := s.localX(xout, sat)
	G := math.Abs(cs.MassFlux)
	cs.VoidOut, cs.VelLiquid, cs.VelVapour = 0, 0, 0
	rhoL, _ := s.liquid(math.Min(xout, 0))
	if xl > 0 {
		cs.VoidOut = correlate.VoidFraction(s.void, xl, G, pl, s.bmag, s.cosInc[ci])
		rhoL = pl.RhoL
	}
	xo := math.Min(math.Max(xl, 0), 1)
	if cs.VoidOut < 1 {
		cs.VelLiquid = G * (1 - xo) / (rhoL * (1 - cs.VoidOut))
	}
	if cs.VoidOut > 0 {
		cs.VelVapour = G * xo / (pl.RhoV * cs.VoidOut)
	}
	if cs.MassFlow < 0 {
		cs.VelLiquid, cs.VelVapour = -cs.VelLiquid, -cs.VelVapour
	}
}

// junctionPressures sets the junction pressures of a network in local mode
// for the flows and qualities of ev. The condenser refCond's outlet is at
// the case's saturation pressure; every other junction follows from it
// through the branches' pressure changes along a spanning tree. Since each
// branch's change depends (weakly) on the pressure it starts from, the
// pressures are iterated to a fixed point from those of the previous
// evaluation; ev.dp holds the last changes marched. Without a condenser in
// the network every junction stays at the saturation pressure.
func (s *state) junctionPressures(ev *eval) {
	n := s.net
	rb := -1
	for bi, b := range n.branches {
		for _, lg := range b.legs {
			if lg.ci == s.refCond {
				rb = bi
			}
		}
	}
	if rb < 0 || n.nj == 0 {
		return
	}
	if s.jAdj == nil {
		s.jAdj = make([][]int, n.nj)
		for bi, b := range n.branches {
			s.jAdj[b.from] = append(s.jAdj[b.from], bi)
			if b.to != b.from {
				s.jAdj[b.to] = append(s.jAdj[b.to], bi)
			}
		}
	}
	next := make([]float64, n.nj)
	seen := make([]bool, n.nj)
	queue := make([]int, 0, n.nj)
	tol := 1e-7 + 1e-12*s.sat.P
	// Damped fixed-point iteration: a step that changes the pressures more
	// than the one before halves the damping (a riser on the edge of
	// flashing answers a small pressure change with a large one in weight).
	omega, prev := 1.0, math.Inf(1)
	if len(s.pjGood) != len(s.pj) {
		s.pjGood = make([]float64, len(s.pj))
	}
	copy(s.pjGood, s.pj)
	for it := 0; it < 100; it++ {
		for bi, b := range n.branches {
			up := b.from
			if ev.mb[bi] < 0 {
				up = b.to
			}
			ev.dp[bi] = s.branchDP(bi, ev.mb[bi], ev.xj[up], nil)
		}
		root := n.branches[rb].from
		if ev.mb[rb] < 0 {
			root = n.branches[rb].to
		}
		for j := range seen {
			seen[j] = false
		}
		next[root] = s.pj[root] + s.sat.P - s.pRef
		seen[root] = true
		queue = append(queue[:0], root)
		for len(queue) > 0 {
			u := queue[0]
			queue = queue[1:]
			for _, bi := range s.jAdj[u] {
				b := &n.branches[bi]
				switch {
				case b.from == u && !seen[b.to]:
					next[b.to] = next[u] - ev.dp[bi]
					seen[b.to] = true
					queue = append(queue, b.to)
				case b.to == u && !seen[b.from]:
					next[b.from] = next[u] + ev.dp[bi]
					seen[b.from] = true
					queue = append(queue, b.from)
				}
			}
		}
		change := 0.0
		for j := range next {
			if seen[j] && finite(next[j]) {
				change = math.Max(change, math.Abs(next[j]-s.pj[j]))
			}
		}
		if change <= tol {
			return
		}
		if change > prev {
			omega = math.Max(omega/2, 1.0/64)
		}
		prev = change
		clamped := false
		for j := range next {
			if seen[j] && finite(next[j]) {
				v := s.pj[j] + omega*(next[j]-s.pj[j])
				s.pj[j] = math.Min(math.Max(v, s.pLo), s.pHi)
				clamped = clamped || s.pj[j] != v
			}
		}
		if clamped {
			// Pressures beyond the fluid's range (a trial flow far from
			// any balance): no fixed point to find.
			break
		}
	}

	// No fixed point: the next evaluation starts from the last one found.
	copy(s.pj, s.pjGood)
}
