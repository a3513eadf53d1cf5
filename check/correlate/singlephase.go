package correlate

import "math"

// SinglePhase is a Darcy friction factor as a function of the Reynolds
// number and the relative roughness e/D.
type SinglePhase func(re, relRough float64) float64

// Churchill is the Darcy friction factor of Churchill (1977), one explicit
// formula for laminar, transitional and turbulent flow:
// f = 8[(8/Re)¹² + (A+B)^−1.5]^(1/12),
// A = {2.457 ln[1/((7/Re)^0.9 + 0.27 e/D)]}¹⁶, B = (37530/Re)¹⁶.
// It is the default single-phase factor. Re ≤ 0 gives 0.
func Churchill(re, relRough float64) float64 {
	if !(re > 0) || math.IsInf(re, 1) {
		return 0
	}
	if relRough < 0 || relRough != relRough {
		relRough = 0
	}
	if re < 1 {
		// Creeping flow: the (8/Re)¹² term dominates by hundreds of orders
		// of magnitude and the formula reduces to 64/Re exactly.
		return finite(64 / re)
	}
	r8 := 8 / re
	r8 *= r8          // ^2
	r8 = r8 * r8 * r8 // ^6
	r8 *= r8          // ^12
	// ln[1/((7/Re)^0.9 + 0.27 e/D)], with Log and Exp in place of the
	// slower Pow; a smooth tube needs no Exp at all.
	l7 := math.Log(7 / re)
	var ln float64
	if relRough == 0 {
		ln = -0.9 * l7
	} else {
		ln = -math.Log(math.Exp(0.9*l7) + 0.27*relRough)
	}
	la := 2.457 * ln
	a := la * la // ^2
	a *= a       // ^4
	a *= a       // ^8
	a *= a       // ^16
	b := 37530 / re
	b *= b
	b *= b
	b *= b
	b *= b
	s := a + b
	t := r8 * s * math.Sqrt(s) // laminar term over turbulent term
	if u := b / a; u < 1e-4 && t < 1e-4 {
		// Turbulent: f = 8 s^(−1/8) (1+t)^(1/12) with
		// s^(−1/8) = la^−2 (1+u)^(−1/8); second-order binomial series are
		// exact to about 1e-12 here and avoid two dependent Log/Exp calls.
		cu := 1 - u/8 + 9.0/128*u*u
		ct := 1 + t/12 - 11.0/288*t*t
		return finite(8 / (la * la) * cu * ct)
	}
	return finite(8 * math.Exp(math.Log(r8+1/(s*math.Sqrt(s)))/12))
}

// Colebrook is the Darcy friction factor solving the Colebrook (1939)
// equation 1/√f = −2 log10[(e/D)/3.7 + 2.51/(Re √f)] by Newton iteration,
// for turbulent flow. Below Re = 2300 it returns the laminar 64/Re, so it
// jumps at 2300 where Churchill is continuous. Re ≤ 0 gives 0.
func Colebrook(re, relRough float64) float64 {
	if !(re > 0) || math.IsInf(re, 1) {
		return 0
	}
	if re < 2300 {
		return 64 / re
	}
	if relRough < 0 || relRough != relRough {
		relRough = 0
	}
	a := relRough / 3.7
	b := 2.51 / re
	// Start from the Swamee–Jain explicit approximation, then solve
	// F(y) = y + 2 log10(a + b y) = 0 for y = 1/√f.
	y := math.Abs(-2 * math.Log10(a+5.74/math.Pow(re, 0.9)))
	const k = 2 / math.Ln10
	for range 50 {
		u := a + b*y
		fy := y + k*math.Log(u)
		dy := fy / (1 + k*b/u)
		y -= dy
		if math.Abs(dy) < 1e-13*y {
			break
		}
	}
	return finite(1 / (y * y))
}

// BlasiusLaminar is 0.184 Re^−0.2 for turbulent flow and 64/Re below
// Re = 2000, the smooth-tube pair the Lockhart–Martinelli method was
// written with. It ignores roughness. Re ≤ 0 gives 0.
func BlasiusLaminar(re, _ float64) float64 {
	if !(re > 0) || math.IsInf(re, 1) {
		return 0
	}
	if re < 2000 {
		return 64 / re
	}
	return 0.184 * math.Pow(re, -0.2)
}

// SinglePhaseGradient is the frictional pressure gradient f G²/(2 D ρ),
// Pa/m, of one phase of density rho and viscosity mu flowing alone at mass
// flux G in a tube of diameter D, with Darcy factor f = sp(G D/μ, e/D).
// A nil sp means Churchill. The result is positive and depends on |G|.
func SinglePhaseGradient(sp SinglePhase, G, D, relRough, rho, mu float64) float64 {
	if sp == nil {
		sp = Churchill
	}
	if G == 0 || !(D > 0) || !(rho > 0) || !(mu > 0) {
		return 0
	}
	aG := math.Abs(G)
	re := aG * D / mu
	var dp float64
	if re < 1e-3 {
		// Creeping flow: every factor is 64/Re; write the product out so
		// f·G² stays finite as Re → 0.
		dp = 32 * mu * aG / (D * D * rho)
	} else {
		dp = sp(re, relRough) * aG * aG / (2 * D * rho)
	}
	return finite(dp)
}
