package flow

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"circa/check/correlate"
	"circa/check/fluid"
	"circa/lang"
)

// TestCondenserByGeometry gives the ring's horizontal condenser by its bore,
// length and tube count instead of a conductance: the saturation temperature
// must make Chato's film coefficient (recomputed here from the fluid's
// properties at that temperature) reject the load, Q = h·π D L N·(T − T_sink).
func TestCondenserByGeometry(t *testing.T) {
	for _, c := range []struct {
		fields string
		tubes  float64
	}{
		{"", 1}, {"tubes 4", 4},
	} {
		src := strings.ReplaceAll(ring, "HEAT", "300 W")
		src = strings.Replace(src, "conductance 150 W/K; sink 25 degC", "sink 25 degC; "+c.fields, 1)
		r := estimate(t, load(t, src), Options{NoTilt: true})
		cr := only(t, r)
		if cr.SatSource != "condenser balance" {
			t.Fatalf("%q: saturation from %q", c.fields, cr.SatSource)
		}
		T := cr.SatTemperature
		fl, _ := fluid.Lookup("R134a")
		sat, _ := fl.AtT(T)
		p := correlate.Props{RhoL: sat.RhoL, RhoV: sat.RhoV, MuL: sat.MuL, KL: sat.KL, CpL: sat.CpL, Hlv: sat.Hlv}
		dT := T - (25 + 273.15)
		h := correlate.FilmHorizontalTube(0.01, gn, dT, p)
		q := h * math.Pi * 0.01 * 0.3 * c.tubes * dT
		if math.Abs(q-300) > 1e-3*300 {
			t.Errorf("%q: T_sat %.3f °C rejects %.2f W by Chato's film, want 300 W", c.fields, T-273.15, q)
		}
		hasA := false
		for _, a := range r.Loops[0].Assumptions {
			hasA = hasA || strings.Contains(a, "Chato")
		}
		if !hasA {
			t.Errorf("%q: assumptions do not name the film condensation", c.fields)
		}
	}
	// A coolant side in series raises the saturation temperature.
	base := strings.ReplaceAll(ring, "HEAT", "300 W")
	film := only(t, estimate(t, load(t, strings.Replace(base, "conductance 150 W/K;", "", 1)), Options{NoTilt: true}))
	series := only(t, estimate(t, load(t, strings.Replace(base, "conductance 150 W/K;", "coolant_htc 2000 W/(m2 K);", 1)), Options{NoTilt: true}))
	if !(series.SatTemperature > film.SatTemperature+0.1) {
		t.Errorf("coolant side 2000 W/(m²K): T_sat %.2f °C, film alone %.2f °C", series.SatTemperature-273.15, film.SatTemperature-273.15)
	}
	// Coolant side alone would need ΔT = Q/(ho·A) = 300/(2000·π·0.01·0.3) = 15.92 K; the series
	// sum is more than that.
	if d := series.SatTemperature - 298.15; !(d > 15.92) {
		t.Errorf("series ΔT %.2f K, want above the coolant side's 15.92 K", d)
	}
}

