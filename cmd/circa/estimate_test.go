package main

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func runEstimateCmd(t *testing.T, args ...string) (int, string, string) {
	t.Helper()
	var out, errb bytes.Buffer
	code := run(append([]string{"estimate"}, args...), strings.NewReader(""), &out, &errb)
	return code, out.String(), errb.String()
}

func TestEstimateFormats(t *testing.T) {
	const file = "../../testdata/examples/rack-door.loop"
	code, out, errs := runEstimateCmd(t, file, "--case", "hot_aisle", "--no-tilt")
	if code == exitUsage || !strings.Contains(out, "case hot_aisle") || !strings.Contains(out, "mass flow") ||
		!strings.Contains(out, "early design") || !strings.Contains(out, "local pressure-equipment codes") {
		t.Fatalf("text: %d %q %q", code, out, errs)
	}
	code, out, _ = runEstimateCmd(t, "--format", "json", "--no-tilt", file)
	var res struct {
		Cautions []string `json:"cautions"`
		Loops    []struct {
			Cases []struct {
				Case     string  `json:"case"`
				MassFlow float64 `json:"mass_flow"`
			} `json:"cases"`
		} `json:"loops"`
	}
	if err := json.Unmarshal([]byte(out), &res); err != nil || code == exitUsage {
		t.Fatalf("json: %d %v", code, err)
	}
	if len(res.Cautions) == 0 || len(res.Loops) != 1 || len(res.Loops[0].Cases) != 3 || !(res.Loops[0].Cases[0].MassFlow > 0) {
		t.Errorf("json result %+v", res)
	}
	_, out, _ = runEstimateCmd(t, file, "--format", "csv", "--no-tilt", "--void", "homogeneous", "--friction", "friedel")
	var body []string
	for _, l := range strings.Split(out, "\n") {
		if !strings.HasPrefix(l, "#") {
			body = append(body, l)
		}
	}
	rows, err := csv.NewReader(strings.NewReader(strings.Join(body, "\n"))).ReadAll()
	kinds := map[string]int{}
	for _, r := range rows[1:] {
		kinds[r[0]]++
	}
	// Three cases of four components, a total row each, and their margins.
	if err != nil || kinds["component"] != 3*4 || kinds["total"] != 3 || kinds["margin"] < 3 || len(rows) != 1+kinds["component"]+kinds["total"]+kinds["margin"] {
		t.Errorf("csv: %d rows %v, %v", len(rows), kinds, err)
	}
}

// TestEstimateCautions: every estimate, in text and JSON, carries the
// cautions for the results that can hurt someone: pressure, the fluid's
// ASHRAE 34 / ISO 817 safety class and hot surfaces, each deferring to
// local codes.
func TestEstimateCautions(t *testing.T) {
	const file = "../../testdata/examples/tram-inverter.loop"
	want := []string{"local pressure-equipment codes", "ASHRAE 34", "hot surfaces"}
	_, out, errs := runEstimateCmd(t, file, "--case", "fan_off", "--no-tilt", "--no-guidance")
	var text []string
	for _, l := range strings.Split(out, "\n") {
		if strings.HasPrefix(l, "caution: ") {
			text = append(text, l)
		}
	}
	_, js, _ := runEstimateCmd(t, "--format", "json", "--case", "fan_off", "--no-tilt", "--no-guidance", file)
	var res struct {
		Cautions []string `json:"cautions"`
	}
	if err := json.Unmarshal([]byte(js), &res); err != nil {
		t.Fatalf("json: %v", err)
	}
	for name, got := range map[string]string{"text": strings.Join(text, "\n"), "json": strings.Join(res.Cautions, "\n")} {
		for _, w := range want {
			if !strings.Contains(got, w) {
				t.Errorf("%s cautions do not mention %q:\n%s%s", name, w, got, errs)
			}
		}
		if !strings.Contains(got, "local codes") {
			t.Errorf("%s cautions do not defer to local codes:\n%s", name, got)
		}
	}
}

