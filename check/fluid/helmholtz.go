package fluid

import (
	"errors"
	"fmt"
	"math"
)

// This file holds one general evaluator for fluids described by a reduced
// Helmholtz-energy equation of state,
//
//	a(T,ρ)/(RT) = α⁰(τ,δ) + αʳ(τ,δ),  τ = Tr/T,  δ = ρ/ρr,
//
// in the term forms used by modern reference equations. Saturation is found
// from the Maxwell criterion (equal pressure and equal Gibbs energy in both
// phases) by Newton's method on the two densities, started from the
// ancillary density equations published with each equation of state.

// powerTerm is n δ^d τ^t, times exp(−δ^l) when l > 0.
type powerTerm struct{ n, d, t, l float64 }

// exponentialTerm is n δ^d τ^t exp(−g δ^l).
type exponentialTerm struct{ n, d, t, g, l float64 }

// doubleExpTerm is n δ^d τ^t exp(−gd δ^ld − gt τ^lt).
type doubleExpTerm struct{ n, d, t, gd, ld, gt, lt float64 }

// gaussianTerm is n δ^d τ^t exp(−η(δ−ε)² − β(τ−γ)²).
type gaussianTerm struct{ n, d, t, eta, eps, beta, gamma float64 }

// gaoBTerm is n δ^d τ^t exp(η(δ−ε)² + 1/(β(τ−γ)² + b)), the association-type
// term of the ammonia reference equation.
type gaoBTerm struct{ n, d, t, eta, eps, beta, gamma, b float64 }

// residual lists the residual part αʳ of an equation of state by term form.
type residual struct {
	power       []powerTerm
	exponential []exponentialTerm
	doubleExp   []doubleExpTerm
	gaussian    []gaussianTerm
	gaoB        []gaoBTerm
}

// planckTerm is n ln(1 − exp(−θ τ)) in α⁰.
type planckTerm struct{ n, theta float64 }

// idealPowerTerm is n τ^t in α⁰.
type idealPowerTerm struct{ n, t float64 }

// ideal is the ideal-gas part α⁰ = ln δ + a1 + a2 τ + logTau ln τ + Σ n τ^t
// + Σ n ln(1 − exp(−θ τ)). Terms constant or linear in τ only fix the
// reference state, which the evaluator sets itself (see refT, refH).
type ideal struct {
	a1, a2 float64
	logTau float64
	power  []idealPowerTerm
	planck []planckTerm
}

// ancillaryForm names the shape of an ancillary saturated-density equation.
type ancillaryForm int

const (
	// ancLinear: ρ = red (1 + Σ n θ^t), θ = 1 − T/Tr.
	ancLinear ancillaryForm = iota
	// ancSum: ρ = red + Σ n θ^t.
	ancSum
	// ancExp: ρ = red exp(Σ n θ^t), or red exp((Tr/T) Σ n θ^t) when overT is set.
	ancExp
)

// ancillary is a simple saturated-density equation in kg/m³, used only to
// start the Maxwell iteration.
type ancillary struct {
	form  ancillaryForm
	overT bool
	Tr    float64 // K
	red   float64 // kg/m³
	n, t  []float64
}

func (a ancillary) eval(T float64) float64 {
	th := 1 - T/a.Tr
	if th < 0 {
		th = 0
	}
	s := 0.0
	for i, n := range a.n {
		s += n * math.Pow(th, a.t[i])
	}
	switch a.form {
	case ancLinear:
		return a.red * (1 + s)
	case ancSum:
		return a.red + s
	default:
		if a.overT {
			s *= a.Tr / T
		}
		return a.red * math.Exp(s)
	}
}

// term is one residual term in separable form n·D(δ)·E(τ), with
// D = δ^d exp(f(δ)) and E = τ^t exp(g(τ)); every term form above reduces to it.
type term struct {
	n, d, t float64
	// f(δ) = −dc δ^dl  (dKind 1)  or  −dEta (δ−dEps)²  (dKind 2)
	dKind         int
	dc, dl        float64
	dEta, dEps    float64
	tKind         int // g(τ): 0 none, 1 −tc τ^tl, 2 −tBeta(τ−tGamma)², 3 1/(tBeta(τ−tGamma)²+tB)
	tc, tl        float64
	tBeta, tGamma float64
	tB            float64
}

