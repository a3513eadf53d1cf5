package output

import (
	"strings"
	"testing"

	"circa/check/flow"
)

// TestFindingsQuoteTheTableFigures: a margin's finding prints its value
// and limit as the margin table does (three significant figures). The
// forestry inverter's desert_peak exit quality is 0.605 in the table; its
// warning said 0.61 (and level_work's loss-reserve warning gave the exit
// quality it starts from as 0.40 beside the table's 0.405).
func TestFindingsQuoteTheTableFigures(t *testing.T) {
	res := estimateFile(t, "../../testdata/examples/forestry-inverter.loop", flow.Options{NoTilt: true})
	rules := map[string]string{flow.MarginExitQuality: flow.RuleExitQuality, flow.MarginHead: flow.RuleHead}
	checked := 0
	for li := range res.Loops {
		l := &res.Loops[li]
		for ci := range l.Cases {
			c := &l.Cases[ci]
			for _, m := range c.Margins {
				rule, ok := rules[m.Margin]
				if !ok {
					continue
				}
				v, lim := MarginValue(l, c, m)
				for _, f := range c.Findings {
					if f.Rule != rule || f.Component != m.Component {
						continue
					}
					checked++
					if !strings.Contains(f.Message, " "+v+" ") && !strings.Contains(f.Message, " "+v+",") {
						t.Errorf("%s %s: finding lacks the table's value %s: %s", c.Case, m.Margin, v, f.Message)
					}
					if !strings.Contains(f.Message, "limit "+lim) {
						t.Errorf("%s %s: finding lacks the table's limit %s: %s", c.Case, m.Margin, lim, f.Message)
					}
				}
			}
		}
	}
	if checked < 3 {
		t.Errorf("only %d findings checked", checked)
	}
}

// TestPressureFigures: a pressure keeps three significant figures where
// two decimals of its unit would leave fewer, so a vacuum loop's heading
// agrees with its local-saturation table (water at 30 °C saturates at
// 4.2467 kPa, IAPWS-IF97 via python3-iapws); the charge range's ends keep
// their trailing zeros as the margin table's do.
func TestPressureFigures(t *testing.T) {
	for _, c := range []struct {
		pa      float64
		written string
		want    string
	}{
		{4246.7, "", "0.0425 bar abs"},
		{4246.7, "bar", "0.0425 bar abs"},
		{12351, "bar", "0.124 bar abs"},
		{249851, "bar(g)", "1.49 bar(g)"},
		{200000, "bar", "2.00 bar abs"},
		{101325, "bar(g)", "0.00 bar(g)"},
	} {
		if got := pressureAs(c.pa, c.written); got != c.want {
			t.Errorf("pressureAs(%g, %q) = %q, want %q", c.pa, c.written, got, c.want)
		}
	}
	r := &flow.ChargeRange{Charge: 0.149, Low: 0.148, High: 0.15, LowCase: "a", HighCase: "b"}
	if got := ChargeSummary(r); !strings.Contains(got, "to 0.150 kg (set by b)") {
		t.Errorf("charge summary %q: the high end drops its trailing zero", got)
	}
}

// TestPointLabelAngles: a sweep or envelope point is named with its angles
// written as the case headings and the sweep table write them (+2.3°,
// 0.0°): the envelope's worst combination read "pitch 2.3°, roll 0°"
// under an envelope line of "pitch -2.3° to +2.3°".
func TestPointLabelAngles(t *testing.T) {
	for _, c := range []struct{ pitch, roll float64 }{{0.04014, 0}, {-0.0593, 0.3491}, {1e-4, -1e-4}} {
		got := (&flow.CaseResult{Pitch: c.pitch, Roll: c.roll}).PointLabel()
		if want := "pitch " + angle(c.pitch) + ", roll " + angle(c.roll); got != want {
			t.Errorf("PointLabel(%g, %g) = %q, the headings write %q", c.pitch, c.roll, got, want)
		}
	}
}
