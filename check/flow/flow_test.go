package flow

import (
	"encoding/json"
	"fmt"
	"math"
	"os"
	"strings"
	"testing"

	"circa/lang"
)

const gn = 9.80665 // standard gravity, m/s² (3rd CGPM, 1901)

// load resolves loop source text; included tables are read from testdata/flow.
func load(t testing.TB, src string) *lang.Model {
	t.Helper()
	m := lang.LoadSource("../../testdata/flow/test.loop", []byte(src), lang.OSFS{})
	for _, d := range m.Diags {
		if d.Severity == lang.Error {
			t.Fatalf("model: %s", d.Message())
		}
	}
	return m
}

func estimate(t testing.TB, m *lang.Model, opts Options) *Result {
	t.Helper()
	r, err := Estimate(m, opts)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := json.Marshal(r); err != nil { // fails on NaN or Inf
		t.Fatalf("result does not encode: %v", err)
	}
	return r
}

// ring is a rectangular thermosiphon: vertical evaporator, riser, a
// condenser at the top and a downcomer.
const ring = `
loop r {
  fluid R134a
  charge 0.3 kg
  node a at (0, 0, 0) m
  node b at (0, 0, 0.3) m
  node c at (0, 0, 1.3) m
  node d at (-0.3, 0, 1.3) m
  evaporator evap from a to b { length 0.3 m; bore 10 mm; heat HEAT; wetted_area 0.01 m2; wall_limit 90 degC }
  pipe riser from b to c { length 1 m; bore 12 mm; loss 1 }
  condenser cond from c to d { length 0.3 m; bore 10 mm; conductance 150 W/K; sink 25 degC }
  pipe down from d to a { length 1.5 m; run (0.3, 0, -1.3) m; bore 8 mm; loss 1 }
}
case nominal { heat evap HEAT }
`

func ringModel(t testing.TB, heat string) *lang.Model {
	return load(t, strings.ReplaceAll(ring, "HEAT", heat))
}

func only(t testing.TB, r *Result) *CaseResult {
	t.Helper()
	if len(r.Loops) != 1 || len(r.Loops[0].Cases) == 0 {
		t.Fatalf("want one loop with a case, got %+v", r)
	}
	return &r.Loops[0].Cases[0]
}

func TestNoHeatNoFlow(t *testing.T) {
	c := only(t, estimate(t, ringModel(t, "0 W"), Options{NoTilt: true}))
	if c.Circulates || c.MassFlow != 0 {
		t.Fatalf("no heat: circulates=%v mass flow %g", c.Circulates, c.MassFlow)
	}
}

func TestHorizontalNoFlow(t *testing.T) {
	src := `
loop r {
  fluid R134a
  node a at (0, 0, 0) m
  node b at (0.3, 0, 0) m
  node c at (0.3, 0.5, 0) m
  node d at (0, 0.5, 0) m
  evaporator evap from a to b { length 0.3 m; bore 10 mm; heat 500 W }
  pipe riser from b to c { length 0.5 m; bore 12 mm }
  condenser cond from c to d { length 0.3 m; bore 10 mm; conductance 150 W/K; sink 25 degC }
  pipe down from d to a { length 0.5 m; bore 8 mm }
}
case nominal { heat evap 500 W }
`
	c := only(t, estimate(t, load(t, src), Options{NoTilt: true}))
	if c.Circulates {
		t.Fatalf("level loop circulates at %g kg/s", c.MassFlow)
	}
	if !strings.Contains(c.Reason, "not above") {
		t.Errorf("reason %q should say the condenser is not above the evaporator", c.Reason)
	}
	// The head is quoted at the flow 500 W just evaporates: R134a's latent
	// heat at 28.3 °C is about 174.8 kJ/kg (Tillner-Roth and Baehr 1994,
	// from memory), so 2.86 g/s; not at a vanishing flow.
	if !strings.Contains(c.Reason, "at 2.86 g/s") {
		t.Errorf("reason %q should quote the head at 2.86 g/s", c.Reason)
	}
}

func flowOf(t testing.TB, src string) float64 {
	t.Helper()
	c := only(t, estimate(t, load(t, src), Options{NoTilt: true}))
	if !c.Circulates {
		t.Fatalf("does not circulate: %s", c.Reason)
	}
	return c.MassFlow
}

