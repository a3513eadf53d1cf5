package flow

import (
	"encoding/json"
	"math"
	"strings"
	"testing"

	"circa/check/fluid"
	"circa/lang"
)

// vacuumLoop is a water loop under vacuum: saturation 40 °C at the
// condenser (7.38 kPa), 1.3 m of liquid above the evaporator inlet.
const vacuumLoop = `
loop v {
  fluid water
  saturation 40 degC
  node a at (0, 0, 0) m
  node b at (0, 0, 0.3) m
  node c at (0, 0, 1.3) m
  node d at (-0.3, 0, 1.3) m
  evaporator evap from a to b { length 0.3 m; bore 20 mm; heat HEAT }
  pipe riser from b to c { length 1 m; bore 20 mm }
  condenser cond from c to d { length 0.3 m; bore 20 mm }
  pipe down from d to a { length 1.5 m; run (0.3, 0, -1.3) m; bore 20 mm }
}
case nominal { heat evap HEAT }
`

func component(t *testing.T, cr *CaseResult, name string) ComponentState {
	t.Helper()
	for _, c := range cr.Components {
		if c.Component == name {
			return c
		}
	}
	t.Fatalf("no component %s", name)
	return ComponentState{}
}

// TestSaturationStateDefault: saying nothing is saturation_state auto. A
// refrigerant loop whose liquid column shifts its saturation by well under
// AutoLocalShift (the R134a ring: 0.7 K) gets, case for case and to the
// bit, the single state's estimate; the vacuum water loop (20 K) gets the
// local one. Naming a state, in the file or in the options, gives that
// state.
func TestSaturationStateDefault(t *testing.T) {
	for _, c := range []struct {
		src, want string
	}{{strings.ReplaceAll(ring, "HEAT", "800 W"), "single"}, {strings.ReplaceAll(vacuumLoop, "HEAT", "300 W"), "local"}} {
		def := estimate(t, load(t, c.src), Options{NoTilt: true})
		if def.Loops[0].Methods.Saturation != "auto" {
			t.Errorf("default methods %+v", def.Loops[0].Methods)
		}
		cases := func(r *Result) string {
			j, _ := json.Marshal(r.Loops[0].Cases)
			return string(j)
		}
		named := estimate(t, load(t, c.src+"methods { saturation_state "+c.want+" }\n"), Options{NoTilt: true})
		opt := estimate(t, load(t, c.src), Options{NoTilt: true, Saturation: c.want})
		if cases(def) != cases(named) || cases(named) != cases(opt) {
			t.Errorf("the default, saturation_state %s and the option differ:\n%s\n%s\n%s", c.want, cases(def), cases(named), cases(opt))
		}
		if got := def.Loops[0].Cases[0].SatState; got != c.want {
			t.Errorf("default estimated with %q, want %q (column shift %.2f K)", got, c.want, def.Loops[0].Cases[0].ColumnShift)
		}
		other := map[string]string{"single": "local", "local": "single"}[c.want]
		if o := estimate(t, load(t, c.src+"methods { saturation_state "+other+" }\n"), Options{NoTilt: true}); cases(o) == cases(def) {
			t.Errorf("saturation_state %s gives the default's estimate", other)
		}
	}
}

// TestColumnShift: the screening quantity of saturation_state auto for the
// vacuum loop, worked by hand. Liquid at 40 °C (992.183 kg/m³, p_sat =
// 7384.43 Pa; IF97, python3-iapws 1.5.2 IAPWS97(T=313.15, x=0)) under a
// 1.3 m column at standard gravity adds 992.183 · 9.80665 · 1.3 = 12649.0 Pa:
// 20033.4 Pa, where water saturates at 60.095 °C (IAPWS97(P=0.0200334,
// x=0)), so the shift is 20.095 K.
func TestColumnShift(t *testing.T) {
	r := estimate(t, load(t, strings.ReplaceAll(vacuumLoop, "HEAT", "300 W")), Options{NoTilt: true})
	if got := r.Loops[0].Cases[0].ColumnShift; math.Abs(got-20.095) > 0.01 {
		t.Errorf("column shift %.3f K, hand-worked 20.095 K", got)
	}
}

