package fluid

import (
	"fmt"
	"math"
)

// Water is answered from the IAPWS industrial formulation IF97 for the
// saturation line (region 4) and the saturated phases (region 1 for the
// liquid and region 2 for the vapour up to 623.15 K, region 3 for both above),
// with the IAPWS 2008 viscosity and 2011 thermal conductivity correlations
// evaluated at the IF97 saturated densities, and the IAPWS 2014 surface
// tension.
//
// The viscosity omits its critical enhancement (μ₂ = 1), which the 2008
// release allows outside a small region around the critical point; the
// thermal conductivity includes its critical enhancement λ₂ in the release's
// industrial form (IF97 derivatives, the tabulated reference compressibility).
// The range ends at waterTmax, 646 K (372.85 °C), 1.096 K below the critical
// point 647.096 K (373.946 °C) and inside IF97 region 3, which starts at
// 623.15 K (350 °C): closer to the critical point the saturated phases'
// properties change faster than a quick estimate can use, and the omitted
// viscosity enhancement starts to matter. Without a lower saturation_max the
// top of the range is also the condenser margin's limit.
type water struct{}

func init() { register(water{}) }

const (
	waterR    = 461.526 // specific gas constant of IF97, J/(kg·K)
	waterTc   = 647.096 // K
	waterPc   = 22.064e6
	waterRhoc = 322.0
	waterTmin = 273.16 // triple point, K
	waterTmax = 646.0  // highest saturation temperature answered, K (region 3)
	waterT13  = 623.15 // boundary of IF97 regions 1 and 2 with region 3, K
)

func (water) Info() Info {
	return Info{
		Name:      "water",
		Aliases:   []string{"R718", "H2O"},
		MolarMass: 0.018015268,
		Tc:        waterTc,
		Pc:        waterPc,
		RhoC:      waterRhoc,
		Tmin:      waterTmin,
		Tmax:      waterTmax,
		Safety:    "A1",
		Source: "IAPWS R7-97(2012) IF97 regions 1, 2, 3 and 4; IAPWS R12-08 viscosity without critical enhancement; " +
			"IAPWS R15-11 thermal conductivity with its critical enhancement (industrial form); " +
			"IAPWS R1-76(2014) surface tension",
	}
}

func (w water) Direct(T float64) (Sat, error) {
	if !(T >= waterTmin && T <= waterTmax) {
		return Sat{}, &RangeError{Fluid: "water", Quantity: "temperature", Value: T, Min: waterTmin, Max: waterTmax, Unit: "K"}
	}
	p := if97Psat(T)
	l, v, err := waterSatPhases(T, p)
	if err != nil {
		return Sat{}, err
	}
	rl, rv := 1/l.v, 1/v.v
	mul, muv := waterViscosity(rl, T), waterViscosity(rv, T)
	s := Sat{
		T: T, P: p,
		RhoL: rl, RhoV: rv,
		HL: l.h, HV: v.h, Hlv: v.h - l.h,
		CpL: l.cp, CpV: v.cp,
		MuL: mul, MuV: muv,
		KL:    waterConductivity(rl, T) + waterConductivityCritical(rl, T, l, mul),
		KV:    waterConductivity(rv, T) + waterConductivityCritical(rv, T, v, muv),
		Sigma: waterSurfaceTension(T),
	}
	if !finiteSat(s) {
		return Sat{}, fmt.Errorf("water: no finite saturated state at %g K", T)
	}
	return s, nil
}

// waterBlend is the half-width (K) of the band about 623.15 K over which the
// saturated phases pass from regions 1 and 2 to region 3. The two sets differ
// there by up to 0.01 % in density (IF97's consistency at the boundary), a
// step the cached table cannot follow; a smooth blend over the band keeps
// every property continuous with a continuous slope.
const waterBlend = 1.0

// waterSatPhases returns the saturated liquid and vapour at T (K) and the
// saturation pressure p (Pa).
func waterSatPhases(T, p float64) (l, v if97State, err error) {
	lo, hi := waterT13-waterBlend, waterT13+waterBlend
	if T <= lo {
		return if97Region1(T, p), if97Region2(T, p), nil
	}
	l3, v3, err := if97Region3Sat(T, p)
	if err != nil || T >= hi {
		return l3, v3, err
	}
	u := (T - lo) / (hi - lo)
	w := u * u * (3 - 2*u)
	return if97Mix(if97Region1(T, p), l3, w), if97Mix(if97Region2(T, p), v3, w), nil
}

