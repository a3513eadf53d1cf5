package flow

import (
	"math"
	"strings"
	"testing"

	"circa/lang"
)

// TestLocalLiquidTubes: marching a tube of liquid in one step where it
// cannot flash gives the estimate that marching it cell by cell gives, to
// well within the solver's tolerance, on the shipped examples and on the
// vacuum water loop (whose downcomer liquid sits close to saturation at its
// top).
func TestLocalLiquidTubes(t *testing.T) {
	type model struct {
		name string
		m    *lang.Model
	}
	var ms []model
	for _, f := range []string{"ferry-cabinet", "forestry-inverter", "rack-door", "shelter-rectifier", "tram-inverter"} {
		ms = append(ms, model{f, lang.Load("../../testdata/examples/"+f+".loop", lang.OSFS{})})
	}
	for _, q := range []string{"50 W", "300 W", "1500 W"} {
		ms = append(ms, model{"vacuum " + q, load(t, strings.ReplaceAll(vacuumLoop, "HEAT", q))})
	}
	defer func() { localCellByCell = false }()
	for _, md := range ms {
		opts := Options{NoTilt: true, Saturation: "local"}
		localCellByCell = false
		fast := estimate(t, md.m, opts)
		localCellByCell = true
		slow := estimate(t, md.m, opts)
		if len(fast.Loops) != len(slow.Loops) {
			t.Fatalf("%s: %d loops against %d", md.name, len(fast.Loops), len(slow.Loops))
		}
		for li := range fast.Loops {
			for ci, a := range fast.Loops[li].Cases {
				b := slow.Loops[li].Cases[ci]
				if a.Circulates != b.Circulates {
					t.Errorf("%s %s: circulates %v, cell by cell %v", md.name, a.Case, a.Circulates, b.Circulates)
					continue
				}
				if !agree(a.MassFlow, b.MassFlow, 1e-6) {
					t.Errorf("%s %s: %.9g kg/s, cell by cell %.9g kg/s", md.name, a.Case, a.MassFlow, b.MassFlow)
				}
				for k := range a.Components {
					ca, cb := a.Components[k], b.Components[k]
					if !agree(ca.DpTotal, cb.DpTotal, 1e-5) || !agree(ca.XOut, cb.XOut, 1e-5) {
						t.Errorf("%s %s %s: Δp %.9g Pa x %.9g, cell by cell %.9g Pa x %.9g", md.name, a.Case, ca.Component, ca.DpTotal, ca.XOut, cb.DpTotal, cb.XOut)
					}
				}
			}
		}
	}
}

// agree reports whether a and b agree to rel of the larger, or both are
// below 1e-9 (an absolute floor for values that vanish).
func agree(a, b, rel float64) bool {
	return math.Abs(a-b) <= rel*math.Max(math.Abs(a), math.Abs(b))+1e-9
}