// TestLocalSaturationVacuumLoop works the evaporator inlet of the vacuum
// loop by hand. The liquid leaves the condenser saturated at 40 °C, at
// p_sat = 7384.4 Pa (IF97 Eq. 30), density 992.18 kg/m³ (IF97 region 1),
// and falls 1.3 m through the adiabatic downcomer: the hydrostatic gain is
// 992.18 · 9.80665 · 1.3 = 12649.0 Pa, less the downcomer's friction (54 Pa
// at the estimate's flow, taken from its own budget), so the evaporator
// inlet is at 7384.4 + 12649.0 − 54 = 19979 Pa, where water saturates at
// 60.04 °C (IF97 Eq. 31; python3-iapws 1.5.2 IAPWS97(P=0.01998, x=0)):
// the liquid enters 20.0 K subcooled. The single state sees it saturated.
func TestLocalSaturationVacuumLoop(t *testing.T) {
	src := strings.ReplaceAll(vacuumLoop, "HEAT", "300 W")
	single := only(t, estimate(t, load(t, src+"methods { saturation_state single }\n"), Options{NoTilt: true}))
	r := estimate(t, load(t, src+"methods { saturation_state local }\n"), Options{NoTilt: true})
	if r.Loops[0].Methods.Saturation != "local" {
		t.Fatalf("methods %+v", r.Loops[0].Methods)
	}
	cr := only(t, r)
	if !cr.Circulates {
		t.Fatalf("does not circulate: %s", cr.Reason)
	}
	ev, down := component(t, cr, "evap"), component(t, cr, "down")
	if ev.Local == nil || down.Local == nil {
		t.Fatal("no local state")
	}
	pin := 7384.4 + 992.18*gn*1.3 - down.Budget.Friction // hand-worked above
	if math.Abs(ev.Local.PressureIn-pin) > 3 {
		t.Errorf("evaporator inlet %.1f Pa, hand-worked %.1f Pa", ev.Local.PressureIn, pin)
	}
	if math.Abs(down.Budget.Friction-54) > 10 {
		t.Errorf("downcomer friction %.1f Pa, the hand-worked figure used 54 Pa", down.Budget.Friction)
	}
	if math.Abs(ev.Local.SatTempIn-273.15-60.04) > 0.05 {
		t.Errorf("local saturation at the evaporator inlet %.3f °C, want 60.04 °C", ev.Local.SatTempIn-273.15)
	}
	if math.Abs(ev.Local.SubcoolingIn-20.04) > 0.1 {
		t.Errorf("inlet subcooling %.3f K, want 20.04 K", ev.Local.SubcoolingIn)
	}
	// The single state reports the same inlet as saturated liquid, but its
	// diagnostic shows the subcooling it leaves out.
	if sev := component(t, single, "evap"); math.Abs(sev.XIn) > 1e-9 || sev.Local == nil || !(sev.Local.SubcoolingIn > 15) {
		t.Errorf("single state: x in %g, local %+v", sev.XIn, sev.Local)
	}
	// Its density-wave numbers are those of its own model: a saturated inlet
	// has Δh_sub = 0, so N_sub = 0, not the 20 K the local table shows.
	if st := single.Stability; st == nil || len(st.Channels) != 1 || st.Channels[0].Nsub != 0 {
		t.Errorf("single state's density-wave numbers %+v, want N_sub 0 at a saturated inlet", st)
	}
	// Under local saturation the evaporator stays subcooled at 300 W and the
	// mixture flashes in the riser as the pressure falls toward the
	// condenser: no heat is added there, yet the quality rises through zero.
	ri := component(t, cr, "riser")
	if !(ev.XOut < 0 && ri.XIn < 0 && ri.XOut > 0 && ri.VoidOut > 0.5) {
		t.Errorf("evaporator x out %.4f, riser x %.4f → %.4f (void %.3f): want flashing in the riser", ev.XOut, ri.XIn, ri.XOut, ri.VoidOut)
	}
	if ev.Local.BoilingOnset != nil {
		t.Errorf("boiling onset %g m inside a subcooled evaporator", *ev.Local.BoilingOnset)
	}
	// Energy still closes: the enthalpy march is the same.
	if math.Abs(cr.Totals.Heat-cr.Totals.Rejected) > 1e-9*cr.Totals.Heat {
		t.Errorf("heat in %g, rejected %g", cr.Totals.Heat, cr.Totals.Rejected)
	}
}

