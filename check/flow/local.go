package flow

import (
	"math"

	"circa/check/correlate"
	"circa/check/fluid"
	"circa/lang"
)

// Local saturation (methods { saturation_state local }, or auto where the
// liquid column decides it): in a single loop the pressure is marched
// around the loop from the condenser outlet, where
// it is the saturation pressure of the case, and every cell takes the
// saturated state at its own pressure. The enthalpy march is unchanged: x is
// the enthalpy measured from the reference state, (h − h_f,0)/h_lv,0, and the
// local quality is (h − h_f(p))/h_lv(p). Liquid below its local saturation
// temperature is subcooled whatever the reference says; a mixture rising
// into lower pressure flashes.

// AutoLocalShift is the shift of the saturation temperature by the liquid
// column's weight above which saturation_state auto estimates a case at
// local saturation, K. It is circa's own screening rule. Above it (water or
// R1233zd(E) at a few kPa to about 1 bar under a tall column) the single
// state misses a subcooled inlet and the flashing in the riser, and its
// flow can be several times too high.
//
// Below it the single state still errs. It takes an inlet subcooled by the
// shift ΔT as saturated, so its exit quality is high by about
// c_p,l·ΔT/h_lv: per kelvin at 40 °C 0.0017 for water, 0.0045 for
// ammonia, 0.0067 to 0.011 for R1233zd(E), R134a, R1234ze(E) and R1234yf.
// On the shipped examples (0.17 to 2.8 K) the two states' exit qualities
// differ by 0.0005 to 0.012 and their flows by 0.01 to 4.4 %. A switch at
// 1 K, where the estimate starts to note the subcooling the single state
// ignores, would keep that error within about 0.01 of quality for every
// built-in fluid, but it moves rack-door and six of tram-inverter's seven
// cases to the local march, whose cost their design guidance pays in every
// variant: 2.9 and 9.5 times the CPU (0.29 → 0.85 s, 0.25 → 2.4 s,
// BenchmarkExamples in check/guide), so the switch stays at 5 K until the
// march costs about what the single state does.
const AutoLocalShift = 5.0 // K

// PinKey is the key of a loop's case in Options.Pinned.
func PinKey(loop, cs string) string { return loop + "\x00" + cs }

// PinnedStates returns the saturation state each case of res was
// estimated with at its own attitude, for Options.Pinned, in the loops
// whose saturation_state is auto (nil when there are none).
func PinnedStates(res *Result) map[string]string {
	var out map[string]string
	for _, l := range res.Loops {
		if l.Methods.Saturation != "auto" {
			continue
		}
		for _, c := range l.Cases {
			if c.Grid || c.SatState == "" {
				continue
			}
			if out == nil {
				out = map[string]string{}
			}
			out[PinKey(l.Loop, c.Case)] = c.SatState
		}
	}
	return out
}

// AutoState is the state saturation_state auto chooses for a case by its
// liquid column, whatever was pinned.
func (c *CaseResult) AutoState() string {
	if c.ColumnShift > AutoLocalShift {
		return "local"
	}
	return "single"
}

// saturationState sets the case's saturation state (single or local) and
// what local saturation needs: the fluid's pressure range, the saturation
// grid, and for a network its junction pressures. Under saturation_state
// auto the state is decided by caseShift, the column shift of the case at
// its own attitude (or its pin), so that every sweep, profile and envelope
// point of a case shares the case's state; cr.ColumnShift is the point's
// own.
func (p *prepared) saturationState(s *state, cr *CaseResult, caseShift float64) {
	cr.ColumnShift = p.columnShift(s)
	switch p.methods.Saturation {
	case "local":
		s.local = true
	case "auto":
		s.local = caseShift > AutoLocalShift
		if st, ok := p.pinned[PinKey(p.l.Name, cr.Case)]; ok {
			s.local = st == "local"
		}
	}
	cr.SatState = "single"
	if !s.local {
		return
	}
	cr.SatState = "local"
	s.pLo, s.pHi = 0, math.Inf(1)
	if lo, err := p.fl.AtT(p.info.Tmin); err == nil {
		s.pLo = lo.P
	}
	if hi, err := p.fl.AtT(p.info.Tmax); err == nil {
		s.pHi = hi.P
	}
	if s.pLo > 0 && s.pHi < math.Inf(1) {
		s.grid = gridFor(p.fl, s.pLo, s.pHi)
	}
	if s.net.ring {
		return
	}
	s.pj = make([]float64, s.net.nj)
	for j := range s.pj {
		s.pj[j] = s.sat.P
	}
	for ci, cp := range s.net.comps {
		if cp.kind == lang.Condenser {
			s.refCond = ci
			break
		}
	}
}

