package flow

import (
	"math"
	"strings"
	"testing"
)

// The device's heat crosses its stack in series above the boiling wall.
// By hand, at 300 W through 0.05 + 0.02 + 0.01 = 0.08 K/W:
// junction = wall + 300 × 0.08 = wall + 24 K, and the device case sits
// below junction_to_case: case = wall + 300 × (0.02 + 0.01) = wall + 9 K.
// At 450 W (the hot case) the junction is wall + 450 × 0.08 = wall + 36 K.
func TestJunctionStack(t *testing.T) {
	src := strings.Replace(strings.ReplaceAll(ring, "HEAT", "300 W"), "wall_limit 90 degC }",
		"wall_limit 90 degC; junction_to_case 0.05 K/W; interface_resistance 0.02 K/W; spreading_resistance 0.01 K/W; junction_limit 70 degC }", 1) + `
case hot { heat evap 450 W; sink 45 degC }
`
	r := estimate(t, load(t, src), Options{NoTilt: true})
	for _, tc := range []struct {
		cs        string
		q         float64
		overLimit bool
	}{{"nominal", 300, false}, {"hot", 450, true}} {
		var c *CaseResult
		for i := range r.Loops[0].Cases {
			if r.Loops[0].Cases[i].Case == tc.cs {
				c = &r.Loops[0].Cases[i]
			}
		}
		if c == nil || !c.Circulates {
			t.Fatalf("case %s missing or not circulating", tc.cs)
		}
		j := c.Components[0].Junction
		if j == nil {
			t.Fatalf("%s: no junction on the evaporator", tc.cs)
		}
		if d := j.Junction - j.Wall; math.Abs(d-tc.q*0.08) > 1e-9 {
			t.Errorf("%s: junction − wall = %.9g K, want %g × 0.08", tc.cs, d, tc.q)
		}
		if d := j.Case - j.Wall; math.Abs(d-tc.q*0.03) > 1e-9 {
			t.Errorf("%s: case − wall = %.9g K, want %g × 0.03", tc.cs, d, tc.q)
		}
		var wall, junction *Margin
		for i, m := range c.Margins {
			switch m.Margin {
			case MarginWall:
				wall = &c.Margins[i]
			case MarginJunction:
				junction = &c.Margins[i]
			}
		}
		if wall == nil || junction == nil {
			t.Fatalf("%s: margins %+v", tc.cs, c.Margins)
		}
		if wall.Value != j.Wall || junction.Value != j.Junction || junction.Limit != 273.15+70 {
			t.Errorf("%s: wall margin %g, junction margin %g of %g; junction %+v", tc.cs, wall.Value, junction.Value, junction.Limit, j)
		}
		flagged := false
		for _, f := range c.Findings {
			flagged = flagged || f.Rule == RuleJunction
		}
		if flagged != tc.overLimit || (junction.Status == "error") != tc.overLimit || (j.Junction > 273.15+70) != tc.overLimit {
			t.Errorf("%s: junction %.2f °C, status %s, finding %v; want over the limit: %v", tc.cs, j.Junction-273.15, junction.Status, flagged, tc.overLimit)
		}
	}
}
