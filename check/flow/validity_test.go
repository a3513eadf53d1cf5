package flow

import (
	"math"
	"strings"
	"testing"

	"circa/check/fluid"
)

// rangeLoop is a small R134a thermosiphon whose condenser is given by its
// geometry; METHODS is replaced by a methods block.
const rangeLoop = `
loop l {
  fluid R134a
  node a at (0, 0, 0) m
  node b at (0, 0, 0.2) m
  node c at (0, 0, 1.2) m
  node d at (0, 0, 1.0) m
  evaporator e from a to b { length 0.2 m; rise 0.2 m; bore BORE; heat HEAT; wall_limit 90 °C }
  pipe up from b to c { length 1 m; bore BORE }
  condenser k from c to d { length 1 m; bore BORE; sink 25 °C }
  pipe down from d to a { length 1.1 m; bore BORE }
}
case nominal { }
METHODS
`

func rangeModelResult(t *testing.T, bore, heat, methods string) *CaseResult {
	t.Helper()
	src := strings.NewReplacer("BORE", bore, "HEAT", heat, "METHODS", methods).Replace(rangeLoop)
	return only(t, estimate(t, load(t, src), Options{NoTilt: true}))
}

func rangeFindings(cr *CaseResult) []Finding {
	var out []Finding
	for _, f := range cr.Findings {
		if f.Rule == RuleCorrelationRange {
			out = append(out, f)
		}
	}
	return out
}

// A 40 W condenser of 10 mm bore condenses about 0.24 g/s: the liquid-only
// Reynolds number is 4Q/(π D h_lv μ_l) ≈ 200, below the 350 Shah's
// correlation is stated for.
func TestShahLaminarCondenser(t *testing.T) {
	cr := rangeModelResult(t, "10 mm", "40 W", "methods { condensation shah }")
	fs := rangeFindings(cr)
	if len(fs) != 1 || fs[0].Component != "k" || fs[0].Correlation != "Shah (1979)" {
		t.Fatalf("findings %+v, want one for Shah at condenser k", fs)
	}
	var q float64
	for _, cs := range cr.Components {
		if cs.Component == "k" {
			q = math.Abs(cs.Heat)
		}
	}
	fl, err := fluid.Lookup("R134a")
	if err != nil {
		t.Fatal(err)
	}
	sat, err := fl.AtT(cr.SatTemperature)
	if err != nil {
		t.Fatal(err)
	}
	re := 4 * q / (math.Pi * 0.010 * sat.Hlv * sat.MuL)
	if f := fs[0]; math.Abs(f.Value-re) > 1e-9*re || f.Limit != 350 || f.Severity != "info" {
		t.Errorf("finding value %g limit %g severity %s, want Re_lo %g below 350 (info)", f.Value, f.Limit, f.Severity, re)
	}
	if !strings.Contains(fs[0].Message, "Re_lo") || !strings.Contains(fs[0].Message, "from memory") {
		t.Errorf("message %q should name Re_lo and the source", fs[0].Message)
	}
	// The film (the default) has no stated range here, and R134a at about
	// 45 °C boils at p_r ≈ 0.3, inside Cooper's range.
	if fs := rangeFindings(rangeModelResult(t, "10 mm", "40 W", "")); len(fs) != 0 {
		t.Errorf("default methods: %+v", fs)
	}
}

// Friedel's multiplier in 3 mm tubes, below the 4 mm its data reach: one
// finding for each component that carries two-phase flow, none for the
// liquid downcomer. The condenser flows down, outside the upflow and
// horizontal flow Friedel was fitted to, and that is further outside
// (cos θ = 1 against 0.0872) than the bore (3 mm against 4 mm).
func TestFriedelSmallBore(t *testing.T) {
	cr := rangeModelResult(t, "3 mm", "150 W", "methods { friction friedel }")
	got := map[string]bool{}
	for _, f := range rangeFindings(cr) {
		want := [2]float64{0.003, 0.004}
		if f.Component == "k" {
			want = [2]float64{1, 0.0872}
		}
		if f.Correlation != "Friedel (1979)" || math.Abs(f.Value-want[0]) > 1e-12 || f.Limit != want[1] {
			t.Errorf("finding %+v, want value %g limit %g", f, want[0], want[1])
		}
		got[f.Component] = true
	}
	if !got["e"] || !got["up"] || !got["k"] || got["down"] || len(got) != 3 {
		t.Errorf("Friedel findings at %v, want e, up and k", got)
	}
	fs := rangeFindings(rangeModelResult(t, "5 mm", "150 W", "methods { friction friedel }"))
	if len(fs) != 1 || fs[0].Component != "k" {
		t.Errorf("5 mm bore: %+v, want only the downflow condenser", fs)
	}
}

// Lockhart & Martinelli's data are for horizontal pipes: every two-phase
// component of this vertical loop is outside them.
func TestLockhartMartinelliVertical(t *testing.T) {
	got := map[string]bool{}
	for _, f := range rangeFindings(rangeModelResult(t, "10 mm", "150 W", "methods { friction lockhart_martinelli }")) {
		if f.Correlation != "Lockhart & Martinelli (1949)" || math.Abs(f.Value-1) > 1e-12 || f.Limit != 0.0872 {
			t.Errorf("finding %+v", f)
		}
		got[f.Component] = true
	}
	if !got["e"] || !got["up"] || !got["k"] || got["down"] || len(got) != 3 {
		t.Errorf("Lockhart–Martinelli findings at %v, want e, up and k", got)
	}
}

// Katto & Ohno's L/D: a 0.2 m evaporator of 50 mm bore has L/D = 4, below
// the stated 5.
func TestKattoOhnoShortTube(t *testing.T) {
	cr := rangeModelResult(t, "50 mm", "150 W", "methods { chf katto_ohno }")
	fs := rangeFindings(cr)
	if len(fs) != 1 || fs[0].Component != "e" || fs[0].Correlation != "Katto & Ohno (1984)" ||
		math.Abs(fs[0].Value-4) > 1e-12 || fs[0].Limit != 5 {
		t.Errorf("findings %+v, want L/D 4 below 5 at e", fs)
	}
}
