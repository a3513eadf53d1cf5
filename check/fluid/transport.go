package fluid

import "math"

// state is one saturated phase as the transport correlations see it.
type state struct {
	T, rho float64 // K, kg/m³
	cp, cv float64 // J/(kg·K)
	cv0    float64 // ideal-gas isochoric specific heat, J/(kg·K)
	liquid bool
	h      *helmholtz // the equation of state, for derivatives at other states
}

// transportModel gives viscosity (Pa·s) and thermal conductivity (W/(m·K))
// of one saturated phase.
type transportModel interface {
	transport(s state) (mu, k float64)
}

// Chung et al. corresponding-states method: T.-H. Chung, M. Ajlan, L.L. Lee,
// K.E. Starling, "Generalized multiparameter correlation for nonpolar and
// polar fluid transport properties", Ind. Eng. Chem. Res. 27 (1988) 671–679,
// as given by B.E. Poling, J.M. Prausnitz, J.P. O'Connell, The Properties of
// Gases and Liquids, 5th ed., McGraw-Hill 2001: viscosity eqs. 9-4.10 and
// 9-6.18 with Table 9-6, thermal conductivity eqs. 10-3.14 and 10-5.5 with
// Table 10-3. One model covers dilute gas, dense gas and liquid.
//
// Where fluid-specific correlations exist they replace parts of it: liqMu and
// liqK give the saturated liquid directly; gasMu0 and gasK0 give the
// dilute-gas values, to which Chung's density dependence (the ratio of its
// dense to its dilute value) is applied for the saturated vapour.
type chung struct {
	M     float64 // molar mass, g/mol
	Tc    float64 // critical temperature, K
	Vc    float64 // critical molar volume, cm³/mol
	omega float64 // acentric factor (set from the equation of state)
	mu    float64 // dipole moment, debye
	kappa float64 // association factor (Chung et al. 1988, Table 1)

	liqMu, liqK, gasMu0, gasK0 func(T float64) float64
}

// chungE are the viscosity coefficients a, b, c, d of Ei = a + bω + cμr⁴ + dκ
// (Chung et al. 1988; Poling et al. Table 9-6).
var chungE = [10][4]float64{
	{6.324, 50.412, -51.680, 1189.0},
	{1.210e-3, -1.154e-3, -6.257e-3, 0.03728},
	{5.283, 254.209, -168.48, 3898.0},
	{6.623, 38.096, -8.464, 31.42},
	{19.745, 7.630, -14.354, 31.53},
	{-1.900, -12.537, 4.985, -18.15},
	{24.275, 3.450, -11.291, 69.35},
	{0.7972, 1.117, 0.01235, -4.117},
	{-0.2382, 0.06770, -0.8163, 4.025},
	{0.06863, 0.3479, 0.5926, -0.727},
}

// chungB are the conductivity coefficients of Bi = a + bω + cμr⁴ + dκ
// (Chung et al. 1988; Poling et al. Table 10-3).
var chungB = [7][4]float64{
	{2.4166, 7.4824e-1, -9.1858e-1, 1.2172e2},
	{-5.0924e-1, -1.5094, -4.9991e1, 6.9983e1},
	{6.6107, 5.6207, 6.4760e1, 2.7039e1},
	{1.4543e1, -8.9139, -5.6379, 7.4344e1},
	{7.9274e-1, 8.2019e-1, -6.9369e-1, 6.3173},
	{-5.8634, 1.2801e1, 9.5893, 6.5529e1},
	{9.1089e1, 1.2811e2, -5.4217e1, 5.2381e2},
}

// neufeld is the Lennard-Jones collision integral Ω_v(T*) of Neufeld,
// Janzen and Aziz, J. Chem. Phys. 57 (1972) 1100 (Poling et al. eq. 9-4.3).
func neufeld(ts float64) float64 {
	return 1.16145*math.Pow(ts, -0.14874) + 0.52487*math.Exp(-0.77320*ts) + 2.16178*math.Exp(-2.43787*ts)
}

