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

// refTransport is a fluid-specific reference correlation of the form
// η = η0(T) + η1(T) ρ + Δη(ρ, T) and λ = λ0(T) + λr(ρ, T) + λc(ρ, T):
// dilute gas from kinetic theory with a fitted collision integral, the
// Rainwater–Friend initial-density term, a residual term and, for the
// thermal conductivity, the simplified critical enhancement of Olchowy and
// Sengers (Int. J. Thermophys. 10 (1989) 417).
type refTransport struct {
	// Dilute-gas viscosity η0 = 0.021357 √(M T) / (σ² Ω) µPa·s,
	// ln Ω = Σ a_i (ln T*)^i, T* = T/(ε/k).
	M      float64 // molar mass, g/mol
	sigma  float64 // Lennard-Jones size, nm
	epsK   float64 // Lennard-Jones energy ε/k, K
	omegaA []float64
	// Initial-density term η1 = η0 N_A σ³ Σ b_i T*^t_i.
	rfB, rfT []float64
	// Residual viscosity (Pa·s), modified Batschinski–Hildebrand form:
	// Δη = Σ a_i δ^d_i τ^t_i + f (1/(δ0−δ) − 1/δ0), δ0 = g/Σ p_i τ^q_i,
	// δ = ρ/(rhoRV·M), τ = TrV/T.
	TrV, rhoRV    float64 // K, mol/m³
	hoA, hoD, hoT []float64
	hoF, hoG      float64
	hoP, hoQ      []float64
	// Conductivity (W/(m·K)): λ0 = Σ k0_i T^i;
	// λr = Σ kr_i (ρ/rhoRK)^i (i = 1, 2, …).
	k0    []float64
	kr    []float64
	rhoRK float64 // kg/m³
	// Critical enhancement parameters.
	crit olchowy
}

// olchowy holds the simplified Olchowy–Sengers critical-enhancement constants.
type olchowy struct {
	R0, gamma, nu, Gamma float64
	xi0, qD              float64 // m, 1/m
	Tref                 float64 // K
	Tc, pc, rhoc         float64 // K, Pa, kg/m³
}

const avogadro = 6.02214076e23

func (r *refTransport) viscosity(T, rho float64) float64 {
	ts := T / r.epsK
	lt := math.Log(ts)
	lnOm, pw := 0.0, 1.0
	for _, a := range r.omegaA {
		lnOm += a * pw
		pw *= lt
	}
	eta0 := 0.021357e-6 * math.Sqrt(r.M*T) / (r.sigma * r.sigma * math.Exp(lnOm))
	bs := 0.0
	for i, b := range r.rfB {
		bs += b * math.Pow(ts, r.rfT[i])
	}
	sig := r.sigma * 1e-9
	rhoMol := rho / (r.M * 1e-3)
	eta1 := eta0 * avogadro * sig * sig * sig * bs * rhoMol
	delta, tau := rhoMol/r.rhoRV, r.TrV/T
	s := 0.0
	for i, a := range r.hoA {
		s += a * math.Pow(delta, r.hoD[i]) * math.Pow(tau, r.hoT[i])
	}
	den := 0.0
	for i, p := range r.hoP {
		den += p * math.Pow(tau, r.hoQ[i])
	}
	d0 := r.hoG / den
	s += r.hoF * (1/(d0-delta) - 1/d0)
	return eta0 + eta1 + s
}

func (r *refTransport) transport(st state) (mu, k float64) {
	mu = r.viscosity(st.T, st.rho)
	pw := 1.0
	for _, c := range r.k0 {
		k += c * pw
		pw *= st.T
	}
	d := st.rho / r.rhoRK
	pw = d
	for _, c := range r.kr {
		k += c * pw
		pw *= d
	}
	k += r.crit.enhancement(st, mu)
	return mu, k
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