func TestInvariance(t *testing.T) {
	base := strings.ReplaceAll(ring, "HEAT", "800 W")
	m0 := flowOf(t, base)
	// Yaw turns the equipment about the body-force axis: nothing changes.
	yawed := strings.Replace(base, "case nominal { heat evap 800 W }", "case nominal { heat evap 800 W; yaw 37 deg }", 1)
	if m := flowOf(t, yawed); math.Abs(m-m0) > 1e-9*m0 {
		t.Errorf("yaw 37°: %g kg/s, level %g kg/s", m, m0)
	}
	// Renamed nodes and components, listed in another order.
	renamed := `
loop other {
  fluid R134a
  node n4 at (-0.3, 0, 1.3) m
  node n1 at (0, 0, 0) m
  node n3 at (0, 0, 1.3) m
  node n2 at (0, 0, 0.3) m
  pipe ret from n4 to n1 { length 1.5 m; run (0.3, 0, -1.3) m; bore 8 mm; loss 1 }
  condenser cool from n3 to n4 { length 0.3 m; bore 10 mm; conductance 150 W/K; sink 25 degC }
  evaporator boil from n1 to n2 { length 0.3 m; bore 10 mm; heat 800 W; wetted_area 0.01 m2 }
  pipe up from n2 to n3 { length 1 m; bore 12 mm; loss 1 }
}
case other_name { heat boil 800 W }
`
	if m := flowOf(t, renamed); math.Abs(m-m0) > 1e-9*m0 {
		t.Errorf("relabelled: %g kg/s, original %g kg/s", m, m0)
	}
	// One standard gravity of forward acceleration on a level loop gives
	// b = (−g_n, 0, −g_n): the body force of a 45° nose-up pitch, scaled
	// by √2. The pitched case reaches the same b with an extra
	// acceleration (√2−1)·g_n along its own body force: a = (√2−1)/√2·g_n·(1, 0, 1)
	// in the equipment frame (frame convention of docs/language.md).
	acc := strings.Replace(base, "case nominal { heat evap 800 W }", "case nominal { heat evap 800 W; accel (1, 0, 0) gn }", 1)
	k := (math.Sqrt2 - 1) / math.Sqrt2
	pitched := strings.Replace(base, "case nominal { heat evap 800 W }",
		"case nominal { heat evap 800 W; pitch 45 deg; accel ("+ftoa(k)+", 0, "+ftoa(k)+") gn }", 1)
	ca := only(t, estimate(t, load(t, acc), Options{NoTilt: true}))
	cp := only(t, estimate(t, load(t, pitched), Options{NoTilt: true}))
	bmag := math.Hypot(ca.BodyForce[0], ca.BodyForce[2])
	if math.Abs(bmag-math.Sqrt2*gn) > 1e-9 || math.Abs(ca.BodyForce[0]-ca.BodyForce[2]) > 1e-9 {
		t.Errorf("1 gn forward: body force %v, want magnitude √2·g_n at 45°", ca.BodyForce)
	}
	if ca.Circulates != cp.Circulates || math.Abs(ca.MassFlow-cp.MassFlow) > 1e-6*math.Max(ca.MassFlow, 1e-9) {
		t.Errorf("1 gn forward: %g kg/s; pitched 45° at √2·g_n: %g kg/s", ca.MassFlow, cp.MassFlow)
	}
}

func ftoa(v float64) string {
	b, _ := json.Marshal(v)
	return string(b)
}

func TestEnergyCloses(t *testing.T) {
	c := only(t, estimate(t, ringModel(t, "800 W"), Options{NoTilt: true}))
	if c.Totals.EnergyGap > 1e-9 || math.Abs(c.Totals.Heat-800) > 1e-9*800 {
		t.Errorf("ΣQ: heat %g W, rejected %g W, gap %g", c.Totals.Heat, c.Totals.Rejected, c.Totals.EnergyGap)
	}
	m := lang.Load("../../testdata/examples/ferry-cabinet.loop", lang.OSFS{})
	r := estimate(t, m, Options{NoTilt: true})
	for _, c := range r.Loops[0].Cases {
		if !c.Circulates || c.Totals.EnergyGap > 1e-9 || c.Totals.MassGap > 1e-9 {
			t.Errorf("network case %s: circulates %v, energy gap %g, mass gap %g", c.Case, c.Circulates, c.Totals.EnergyGap, c.Totals.MassGap)
		}
	}
}