// chungG2 is Chung's density function G2 (or H2) for coefficients c.
func chungG2(c0, c1, c2, c3, c4, y float64) float64 {
	if y <= 0 {
		return 1
	}
	g1 := (1 - 0.5*y) / ((1 - y) * (1 - y) * (1 - y))
	return (c0*(-math.Expm1(-c3*y))/y + c1*g1*math.Exp(c4*y) + c2*g1) / (c0*c3 + c1 + c2)
}

// dense returns Chung's viscosity and conductivity at (T, rho) and their
// dilute-gas limits.
func (c *chung) dense(T, rho, cv0 float64) (mu, k, mu0, k0 float64) {
	mur := 131.3 * c.mu / math.Sqrt(c.Vc*c.Tc) // reduced dipole moment
	mur4 := mur * mur * mur * mur
	ts := 1.2593 * T / c.Tc
	om := neufeld(ts)
	fc := 1 - 0.2756*c.omega + 0.059035*mur4 + c.kappa
	y := rho / c.M * 1e-3 * c.Vc / 6 // molar density in mol/cm³ times Vc/6
	vc23 := math.Pow(c.Vc, 2.0/3.0)

	var e [10]float64
	for i, r := range chungE {
		e[i] = r[0] + r[1]*c.omega + r[2]*mur4 + r[3]*c.kappa
	}
	g2 := chungG2(e[0], e[1], e[2], e[3], e[4], y)
	ess := e[6] * y * y * g2 * math.Exp(e[7]+e[8]/ts+e[9]/(ts*ts))
	es := math.Sqrt(ts)/om*fc*(1/g2+e[5]*y) + ess
	mu = es * 36.344 * math.Sqrt(c.M*c.Tc) / vc23 * 1e-7 // µP → Pa·s
	mu0 = 40.785 * fc * math.Sqrt(c.M*T) / (vc23 * om) * 1e-7

	const R = 8.314462618
	mkg := c.M * 1e-3
	alpha := cv0*mkg/R - 1.5
	beta := 0.7862 - 0.7109*c.omega + 1.3168*c.omega*c.omega
	tr := T / c.Tc
	z := 2.0 + 10.5*tr*tr
	psi := 1 + alpha*(0.215+0.28288*alpha-1.061*beta+0.26665*z)/(0.6366+beta*z+1.061*alpha*beta)
	var b [7]float64
	for i, r := range chungB {
		b[i] = r[0] + r[1]*c.omega + r[2]*mur4 + r[3]*c.kappa
	}
	h2 := chungG2(b[0], b[1], b[2], b[3], b[4], y)
	q := 3.586e-3 * math.Sqrt(c.Tc/mkg) / vc23
	k0 = 31.2 * mu0 * psi / mkg
	k = k0*(1/h2+b[5]*y) + q*b[6]*y*y*math.Sqrt(tr)*h2
	return mu, k, mu0, k0
}

func (c *chung) transport(s state) (mu, k float64) {
	mu, k, mu0, k0 := c.dense(s.T, s.rho, s.cv0)
	if s.liquid {
		if c.liqMu != nil {
			mu = c.liqMu(s.T)
		}
		if c.liqK != nil {
			k = c.liqK(s.T)
		}
		return mu, k
	}
	if c.gasMu0 != nil {
		mu *= c.gasMu0(s.T) / mu0
	}
	if c.gasK0 != nil {
		k *= c.gasK0(s.T) / k0
	}
	return mu, k
}

// ppdsViscosity is the saturated-liquid viscosity equation of the VDI Heat
// Atlas, 2nd ed., Springer 2010, section D3.1:
// η = E exp(A x^(1/3) + B x^(4/3)), x = (C−T)/(T−D), in Pa·s.
type ppdsViscosity struct{ A, B, C, D, E float64 }