// TestBoilingOnsetHeight puts the evaporator of the vacuum loop under only
// 0.3 m of liquid and loads it with 3 kW so that boiling starts inside. Up to
// the onset the tube holds liquid, entering at h_f(40 °C) = 167.541 kJ/kg
// and gaining Q/(ṁ L) per metre; its pressure falls from the inlet's by its
// own weight ρ_l g plus its friction f G²/(2 D ρ_l): 9,730 + 34.6 =
// 9,765 Pa/m at the inlet, 9,731 at the onset. Worked by hand with python3-iapws 1.5.2 (IAPWS97 from P and h
// for ρ_l and μ_l, IAPWS97(P, x=0) for h_f) and python3-fluids 1.0.22
// (Churchill_1977, e/D = 1.5e-6/0.02), marched in 3000 cells of 0.1 mm, at
// ṁ = 61.36 g/s (G = 195.3 kg/(m²·s), Re 5,980 to 6,900) from an inlet at
// 13,194.7 Pa: the liquid's enthalpy h_in + Q z/(ṁ L) meets h_f(p(z)) at
// z = 0.2058 m (h = h_f = 201.07 kJ/kg at 11,188 Pa). A pressure taken
// linear to the evaporator's outlet falls too slowly below the onset, the
// two-phase part above weighing less, and puts it at 0.2140 m.
func TestBoilingOnsetHeight(t *testing.T) {
	src := strings.ReplaceAll(vacuumLoop, "HEAT", "3 kW")
	src = strings.Replace(src, "node c at (0, 0, 1.3) m", "node c at (0, 0, 0.6) m", 1)
	src = strings.Replace(src, "node d at (-0.3, 0, 1.3) m", "node d at (-0.3, 0, 0.6) m", 1)
	src = strings.Replace(src, "length 1 m; bore 20 mm }", "length 0.3 m; bore 20 mm }", 1)
	src = strings.Replace(src, "length 1.5 m; run (0.3, 0, -1.3) m", "length 0.8 m; run (0.3, 0, -0.6) m", 1)
	cr := only(t, estimate(t, load(t, src+"methods { saturation_state local }\n"), Options{NoTilt: true}))
	if !cr.Circulates {
		t.Fatalf("does not circulate: %s", cr.Reason)
	}
	ev := component(t, cr, "evap")
	if ev.Local == nil || ev.Local.BoilingOnset == nil {
		t.Fatalf("no boiling onset: %+v", ev.Local)
	}
	// The state the hand calculation starts from.
	if m := math.Abs(ev.MassFlow); math.Abs(m-0.06136) > 5e-5 {
		t.Errorf("flow %.5f kg/s, the hand-worked onset is at 0.06136", m)
	}
	if math.Abs(ev.Local.PressureIn-13194.7) > 0.5 {
		t.Errorf("evaporator inlet %.1f Pa, the hand-worked onset is from 13194.7", ev.Local.PressureIn)
	}
	if z := *ev.Local.BoilingOnset; math.Abs(z-0.2058) > 0.0005 {
		t.Errorf("onset %.4f m, hand-worked 0.2058 m", z)
	}
}