// if97Mix is (1−w)·a + w·b field by field, density blended as density.
func if97Mix(a, b if97State, w float64) if97State {
	m := func(x, y float64) float64 { return (1-w)*x + w*y }
	return if97State{
		v: 1 / m(1/a.v, 1/b.v),
		h: m(a.h, b.h), cp: m(a.cp, b.cp), cv: m(a.cv, b.cv),
		drhodp: m(a.drhodp, b.drhodp),
	}
}

// Region 4 coefficients, IF97 Table 34.
var if97n4 = [11]float64{0, 0.11670521452767e4, -0.72421316703206e6, -0.17073846940092e2,
	0.12020824702470e5, -0.32325550322333e7, 0.14915108613530e2,
	-0.48232657361591e4, 0.40511340542057e6, -0.23855557567849,
	0.65017534844798e3}

// if97Psat is the saturation pressure (Pa) at T (K), IF97 Eq. 30.
func if97Psat(T float64) float64 {
	n := &if97n4
	th := T + n[9]/(T-n[10])
	A := th*th + n[1]*th + n[2]
	B := n[3]*th*th + n[4]*th + n[5]
	C := n[6]*th*th + n[7]*th + n[8]
	r := 2 * C / (-B + math.Sqrt(B*B-4*A*C))
	r *= r
	return r * r * 1e6
}

// if97Tsat is the saturation temperature (K) at p (Pa), IF97 Eq. 31.
func if97Tsat(p float64) float64 {
	n := &if97n4
	b := math.Sqrt(math.Sqrt(p / 1e6))
	E := b*b + n[3]*b + n[6]
	F := n[1]*b*b + n[4]*b + n[7]
	G := n[2]*b*b + n[5]*b + n[8]
	D := 2 * G / (-F - math.Sqrt(F*F-4*E*G))
	return (n[10] + D - math.Sqrt((n[10]+D)*(n[10]+D)-4*(n[9]+n[10]*D))) / 2
}

// Region 1 Gibbs-function terms, IF97 Table 2.
var (
	if97I1 = [34]int{0, 0, 0, 0, 0, 0, 0, 0, 1, 1, 1, 1, 1, 1, 2, 2, 2, 2, 2, 3, 3, 3, 4, 4, 4, 5, 8, 8, 21, 23, 29, 30, 31, 32}
	if97J1 = [34]int{-2, -1, 0, 1, 2, 3, 4, 5, -9, -7, -1, 0, 1, 3, -3, 0, 1, 3, 17, -4, 0, 6, -5, -2, 10, -8, -11, -6, -29, -31, -38, -39, -40, -41}
	if97n1 = [34]float64{0.14632971213167, -0.84548187169114, -0.37563603672040e1, 0.33855169168385e1,
		-0.95791963387872, 0.15772038513228, -0.16616417199501e-1, 0.81214629983568e-3,
		0.28319080123804e-3, -0.60706301565874e-3, -0.18990068218419e-1, -0.32529748770505e-1,
		-0.21841717175414e-1, -0.52838357969930e-4, -0.47184321073267e-3, -0.30001780793026e-3,
		0.47661393906987e-4, -0.44141845330846e-5, -0.72694996297594e-15, -0.31679644845054e-4,
		-0.28270797985312e-5, -0.85205128120103e-9, -0.22425281908000e-5, -0.65171222895601e-6,
		-0.14341729937924e-12, -0.40516996860117e-6, -0.12734301741641e-8, -0.17424871230634e-9,
		-0.68762131295531e-18, 0.14478307828521e-19, 0.26335781662795e-22, -0.11947622640071e-22,
		0.18228094581404e-23, -0.93537087292458e-25}
)

// if97State is one IF97 state: specific volume (m³/kg), enthalpy (J/kg),
// isobaric and isochoric heat capacities (J/(kg·K)) and the isothermal
// derivative of density with pressure (kg/(m³·Pa)), which the conductivity's
// critical enhancement needs.
type if97State struct {
	v, h, cp, cv, drhodp float64
}

