package fluid

import (
	"math"
	"testing"
)

// alpha0Value is the ideal-gas part α⁰ without ln δ, written out separately
// from the evaluator so that its τ-derivatives can be checked numerically.
func alpha0Value(id *ideal, tau float64) float64 {
	a := id.a1 + id.a2*tau + id.logTau*math.Log(tau)
	for _, p := range id.power {
		a += p.n * math.Pow(tau, p.t)
	}
	for _, p := range id.planck {
		a += p.n * math.Log(1-math.Exp(-p.theta*tau))
	}
	return a
}

// TestDerivatives checks the analytic derivatives of αʳ and α⁰ against
// central differences (common practice: step 1e-5 relative, agreement to
// 1e-6 of the derivative's scale), for every fluid at liquid-like,
// vapour-like and near-critical reduced states.
func TestDerivatives(t *testing.T) {
	const eps = 1e-5
	for _, h := range builtins {
		for _, tau := range []float64{0.8, 1.05, 1.4, 1.9} {
			for _, delta := range []float64{0.002, 0.3, 1.0, 2.2, 2.9} {
				r := alphar(h.terms, tau, delta)
				dp, dm := alphar(h.terms, tau, delta*(1+eps)), alphar(h.terms, tau, delta*(1-eps))
				tp, tm := alphar(h.terms, tau*(1+eps), delta), alphar(h.terms, tau*(1-eps), delta)
				hd, ht := 2*eps*delta, 2*eps*tau
				scale := 1 + math.Abs(r.a) + math.Abs(r.d) + math.Abs(r.dd) + math.Abs(r.t) + math.Abs(r.tt)
				for _, c := range []struct {
					name      string
					got, want float64
				}{
					{"αʳ_δ", r.d, (dp.a - dm.a) / hd},
					{"αʳ_δδ", r.dd, (dp.d - dm.d) / hd},
					{"αʳ_τ", r.t, (tp.a - tm.a) / ht},
					{"αʳ_ττ", r.tt, (tp.t - tm.t) / ht},
					{"αʳ_δτ", r.dt, (tp.d - tm.d) / ht},
					{"αʳ_τδ", r.dt, (dp.t - dm.t) / hd},
				} {
					if math.Abs(c.got-c.want) > 1e-6*scale {
						t.Errorf("%s τ=%v δ=%v: %s = %.10g, numerical %.10g", h.info.Name, tau, delta, c.name, c.got, c.want)
					}
				}
			}
			i1, i2 := h.id.alpha0(tau)
			n1 := (alpha0Value(&h.id, tau*(1+eps)) - alpha0Value(&h.id, tau*(1-eps))) / (2 * eps * tau)
			p1, _ := h.id.alpha0(tau * (1 + eps))
			m1, _ := h.id.alpha0(tau * (1 - eps))
			n2 := (p1 - m1) / (2 * eps * tau)
			if math.Abs(i1-n1) > 1e-6*(1+math.Abs(i1)) || math.Abs(i2-n2) > 1e-6*(1+math.Abs(i2)) {
				t.Errorf("%s τ=%v: α⁰_τ %.10g (numerical %.10g), α⁰_ττ %.10g (numerical %.10g)", h.info.Name, tau, i1, n1, i2, n2)
			}
		}
	}
}

// TestSaturationConditions checks that the states Direct returns satisfy the
// Maxwell criterion (equal pressure and Gibbs energy in both phases) and that
// its cp agrees with the thermodynamic identity
// cp = (∂h/∂T)_ρ − (∂h/∂ρ)_T (∂p/∂T)_ρ / (∂p/∂ρ)_T evaluated by differences.
func TestSaturationConditions(t *testing.T) {
	for _, h := range builtins {
		for _, f := range []float64{0.05, 0.5, 0.95} {
			T := h.info.Tmin + f*(h.info.Tmax-h.info.Tmin)
			s, err := h.Direct(T)
			if err != nil {
				t.Fatal(err)
			}
			tau := h.Tr / T
			g := func(rho float64) (p, gibbs float64) {
				d := rho / h.rhoR
				r := alphar(h.terms, tau, d)
				return rho * h.rs * T * (1 + d*r.d), h.rs * T * (r.a + d*r.d + math.Log(d))
			}
			pl, gl := g(s.RhoL)
			pv, gv := g(s.RhoV)
			if math.Abs(pl-pv) > 1e-6*s.P || math.Abs(gl-gv) > 1e-9*h.rs*T {
				t.Errorf("%s at %.2f K: p' %.9g p'' %.9g, g'-g'' %.3g J/kg", h.info.Name, T, pl, pv, gl-gv)
			}
			for _, ph := range []struct {
				rho, cp float64
				name    string
			}{{s.RhoL, s.CpL, "liquid"}, {s.RhoV, s.CpV, "vapour"}} {
				dT, dr := 1e-4*T, 1e-6*ph.rho
				hT := (h.phaseAt(T+dT, ph.rho).h - h.phaseAt(T-dT, ph.rho).h) / (2 * dT)
				pT := (h.phaseAt(T+dT, ph.rho).p - h.phaseAt(T-dT, ph.rho).p) / (2 * dT)
				hr := (h.phaseAt(T, ph.rho+dr).h - h.phaseAt(T, ph.rho-dr).h) / (2 * dr)
				pr := (h.phaseAt(T, ph.rho+dr).p - h.phaseAt(T, ph.rho-dr).p) / (2 * dr)
				cp := hT - hr*pT/pr
				if math.Abs(cp-ph.cp) > 1e-4*ph.cp {
					t.Errorf("%s %s at %.2f K: cp %.6g, from differences %.6g", h.info.Name, ph.name, T, ph.cp, cp)
				}
			}
		}
	}
}