// columnTop gives the height of a node along the body force and the height
// of the highest condenser outlet, from which the liquid columns above the
// evaporator inlets are measured; ok is false without node positions, body
// force or a placed condenser outlet.
func (p *prepared) columnTop(s *state) (height func(*lang.Node) (float64, bool), top float64, ok bool) {
	if p.lay == nil || !(s.bmag > 0) {
		return nil, 0, false
	}
	up := s.b.Scale(-1 / s.bmag)
	height = func(n *lang.Node) (float64, bool) {
		if n == nil || n.Index < 0 || n.Index >= len(p.lay.Pos) {
			return 0, false
		}
		return p.lay.Pos[n.Index].Dot(up), true
	}
	top = math.Inf(-1)
	for _, cp := range s.net.comps {
		if cp.kind != lang.Condenser {
			continue
		}
		if h, k := height(cp.c.To); k && h > top {
			top, ok = h, true
		}
	}
	return height, top, ok
}

// columnShift is the largest rise of the saturation temperature, K, that
// the hydrostatic head ρ_l·|b|·H of a liquid column gives at an evaporator
// inlet, H the height along the body force from the highest condenser
// outlet down to that inlet (0 without node positions or body force).
func (p *prepared) columnShift(s *state) float64 {
	height, top, ok := p.columnTop(s)
	if !ok {
		return 0
	}
	low := math.Inf(1)
	for _, cp := range s.net.comps {
		if cp.kind != lang.Evaporator {
			continue
		}
		if h, k := height(cp.c.From); k && h < low {
			low = h
		}
	}
	if !(top > low) || math.IsInf(low, 0) {
		return 0
	}
	pin := s.sat.P + s.sat.RhoL*s.bmag*(top-low)
	in, err := p.fl.AtP(pin)
	if err != nil {
		// Past the top of the fluid's range: certainly more than any
		// threshold.
		return math.Max(p.info.Tmax-s.sat.T, 0)
	}
	return math.Max(in.T-s.sat.T, 0)
}

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
	return s.qualityAt(x, sat.HL, sat.Hlv)
}

// qualityAt is the local quality of reference enthalpy x where the liquid
// saturates at enthalpy hl with latent heat hlv.
func (s *state) qualityAt(x, hl, hlv float64) float64 {
	return (s.sat.HL + x*s.sat.Hlv - hl) / hlv
}

// localXh is localX at satAt(p)'s state, from its enthalpies alone.
func (s *state) localXh(x, p float64) float64 {
	hl, hlv, err := fluid.EnthalpiesAtP(s.fl, p)
	if err != nil {
		sat, _ := s.satAt(p)
		hl, hlv = sat.HL, sat.Hlv
	}
	return s.qualityAt(x, hl, hlv)
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
	if s.net.comps[ci].kind == lang.Condenser && xout <= 0 {
		// A condenser's outlet is liquid by construction: its pressure
		// differs from the saturation pressure it is referred to only by
		// the balance's residual, which must not make vapour of it.
		ls.XOut = math.Min(ls.XOut, 0)
	}
	if cs.Kind == lang.Evaporator.String() {
		if ls.XIn < 0 {
			ls.SubcoolingIn = -ls.XIn * satI.Hlv / satI.CpL
		}
		ls.BoilingOnset = s.boilingOnset(ci, dir, cs.MassFlow, xin, xout, p)
	}
	if s.local {
		cs.XIn, cs.XOut = ls.XIn, ls.XOut
		s.localOutlet(ci, cs, xout, pOut)
	}
	cs.Local = ls
	return pOut
}

// boilingOnset finds where the local quality of an evaporator crosses zero,
// m from its inlet, at flow m; nil when it does not cross inside. Up to
// the onset the tube holds liquid, so the pressure is marched from the inlet
// pressure pIn with the liquid's own gradient, its weight along the body
// force and its single-phase friction at the cell's density and viscosity:
// the pressure taken linear to the component's outlet falls too slowly
// there, since the lighter two-phase part above weighs less.
func (s *state) boilingOnset(ci int, dir, m, xin, xout, pIn float64) *float64 {
	cp := &s.net.comps[ci]
	if !(cp.L > 0) {
		return nil
	}
	const n = onsetCells
	G := math.Abs(m) / cp.A
	gain := s.bDisp[ci] * dir / cp.L // hydrostatic pressure gain per unit length along the flow
	scale := 1.0
	if s.lossScale > 0 {
		scale = s.lossScale
	}
	ds := cp.L / n
	p := pIn
	x := s.faceX(cp, dir, xin, xout, 0, n)
	prev := s.localXh(x, p)
	if !(prev < 0) {
		return nil
	}
	for k := 1; k <= n; k++ {
		// The cell's gradient at its inlet face's liquid state.
		rho, mu := s.liquid(x)
		p -= (scale*s.liquidGradient(G, cp.D, cp.rr, rho, mu) - rho*gain) * ds
		x = s.faceX(cp, dir, xin, xout, k, n)
		xl := s.localXh(x, p)
		if xl >= 0 {
			z := (float64(k-1) + prev/(prev-xl)) * ds
			return &z
		}
		prev = xl
	}
	return nil
}

// onsetCells is the number of cells boilingOnset marches an evaporator
// in: the liquid's gradient changes with its temperature by about 1 % over
// a 20 K rise, so the march is a first-order sum that halving its cells
// moves by well under a millimetre.
const onsetCells = 512