func TestGridConvergence(t *testing.T) {
	m := ringModel(t, "800 W")
	// Halving the cell size changes the mass flow by less than 0.1 % (the
	// estimator's own accuracy target).
	for _, n := range []int{40, 80} {
		a := only(t, estimate(t, m, Options{NoTilt: true, Cells: n})).MassFlow
		b := only(t, estimate(t, m, Options{NoTilt: true, Cells: 2 * n})).MassFlow
		if math.Abs(a-b) > 1e-3*b {
			t.Errorf("%d → %d cells: %g → %g kg/s", n, 2*n, a, b)
		}
	}
}

// TestHandWorkedHomogeneous checks testdata/flow/hand.loop against this
// arithmetic (constant properties ρl = 1000, ρv = 10 kg/m³, h_lv = 1 MJ/kg;
// homogeneous void and friction; heater and cooler level):
//
//	v_l = 0.001, v_v = 0.1 m³/kg; at ṁ = 0.05 kg/s the heater's 5 kW gives
//	x = 5000/(0.05·1e6) = 0.1, v_h = 0.001 + 0.1·0.099 = 0.0109 m³/kg,
//	ρ_h = 91.743 kg/m³.
//	Head: g·H·(ρl − ρh) = 9.80665·1·(1000 − 91.743) = 8906.96 Pa.
//	A = π/4·0.1² = 7.8540e-3 m², G = 0.05/A = 6.3662 kg/(m²s),
//	riser outlet loss K·G²·v_h/2 = K·0.22088 Pa, so K = 8906.96/0.22088
//	= 40324.8 balances at 0.05 kg/s. Acceleration cancels (heater
//	+G²(v_h − v_l), cooler −G²(v_h − v_l), one bore); friction at
//	Re ≈ 640–64000 over 2.2 m of 100 mm tube is below 0.5 Pa (< 0.01 %).
func TestHandWorkedHomogeneous(t *testing.T) {
	m := lang.Load("../../testdata/flow/hand.loop", lang.OSFS{})
	for _, d := range m.Diags {
		t.Fatalf("hand.loop: %s", d.Message())
	}
	c := only(t, estimate(t, m, Options{NoTilt: true}))
	const want = 0.05 // kg/s, the arithmetic above
	if math.Abs(c.MassFlow-want) > 0.01*want {
		t.Fatalf("hand-worked loop: %g kg/s, want %g within 1 %%", c.MassFlow, want)
	}
	if x := c.Components[0].XOut; math.Abs(x-0.1) > 0.001 {
		t.Errorf("heater exit quality %g, want 0.1", x)
	}
}

// TestHandWorkedAboveGrid checks testdata/flow/hand-large.loop, the loop
// above at 1 m bore and 2 MW, whose flow lies above the 10 kg/s top of the
// coarse grid, against the same arithmetic:
//
//	at ṁ = 20 kg/s the heater's 2 MW gives x = 2e6/(20·1e6) = 0.1, so the
//	head is again 8906.96 Pa. A = π/4·1² = 0.78540 m², G = 25.465 kg/(m²s),
//	riser loss K·G²·v_h/2 = K·3.5341 Pa, so K = 8906.96/3.5341 = 2520.3
//	balances at 20 kg/s. Friction over 2.2 m of 1 m tube at Re ≈ 25000
//	is below 0.5 Pa (< 0.01 %).
func TestHandWorkedAboveGrid(t *testing.T) {
	m := lang.Load("../../testdata/flow/hand-large.loop", lang.OSFS{})
	for _, d := range m.Diags {
		t.Fatalf("hand-large.loop: %s", d.Message())
	}
	c := only(t, estimate(t, m, Options{NoTilt: true}))
	const want = 20.0 // kg/s, the arithmetic above
	if math.Abs(c.MassFlow-want) > 0.01*want {
		t.Fatalf("hand-worked loop above the grid: %g kg/s (%s), want %g within 1 %%", c.MassFlow, c.Reason, want)
	}
	for _, f := range c.Findings {
		if f.Rule == RuleNoCirculation {
			t.Errorf("finding %s", f.Message)
		}
	}
}

