package flow

import (
	"fmt"
	"math"
	"strings"
	"testing"
)

// switchLoop is the vacuum loop at 80 °C, where the 1.3 m liquid column
// shifts the saturation at the evaporator inlet by 5.84 K at standard
// gravity: water at 80 °C saturates at 47.414 kPa with ρ_l = 971.79 kg/m³;
// 971.79 · 9.80665 · 1.3 = 12.389 kPa more is 59.803 kPa, where water
// saturates at 85.842 °C (IAPWS-IF97 via python3-iapws:
// IAPWS97(T=353.15, x=0), IAPWS97(P=0.059803, x=0)). Under 0.7 g (a
// downward acceleration of 0.3 gn) the shift is 4.21 K, under 1.3 g 7.40 K
// (the same sources): an accel_z sweep of ±0.3 gn crosses AutoLocalShift.
var switchLoop = strings.ReplaceAll(strings.ReplaceAll(vacuumLoop, "HEAT", "300 W"), "saturation 40 degC", "saturation 80 degC")

// TestSweepKeepsCaseState: every sweep point of a case is estimated in the
// saturation state saturation_state auto chose for the case at its own
// attitude, so the flow against the acceleration is continuous where the
// points' own columns cross the switch. In single state the flashing the
// subcooled inlet causes is missed and the flow there was 2.9 times the
// local state's (360 against 134 g/s at −0.3 gn).
func TestSweepKeepsCaseState(t *testing.T) {
	var acc [][3]float64
	for k := -6; k <= 6; k++ {
		acc = append(acc, [3]float64{0, 0, float64(k) * 0.05 * gn})
	}
	r := estimate(t, load(t, switchLoop), Options{NoTilt: true, Sweep: &Sweep{Accel: acc}})
	cs := r.Loops[0].Cases
	base := cs[0]
	if base.Grid || base.SatState != "local" || math.Abs(base.ColumnShift-5.842) > 0.01 {
		t.Fatalf("case: grid %v, state %q, column %.3f K (IAPWS-IF97: 5.842 K)", base.Grid, base.SatState, base.ColumnShift)
	}
	pts := cs[1:]
	if len(pts) != len(acc) {
		t.Fatalf("%d sweep points, want %d", len(pts), len(acc))
	}
	// 4.205 K at −0.3 gn, 7.395 K at +0.3 gn (IAPWS-IF97, as above).
	if math.Abs(pts[0].ColumnShift-4.205) > 0.01 || math.Abs(pts[len(pts)-1].ColumnShift-7.395) > 0.01 {
		t.Errorf("column shifts %.3f K and %.3f K at the ends, IAPWS-IF97 4.205 K and 7.395 K", pts[0].ColumnShift, pts[len(pts)-1].ColumnShift)
	}
	crossed := 0
	for i, c := range pts {
		if c.SatState != base.SatState {
			t.Errorf("point %d (accel_z %.2f gn, column %.2f K) in state %q, the case's is %q", i, c.Accel[2]/gn, c.ColumnShift, c.SatState, base.SatState)
		}
		if c.AutoState() != base.SatState {
			crossed++
		}
		if !c.Circulates {
			t.Fatalf("point %d does not circulate: %s", i, c.Reason)
		}
		// Continuity: a step of 0.05 gn moves the flow by about 0.15 %;
		// the switch of state moved it by 185 %.
		if i > 0 {
			if d := math.Abs(c.MassFlow-pts[i-1].MassFlow) / c.MassFlow; d > 0.01 {
				t.Errorf("flow jumps by %.1f %% from accel_z %.2f to %.2f gn (%.2f → %.2f g/s)", 100*d,
					pts[i-1].Accel[2]/gn, c.Accel[2]/gn, pts[i-1].MassFlow*1e3, c.MassFlow*1e3)
			}
		}
	}
	if crossed != 3 {
		t.Errorf("%d points with their own column below the switch, want 3 (−0.3, −0.25, −0.2 gn)", crossed)
	}
}

// TestProfileEnvelopeKeepCaseState: the instants of a profile and the
// combinations of an envelope search follow their case's saturation state
// too, and count those whose own column would take the other one.
func TestProfileEnvelopeKeepCaseState(t *testing.T) {
	src := switchLoop + `
case moving {
  heat evap 300 W
  profile {
    columns time accel_z
`
	for k := 0; k <= 6; k++ {
		src += fmt.Sprintf("    row %d s %.2f gn\n", 10*k, -0.3+0.1*float64(k))
	}
	src += `  }
}
case boxed {
  heat evap 300 W
  envelope {
    accel_z -0.3 gn 0.3 gn
  }
}
`
	r := estimate(t, load(t, src), Options{NoTilt: true})
	var moving, boxed *CaseResult
	for i := range r.Loops[0].Cases {
		switch c := &r.Loops[0].Cases[i]; c.Case {
		case "moving":
			moving = c
		case "boxed":
			boxed = c
		}
	}
	if moving == nil || moving.Profile == nil || boxed == nil || boxed.Envelope == nil {
		t.Fatalf("cases %+v", r.Loops[0].Cases)
	}
	if moving.SatState != "local" || boxed.SatState != "local" {
		t.Fatalf("states %q and %q, want local (5.84 K at 1 g)", moving.SatState, boxed.SatState)
	}
	in := moving.Profile.Instants
	for i := 1; i < len(in); i++ {
		if d := math.Abs(in[i].MassFlow-in[i-1].MassFlow) / in[i].MassFlow; d > 0.01 {
			t.Errorf("flow jumps by %.1f %% from t = %g to %g s (%.2f → %.2f g/s)", 100*d, in[i-1].Time, in[i].Time,
				in[i-1].MassFlow*1e3, in[i].MassFlow*1e3)
		}
	}
	// −0.3, −0.2 gn: 4.21 and 4.76 K, below the switch; −0.1 gn 5.31 K.
	if moving.Profile.OtherState != 2 {
		t.Errorf("%d instants would take the other state, want 2", moving.Profile.OtherState)
	}
	if !(boxed.Envelope.OtherState > 0 && boxed.Envelope.OtherState < boxed.Envelope.Estimates) {
		t.Errorf("%d of %d combinations would take the other state", boxed.Envelope.OtherState, boxed.Envelope.Estimates)
	}
}
