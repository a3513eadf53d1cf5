package correlate

import (
	"fmt"
	"math"
	"strings"
)

// FrictionMethod selects a two-phase frictional pressure-gradient method.
// The zero value is MullerSteinhagenHeck, the default.
type FrictionMethod int

const (
	// MullerSteinhagenHeck interpolates between the liquid-only and
	// vapour-only gradients: Λ(1−x)^(1/3) + B x³, Λ = A + 2(B−A)x.
	MullerSteinhagenHeck FrictionMethod = iota
	// Friedel is the liquid-only two-phase multiplier of Friedel (1979),
	// recommended for μl/μv < 1000.
	Friedel
	// LockhartMartinelliChisholm is φl² = 1 + C/X + 1/X² on the liquid-alone
	// gradient, C = 20, 12, 10 or 5 by the phases' flow regimes (each phase
	// turbulent above Re = 2000). The original used the Blasius pair
	// (BlasiusLaminar) for the phase gradients; like every method here it
	// uses the Friction's SinglePhase factor, Churchill by default.
	LockhartMartinelliChisholm
	// HomogeneousMcAdams is the homogeneous model with 1/μ = x/μv + (1−x)/μl.
	HomogeneousMcAdams
	// HomogeneousCicchitti is the homogeneous model with μ = xμv + (1−x)μl.
	HomogeneousCicchitti
	// HomogeneousDukler is the homogeneous model with μ = βμv + (1−β)μl, β
	// the homogeneous void fraction.
	HomogeneousDukler
)

var frictionNames = [...]string{
	MullerSteinhagenHeck:       "muller-steinhagen-heck",
	Friedel:                    "friedel",
	LockhartMartinelliChisholm: "lockhart-martinelli",
	HomogeneousMcAdams:         "homogeneous-mcadams",
	HomogeneousCicchitti:       "homogeneous-cicchitti",
	HomogeneousDukler:          "homogeneous-dukler",
}

// String returns the method's name as written in loop files and flags.
func (m FrictionMethod) String() string {
	if m >= 0 && int(m) < len(frictionNames) {
		return frictionNames[m]
	}
	return fmt.Sprintf("FrictionMethod(%d)", int(m))
}

// FrictionMethodNames lists the accepted friction method names, default
// first.
func FrictionMethodNames() []string { return append([]string(nil), frictionNames[:]...) }

// ParseFrictionMethod returns the method with the given name (see
// FrictionMethodNames).
func ParseFrictionMethod(s string) (FrictionMethod, error) {
	for i, n := range frictionNames {
		if s == n {
			return FrictionMethod(i), nil
		}
	}
	return 0, fmt.Errorf("unknown friction method %q (want one of %s)", s, strings.Join(frictionNames[:], ", "))
}

// FriedelFroudeExponent is the exponent of the homogeneous Froude number in
// Friedel's multiplier. Secondary sources print 0.045 or 0.0454; this
// package uses 0.0454.
const FriedelFroudeExponent = 0.0454

// lmReynoldsCritical is the Reynolds number separating laminar and
// turbulent phases when choosing the Chisholm constant.
const lmReynoldsCritical = 2000

// Friction is a two-phase friction method together with the single-phase
// Darcy factor it uses for the liquid-alone, vapour-alone or homogeneous
// flows. A nil SinglePhase means Churchill.
type Friction struct {
	Method      FrictionMethod
	SinglePhase SinglePhase
}

// FrictionGradient is Friction{Method: m}.Gradient: the method m with the
// Churchill single-phase factor.
func FrictionGradient(m FrictionMethod, G, x, D, relRough float64, p Props, g float64) float64 {
	return Friction{Method: m}.Gradient(G, x, D, relRough, p, g)
}

// Gradient is the two-phase frictional pressure gradient, Pa/m (positive),
// at mass flux G (kg/m²s, its sign ignored) and quality x in a tube of
// diameter D and relative roughness e/D. g is the body-force magnitude
// (m/s²), used only by Friedel's Froude number. x ≤ 0 gives the
// single-phase liquid gradient and x ≥ 1 the single-phase vapour gradient,
// and every method tends to those limits continuously.
func (f Friction) Gradient(G, x, D, relRough float64, p Props, g float64) float64 {
	pf := f.Prepare(G, D, relRough, p, g)
	return pf.Gradient(x)
}