// if97Region1 returns the liquid's state at T (K), p (Pa), IF97 Eq. 7 and Table 3.
func if97Region1(T, p float64) if97State {
	pi, tau := p/16.53e6, 1386.0/T
	a, b := 7.1-pi, tau-1.222
	var gp, gpp, gpt, gt, gtt float64
	for k := range if97n1 {
		I, J, n := if97I1[k], if97J1[k], if97n1[k]
		aI := ipow(a, I)
		bJ := ipow(b, J)
		if I > 0 {
			gp -= n * float64(I) * aI / a * bJ
			gpt -= n * float64(I*J) * aI / a * bJ / b
		}
		if I > 1 {
			gpp += n * float64(I*(I-1)) * aI / (a * a) * bJ
		}
		gt += n * float64(J) * aI * bJ / b
		gtt += n * float64(J*(J-1)) * aI * bJ / (b * b)
	}
	v := pi * gp * waterR * T / p
	dvdp := waterR * T / (16.53e6 * 16.53e6) * gpp
	q := gp - tau*gpt
	return if97State{
		v:      v,
		h:      tau * gt * waterR * T,
		cp:     -tau * tau * gtt * waterR,
		cv:     waterR * (-tau*tau*gtt + q*q/gpp),
		drhodp: -dvdp / (v * v),
	}
}

// Region 2 ideal-gas (Table 10) and residual (Table 11) terms.
var (
	if97J0 = [9]int{0, 1, -5, -4, -3, -2, -1, 2, 3}
	if97n0 = [9]float64{-0.96927686500217e1, 0.10086655968018e2, -0.56087911283020e-2, 0.71452738081455e-1,
		-0.40710498223928, 0.14240819171444e1, -0.43839511319450e1, -0.28408632460772,
		0.21268463753307e-1}
	if97I2 = [43]int{1, 1, 1, 1, 1, 2, 2, 2, 2, 2, 3, 3, 3, 3, 3, 4, 4, 4, 5, 6, 6, 6, 7, 7, 7, 8, 8, 9, 10, 10, 10, 16, 16, 18, 20, 20, 20, 21, 22, 23, 24, 24, 24}
	if97J2 = [43]int{0, 1, 2, 3, 6, 1, 2, 4, 7, 36, 0, 1, 3, 6, 35, 1, 2, 3, 7, 3, 16, 35, 0, 11, 25, 8, 36, 13, 4, 10, 14, 29, 50, 57, 20, 35, 48, 21, 53, 39, 26, 40, 58}
	if97n2 = [43]float64{-0.17731742473213e-2, -0.17834862292358e-1, -0.45996013696365e-1, -0.57581259083432e-1,
		-0.50325278727930e-1, -0.33032641670203e-4, -0.18948987516315e-3, -0.39392777243355e-2,
		-0.43797295650573e-1, -0.26674547914087e-4, 0.20481737692309e-7, 0.43870667284435e-6,
		-0.32277677238570e-4, -0.15033924542148e-2, -0.40668253562649e-1, -0.78847309559367e-9,
		0.12790717852285e-7, 0.48225372718507e-6, 0.22922076337661e-5, -0.16714766451061e-10,
		-0.21171472321355e-2, -0.23895741934104e2, -0.59059564324270e-17, -0.12621808899101e-5,
		-0.38946842435739e-1, 0.11256211360459e-10, -0.82311340897998e1, 0.19809712802088e-7,
		0.10406965210174e-18, -0.10234747095929e-12, -0.10018179379511e-8, -0.80882908646985e-10,
		0.10693031879409, -0.33662250574171, 0.89185845355421e-24, 0.30629316876232e-12,
		-0.42002467698208e-5, -0.59056029685639e-25, 0.37826947613457e-5, -0.12768608934681e-14,
		0.73087610595061e-28, 0.55414715350778e-16, -0.94369707241210e-6}
)

// if97Region2 returns the vapour's state at T (K), p (Pa), IF97 Eq. 15 and Table 12.
func if97Region2(T, p float64) if97State {
	pi, tau := p/1e6, 540.0/T
	var g0t, g0tt float64
	for k := range if97n0 {
		J, n := if97J0[k], if97n0[k]
		tJ := ipow(tau, J)
		g0t += n * float64(J) * tJ / tau
		g0tt += n * float64(J*(J-1)) * tJ / (tau * tau)
	}
	b := tau - 0.5
	var grp, grpp, grpt, grt, grtt float64
	for k := range if97n2 {
		I, J, n := if97I2[k], if97J2[k], if97n2[k]
		pI := ipow(pi, I)
		bJ := ipow(b, J)
		grp += n * float64(I) * pI / pi * bJ
		grpp += n * float64(I*(I-1)) * pI / (pi * pi) * bJ
		if J > 0 {
			grt += n * pI * float64(J) * bJ / b
			grtt += n * pI * float64(J*(J-1)) * bJ / (b * b)
			grpt += n * float64(I*J) * pI / pi * bJ / b
		}
	}
	v := pi * (1/pi + grp) * waterR * T / p
	dvdp := waterR * T / 1e12 * (-1/(pi*pi) + grpp)
	q := 1 + pi*grp - tau*pi*grpt
	return if97State{
		v:      v,
		h:      tau * (g0t + grt) * waterR * T,
		cp:     -tau * tau * (g0tt + grtt) * waterR,
		cv:     waterR * (-tau*tau*(g0tt+grtt) - q*q/(1-pi*pi*grpp)),
		drhodp: -dvdp / (v * v),
	}
}

