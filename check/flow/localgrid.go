package flow

import (
	"math"
	"sync"
	"sync/atomic"

	"circa/check/correlate"
	"circa/check/fluid"
	"circa/lang"
)

// The local march asks for the saturated state at the pressure of every
// cell. A look-up in the fluid's table inverts its pressure spline, and the
// friction methods built on the liquid-only and vapour-only gradients
// prepare two Churchill factors per property set: done per cell that is
// most of an estimate's cost. So the saturated states are kept, per fluid
// and for the whole process, on a grid uniform in ln p, each node computed
// when a march first reaches it, and a cell takes its properties linearly
// interpolated between the two nodes around its pressure. The friction
// of the methods built on single-phase gradients is prepared at the nodes
// for each bore and mass flux a case's marches reach, shared by every tube
// of that bore (see singlePhaseLocal).
//
// Accuracy: linear interpolation over a step h in ln p (linear in p within
// an interval, the same order) errs by about h²/8 times the property's
// relative second derivative. The vapour density is nearly proportional
// to p (relative second derivative ≈ 1), so its error is about 1.25e-5 at
// h = 0.01. The liquid enthalpy and the latent heat, which set the local
// quality (and near zero quality, at flashing and boiling onset, the void
// fraction hangs on it), are interpolated by cubic Hermite polynomials with
// the nodes' slopes along the saturation line: within a part in 10⁸ of the
// latent heat. TestLocalGridProperties checks the
// interpolated states against the table across the nodes,
// TestLocalGridFriction the single-phase gradients, and TestLocalFastMarch
// the estimates against the fine march that looks every cell up exactly
// (flows within 1e-4 relative).

// satGridStep is the grid's step in ln p.
const satGridStep = 0.01

// satNode is the saturated state at one grid pressure.
type satNode struct {
	p       float64 // the node's pressure, Pa
	hl, hlv float64 // saturated liquid enthalpy and latent heat, J/kg
	// Their derivatives along the saturation line, J/(kg·Pa): the local
	// quality near zero (flashing, boiling onset) is as sensitive as the
	// liquid enthalpy is accurate, so these two are interpolated by cubic
	// Hermite polynomials.
	dhl, dhlv float64
	pl        correlate.Props
}

// satNodes are one fluid's saturated states at p_k = e^(k·h) Pa over its
// pressure range, each computed on first use and then shared by every
// estimate in the process (the states depend on the fluid alone).
type satNodes struct {
	k0    int
	nodes []atomic.Pointer[satNode]
}

// satGrid is a case's view of its fluid's nodes, with the interval of its
// last look-up (nodes ka and ka+1 at pa and pb) and the friction prepared
// at the nodes its marches reached.
type satGrid struct {
	shared *satNodes
	ka     int
	pa, pb float64
	a, b   *satNode // nodes ka and ka+1
	fric   *[nodeFrictionSlots]nodeFriction
}

// nodeFriction is the friction prepared at grid node k for a tube of bore
// D and relative roughness rr at mass flux G under body force g, and for
// the methods built on single-phase gradients the products of its
// liquid-only and vapour-only gradients with the node's phase densities,
// f·G²/(2D).
type nodeFriction struct {
	ok          bool
	k           int
	G, D, rr, g float64
	pf          correlate.PreparedFriction
	fLo, fGo    float64
}

// nodeFrictionSlots is the size of a case's node-friction table, indexed
// by node modulo its size: the tubes of one bore in a loop at one flow
// share the few nodes their pressures cross, and Brent's slope and
// Newton's Jacobian march again at the same flows.
const nodeFrictionSlots = 32

var (
	satNodesMu sync.Mutex
	satNodesOf = map[fluid.Fluid]*satNodes{}
)

// satNodesCap bounds the fluids whose nodes are kept: user tables loaded
// again on every edit would otherwise pile up.
const satNodesCap = 16

