package flow

import (
	"math"
	"strings"
	"testing"

	"circa/lang"
)

// TestNetworkLocalSaturation estimates the two-stack ferry network with
// saturation at local pressure. The first condenser's outlet must sit at
// the case's saturation pressure, every component's inlet pressure must
// follow from the one before it in its branch, and for a refrigerant at
// several bar the result must stay close to the single state's: a metre of
// liquid shifts R1234ze(E)'s saturation temperature by a fraction of a
// kelvin, so the flow moves by a few per cent at most.
func TestNetworkLocalSaturation(t *testing.T) {
	m := lang.Load("../../testdata/examples/ferry-cabinet.loop", lang.OSFS{})
	single := estimate(t, m, Options{NoTilt: true, Saturation: "single"})
	r := estimate(t, m, Options{NoTilt: true, Saturation: "local"})
	if r.Loops[0].Methods.Saturation != "local" || !strings.Contains(strings.Join(r.Loops[0].Assumptions, "; "), "upstream junction") {
		t.Fatalf("methods %+v, assumptions %q", r.Loops[0].Methods, r.Loops[0].Assumptions)
	}
	for i, c := range r.Loops[0].Cases {
		s := single.Loops[0].Cases[i]
		if !c.Circulates {
			t.Fatalf("%s: no circulation: %s", c.Case, c.Reason)
		}
		if rel := math.Abs(c.MassFlow/s.MassFlow - 1); rel > 0.03 {
			t.Errorf("%s: %.3f g/s local, %.3f g/s single", c.Case, c.MassFlow*1e3, s.MassFlow*1e3)
		}
		for _, cs := range c.Components {
			if cs.Local == nil {
				t.Fatalf("%s: %s has no local state", c.Case, cs.Component)
			}
			if cs.Kind == "evaporator" && !(cs.Local.SubcoolingIn >= 0 && cs.Local.SubcoolingIn < 1) {
				t.Errorf("%s: %s inlet subcooling %.3f K, want a fraction of a kelvin", c.Case, cs.Component, cs.Local.SubcoolingIn)
			}
		}
		// The first condenser's outlet is at the saturation pressure.
		for _, cs := range c.Components {
			if cs.Kind == "condenser" {
				if d := cs.Local.PressureIn - cs.DpTotal - c.SatPressure; math.Abs(d) > 1e-3 {
					t.Errorf("%s: condenser %s outlet %.4f Pa from the saturation pressure", c.Case, cs.Component, d)
				}
				break
			}
		}
		// Inlet pressures chain through each branch: a component whose
		// inlet node is another's outlet node starts where that one ends.
		byName := map[string]ComponentState{}
		for _, cs := range c.Components {
			byName[cs.Component] = cs
		}
		for _, a := range m.Loops[0].Components {
			for _, b := range m.Loops[0].Components {
				if a.To == nil || b.From == nil || a.To != b.From || a.Kind == lang.Reservoir || b.Kind == lang.Reservoir {
					continue
				}
				ca, cb := byName[a.Name], byName[b.Name]
				if ca.MassFlow <= 0 || cb.MassFlow <= 0 {
					continue
				}
				if d := ca.Local.PressureIn - ca.DpTotal - cb.Local.PressureIn; math.Abs(d) > 1e-3 {
					t.Errorf("%s: %s ends %.4f Pa from where %s starts", c.Case, a.Name, d, b.Name)
				}
			}
		}
		// The parallel-branch static stability is still evaluated, and the
		// two-channel form of the external slope still holds.
		st := c.Stability
		if st == nil || len(st.Branches) != 3 {
			t.Fatalf("%s: stability %+v", c.Case, st)
		}
		a, b, rest := stackBranches(st)
		if want := -b.Slope * rest.Slope / (b.Slope + rest.Slope); math.Abs(a.External-want) > 1e-6*math.Abs(want) {
			t.Errorf("%s: external slope at stack_a %g, two-channel form %g", c.Case, a.External, want)
		}
	}
}

