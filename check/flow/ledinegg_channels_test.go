package flow

import (
	"math"
	"strings"
	"testing"
)

// TestTwinBranchSlopesHandWorked works the static (Ledinegg) check of the
// two-channel network twinLedinegg by hand at its reported balance, where
// each heater-and-riser branch and each cooler-and-downcomer return carries
// ṁ = 48.86 g/s (TestLedineggLoop's arithmetic: constant properties
// ρl = 1000, ρv = 10 kg/m³, h_lv = 1 MJ/kg, μl = 1 mPa·s; A = π/4·0.04² =
// 1.2566e-3 m², H = 1 m, K = 2800).
//
// Heater branch, lo → hi, entering as 50 K subcooled liquid (x = −0.2):
// x_out = 0.01/ṁ − 0.2 = 0.004650, v_h = 0.001 + 0.099·x_out; its curve,
// with the momentum flux drawn from junction lo, is
// Δp(ṁ) = g H/v_h + K G² v_h/2 + G² v_h, whose slope at 48.86 g/s
// (central difference of that expression) is 1.1535e6 Pa/(kg/s); the
// friction, under 1 Pa in laminar flow, moves it by under 0.1 %.
//
// Return, hi → lo, ending as liquid: gravity is fixed, the momentum flux
// G² v_l gives 2 ṁ v_l/A² = 61.88 and the laminar friction over 1.1 m,
// Δp = 32 μl L G/(ρl D²), gives 32 μl L/(ρl D² A) = 17.51: 79.39 Pa/(kg/s).
//
// Seen from a heater branch, the other heater (S_B = 1.1535e6) lies in
// parallel with the two returns in parallel (S_R/2 = 39.70): the external
// slope is −(S_B·S_R/2)/(S_B + S_R/2) = −39.69, far below the branch's own
// slope, so both channels are statically stable (Ledinegg's criterion:
// the branch's curve steeper than the rest of the network's). Seen from a
// return, the other return (79.39) is in parallel with the two heaters
// (S_B/2 = 5.77e5): −79.38.
func TestTwinBranchSlopesHandWorked(t *testing.T) {
	c := only(t, estimate(t, load(t, twinLedinegg), Options{NoTilt: true}))
	if c.Stability == nil || len(c.Stability.Branches) != 4 {
		t.Fatalf("stability %+v", c.Stability)
	}
	const heater, ret = 1.1535e6, 79.39 // Pa/(kg/s), the arithmetic above
	for _, b := range c.Stability.Branches {
		if math.Abs(b.MassFlow-0.04886) > 0.005*0.04886 {
			t.Errorf("branch %v carries %.5f kg/s, hand-worked 0.04886", b.Components, b.MassFlow)
		}
		want, ext := ret, -1/(1/ret+2/heater)
		if strings.HasPrefix(b.Components[0], "heater") {
			want, ext = heater, -1/(1/heater+2/ret)
		}
		if math.Abs(b.Slope-want) > 0.005*want {
			t.Errorf("branch %v: slope %.6g Pa/(kg/s), hand-worked %.6g", b.Components, b.Slope, want)
		}
		if math.Abs(b.External-ext) > 0.005*math.Abs(ext) {
			t.Errorf("branch %v: external slope %.6g Pa/(kg/s), hand-worked %.6g", b.Components, b.External, ext)
		}
		if !b.Stable {
			t.Errorf("branch %v flagged unstable", b.Components)
		}
	}
}