// TestFlowBeyondRange: a loop whose excess head is still positive at the
// largest flow searched is reported as beyond the range, not as one that
// does not circulate.
func TestFlowBeyondRange(t *testing.T) {
	src, err := os.ReadFile("../../testdata/flow/hand-large.loop")
	if err != nil {
		t.Fatal(err)
	}
	// A 100 m bore and no losses: far above any flow searched.
	text := strings.NewReplacer("1000 mm", "100 m", "loss 2520.3; ", "").Replace(string(src))
	m := lang.LoadSource("../../testdata/flow/wide.loop", []byte(text), lang.OSFS{})
	for _, d := range m.Diags {
		t.Fatalf("wide.loop: %s", d.Message())
	}
	c := only(t, estimate(t, m, Options{NoTilt: true}))
	if c.Circulates {
		t.Fatalf("circulates at %g kg/s: not beyond the range", c.MassFlow)
	}
	found := false
	for _, f := range c.Findings {
		if f.Rule == RuleNoCirculation {
			found = true
			if strings.Contains(f.Message, "no circulation") || !strings.Contains(f.Message, "beyond the range searched") {
				t.Errorf("message %q", f.Message)
			}
		}
	}
	if !found {
		t.Errorf("no finding; reason %q", c.Reason)
	}
}

// TestVijayanSinglePhase checks a single-phase (all subcooled) loop against
// Vijayan's generalized steady-state correlation Re = C (Gr_m/N_G)^r,
// laminar C = 0.1768, r = 0.5 (Vijayan & Austregesilo, Nucl. Eng. Des. 152
// (1994) 331; Vijayan, Nucl. Eng. Des. 215 (2002) 139). The loop is
// uniform-diameter with no local losses; the correlation's scatter against
// its data is about ±20 % (from memory), the band used here. The whole loop
// stays liquid because the cooler subcools by 40 K.
func TestVijayanSinglePhase(t *testing.T) {
	src := `
loop sp {
  fluid water
  saturation 100 degC
  node a at (0, 0, 0) m
  node b at (0, 0, 0.5) m
  node c at (0, 0, 1.5) m
  node d at (0, 0, 2) m
  node e at (0.5, 0, 2) m
  node f at (0.5, 0, 0) m
  evaporator heater from a to b { length 0.5 m; bore 10 mm; heat 30 W }
  pipe riser from b to c { length 1 m; bore 10 mm }
  pipe top from c to d { length 0.5 m; bore 10 mm }
  condenser cooler from d to e { length 0.5 m; bore 10 mm; subcool 40 K; conductance 100 W/K; sink 20 degC }
  pipe down from e to f { length 2 m; bore 10 mm }
  pipe bottom from f to a { length 0.5 m; bore 10 mm }
}
case nominal { heat heater 30 W }
`
	m := load(t, src)
	c := only(t, estimate(t, m, Options{NoTilt: true}))
	if !c.Circulates {
		t.Fatalf("no circulation: %s", c.Reason)
	}
	for _, cs := range c.Components {
		if cs.XOut >= 0 {
			t.Fatalf("%s reaches quality %g: not single-phase", cs.Component, cs.XOut)
		}
	}
	// Properties at the loop's mean temperature, from the estimator's own
	// fluid (water, IAPWS): β from the liquid density slope.
	var sub float64
	for _, cs := range c.Components {
		if cs.Component == "heater" {
			sub = cs.XIn
		}
	}
	fl, _ := lookupForTest("water")
	sat, _ := fl.AtT(373.15)
	tMean := 373.15 + 0.5*(sub+c.Components[0].XOut)*sat.Hlv/sat.CpL
	s1, _ := fl.AtT(tMean - 1)
	s2, _ := fl.AtT(tMean + 1)
	sm, _ := fl.AtT(tMean)
	rho, mu, cp := sm.RhoL, sm.MuL, sm.CpL
	beta := -(s2.RhoL - s1.RhoL) / 2 / rho
	// Δz: heater centre (0.25 m) to cooler centre (2 m).
	D, Lt, dz, Q := 0.01, 5.0, 2-0.25, 30.0
	A := math.Pi / 4 * D * D
	grm := D * D * D * rho * rho * beta * gn * Q * dz / (A * mu * mu * mu * cp)
	ng := Lt / D
	re := 0.1768 * math.Sqrt(grm/ng)
	want := re * A * mu / D
	if math.Abs(c.MassFlow-want) > 0.2*want {
		t.Errorf("single-phase loop: %g kg/s, Vijayan laminar %g kg/s (Re %.0f), outside ±20 %%", c.MassFlow, want, re)
	}
	t.Logf("single-phase loop %.4g g/s, Vijayan %.4g g/s, Re %.0f", c.MassFlow*1e3, want*1e3, re)
}

