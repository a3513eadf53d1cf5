package flow

import (
	"math"
	"strings"
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

// TestStaticModeParallelUnstable: two channels A and B, both from junction 0
// to junction 1, closed by a return R from 1 to 0, with slopes S_A = S_B =
// −150 and S_R = +100 Pa/(kg/s) (numbers chosen for the arithmetic). Seen
// from A, B and R in series around it give an external slope of
// −S_B S_R/(S_B + S_R) = −(−150·100)/(−50) = −300, and S_A = −150 > −300
// passes; B likewise. But shifting δ from B to A (δṁ = (+1, −1, 0), R
// unchanged) changes the balance of the cycle A − B by S_A + S_B = −300:
// unstable. Over the cycle space {δṁ_R = δṁ_A + δṁ_B} the Rayleigh quotient
// Σ S δṁ² / Σ δṁ² is (−150 − 150)/2 = −150 along that mode and
// (−150 − 150 + 4·100)/6 = 16.67 along (1, 1, 2), the mode orthogonal to
// it: one negative eigenvalue, −150.
func TestStaticModeParallelUnstable(t *testing.T) {
	bs := []branch{{from: 0, to: 1}, {from: 0, to: 1}, {from: 1, to: 0}}
	from, to := []int{0, 0, 1}, []int{1, 1, 0}
	slopes := []float64{-150, -150, 100}
	for _, bi := range []int{0, 1} {
		ext := -externalSlope(2, from, to, slopes, bi, from[bi], to[bi])
		if math.Abs(ext+300) > 1e-9 || !(slopes[bi] > ext) {
			t.Errorf("branch %d: external slope %g, want −300, passing the branch test", bi, ext)
		}
	}
	cycles, _ := fundamentalCycles(2, bs)
	mode, flow, checked := staticMode(3, cycles, slopes)
	if !checked || mode == nil {
		t.Fatalf("no unstable mode: %v %v", mode, checked)
	}
	if math.Abs(mode.Slope+150) > 1e-9 {
		t.Errorf("mode slope %g Pa/(kg/s), hand-worked −150", mode.Slope)
	}
	if math.Abs(math.Abs(flow[0])-1) > 1e-9 || math.Abs(flow[0]+flow[1]) > 1e-9 || flow[2] != 0 {
		t.Errorf("mode shifts %v, want ±(1, −1, 0)", flow)
	}
	// The finding names the mode: the branch test passed both channels,
	// so the mode is reported, from the channel it starves to the one it
	// feeds, with its slope.
	n := &network{comps: []comp{{name: "chan_a"}, {name: "chan_b"}, {name: "ret"}}, branches: bs, cycles: cycles}
	for i := range n.branches {
		n.branches[i].legs = []leg{{ci: i, sign: 1}}
	}
	p := &prepared{l: &lang.Loop{}}
	cr := &CaseResult{Case: "nominal"}
	st := &Stability{}
	p.reportMode(n, []float64{0.01, 0.01, 0.02}, mode, flow, false, cr, st)
	if len(cr.Findings) != 1 || cr.Findings[0].Rule != RuleUnstable || cr.Findings[0].Value != mode.Slope || st.Mode != mode ||
		len(mode.Gain) != 1 || len(mode.Lose) != 1 || mode.Gain[0] == mode.Lose[0] || mode.Gain[0] == "ret" || mode.Lose[0] == "ret" {
		t.Fatalf("findings %+v, mode %+v", cr.Findings, st.Mode)
	}
	if msg := cr.Findings[0].Message; !strings.Contains(msg, "from the branches at "+mode.Lose[0]+" to those at "+mode.Gain[0]) || !strings.Contains(msg, "-150 Pa per kg/s") {
		t.Errorf("finding %q", msg)
	}
	// Where a branch already failed its own test, its finding stands alone.
	cr = &CaseResult{Case: "nominal"}
	p.reportMode(n, []float64{0.01, 0.01, 0.02}, &StaticMode{Slope: mode.Slope}, flow, true, cr, &Stability{})
	if len(cr.Findings) != 0 {
		t.Errorf("a second finding beside the branch's: %+v", cr.Findings)
	}
	// With channel slopes +150 every mode rises: no mode.
	if m, _, _ := staticMode(3, cycles, []float64{150, 150, 100}); m != nil {
		t.Errorf("rising channels flagged: %+v", m)
	}
	// A single cycle keeps the branch test: its one mode δṁ = (1, 1) has
	// the quotient Σ S/2 = (−150 + 100)/2 = −25 (worked by hand), negative
	// exactly where Σ S is.
	one, _ := fundamentalCycles(2, bs[1:])
	if m, _, _ := staticMode(2, one, []float64{-150, 100}); m == nil || math.Abs(m.Slope+25) > 1e-9 {
		t.Errorf("single cycle of −150 and +100: %+v, want (−150 + 100)/2 = −25", m)
	}
}
