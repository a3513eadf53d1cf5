package flow

import (
	"math"
	"strings"
	"testing"
)

// A case's conductance replaces the condenser's in that case only: the
// condenser balance Q = UA·(T_sat − T_sink) then gives, by hand,
// T_sat = 25 °C + 300 W / 50 W/K = 31 °C with the fan slowed and
// 25 °C + 300 W / 150 W/K = 27 °C running; and the case reproduces a loop
// whose condenser has that conductance itself.
func TestCaseConductance(t *testing.T) {
	src := strings.ReplaceAll(ring, "HEAT", "300 W") + `
case standing { heat evap 300 W; conductance cond 50 W/K; sink cond 30 degC }
case parked { heat evap 300 W; conductance cond 50 W/K }
`
	r := estimate(t, load(t, src), Options{NoTilt: true})
	cases := r.Loops[0].Cases
	if len(cases) != 3 {
		t.Fatalf("want 3 cases, got %d", len(cases))
	}
	byName := map[string]*CaseResult{}
	for i := range cases {
		byName[cases[i].Case] = &cases[i]
	}
	near := func(name string, got, want float64) {
		t.Helper()
		if math.Abs(got-want) > 1e-9 {
			t.Errorf("%s: saturation %.6f K, want %.6f K", name, got, want)
		}
	}
	near("nominal", byName["nominal"].SatTemperature, 273.15+27)
	near("parked", byName["parked"].SatTemperature, 273.15+31)
	near("standing", byName["standing"].SatTemperature, 273.15+30+300.0/50)

	ov := byName["standing"].Overrides
	if len(ov) != 2 || ov[0].Field != "sink" || ov[0].Value != 273.15+30 || ov[0].Own == nil || *ov[0].Own != 273.15+25 ||
		ov[1].Field != "conductance" || ov[1].Value != 50 || ov[1].Own == nil || *ov[1].Own != 150 {
		t.Errorf("standing overrides: %+v", ov)
	}
	if len(byName["nominal"].Overrides) != 0 {
		t.Errorf("nominal has overrides %+v", byName["nominal"].Overrides)
	}

	// The same loop with the condenser's own conductance at 50 W/K.
	own := only(t, estimate(t, load(t, strings.ReplaceAll(strings.ReplaceAll(ring, "HEAT", "300 W"), "150 W/K", "50 W/K")), Options{NoTilt: true}))
	parked := byName["parked"]
	if parked.MassFlow != own.MassFlow || parked.SatTemperature != own.SatTemperature {
		t.Errorf("case conductance: %.9g kg/s at %.6f K; own conductance: %.9g kg/s at %.6f K",
			parked.MassFlow, parked.SatTemperature, own.MassFlow, own.SatTemperature)
	}
	if len(parked.Margins) != len(own.Margins) {
		t.Fatalf("margins differ: %d against %d", len(parked.Margins), len(own.Margins))
	}
	for i, m := range parked.Margins {
		if m.Margin != own.Margins[i].Margin || m.Use != own.Margins[i].Use {
			t.Errorf("margin %s uses %.6g with the case conductance, %s %.6g with its own", m.Margin, m.Use, own.Margins[i].Margin, own.Margins[i].Use)
		}
	}
}

// Every condenser switched off leaves the heat nowhere to go: one located
// finding, no estimate.
func TestCaseConductanceZero(t *testing.T) {
	src := strings.ReplaceAll(ring, "HEAT", "300 W") + `
case fan_off { heat evap 300 W; conductance cond 0 W/K }
`
	r := estimate(t, load(t, src), Options{NoTilt: true})
	c := r.Loops[0].Cases[1]
	if c.Circulates || len(c.Findings) == 0 || !strings.Contains(c.Findings[0].Message, "no conductance in case fan_off") {
		t.Fatalf("fan off: circulates=%v findings %+v", c.Circulates, c.Findings)
	}
}