// derivs holds αʳ and its derivatives at one (τ, δ).
type derivs struct {
	a, d, dd, t, tt, dt float64
}

// compile flattens a residual table into separable terms.
func compile(r residual) []term {
	var ts []term
	for _, p := range r.power {
		tm := term{n: p.n, d: p.d, t: p.t}
		if p.l > 0 {
			tm.dKind, tm.dc, tm.dl = 1, 1, p.l
		}
		ts = append(ts, tm)
	}
	for _, p := range r.exponential {
		ts = append(ts, term{n: p.n, d: p.d, t: p.t, dKind: 1, dc: p.g, dl: p.l})
	}
	for _, p := range r.doubleExp {
		ts = append(ts, term{n: p.n, d: p.d, t: p.t, dKind: 1, dc: p.gd, dl: p.ld, tKind: 1, tc: p.gt, tl: p.lt})
	}
	for _, p := range r.gaussian {
		ts = append(ts, term{n: p.n, d: p.d, t: p.t, dKind: 2, dEta: p.eta, dEps: p.eps, tKind: 2, tBeta: p.beta, tGamma: p.gamma})
	}
	for _, p := range r.gaoB {
		ts = append(ts, term{n: p.n, d: p.d, t: p.t, dKind: 2, dEta: -p.eta, dEps: p.eps, tKind: 3, tBeta: p.beta, tGamma: p.gamma, tB: p.b})
	}
	return ts
}

// alphar evaluates αʳ and its first and second derivatives.
func alphar(ts []term, tau, delta float64) derivs {
	var r derivs
	lnd, lnt := math.Log(delta), math.Log(tau)
	for i := range ts {
		tm := &ts[i]
		// δ factor: D = δ^d e^f; D'/D = d/δ + f'; D''/D = (D'/D)² − d/δ² + f''.
		f, f1, f2 := 0.0, 0.0, 0.0
		switch tm.dKind {
		case 1:
			pw := tm.dc * math.Exp(tm.dl*lnd)
			f = -pw
			f1 = -tm.dl * pw / delta
			f2 = -tm.dl * (tm.dl - 1) * pw / (delta * delta)
		case 2:
			x := delta - tm.dEps
			f = -tm.dEta * x * x
			f1 = -2 * tm.dEta * x
			f2 = -2 * tm.dEta
		}
		q := tm.d/delta + f1
		qq := q*q - tm.d/(delta*delta) + f2
		// τ factor, likewise.
		g, g1, g2 := 0.0, 0.0, 0.0
		switch tm.tKind {
		case 1:
			pw := tm.tc * math.Exp(tm.tl*lnt)
			g = -pw
			g1 = -tm.tl * pw / tau
			g2 = -tm.tl * (tm.tl - 1) * pw / (tau * tau)
		case 2:
			x := tau - tm.tGamma
			g = -tm.tBeta * x * x
			g1 = -2 * tm.tBeta * x
			g2 = -2 * tm.tBeta
		case 3:
			x := tau - tm.tGamma
			u := tm.tBeta*x*x + tm.tB
			g = 1 / u
			u1 := 2 * tm.tBeta * x
			g1 = -u1 / (u * u)
			g2 = -2*tm.tBeta/(u*u) + 2*u1*u1/(u*u*u)
		}
		p := tm.t/tau + g1
		pp := p*p - tm.t/(tau*tau) + g2
		// n D E, with D = δ^d e^f and E = τ^t e^g, in one exponential.
		w := tm.n * math.Exp(tm.d*lnd+f+tm.t*lnt+g)
		r.a += w
		r.d += w * q
		r.dd += w * qq
		r.t += w * p
		r.tt += w * pp
		r.dt += w * q * p
	}
	return r
}

// alpha0 returns the τ-derivatives of the ideal part, ∂α⁰/∂τ and ∂²α⁰/∂τ².
func (id *ideal) alpha0(tau float64) (t, tt float64) {
	t = id.a2 + id.logTau/tau
	tt = -id.logTau / (tau * tau)
	for _, p := range id.power {
		t += p.n * p.t * math.Pow(tau, p.t-1)
		tt += p.n * p.t * (p.t - 1) * math.Pow(tau, p.t-2)
	}
	for _, p := range id.planck {
		e := math.Exp(-p.theta * tau) // e^{-θτ}, never overflows
		den := 1 - e
		t += p.n * p.theta * e / den
		tt -= p.n * p.theta * p.theta * e / (den * den)
	}
	return t, tt
}