// Region 3 Helmholtz-function terms, IF97 Table 30 (the first term, n₁ ln δ,
// is written out in if97Region3).
var (
	if97I3 = [39]int{0, 0, 0, 0, 0, 0, 0, 1, 1, 1, 1, 2, 2, 2, 2, 2, 2, 3, 3, 3, 3, 3, 4, 4, 4, 4, 5, 5, 5, 6, 6, 6, 7, 8, 9, 9, 10, 10, 11}
	if97J3 = [39]int{0, 1, 2, 7, 10, 12, 23, 2, 6, 15, 17, 0, 2, 6, 7, 22, 26, 0, 2, 4, 16, 26, 0, 2, 4, 26, 1, 3, 26, 0, 2, 26, 2, 26, 2, 26, 0, 1, 26}
	if97n3 = [39]float64{-0.15732845290239e2, 0.20944396974307e2, -0.76867707878716e1,
		0.26185947787954e1, -0.28080781148620e1, 0.12053369696517e1, -0.84566812812502e-2,
		-0.12654315477714e1, -0.11524407806681e1, 0.88521043984318, -0.64207765181607,
		0.38493460186671, -0.85214708824206, 0.48972281541877e1, -0.30502617256965e1,
		0.39420536879154e-1, 0.12558408424308, -0.27999329698710, 0.13899799569460e1,
		-0.20189915023570e1, -0.82147637173963e-2, -0.47596035734923, 0.43984074473500e-1,
		-0.44476435428739, 0.90572070719733, 0.70522450087967, 0.10770512626332,
		-0.32913623258954, -0.50871062041158, -0.22175400873096e-1, 0.94260751665092e-1,
		0.16436278447961, -0.13503372241348e-1, -0.14834345352472e-1, 0.57922953628084e-3,
		0.32308904703711e-2, 0.80964802996215e-4, -0.16557679795037e-3, -0.44923899061815e-4}
)

const if97n3ln = 0.10658070028513e1 // n₁ of IF97 Table 30, the coefficient of ln δ

// if97Region3 returns the pressure (Pa) and the state at density rho (kg/m³)
// and T (K), IF97 Eq. 28 and Table 31.
func if97Region3(rho, T float64) (p float64, s if97State) {
	d, tau := rho/waterRhoc, waterTc/T
	fd, fdd := if97n3ln/d, -if97n3ln/(d*d)
	var ft, ftt, fdt float64
	for k := range if97n3 {
		I, J, n := if97I3[k], if97J3[k], if97n3[k]
		dI, tJ := ipow(d, I), ipow(tau, J)
		fd += n * float64(I) * dI / d * tJ
		fdd += n * float64(I*(I-1)) * dI / (d * d) * tJ
		ft += n * float64(J) * dI * tJ / tau
		ftt += n * float64(J*(J-1)) * dI * tJ / (tau * tau)
		fdt += n * float64(I*J) * dI / d * tJ / tau
	}
	RT := waterR * T
	p = rho * RT * d * fd
	dpdrho := RT * (2*d*fd + d*d*fdd)
	q := d*fd - d*tau*fdt
	s = if97State{
		v:      1 / rho,
		h:      RT * (tau*ft + d*fd),
		cv:     -waterR * tau * tau * ftt,
		cp:     waterR * (-tau*tau*ftt + q*q/(2*d*fd+d*d*fdd)),
		drhodp: 1 / dpdrho,
	}
	return p, s
}

// if97Region3Sat returns the saturated liquid and vapour of region 3 at T (K)
// and the region 4 saturation pressure p (Pa): the outer roots of
// p₃(ρ, T) = p, found by stepping in from either side of the two-phase loop of
// the Helmholtz function and refining by bisection.
func if97Region3Sat(T, p float64) (l, v if97State, err error) {
	f := func(rho float64) float64 { q, _ := if97Region3(rho, T); return q - p }
	// Liquid: down from a compressed-liquid density; vapour: up from a
	// density below every saturated vapour of region 3.
	rl, okl := if97Region3Root(f, 760, waterRhoc, -1)
	rv, okv := if97Region3Root(f, 60, waterRhoc, 1)
	if !okl || !okv || !(rl > rv) {
		return l, v, fmt.Errorf("water: no region 3 saturated state at %g K", T)
	}
	_, l = if97Region3(rl, T)
	_, v = if97Region3(rv, T)
	return l, v, nil
}

