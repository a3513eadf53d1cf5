package correlate

import (
	"fmt"
	"math"
	"strings"
)

// CondensationMethod selects an in-tube forced-convection condensation
// coefficient. The zero value is CondShah1979.
type CondensationMethod int

const (
	// CondShah1979 is Shah (1979), [Shah1979].
	CondShah1979 CondensationMethod = iota
	// CondBoykoKruzhilin is Boyko & Kruzhilin (1967), [BoykoKruzhilin].
	CondBoykoKruzhilin
	// CondAkersDeansCrosser is Akers, Deans & Crosser (1959),
	// [AkersDeansCrosser].
	CondAkersDeansCrosser
	// CondCavalliniSmithZecchin is Cavallini, Smith & Zecchin (1974),
	// [CavalliniSmithZecchin].
	CondCavalliniSmithZecchin
)

var condNames = [...]string{
	CondShah1979:              "shah",
	CondBoykoKruzhilin:        "boyko-kruzhilin",
	CondAkersDeansCrosser:     "akers-deans-crosser",
	CondCavalliniSmithZecchin: "cavallini-smith-zecchin",
}

// String returns the method's name as written in flags (hyphens; loop
// files write underscores).
func (m CondensationMethod) String() string {
	if m >= 0 && int(m) < len(condNames) {
		return condNames[m]
	}
	return fmt.Sprintf("CondensationMethod(%d)", int(m))
}

// CondensationMethodNames lists the accepted names, default first.
func CondensationMethodNames() []string { return append([]string(nil), condNames[:]...) }

// ParseCondensationMethod returns the method with the given name (see
// CondensationMethodNames).
func ParseCondensationMethod(s string) (CondensationMethod, error) {
	for i, n := range condNames {
		if s == n {
			return CondensationMethod(i), nil
		}
	}
	return 0, fmt.Errorf("unknown condensation method %q (want %s)", s, strings.Join(condNames[:], ", "))
}

// Coefficient is the method's local coefficient, W/(m²K), at mass flux G
// (kg/m²s), quality x and inner diameter D (m).
func (m CondensationMethod) Coefficient(G, x, D float64, p Props) float64 {
	switch m {
	case CondBoykoKruzhilin:
		return BoykoKruzhilin(G, x, D, p)
	case CondAkersDeansCrosser:
		return AkersDeansCrosser(G, x, D, p)
	case CondCavalliniSmithZecchin:
		return CavalliniSmithZecchin(G, x, D, p)
	}
	return Shah1979(G, x, D, p)
}

// Mean is the method's coefficient averaged over the quality between xOut
// and xIn, W/(m²K): the mean over a tube whose quality falls linearly
// along it, as in a condenser of uniform heat flux. Boyko–Kruzhilin,
// Akers–Deans–Crosser and Cavallini–Smith–Zecchin are powers of a factor
// linear in x, so their means are exact (Akers–Deans–Crosser's split where
// Re_e crosses 5·10⁴); Shah's is integrated numerically.
func (m CondensationMethod) Mean(G, xIn, xOut, D float64, p Props) float64 {
	local := func(x float64) float64 { return m.Coefficient(G, x, D, p) }
	G = math.Abs(G)
	xIn, xOut = clampQuality(xIn), clampQuality(xOut)
	if xIn < xOut {
		xIn, xOut = xOut, xIn
	}
	if m == CondShah1979 || xIn == xOut || !liquidOK(G, D, p) || !(p.RhoV > 0) || !(p.RhoL > p.RhoV) {
		return qualityMean(local, xIn, xOut)
	}
	// The local coefficient is c·f(x)^n with f = 1 + s·x linear in x, whose
	// mean over [a, b] is c·[f^(n+1)]_a^b / ((n+1)·s·(b − a)).
	r := p.RhoL / p.RhoV
	mean := func(c, n, s, a, b float64) float64 {
		if !(s*(b-a) > 1e-9) {
			return c * math.Pow(1+s*(a+b)/2, n) * (b - a)
		}
		return c * (math.Pow(1+s*b, n+1) - math.Pow(1+s*a, n+1)) / ((n + 1) * s)
	}
	w := xIn - xOut
	prl := p.CpL * p.MuL / p.KL
	re := G * D / p.MuL
	switch m {
	case CondBoykoKruzhilin:
		c := 0.021 * p.KL / D * math.Pow(re, 0.8) * math.Pow(prl, 0.43)
		return finite(mean(c, 0.5, r-1, xOut, xIn) / w)
	case CondCavalliniSmithZecchin:
		c := 0.05 * math.Pow(re, 0.8) * math.Pow(prl, 0.33) * p.KL / D
		return finite(mean(c, 0.8, math.Sqrt(r)-1, xOut, xIn) / w)
	case CondAkersDeansCrosser:
		s := math.Sqrt(r) - 1
		k := math.Cbrt(prl) * p.KL / D
		lowC, highC := 5.03*math.Cbrt(re)*k, 0.0265*math.Pow(re, 0.8)*k
		// Re_e = re·(1 + s·x) passes 5·10⁴ at x = (5·10⁴/re − 1)/s.
		xs := math.Inf(1)
		if s > 0 {
			xs = (5e4/re - 1) / s
		}
		switch {
		case xs >= xIn:
			return finite(mean(lowC, 1.0/3, s, xOut, xIn) / w)
		case xs <= xOut:
			return finite(mean(highC, 0.8, s, xOut, xIn) / w)
		}
		return finite((mean(lowC, 1.0/3, s, xOut, xs) + mean(highC, 0.8, s, xs, xIn)) / w)
	}
	return qualityMean(local, xIn, xOut)
}

