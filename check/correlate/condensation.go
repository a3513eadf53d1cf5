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