// helmholtz is an Evaluator for a fluid with a Helmholtz-energy equation of
// state plus surface-tension and transport correlations.
type helmholtz struct {
	info  Info
	R     float64 // molar gas constant used by the equation, J/(mol·K)
	M     float64 // molar mass, kg/mol
	Tr    float64 // reducing temperature, K
	rhoR  float64 // reducing density, kg/m³
	res   residual
	id    ideal
	liq   ancillary // start value for the saturated-liquid density
	vap   ancillary // start value for the saturated-vapour density
	sigma mulero
	chung chung          // corresponding-states constants
	trans transportModel // defaults to &chung
	// Reference state: HL(refT) = refH. The IIR convention (200 kJ/kg for
	// saturated liquid at 0 °C) is used for every built-in fluid.
	refT, refH float64

	terms []term
	rs    float64 // specific gas constant R/M, J/(kg·K)
	hOff  float64 // enthalpy shift that realises the reference state
}

// prepare compiles the terms and sets the reference state. It must be called
// once, before Direct.
func (h *helmholtz) prepare() *helmholtz {
	h.terms = compile(h.res)
	if h.trans == nil {
		h.trans = &h.chung
	}
	h.rs = h.R / h.M
	h.hOff = 0
	// Pitzer's acentric factor ω = −log10(ps(0.7 Tc)/pc) − 1, from the
	// equation itself, for the transport correlation.
	if dl, _, err := h.saturate(0.7 * h.info.Tc); err == nil {
		p := h.phaseAt(0.7*h.info.Tc, dl*h.rhoR).p
		h.chung.omega = -math.Log10(p/h.info.Pc) - 1
	}
	if s, err := h.direct(h.refT); err == nil {
		h.hOff = h.refH - s.HL
	}
	return h
}

// Info describes the fluid.
func (h *helmholtz) Info() Info { return h.info }

// phase is the state of one phase at (T, ρ).
type phase struct {
	p, h, cp, cv float64
}

func (h *helmholtz) phaseAt(T, rho float64) phase {
	tau, delta := h.Tr/T, rho/h.rhoR
	r := alphar(h.terms, tau, delta)
	i1, i2 := h.id.alpha0(tau)
	var ph phase
	ph.p = rho * h.rs * T * (1 + delta*r.d)
	ph.h = h.rs*T*(1+tau*(i1+r.t)+delta*r.d) + h.hOff
	ph.cv = -h.rs * tau * tau * (i2 + r.tt)
	num := 1 + delta*r.d - delta*tau*r.dt
	ph.cp = ph.cv + h.rs*num*num/(1+2*delta*r.d+delta*delta*r.dd)
	return ph
}

var errNoConvergence = errors.New("saturation iteration did not converge")

