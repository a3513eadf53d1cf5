package main

import (
	"bytes"
	"strings"
	"testing"
)

func TestFluidCommand(t *testing.T) {
	var out, errb bytes.Buffer
	if rc := run([]string{"fluid", "R134a", "--at", "40degC"}, nil, &out, &errb); rc != exitOK {
		t.Fatalf("exit %d: %s", rc, errb.String())
	}
	// Tillner-Roth & Baehr (1994) equation of state, as tabulated in the
	// fluid reference file: p = 1016.5930 kPa, rho' = 1146.739 kg/m3 at 40 degC.
	for _, want := range []string{"pressure", "1016.6 kPa", "1146.7 kg/m3", "163.02 kJ/kg", "safety class A1"} {
		if !strings.Contains(out.String(), want) {
			t.Errorf("output lacks %q:\n%s", want, out.String())
		}
	}
}

func TestFluidCommandErrors(t *testing.T) {
	cases := []struct {
		args []string
		rc   int
		msg  string
	}{
		{[]string{"fluid", "R999", "--at", "40degC"}, exitUsage, "unknown fluid"},
		{[]string{"fluid", "water", "--at", "40"}, exitUsage, "needs a unit"},
		{[]string{"fluid", "water", "--at", "3 bar"}, exitUsage, "expected a temperature"},
		{[]string{"fluid", "water", "--at", "400degC"}, exitFindings, "outside the range"},
		{[]string{"fluid", "water"}, exitUsage, "--at"},
	}
	for _, c := range cases {
		var out, errb bytes.Buffer
		rc := run(c.args, nil, &out, &errb)
		if rc != c.rc || !strings.Contains(errb.String(), c.msg) {
			t.Errorf("%v: exit %d, stderr %q; want exit %d and %q", c.args, rc, errb.String(), c.rc, c.msg)
		}
	}
}

func TestFluidList(t *testing.T) {
	var out, errb bytes.Buffer
	if rc := run([]string{"fluid", "--list"}, nil, &out, &errb); rc != exitOK {
		t.Fatal(errb.String())
	}
	for _, want := range []string{"R1233zd(E)", "Ammonia", "B2L", "water", "ASHRAE 34"} {
		if !strings.Contains(out.String(), want) {
			t.Errorf("list lacks %q", want)
		}
	}
}

func TestFluidCaution(t *testing.T) {
	var out, errb bytes.Buffer
	run([]string{"fluid", "ammonia", "--at", "20degC"}, nil, &out, &errb)
	if !strings.Contains(out.String(), "Caution") || !strings.Contains(out.String(), "local refrigerant-safety codes") {
		t.Errorf("ammonia (B2L) printed no caution:\n%s", out.String())
	}
}

// Temperatures are spelt °C, as the estimate spells them.
func TestFluidTemperatureSpelling(t *testing.T) {
	var out, errb bytes.Buffer
	run([]string{"fluid", "water", "--at", "60degC"}, nil, &out, &errb)
	if !strings.HasPrefix(out.String(), "water, saturated at 60 °C (333.15 K)") || strings.Contains(out.String(), "degC") {
		t.Errorf("%q", out.String())
	}
}
