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
	// Friedel is the liquid-only two-phase multiplier of Friedel (1979).
	Friedel
	// LockhartMartinelliChisholm is φl² = 1 + C/X + 1/X² on the liquid-alone
	// gradient, C = 20, 12, 10 or 5 by the phases' flow regimes.
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
	sp := f.SinglePhase
	if sp == nil {
		sp = Churchill
	}
	G = math.Abs(G)
	if G == 0 || !(D > 0) || !(p.RhoL > 0) || !(p.RhoV > 0) || !(p.MuL > 0) || !(p.MuV > 0) {
		return 0
	}
	if !(x > 0) {
		return SinglePhaseGradient(sp, G, D, relRough, p.RhoL, p.MuL)
	}
	if x >= 1 {
		return SinglePhaseGradient(sp, G, D, relRough, p.RhoV, p.MuV)
	}
	var dp float64
	switch f.Method {
	case Friedel:
		dp = friedel(sp, G, x, D, relRough, p, g)
	case LockhartMartinelliChisholm:
		dp = lockhartMartinelli(sp, G, x, D, relRough, p)
	case HomogeneousMcAdams, HomogeneousCicchitti, HomogeneousDukler:
		var mu float64
		switch f.Method {
		case HomogeneousMcAdams:
			mu = 1 / (x/p.MuV + (1-x)/p.MuL)
		case HomogeneousCicchitti:
			mu = x*p.MuV + (1-x)*p.MuL
		default:
			b := 1 / (1 + (1-x)/x*(p.RhoV/p.RhoL))
			mu = b*p.MuV + (1-b)*p.MuL
		}
		dp = SinglePhaseGradient(sp, G, D, relRough, HomogeneousDensity(x, p), mu)
	default:
		a := SinglePhaseGradient(sp, G, D, relRough, p.RhoL, p.MuL)
		b := SinglePhaseGradient(sp, G, D, relRough, p.RhoV, p.MuV)
		lambda := a + 2*(b-a)*x
		dp = lambda*math.Cbrt(1-x) + b*x*x*x
	}
	return finite(dp)
}

// friedel is φlo² (dp/dz)lo with
// φlo² = E + 3.24 F H/(Fr^0.0454 We^0.035),
// E = (1−x)² + x² ρl f_go/(ρv f_lo), F = x^0.78 (1−x)^0.224,
// H = (ρl/ρv)^0.91 (μv/μl)^0.19 (1 − μv/μl)^0.7.
func friedel(sp SinglePhase, G, x, D, rr float64, p Props, g float64) float64 {
	reLo := G * D / p.MuL
	reGo := G * D / p.MuV
	fLo := sp(reLo, rr)
	fGo := sp(reGo, rr)
	dpLo := SinglePhaseGradient(sp, G, D, rr, p.RhoL, p.MuL)
	if !(fLo > 0) || !(fGo > 0) {
		return dpLo
	}
	e := (1-x)*(1-x) + x*x*(p.RhoL*fGo)/(p.RhoV*fLo)
	ff := math.Pow(x, 0.78) * math.Pow(1-x, 0.224)
	mr := p.MuV / p.MuL
	h := math.Pow(p.RhoL/p.RhoV, 0.91) * math.Pow(mr, 0.19) * math.Pow(math.Max(1-mr, 0), 0.7)
	rh := HomogeneousDensity(x, p)
	g = math.Abs(g)
	// Fr^0.0454 We^0.035 with Fr = G²/(g D ρH²), We = G² D/(σ ρH); a zero
	// body force or surface tension drops the second term.
	var corr float64
	if g > 0 && p.Sigma > 0 {
		fr := G * G / (g * D * rh * rh)
		we := G * G * D / (p.Sigma * rh)
		corr = 3.24 * ff * h / (math.Pow(fr, FriedelFroudeExponent) * math.Pow(we, 0.035))
	}
	return (e + corr) * dpLo
}

// lockhartMartinelli is φl²(dp/dz)l = (dp/dz)l + C √((dp/dz)l (dp/dz)v) +
// (dp/dz)v, Chisholm's φl² = 1 + C/X + 1/X² multiplied out so that either
// phase may vanish.
func lockhartMartinelli(sp SinglePhase, G, x, D, rr float64, p Props) float64 {
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
