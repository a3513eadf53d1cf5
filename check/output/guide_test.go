package output

import (
	"bytes"
	"encoding/json"
	"strings"
	"testing"

	"circa/check/flow"
	"circa/check/guide"
)

func TestRangeText(t *testing.T) {
	eq := guide.Where{Margin: flow.MarginExitQuality, Case: "hot", Component: "plate"}
	for _, tc := range []struct {
		r    *guide.Range
		want []string
	}{
		{&guide.Range{Feasible: true, Contains: true,
			Low:  &guide.Bound{Value: 0.0092, Limit: eq, Reason: "exit quality at plate in case hot reaches its limit"},
			High: &guide.Bound{Value: 0.021, Stop: guide.StopNoCirculation, Reason: "no circulation in case cold: ..."}},
			[]string{"from 9.20 mm (below: exit quality at plate in case hot reaches its limit)", "to 21.0 mm (above: no circulation in case cold"}},
		{&guide.Range{Feasible: true, Contains: false, Use: 1.3, Limit: eq,
			Low:  &guide.Bound{Value: 0.0001, Unbounded: true},
			High: &guide.Bound{Value: 0.008, Limit: eq, Reason: "r"}},
			[]string{"up to 8.00 mm (above: r)", "no limit down to 0.100 mm (the farthest searched)", "outside: exit quality at plate in case hot uses 1.3 of its limit"}},
		{&guide.Range{Reason: "no value searched keeps every margin", Best: &guide.Nearest{Value: 0.012, Use: 1.1, Limit: eq}},
			[]string{"no value searched keeps every margin; closest at 12.0 mm, where exit quality at plate in case hot uses 1.1 of its limit"}},
	} {
		got := RangeText(tc.r, "mm")
		for _, w := range tc.want {
			if !strings.Contains(got, w) {
				t.Errorf("%q lacks %q", got, w)
			}
		}
	}
}

func TestGuidanceOutputs(t *testing.T) {
	g := &guide.Guidance{Params: []guide.Param{
		{Param: "label", Value: 2, Unit: "m"},
		{Param: "riser_bore", Value: 0.01, Unit: "mm", Influences: true, Range: &guide.Range{Feasible: true, Contains: true,
			Low: &guide.Bound{Value: 0.0092, Reason: "a"}, High: &guide.Bound{Value: 0.021, Reason: "b"}},
			Sensitivities: []guide.Sensitivity{{Where: guide.Where{Margin: flow.MarginExitQuality, Case: "hot"}, PerUnit: -0.05, Unit: "mm", PerTenPercent: -0.05}}},
	}}
	g.Use, g.Limit = 1.2, guide.Where{Margin: flow.MarginExitQuality, Case: "hot"}
	g.Levers = []guide.Lever{{Param: "riser_bore", Sensitivity: g.Params[1].Sensitivities[0]}}
	var b bytes.Buffer
	if err := GuidanceText(&b, g, nil); err != nil {
		t.Fatal(err)
	}
	for _, w := range []string{"param label = 2 m: influences no estimate",
		"the limiting margin, exit quality in case hot (use 1.2), moves with: riser_bore -0.05 per 10 %", "param riser_bore = 10 mm: keeps every margin from 9.20 mm", "exit quality in case hot -0.05"} {
		if !strings.Contains(b.String(), w) {
			t.Errorf("text lacks %q:\n%s", w, b.String())
		}
	}
	b.Reset()
	if err := GuidanceText(&b, &guide.Guidance{Message: "the file has errors: no design guidance until they are fixed"}, nil); err != nil || !strings.Contains(b.String(), "no design guidance") {
		t.Errorf("%q %v", b.String(), err)
	}
	b.Reset()
	if err := EstimateGuidedJSON(&b, &flow.Result{Cautions: []string{"c"}}, g); err != nil {
		t.Fatal(err)
	}
	var doc map[string]json.RawMessage
	if err := json.Unmarshal(b.Bytes(), &doc); err != nil || doc["cautions"] == nil || doc["guidance"] == nil {
		t.Errorf("json %s: %v", b.String(), err)
	}
}