// localOutlet sets the outlet void fraction and phase velocities of a
// component at its local outlet state.
func (s *state) localOutlet(ci int, cs *ComponentState, xout, pOut float64) {
	sat, pl := s.satAt(pOut)
	xl := s.localX(xout, sat)
	if s.net.comps[ci].kind == lang.Condenser && xout <= 0 {
		xl = math.Min(xl, 0) // liquid by construction, as in localState
	}
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
// pressures are iterated to a fixed point, every time from those of the
// single state's changes at ev's flows, so that they (and the balances
// marched from them) are a function of ev's flows alone, whatever was
// evaluated before; ev.dp holds the last changes marched and ev.pj the
// pressures. Where the iteration swings, the root junction's pressure is
// found by bracketing and the others iterated again; without a fixed point
// the iterate that moved least is kept.
// Without a condenser in the network every junction stays at the
// saturation pressure.
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
	// sweep sets next along a spanning tree from the root junction's
	// pressure and the branches' changes ev.dp.
	sweep := func(root int, p float64) {
		for j := range seen {
			seen[j] = false
		}
		next[root] = p
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
	}
	root := n.branches[rb].from
	if ev.mb[rb] < 0 {
		root = n.branches[rb].to
	}
	// The start: the junction pressures of the single state's pressure
	// changes, with refCond's outlet at the saturation pressure. It depends
	// on ev's flows and qualities alone.
	s.local = false
	for bi, b := range n.branches {
		up := b.from
		if ev.mb[bi] < 0 {
			up = b.to
		}
		ev.dp[bi] = s.branchDP(bi, ev.mb[bi], ev.xj[up], nil)
	}
	toRef, reached := 0.0, false
	s.branchDP(rb, ev.mb[rb], ev.xj[root], func(ci int, _, _, _, _ float64, q parts) {
		if !reached {
			toRef += q.loss()
			reached = ci == s.refCond
		}
	})
	s.local = true
	sweep(root, s.sat.P+toRef)
	for j := range s.pj {
		v := s.sat.P
		if seen[j] && finite(next[j]) {
			v = next[j]
		}
		s.pj[j] = math.Min(math.Max(v, s.pLo), s.pHi)
	}
	tol := 1e-7 + 1e-12*s.sat.P
	if len(s.pjBest) != len(s.pj) {
		s.pjBest = make([]float64, len(s.pj))
	}
	best := math.Inf(1)
	// iterate is a damped fixed-point iteration from s.pj: a step that
	// changes the pressures more than the one before halves the damping (a
	// riser on the edge of flashing answers a small pressure change with a
	// large one in weight). It reports whether it reached a fixed point.
	iterate := func() bool {
		omega, prev := 1.0, math.Inf(1)
		for it := 0; it < 100; it++ {
			for bi, b := range n.branches {
				up := b.from
				if ev.mb[bi] < 0 {
					up = b.to
				}
				ev.dp[bi] = s.branchDP(bi, ev.mb[bi], ev.xj[up], nil)
			}
			sweep(root, s.pj[root]+s.sat.P-s.pRef)
			change := 0.0
			for j := range next {
				if seen[j] && finite(next[j]) {
					change = math.Max(change, math.Abs(next[j]-s.pj[j]))
				}
			}
			if change <= tol {
				return true
			}
			if change < best {
				best = change
				copy(s.pjBest, s.pj)
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
				// Pressures beyond the fluid's range (a trial flow far
				// from any balance): no fixed point to find.
				return false
			}
		}
		return false
	}
	p0 := s.pj[root]
	if iterate() {
		return
	}
	// The root junction's pressure alone sets refCond's outlet pressure,
	// and where the branch from it flashes that answers a change of the
	// root's pressure with a larger one the other way, so the iteration
	// swings. Then the root's pressure is bracketed outward from the start
	// and found by Brent's method, and the other junctions iterated to it.
	g := func(p float64) float64 {
		s.pj[root] = p
		s.branchDP(rb, ev.mb[rb], ev.xj[root], nil)
		return s.pRef - s.sat.P
	}
	g0 := g(p0)
	up, gup, dn, gdn := p0, g0, p0, g0
	var lo, hi, glo, ghi float64
	found := false
	for k := 0; k < 40 && !found && finite(g0) && g0 != 0; k++ {
		if up < s.pHi {
			b := math.Min(up*1.25, s.pHi)
			gb := g(b)
			if !finite(gb) {
				break
			}
			if found = (gb > 0) != (gup > 0); found {
				lo, hi, glo, ghi = up, b, gup, gb
				break
			}
			up, gup = b, gb
		}
		if dn > s.pLo {
			b := math.Max(dn/1.25, s.pLo)
			gb := g(b)
			if !finite(gb) {
				break
			}
			if found = (gb > 0) != (gdn > 0); found {
				lo, hi, glo, ghi = b, dn, gb, gdn
				break
			}
			dn, gdn = b, gb
		}
	}
	if found {
		pr := brent(g, lo, hi, glo, ghi, tol)
		for j := range s.pj {
			s.pj[j] = s.pjBest[j]
		}
		s.pj[root] = pr
		if iterate() {
			return
		}
	}

	// No fixed point: the iterate that moved least.
	if best < math.Inf(1) {
		copy(s.pj, s.pjBest)
	}
}