// PreparedFriction is a friction method bound to one tube, mass flux,
// property set and body force, with the parts that do not depend on
// quality computed once. The estimator prepares once per component and
// calls Gradient per cell; the result equals Friction.Gradient exactly.
type PreparedFriction struct {
	method   FrictionMethod
	sp       SinglePhase
	G, D, rr float64
	p        Props
	zero     bool // no flow or unusable inputs: gradient 0
	// Liquid-only and vapour-only gradients, Pa/m, for the methods built on
	// them (Müller-Steinhagen & Heck, Friedel).
	dpLo, dpGo float64
	// Friedel: E ratio ρl f_go/(ρv f_lo); ln(3.24 H); ln(G²/(gD)); ln(G²D/σ);
	// whether the Fr–We term applies.
	eRatio, lnH, lnFr0, lnWe0 float64
	friedelTerm               bool
}

// Prepare binds f to one tube (D, e/D), mass flux G, properties p and
// body-force magnitude g; see Gradient for the meaning of each.
func (f Friction) Prepare(G, D, relRough float64, p Props, g float64) PreparedFriction {
	sp := f.SinglePhase
	if sp == nil {
		sp = Churchill
	}
	G = math.Abs(G)
	pf := PreparedFriction{method: f.Method, sp: sp, G: G, D: D, rr: relRough, p: p}
	if G == 0 || G != G || !(D > 0) || !(p.RhoL > 0) || !(p.RhoV > 0) || !(p.MuL > 0) || !(p.MuV > 0) {
		pf.zero = true
		return pf
	}
	if f.Method != MullerSteinhagenHeck && f.Method != Friedel {
		// The other methods need the single-phase gradients only at x ≤ 0
		// or x ≥ 1; Gradient computes them there.
		return pf
	}
	pf.dpLo = SinglePhaseGradient(sp, G, D, relRough, p.RhoL, p.MuL)
	pf.dpGo = SinglePhaseGradient(sp, G, D, relRough, p.RhoV, p.MuV)
	if f.Method == Friedel {
		// f_go/f_lo from the gradients: dp = f G²/(2Dρ).
		if pf.dpLo > 0 {
			pf.eRatio = pf.dpGo / pf.dpLo
		}
		mr := p.MuV / p.MuL
		h := math.Pow(p.RhoL/p.RhoV, 0.91) * math.Pow(mr, 0.19) * math.Pow(math.Max(1-mr, 0), 0.7)
		g = math.Abs(g)
		if h > 0 && g > 0 && p.Sigma > 0 && !math.IsInf(g, 0) {
			pf.friedelTerm = true
			pf.lnH = math.Log(3.24 * h)
			pf.lnFr0 = math.Log(G * G / (g * D))
			pf.lnWe0 = math.Log(G * G * D / p.Sigma)
		}
	}
	return pf
}

// Gradient is the frictional pressure gradient, Pa/m, at quality x.
func (pf *PreparedFriction) Gradient(x float64) float64 {
	if pf.zero {
		return 0
	}
	p := &pf.p
	if !(x > 0) || x >= 1 {
		if pf.method == MullerSteinhagenHeck || pf.method == Friedel {
			if x >= 1 {
				return pf.dpGo
			}
			return pf.dpLo
		}
		if x >= 1 {
			return SinglePhaseGradient(pf.sp, pf.G, pf.D, pf.rr, p.RhoV, p.MuV)
		}
		return SinglePhaseGradient(pf.sp, pf.G, pf.D, pf.rr, p.RhoL, p.MuL)
	}
	var dp float64
	switch pf.method {
	case Friedel:
		dp = pf.friedel(x)
	case LockhartMartinelliChisholm:
		dp = lockhartMartinelli(pf.sp, pf.G, x, pf.D, pf.rr, p)
	case HomogeneousMcAdams, HomogeneousCicchitti, HomogeneousDukler:
		var mu float64
		switch pf.method {
		case HomogeneousMcAdams:
			mu = 1 / (x/p.MuV + (1-x)/p.MuL)
		case HomogeneousCicchitti:
			mu = x*p.MuV + (1-x)*p.MuL
		default:
			b := 1 / (1 + (1-x)/x*(p.RhoV/p.RhoL))
			mu = b*p.MuV + (1-b)*p.MuL
		}
		dp = SinglePhaseGradient(pf.sp, pf.G, pf.D, pf.rr, 1/(x/p.RhoV+(1-x)/p.RhoL), mu)
	default:
		return MullerSteinhagenHeckGradient(pf.dpLo, pf.dpGo, x)
	}
	return finite(dp)
}

