package flow

import (
	"math"

	"circa/check/correlate"
	"circa/check/fluid"
	"circa/check/geom"
	"circa/lang"
)

// liquidPoints is the number of temperatures at which subcooled-liquid
// properties are tabulated below saturation.
const liquidPoints = 13

// liquidSpan is the temperature span of that table, K.
const liquidSpan = 60.0

// state is everything one case's evaluation needs, fixed before solving.
type state struct {
	net    *network
	sat    fluid.Sat
	info   fluid.Info
	p      correlate.Props
	b      geom.Vec3
	bmag   float64
	void   correlate.VoidMethod
	vp     correlate.PreparedVoid // void with p and bmag (set with the body force)
	fric   correlate.Friction
	sp     correlate.SinglePhase
	cells  int
	heat   []float64 // by comps index: evaporator heat, W
	xCond  []float64 // by comps index: condenser outlet quality
	cosInc []float64 // by comps index: cos of the angle between tube and body force
	bDisp  []float64 // by comps index: b·disp, J/kg
	// maxBDisp is the largest |b·disp|, J/kg: with the liquid density, the
	// scale of the hydrostatic heads Newton's tolerance is relative to.
	maxBDisp float64
	// bDispU and cosIncU are bDisp and cosInc by distinct displacement
	// (network.dispU).
	bDispU, cosIncU []float64
	// Subcooled liquid: density and viscosity at T_sat − k·dT.
	liqDT  float64
	liqRho [liquidPoints]float64
	liqMu  [liquidPoints]float64
	// One-entry cache of the liquid friction gradient: consecutive tubes of
	// one bore at one flow share it.
	lqKey [5]float64
	lqVal float64
	// pfc caches prepared friction by tube and mass flux: Newton's
	// iteration and its Jacobian march a branch again and again at the same
	// flow, and consecutive tubes of one bore in a branch share it. Copies
	// of the state share the cache (one goroutine's).
	pfc *frictionCache
	// warm is, for an instant of a profile, the search its worker kept
	// from the instant before (nil: a cold search).
	warm *ringWarm
	// gravOnly has march return the gravity term alone (the other parts
	// zero), for the head at vanishing flow.
	gravOnly bool
	// lossScale multiplies every component's friction and local losses
	// (0 or 1: as estimated); the loss-reserve margin solves with it.
	lossScale float64
	// looseTol, when set, replaces the network Newton iteration's relative
	// tolerance (1e-9 of the largest hydrostatic head) for solves whose
	// result only feeds a margin.
	looseTol float64
	// newtonCap, when set, bounds the network Newton iteration's steps
	// (60) and each line search's halvings (30) for solves that may fail.
	newtonCap int
	// local marches the pressure around a single loop from the condenser
	// outlet, at the saturation pressure, and takes the phase state of each
	// cell at its own pressure; x stays the enthalpy measured from the
	// reference state, (h − h_f)/h_lv at the case's saturation temperature.
	local bool
	fl    fluid.Fluid
	pIn   []float64 // by comps index: inlet pressure, Pa (local mode: set before each march)
	// Networks in local mode: junction pressures of the last evaluation
	// (see junctionPressures), the condenser whose outlet is at the
	// saturation pressure and its outlet pressure as last marched.
	pj      []float64
	refCond int
	pRef    float64
	jAdj    [][]int   // by junction: the branches that meet there
	pjBest  []float64 // scratch: the junction iterate closest to a fixed point
	pLo     float64   // the fluid's saturation pressure range, Pa
	pHi     float64
	// grid caches the saturated states of the local march (one case's;
	// copies of the state share it, on one goroutine).
	grid *satGrid
}

// scaled applies the loss scale to a component's pressure-change parts.
func (s *state) scaled(q parts) parts {
	if k := s.lossScale; k > 0 && k != 1 {
		q.fric *= k
		q.local *= k
	}
	return q
}

// liquidGradient is the single-phase liquid friction gradient, Pa/m.
func (s *state) liquidGradient(G, D, rr, rho, mu float64) float64 {
	k := [5]float64{G, D, rr, rho, mu}
	if k == s.lqKey {
		return s.lqVal
	}
	v := correlate.SinglePhaseGradient(s.sp, G, D, rr, rho, mu)
	s.lqKey, s.lqVal = k, v
	return v
}

// frictionCache holds the most recent friction preparations, each with
// the inputs it was prepared from.
type frictionCache struct {
	key  [frictionEntries]frictionKey
	pf   [frictionEntries]correlate.PreparedFriction
	next int // the entry the next miss replaces
}

// frictionEntries covers a network's distinct tube-and-flow pairs between
// two evaluations and its Jacobian's perturbed flows.
const frictionEntries = 8

type frictionKey struct {
	ok            bool
	G, D, rr, acc float64
	p             correlate.Props
}