func TestBadStates(t *testing.T) {
	cases := map[string]string{
		"zero length":     strings.Replace(strings.ReplaceAll(ring, "HEAT", "800 W"), "length 1 m; bore 12 mm", "length 0 m; bore 12 mm", 1),
		"negative length": strings.Replace(strings.ReplaceAll(ring, "HEAT", "800 W"), "length 1 m; bore 12 mm", "length -1 m; bore 12 mm", 1),
		"past critical":   strings.Replace(strings.ReplaceAll(ring, "HEAT", "800 W"), "sink 25 degC", "sink 150 degC", 1),
		"dryout":          strings.ReplaceAll(ring, "HEAT", "60 kW"),
	}
	for name, src := range cases {
		m := lang.LoadSource("../../testdata/flow/test.loop", []byte(src), lang.OSFS{})
		r := estimate(t, m, Options{})
		var fs []Finding
		for _, l := range r.Loops {
			fs = append(fs, l.Findings...)
			for _, c := range l.Cases {
				fs = append(fs, c.Findings...)
			}
		}
		hasError := false
		for _, f := range fs {
			if f.Severity == "error" {
				hasError = true
			}
		}
		if !hasError {
			t.Errorf("%s: no error finding (%+v)", name, fs)
		}
	}
}

// TestExamples checks that every example gives plausible numbers: mass
// flow of order 1–100 g/s for 1–7 kW in every case, and in the nominal
// case an exit quality of 0.05–0.7 (common practice for electronics
// thermosiphons, rules of thumb: x_out ~0.1–0.5). Off-nominal cases may
// exceed the exit-quality limit; they must then say so in a finding.
func TestExamples(t *testing.T) {
	for _, f := range []string{"rack-door", "forestry-inverter", "ferry-cabinet"} {
		m := lang.Load("../../testdata/examples/"+f+".loop", lang.OSFS{})
		r := estimate(t, m, Options{NoTilt: true})
		for _, c := range r.Loops[0].Cases {
			if !c.Circulates {
				t.Errorf("%s/%s: no circulation: %s", f, c.Case, c.Reason)
				continue
			}
			if c.MassFlow < 1e-3 || c.MassFlow > 0.15 {
				t.Errorf("%s/%s: mass flow %g kg/s", f, c.Case, c.MassFlow)
			}
			nominal := c.Case == m.Nominal.Name
			for _, cs := range c.Components {
				if cs.Kind != "evaporator" {
					continue
				}
				if nominal && (cs.XOut < 0.05 || cs.XOut > 0.7) {
					t.Errorf("%s/%s: exit quality %g at %s", f, c.Case, cs.XOut, cs.Component)
				}
				if cs.XOut > r.Loops[0].Cases[0].Margins[0].Limit && !hasFinding(c.Findings, RuleExitQuality, cs.Component) {
					t.Errorf("%s/%s: exit quality %g at %s without a finding", f, c.Case, cs.XOut, cs.Component)
				}
			}
			t.Logf("%s/%s: %.1f g/s, T_sat %.1f °C", f, c.Case, c.MassFlow*1e3, c.SatTemperature-273.15)
		}
	}
}

func hasFinding(fs []Finding, rule, comp string) bool {
	for _, f := range fs {
		if f.Rule == rule && f.Component == comp {
			return true
		}
	}
	return false
}

