package flow

import (
	"encoding/json"
	"flag"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"circa/lang"
)

var updateSingle = flag.Bool("update", false, "rewrite testdata/single-state golden files")

// TestSingleStateGolden: the single saturation state estimates the
// examples (copies in testdata/single-state/loops, frozen so that editing
// an example does not touch this test) as it did before local saturation
// reached networks. It compares the operating point of every case: flows,
// saturation state, balances, component states and totals, every number to
// 1e-12 relative (1e-7 absolute for the closure residuals, which are
// rounding noise of a few nPa) so that a change of summation order
// elsewhere does not fail it, and fields added since are ignored. The golden files hold
// those estimates (written by that version, the examples' own
// saturation_state local read as single);
// -update rewrites them, which should only follow a deliberate change of the
// single-state model.
func TestSingleStateGolden(t *testing.T) {
	files, _ := filepath.Glob("testdata/single-state/loops/*.loop")
	if len(files) == 0 {
		t.Fatal("no examples")
	}
	for _, f := range files {
		src, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		text := strings.ReplaceAll(string(src), "saturation_state local", "saturation_state single")
		m := lang.LoadSource(f, []byte(text), lang.OSFS{})
		r := estimate(t, m, Options{NoTilt: true, Saturation: "single"})
		got, _ := json.MarshalIndent(operatingPoints(r), "", " ")
		got = append(got, '\n')
		golden := filepath.Join("testdata", "single-state", strings.TrimSuffix(filepath.Base(f), ".loop")+".json")
		if *updateSingle {
			if err := os.MkdirAll(filepath.Dir(golden), 0o755); err != nil {
				t.Fatal(err)
			}
			if err := os.WriteFile(golden, got, 0o644); err != nil {
				t.Fatal(err)
			}
			continue
		}
		want, err := os.ReadFile(golden)
		if err != nil {
			t.Fatal(err)
		}
		var a, b any
		if err := json.Unmarshal(got, &a); err != nil {
			t.Fatal(err)
		}
		if err := json.Unmarshal(want, &b); err != nil {
			t.Fatal(err)
		}
		if path := sameJSON(a, b, ""); path != "" {
			t.Errorf("%s: the single saturation state no longer reproduces %s at %s", filepath.Base(f), golden, path)
		}
	}
}

// operatingPoint is what the golden files hold of a case.
type operatingPoint struct {
	Loop, Case     string
	Circulates     bool
	MassFlow       float64
	SatTemperature float64
	SatPressure    float64
	Roots          []Root
	Components     []ComponentState
	Totals         Totals
}

func operatingPoints(r *Result) []operatingPoint {
	var out []operatingPoint
	for _, l := range r.Loops {
		for _, c := range l.Cases {
			out = append(out, operatingPoint{Loop: l.Loop, Case: c.Case, Circulates: c.Circulates, MassFlow: c.MassFlow,
				SatTemperature: c.SatTemperature, SatPressure: c.SatPressure, Roots: c.Roots, Components: c.Components, Totals: c.Totals})
		}
	}
	return out
}

// sameJSON compares decoded JSON values, numbers within 1e-12 relative plus
// 1e-7 absolute, objects over the keys of want b; it returns the path of
// the first difference, "" if none.
func sameJSON(a, b any, path string) string {
	switch av := a.(type) {
	case map[string]any:
		bv, ok := b.(map[string]any)
		if !ok {
			return path
		}
		for k, w := range bv { // fields added since the golden file are ignored
			v, ok := av[k]
			if !ok {
				return path + "." + k + " (missing)"
			}
			if d := sameJSON(v, w, path+"."+k); d != "" {
				return d
			}
		}
	case []any:
		bv, ok := b.([]any)
		if !ok || len(av) != len(bv) {
			return path
		}
		for i := range av {
			if d := sameJSON(av[i], bv[i], fmt.Sprintf("%s[%d]", path, i)); d != "" {
				return d
			}
		}
	case float64:
		bv, ok := b.(float64)
		if !ok || math.Abs(av-bv) > 1e-12*math.Max(math.Abs(av), math.Abs(bv))+1e-7 {
			return fmt.Sprintf("%s (%v, want %v)", path, a, b)
		}
	default:
		if a != b {
			return fmt.Sprintf("%s (%v, want %v)", path, a, b)
		}
	}
	return ""
}