// gridFor returns the node store of fluid fl, whose saturation pressures
// span pLo to pHi.
func gridFor(fl fluid.Fluid, pLo, pHi float64) *satGrid {
	satNodesMu.Lock()
	defer satNodesMu.Unlock()
	n, ok := satNodesOf[fl]
	if !ok {
		if len(satNodesOf) >= satNodesCap {
			clear(satNodesOf)
		}
		k0 := int(math.Floor(math.Log(pLo)/satGridStep)) - 1
		k1 := int(math.Ceil(math.Log(pHi)/satGridStep)) + 1
		n = &satNodes{k0: k0, nodes: make([]atomic.Pointer[satNode], k1-k0+1)}
		satNodesOf[fl] = n
	}
	return &satGrid{shared: n}
}

// clampP clamps a pressure to the fluid's saturation range.
func (s *state) clampP(p float64) float64 {
	if !(p > s.pLo) {
		return s.pLo
	}
	if !(p < s.pHi) {
		return s.pHi
	}
	return p
}

// localProps is the saturated state the local march takes at one
// pressure: interpolated between grid nodes k and k+1 with weight t on the
// upper one (exact: looked up directly, k unused).
type localProps struct {
	hl, hlv float64
	pl      correlate.Props
	k       int
	t       float64
	exact   bool
}

// localExact, set by tests only, has the local march look up every cell's
// saturated state and prepare its friction directly instead of through the
// grid, march liquid tubes like the others, and take four times the steps
// in adiabatic tubes: the fine march that the grid's march is checked
// against.
var localExact bool

// node returns grid node k, computing it on first use. Two goroutines
// that meet an empty node both compute it, to the same value.
func (s *state) node(k int) *satNode {
	g := s.grid.shared
	i := min(max(k-g.k0, 0), len(g.nodes)-1)
	if nd := g.nodes[i].Load(); nd != nil {
		return nd
	}
	p := math.Exp(float64(i+g.k0) * satGridStep)
	sat, pl := s.satAt(p)
	nd := &satNode{p: p, hl: sat.HL, hlv: sat.Hlv, pl: pl}
	const eps = 1e-4
	if lo, hi := p*(1-eps), p*(1+eps); lo > s.pLo && hi < s.pHi {
		a, _ := s.satAt(lo)
		b, _ := s.satAt(hi)
		nd.dhl, nd.dhlv = (b.HL-a.HL)/(hi-lo), (b.Hlv-a.Hlv)/(hi-lo)
	} else if nb := math.Exp(float64(i+g.k0+1) * satGridStep); nb < s.pHi {
		// At the range's low end: the slope to the next node.
		b, _ := s.satAt(nb)
		nd.dhl, nd.dhlv = (b.HL-sat.HL)/(nb-p), (b.Hlv-sat.Hlv)/(nb-p)
	}
	g.nodes[i].Store(nd)
	return nd
}

// interval finds the grid interval around pressure p (clamped to the
// fluid's range): nodes a and b and the weight t of b, linear in p within
// the interval (the same order of accuracy as linear in ln p). The last
// interval and its neighbours are found without a logarithm.
func (s *state) interval(p float64) (a, b *satNode, k int, t float64) {
	p = s.clampP(p)
	g := s.grid
	k = g.ka
	switch {
	case g.pb > g.pa && p >= g.pa && p < g.pb:
		a, b = g.a, g.b
		t = (p - a.p) / (b.p - a.p)
		if !(t >= 0 && t <= 1) {
			t = math.Min(math.Max(t, 0), 1)
		}
		return a, b, k, t
	case g.pb > g.pa && p >= g.pb && p < g.pb*satGridRatio:
		k++
	case g.pb > g.pa && p < g.pa && p >= g.pa/satGridRatio:
		k--
	default:
		k = int(math.Floor(math.Log(p) / satGridStep))
	}
	a, b = s.node(k), s.node(k+1)
	g.ka, g.pa, g.pb, g.a, g.b = k, a.p, b.p, a, b
	t = (p - a.p) / (b.p - a.p)
	if !(t >= 0 && t <= 1) {
		// Round-off at an interval's end.
		t = math.Min(math.Max(t, 0), 1)
	}
	return a, b, k, t
}

// satGridRatio is the ratio of consecutive grid pressures, e^satGridStep.
var satGridRatio = math.Exp(satGridStep)