// if97Region3Root steps from rho toward stop by 1 kg/m³ in direction dir until
// f changes sign, then bisects that step to machine precision.
func if97Region3Root(f func(float64) float64, rho, stop, dir float64) (float64, bool) {
	const step = 1.0
	f0 := f(rho)
	for ; (stop-rho)*dir > 0; rho += dir * step {
		f1 := f(rho + dir*step)
		if (f0 > 0) != (f1 > 0) {
			a, b, fa := rho, rho+dir*step, f0
			for i := 0; i < 200 && a != b; i++ {
				m := (a + b) / 2
				if m == a || m == b {
					break
				}
				if fm := f(m); (fm > 0) == (fa > 0) {
					a, fa = m, fm
				} else {
					b = m
				}
			}
			return (a + b) / 2, true
		}
		f0 = f1
	}
	return 0, false
}

// ipow is x to an integer power by repeated squaring.
func ipow(x float64, n int) float64 {
	if n < 0 {
		return 1 / ipow(x, -n)
	}
	r := 1.0
	for n > 0 {
		if n&1 == 1 {
			r *= x
		}
		x *= x
		n >>= 1
	}
	return r
}

// Viscosity coefficients, IAPWS R12-08 Tables 1 and 2.
var (
	visH0 = [4]float64{1.67752, 2.20462, 0.6366564, -0.241605}
	visH1 = [6][7]float64{ // visH1[i][j] multiplies (1/Tr−1)^i (ρr−1)^j
		{0.520094, 0.222531, -0.281378, 0.161913, -0.0325372, 0, 0},
		{0.0850895, 0.999115, -0.906851, 0.257399, 0, 0, 0},
		{-1.08374, 1.88797, -0.772479, 0, 0, 0, 0},
		{-0.289555, 1.26613, -0.489837, 0, 0.0698452, 0, -0.00435673},
		{0, 0, -0.257040, 0, 0, 0.00872102, 0},
		{0, 0.120573, 0, 0, 0, 0, -0.000593264},
	}
)

// waterViscosity is the dynamic viscosity (Pa·s) at density rho (kg/m³) and
// T (K), IAPWS R12-08 Eq. 10–12 with μ₂ = 1.
func waterViscosity(rho, T float64) float64 {
	Tr, Dr := T/waterTc, rho/waterRhoc
	var s0 float64
	for i, h := range visH0 {
		s0 += h / ipow(Tr, i)
	}
	mu0 := 100 * math.Sqrt(Tr) / s0
	x, y := 1/Tr-1, Dr-1
	var s1, xi float64 = 0, 1
	for i := range visH1 {
		var yj float64 = 1
		for j := range visH1[i] {
			s1 += visH1[i][j] * xi * yj
			yj *= y
		}
		xi *= x
	}
	return mu0 * math.Exp(Dr*s1) * 1e-6
}

// Thermal conductivity coefficients, IAPWS R15-11 Tables 1 and 2.
var (
	tcL0 = [5]float64{2.443221e-3, 1.323095e-2, 6.770357e-3, -3.454586e-3, 4.096266e-4}
	tcL1 = [5][6]float64{ // tcL1[i][j] multiplies (1/Tr−1)^i (ρr−1)^j
		{1.60397357, -0.646013523, 0.111443906, 0.102997357, -0.0504123634, 0.00609859258},
		{2.33771842, -2.78843778, 1.53616167, -0.463045512, 0.0832827019, -0.00719201245},
		{2.19650529, -4.54580785, 3.55777244, -1.40944978, 0.275418278, -0.0205938816},
		{-1.21051378, 1.60812989, -0.621178141, 0.0716373224, 0, 0},
		{-2.7203370, 4.57586331, -3.18369245, 1.1168348, -0.19268305, 0.012913842},
	}
)