// TestEstimateFileErrors: a file with errors gets no estimate, and each
// error is printed as check prints it, located and with its rule, so that
// "circa explain RULE" can be looked up.
func TestEstimateFileErrors(t *testing.T) {
	dir := t.TempDir()
	file := filepath.Join(dir, "bad.loop")
	src := "loop l {\n  fluid water\n  node a at (0, 0, 0) m\n  node b at (0, 0, 1) furlong\n}\n"
	if err := os.WriteFile(file, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	code, out, errs := runEstimateCmd(t, file)
	want := file + `:4:23: error: unknown unit "furlong" [unit]`
	if code != exitFindings || out != "" || !strings.Contains(errs, want+"\n") || !strings.Contains(errs, "no estimate") {
		t.Errorf("estimate of a file with errors: %d %q %q, want the line %q", code, out, errs, want)
	}
}

func TestEstimateUsage(t *testing.T) {
	for _, args := range [][]string{{}, {"--format", "xml", "x.loop"}, {"../../testdata/examples/rack-door.loop", "--case", "nope"},
		{"../../testdata/examples/rack-door.loop", "--void", "nope"}} {
		if code, _, _ := runEstimateCmd(t, args...); code != exitUsage {
			t.Errorf("estimate %v = %d, want %d", args, code, exitUsage)
		}
	}
}

// A sweep of accelerations adds grid points with the acceleration in m/s²
// (one standard gravity is 9.80665 m/s² exactly, CGPM 1901), and the flow
// follows the body force b = g − a.
func TestEstimateSweepAccel(t *testing.T) {
	const file = "../../testdata/examples/forestry-inverter.loop"
	code, out, errs := runEstimateCmd(t, file, "--case", "level_work", "--no-tilt", "--format", "json", "--sweep-accel", "0.5,0,0;-0.5,0,0")
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var res struct {
		Loops []struct {
			Cases []struct {
				Grid     bool       `json:"grid"`
				Accel    [3]float64 `json:"accel"`
				MassFlow float64    `json:"mass_flow"`
			} `json:"cases"`
		} `json:"loops"`
	}
	if err := json.Unmarshal([]byte(out), &res); err != nil {
		t.Fatal(err)
	}
	cs := res.Loops[0].Cases
	if len(cs) != 3 || cs[0].Grid || !cs[1].Grid || !cs[2].Grid {
		t.Fatalf("want the case and two grid points, got %+v", cs)
	}
	if got, want := cs[1].Accel[0], 0.5*9.80665; got != want {
		t.Errorf("grid acceleration %g m/s², want %g", got, want)
	}
	// The roof condenser sits behind the plate (−x). Accelerating forward
	// (+x) tilts the body force backward, as a nose-up pitch does, which
	// lowers the condenser along it: less flow. Braking does the opposite.
	if !(cs[1].MassFlow < cs[0].MassFlow && cs[2].MassFlow > cs[0].MassFlow) {
		t.Errorf("mass flow accelerating %g, steady %g, braking %g: want accelerating < steady < braking", cs[1].MassFlow, cs[0].MassFlow, cs[2].MassFlow)
	}
	if code, _, errs := runEstimateCmd(t, file, "--sweep-accel", "1,2"); code != exitUsage || !strings.Contains(errs, "AX,AY,AZ") {
		t.Errorf("bad --sweep-accel: exit %d, %q", code, errs)
	}
}

// TestNoLoop: a file without a loop (a parts file, an empty file) says so
// instead of printing cautions over nothing: the estimate in its text and
// plot on standard error, with a failing status since no figure is drawn.
func TestNoLoop(t *testing.T) {
	file := filepath.Join(t.TempDir(), "parts.loop")
	if err := os.WriteFile(file, []byte("part tube { bore 10 mm }\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	code, out, errs := runEstimateCmd(t, file, "--no-guidance")
	if code != exitOK || !strings.Contains(out, "the file has no loop: no estimate was made") {
		t.Errorf("estimate of a file without a loop: %d %q %q", code, out, errs)
	}
	var pout, perr bytes.Buffer
	code = run([]string{"plot", file, "--out", t.TempDir()}, strings.NewReader(""), &pout, &perr)
	if code != exitFindings || pout.Len() != 0 || !strings.Contains(perr.String(), "has no loop: no figures") {
		t.Errorf("plot of a file without a loop: %d %q %q", code, pout.String(), perr.String())
	}
}