// propsAt sets lp to the saturated state of the local march at pressure
// p, clamped to the fluid's range.
func (s *state) propsAt(p float64, lp *localProps) {
	if localExact || s.grid == nil {
		sat, pl := s.satAt(p)
		*lp = localProps{hl: sat.HL, hlv: sat.Hlv, pl: pl, exact: true}
		return
	}
	a, b, k, t := s.interval(p)
	lp.k, lp.t, lp.exact = k, t, false
	lp.hl, lp.hlv = hermite(a, b, t)
	pa, pb := &a.pl, &b.pl
	lp.pl.MolarMass = pa.MolarMass
	lp.pl.RhoL = pa.RhoL + t*(pb.RhoL-pa.RhoL)
	lp.pl.RhoV = pa.RhoV + t*(pb.RhoV-pa.RhoV)
	lp.pl.MuL = pa.MuL + t*(pb.MuL-pa.MuL)
	lp.pl.MuV = pa.MuV + t*(pb.MuV-pa.MuV)
	lp.pl.Sigma = pa.Sigma + t*(pb.Sigma-pa.Sigma)
	lp.pl.KL = pa.KL + t*(pb.KL-pa.KL)
	lp.pl.CpL = pa.CpL + t*(pb.CpL-pa.CpL)
	lp.pl.Hlv = lp.hlv
	lp.pl.ReducedPressure = pa.ReducedPressure + t*(pb.ReducedPressure-pa.ReducedPressure)
}

// localXAt is the local quality of reference enthalpy x at pressure p, as
// propsAt's state gives it (without the other properties).
func (s *state) localXAt(x, p float64) float64 {
	if localExact || s.grid == nil {
		var lp localProps
		s.propsAt(p, &lp)
		return s.localXp(x, &lp)
	}
	a, b, _, t := s.interval(p)
	hl, hlv := hermite(a, b, t)
	return s.qualityAt(x, hl, hlv)
}

// hermite interpolates the liquid enthalpy and latent heat between nodes a
// and b at weight t by cubic Hermite polynomials in p.
func hermite(a, b *satNode, t float64) (hl, hlv float64) {
	d := b.p - a.p
	t2 := t * t
	t3 := t2 * t
	h00, h10, h01, h11 := 2*t3-3*t2+1, t3-2*t2+t, 3*t2-2*t3, t3-t2
	hl = h00*a.hl + h10*d*a.dhl + h01*b.hl + h11*d*b.dhl
	hlv = h00*a.hlv + h10*d*a.dhlv + h01*b.hlv + h11*d*b.dhlv
	return hl, hlv
}

// localXp is the local quality of reference enthalpy x at state lp.
func (s *state) localXp(x float64, lp *localProps) float64 {
	return s.qualityAt(x, lp.hl, lp.hlv)
}

// frictionAt returns the friction prepared at node k for tube cp at mass
// flux G, from the case's table when it holds it. The result is valid
// until the next call for a node of the same slot (k and k+1 never share
// one).
func (s *state) frictionAt(cp *comp, G float64, k int) *nodeFriction {
	g := s.grid
	if g.fric == nil {
		g.fric = new([nodeFrictionSlots]nodeFriction)
	}
	e := &g.fric[k&(nodeFrictionSlots-1)]
	if e.ok && e.k == k && e.G == G && e.D == cp.D && e.rr == cp.rr && e.g == s.bmag {
		return e
	}
	nd := s.node(k)
	*e = nodeFriction{ok: true, k: k, G: G, D: cp.D, rr: cp.rr, g: s.bmag,
		pf: s.fric.Prepare(G, cp.D, cp.rr, nd.pl, s.bmag)}
	dpLo, dpGo := e.pf.SinglePhaseGradients()
	e.fLo, e.fGo = dpLo*nd.pl.RhoL, dpGo*nd.pl.RhoV
	return e
}