// TestHomogeneousFlowMaximum checks the circulation against heat load of a
// homogeneous loop whose losses are one local loss K at the riser outlet.
// With the heat added at the bottom of a riser of height L, the excess head
// g L (ρf − ρm) − K G²/(2ρm) vanishes at G² = 2 g L ρm (ρf − ρm)/K; over the
// exit quality it is largest where ρm = ρf/2, i.e. x = v_f/v_fg, giving
// ṁ_max = A ρf √(g L/(2K)) (homogeneous-model loop analysis, worked here).
// R134a at 40 °C: ρf 1146.7 kg/m³; A = π (0.02)²/4 = 3.1416e-4 m², L = 1 m,
// K = 1000: ṁ_max = 3.1416e-4 · 1146.7 · √(9.80665/2000) = 25.22 g/s.
// Friction (f L/D ≈ 1 against K = 1000) and acceleration are small; circa's
// maximum over the load must be within 2 %.
func TestHomogeneousFlowMaximum(t *testing.T) {
	const src = `
loop h {
  fluid R134a
  saturation 40 degC
  node a at (0, 0, 0) m
  node b at (0.05, 0, 0) m
  node c at (0.05, 0, 1) m
  node d at (-0.25, 0, 1) m
  evaporator evap from a to b { length 0.05 m; bore 20 mm; heat HEAT }
  pipe riser from b to c { length 1 m; bore 20 mm; loss 1000; roughness 0 m }
  condenser cond from c to d { length 0.3 m; bore 20 mm }
  pipe down from d to a { length 1.04 m; run (0.25, 0, -1) m; bore 20 mm; roughness 0 m }
}
case nominal { heat evap HEAT }
methods { void_fraction homogeneous; friction homogeneous_mcadams }
`
	fl, _ := fluid.Lookup("R134a")
	sat, _ := fl.AtT(313.15)
	A := math.Pi * 0.02 * 0.02 / 4
	want := A * sat.RhoL * math.Sqrt(gn*1/(2*1000))
	flowAt := func(q float64) float64 {
		c := only(t, estimate(t, load(t, strings.ReplaceAll(src, "HEAT", ftoa(q)+" W")), Options{NoTilt: true}))
		if !c.Circulates {
			return 0
		}
		return c.MassFlow
	}
	// Golden-section search for the largest flow over the load; the
	// closed form's load is ṁ x h_lv with x = v_f/v_fg.
	xs := (1 / sat.RhoL) / (1/sat.RhoV - 1/sat.RhoL)
	q0 := want * xs * sat.Hlv
	lo, hi := 0.2*q0, 5*q0
	const r = 0.6180339887
	a, b := hi-r*(hi-lo), lo+r*(hi-lo)
	fa, fb := flowAt(a), flowAt(b)
	for i := 0; i < 30; i++ {
		if fa > fb {
			hi, b, fb = b, a, fa
			a = hi - r*(hi-lo)
			fa = flowAt(a)
		} else {
			lo, a, fa = a, b, fb
			b = lo + r*(hi-lo)
			fb = flowAt(b)
		}
	}
	got := math.Max(fa, fb)
	if math.Abs(got-want) > 0.02*want {
		t.Errorf("largest flow %.3f g/s at %.1f W, closed form %.3f g/s at %.1f W", got*1e3, (a+b)/2, want*1e3, q0)
	}
	t.Logf("largest flow %.3f g/s at %.1f W; closed form %.3f g/s at %.1f W", got*1e3, (a+b)/2, want*1e3, q0)
}

