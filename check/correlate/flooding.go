package correlate

import "math"

// Wallis constants for WallisFraction (from memory): m ≈ 1; C ≈ 0.725 for
// sharp-edged tube ends, 0.88–1.0 for smooth or rounded ends.
const (
	WallisM          = 1.0
	WallisCSharpEdge = 0.725
)

// KutateladzeCK is the constant of the large-diameter Kutateladze flooding
// form, ≈ 1.79 ≈ √3.2: with no liquid flow a tube floods at a vapour
// Kutateladze number of about 3.2 (Pushkina & Sorokin 1969). Both are from
// memory; no printed form of the constant was found in the open sources
// and general-purpose libraries searched (the fluids and ht libraries state
// no flooding correlation).
const KutateladzeCK = 1.79

// WallisFraction is the fraction of the Wallis (1969) counter-current
// flooding limit in use, (√jg* + m √jf*)/C, where
// jk* = |jk| ρk^½ [a D (ρl−ρv)]^−½ are the dimensionless superficial
// velocities of vapour (jg) and liquid (jf), m/s, in a tube of diameter D
// with body-force magnitude accel along it. A value ≥ 1 means flooding.
// With no body force there is no gravity-driven counter-current flow and
// the result is 0.
func WallisFraction(jg, jf, rhoL, rhoV, D, accel, m, C float64) float64 {
	d := math.Abs(accel) * D * (rhoL - rhoV)
	if !(d > 0) || !(C > 0) || !(rhoV > 0) {
		return 0
	}
	sd := math.Sqrt(d)
	gs := math.Abs(jg) * math.Sqrt(rhoV) / sd
	fs := math.Abs(jf) * math.Sqrt(rhoL) / sd
	return finite((math.Sqrt(gs) + m*math.Sqrt(fs)) / C)
}

// KutateladzeFraction is the fraction of the large-diameter flooding limit
// in use, (√Ku_g + √Ku_l)/C_K, with Ku_k = |jk| ρk^½ [a σ (ρl−ρv)]^−¼.
// Use C_K = KutateladzeCK. It does not depend on the diameter, which suits
// tubes wide against the capillary length. No body force gives 0.
func KutateladzeFraction(jg, jf, rhoL, rhoV, sigma, accel, CK float64) float64 {
	d := math.Abs(accel) * sigma * (rhoL - rhoV)
	if !(d > 0) || !(CK > 0) || !(rhoV > 0) {
		return 0
	}
	q := math.Sqrt(math.Sqrt(d))
	kg := math.Abs(jg) * math.Sqrt(rhoV) / q
	kl := math.Abs(jf) * math.Sqrt(rhoL) / q
	return finite((math.Sqrt(kg) + math.Sqrt(kl)) / CK)
}

// FaghriQmax is the flooding-limited heat transport, W, of a closed
// two-phase thermosiphon of inner diameter D (m) after Faghri, Chen &
// Morgan (1989): Qmax = K hlv A [a σ (ρl−ρv)]^¼ [ρv^−¼ + ρl^−¼]^−2 with
// K = (ρl/ρv)^0.14 tanh²(Bo^¼), Bo = D [a (ρl−ρv)/σ]^½ and A = πD²/4.
// Written from memory and not checked against the paper.
func FaghriQmax(hlv, rhoL, rhoV, sigma, D, accel float64) float64 {
	a := math.Abs(accel)
	dr := rhoL - rhoV
	if !(a > 0) || !(dr > 0) || !(sigma > 0) || !(D > 0) || !(rhoV > 0) || !(hlv > 0) {
		return 0
	}
	bo := D * math.Sqrt(a*dr/sigma)
	t := math.Tanh(math.Sqrt(math.Sqrt(bo)))
	k := math.Pow(rhoL/rhoV, 0.14) * t * t
	s := math.Pow(rhoV, -0.25) + math.Pow(rhoL, -0.25)
	area := math.Pi / 4 * D * D
	return finite(k * hlv * area * math.Sqrt(math.Sqrt(a*sigma*dr)) / (s * s))
}