// singlePhaseLocal is the liquid-only and vapour-only gradients for tube
// cp at mass flux G at state lp. What varies fast with the pressure is the
// phase densities (the vapour's nearly as p, so that its gradient, as
// 1/p, would err by h²/4 ≈ 2.5e-5 interpolated linearly); the Darcy
// factors vary only through the viscosities in the Reynolds numbers. So
// each node keeps f·G²/(2D), interpolated as the viscosities are, and the
// cell divides it by its own densities.
func (s *state) singlePhaseLocal(cp *comp, G float64, lp *localProps) (dpLo, dpGo float64) {
	a := s.frictionAt(cp, G, lp.k)
	b := s.frictionAt(cp, G, lp.k+1)
	return (a.fLo + lp.t*(b.fLo-a.fLo)) / lp.pl.RhoL, (a.fGo + lp.t*(b.fGo-a.fGo)) / lp.pl.RhoV
}

// preparesFactors reports whether the friction method computes Churchill
// factors when prepared.
func (s *state) preparesFactors() bool {
	return s.fric.Method == correlate.MullerSteinhagenHeck || s.fric.Method == correlate.Friedel
}

// gradientLocal is the two-phase (or vapour) friction gradient at local
// quality xl and state lp in tube cp at mass flux G.
func (s *state) gradientLocal(cp *comp, G, xl float64, lp *localProps) float64 {
	if lp.exact || !s.preparesFactors() {
		pf := s.fric.Prepare(G, cp.D, cp.rr, lp.pl, s.bmag)
		return pf.Gradient(xl)
	}
	if s.fric.Method == correlate.MullerSteinhagenHeck {
		dpLo, dpGo := s.singlePhaseLocal(cp, G, lp)
		if xl >= 1 {
			return dpGo
		}
		return correlate.MullerSteinhagenHeckGradient(dpLo, dpGo, xl)
	}
	ga := s.frictionAt(cp, G, lp.k).pf.Gradient(xl)
	gb := s.frictionAt(cp, G, lp.k+1).pf.Gradient(xl)
	return ga + lp.t*(gb-ga)
}

// cellLocal evaluates one cell of reference enthalpy x at local state lp:
// friction gradient, void, mixture and homogeneous densities and the local
// quality. Liquid keeps the density and viscosity of its own temperature.
func (s *state) cellLocal(cp *comp, G, x, cosInc float64, lp *localProps) (dpdz, alpha, rhoM, rhoH, xl float64) {
	xl = s.localXp(x, lp)
	switch {
	case xl <= 0:
		rho, mu := s.liquid(math.Min(x, 0))
		return s.liquidGradient(G, cp.D, cp.rr, rho, mu), 0, rho, rho, xl
	case xl >= 1:
		return s.gradientLocal(cp, G, 1, lp), 1, lp.pl.RhoV, lp.pl.RhoV, xl
	}
	alpha = correlate.VoidFractionAt(s.void, xl, G, &lp.pl, s.bmag, cosInc)
	return s.gradientLocal(cp, G, xl, lp), alpha, correlate.MixtureDensity(alpha, lp.pl), correlate.HomogeneousDensity(xl, lp.pl), xl
}

// momLocal is the momentum flux and homogeneous density at reference
// enthalpy x and local state lp.
func (s *state) momLocal(G, x, cosInc float64, lp *localProps) (mom, rhoH float64) {
	xl := s.localXp(x, lp)
	if xl <= 0 {
		rho, _ := s.liquid(math.Min(x, 0))
		return G * G / rho, rho
	}
	alpha := correlate.VoidFractionAt(s.void, xl, G, &lp.pl, s.bmag, cosInc)
	return correlate.AccelerationTerm(G, xl, alpha, lp.pl), correlate.HomogeneousDensity(xl, lp.pl)
}

