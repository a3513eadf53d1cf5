package check

import (
	"strings"
	"testing"

	"circa/check/flow"
	"circa/lang"
	"circa/lang/loopgen"
)

// plateLoop is a small R1234yf loop of one plate evaporator whose load the
// tests set in their cases.
const plateLoop = `
loop r {
  fluid R1234yf
  node a at (0, 0, 0) m
  node b at (0, 0, 0.3) m
  node c at (0, 0, 1.3) m
  node d at (-0.3, 0, 1.3) m
  evaporator plate from a to b { length 0.3 m; bore 10 mm; wetted_area 0.01 m2 }
  pipe riser from b to c { length 1 m; bore 12 mm; loss 1 }
  condenser coil from c to d { length 0.3 m; bore 10 mm; conductance 150 W/K; sink 25 degC }
  pipe down from d to a { length 1.5 m; run (0.3, 0, -1.3) m; bore 8 mm; loss 1 }
}
`

// An overloaded evaporator gives an exit-quality finding at the component,
// with the case and the written limit as related locations.
func TestMarginFindings(t *testing.T) {
	src := plateLoop + `limits { exit_quality 0.1 }
case overload { heat plate 3 kW }
`
	m := lang.LoadSource("t.loop", []byte(src), lang.OSFS{})
	ds := Run(m, Options{})
	var exit, safety *lang.Diagnostic
	for i, d := range ds {
		switch d.Rule {
		case "margin-exit-quality":
			exit = &ds[i]
		case "fluid-safety":
			safety = &ds[i]
		}
	}
	if exit == nil {
		t.Fatalf("no exit-quality finding in %v", ds)
	}
	if got := src[exit.Loc.Span.Start:exit.Loc.Span.End]; got != "plate" {
		t.Errorf("finding at %q, want the component name", got)
	}
	if !strings.Contains(exit.Message(), "overload") || !strings.Contains(exit.Message(), "the limit 0.100 ") {
		t.Errorf("message %q lacks the case or the limit", exit.Message())
	}
	if len(exit.Related) != 2 {
		t.Errorf("related %v, want the case and the limit", exit.Related)
	}
	// R1234yf is class A2L (ASHRAE 34).
	if safety == nil || safety.Severity != lang.Info {
		t.Errorf("no info finding for the A2L fluid: %v", safety)
	}
	// SkipEstimates leaves the margins out.
	for _, d := range Run(m, Options{SkipEstimates: true}) {
		if strings.HasPrefix(d.Rule, "margin-") {
			t.Errorf("margin finding with SkipEstimates: %s", d.Message())
		}
	}
}

// NoTilt keeps every margin but the tilt margin: a case pitched close to
// the loop's critical angle warns only when the search runs.
func TestMarginsNoTilt(t *testing.T) {
	src := `
loop r {
  fluid R134a
  node a at (0, 0, 0) m
  node b at (0, 0, 0.3) m
  node c at (-1, 0, 0.5) m
  node d at (-1.2, 0, 0.4) m
  evaporator plate from a to b { length 0.3 m; bore 10 mm; wetted_area 0.01 m2 }
  pipe riser from b to c { length 1.2 m; bore 12 mm }
  condenser coil from c to d { length 0.3 m; bore 10 mm; conductance 150 W/K; sink 25 degC }
  pipe down from d to a { length 1.5 m; bore 10 mm }
}
limits { exit_quality 0.01; tilt_margin 30 deg }
case climb { heat plate 500 W; pitch -10 deg }
`
	m := lang.LoadSource("t.loop", []byte(src), lang.OSFS{})
	rules := func(ds []lang.Diagnostic) map[string]bool {
		out := map[string]bool{}
		for _, d := range ds {
			out[d.Rule] = true
		}
		return out
	}
	full := rules(Run(m, Options{}))
	if !full["margin-tilt"] || !full["margin-exit-quality"] {
		t.Fatalf("full run lacks the tilt or exit-quality margin: %v", full)
	}
	m = lang.LoadSource("t.loop", []byte(src), lang.OSFS{})
	quick := rules(Run(m, Options{NoTilt: true}))
	if quick["margin-tilt"] {
		t.Error("tilt margin reported with NoTilt")
	}
	if !quick["margin-exit-quality"] {
		t.Error("exit-quality margin lost with NoTilt")
	}
	// One fact, one number: with the estimate's tilt search the case's tilt
	// margin comes from margin-tilt alone; without it, from the geometric
	// tilt-margin rule.
	if full["tilt-margin"] {
		t.Error("tilt-margin repeats margin-tilt with a different angle")
	}
	if !quick["tilt-margin"] {
		t.Error("no geometric tilt-margin without the tilt search")
	}
}

