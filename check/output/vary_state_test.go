package output

import (
	"bytes"
	"context"
	"strings"
	"testing"

	"circa/check/vary"
	"circa/lang"
)

// TestVaryStateSwitch: a parameter sweep whose variants' liquid columns
// cross the switch of saturation_state auto says at which points each
// case took local saturation. The rack door's cool_night case (R1233zd(E)
// at 28.3 °C) shifts saturation by 2.79 K under its 1.2 m lift; at 2.5 m
// its column passes 5 K, and its charge use stepped from 22 % at 2 m to
// 136 % with no word of the change of model.
func TestVaryStateSwitch(t *testing.T) {
	m := lang.Load("../../testdata/examples/rack-door.loop", lang.OSFS{})
	a, err := vary.Parse("lift=2m..2.5m:2")
	if err != nil {
		t.Fatal(err)
	}
	res, err := vary.Run(context.Background(), m, []vary.Axis{a}, vary.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if got := res.Points[0].Loops[0].Local; len(got) != 0 {
		t.Errorf("lift 2 m: local in %v, want none", got)
	}
	if got := res.Points[1].Loops[0].Local; len(got) != 1 || got[0] != "cool_night" {
		t.Errorf("lift 2.5 m: local in %v, want cool_night", got)
	}
	var b bytes.Buffer
	if err := VaryText(&b, res); err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"saturation state\n", "single\n", "local in cool_night\n", "the saturation state changes across the sweep"} {
		if !strings.Contains(b.String(), want) {
			t.Errorf("text lacks %q:\n%s", want, b.String())
		}
	}
	// A sweep that stays in one state adds no column.
	a, _ = vary.Parse("lift=1m..1.5m:2")
	res, err = vary.Run(context.Background(), m, []vary.Axis{a}, vary.Options{})
	if err != nil {
		t.Fatal(err)
	}
	b.Reset()
	if err := VaryText(&b, res); err != nil {
		t.Fatal(err)
	}
	if strings.Contains(b.String(), "saturation state") {
		t.Errorf("a sweep in one state names it:\n%s", b.String())
	}
}
