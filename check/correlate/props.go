package correlate

import (
	"errors"
	"fmt"
	"math"
)

// Props are the saturated phase properties a correlation needs, in SI.
// Each correlation reads only the fields it uses.
type Props struct {
	RhoL, RhoV float64 // liquid and vapour density, kg/m³
	MuL, MuV   float64 // liquid and vapour dynamic viscosity, Pa·s
	Sigma      float64 // surface tension, N/m
	KL         float64 // liquid thermal conductivity, W/(m·K)
	CpL        float64 // liquid isobaric specific heat, J/(kg·K)
	Hlv        float64 // latent heat of vaporisation, J/kg
	// ReducedPressure is p/pc, dimensionless (0 < p/pc < 1).
	ReducedPressure float64
	// MolarMass is in kg/mol.
	MolarMass float64
}

// Validate reports the first property that is not a positive finite number
// or that breaks rhoL > rhoV and 0 < p/pc < 1. Zero fields are allowed (a
// correlation that needs them then returns 0) except the densities.
func (p Props) Validate() error {
	fields := []struct {
		name string
		v    float64
	}{
		{"liquid density", p.RhoL}, {"vapour density", p.RhoV},
		{"liquid viscosity", p.MuL}, {"vapour viscosity", p.MuV},
		{"surface tension", p.Sigma}, {"liquid conductivity", p.KL},
		{"liquid specific heat", p.CpL}, {"latent heat", p.Hlv},
		{"reduced pressure", p.ReducedPressure}, {"molar mass", p.MolarMass},
	}
	for _, f := range fields {
		if math.IsNaN(f.v) || math.IsInf(f.v, 0) || f.v < 0 {
			return fmt.Errorf("correlate: %s %g is not a non-negative finite number", f.name, f.v)
		}
	}
	if p.RhoL <= 0 || p.RhoV <= 0 {
		return errors.New("correlate: phase densities must be positive")
	}
	if p.RhoL <= p.RhoV {
		return fmt.Errorf("correlate: liquid density %g kg/m³ must exceed vapour density %g kg/m³", p.RhoL, p.RhoV)
	}
	if p.ReducedPressure >= 1 {
		return fmt.Errorf("correlate: reduced pressure %g must be below 1", p.ReducedPressure)
	}
	return nil
}

// finite maps NaN to 0 and ±Inf to ±MaxFloat64 so no exported function
// leaks a non-finite value.
func finite(v float64) float64 {
	switch {
	case v != v:
		return 0
	case v > math.MaxFloat64:
		return math.MaxFloat64
	case v < -math.MaxFloat64:
		return -math.MaxFloat64
	}
	return v
}

// clampQuality maps quality into [0, 1]; NaN becomes 0.
func clampQuality(x float64) float64 {
	if !(x > 0) {
		return 0
	}
	if x > 1 {
		return 1
	}
	return x
}

// HomogeneousDensity is the no-slip mixture density [x/ρv + (1−x)/ρl]⁻¹,
// kg/m³, the density for local losses and homogeneous friction.
func HomogeneousDensity(x float64, p Props) float64 {
	x = clampQuality(x)
	return finite(1 / (x/p.RhoV + (1-x)/p.RhoL))
}

// MixtureDensity is the in-situ density αρv + (1−α)ρl, kg/m³, the density
// for the hydrostatic head.
func MixtureDensity(alpha float64, p Props) float64 {
	alpha = clampQuality(alpha)
	return finite(alpha*p.RhoV + (1-alpha)*p.RhoL)
}

// AccelerationTerm is the momentum flux G²[x²/(ρv α) + (1−x)²/(ρl (1−α))],
// Pa; the accelerational pressure drop of a cell is its outlet value minus
// its inlet value. x ≤ 0 gives G²/ρl and x ≥ 1 gives G²/ρv whatever α is.
// For 0 < x < 1, α should come from VoidFraction; α = 0 or 1 there means
// one phase moves infinitely fast and the result is clamped to
// math.MaxFloat64.
func AccelerationTerm(G, x, alpha float64, p Props) float64 {
	if G == 0 || G != G {
		return 0
	}
	if !(x > 0) {
		return finite(G * G / p.RhoL)
	}
	if x >= 1 {
		return finite(G * G / p.RhoV)
	}
	alpha = clampQuality(alpha)
	return finite(G * G * (x*x/(p.RhoV*alpha) + (1-x)*(1-x)/(p.RhoL*(1-alpha))))
}
