package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// circa estimate carries the design guidance in text and JSON, and leaves
// it out on request.
func TestEstimateGuidance(t *testing.T) {
	const file = "../../testdata/examples/rack-door.loop"
	code, out, errs := runEstimateCmd(t, file, "--no-tilt")
	if code == exitUsage || !strings.Contains(out, "design guidance") || !strings.Contains(out, "param lift = 1.2 m: keeps every margin from") ||
		!strings.Contains(out, "charge of loop rack = 0.42 kg") || !strings.Contains(out, "biggest levers") {
		t.Fatalf("text: %d %q %q", code, out, errs)
	}
	_, out, _ = runEstimateCmd(t, file, "--no-tilt", "--no-guidance")
	if strings.Contains(out, "design guidance") {
		t.Errorf("--no-guidance printed guidance")
	}
	code, out, _ = runEstimateCmd(t, "--format", "json", "--no-tilt", file)
	var res struct {
		Loops    []json.RawMessage `json:"loops"`
		Guidance struct {
			Params []struct {
				Param      string `json:"param"`
				Unit       string `json:"unit"`
				Influences bool   `json:"influences"`
				Range      struct {
					Feasible bool `json:"feasible"`
					Low      struct {
						Value  float64 `json:"value"`
						Reason string  `json:"reason"`
					} `json:"low"`
				} `json:"range"`
				Sensitivities []struct {
					Margin  string  `json:"margin"`
					PerUnit float64 `json:"per_unit"`
				} `json:"sensitivities"`
			} `json:"params"`
			Loops []struct {
				Loop   string `json:"loop"`
				Charge *struct {
					Range struct {
						Feasible bool `json:"feasible"`
					} `json:"range"`
				} `json:"charge"`
			} `json:"loops"`
		} `json:"guidance"`
	}
	if err := json.Unmarshal([]byte(out), &res); err != nil || code == exitUsage {
		t.Fatalf("json: %d %v", code, err)
	}
	g := res.Guidance
	if len(res.Loops) != 1 || len(g.Params) != 2 || g.Params[0].Param != "lift" || g.Params[0].Unit != "m" || !g.Params[0].Influences ||
		!g.Params[0].Range.Feasible || g.Params[0].Range.Low.Reason == "" || len(g.Params[0].Sensitivities) == 0 {
		t.Errorf("guidance params %+v", g.Params)
	}
	if len(g.Loops) != 1 || g.Loops[0].Charge == nil || !g.Loops[0].Charge.Range.Feasible {
		t.Errorf("guidance loops %+v", g.Loops)
	}
	_, out, _ = runEstimateCmd(t, "--format", "csv", "--no-tilt", file)
	if strings.Contains(out, "guidance") {
		t.Errorf("csv carries guidance")
	}
}

// A file with errors gets neither an estimate nor guidance, and says so.
func TestEstimateGuidanceErrors(t *testing.T) {
	path := filepath.Join(t.TempDir(), "bad.loop")
	if err := os.WriteFile(path, []byte("param h = 2 kg\nloop l {\n  fluid water\n  node a at (0, 0, h)\n}\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	code, out, errs := runEstimateCmd(t, path)
	if code != exitFindings || out != "" || !strings.Contains(errs, "no design guidance") {
		t.Errorf("%d %q %q", code, out, errs)
	}
}
