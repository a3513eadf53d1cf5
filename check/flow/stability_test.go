package flow

import (
	"math"
	"testing"

	"circa/check/fluid"
	"circa/lang"
)

// TestExternalSlopeHandWorked: three branches between junctions 0 and 1
// with slopes 2, 3 and 6 Pa/(kg/s). Seen from branch 0, the other two act in
// parallel: 1/(1/3 + 1/6) = 2, so the external curve falls with slope −2 and
// branch 0 (slope 2) is stable; a branch of slope −3 in its place is not
// (−3 < −2). With a fourth junction in series, 3 then 6 add: 9.
func TestExternalSlopeHandWorked(t *testing.T) {
	from, to := []int{0, 0, 0}, []int{1, 1, 1}
	if r := externalSlope(2, from, to, []float64{2, 3, 6}, 0, 0, 1); math.Abs(r-2) > 1e-12 {
		t.Errorf("parallel 3 ∥ 6 = %g, want 2", r)
	}
	from, to = []int{0, 0, 2}, []int{1, 2, 1}
	if r := externalSlope(3, from, to, []float64{5, 3, 6}, 0, 0, 1); math.Abs(r-9) > 1e-12 {
		t.Errorf("series 3 + 6 = %g, want 9", r)
	}
}

// stackBranches picks out of the two-stack examples' branches stack_a's,
// stack_b's and the rest of the network's (riser, condenser, downcomer).
func stackBranches(st *Stability) (a, b, rest BranchStability) {
	for _, bs := range st.Branches {
		switch bs.Components[1] {
		case "stack_a":
			a = bs
		case "stack_b":
			b = bs
		default:
			rest = bs
		}
	}
	return a, b, rest
}

// TestNetworkStability runs the two-stack example: every branch gets its
// static slope against the rest of the network, and the two parallel stacks'
// external slope is the hand-worked two-channel form −S_B S_R/(S_B + S_R)
// of the other stack B and the rest R (riser, condenser, downcomer). The
// density-wave numbers follow from the operating point by their definitions.
func TestNetworkStability(t *testing.T) {
	m := lang.Load("../../testdata/examples/ferry-cabinet.loop", lang.OSFS{})
	r := estimate(t, m, Options{NoTilt: true})
	cr := &r.Loops[0].Cases[0]
	st := cr.Stability
	if st == nil || len(st.Branches) != 3 || len(st.Channels) != 2 {
		t.Fatalf("stability %+v", st)
	}
	a, b, rest := stackBranches(st)
	want := -b.Slope * rest.Slope / (b.Slope + rest.Slope)
	if math.Abs(a.External-want) > 1e-9*math.Abs(want) {
		t.Errorf("external slope at stack_a %g, two-channel form %g", a.External, want)
	}
	for _, bs := range st.Branches {
		if bs.Stable != (bs.Slope > bs.External) || !(bs.Slope > 0) {
			t.Errorf("branch %v: slope %g, external %g, stable %v", bs.Components, bs.Slope, bs.External, bs.Stable)
		}
	}
	fl, _ := fluid.Lookup("R1234ze(E)")
	sat, _ := fl.AtT(cr.SatTemperature)
	for _, ch := range st.Channels {
		cs := component(t, cr, ch.Component)
		npch := cs.Heat / (math.Abs(cs.MassFlow) * sat.Hlv) * (sat.RhoL - sat.RhoV) / sat.RhoV
		if math.Abs(ch.Npch-npch) > 1e-3*npch {
			t.Errorf("%s: N_pch %g, from its definition %g", ch.Component, ch.Npch, npch)
		}
		if ch.Stable != (ch.Npch-ch.Nsub < ch.Boundary) || !(ch.Boundary > 0) {
			t.Errorf("%s: %+v", ch.Component, ch)
		}
	}
}

// TestGeyseringIndicator: the vacuum demo's channels carry the geyser-risk
// caution of the case in their stability entry.
func TestGeyseringIndicator(t *testing.T) {
	m := lang.Load("../../testdata/examples/shelter-rectifier.loop", lang.OSFS{})
	r := estimate(t, m, Options{NoTilt: true})
	for _, c := range r.Loops[0].Cases {
		if c.Stability == nil || len(c.Stability.Channels) != 1 || !c.Stability.Channels[0].Geysering {
			t.Errorf("%s: stability %+v", c.Case, c.Stability)
		}
		if !hasFinding(c.Findings, RuleGeyser, "plate") {
			t.Errorf("%s: no geyser-risk finding", c.Case)
		}
	}
}
