package correlate

import (
	"fmt"
	"math"
	"strings"
)

// VoidMethod selects a void-fraction correlation. The zero value is
// RouhaniAxelsson, the default.
type VoidMethod int

const (
	// RouhaniAxelsson is the Rouhani–Axelsson drift-flux method, choosing its
	// vertical or horizontal form from the tube's inclination (see
	// HorizontalCos).
	RouhaniAxelsson VoidMethod = iota
	// RouhaniAxelssonVertical is the drift-flux form for vertical and
	// inclined tubes: C0 = 1 + 0.2(1−x).
	RouhaniAxelssonVertical
	// RouhaniAxelssonHorizontal is the horizontal-tube variant:
	// C0 = 1 + 0.12(1−x).
	RouhaniAxelssonHorizontal
	// Homogeneous assumes no slip between the phases.
	Homogeneous
	// Zivi is the minimum-entropy-production slip ratio (ρl/ρv)^(1/3).
	Zivi
	// ChisholmSlip is Chisholm's slip ratio [1 − x(1 − ρl/ρv)]^½.
	ChisholmSlip
)

var voidNames = [...]string{
	RouhaniAxelsson:           "rouhani-axelsson",
	RouhaniAxelssonVertical:   "rouhani-axelsson-vertical",
	RouhaniAxelssonHorizontal: "rouhani-axelsson-horizontal",
	Homogeneous:               "homogeneous",
	Zivi:                      "zivi",
	ChisholmSlip:              "chisholm",
}

// String returns the method's name as written in loop files and flags.
func (m VoidMethod) String() string {
	if m >= 0 && int(m) < len(voidNames) {
		return voidNames[m]
	}
	return fmt.Sprintf("VoidMethod(%d)", int(m))
}

// VoidMethodNames lists the accepted void-fraction method names, default
// first.
func VoidMethodNames() []string { return append([]string(nil), voidNames[:]...) }

// ParseVoidMethod returns the method with the given name (see
// VoidMethodNames).
func ParseVoidMethod(s string) (VoidMethod, error) {
	for i, n := range voidNames {
		if s == n {
			return VoidMethod(i), nil
		}
	}
	return 0, fmt.Errorf("unknown void-fraction method %q (want one of %s)", s, strings.Join(voidNames[:], ", "))
}

// HorizontalCos is the largest |cos| of the angle between the tube axis and
// the body force for which RouhaniAxelsson uses its horizontal form: tubes
// within 5° of perpendicular to the body force count as horizontal. The
// 5° band is a choice of this package (common practice), not part of the
// published method.
const HorizontalCos = 0.08715574274765817 // cos 85°

// VoidFraction is the cross-section averaged vapour fraction α for quality
// x, mass flux G (kg/m²s), properties p, body-force magnitude accel (m/s²)
// and cosIncl, the cosine of the angle between the tube axis and the body
// force (its sign is ignored: downflow uses the upflow form). Only the
// drift-flux methods use G, accel and cosIncl; in zero body force or at
// G = 0 their drift term is dropped or dominates as the formula says
// (α → 0 as G → 0 for 0 < x < 1; with neither flow nor body force they
// fall back to no slip). The result lies in [0, 1]; x ≤ 0 gives 0
// and x ≥ 1 gives 1.
func VoidFraction(m VoidMethod, x, G float64, p Props, accel, cosIncl float64) float64 {
	pv := PrepareVoid(m, p, accel)
	return pv.At(x, G, cosIncl)
}

// PreparedVoid is a void-fraction method bound to one property set and
// body-force magnitude, with the parts that depend on neither quality nor
// flow computed once. The estimator prepares once per case and attitude and
// calls At per cell; the result equals VoidFraction exactly.
type PreparedVoid struct {
	m VoidMethod
	p Props
	// drift is [a σ (ρl−ρv)]^¼/ρl^½ of the drift-flux methods' V_gj, 0
	// without a body force or surface tension.
	drift float64
	zivi  float64 // Zivi's (ρv/ρl)^(2/3) factor's cube root (ρv/ρl)^(1/3)
}