func (p ppdsViscosity) at(T float64) float64 {
	x := (p.C - T) / (T - p.D)
	x3 := math.Cbrt(x)
	return p.E * math.Exp(p.A*x3+p.B*x3*x3*x3*x3)
}

// ppdsPoly is a VDI Heat Atlas (2nd ed., section D3.1) polynomial
// A + B T + C T² + D T³ + E T⁴ in SI units, used there for dilute-gas
// viscosity and for liquid and dilute-gas thermal conductivity.
type ppdsPoly [5]float64

func (p ppdsPoly) at(T float64) float64 {
	return p[0] + T*(p[1]+T*(p[2]+T*(p[3]+T*p[4])))
}

// dippr101 is DIPPR equation 101, exp(C1 + C2/T + C3 ln T + C4 T^C5), as
// used in Perry's Chemical Engineers' Handbook, 8th ed. (2008), Table 2-313
// for liquid viscosity in Pa·s.
type dippr101 [5]float64

func (d dippr101) at(T float64) float64 {
	return math.Exp(d[0] + d[1]/T + d[2]*math.Log(T) + d[3]*math.Pow(T, d[4]))
}

// refViscosity is a fluid-specific reference viscosity correlation
// η = η0(T) + η1(T) ρ + Δη(ρ, T): dilute gas from kinetic theory with a fitted
// collision integral, the Rainwater–Friend initial-density term and a
// residual term in the modified Batschinski–Hildebrand form.
type refViscosity struct {
	// Dilute gas η0 = c0 √(M T) / (σ² Ω) µPa·s, ln Ω = Σ a_i (ln T*)^i,
	// T* = T/(ε/k); c0 is 0.021357 unless set.
	c0     float64
	M      float64 // molar mass, g/mol
	sigma  float64 // Lennard-Jones size, nm
	epsK   float64 // Lennard-Jones energy ε/k, K
	omegaA []float64
	// Initial-density term η1 = η0 N_A σ³ Σ b_i T*^t_i.
	rfB, rfT []float64
	// Dilute gas as Σ dilutePoly_i T^i Pa·s instead, when set.
	dilutePoly []float64
	// Dilute gas as Σ diluteNum_i T^i / Σ diluteDen_i T^i µPa·s instead,
	// when set (T in K).
	diluteNum, diluteDen []float64
	// Residual (Pa·s): Σ a_i δ^d_i τ^t_i + f δ^fd (1/(δ0−δ) − 1/δ0),
	// δ0 = Σ g_i τ^h_i / Σ p_i τ^q_i, δ = ρ/rhoR (molar), τ = Tr/T.
	Tr, rhoR      float64 // K, mol/m³
	hoA, hoD, hoT []float64
	hoF, hoFD     float64
	hoG, hoH      []float64
	hoP, hoQ      []float64
	// Rational residual term (Pa·s), added when hoRatN is set:
	// hoRatN τ^hoRatT δ^hoRatD / Σ hoRatC_i τ^hoRatCT_i δ^hoRatCD_i.
	hoRatN, hoRatT, hoRatD   float64
	hoRatC, hoRatCT, hoRatCD []float64
}

const avogadro = 6.02214076e23

// dilute is η0(T) in Pa·s.
func (r *refViscosity) dilute(T float64) float64 {
	if r.diluteNum != nil {
		num, den, pw := 0.0, 0.0, 1.0
		for i := 0; i < len(r.diluteNum) || i < len(r.diluteDen); i++ {
			if i < len(r.diluteNum) {
				num += r.diluteNum[i] * pw
			}
			if i < len(r.diluteDen) {
				den += r.diluteDen[i] * pw
			}
			pw *= T
		}
		return num / den * 1e-6
	}
	if r.dilutePoly != nil {
		v, pw := 0.0, 1.0
		for _, c := range r.dilutePoly {
			v += c * pw
			pw *= T
		}
		return v
	}
	lt := math.Log(T / r.epsK)
	lnOm, pw := 0.0, 1.0
	for _, a := range r.omegaA {
		lnOm += a * pw
		pw *= lt
	}
	c0 := r.c0
	if c0 == 0 {
		c0 = 0.021357
	}
	return c0 * 1e-6 * math.Sqrt(r.M*T) / (r.sigma * r.sigma * math.Exp(lnOm))
}