// A caller's estimate is what the margin rules report: the same findings
// as the rules' own estimate, and nothing of their own when it differs.
func TestMarginsSharedEstimate(t *testing.T) {
	m := lang.Load("../testdata/examples/ferry-cabinet.loop", lang.OSFS{})
	own := Run(m, Options{})
	est, err := flow.Estimate(m, flow.Options{})
	if err != nil {
		t.Fatal(err)
	}
	shared := Run(m, Options{Estimate: est})
	if len(own) != len(shared) {
		t.Fatalf("%d findings with the rules' estimate, %d with the caller's", len(own), len(shared))
	}
	for i := range own {
		if own[i].Rule != shared[i].Rule || own[i].Message() != shared[i].Message() || own[i].Loc != shared[i].Loc {
			t.Errorf("finding %d: %s %q, with the caller's estimate %s %q", i, own[i].Rule, own[i].Message(), shared[i].Rule, shared[i].Message())
		}
	}
	// An estimate without findings silences the margin rules: they did not
	// run their own.
	for i := range est.Loops {
		est.Loops[i].Findings = nil
		for j := range est.Loops[i].Cases {
			est.Loops[i].Cases[j].Findings = nil
		}
	}
	for _, d := range Run(m, Options{Estimate: est}) {
		if r, ok := Lookup(d.Rule); ok && r.Category == CategoryMargin {
			t.Errorf("margin finding %s %q from an estimate that has none", d.Rule, d.Message())
		}
	}
}

// The summary's margin texts give values in the units the file wrote, and
// one measure of how far inside or past the limit they are.
func TestMarginTexts(t *testing.T) {
	m := lang.Load("../testdata/examples/rack-door.loop", lang.OSFS{})
	rep := RunReport(m, Options{NoTilt: true})
	texts := map[string]string{}
	for _, mg := range rep.Margins {
		texts[mg.Rule] = mg.Message
	}
	// The example writes design_pressure 4 bar(g) and wall_limit 80 °C;
	// they print to three figures, as the values beside them do.
	if s := texts["margin-design-pressure"]; !strings.Contains(s, "bar(g)") || !strings.Contains(s, "4.00 bar(g): ") || !strings.Contains(s, "% of the limit") {
		t.Errorf("design pressure margin %q", s)
	}
	if s := texts["margin-wall-temperature"]; !strings.Contains(s, "limit 80.0 °C") || !strings.Contains(s, "K to spare") {
		t.Errorf("wall margin %q", s)
	}
	if s := texts["margin-chf"]; !strings.Contains(s, "times the minimum") {
		t.Errorf("chf margin %q", s)
	}
	for rule, s := range texts {
		if strings.Contains(s, "Inf") || strings.Contains(s, "e+0") {
			t.Errorf("%s: raw number in %q", rule, s)
		}
	}
}

