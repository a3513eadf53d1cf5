package flow

import (
	"fmt"
	"strings"
	"testing"

	"circa/lang"
)

// TestGeyserStates: the geyser-risk warning of the vacuum demo states the
// criterion's own inputs (the liquid column at rest) and quotes the inlet
// at the estimated flow exactly as the local-saturation table gives it, so
// the two pressures and subcoolings are read as two states, not as one
// quantity that disagrees with itself.
//
// Summer: water at 50 °C saturates at 12.351 kPa with ρ_l = 988.01 kg/m³;
// the 0.70 m column adds 988.01 · 9.80665 · 0.70 = 6.782 kPa at rest, 19.134
// kPa in all, where water saturates at 59.105 °C, 9.105 K above 50 °C
// (IAPWS-IF97 via python3-iapws: IAPWS97(T=323.15, x=0).P and .rho,
// IAPWS97(P=0.0191336, x=0).T = 332.2545 K).
func TestGeyserStates(t *testing.T) {
	m := lang.Load("../../testdata/examples/shelter-rectifier.loop", lang.OSFS{})
	r := estimate(t, m, Options{NoTilt: true, Case: "summer"})
	c := r.Loops[0].Cases[0]
	var msg string
	for _, f := range c.Findings {
		if f.Rule == RuleGeyser && f.Component == "plate" {
			msg = f.Message
		}
	}
	if msg == "" {
		t.Fatal("no geyser-risk finding")
	}
	for _, want := range []string{
		"at rest, the static head of the 0.70 m liquid column",
		"from 12.35 kPa at the condenser outlet to 19.13 kPa", // IAPWS-IF97, above
		"water saturates at 59.10 °C, 9.10 K above the loop's saturation temperature",
	} {
		if !strings.Contains(msg, want) {
			t.Errorf("message lacks %q:\n%s", want, msg)
		}
	}
	var plate *ComponentState
	for i := range c.Components {
		if c.Components[i].Component == "plate" {
			plate = &c.Components[i]
		}
	}
	if plate == nil || plate.Local == nil {
		t.Fatal("no local state at plate")
	}
	// The table prints each pressure to the decimals of four figures of
	// its largest (here the plate's inlet), temperatures to 0.01 K.
	l := plate.Local
	flowing := fmt.Sprintf("circulating at %.2f g/s, the losses on the way leave the inlet at %.2f kPa (saturation %.2f °C), where the liquid arrives %.2f K subcooled",
		plate.MassFlow*1e3, l.PressureIn/1e3, l.SatTempIn-273.15, l.SubcoolingIn)
	if !strings.Contains(msg, flowing) {
		t.Errorf("message lacks the table's inlet state %q:\n%s", flowing, msg)
	}
	if !(l.PressureIn < 19.13e3) {
		t.Errorf("inlet pressure at the flow %.0f Pa not below the column at rest", l.PressureIn)
	}
}