// marchLocal is march in local mode: component ci from its inlet pressure
// s.pIn[ci]. Recorded cells carry the local quality.
//
// Heated and cooled components are marched over the method's cells, as the
// single state marches them; a cell across which the local quality passes
// 0 (boiling onset) or 1 is split there, each part evaluated on its own
// side, as the single state's march splits a cell at a phase boundary. A
// tube that neither heats nor cools changes its state only through its
// pressure, dp/ds = −F(p): it is integrated by the third-order Runge–Kutta
// stages of Bogacki & Shampine (1989) over a few steps (see adiabatic), so
// that a tube whose saturation hardly moves over its pressure change (most
// refrigerant loops) costs a handful of evaluations, not one per cell.
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
	var q parts
	p := s.pIn[ci]
	if rec == nil && xout == xin && xin <= 0 && !localExact {
		if q, ok := s.liquidTubeLocal(cp, G, xin, bd, p); ok {
			return xout, q
		}
	}
	mc := localMarch{s: s, cp: cp, G: G, cosInc: cosInc, rec: rec, bd: bd}
	if cp.L > 0 {
		mc.bUnit = bd / cp.L
	}
	var lp localProps
	s.propsAt(p, &lp)
	q.mIn, _ = s.momLocal(G, xin, cosInc, &lp)
	mc.anchor(xin, p, s.localXp(xin, &lp))
	switch {
	case cp.L == 0:
		mc.step(xin, xin, 0, p, 0)
		p -= mc.d
	case xout == xin:
		p = mc.adiabatic(xin, p)
	default:
		ds := cp.L / float64(n)
		g := 0.0
		for k := 0; k < n; k++ {
			xa, xb := s.faceX(cp, dir, xin, xout, k, n), s.faceX(cp, dir, xin, xout, k+1, n)
			mc.step(xa, xb, ds, p, g)
			p -= mc.d
			g = mc.d / ds
		}
	}
	q.fric, q.grav = mc.fric, mc.grav
	s.propsAt(p, &lp)
	var rhoHOut float64
	q.mOut, rhoHOut = s.momLocal(G, xout, cosInc, &lp)
	q.acc = q.mOut - q.mIn
	q.local = cp.K * G * G / (2 * rhoHOut)
	return xout, s.scaled(q)
}

// localMarch accumulates the cells of one component's local march.
type localMarch struct {
	s          *state
	cp         *comp
	G, cosInc  float64
	bUnit      float64 // b·ŝ along the flow, m/s²
	bd         float64 // b·(displacement along the flow), J/kg
	rec        func(cellRec)
	fric, grav float64
	d          float64 // the last step's pressure loss, Pa
	// xlA is the local quality at the current step's start, unless lazy:
	// then it is that of reference enthalpy xP at pressure pP, not yet
	// looked up (see step).
	xlA    float64
	lazy   bool
	xP, pP float64
	// The last local quality looked up (xl0, at pressure p0, where the
	// latent heat is at least hlv0 and |dh_f/dp| + (|x|+1)·|dh_lv/dp| at
	// most slope0, 0 for no bound), and the sums of the changes of
	// reference enthalpy and pressure between the ends of the steps since.
	xl0, p0, hlv0, slope0 float64
	sumDx, sumDp          float64
}

// localEval is the state of one evaluation of an adiabatic tube: the
// cell's values and the loss gradient F = dp/ds lost, Pa/m.
type localEval struct {
	dpdz, alpha, rhoM, rhoH, xl, F float64
}

// at evaluates the tube's state at reference enthalpy x and pressure p.
func (mc *localMarch) at(x, p float64) localEval {
	s := mc.s
	var lp localProps
	s.propsAt(p, &lp)
	var e localEval
	e.dpdz, e.alpha, e.rhoM, e.rhoH, e.xl = s.cellLocal(mc.cp, mc.G, x, mc.cosInc, &lp)
	k := 1.0
	if s.lossScale > 0 {
		k = s.lossScale
	}
	e.F = k*e.dpdz - e.rhoM*mc.bUnit
	return e
}

