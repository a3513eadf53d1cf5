package guide

import (
	"context"
	"math"
	"os"
	"strconv"
	"strings"
	"testing"

	"circa/check/flow"
	"circa/lang"
)

// fdUses estimates the file with the parameter's text "param NAME = OLD"
// replaced by the value v written in unit, and returns every margin's use.
func fdUses(t *testing.T, path, src, decl, name string, v float64, unit string) margins {
	t.Helper()
	text := strings.Replace(src, decl, "param "+name+" = "+strconv.FormatFloat(v, 'g', -1, 64)+" "+unit, 1)
	if text == src {
		t.Fatalf("%s: no %q", path, decl)
	}
	m := lang.LoadSource(path, []byte(text), lang.OSFS{})
	for _, d := range m.Diags {
		if d.Severity == lang.Error {
			t.Fatalf("%s", d.Message())
		}
	}
	res, err := flow.Estimate(m, flow.Options{})
	if err != nil {
		t.Fatal(err)
	}
	_, ms := summarize(res, v, nil)
	return ms
}

// TestSensitivitiesAgainstDifferences checks each reported sensitivity
// against a central difference of the estimate taken through the file's
// text (the parameter rewritten, the file resolved and estimated afresh),
// with twice the guidance's step, within 1 %.
func TestSensitivitiesAgainstDifferences(t *testing.T) {
	for _, tc := range []struct {
		path, decl, name string
		x0               float64
		unit             string
	}{
		{"../../testdata/examples/forestry-inverter.loop", "param roof = 0.9 m", "roof", 0.9, "m"},
		{"../../testdata/examples/tram-inverter.loop", "param lift = 0.9 m", "lift", 0.9, "m"},
	} {
		src, err := os.ReadFile(tc.path)
		if err != nil {
			t.Fatal(err)
		}
		m := lang.LoadSource(tc.path, src, lang.OSFS{})
		g, err := Compute(context.Background(), m, Options{Params: []string{tc.name}})
		if err != nil {
			t.Fatal(err)
		}
		p := paramOf(t, g, tc.name)
		if len(p.Sensitivities) == 0 {
			t.Fatalf("%s: no sensitivities", tc.name)
		}
		h := 2 * sensStep * tc.x0
		up := fdUses(t, tc.path, string(src), tc.decl, tc.name, tc.x0+h, tc.unit)
		down := fdUses(t, tc.path, string(src), tc.decl, tc.name, tc.x0-h, tc.unit)
		checked := 0
		for _, s := range p.Sensitivities {
			d := (up[s.Where] - down[s.Where]) / (2 * h)
			t.Logf("%s %v: %g per %s, difference %g", tc.name, s.Where, s.PerUnit, s.Unit, d)
			if s.Unit != tc.unit {
				t.Errorf("%s: unit %q, want %q", tc.name, s.Unit, tc.unit)
			}
			if s.Coarse {
				// Below the margin's own resolution (the tilt limit's
				// 0.02°): flagged, and not held to 1 %.
				if s.Margin != flow.MarginTilt {
					t.Errorf("%s: coarse", s.Where.Describe())
				}
				continue
			}
			if math.Abs(s.PerUnit-d) > 0.01*math.Abs(d) {
				t.Errorf("%s %s: %g per %s, central difference %g", tc.name, s.Where.Describe(), s.PerUnit, s.Unit, d)
			}
			if math.Abs(s.PerTenPercent-0.1*tc.x0*s.PerUnit) > 1e-12 {
				t.Errorf("per 10 %%: %g, want %g", s.PerTenPercent, 0.1*tc.x0*s.PerUnit)
			}
			checked++
		}
		if checked < 4 {
			t.Errorf("%s: only %d sensitivities checked", tc.name, checked)
		}
		for i := 1; i < len(p.Sensitivities); i++ {
			if math.Abs(p.Sensitivities[i].PerTenPercent) > math.Abs(p.Sensitivities[i-1].PerTenPercent) {
				t.Errorf("not ranked: %v after %v", p.Sensitivities[i], p.Sensitivities[i-1])
			}
		}
	}
}