// preparedFriction is s.fric prepared for tube cp at mass flux G with the
// state's properties and body force, from the cache when it holds the same
// inputs: the very value a fresh preparation gives. The result is valid
// until the next call.
func (s *state) preparedFriction(cp *comp, G float64) *correlate.PreparedFriction {
	c := s.pfc
	if c == nil {
		pf := s.fric.Prepare(G, cp.D, cp.rr, s.p, s.bmag)
		return &pf
	}
	k := frictionKey{ok: true, G: G, D: cp.D, rr: cp.rr, acc: s.bmag, p: s.p}
	for i := range c.key {
		if c.key[i] == k {
			return &c.pf[i]
		}
	}
	i := c.next
	c.next = (i + 1) % frictionEntries
	c.key[i], c.pf[i] = k, s.fric.Prepare(G, cp.D, cp.rr, s.p, s.bmag)
	return &c.pf[i]
}

// parts are the pressure changes of a component, Pa, as losses: positive
// friction, local and acceleration terms reduce the pressure; gravity is the
// pressure gain ∫ρ_m b·ŝ ds.
type parts struct {
	fric, local, acc, grav float64
	// Momentum flux at the inlet and outlet, Pa (acc is their difference
	// unless the caller adds the step from the previous component).
	mIn, mOut float64
}

func (q parts) loss() float64 { return q.fric + q.local + q.acc - q.grav }

// cellRec receives the state of each cell when a component is recorded.
type cellRec struct {
	x, alpha, rhoM, rhoH, ds float64
}

// liquid returns the subcooled-liquid density and viscosity at quality
// equivalent x < 0.
func (s *state) liquid(x float64) (rho, mu float64) {
	dT := -x * s.p.Hlv / s.p.CpL // K below saturation
	if !(dT > 0) || s.liqDT == 0 {
		return s.p.RhoL, s.p.MuL
	}
	f := dT / s.liqDT
	i := int(f)
	if i >= liquidPoints-1 {
		return s.liqRho[liquidPoints-1], s.liqMu[liquidPoints-1]
	}
	t := f - float64(i)
	return s.liqRho[i] + t*(s.liqRho[i+1]-s.liqRho[i]), s.liqMu[i] + t*(s.liqMu[i+1]-s.liqMu[i])
}

// outletX is a component's outlet quality for inlet quality xin at mass flow
// |m| (kg/s): evaporators add their heat, condensers bring the fluid down to
// their outlet state, everything else passes it on.
func (s *state) outletX(ci int, m, xin float64) float64 {
	switch s.net.comps[ci].kind {
	case lang.Evaporator:
		return xin + s.heat[ci]/(flowFloor(m)*s.p.Hlv)
	case lang.Condenser:
		return math.Min(xin, s.xCond[ci])
	}
	return xin
}

// flowFloor keeps enthalpy finite as the flow vanishes.
func flowFloor(m float64) float64 {
	m = math.Abs(m)
	if m < 1e-12 {
		return 1e-12
	}
	return m
}

// cell evaluates one cell at quality x: friction gradient, void, mixture and
// homogeneous densities.
func (s *state) cell(pf *correlate.PreparedFriction, cp *comp, G, x, cosInc float64) (dpdz, alpha, rhoM, rhoH float64) {
	switch {
	case x <= 0:
		rho, mu := s.liquid(x)
		return s.liquidGradient(G, cp.D, cp.rr, rho, mu), 0, rho, rho
	case x >= 1:
		return pf.Gradient(1), 1, s.p.RhoV, s.p.RhoV
	}
	alpha = s.vp.At(x, G, cosInc)
	return pf.Gradient(x), alpha, correlate.MixtureDensity(alpha, s.p), correlate.HomogeneousDensity(x, s.p)
}