// waterConductivity is the thermal conductivity (W/(m·K)) at density rho
// (kg/m³) and T (K), IAPWS R15-11 Eq. 16–17 with λ₂ = 0.
func waterConductivity(rho, T float64) float64 {
	Tr, Dr := T/waterTc, rho/waterRhoc
	var s0 float64
	for k, L := range tcL0 {
		s0 += L / ipow(Tr, k)
	}
	l0 := math.Sqrt(Tr) / s0
	x, y := 1/Tr-1, Dr-1
	var s1, xi float64 = 0, 1
	for i := range tcL1 {
		var yj float64 = 1
		for j := range tcL1[i] {
			s1 += tcL1[i][j] * xi * yj
			yj *= y
		}
		xi *= x
	}
	return l0 * math.Exp(Dr*s1) * 1e-3
}

// Critical-enhancement constants of IAPWS R15-11 Table 3 and Eq. 18–25 (the
// release's own gas constant, not IF97's).
const (
	tcLambda = 177.8514
	tcQD     = 1 / 0.40 // inverse of q̄_D⁻¹ = 0.40 nm, per nm
	tcNu     = 0.630
	tcGamma  = 1.239
	tcXi0    = 0.13 // nm
	tcGamma0 = 0.06
	tcTR     = 1.5
	tcR      = 461.51805 // J/(kg·K)
)

// tcZetaRef are the coefficients A_ij of IAPWS R15-11 Table 6: the reduced
// compressibility at the reference temperature T̄_R, ζ = 1/Σ A_i ρ̄^i, for the
// reduced-density intervals ending at tcZetaBreaks.
var (
	tcZetaBreaks = [4]float64{0.310559006, 0.776397516, 1.242236025, 1.863354037}
	tcZetaRef    = [5][6]float64{
		{6.53786807199516, -5.61149954923348, 3.39624167361325, -2.27492629730878, 10.2631854662709, 1.97815050331519},
		{6.52717759281799, -6.30816983387575, 8.08379285492595, -9.82240510197603, 12.1358413791395, -5.54349664571295},
		{5.35500529896124, -3.96415689925446, 8.91990208918795, -12.0338729505790, 9.19494865194302, -2.16866274479712},
		{1.55225959906681, 0.464621290821181, 8.93237374861479, -11.0321960061126, 6.16780999933360, -0.965458722086812},
		{1.11999926419994, 0.595748562571649, 9.88952565078920, -10.3255051147040, 4.66861294457414, -0.503243546373828},
	}
)

// waterConductivityCritical is the critical enhancement λ₂ (W/(m·K)) at
// density rho (kg/m³) and T (K) of the state s whose viscosity is mu (Pa·s),
// IAPWS R15-11 Eq. 18–22 with the industrial reference compressibility of
// Eq. 25. It vanishes far from the critical point.
func waterConductivityCritical(rho, T float64, s if97State, mu float64) float64 {
	d, Tr := rho/waterRhoc, T/waterTc
	row := len(tcZetaBreaks)
	for i, b := range tcZetaBreaks {
		if d <= b {
			row = i
			break
		}
	}
	var den float64
	for i, a := range tcZetaRef[row] {
		den += a * ipow(d, i)
	}
	zeta := waterPc / waterRhoc * s.drhodp
	dchi := d * (zeta - 1/den*tcTR/Tr)
	if !(dchi > 0) {
		return 0
	}
	xi := tcXi0 * math.Pow(dchi/tcGamma0, tcNu/tcGamma)
	y := tcQD * xi
	if y < 1.2e-7 {
		return 0
	}
	kappa := s.cp / s.cv
	Z := 2 / (math.Pi * y) * ((1-1/kappa)*math.Atan(y) + y/kappa - (1 - math.Exp(-1/(1/y+y*y/(3*d*d)))))
	return tcLambda * d * s.cp / tcR * Tr / (mu * 1e6) * Z * 1e-3
}

// waterSurfaceTension is the vapour–liquid surface tension (N/m) at T (K),
// IAPWS R1-76(2014) Eq. 1.
func waterSurfaceTension(T float64) float64 {
	tau := 1 - T/waterTc
	return 235.8e-3 * math.Pow(tau, 1.256) * (1 - 0.625*tau)
}

// finiteSat reports whether every field of s is a finite number.
func finiteSat(s Sat) bool {
	for _, v := range satFields(&s) {
		if math.IsNaN(*v) || math.IsInf(*v, 0) {
			return false
		}
	}
	return true
}

// satFields lists pointers to every field of s, in declaration order.
func satFields(s *Sat) [14]*float64 {
	return [14]*float64{&s.T, &s.P, &s.RhoL, &s.RhoV, &s.HL, &s.HV, &s.Hlv,
		&s.CpL, &s.CpV, &s.MuL, &s.MuV, &s.KL, &s.KV, &s.Sigma}
}