// TestShelterExample: the demo loop under vacuum shows the local-saturation
// results it is written for.
func TestShelterExample(t *testing.T) {
	m := lang.Load("../../testdata/examples/shelter-rectifier.loop", lang.OSFS{})
	r := estimate(t, m, Options{NoTilt: true})
	if r.Loops[0].Methods.Saturation != "local" {
		t.Fatalf("methods %+v", r.Loops[0].Methods)
	}
	for _, c := range r.Loops[0].Cases {
		if !c.Circulates {
			t.Fatalf("%s: no circulation: %s", c.Case, c.Reason)
		}
		pl := component(t, &c, "plate")
		if pl.Local == nil || !(pl.Local.SubcoolingIn > 5) {
			t.Errorf("%s: inlet subcooling %+v", c.Case, pl.Local)
		}
		onset := pl.Local.BoilingOnset != nil
		switch c.Case {
		case "summer":
			if !onset || !(*pl.Local.BoilingOnset > 0.1 && *pl.Local.BoilingOnset < 0.25) || !(pl.XOut > 0) {
				t.Errorf("summer: onset %v, exit quality %g", pl.Local.BoilingOnset, pl.XOut)
			}
		case "cool_night":
			ri := component(t, &c, "riser")
			if onset || !(pl.XOut < 0 && ri.XOut > 0) {
				t.Errorf("cool night: onset %v, plate x out %g, riser x out %g", pl.Local.BoilingOnset, pl.XOut, ri.XOut)
			}
		}
		t.Logf("%s: %.1f g/s, T_sat %.1f °C, inlet subcooling %.1f K", c.Case, c.MassFlow*1e3, c.SatTemperature-273.15, pl.Local.SubcoolingIn)
	}
}

// TestLocalWallTemperature: with saturation at local pressure the wall of
// the vacuum demo's cold plate boils at the plate's own saturation
// temperature (its inlet's, under the liquid column), not the loop's.
func TestLocalWallTemperature(t *testing.T) {
	m := lang.Load("../../testdata/examples/shelter-rectifier.loop", lang.OSFS{})
	r := estimate(t, m, Options{NoTilt: true})
	c := r.Loops[0].Cases[0]
	pl := component(t, &c, "plate")
	tw := margin(&c, MarginWall)
	if !(tw > pl.Local.SatTempIn) || !(pl.Local.SatTempIn > c.SatTemperature+5) {
		t.Errorf("wall %.2f °C, local saturation %.2f °C, loop %.2f °C", tw-273.15, pl.Local.SatTempIn-273.15, c.SatTemperature-273.15)
	}
}

// TestPinnedState: a pinned state replaces saturation_state auto's choice
// for the case at its own attitude, to the bit the estimate of the state
// named in the file; a file that names its state, and a case not in the
// map, keep theirs.
func TestPinnedState(t *testing.T) {
	src := strings.ReplaceAll(vacuumLoop, "HEAT", "300 W")
	cases := func(r *Result) string {
		j, _ := json.Marshal(r.Loops[0].Cases)
		return string(j)
	}
	pin := map[string]string{PinKey("v", "nominal"): "single"}
	pinned := estimate(t, load(t, src), Options{NoTilt: true, Pinned: pin})
	single := estimate(t, load(t, src+"methods { saturation_state single }\n"), Options{NoTilt: true})
	if cases(pinned) != cases(single) {
		t.Errorf("pinned single differs from saturation_state single:\n%s\n%s", cases(pinned), cases(single))
	}
	if c := pinned.Loops[0].Cases[0]; c.SatState != "single" || c.AutoState() != "local" {
		t.Errorf("pinned case: state %s, auto's choice %s (column shift %.2f K)", c.SatState, c.AutoState(), c.ColumnShift)
	}
	if got := PinnedStates(estimate(t, load(t, src), Options{NoTilt: true})); len(got) != 1 || got[PinKey("v", "nominal")] != "local" {
		t.Errorf("PinnedStates of the vacuum loop: %v", got)
	}
	local := estimate(t, load(t, src+"methods { saturation_state local }\n"), Options{NoTilt: true})
	if named := estimate(t, load(t, src+"methods { saturation_state local }\n"), Options{NoTilt: true, Pinned: pin}); cases(named) != cases(local) {
		t.Error("a pin changed a file that names saturation_state local")
	}
	if PinnedStates(local) != nil {
		t.Error("PinnedStates pins a loop that names its state")
	}
	other := estimate(t, load(t, src), Options{NoTilt: true, Pinned: map[string]string{PinKey("v", "other"): "single"}})
	if other.Loops[0].Cases[0].SatState != "local" {
		t.Error("a pin of another case applied")
	}
}