// TestCondenserShah selects Shah's (1979) coefficient for the ring's
// geometry condenser: the saturation temperature must make Shah's mean
// coefficient from x = 1 to 0, at the mass flux G = Q/(h_lv·πD²/4·N) that
// condenses the load, reject it: Q = h(G)·π D L N·(T − T_sink).
func TestCondenserShah(t *testing.T) {
	for _, tubes := range []float64{1, 4} {
		src := strings.ReplaceAll(ring, "HEAT", "300 W")
		src = strings.Replace(src, "conductance 150 W/K; sink 25 degC", fmt.Sprintf("sink 25 degC; tubes %g", tubes), 1)
		r := estimate(t, load(t, src+"methods { condensation shah }\n"), Options{NoTilt: true})
		if r.Loops[0].Methods.Condensation != "shah" {
			t.Fatalf("methods %+v", r.Loops[0].Methods)
		}
		cr := only(t, r)
		T := cr.SatTemperature
		fl, _ := fluid.Lookup("R134a")
		info := fl.Info()
		sat, _ := fl.AtT(T)
		p := correlate.Props{RhoL: sat.RhoL, RhoV: sat.RhoV, MuL: sat.MuL, KL: sat.KL, CpL: sat.CpL, Hlv: sat.Hlv, ReducedPressure: sat.P / info.Pc}
		G := 300 / (sat.Hlv * math.Pi / 4 * 0.01 * 0.01 * tubes)
		h := correlate.Shah1979Mean(G, 1, 0, 0.01, p)
		q := h * math.Pi * 0.01 * 0.3 * tubes * (T - 298.15)
		if math.Abs(q-300) > 1e-3*300 {
			t.Errorf("%g tubes: T_sat %.3f °C rejects %.2f W by Shah's coefficient, want 300 W", tubes, T-273.15, q)
		}
		hasA := false
		for _, a := range r.Loops[0].Assumptions {
			hasA = hasA || strings.Contains(a, "Shah 1979")
		}
		if !hasA {
			t.Errorf("assumptions do not name Shah: %q", r.Loops[0].Assumptions)
		}
	}
	// With a coolant side in series the saturation temperature rises.
	base := strings.ReplaceAll(ring, "HEAT", "300 W") + "methods { condensation shah }\n"
	alone := only(t, estimate(t, load(t, strings.Replace(base, "conductance 150 W/K;", "", 1)), Options{NoTilt: true}))
	series := only(t, estimate(t, load(t, strings.Replace(base, "conductance 150 W/K;", "coolant_htc 2000 W/(m2 K);", 1)), Options{NoTilt: true}))
	if d := series.SatTemperature - 298.15; !(d > 15.92) || !(series.SatTemperature > alone.SatTemperature) {
		t.Errorf("series ΔT %.2f K (Shah alone %.2f K), want above the coolant side's 15.92 K", d, alone.SatTemperature-298.15)
	}
}

// TestCondenserForcedMethods selects each further forced-convection
// condensation correlation for the ring's geometry condenser: as for Shah,
// the saturation temperature must make the method's mean coefficient from
// x = 1 to 0, at the mass flux that condenses the load, reject it; with a
// coolant side in series, Q = A·ΔT/(1/h + 1/ho).
func TestCondenserForcedMethods(t *testing.T) {
	for _, c := range []struct {
		name, source string
		m            correlate.CondensationMethod
	}{
		{"boyko_kruzhilin", "Boyko & Kruzhilin 1967", correlate.CondBoykoKruzhilin},
		{"akers_deans_crosser", "Akers, Deans & Crosser 1959", correlate.CondAkersDeansCrosser},
		{"cavallini_smith_zecchin", "Cavallini, Smith & Zecchin 1974", correlate.CondCavalliniSmithZecchin},
	} {
		for _, ho := range []float64{0, 2000} {
			src := strings.ReplaceAll(ring, "HEAT", "300 W")
			side := ""
			if ho > 0 {
				side = fmt.Sprintf("; coolant_htc %g W/(m2 K)", ho)
			}
			src = strings.Replace(src, "conductance 150 W/K; sink 25 degC", "sink 25 degC; tubes 2"+side, 1)
			r := estimate(t, load(t, src+"methods { condensation "+c.name+" }\n"), Options{NoTilt: true})
			if r.Loops[0].Methods.Condensation != c.name {
				t.Fatalf("methods %+v", r.Loops[0].Methods)
			}
			cr := only(t, r)
			T := cr.SatTemperature
			fl, _ := fluid.Lookup("R134a")
			sat, _ := fl.AtT(T)
			p := correlate.Props{RhoL: sat.RhoL, RhoV: sat.RhoV, MuL: sat.MuL, KL: sat.KL, CpL: sat.CpL, Hlv: sat.Hlv}
			G := 300 / (sat.Hlv * math.Pi / 4 * 0.01 * 0.01 * 2)
			h := c.m.Mean(G, 1, 0, 0.01, p)
			area := math.Pi * 0.01 * 0.3 * 2
			q := h * area * (T - 298.15)
			if ho > 0 {
				q = area * (T - 298.15) / (1/h + 1/ho)
			}
			if math.Abs(q-300) > 1e-3*300 {
				t.Errorf("%s, coolant %g: T_sat %.3f °C rejects %.2f W, want 300 W", c.name, ho, T-273.15, q)
			}
			hasA := false
			for _, a := range r.Loops[0].Assumptions {
				hasA = hasA || strings.Contains(a, c.source)
			}
			if !hasA {
				t.Errorf("assumptions do not name %s: %q", c.source, r.Loops[0].Assumptions)
			}
		}
	}
	if _, err := chooseMethods(lang.Methods{Condensation: lang.Choice{Name: "nusselt"}}, Options{}); err == nil ||
		!strings.Contains(err.Error(), "cavallini_smith_zecchin") {
		t.Errorf("unknown condensation method: %v", err)
	}
}