// at is η(T, ρ) in Pa·s, ρ in kg/m³.
func (r *refViscosity) at(T, rho float64) float64 {
	eta0 := r.dilute(T)
	ts := T / r.epsK
	bs := 0.0
	for i, b := range r.rfB {
		bs += b * math.Pow(ts, r.rfT[i])
	}
	sig := r.sigma * 1e-9
	rhoMol := rho / (r.M * 1e-3)
	eta1 := eta0 * avogadro * sig * sig * sig * bs * rhoMol
	delta, tau := rhoMol/r.rhoR, r.Tr/T
	s := 0.0
	for i, a := range r.hoA {
		s += a * math.Pow(delta, r.hoD[i]) * math.Pow(tau, r.hoT[i])
	}
	if r.hoF != 0 {
		num, den := 0.0, 0.0
		for i, g := range r.hoG {
			num += g * math.Pow(tau, r.hoH[i])
		}
		for i, p := range r.hoP {
			den += p * math.Pow(tau, r.hoQ[i])
		}
		d0 := num / den
		s += r.hoF * math.Pow(delta, r.hoFD) * (1/(d0-delta) - 1/d0)
	}
	if r.hoRatN != 0 {
		den := 0.0
		for i, c := range r.hoRatC {
			den += c * math.Pow(tau, r.hoRatCT[i]) * math.Pow(delta, r.hoRatCD[i])
		}
		s += r.hoRatN * math.Pow(tau, r.hoRatT) * math.Pow(delta, r.hoRatD) / den
	}
	return eta0 + eta1 + s
}

func (r *refViscosity) viscosity(s state) float64 { return r.at(s.T, s.rho) }

// ecsViscosity is the extended corresponding-states viscosity of M.L. Huber,
// A. Laesecke, R.A. Perkins, Ind. Eng. Chem. Res. 42 (2003) 3163:
// η(T, ρ) = η*(T) + [η₀(T₀, ρ₀ψ) − η₀*(T₀)] F, F = √f h^(−2/3) √(M/M₀),
// with the reference fluid's correlation η₀ and the conformal state
// (T₀ = T/f, ρ₀ = ρ h) found exactly from both equations of state (equal
// reduced residual Helmholtz energy and compressibility factor). ψ is the
// fluid's viscosity shape factor Σ c_i (ρ/ρc)^i (1 where none is published);
// η* is the fluid's dilute-gas viscosity.
type ecsViscosity struct {
	ref    *refViscosity
	refEOS *helmholtz
	psi    []float64 // in powers of δ = ρ/psiRho (molar)
	psiRho float64   // mol/m³
	dilute viscosityModel
}

// conformal returns T₀ and ρ₀ (kg/m³ of the reference fluid) of the state of
// the reference fluid that corresponds to (T, ρ) of fluid h.
func conformal(h, ref *helmholtz, T, rho float64) (T0, rho0 float64, ok bool) {
	tau, delta := h.Tr/T, rho/h.rhoR
	r := alphar(h.terms, tau, delta)
	wantA, wantZ := r.a, delta*r.d
	// Start from the ratio of critical constants.
	t0 := ref.Tr / (T * ref.info.Tc / h.info.Tc)
	d0 := rho / h.M * (ref.info.RhoC / ref.M) / (h.info.RhoC / h.M) * ref.M / ref.rhoR
	for it := 0; it < 50; it++ {
		q := alphar(ref.terms, t0, d0)
		fa, fz := q.a-wantA, d0*q.d-wantZ
		// Jacobian in (τ₀, δ₀).
		a11, a12 := q.t, q.d
		a21, a22 := d0*q.dt, q.d+d0*q.dd
		det := a11*a22 - a12*a21
		if det == 0 || math.IsNaN(det) {
			return 0, 0, false
		}
		dt := (fa*a22 - fz*a12) / det
		dd := (a11*fz - a21*fa) / det
		for k := 0; k < 20 && (t0-dt <= 0 || d0-dd <= 0); k++ {
			dt, dd = dt/2, dd/2
		}
		t0 -= dt
		d0 -= dd
		if math.Abs(dt) < 1e-12*t0 && math.Abs(dd) < 1e-12*d0 {
			return ref.Tr / t0, d0 * ref.rhoR, true
		}
	}
	return 0, 0, false
}