func TestTiltLimits(t *testing.T) {
	c := only(t, estimate(t, ringModel(t, "800 W"), Options{}))
	if c.Tilt == nil || c.Tilt.Margin <= 0 || c.Tilt.Margin > math.Pi/2 {
		t.Fatalf("tilt limits %+v", c.Tilt)
	}
	// Just past the critical pitch, the loop no longer circulates.
	if c.Tilt.PitchUp != nil {
		src := strings.Replace(strings.ReplaceAll(ring, "HEAT", "800 W"), "case nominal { heat evap 800 W }",
			"case nominal { heat evap 800 W; pitch "+ftoa(*c.Tilt.PitchUp*180/math.Pi+0.5)+" deg }", 1)
		cc := only(t, estimate(t, load(t, src), Options{NoTilt: true}))
		if cc.Circulates {
			t.Errorf("past the critical pitch %g° it still circulates", *c.Tilt.PitchUp*180/math.Pi)
		}
	}
}

// TestLedineggLoop checks testdata/flow/ledinegg.loop, a loop with three
// balances, against this arithmetic (constant properties ρl = 1000,
// ρv = 10 kg/m³, h_lv = 1 MJ/kg, c_p,l = 4 kJ/(kg K); homogeneous void
// and friction; heater and cooler level, so only the 1 m riser gives head;
// friction in 40 mm tube is below 0.2 % of the orifice loss):
//
//	Subcooling 50 K: heater inlet x_in = −4000·50/1e6 = −0.2; 10 kW gives
//	x = 0.01/ṁ − 0.2, so the heater outlet is just saturated at
//	ṁ* = 0.05 kg/s. A = π/4·0.04² = 1.2566e-3 m², v_h = 0.001 + 0.099·x.
//	E(ṁ) = g·H·(ρl − 1/v_h) − K·G²·v_h/2, K = 2800 at the riser outlet:
//	  ṁ = 0.010: x = 0.8,    ρh = 12.47,  head 9684.4, loss 7110.2, E = +2574
//	  ṁ = 0.025: x = 0.2,    ρh = 48.08,  head 9335.2, loss 11525.5, E = −2190
//	  ṁ = 0.045: x = 0.0222, ρh = 312.5,  head 6742.1, loss 5744.9, E = +997
//	  ṁ = 0.050: x = 0,      liquid,      head 0,      loss 2216.4, E = −2216
//	Three sign changes: a root in each of (10, 25), (25, 45) and
//	(45, 50) g/s. Solving E = 0 in closed form numerically
//	gives 15.47, 40.98 and 48.86 g/s with dE/dṁ ≈ −3.82e5, +2.87e5 and
//	−1.156e6 Pa/(kg/s).
//
// Why E rises: the orifice loss ∝ ṁ²·v_h = ṁ²(v_l + v_lv·(q/ṁ − s))
// falls with flow above ṁ = q·v_lv/(2(v_lv·s − v_l)) = 26 g/s while the
// two-phase head stays near g·H·ρl until x is within a few per cent of
// zero. With y = x·v_lv/v_l the ratio head/loss ∝ y(y+S)²/(1+y)², S =
// s·v_lv/v_l, which turns back (and E can rise with ṁ) only when S > 9:
// here S = 19.8. That is the static (Ledinegg) excursion of a boiling
// channel with subcooled inlet (Ledinegg, Die Wärme 61 (1938) 891, from
// memory): the middle balance has dE/dṁ > 0 and is unstable.
//
// The two upper balances lie within one step of the coarse 5-per-decade
// grid (39.8 to 63.1 g/s), which alone finds only the lowest one; the
// estimate finds all three only through the refined boiling band.
func TestLedineggLoop(t *testing.T) {
	m := lang.Load("../../testdata/flow/ledinegg.loop", lang.OSFS{})
	for _, d := range m.Diags {
		t.Fatalf("ledinegg.loop: %s", d.Message())
	}
	r := estimate(t, m, Options{NoTilt: true})
	c := only(t, r)
	want := []struct{ m, slope float64 }{{0.01547, -3.82e5}, {0.04098, 2.87e5}, {0.04886, -1.156e6}} // the arithmetic above
	if len(c.Roots) != len(want) {
		t.Fatalf("roots %+v, want 3", c.Roots)
	}
	for i, w := range want {
		got := c.Roots[i]
		if math.Abs(got.MassFlow-w.m) > 0.005*w.m {
			t.Errorf("root %d at %g kg/s, want %g within 0.5 %%", i, got.MassFlow, w.m)
		}
		if math.Abs(got.Slope-w.slope) > 0.02*math.Abs(w.slope) {
			t.Errorf("root %d slope %g Pa/(kg/s), want %g within 2 %%", i, got.Slope, w.slope)
		}
		if got.Stable != (w.slope < 0) {
			t.Errorf("root %d stable=%v with slope %g", i, got.Stable, got.Slope)
		}
	}
	// The estimate is the stable balance of highest flow.
	if !c.Circulates || math.Abs(c.MassFlow-c.Roots[2].MassFlow) > 1e-12 {
		t.Errorf("estimate %g kg/s (circulates %v), want the upper stable root %g", c.MassFlow, c.Circulates, c.Roots[2].MassFlow)
	}
	if x := c.Components[0].XOut; math.Abs(x-(0.01/c.MassFlow-0.2)) > 1e-6 {
		t.Errorf("heater exit quality %g, want %g", x, 0.01/c.MassFlow-0.2)
	}
	var unstable []Finding
	for _, f := range c.Findings {
		if f.Rule == RuleUnstable {
			unstable = append(unstable, f)
		}
	}
	if len(unstable) != 1 || unstable[0].Severity != "warning" || unstable[0].Loop != "throttled" ||
		math.Abs(unstable[0].Value-c.Roots[1].MassFlow) > 1e-12 {
		t.Errorf("unstable findings %+v, want one warning at %g kg/s", unstable, c.Roots[1].MassFlow)
	}

	// The coarse grid alone misses the upper pair; the refined one does not.
	mu, _ := chooseMethods(m.Methods, Options{})
	p := prepare(m, m.Loops[0], mu)
	var cr CaseResult
	s, _ := p.newState(point{c: m.Cases[0]}, &cr)
	ev := s.newEval()
	E := func(mf float64) float64 {
		s.evaluate([]float64{mf}, ev)
		return ev.e[0]
	}
	if coarse, _ := findRoots(E, grid); len(coarse) != 1 {
		t.Errorf("coarse grid finds %d roots; the test no longer shows why the band is refined", len(coarse))
	}
	for _, h := range []struct{ m, e float64 }{{0.010, 2574.2}, {0.025, -2190.3}, {0.045, 997.2}, {0.050, -2216.4}} { // the arithmetic above
		if got := E(h.m); math.Abs(got-h.e) > 0.01*math.Abs(h.e) {
			t.Errorf("E(%g kg/s) = %g Pa, want %g within 1 %% (friction)", h.m, got, h.e)
		}
	}
}