// A profile read from a CSV file: a finding at one of its instants, and
// its step faster than the loop, point into the table at the row's time,
// as well as at the profile statement and the case.
func TestProfileTableRowLocations(t *testing.T) {
	src := plateLoop + `limits { exit_quality 0.45 }
case overload {
  heat plate 3 kW
  profile "drive.csv"
}
`
	table := "time (s), pitch (deg)\n0, 0\n30, 0\n30.01, 60\n60, 60\n"
	m := lang.LoadSource("t.loop", []byte(src), lang.Overlay{"drive.csv": []byte(table)})
	if len(m.Diags) != 0 {
		t.Fatalf("findings: %v", m.Diags)
	}
	var exit, fast *lang.Diagnostic
	ds := Run(m, Options{NoTilt: true})
	for i, d := range ds {
		switch d.Rule {
		case "margin-exit-quality":
			exit = &ds[i]
		case flow.RuleManoeuvre:
			fast = &ds[i]
		}
	}
	if exit == nil || fast == nil {
		t.Fatalf("want an exit-quality and a manoeuvre finding, got %v", ds)
	}
	// Pitched 60°, the column is shorter and the flow falls: the exit
	// quality passes its limit first at the row of 30.01 s, where the step
	// ends too.
	for _, tc := range []struct {
		d   *lang.Diagnostic
		msg string
	}{{exit, "the instant of the profile"}, {fast, "the row of the profile's table"}} {
		found := false
		for _, r := range tc.d.Related {
			if r.Message != tc.msg {
				continue
			}
			found = true
			if r.Loc.File != "drive.csv" || table[r.Loc.Span.Start:r.Loc.Span.End] != "30.01" {
				t.Errorf("%s: %q at %s %q, want drive.csv \"30.01\"", tc.d.Rule, r.Message, r.Loc.File, table[r.Loc.Span.Start:r.Loc.Span.End])
			}
		}
		if !found {
			t.Errorf("%s: no %q among %v", tc.d.Rule, tc.msg, tc.d.Related)
		}
	}
	if got := src[fast.Loc.Span.Start:fast.Loc.Span.End]; got != `"drive.csv"` {
		t.Errorf("manoeuvre finding at %q, want the profile's table name", got)
	}
}

// A network of more independent cycles than the estimate takes is told so,
// at the loop, and not estimated; the structural rules still run.
func TestEstimateTooLarge(t *testing.T) {
	m := lang.LoadSource("net.loop", loopgen.Network(flow.MaxEstimateCycles+4, flow.MaxEstimateCycles+1), nil)
	var found int
	for _, d := range Run(m, Options{NoTilt: true}) {
		switch d.Rule {
		case flow.RuleTooLarge:
			found++
			if !strings.Contains(d.Message(), "network too large for the estimate: loop net has 10001 independent cycles") ||
				!strings.Contains(d.Message(), "the estimate was skipped") {
				t.Errorf("message: %s", d.Message())
			}
			if d.Loc.File != "net.loop" || d.Severity != lang.Warning {
				t.Errorf("at %s:%v, severity %v", d.Loc.File, d.Loc.Span, d.Severity)
			}
		case flow.RuleNoCirculation, flow.RuleConverge:
			t.Errorf("estimated anyway: %s", d.Message())
		}
	}
	if found != 1 {
		t.Errorf("%d too-large findings, want 1", found)
	}
}

// A condenser margin checked against the top of the fluid's range, for
// want of a saturation_max, says so and gives that top as the fluid list
// does: water's 646 K is 372.85 °C, 1.096 K below the critical point
// 647.096 K (IAPWS R7-97(2012) IF97; python3-iapws gives Tc = 647.096 K).
// "allowed 373 °C" read as a design limit, and as the critical point.
func TestCondenserMarginNamesFluidRange(t *testing.T) {
	m := lang.Load("../testdata/examples/shelter-rectifier.loop", lang.OSFS{})
	rep := RunReport(m, Options{NoTilt: true})
	found := false
	for _, mg := range rep.Margins {
		if mg.Rule != "margin-condenser" {
			continue
		}
		found = true
		if !strings.Contains(mg.Message, "below 372.85 °C, the top of water's property range (1.10 K below its critical point, 373.95 °C): ") || strings.Contains(mg.Message, "allowed") {
			t.Errorf("condenser margin %q", mg.Message)
		}
	}
	if !found {
		t.Fatal("no condenser margin in the summary")
	}
}
