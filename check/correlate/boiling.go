package correlate

import "math"

// Constants K of the pool-boiling critical heat flux [CHFPool].
const (
	// Zuber is K = π/24 ≈ 0.131 (Zuber 1958).
	Zuber = math.Pi / 24
	// LienhardDhir is K = 0.149 for a large flat heater (Lienhard & Dhir
	// 1973), the default.
	LienhardDhir = 0.149
)

// CHFPool is the pool-boiling critical heat flux
// q”max = K hlv ρv^½ [σ a (ρl−ρv)]^¼, W/m², for latent heat hlv (J/kg),
// densities rhoL, rhoV (kg/m³), surface tension sigma (N/m) and the local
// body-force magnitude accel (m/s²). Use K = LienhardDhir by default. It
// scales as accel^¼ and is 0 in zero body force, where the form does not
// apply.
func CHFPool(K, hlv, rhoL, rhoV, sigma, accel float64) float64 {
	d := sigma * math.Abs(accel) * (rhoL - rhoV)
	if !(d > 0) || !(rhoV > 0) || !(K > 0) || !(hlv > 0) {
		return 0
	}
	return finite(K * hlv * math.Sqrt(rhoV) * math.Sqrt(math.Sqrt(d)))
}

// cooperCoef is the factor C in Cooper's h = C q^0.67:
// 55 pr^(0.12 − 0.2 log10 Rp) (−log10 pr)^−0.55 M^−0.5, M in g/mol.
func cooperCoef(pr, molarMass, rpUm float64) float64 {
	if !(pr > 0 && pr < 1) || !(molarMass > 0) {
		return 0
	}
	if !(rpUm > 0) {
		rpUm = 1
	}
	return 55 * math.Pow(pr, 0.12-0.2*math.Log10(rpUm)) * math.Pow(-math.Log10(pr), -0.55) /
		math.Sqrt(molarMass*1000)
}

// Cooper is the nucleate pool-boiling heat transfer coefficient of Cooper
// (1984), W/(m²K), at reduced pressure pr = p/pc, molar mass M (kg/mol,
// converted to g/mol inside), surface roughness Rp in µm (≤ 0 means the
// usual 1 µm) and heat flux q (W/m²). Cooper suggested multiplying by 1.7
// for horizontal copper cylinders (from memory); that is left to callers.
func Cooper(pr, M, rpUm, q float64) float64 {
	c := cooperCoef(pr, M, rpUm)
	if c == 0 || !(q > 0) {
		return 0
	}
	return finite(c * math.Pow(q, 0.67))
}

// CooperSuperheat is the wall superheat Tw − Tsat = q/h, K, at heat flux q
// with h from Cooper; since h ∝ q^0.67 it is q^0.33/C in closed form.
func CooperSuperheat(pr, M, rpUm, q float64) float64 {
	c := cooperCoef(pr, M, rpUm)
	if c == 0 || !(q > 0) {
		return 0
	}
	return finite(math.Pow(q, 0.33) / c)
}

// CooperFromSuperheat is Cooper's coefficient, W/(m²K), for a given wall
// superheat dT (K) instead of a heat flux: h = C^(1/0.33) dT^(0.67/0.33).
func CooperFromSuperheat(pr, M, rpUm, dT float64) float64 {
	c := cooperCoef(pr, M, rpUm)
	if c == 0 || !(dT > 0) {
		return 0
	}
	return finite(math.Pow(c, 1/0.33) * math.Pow(dT, 0.67/0.33))
}