func TestMergeGrid(t *testing.T) {
	g := mergeGrid([]float64{1, 2, 4, 8}, []float64{6, 4 * (1 + 1e-12), 3})
	want := []float64{1, 2, 3, 4, 6, 8}
	if len(g) != len(want) {
		t.Fatalf("merged %v, want %v", g, want)
	}
	for i := range want {
		if math.Abs(g[i]-want[i]) > 1e-9 {
			t.Fatalf("merged %v, want %v", g, want)
		}
	}
}

// The tilt limits of the shipped examples, about each one's nominal case.
// Circulation stops where the gravity head at vanishing flow vanishes or
// a heated branch stops, which is close to where the condensers' thermal
// centre stops being above the evaporators' (the tilt-limits rule's
// angles, checked by hand from the examples' coordinates: rack +80.5° /
// −99.5° pitch, inverter +71.2°, ferry +103.5° / −76.5°) but not the same:
// the head counts the vapour and liquid where they are, not at the
// components' centres. The angles within ±90° agree within 0.02° with
// those of the earlier search (5° steps to ±90°, then bisection); the
// others it did not look for.
func TestTiltLimitsOfExamples(t *testing.T) {
	for _, tc := range []struct {
		file, loop string
		axis       string // "pitch" or "roll"
		up         bool
		want       float64 // degrees, this search
		earlier    float64 // degrees, the earlier search (0: beyond ±90°)
		centres    float64 // degrees, the thermal centres (0: not checked)
	}{
		{"rack-door", "rack", "pitch", true, 80.40, 80.40, 80.5},
		{"rack-door", "rack", "pitch", false, -99.65, 0, -99.5},
		{"rack-door", "rack", "roll", true, 90.0, 90.0, 90.0},
		{"forestry-inverter", "inverter", "pitch", true, 67.58, 67.58, 71.2},
		{"ferry-cabinet", "cabinet", "pitch", true, 103.0, 0, 103.5},
		{"ferry-cabinet", "cabinet", "pitch", false, -77.0, -77.01, -76.5},
		{"ferry-cabinet", "cabinet", "roll", true, 70.16, 70.16, 0},
		{"ferry-cabinet", "cabinet", "roll", false, -76.30, -76.30, 0},
	} {
		m := lang.Load("../../testdata/examples/"+tc.file+".loop", lang.OSFS{})
		r := estimate(t, m, Options{Case: m.Nominal.Name})
		c := r.Loops[0].Cases[0]
		if c.Tilt == nil {
			t.Fatalf("%s: no tilt limits", tc.file)
		}
		lim := map[string]*float64{"pitch true": c.Tilt.PitchUp, "pitch false": c.Tilt.PitchDown,
			"roll true": c.Tilt.RollLeft, "roll false": c.Tilt.RollRight}[fmt.Sprint(tc.axis, " ", tc.up)]
		if lim == nil {
			t.Errorf("%s: no %s limit (up %v)", tc.file, tc.axis, tc.up)
			continue
		}
		got := *lim * 180 / math.Pi
		if math.Abs(got-tc.want) > 0.05 {
			t.Errorf("%s: %s limit %.3f°, want %.2f°", tc.file, tc.axis, got, tc.want)
		}
		if tc.earlier != 0 && math.Abs(got-tc.earlier) > 0.05 {
			t.Errorf("%s: %s limit %.3f°, the earlier search found %.2f°", tc.file, tc.axis, got, tc.earlier)
		}
		if tc.centres != 0 && math.Abs(got-tc.centres) > 4 {
			t.Errorf("%s: %s limit %.3f° is far from the thermal centres' %.1f°", tc.file, tc.axis, got, tc.centres)
		}
	}
}

