package correlate

import "math"

// Constants K of the pool-boiling critical heat flux [CHFPool].
const (
	// Zuber is K = π/24 ≈ 0.131 (Zuber 1959).
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
// converted to g/mol inside), surface roughness Rp in µm (≤ 0 means 1 µm,
// the value to use "if unknown") and heat flux q (W/m²). Cooper suggested,
// "based on inconclusive evidence", multiplying by 1.7 for copper surfaces;
// most later work finds better agreement without it and does not
// recommend it (both from the 2021 ASHRAE Handbook—Fundamentals (SI),
// ch. 5, Table 1 eq. T1.6 and the text beside it), so it is not applied.
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

// CHFKattoOhno is the flow-boiling critical heat flux of Katto & Ohno
// (1984, Int. J. Heat Mass Transfer 27:1641) for a uniformly heated vertical
// tube, W/m²: q”c = q”co (1 + K Δh_in/hlv), with q”co/(G hlv) and K
// functions of ρv/ρl, We⁻¹ = σ ρl/(G² L) and L/D over the paper's regimes
// (one set of selection rules below ρv/ρl = 0.15, one above). G is the mass
// flux (kg/m²s), L the heated length and D the inner diameter (m), dhIn the
// inlet subcooling h_f − h_in (J/kg, ≥ 0). At vanishing flow the low-flow
// branch tends to the flux that evaporates the whole inflow, G hlv D/(4L)·
// We^-0.043: it is 0 at G = 0, where the pool-boiling form applies instead.
// The coefficients agree with the transcription in NASA's assessment of
// cryogenic flow-boiling CHF correlations (NTRS 20230009827); the piecewise
// regime rules, which that transcription writes as plain minima and maxima,
// follow the paper as reproduced in Collier & Thome (1994), from memory.
func CHFKattoOhno(G, L, D, dhIn float64, p Props) float64 {
	G = math.Abs(G)
	if !(G > 0) || !(L > 0) || !(D > 0) || !(p.RhoL > p.RhoV) || !(p.RhoV > 0) || !(p.Sigma > 0) || !(p.Hlv > 0) {
		return 0
	}
	if !(dhIn > 0) {
		dhIn = 0
	}
	r := p.RhoV / p.RhoL
	we := p.Sigma * p.RhoL / (G * G * L) // inverse Weber number
	ld := L / D
	var C float64 // Katto–Ohno's length constant
	switch {
	case ld < 50:
		C = 0.25
	case ld > 150:
		C = 0.34
	default:
		C = 0.25 + 0.0009*(ld-50)
	}
	q1 := C * math.Pow(we, 0.043) / ld
	q2 := 0.10 * math.Pow(r, 0.133) * math.Pow(we, 1.0/3) / (1 + 0.0031*ld)
	q3 := 0.098 * math.Pow(r, 0.133) * math.Pow(we, 0.433) * math.Pow(ld, 0.27) / (1 + 0.0031*ld)
	q4 := 0.0384 * math.Pow(r, 0.6) * math.Pow(we, 0.173) / (1 + 0.28*math.Pow(we, 0.233)*ld)
	q5 := 0.234 * math.Pow(r, 0.513) * math.Pow(we, 0.433) * math.Pow(ld, 0.27) / (1 + 0.0031*ld)
	K1 := 1.043 / (4 * C * math.Pow(we, 0.043))
	K2 := 5.0 / 6 * (0.0124 + 1/ld) / (math.Pow(r, 0.133) * math.Pow(we, 1.0/3))
	K3 := 1.12 * (1.52*math.Pow(we, 0.233) + 1/ld) / (math.Pow(r, 0.6) * math.Pow(we, 0.173))
	var qco, K float64
	if r < 0.15 {
		switch {
		case q1 < q2:
			qco = q1
		case q2 < q3:
			qco = q2
		default:
			qco = q3
		}
		K = math.Max(K1, K2)
	} else {
		switch {
		case q1 < q5:
			qco = q1
		case q5 > q4:
			qco = q5
		default:
			qco = q4
		}
		switch {
		case K1 > K2:
			K = K1
		case K2 < K3:
			K = K2
		default:
			K = K3
		}
	}
	return finite(qco * G * p.Hlv * (1 + K*dhIn/p.Hlv))
}