func (e *ecsViscosity) viscosity(s state) float64 {
	h, ref := s.h, e.refEOS
	T0, rho0, ok := conformal(h, ref, s.T, s.rho)
	if !ok { // fall back on the ratio of critical constants
		T0 = s.T * ref.info.Tc / h.info.Tc
		rho0 = s.rho / h.M * (ref.info.RhoC / ref.M) / (h.info.RhoC / h.M) * ref.M
	}
	f := s.T / T0
	hh := (rho0 / ref.M) / (s.rho / h.M) // molar density ratio ρ₀/ρ
	psi, pw := 0.0, 1.0
	d := s.rho / h.M / e.psiRho
	for _, c := range e.psi {
		psi += c * pw
		pw *= d
	}
	if e.psi == nil {
		psi = 1
	}
	res := e.ref.at(T0, rho0*psi) - e.ref.dilute(T0)
	F := math.Sqrt(f) * math.Pow(hh, -2.0/3.0) * math.Sqrt(h.M/ref.M)
	return e.dilute.viscosity(s) + res*F
}

// refConductivity is a fluid-specific reference thermal-conductivity
// correlation λ = λ0(T) + λr(ρ, T) + λc(ρ, T), in W/(m·K): λ0 = Σ a_i (T/Tr)^i
// (divided by Σ aDen_i (T/Tr)^i when aDen is set),
// λr = Σ (b1_i + b2_i T/Tr) (ρ/rhoR)^i (i = 1, 2, …) and λc the simplified
// critical enhancement of G.A. Olchowy and J.V. Sengers, Int. J.
// Thermophys. 10 (1989) 417 (omitted when crit is zero).
type refConductivity struct {
	Tr     float64 // K
	rhoR   float64 // kg/m³
	a      []float64
	aDen   []float64
	b1, b2 []float64
	crit   olchowy
}

// residual is λr(ρ, T) alone.
func (r *refConductivity) residual(T, rho float64) float64 {
	tr := T / r.Tr
	k := 0.0
	d := rho / r.rhoR
	pw := d
	for i, c := range r.b1 {
		b := c
		if i < len(r.b2) {
			b += r.b2[i] * tr
		}
		k += b * pw
		pw *= d
	}
	return k
}

func (r *refConductivity) conductivity(s state, mu float64) float64 {
	tr := s.T / r.Tr
	k, pw := 0.0, 1.0
	for _, c := range r.a {
		k += c * pw
		pw *= tr
	}
	if r.aDen != nil {
		den := 0.0
		pw = 1
		for _, c := range r.aDen {
			den += c * pw
			pw *= tr
		}
		k /= den
	}
	d := s.rho / r.rhoR
	pw = d
	for i, c := range r.b1 {
		b := c
		if i < len(r.b2) {
			b += r.b2[i] * tr
		}
		k += b * pw
		pw *= d
	}
	if r.crit.xi0 == 0 {
		return k
	}
	return k + r.crit.enhancement(s, mu)
}

// ecsConductivity is the corresponding-states counterpart of ecsViscosity
// (same method and reference fluid, shape factors one): λ = λ*(T) +
// λr₀(T₀, ρ₀) √f h^(−2/3) √(M₀/M) + λc, with the fluid's Chung dilute-gas
// conductivity λ* and its own critical enhancement λc.
type ecsConductivity struct {
	ref    *refConductivity
	refEOS *helmholtz
	crit   olchowy
}