// adiabatic integrates a tube of constant reference enthalpy x from
// pressure p with a step sequence that varies continuously with the flow,
// so that the excess head stays smooth in the flow (its slope decides
// stability); it returns the outlet pressure. Liquid that cannot flash, or
// the liquid stretch up to where its pressure falls to saturation at its
// enthalpy, has a constant gradient and is taken in one step. From the
// flashing point (where the void fraction climbs steeply out of zero) the
// rest of the tube takes localFlashSteps steps growing by localFlashRatio;
// a tube entering two-phase takes localSteps equal steps. Each step is
// Bogacki–Shampine's third-order stage set.
func (mc *localMarch) adiabatic(x, p float64) float64 {
	s := mc.s
	L := mc.cp.L
	k1 := mc.at(x, p)
	if p <= s.pLo && k1.F >= 0 || p >= s.pHi && k1.F <= 0 {
		// Beyond the fluid's range, where the march holds the state at the
		// range's end, and moving away from it (a trial flow far above any
		// balance): the state, and so F, is the same all along.
		mc.take(k1, k1, k1, L)
		return p - k1.F*L
	}
	rest := L
	flashed := false
	if k1.xl <= flashTol {
		// Liquid: F is the same all along.
		pEnd := p - k1.F*L
		if !(k1.F > 0) || !(s.localXAt(x, pEnd) > flashTol) {
			mc.take(k1, k1, k1, L)
			return pEnd
		}
		// Bisect for the pressure at which the liquid saturates (above the
		// range's low end, below which the march holds the state there).
		lo, hi := math.Max(pEnd, s.pLo), p
		for i := 0; i < 60 && hi-lo > 1e-9*hi; i++ {
			mid := (lo + hi) / 2
			if s.localXAt(x, mid) > flashTol {
				lo = mid
			} else {
				hi = mid
			}
		}
		pf := (lo + hi) / 2
		sf := (p - pf) / k1.F
		mc.take(k1, k1, k1, sf)
		p, rest, flashed = pf, L-sf, true
		k1 = mc.at(x, p)
	}
	n, q := localSteps, 1.0
	if flashed {
		n, q = localFlashSteps, localFlashRatio
	}
	if localExact {
		n, q = 4*n, math.Pow(q, 0.25)
	}
	h := rest / float64(n)
	if q != 1 {
		h = rest * (q - 1) / (math.Pow(q, float64(n)) - 1)
	}
	for i := 0; i < n; i++ {
		k2 := mc.at(x, p-h/2*k1.F)
		k3 := mc.at(x, p-3*h/4*k2.F)
		p -= h * (2*k1.F + 3*k2.F + 4*k3.F) / 9
		mc.take(k1, k2, k3, h)
		if i < n-1 {
			k1 = mc.at(x, p)
		}
		h *= q
	}
	return p
}

// take adds a step of length h with Bogacki–Shampine stages k1, k2, k3 to
// the friction and gravity, and records it.
func (mc *localMarch) take(k1, k2, k3 localEval, h float64) {
	w1, w2, w3 := 2*h/9, h/3, 4*h/9
	mc.fric += w1*k1.dpdz + w2*k2.dpdz + w3*k3.dpdz
	mc.grav += (w1*k1.rhoM + w2*k2.rhoM + w3*k3.rhoM) * mc.bUnit
	if mc.rec != nil && h > 0 {
		mc.rec(cellRec{x: (2*k1.xl + 3*k2.xl + 4*k3.xl) / 9, alpha: (2*k1.alpha + 3*k2.alpha + 4*k3.alpha) / 9,
			rhoM: (2*k1.rhoM + 3*k2.rhoM + 4*k3.rhoM) / 9, rhoH: (2*k1.rhoH + 3*k2.rhoH + 4*k3.rhoH) / 9, ds: h})
	}
}

// localSteps, localFlashSteps and localFlashRatio set the steps of an
// adiabatic tube: equal steps for a tube entering two-phase, steps growing
// geometrically from the flashing point for one in which liquid flashes.
const (
	localSteps      = 3
	localFlashSteps = 12
	localFlashRatio = 1.4
)

