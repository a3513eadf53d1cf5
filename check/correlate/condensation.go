package correlate

import "math"

// Shah1979 is the in-tube film condensation coefficient of Shah (1979),
// W/(m²K): h = h_lo [(1−x)^0.8 + 3.8 x^0.76 (1−x)^0.04 / pr^0.38], with the
// liquid-only Dittus–Boelter h_lo = 0.023 Re_lo^0.8 Pr_l^0.4 k_l/D,
// Re_lo = G D/μl. It reads MuL, KL, CpL and ReducedPressure from p. G is
// the mass flux (kg/m²s), x the quality, D the inner diameter (m). Shah's
// data span roughly 0.002 < pr < 0.44 and Re_lo > 350.
func Shah1979(G, x, D float64, p Props) float64 {
	G = math.Abs(G)
	if G == 0 || !(D > 0) || !(p.MuL > 0) || !(p.KL > 0) || !(p.CpL > 0) ||
		!(p.ReducedPressure > 0 && p.ReducedPressure < 1) {
		return 0
	}
	x = clampQuality(x)
	re := G * D / p.MuL
	prl := p.CpL * p.MuL / p.KL
	hlo := 0.023 * math.Pow(re, 0.8) * math.Pow(prl, 0.4) * p.KL / D
	return finite(hlo * (math.Pow(1-x, 0.8) + 3.8*math.Pow(x, 0.76)*math.Pow(1-x, 0.04)/math.Pow(p.ReducedPressure, 0.38)))
}

// FilmVertical is the mean coefficient of laminar film condensation on a
// vertical surface of height L (m) of Nusselt (1916), W/(m²K):
// h = (2√2/3) [ρl (ρl−ρv) a kl³ h'lv / (μl L ΔT)]^¼ (2√2/3 ≈ 0.943), with the latent heat
// corrected for subcooling of the film, h'lv = hlv + 0.68 cpl ΔT
// (Rohsenow 1956). a is the body force along the surface (m/s²) and
// dT = Tsat − Twall (K). It reads RhoL, RhoV, KL, MuL, CpL and Hlv.
func FilmVertical(L, a, dT float64, p Props) float64 {
	if !(L > 0) {
		return 0
	}
	return filmCoef(2*math.Sqrt2/3, L, a, dT, 0.68, p)
}

// FilmHorizontalTube is the mean coefficient of stratified film
// condensation inside a horizontal tube of inner diameter D (m) at low
// vapour velocity of Chato (1962), W/(m²K):
// h = 0.555 [ρl (ρl−ρv) a kl³ h'lv / (μl D ΔT)]^¼, h'lv = hlv + 3/8 cpl ΔT.
// a is the body force across the tube (m/s²), dT = Tsat − Twall (K).
func FilmHorizontalTube(D, a, dT float64, p Props) float64 {
	if !(D > 0) {
		return 0
	}
	return filmCoef(0.555, D, a, dT, 0.375, p)
}

func filmCoef(c, length, a, dT, sub float64, p Props) float64 {
	a = math.Abs(a)
	if !(a > 0) || !(dT > 0) || !(p.RhoL > p.RhoV) || !(p.KL > 0) || !(p.MuL > 0) || !(p.Hlv > 0) {
		return 0
	}
	h := p.Hlv + sub*math.Max(p.CpL, 0)*dT
	return finite(c * math.Sqrt(math.Sqrt(p.RhoL*(p.RhoL-p.RhoV)*a*p.KL*p.KL*p.KL*h/(p.MuL*length*dT))))
}

// Shah1979Mean is Shah's (1979) coefficient averaged over the quality
// between xOut and xIn (0 ≤ xOut < xIn ≤ 1), W/(m²K): the mean over a tube
// whose quality falls linearly along it, as in a condenser of uniform heat
// flux (see [CondensationMethod.Mean]).
func Shah1979Mean(G, xIn, xOut, D float64, p Props) float64 {
	return CondShah1979.Mean(G, xIn, xOut, D, p)
}

// qualityMean averages h(x) over x between xOut and xIn. The in-tube
// coefficients are steep in x and 1−x at both ends, so it integrates by
// Simpson's rule on 32 intervals after the substitution
// x = xOut + (xIn − xOut)(3u² − 2u³), which flattens both ends.
func qualityMean(h func(x float64) float64, xIn, xOut float64) float64 {
	xIn, xOut = clampQuality(xIn), clampQuality(xOut)
	if xIn < xOut {
		xIn, xOut = xOut, xIn
	}
	if xIn == xOut {
		return h(xIn)
	}
	const n = 32
	w := xIn - xOut
	f := func(u float64) float64 {
		return h(xOut+w*u*u*(3-2*u)) * 6 * u * (1 - u)
	}
	sum := f(0) + f(1)
	for i := 1; i < n; i++ {
		k := 2.0
		if i%2 == 1 {
			k = 4
		}
		sum += k * f(float64(i)/n)
	}
	return finite(sum / (3 * n))
}
