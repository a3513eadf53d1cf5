package output

import (
	"bytes"
	"strings"
	"testing"

	"circa/check/flow"
)

// TestSaturationNumbersSayWhatTheyAre: the rack door's heading gives the
// liquid column's static shift of saturation (the number
// saturation_state auto decides by) and its note the evaporator inlet's
// subcooling at the estimated flow, each saying what it holds, and the
// note's parts add up as printed: the local saturation temperature above
// the loop's (the column's head less the losses) plus the condenser's
// subcooling (the file's subcool 1 K).
func TestSaturationNumbersSayWhatTheyAre(t *testing.T) {
	res := estimateFile(t, "../../testdata/examples/rack-door.loop", flow.Options{NoTilt: true, Case: "hot_aisle"})
	var b bytes.Buffer
	if err := EstimateText(&b, res, nil); err != nil {
		t.Fatal(err)
	}
	txt := b.String()
	for _, want := range []string{
		"single saturation state (liquid column at rest: saturation +1.82 K at the lowest evaporator inlet)",
		"note: at the estimated flow the liquid enters evaporator plate 2.33 K below its local saturation temperature, 45.97 °C at 260.3 kPa, which the single saturation state ignores: the liquid column's head less the losses on the way puts it 1.34 K above the loop's saturation temperature, and the liquid left the condenser 0.99 K below that",
	} {
		if !strings.Contains(txt, want) {
			t.Errorf("text lacks %q:\n%s", want, txt)
		}
	}
	if strings.Contains(txt, "liquid column 1.8 K") {
		t.Errorf("the heading still gives the column's shift without saying what it is")
	}
}