// MullerSteinhagenHeckGradient is Müller-Steinhagen & Heck's frictional
// gradient at quality 0 < x < 1 from the liquid-only and vapour-only
// gradients dpLo and dpGo, Pa/m: Λ(1−x)^(1/3) + dpGo·x³, Λ = dpLo +
// 2(dpGo−dpLo)x. It is what a PreparedFriction of that method gives.
func MullerSteinhagenHeckGradient(dpLo, dpGo, x float64) float64 {
	lambda := dpLo + 2*(dpGo-dpLo)*x
	return finite(lambda*math.Cbrt(1-x) + dpGo*x*x*x)
}

// SinglePhaseGradients are the liquid-only and vapour-only gradients, Pa/m,
// that Müller-Steinhagen & Heck and Friedel were prepared with (0 for the
// other methods and for no flow).
func (pf *PreparedFriction) SinglePhaseGradients() (dpLo, dpGo float64) {
	if pf.zero {
		return 0, 0
	}
	return pf.dpLo, pf.dpGo
}

// friedel is φlo² (dp/dz)lo with
// φlo² = E + 3.24 F H/(Fr^0.0454 We^0.035),
// E = (1−x)² + x² ρl f_go/(ρv f_lo), F = x^0.78 (1−x)^0.224,
// H = (ρl/ρv)^0.91 (μv/μl)^0.19 (1 − μv/μl)^0.7,
// Fr = G²/(g D ρH²), We = G² D/(σ ρH). A zero body force or surface
// tension drops the second term. The powers of the second term are summed
// as logarithms under one Exp.
func (pf *PreparedFriction) friedel(x float64) float64 {
	p := &pf.p
	e := (1-x)*(1-x) + x*x*pf.eRatio
	if !pf.friedelTerm {
		return e * pf.dpLo
	}
	lnRh := -math.Log(x/p.RhoV + (1-x)/p.RhoL)
	lnFr := pf.lnFr0 - 2*lnRh
	lnWe := pf.lnWe0 - lnRh
	corr := math.Exp(pf.lnH + 0.78*math.Log(x) + 0.224*math.Log(1-x) -
		FriedelFroudeExponent*lnFr - 0.035*lnWe)
	return (e + corr) * pf.dpLo
}

// lockhartMartinelli is φl²(dp/dz)l = (dp/dz)l + C √((dp/dz)l (dp/dz)v) +
// (dp/dz)v, Chisholm's φl² = 1 + C/X + 1/X² multiplied out so that either
// phase may vanish.
func lockhartMartinelli(sp SinglePhase, G, x, D, rr float64, p *Props) float64 {
	gl, gv := G*(1-x), G*x
	turbL := gl*D/p.MuL >= lmReynoldsCritical
	turbV := gv*D/p.MuV >= lmReynoldsCritical
	var c float64
	switch {
	case turbL && turbV:
		c = 20
	case !turbL && turbV:
		c = 12
	case turbL && !turbV:
		c = 10
	default:
		c = 5
	}
	dl := SinglePhaseGradient(sp, gl, D, rr, p.RhoL, p.MuL)
	dv := SinglePhaseGradient(sp, gv, D, rr, p.RhoV, p.MuV)
	return dl + c*math.Sqrt(dl*dv) + dv
}
