package output

import (
	"bytes"
	"strings"
	"testing"

	"circa/check/flow"
	"circa/lang"
)

// TestSweepStateText: a sweep whose points' own columns cross the switch
// of saturation_state auto says that every point is in the case's state
// and how many would have taken the other.
func TestSweepStateText(t *testing.T) {
	src := `
loop v {
  fluid water
  saturation 80 degC
  node a at (0, 0, 0) m
  node b at (0, 0, 0.3) m
  node c at (0, 0, 1.3) m
  node d at (-0.3, 0, 1.3) m
  evaporator evap from a to b { length 0.3 m; bore 20 mm; heat 300 W }
  pipe riser from b to c { length 1 m; bore 20 mm }
  condenser cond from c to d { length 0.3 m; bore 20 mm }
  pipe down from d to a { length 1.5 m; run (0.3, 0, -1.3) m; bore 20 mm }
}
case nominal { heat evap 300 W }
`
	m := lang.LoadSource("switch.loop", []byte(src), lang.OSFS{})
	// 1.3 m of water at 80 °C shifts saturation by 4.21 K under 0.7 g and
	// 5.84 K under 1 g (IAPWS-IF97 via python3-iapws).
	res, err := flow.Estimate(m, flow.Options{NoTilt: true, Sweep: &flow.Sweep{Accel: [][3]float64{{0, 0, -0.3 * 9.80665}, {0, 0, 0}}}})
	if err != nil {
		t.Fatal(err)
	}
	var b bytes.Buffer
	if err := EstimateText(&b, res, nil); err != nil {
		t.Fatal(err)
	}
	want := "sweep of case nominal: 2 points (the loss reserve is not evaluated on sweep points); all in the case's local saturation state, though at 1 of them the liquid column at rest alone, across 5 K, would take the single state"
	if !strings.Contains(b.String(), want) {
		t.Errorf("text lacks %q:\n%s", want, b.String())
	}
}