// A tilt limit is exact to its last printed digit: a case tilted 0.1°
// short of the limit circulates, one 0.1° past it does not (or only
// backwards through its evaporators). The ferry's roll limits are where a
// branch stops; the others where the head goes.
func TestTiltLimitExact(t *testing.T) {
	for _, file := range []string{"rack-door", "ferry-cabinet"} {
		m := lang.Load("../../testdata/examples/"+file+".loop", lang.OSFS{})
		nom := m.Nominal
		c := only(t, estimate(t, m, Options{Case: nom.Name}))
		for _, tc := range []struct {
			v   *lang.Value
			lim *float64
		}{{&nom.Pitch, c.Tilt.PitchUp}, {&nom.Pitch, c.Tilt.PitchDown}, {&nom.Roll, c.Tilt.RollLeft}, {&nom.Roll, c.Tilt.RollRight}} {
			if tc.lim == nil {
				t.Fatalf("%s: limits %+v", file, c.Tilt)
			}
			was := tc.v.SI
			dir := math.Copysign(1, *tc.lim-was)
			for _, off := range []float64{-0.1, 0.1} {
				tc.v.SI = *tc.lim + dir*off*math.Pi/180
				cc := only(t, estimate(t, m, Options{Case: nom.Name, NoTilt: true}))
				forward := cc.Circulates
				for _, f := range cc.Findings {
					forward = forward && f.Rule != RuleReverse
				}
				if forward != (off < 0) {
					t.Errorf("%s: at %.2f° (%+.1f° from the limit %.2f°) circulates forwards %v", file, tc.v.SI*180/math.Pi, off, *tc.lim*180/math.Pi, forward)
				}
			}
			tc.v.SI = was
		}
	}
}

// A cancelled estimate stops early: with the cancel channel closed before
// it starts, no case is evaluated.
func TestEstimateCancelled(t *testing.T) {
	m := lang.Load("../../testdata/examples/ferry-cabinet.loop", lang.OSFS{})
	stop := make(chan struct{})
	close(stop)
	r := estimate(t, m, Options{Cancel: stop})
	for _, c := range r.Loops[0].Cases {
		if c.Circulates || c.Tilt != nil {
			t.Errorf("case %q evaluated after cancellation", c.Case)
		}
	}
}