// MassFluxExponent is n where the coefficient is proportional to G^n at
// every quality; ok is false where no single power holds (Akers, Deans &
// Crosser change exponent at Re_e = 5·10⁴).
func (m CondensationMethod) MassFluxExponent() (n float64, ok bool) {
	if m == CondAkersDeansCrosser {
		return 0, false
	}
	return 0.8, true
}

// liquidOK reports whether p has the liquid properties the in-tube
// correlations read.
func liquidOK(G, D float64, p Props) bool {
	return G > 0 && D > 0 && p.MuL > 0 && p.KL > 0 && p.CpL > 0 && !math.IsInf(G, 0)
}

// BoykoKruzhilin is the in-tube condensation coefficient of Boyko &
// Kruzhilin (1967, Int. J. Heat Mass Transfer 10:361), W/(m²K), as given by
// Hewitt, Shires & Bott, Process Heat Transfer (1994):
// h = h_lo [1 + x(ρl/ρv − 1)]^½, h_lo = 0.021 (kl/D) Re_lo^0.8 Pr_l^0.43,
// Re_lo = G D/μl. It reads RhoL, RhoV, MuL, KL and CpL.
func BoykoKruzhilin(G, x, D float64, p Props) float64 {
	G = math.Abs(G)
	if !liquidOK(G, D, p) || !(p.RhoV > 0) || !(p.RhoL > p.RhoV) {
		return 0
	}
	x = clampQuality(x)
	prl := p.CpL * p.MuL / p.KL
	hlo := 0.021 * p.KL / D * math.Pow(G*D/p.MuL, 0.8) * math.Pow(prl, 0.43)
	return finite(hlo * math.Sqrt(1+x*(p.RhoL/p.RhoV-1)))
}

// equivalentRe is the Reynolds number of the equivalent liquid flow
// G[(1−x) + x(ρl/ρv)^½] D/μl of Akers, Deans & Crosser, which is also
// Cavallini, Smith & Zecchin's Re_eq = Re_v(μv/μl)(ρl/ρv)^½ + Re_l.
func equivalentRe(G, x, D float64, p Props) float64 {
	return G * ((1 - x) + x*math.Sqrt(p.RhoL/p.RhoV)) * D / p.MuL
}

// AkersDeansCrosser is the in-tube condensation coefficient of Akers, Deans
// & Crosser (1959, Chem. Eng. Prog. Symp. Ser. 55(29)), W/(m²K), as given
// by Kakaç, Boilers, Evaporators and Condensers (1991):
// Nu = C Re_e^n Pr_l^⅓ with C = 0.0265, n = 0.8 for Re_e > 5·10⁴ and
// C = 5.03, n = ⅓ below, Re_e the equivalent Reynolds number
// G[(1−x) + x(ρl/ρv)^½] D/μl. It reads RhoL, RhoV, MuL, KL and CpL.
func AkersDeansCrosser(G, x, D float64, p Props) float64 {
	G = math.Abs(G)
	if !liquidOK(G, D, p) || !(p.RhoV > 0) || !(p.RhoL > p.RhoV) {
		return 0
	}
	x = clampQuality(x)
	re := equivalentRe(G, x, D, p)
	c, n := 5.03, 1.0/3
	if re > 5e4 {
		c, n = 0.0265, 0.8
	}
	return finite(c * math.Pow(re, n) * math.Cbrt(p.CpL*p.MuL/p.KL) * p.KL / D)
}

// CavalliniSmithZecchin is the in-tube condensation coefficient of
// Cavallini, Smith & Zecchin (1974, Int. Heat Transfer Conf., Tokyo),
// W/(m²K), as given by Kakaç (1991): Nu = 0.05 Re_eq^0.8 Pr_l^0.33 with
// Re_eq = Re_v(μv/μl)(ρl/ρv)^½ + Re_l, which is G[(1−x) + x(ρl/ρv)^½] D/μl
// since Re_v = G x D/μv and Re_l = G(1−x) D/μl. It reads RhoL, RhoV, MuL,
// KL and CpL.
func CavalliniSmithZecchin(G, x, D float64, p Props) float64 {
	G = math.Abs(G)
	if !liquidOK(G, D, p) || !(p.RhoV > 0) || !(p.RhoL > p.RhoV) {
		return 0
	}
	x = clampQuality(x)
	re := equivalentRe(G, x, D, p)
	return finite(0.05 * math.Pow(re, 0.8) * math.Pow(p.CpL*p.MuL/p.KL, 0.33) * p.KL / D)
}
