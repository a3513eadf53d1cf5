package flow

import (
	"fmt"
	"math"
	"strings"
	"testing"
)

// caseNamed returns the result of case name in the only loop of r.
func caseNamed(t *testing.T, r *Result, name string) *CaseResult {
	t.Helper()
	for i := range r.Loops[0].Cases {
		if c := &r.Loops[0].Cases[i]; c.Case == name {
			return c
		}
	}
	t.Fatalf("no case %s in %+v", name, r.Loops[0].Cases)
	return nil
}

// A manoeuvre held constant is the constant case at every instant: the same
// flow and every margin the same to the last bit (the tilt search, which
// only the case's own attitude gets, aside).
func TestProfileHeldConstant(t *testing.T) {
	src := strings.ReplaceAll(ring, "HEAT", "300 W") + `
case held { heat evap 300 W; pitch 4 deg; roll -3 deg; accel (0.1, 0.05, 0) gn }
case moving {
  heat evap 300 W
  roll -3 deg
  profile {
    columns time pitch accel_x accel_y
    row 0 s 4 deg 0.1 gn 0.05 gn
    row 10 s 4 deg 0.1 gn 0.05 gn
    row 1 min 4 deg 0.1 gn 0.05 gn
  }
}
`
	r := estimate(t, load(t, src), Options{NoTilt: true})
	held, moving := caseNamed(t, r, "held"), caseNamed(t, r, "moving")
	if !held.Circulates || moving.Profile == nil || len(moving.Profile.Instants) != 3 {
		t.Fatalf("held circulates %v; profile %+v", held.Circulates, moving.Profile)
	}
	want := map[string]Margin{}
	for _, m := range held.Margins {
		want[m.Margin+"/"+m.Component] = m
	}
	for _, in := range moving.Profile.Instants {
		if in.MassFlow != held.MassFlow || in.BodyForce != held.BodyForce {
			t.Errorf("t = %g s: mass flow %v, body force %v; held %v, %v", in.Time, in.MassFlow, in.BodyForce, held.MassFlow, held.BodyForce)
		}
		if len(in.Margins) != len(held.Margins) {
			t.Errorf("t = %g s: %d margins, held %d", in.Time, len(in.Margins), len(held.Margins))
		}
		for _, m := range in.Margins {
			w, ok := want[m.Margin+"/"+m.Component]
			if !ok || m.Value != w.Value || m.Use != w.Use || m.Status != w.Status {
				t.Errorf("t = %g s: margin %s %s = %v (use %v), held %v (use %v)", in.Time, m.Margin, m.Component, m.Value, m.Use, w.Value, w.Use)
			}
		}
	}
	for _, m := range moving.Profile.Worst {
		if w := want[m.Margin+"/"+m.Component]; m.Value != w.Value || *m.Time != 0 {
			t.Errorf("worst %s at t = %g s: %v, held %v (ties go to the first instant)", m.Margin, *m.Time, m.Value, w.Value)
		}
	}
	if len(moving.Profile.Fast) != 0 || hasFinding(moving.Findings, RuleManoeuvre, "") {
		t.Errorf("a held manoeuvre is flagged as fast: %+v", moving.Profile.Fast)
	}
}