// starved is testdata/check/messages.txtar's starved-branch loop: two
// stacks in parallel, stack_b fed through a 3 mm tube with a loss of 20.
const starved = `
loop cabinet {
  fluid R134a
  junction split at (0, 0, 0) m
  node a_in at (0, 0.15, 0) m
  node a_out at (0, 0.15, 0.4) m
  node b_in at (0, -0.15, 0) m
  node b_out at (0, -0.15, 0.4) m
  junction merge at (0, 0, 0.55) m
  node hx_in at (0.3, 0, 1.6) m
  node hx_out at (0.3, 0, 1.3) m
  pipe feed_a from split to a_in { length 0.15 m; bore 14 mm }
  evaporator stack_a from a_in to a_out { length 0.4 m; bore 10 mm; wetted_area 0.025 m² }
  pipe rise_a from a_out to merge { length 0.25 m; bore 10 mm }
  pipe feed_b from split to b_in { length 0.15 m; bore 3 mm; loss 20 }
  evaporator stack_b from b_in to b_out { length 0.4 m; bore 10 mm; wetted_area 0.025 m² }
  pipe rise_b from b_out to merge { length 0.25 m; bore 10 mm }
  pipe riser from merge to hx_in { length 1.2 m; bore 14 mm }
  condenser hx from hx_in to hx_out { length 1.0 m; bore 10 mm; conductance 350 W/K }
  pipe downcomer from hx_out to split { length 1.5 m; bore 14 mm }
}
case harbour {
  heat stack_a 3 kW
  heat stack_b 2 kW
  sink 28 °C
}
`

// TestMaldistributionLocal: the starved branch is flagged as maldistributed
// and dries out under local saturation as under the single state, with a
// flow split within a few per cent of the single state's.
func TestMaldistributionLocal(t *testing.T) {
	for _, sat := range []string{"single", "local"} {
		c := only(t, estimate(t, load(t, starved), Options{NoTilt: true, Saturation: sat}))
		var mal, dry bool
		for _, f := range c.Findings {
			mal = mal || f.Rule == RuleMaldistribution
			dry = dry || f.Rule == RuleDryout && f.Component == "stack_b"
		}
		if !mal || !dry {
			t.Errorf("%s: maldistribution %v, dryout of stack_b %v: %+v", sat, mal, dry, c.Findings)
		}
		b := component(t, c, "stack_b")
		if share := b.MassFlow / c.MassFlow; !(share > 0.07 && share < 0.11) {
			t.Errorf("%s: stack_b carries %.1f %% of the flow, the single state's 9 %%", sat, share*100)
		}
	}
}

// TestNetworkLocalResidualPure: under local saturation a network's cycle
// balances are a function of the cycle flows alone. The junction pressures
// are found afresh at every evaluation, so the residual at given flows does
// not depend on which flows were evaluated before (a far trial step of
// Newton's method, another case, another request of the language server).
// The tolerance is far below the network solver's, 1e-9 of the largest
// liquid column's head. The water network under vacuum has risers that
// flash, where the junction pressures swing between iterations.
func TestNetworkLocalResidualPure(t *testing.T) {
	ferry := lang.Load("../../testdata/examples/ferry-cabinet.loop", lang.OSFS{})
	vacuum := strings.NewReplacer("fluid R134a", "fluid water\n  saturation 40 degC", "3 kW", "300 W", "2 kW", "200 W").Replace(starved)
	for name, m := range map[string]*lang.Model{"ferry-cabinet": ferry, "starved": load(t, starved), "starved vacuum": load(t, vacuum)} {
		mu, err := chooseMethods(m.Methods, Options{NoTilt: true, Saturation: "local"})
		if err != nil {
			t.Fatal(err)
		}
		p := prepare(m, m.Loops[0], mu)
		for _, c := range m.Cases {
			var cr CaseResult
			s, _ := p.newState(point{c: c}, &cr)
			if s == nil || !s.local || s.net.ring {
				t.Fatalf("%s %s: no local network state", name, c.Name)
			}
			ev := s.newEval()
			// The balance where there is one, else the single-loop start.
			f, _, err := s.solveNetwork(ev, nil)
			if err != nil {
				f = s.networkStart(ev)
			}
			probes := [][]float64{f}
			for _, k := range []float64{3, 0.2, -1, 0.999, 1.001} {
				g := make([]float64, len(f))
				for i := range f {
					g[i] = k * f[i]
				}
				probes = append(probes, g)
			}
			first := make([][]float64, len(probes))
			for i, g := range probes {
				s.evaluate(g, ev)
				first[i] = append([]float64(nil), ev.e...)
			}
			// The same flows again, in the reverse order and after others.
			for i := len(probes) - 1; i >= 0; i-- {
				for j := range probes {
					if j != i {
						s.evaluate(probes[j], ev)
					}
				}
				s.evaluate(probes[i], ev)
				for k, v := range ev.e {
					if d := math.Abs(v - first[i][k]); d > 1e-9*math.Max(1, s.maxBDisp*s.p.RhoL) {
						t.Errorf("%s %s: flows %v: cycle %d balance %.9g Pa, first %.9g Pa", name, c.Name, probes[i], k, v, first[i][k])
					}
				}
			}
		}
	}
}