// PrepareVoid binds m to properties p and body-force magnitude accel (see
// VoidFraction).
func PrepareVoid(m VoidMethod, p Props, accel float64) PreparedVoid {
	pv := PreparedVoid{m: m, p: p}
	pv.bind(&pv.p, accel)
	return pv
}

// VoidFractionAt is VoidFraction with the properties passed by reference,
// for marches whose properties change from cell to cell: preparing the
// method for each cell would copy them twice. The result is VoidFraction's.
func VoidFractionAt(m VoidMethod, x, G float64, p *Props, accel, cosIncl float64) float64 {
	if !(x > 0) {
		return 0
	}
	if x >= 1 {
		return 1
	}
	pv := PreparedVoid{m: m}
	pv.bind(p, accel)
	return pv.at(p, x, G, cosIncl)
}

// bind sets the parts of pv that depend on the properties p and the
// body-force magnitude accel.
func (pv *PreparedVoid) bind(p *Props, accel float64) {
	if !(p.RhoL > 0) || !(p.RhoV > 0) {
		return
	}
	switch pv.m {
	case Homogeneous, ChisholmSlip:
	case Zivi:
		pv.zivi = math.Cbrt(p.RhoV / p.RhoL)
	default:
		if d := math.Abs(accel) * p.Sigma * (p.RhoL - p.RhoV); d > 0 {
			pv.drift = math.Sqrt(math.Sqrt(d) / p.RhoL)
		}
	}
}

// At is the void fraction at quality x, mass flux G and cosIncl, the
// cosine of the angle between the tube axis and the body force.
func (pv *PreparedVoid) At(x, G, cosIncl float64) float64 {
	return pv.at(&pv.p, x, G, cosIncl)
}

// at is At with the properties pv was bound to at p.
func (pv *PreparedVoid) at(p *Props, x, G, cosIncl float64) float64 {
	if !(x > 0) {
		return 0
	}
	if x >= 1 {
		return 1
	}
	if !(p.RhoL > 0) || !(p.RhoV > 0) {
		return 0
	}
	m := pv.m
	var a float64
	switch m {
	case Homogeneous:
		a = 1 / (1 + (1-x)/x*(p.RhoV/p.RhoL))
	case Zivi:
		c := pv.zivi
		a = 1 / (1 + (1-x)/x*c*c)
	case ChisholmSlip:
		s := math.Sqrt(1 - x*(1-p.RhoL/p.RhoV))
		a = 1 / (1 + (1-x)/x*(p.RhoV/p.RhoL)*s)
	default:
		c := 0.2
		if m == RouhaniAxelssonHorizontal || (m == RouhaniAxelsson && math.Abs(cosIncl) < HorizontalCos) {
			c = 0.12
		}
		a = rouhaniAxelsson(x, G, p, pv.drift, c)
	}
	return clampQuality(a)
}

// rouhaniAxelsson is the Zuber–Findlay drift-flux void fraction with
// C0 = 1 + c(1−x) and V_gj = 1.18(1−x)[a σ (ρl−ρv)]^¼/ρl^½, written as
// α = G x/ρv / [C0 G (x/ρv + (1−x)/ρl) + V_gj] so that G = 0 is finite.
// drift is [a σ (ρl−ρv)]^¼/ρl^½ (see PrepareVoid).
func rouhaniAxelsson(x, G float64, p *Props, drift, c float64) float64 {
	G = math.Abs(G)
	var vgj float64
	if drift > 0 {
		vgj = 1.18 * (1 - x) * drift
	}
	num := G * x / p.RhoV
	den := (1+c*(1-x))*G*(x/p.RhoV+(1-x)/p.RhoL) + vgj
	if den == 0 {
		// No flow and no drift: fall back to no slip.
		return 1 / (1 + (1-x)/x*(p.RhoV/p.RhoL))
	}
	return num / den
}
