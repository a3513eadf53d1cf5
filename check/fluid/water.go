package fluid

import (
	"fmt"
	"math"
)

// Water is answered from the IAPWS industrial formulation IF97 for the
// saturation line (region 4) and the saturated phases (region 1 for the
// liquid, region 2 for the vapour), with the IAPWS 2008 viscosity and 2011
// thermal conductivity correlations evaluated at the IF97 saturated densities,
// and the IAPWS 2014 surface tension.
//
// The viscosity omits its critical enhancement (μ₂ = 1) and the thermal
// conductivity its critical term (λ₂ = 0), the industrial simplification both
// releases allow away from the critical point. The range ends at 623.15 K,
// where IF97 regions 1 and 2 stop meeting the saturation line (region 3 takes
// over up to the critical point).
type water struct{}

func init() { register(water{}) }

const (
	waterR    = 461.526 // specific gas constant of IF97, J/(kg·K)
	waterTc   = 647.096 // K
	waterPc   = 22.064e6
	waterRhoc = 322.0
	waterTmin = 273.16 // triple point, K
	waterTmax = 623.15 // boundary of IF97 regions 1/2 with region 3, K
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
		Source: "IAPWS R7-97(2012) IF97 regions 1, 2 and 4; IAPWS R12-08 viscosity without critical enhancement; " +
			"IAPWS R15-11 thermal conductivity without critical enhancement; IAPWS R1-76(2014) surface tension",
	}
}

func (w water) Direct(T float64) (Sat, error) {
	if !(T >= waterTmin && T <= waterTmax) {
		return Sat{}, &RangeError{Fluid: "water", Quantity: "temperature", Value: T, Min: waterTmin, Max: waterTmax, Unit: "K"}
	}
	p := if97Psat(T)
	vl, hl, cpl := if97Region1(T, p)
	vv, hv, cpv := if97Region2(T, p)
	rl, rv := 1/vl, 1/vv
	s := Sat{
		T: T, P: p,
		RhoL: rl, RhoV: rv,
		HL: hl, HV: hv, Hlv: hv - hl,
		CpL: cpl, CpV: cpv,
		MuL: waterViscosity(rl, T), MuV: waterViscosity(rv, T),
		KL: waterConductivity(rl, T), KV: waterConductivity(rv, T),
		Sigma: waterSurfaceTension(T),
	}
	if !finiteSat(s) {
		return Sat{}, fmt.Errorf("water: no finite saturated state at %g K", T)
	}
	return s, nil
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

// if97Region1 returns specific volume (m³/kg), enthalpy (J/kg) and isobaric
// heat capacity (J/(kg·K)) of the liquid at T (K), p (Pa), IF97 Eq. 7 and Table 3.
func if97Region1(T, p float64) (v, h, cp float64) {
	pi, tau := p/16.53e6, 1386.0/T
	a, b := 7.1-pi, tau-1.222
	var gp, gt, gtt float64
	for k := range if97n1 {
		I, J, n := if97I1[k], if97J1[k], if97n1[k]
		aI := ipow(a, I)
		bJ := ipow(b, J)
		if I > 0 {
			gp -= n * float64(I) * aI / a * bJ
		}
		gt += n * float64(J) * aI * bJ / b
		gtt += n * float64(J*(J-1)) * aI * bJ / (b * b)
	}
	v = pi * gp * waterR * T / p
	h = tau * gt * waterR * T
	cp = -tau * tau * gtt * waterR
	return v, h, cp
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

// if97Region2 returns specific volume (m³/kg), enthalpy (J/kg) and isobaric
// heat capacity (J/(kg·K)) of the vapour at T (K), p (Pa), IF97 Eq. 15 and Table 12.
func if97Region2(T, p float64) (v, h, cp float64) {
	pi, tau := p/1e6, 540.0/T
	var g0t, g0tt float64
	for k := range if97n0 {
		J, n := if97J0[k], if97n0[k]
		tJ := ipow(tau, J)
		g0t += n * float64(J) * tJ / tau
		g0tt += n * float64(J*(J-1)) * tJ / (tau * tau)
	}
	b := tau - 0.5
	var grp, grt, grtt float64
	for k := range if97n2 {
		I, J, n := if97I2[k], if97J2[k], if97n2[k]
		pI := ipow(pi, I)
		bJ := ipow(b, J)
		grp += n * float64(I) * pI / pi * bJ
		if J > 0 {
			grt += n * pI * float64(J) * bJ / b
			grtt += n * pI * float64(J*(J-1)) * bJ / (b * b)
		}
	}
	v = pi * (1/pi + grp) * waterR * T / p
	h = tau * (g0t + grt) * waterR * T
	cp = -tau * tau * (g0tt + grtt) * waterR
	return v, h, cp
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