// step marches one cell of length ds whose faces have reference enthalpy
// xa and xb, from pressure p with predicted loss gradient g (Pa/m). When the
// local quality at the predicted end lies across 0 or 1 from its start, the
// cell is split at the crossing (found linear in the cell) and each part
// takes the state at its own midpoint.
//
// The local quality at the end of a step is looked up only where it may
// have crossed 0 or 1. From the last one looked up it moves at most by the
// change of reference enthalpy times h_lv,0/h_lv plus the change of
// pressure times the slopes of h_f and h_lv over h_lv; while twice that
// bound keeps it clear of 0 and 1 (and the pressure within 0.3 % of where
// it was looked up, inside the slopes of the grid nodes around it), no
// step can cross, and the step is taken whole, as it would be after the
// look-up.
func (mc *localMarch) step(xa, xb, ds, p, g float64) {
	s := mc.s
	pB := p - g*ds
	if mc.slope0 > 0 {
		dx := mc.sumDx + math.Abs(xb-mc.xP)
		dp := mc.sumDp + math.Abs(pB-mc.pP)
		b := 2*(dx*s.sat.Hlv+dp*mc.slope0)/mc.hlv0 + 1e-12
		if lo, hi := mc.xl0-b, mc.xl0+b; dp < 3e-3*mc.p0 && (lo > 0 && hi < 1 || hi < 0 || lo > 1) {
			mc.sumDx, mc.sumDp = dx, dp
			mc.xP, mc.pP, mc.lazy = xb, pB, true
			mc.d = 0
			mc.part((xa+xb)/2, ds, p-g*ds/2, ds)
			return
		}
	}
	if mc.lazy {
		mc.xlA = s.localXAt(mc.xP, mc.pP)
	}
	xlB := s.localXAt(xb, pB)
	w := 1.0
	for _, c := range [2]float64{0, 1} {
		if (mc.xlA-c)*(xlB-c) < 0 {
			w = (c - mc.xlA) / (xlB - mc.xlA)
		}
	}
	mc.d = 0
	if w > 0 && w < 1 {
		mc.part(xa+(xb-xa)*w/2, w*ds, p-g*ds*w/2, ds)
		mc.part(xa+(xb-xa)*(1+w)/2, (1-w)*ds, p-g*ds*(1+w)/2, ds)
	} else {
		mc.part((xa+xb)/2, ds, p-g*ds/2, ds)
	}
	mc.anchor(xb, pB, xlB)
}

// anchor records the local quality xl of reference enthalpy x just looked
// up at pressure p (in the grid's last interval), from which step bounds
// the next ones.
func (mc *localMarch) anchor(x, p, xl float64) {
	mc.xlA, mc.lazy, mc.xP, mc.pP = xl, false, x, p
	mc.xl0, mc.p0, mc.sumDx, mc.sumDp, mc.slope0 = xl, p, 0, 0, 0
	s := mc.s
	if localExact || s.grid == nil || !(p > s.pLo && p < s.pHi) {
		return
	}
	a, b := s.grid.a, s.grid.b
	if a == nil || b == nil || !(p >= a.p && p <= b.p) {
		return
	}
	hlv := math.Min(a.hlv, b.hlv)
	slope := math.Max(math.Abs(a.dhl), math.Abs(b.dhl)) + (math.Abs(xl)+1)*math.Max(math.Abs(a.dhlv), math.Abs(b.dhlv))
	if hlv > 0 && slope > 0 && finite(slope) {
		mc.hlv0, mc.slope0 = hlv, slope
	}
}

// part evaluates length ds of a cell of length cell at reference enthalpy
// x and pressure p.
func (mc *localMarch) part(x, ds, p, cell float64) {
	s := mc.s
	var lp localProps
	s.propsAt(p, &lp)
	dpdz, alpha, rhoM, rhoH, xl := s.cellLocal(mc.cp, mc.G, x, mc.cosInc, &lp)
	grav := rhoM * mc.bUnit * ds
	if mc.cp.L == 0 {
		grav = rhoM * mc.bd
	}
	mc.fric += dpdz * ds
	mc.grav += grav
	d := dpdz*ds - grav
	if s.lossScale > 0 && s.lossScale != 1 {
		d = s.lossScale*dpdz*ds - grav
	}
	mc.d += d
	if mc.rec != nil {
		mc.rec(cellRec{x: xl, alpha: alpha, rhoM: rhoM, rhoH: rhoH, ds: ds})
	}
}

// flashTol is the local quality up to which liquid counts as not flashing:
// liquid leaving a condenser saturated has local quality zero within the
// round-off of the saturation look-ups.
const flashTol = 1e-9

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
	if !(s.localXAt(x, math.Min(pIn, pIn-d)) <= flashTol) {
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
