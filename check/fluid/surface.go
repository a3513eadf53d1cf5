package fluid

import "math"

// mulero is a surface-tension correlation σ = Σ aᵢ (1 − T/Tc)^nᵢ in N/m, the
// form of A. Mulero, I. Cachadiña, M.I. Parra, "Recommended correlations for
// the surface tension of common fluids", J. Phys. Chem. Ref. Data 41 (2012)
// 043105 (and its 2014 sequel for further fluids). Tc is the correlation's
// own critical temperature.
type mulero struct {
	Tc   float64
	a, n []float64
}

// at returns σ(T); zero at and above the correlation's critical temperature.
func (m mulero) at(T float64) float64 {
	x := 1 - T/m.Tc
	if x <= 0 {
		return 0
	}
	s := 0.0
	for i, a := range m.a {
		s += a * math.Pow(x, m.n[i])
	}
	return math.Max(s, 0)
}