func (e *ecsConductivity) conductivity(s state, mu float64) float64 {
	h, ref := s.h, e.refEOS
	T0, rho0, ok := conformal(h, ref, s.T, s.rho)
	if !ok {
		T0 = s.T * ref.info.Tc / h.info.Tc
		rho0 = s.rho / h.M * (ref.info.RhoC / ref.M) / (h.info.RhoC / h.M) * ref.M
	}
	f := s.T / T0
	hh := (rho0 / ref.M) / (s.rho / h.M)
	F := math.Sqrt(f) * math.Pow(hh, -2.0/3.0) * math.Sqrt(ref.M/h.M)
	_, _, _, k0 := h.chung.dense(s.T, 0, s.cv0)
	return k0 + e.ref.residual(T0, rho0)*F + e.crit.enhancement(s, mu)
}

// olchowy holds the simplified Olchowy–Sengers critical-enhancement constants.
type olchowy struct {
	R0, gamma, nu, Gamma float64
	xi0, qD              float64 // m, 1/m
	Tref                 float64 // K
	pc, rhoc             float64 // Pa, kg/m³
}

// enhancement is the simplified Olchowy–Sengers critical term λc.
func (o *olchowy) enhancement(st state, mu float64) float64 {
	const kB = 1.380649e-23
	T, rho := st.T, st.rho
	chi := o.pc * rho / (o.rhoc * o.rhoc) *
		(1/st.h.dpdrho(T, rho) - o.Tref/T/st.h.dpdrho(o.Tref, rho))
	if !(chi > 0) {
		return 0
	}
	xi := o.xi0 * math.Pow(chi/o.Gamma, o.nu/o.gamma)
	qx := o.qD * xi
	om := 2 / math.Pi * ((st.cp-st.cv)/st.cp*math.Atan(qx) + st.cv/st.cp*qx)
	om0 := 2 / math.Pi * (1 - math.Exp(-1/(1/qx+qx*qx/3*(o.rhoc/rho)*(o.rhoc/rho))))
	return rho * st.cp * o.R0 * kB * T / (6 * math.Pi * mu * xi) * (om - om0)
}

// viscosityModel and conductivityModel are the two halves of a transport
// model; pair joins them (the conductivity's critical term needs η).
type viscosityModel interface{ viscosity(s state) float64 }
type conductivityModel interface {
	conductivity(s state, mu float64) float64
}

type pair struct {
	visc viscosityModel
	cond conductivityModel
}

func (p pair) transport(s state) (mu, k float64) {
	mu = p.visc.viscosity(s)
	return mu, p.cond.conductivity(s, mu)
}

// chungViscosity is the viscosity half of the fluid's Chung model (with its
// liquid and dilute-gas overrides).
type chungViscosity struct{}

func (chungViscosity) viscosity(s state) float64 {
	mu, _ := s.h.chung.transport(s)
	return mu
}

// chungConductivity is the conductivity half of the fluid's Chung model.
type chungConductivity struct{}

func (chungConductivity) conductivity(s state, _ float64) float64 {
	_, k := s.h.chung.transport(s)
	return k
}

// chapmanEnskog is the dilute-gas viscosity 0.0266958 √(M T)/(σ² Ω) µPa·s of
// kinetic theory with the Neufeld collision integral (M in g/mol, σ in nm).
type chapmanEnskog struct{ M, sigma, epsK float64 }

func (c chapmanEnskog) viscosity(s state) float64 {
	return 0.0266958e-6 * math.Sqrt(c.M*s.T) / (c.sigma * c.sigma * neufeld(s.T/c.epsK))
}

// chungDilute is the fluid's Chung dilute-gas viscosity.
type chungDilute struct{}

func (chungDilute) viscosity(s state) float64 {
	_, _, mu0, _ := s.h.chung.dense(s.T, 0, s.cv0)
	return mu0
}