// march integrates component ci at mass flow m (kg/s, sign: along the leg
// sign's direction when positive) from inlet quality xin. It returns the
// outlet quality and the pressure-change parts along the flow. rec, when not
// nil, receives every cell.
func (s *state) march(ci int, dir float64, m, xin float64, rec func(cellRec)) (float64, parts) {
	if s.local {
		return s.marchLocal(ci, dir, m, xin, rec)
	}
	cp := &s.net.comps[ci]
	am := math.Abs(m)
	G := am / cp.A
	xout := s.outletX(ci, am, xin)
	var q parts
	bd := s.bDisp[ci] * dir // b·(displacement along the flow)
	cosInc := s.cosInc[ci]
	if s.gravOnly {
		q.grav = s.gravity(cp, G, xin, xout, bd, dir, cosInc)
		return xout, q
	}
	pf := &correlate.PreparedFriction{}
	if xin > 0 || xout > 0 {
		// Two-phase or vapour somewhere: the liquid-only cells do not use it.
		pf = s.preparedFriction(cp, G)
	}
	if xout == xin || cp.L == 0 {
		// One state along the whole component.
		dpdz, alpha, rhoM, rhoH := s.cell(pf, cp, G, xin, cosInc)
		q.fric = dpdz * cp.L
		q.grav = rhoM * bd
		q.local = cp.K * G * G / (2 * rhoH)
		if xout != xin {
			// A zero-length heated component: the step change's
			// acceleration and the outlet velocity head.
			aOut := s.voidAt(xout, G, cosInc)
			q.mIn, q.mOut = s.mom(G, xin, alpha), s.mom(G, xout, aOut)
			q.acc = q.mOut - q.mIn
			q.local = cp.K * G * G / (2 * s.homog(xout))
		}
		if xout == xin {
			q.mIn = s.mom(G, xin, alpha)
			q.mOut = q.mIn
		}
		if rec != nil {
			rec(cellRec{x: xin, alpha: alpha, rhoM: rhoM, rhoH: rhoH, ds: cp.L})
			if xout != xin {
				rec(cellRec{x: xout, alpha: s.voidAt(xout, G, cosInc), rhoM: s.mixture(xout, G, cosInc), rhoH: s.homog(xout), ds: 0})
			}
		}
		return xout, s.scaled(q)
	}
	n := s.cells
	ds := cp.L / float64(n)
	dg := bd / float64(n)
	xa := xin
	for k := 0; k < n; k++ {
		xb := s.faceX(cp, dir, xin, xout, k+1, n)
		xm := 0.5 * (xa + xb)
		if xa < 0 && xb > 0 || xa > 0 && xb < 0 || xa < 1 && xb > 1 || xa > 1 && xb < 1 {
			// The cell spans a phase boundary: average its two parts.
			xc := 0.0
			if (xa-1)*(xb-1) < 0 {
				xc = 1
			}
			w := (xc - xa) / (xb - xa)
			d1, a1, m1, h1 := s.cell(pf, cp, G, 0.5*(xa+xc), cosInc)
			d2, a2, m2, h2 := s.cell(pf, cp, G, 0.5*(xc+xb), cosInc)
			q.fric += (w*d1 + (1-w)*d2) * ds
			q.grav += (w*m1 + (1-w)*m2) * dg
			if rec != nil {
				rec(cellRec{x: xm, alpha: w*a1 + (1-w)*a2, rhoM: w*m1 + (1-w)*m2, rhoH: w*h1 + (1-w)*h2, ds: ds})
			}
		} else {
			dpdz, alpha, rhoM, rhoH := s.cell(pf, cp, G, xm, cosInc)
			q.fric += dpdz * ds
			q.grav += rhoM * dg
			if rec != nil {
				rec(cellRec{x: xm, alpha: alpha, rhoM: rhoM, rhoH: rhoH, ds: ds})
			}
		}
		xa = xb
	}
	aIn, aOut := s.voidAt(xin, G, cosInc), s.voidAt(xout, G, cosInc)
	q.mIn, q.mOut = s.mom(G, xin, aIn), s.mom(G, xout, aOut)
	q.acc = q.mOut - q.mIn
	q.local = cp.K * G * G / (2 * s.homog(xout))
	return xout, s.scaled(q)
}

// gravity is march's gravity term alone, cell by cell as march takes it.
func (s *state) gravity(cp *comp, G, xin, xout, bd, dir, cosInc float64) float64 {
	if xout == xin || cp.L == 0 {
		return s.density(G, xin, cosInc) * bd
	}
	var grav float64
	n := s.cells
	dg := bd / float64(n)
	xa := xin
	for k := 0; k < n; k++ {
		xb := s.faceX(cp, dir, xin, xout, k+1, n)
		if xa < 0 && xb > 0 || xa > 0 && xb < 0 || xa < 1 && xb > 1 || xa > 1 && xb < 1 {
			xc := 0.0
			if (xa-1)*(xb-1) < 0 {
				xc = 1
			}
			w := (xc - xa) / (xb - xa)
			m1, m2 := s.density(G, 0.5*(xa+xc), cosInc), s.density(G, 0.5*(xc+xb), cosInc)
			grav += (w*m1 + (1-w)*m2) * dg
		} else {
			grav += s.density(G, 0.5*(xa+xb), cosInc) * dg
		}
		xa = xb
	}
	return grav
}

// density is the mixture density cell takes at quality x.
func (s *state) density(G, x, cosInc float64) float64 {
	switch {
	case x <= 0:
		rho, _ := s.liquid(x)
		return rho
	case x >= 1:
		return s.p.RhoV
	}
	return correlate.MixtureDensity(s.vp.At(x, G, cosInc), s.p)
}

// mom is the momentum flux at mass flux G, quality x and void alpha:
// G²/ρ for (subcooled) liquid, the separated-flow form otherwise.
func (s *state) mom(G, x, alpha float64) float64 {
	if x <= 0 {
		rho, _ := s.liquid(x)
		return G * G / rho
	}
	return correlate.AccelerationTerm(G, x, alpha, s.p)
}

func (s *state) voidAt(x, G, cosInc float64) float64 {
	return s.vp.At(x, G, cosInc)
}

func (s *state) mixture(x, G, cosInc float64) float64 {
	if x <= 0 {
		rho, _ := s.liquid(x)
		return rho
	}
	return correlate.MixtureDensity(s.voidAt(x, G, cosInc), s.p)
}

func (s *state) homog(x float64) float64 {
	if x <= 0 {
		rho, _ := s.liquid(x)
		return rho
	}
	return correlate.HomogeneousDensity(x, s.p)
}
