package flow

import (
	"math"
	"os"
	"strings"
	"testing"
)

// twinLedinegg is testdata/flow/ledinegg.loop doubled: two identical
// heater-and-riser branches from junction lo to junction hi, two identical
// cooler-and-downcomer branches back. With both halves alike every branch
// carries what the single loop carries (continuity over identical parallel
// passages, the mixing of identical streams exact), so the network's
// balances are the single loop's at twice the loop flow: 30.94, 81.96 and
// 97.72 g/s from the hand-worked 15.47, 40.98 and 48.86 g/s of
// TestLedineggLoop, the middle one unstable.
const twinLedinegg = `
loop twin {
  fluid table "constant.csv"
  saturation 100 °C
  junction lo at (0, 0, 0) m
  junction hi at (0.1, 0, 1) m
  node b1 at (0.1, 0, 0) m
  node b2 at (0.1, 0, 0) m
  node d1 at (0, 0, 1) m
  node d2 at (0, 0, 1) m
  evaporator heater1 from lo to b1 { length 0.1 m; bore 40 mm; heat 10 kW; roughness 0 m }
  pipe riser1 from b1 to hi { length 1 m; bore 40 mm; loss 2800; roughness 0 m }
  evaporator heater2 from lo to b2 { length 0.1 m; bore 40 mm; heat 10 kW; roughness 0 m }
  pipe riser2 from b2 to hi { length 1 m; bore 40 mm; loss 2800; roughness 0 m }
  condenser cooler1 from hi to d1 { length 0.1 m; bore 40 mm; subcool 50 K; conductance 1000 W/K; sink 20 °C; roughness 0 m }
  pipe down1 from d1 to lo { length 1 m; bore 40 mm; roughness 0 m }
  condenser cooler2 from hi to d2 { length 0.1 m; bore 40 mm; subcool 50 K; conductance 1000 W/K; sink 20 °C; roughness 0 m }
  pipe down2 from d2 to lo { length 1 m; bore 40 mm; roughness 0 m }
}
methods {
  void_fraction homogeneous
  friction homogeneous_mcadams
  saturation_state single
}
case nominal { heat heater1 10 kW; heat heater2 10 kW }
`

func TestNetworkBalances(t *testing.T) {
	m := load(t, twinLedinegg)
	ring := only(t, estimate(t, load(t, ledineggSource(t)), Options{NoTilt: true}))
	c := only(t, estimate(t, m, Options{NoTilt: true}))
	if !c.Circulates {
		t.Fatalf("does not circulate: %s", c.Reason)
	}
	if len(c.Roots) != 3 || len(ring.Roots) != 3 {
		t.Fatalf("network balances %+v, single loop %+v", c.Roots, ring.Roots)
	}
	for i, want := range []float64{0.01547, 0.04098, 0.04886} { // TestLedineggLoop's arithmetic
		r := c.Roots[i]
		if math.Abs(r.MassFlow-2*want) > 0.005*2*want {
			t.Errorf("balance %d at %.5f kg/s, want 2 × %.5f within 0.5 %%", i, r.MassFlow, want)
		}
		if math.Abs(r.MassFlow-2*ring.Roots[i].MassFlow) > 1e-6*r.MassFlow {
			t.Errorf("balance %d at %.8f kg/s, single loop's doubled %.8f", i, r.MassFlow, 2*ring.Roots[i].MassFlow)
		}
		if r.Stable != (i != 1) || r.Stable != ring.Roots[i].Stable {
			t.Errorf("balance %d stable %v (slope %g), single loop %v", i, r.Stable, r.Slope, ring.Roots[i].Stable)
		}
	}
	unstable := 0
	for _, f := range c.Findings {
		if f.Rule == RuleUnstable && strings.Contains(f.Message, "flow pattern") {
			unstable++
		}
	}
	if unstable != 1 {
		t.Errorf("%d unstable-balance findings, want 1", unstable)
	}
	// The reported operating point is a stable balance, each branch
	// carrying half of it.
	if math.Abs(c.MassFlow-2*ring.MassFlow) > 1e-6*c.MassFlow {
		t.Errorf("reported %.6f kg/s, single loop's doubled %.6f", c.MassFlow, 2*ring.MassFlow)
	}
	if h := component(t, c, "heater2"); math.Abs(h.MassFlow-c.MassFlow/2) > 1e-6*c.MassFlow {
		t.Errorf("heater2 carries %.6f of %.6f kg/s", h.MassFlow, c.MassFlow)
	}
}

func ledineggSource(t *testing.T) string {
	t.Helper()
	b, err := os.ReadFile("../../testdata/flow/ledinegg.loop")
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}

// TestTwinReturnsStable: the Ledinegg criterion flags a branch as statically
// unstable where d(Δp_branch)/dṁ falls below the slope of the head the rest
// of the network offers at its junctions, so that a small surplus of flow
// grows. At the reported (stable) balance of twinLedinegg the two identical
// returns, each a condenser delivering 50 K subcooled liquid into an
// unheated downcomer, carry the same flow; between their junctions each
// pays friction rising with flow and gives out liquid whose momentum flux
// G²/ρ_l rises with it too, so each return's curve rises and a shift of flow
// from one to the other is pushed back (Ledinegg 1938's criterion as
// textbooks state it, e.g. Todreas and Kazimi, Nuclear Systems I, from
// memory). The two returns' slopes are alike and positive, and no branch is
// flagged.
func TestTwinReturnsStable(t *testing.T) {
	c := only(t, estimate(t, load(t, twinLedinegg), Options{NoTilt: true}))
	if c.Stability == nil || len(c.Stability.Branches) != 4 {
		t.Fatalf("stability %+v", c.Stability)
	}
	var returns []BranchStability
	for _, b := range c.Stability.Branches {
		if strings.HasPrefix(b.Components[0], "cooler") {
			returns = append(returns, b)
		}
		if !b.Stable {
			t.Errorf("branch %v flagged: slope %g, external %g Pa/(kg/s)", b.Components, b.Slope, b.External)
		}
	}
	if len(returns) != 2 {
		t.Fatalf("returns %+v", returns)
	}
	a, b := returns[0], returns[1]
	if !(a.Slope > 0) || math.Abs(a.Slope-b.Slope) > 1e-6*math.Abs(a.Slope) {
		t.Errorf("return slopes %g and %g Pa/(kg/s), want alike and positive", a.Slope, b.Slope)
	}
	for _, f := range c.Findings {
		if f.Rule == RuleUnstable && strings.HasPrefix(f.Message, "branch ") {
			t.Errorf("finding %s", f.Message)
		}
	}
}