// saturate solves p(δl) = p(δv), g(δl) = g(δv) at T and returns the two
// reduced densities.
func (h *helmholtz) saturate(T float64) (dl, dv float64, err error) {
	tau := h.Tr / T
	dl = h.liq.eval(T) / h.rhoR
	dv = h.vap.eval(T) / h.rhoR
	// Reduced pressure P = δ(1+δαʳ_δ) and Gibbs energy G = αʳ + δαʳ_δ + ln δ.
	for it := 0; it < 100; it++ {
		rl := alphar(h.terms, tau, dl)
		rv := alphar(h.terms, tau, dv)
		pl := dl * (1 + dl*rl.d)
		pv := dv * (1 + dv*rv.d)
		gl := rl.a + dl*rl.d + math.Log(dl)
		gv := rv.a + dv*rv.d + math.Log(dv)
		jl := 1 + 2*dl*rl.d + dl*dl*rl.dd // ∂P/∂δ
		jv := 1 + 2*dv*rv.d + dv*dv*rv.dd
		if jl <= 0 || jv <= 0 {
			return 0, 0, errNoConvergence
		}
		f1, f2 := pl-pv, gl-gv
		// ∂G/∂δ = (∂P/∂δ)/δ. Solve [jl −jv; jl/dl −jv/dv] [Δl Δv] = −[f1 f2].
		det := -jl*jv/dv + jv*jl/dl
		if det == 0 || math.IsNaN(det) {
			return 0, 0, errNoConvergence
		}
		stepL := (-f1*(-jv/dv) + f2*(-jv)) / det
		stepV := (-f2*jl + f1*jl/dl) / det
		// Damp steps that would leave the physical branches.
		for k := 0; k < 30 && (dl+stepL <= 0 || dv+stepV <= 0 || dv+stepV >= dl+stepL); k++ {
			stepL, stepV = stepL/2, stepV/2
		}
		dl += stepL
		dv += stepV
		// Convergence is quadratic: after a step this small the iterate is
		// exact to rounding.
		if math.Abs(stepL) <= 1e-11*dl && math.Abs(stepV) <= 1e-11*dv {
			if dl/dv < 1+1e-6 {
				return 0, 0, errNoConvergence // collapsed onto one root
			}
			return dl, dv, nil
		}
	}
	return 0, 0, errNoConvergence
}

// rangeSlack forgives rounding at the range ends (−40 + 273.15 is not
// exactly 233.15 in floating point).
const rangeSlack = 1e-9 // K

// Direct computes the saturated state at T from the equations. Outside
// [Tmin, Tmax] it returns a *RangeError.
func (h *helmholtz) Direct(T float64) (Sat, error) {
	if !(T >= h.info.Tmin-rangeSlack && T <= h.info.Tmax+rangeSlack) {
		return Sat{}, &RangeError{Fluid: h.info.Name, Quantity: "temperature", Value: T,
			Min: h.info.Tmin, Max: h.info.Tmax, Unit: "K"}
	}
	return h.direct(T)
}

// direct is Direct without the range check (the reference state and tests
// may need points just outside the published range).
func (h *helmholtz) direct(T float64) (Sat, error) {
	dl, dv, err := h.saturate(T)
	if err != nil {
		return Sat{}, fmt.Errorf("%s at %.6g K: %w", h.info.Name, T, err)
	}
	rl, rv := dl*h.rhoR, dv*h.rhoR
	l, v := h.phaseAt(T, rl), h.phaseAt(T, rv)
	s := Sat{
		T: T, P: 0.5 * (l.p + v.p), RhoL: rl, RhoV: rv,
		HL: l.h, HV: v.h, Hlv: v.h - l.h, CpL: l.cp, CpV: v.cp,
		Sigma: h.sigma.at(T),
	}
	cv0 := h.cv0(T)
	s.MuL, s.KL = h.trans.transport(state{T: T, rho: rl, cp: l.cp, cv: l.cv, cv0: cv0, liquid: true, h: h})
	s.MuV, s.KV = h.trans.transport(state{T: T, rho: rv, cp: v.cp, cv: v.cv, cv0: cv0, h: h})
	if err := finite(s); err != nil {
		return Sat{}, fmt.Errorf("%s at %.6g K: %w", h.info.Name, T, err)
	}
	return s, nil
}

// dpdrho is (∂p/∂ρ)_T in Pa·m³/kg.
func (h *helmholtz) dpdrho(T, rho float64) float64 {
	tau, delta := h.Tr/T, rho/h.rhoR
	r := alphar(h.terms, tau, delta)
	return h.rs * T * (1 + 2*delta*r.d + delta*delta*r.dd)
}

// cv0 is the ideal-gas isochoric specific heat, J/(kg·K).
func (h *helmholtz) cv0(T float64) float64 {
	tau := h.Tr / T
	_, tt := h.id.alpha0(tau)
	return -h.rs * tau * tau * tt
}

// finite reports an error if any property is NaN or infinite.
func finite(s Sat) error {
	for _, v := range []float64{s.P, s.RhoL, s.RhoV, s.HL, s.HV, s.Hlv, s.CpL, s.CpV,
		s.MuL, s.MuV, s.KL, s.KV, s.Sigma} {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return errors.New("property evaluation gave a non-finite value")
		}
	}
	return nil
}