// TestCHFKattoOhnoMethod selects the flow-boiling CHF and checks that the
// margin is Katto–Ohno's at the evaporator's own flow, heated length, bore
// and inlet subcooling, not the pool-boiling value.
func TestCHFKattoOhnoMethod(t *testing.T) {
	src := strings.ReplaceAll(ring, "HEAT", "800 W")
	pool := only(t, estimate(t, load(t, src), Options{NoTilt: true}))
	r := estimate(t, load(t, src+"methods { chf katto_ohno }\n"), Options{NoTilt: true})
	if r.Loops[0].Methods.CHF != "katto_ohno" {
		t.Fatalf("methods %+v", r.Loops[0].Methods)
	}
	cr := only(t, r)
	var ev ComponentState
	for _, c := range cr.Components {
		if c.Component == "evap" {
			ev = c
		}
	}
	fl, _ := fluid.Lookup("R134a")
	sat, _ := fl.AtT(cr.SatTemperature)
	p := correlate.Props{RhoL: sat.RhoL, RhoV: sat.RhoV, Sigma: sat.Sigma, Hlv: sat.Hlv}
	want := correlate.CHFKattoOhno(ev.MassFlux, 0.3, 0.01, math.Max(0, -ev.XIn)*sat.Hlv, p) / (800 / 0.01)
	got, poolRatio := margin(cr, MarginCHF), margin(pool, MarginCHF)
	if math.Abs(got-want) > 1e-6*want {
		t.Errorf("CHF ratio %g, want Katto–Ohno's %g", got, want)
	}
	if math.Abs(got-poolRatio) < 1e-3*poolRatio {
		t.Errorf("Katto–Ohno ratio %g equals the pool-boiling one", got)
	}
}

func margin(cr *CaseResult, name string) float64 {
	for _, m := range cr.Margins {
		if m.Margin == name {
			return m.Value
		}
	}
	return math.NaN()
}

// Without a lower saturation_max, a condenser balance is checked against
// the top of the fluid's range, which the margin names as such: for water
// 646 K, 372.85 °C, 1.096 K below the critical point 647.096 K (IAPWS
// R7-97(2012) IF97 and python3-iapws give Tc = 647.096 K; 646 K lies in
// IF97 region 3, above its 623.15 K boundary with regions 1 and 2).
func TestCondenserLimitIsFluidRange(t *testing.T) {
	water := strings.Replace(strings.ReplaceAll(ring, "HEAT", "300 W"), "fluid R134a", "fluid water", 1)
	for _, c := range []struct {
		limits    string
		field     string
		limitKelv float64
	}{
		{"", LimitFluidRange, 646},
		{"limits { saturation_max 80 degC }\n", "saturation_max", 353.15},
		{"limits { saturation_max 380 degC }\n", LimitFluidRange, 646}, // above the range: the range binds
	} {
		cr := only(t, estimate(t, load(t, c.limits+water), Options{NoTilt: true}))
		var m *Margin
		for i := range cr.Margins {
			if cr.Margins[i].Margin == MarginCondenser {
				m = &cr.Margins[i]
			}
		}
		if m == nil {
			t.Fatalf("%q: no condenser margin (%s)", c.limits, cr.Reason)
		}
		if m.LimitField != c.field || math.Abs(m.Limit-c.limitKelv) > 1e-9 {
			t.Errorf("%q: limit %.4f K from %q, want %.4f K from %q", c.limits, m.Limit, m.LimitField, c.limitKelv, c.field)
		}
	}
	fl, _ := fluid.Lookup("water")
	want := "372.85 °C, the top of water's property range (1.10 K below its critical point, 373.95 °C)"
	if got := RangeTopText(fl.Info()); got != want {
		t.Errorf("RangeTopText(water) = %q, want %q", got, want)
	}
}