// The worst instant of a profile is the constant case at that instant's
// attitude, and a step is flagged as faster than the loop while a ramp far
// slower than the fluid's transit is not.
func TestProfileWorstAndRate(t *testing.T) {
	base := estimate(t, ringModel(t, "300 W"), Options{NoTilt: true})
	tau := only(t, base).Totals.Transit
	if !(tau > 0) {
		t.Fatalf("no transit time: %+v", only(t, base).Totals)
	}
	slow := 50 * tau
	src := strings.ReplaceAll(ring, "HEAT", "300 W") + fmt.Sprintf(`
case tipped { heat evap 300 W; pitch 25 deg }
case step {
  heat evap 300 W
  profile {
    columns time pitch
    row 0 s 0 deg
    row 5 s 0 deg
    row 5.01 s 25 deg
    row 30 s 25 deg
  }
}
case ramp {
  heat evap 300 W
  profile {
    columns time pitch
    row 0 s 0 deg
    row %g s 12 deg
    row %g s 25 deg
  }
}
`, slow/2, slow)
	r := estimate(t, load(t, src), Options{NoTilt: true})
	tipped, step, ramp := caseNamed(t, r, "tipped"), caseNamed(t, r, "step"), caseNamed(t, r, "ramp")
	if step.Profile == nil || ramp.Profile == nil {
		t.Fatal("no profile results")
	}
	var xq *Margin
	for i, m := range tipped.Margins {
		if m.Margin == MarginExitQuality {
			xq = &tipped.Margins[i]
		}
	}
	if xq == nil {
		t.Fatalf("tipped has no exit quality margin: %+v", tipped.Margins)
	}
	// Pitching the evaporator–condenser column shortens its height, so the
	// flow falls and the exit quality rises: the tipped instants are worst.
	for _, m := range step.Profile.Worst {
		if m.Margin == MarginExitQuality && (m.Value != xq.Value || *m.Time != 5.01) {
			t.Errorf("worst exit quality %v at t = %g s; want %v (case tipped) at 5.01 s", m.Value, *m.Time, xq.Value)
		}
	}
	if len(step.Profile.Fast) != 1 {
		t.Fatalf("step: fast changes %+v, want the one at 5 s", step.Profile.Fast)
	}
	fc := step.Profile.Fast[0]
	// |Δb| of a 25° pitch step at 1 g: 2 sin(12.5°) g = 0.4329 g.
	if fc.From != 5 || fc.To != 5.01 || math.Abs(fc.Change/gn-2*math.Sin(12.5*math.Pi/180)) > 1e-9 || !(fc.Transit > 0.01) {
		t.Errorf("step change %+v", fc)
	}
	if !hasFinding(step.Findings, RuleManoeuvre, "") {
		t.Errorf("no %s finding: %+v", RuleManoeuvre, step.Findings)
	}
	if len(ramp.Profile.Fast) != 0 {
		t.Errorf("a ramp over 50 transit times (%.3g s) is flagged: %+v", slow, ramp.Profile.Fast)
	}
	found := false
	for _, c := range r.Cautions {
		found = found || c == CautionManoeuvre
	}
	if !found {
		t.Errorf("no manoeuvre caution in %q", r.Cautions)
	}
}

// A sweep's points lie between a case and its profile's instants: the
// profile still belongs to the case's own result, not to a sweep point.
func TestProfileWithSweep(t *testing.T) {
	src := strings.ReplaceAll(ring, "HEAT", "300 W") + `
case moving {
  heat evap 300 W
  profile {
    columns time pitch
    row 0 s 0 deg
    row 60 s 5 deg
  }
}
`
	r := estimate(t, load(t, src), Options{Case: "moving", NoTilt: true, Sweep: &Sweep{Roll: []float64{0.1, 0.2}}})
	cs := r.Loops[0].Cases
	if len(cs) != 3 || cs[0].Grid || !cs[1].Grid || !cs[2].Grid {
		t.Fatalf("want the case and two sweep points, got %d results", len(cs))
	}
	if cs[0].Profile == nil || len(cs[0].Profile.Instants) != 2 || cs[1].Profile != nil || cs[2].Profile != nil {
		t.Errorf("profile on the wrong result: %v %v %v", cs[0].Profile != nil, cs[1].Profile != nil, cs[2].Profile != nil)
	}
}

// Evaluating a profile costs one steady state per distinct row.
func BenchmarkProfile(b *testing.B) {
	var rows strings.Builder
	for i := 0; i < 50; i++ {
		fmt.Fprintf(&rows, "    row %d s %g deg %g gn\n", 10*i, 10*math.Sin(float64(i)/5), 0.2*math.Cos(float64(i)/7))
	}
	m := load(b, strings.ReplaceAll(ring, "HEAT", "300 W")+"case drive {\n  heat evap 300 W\n  profile {\n    columns time pitch accel_y\n"+rows.String()+"  }\n}\n")
	b.ReportAllocs()
	for i := 0; i < b.N; i++ {
		if _, err := Estimate(m, Options{Case: "drive", NoTilt: true}); err != nil {
			b.Fatal(err)
		}
	}
}

// The ends of a fast change are written with the figures that tell them
// apart.
func TestSecPair(t *testing.T) {
	for _, tc := range []struct {
		a, b     float64
		from, to string
	}{
		{30, 30.01, "30", "30.01"},
		{5, 5.01, "5", "5.01"},
		{12.5, 40, "12.5", "40"},
		{1234.5, 1234.6, "1234.5", "1234.6"},
		{7, 7, "7", "7"},
	} {
		if from, to := secPair(tc.a, tc.b); from != tc.from || to != tc.to {
			t.Errorf("%g, %g: %q, %q; want %q, %q", tc.a, tc.b, from, to, tc.from, tc.to)
		}
	}
}
