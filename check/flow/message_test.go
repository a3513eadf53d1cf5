package flow

import (
	"math"
	"strings"
	"testing"

	"circa/lang"
)

// TestHeatedLengthMessage: a heated length past the evaporator's length,
// as the design guidance reaches at the end of a parameter's range, is
// reported with its figures rounded as a reader writes them, not with
// every digit of a float.
func TestHeatedLengthMessage(t *testing.T) {
	src := strings.Replace(strings.ReplaceAll(ring, "HEAT", "500 W"), "heat 500 W;", "heat 500 W; heated_length 0.3000248 m;", 1)
	m := lang.LoadSource("../../testdata/flow/test.loop", []byte(src), lang.OSFS{})
	r, err := Estimate(m, Options{})
	if err != nil {
		t.Fatal(err)
	}
	const want = "evaporator evap has heated length 0.30002 m; it must lie in (0, 0.3] m, its length"
	var got []string
	for _, l := range r.Loops {
		for _, f := range l.Findings {
			if f.Rule == RuleGeometry {
				got = append(got, f.Message)
			}
		}
	}
	if len(got) != 1 || got[0] != want {
		t.Errorf("geometry findings %q, want [%q]", got, want)
	}
}

// TestTiltDescribeSigns: the margin-tilt finding names the angles where
// circulation stops with their signs, as the estimate's tilt line and the
// tilt-limits finding do ("pitch +80.4°", not "pitch 80.4°").
func TestTiltDescribeSigns(t *testing.T) {
	deg := func(d float64) *float64 { r := d * math.Pi / 180; return &r }
	tl := TiltLimits{PitchUp: deg(80.4), PitchDown: deg(-99.7), RollLeft: deg(42.9), RollRight: deg(-42.9)}
	const want = "pitch +80.4°, pitch -99.7°, roll +42.9°, roll -42.9°"
	if got := tl.describe(); got != want {
		t.Errorf("describe() = %q, want %q", got, want)
	}
}
