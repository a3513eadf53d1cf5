package lsp

import (
	"math"
	"testing"

	"circa/lang"
)

// The tilt-limits rule renders a pair of critical angles four ways; each
// must read back to the same numbers.
func TestParseTiltRange(t *testing.T) {
	for _, tc := range []struct {
		in   string
		want tiltRange
		ok   bool
	}{
		{"±55.1°", tiltRange{55.1, -55.1, true, true}, true},
		{"+80.5° / -99.5°", tiltRange{80.5, -99.5, true, true}, true},
		{"+40.0° (none below)", tiltRange{up: 40, okUp: true}, true},
		{"-40.0° (none above)", tiltRange{down: -40, okDown: true}, true},
		{"none", tiltRange{}, true},
		{"sideways", tiltRange{}, false},
		{"+NaN° / -1°", tiltRange{}, false},
	} {
		got, ok := parseTiltRange(tc.in)
		if ok != tc.ok || ok && got != tc.want {
			t.Errorf("parseTiltRange(%q) = %+v, %v; want %+v, %v", tc.in, got, ok, tc.want, tc.ok)
		}
	}
}

// Margins by subtraction: pitch 30° inside ±90° is 60° from +90°; 100° is
// 10° past it; with only an upper limit at +20°, −170° is 190° below it.
func TestTiltMargin(t *testing.T) {
	r := tiltRange{90, -90, true, true}
	for _, tc := range []struct {
		r    tiltRange
		a    float64
		want string
	}{
		{r, 30, "60.0° from the critical +90.0°"},
		{r, -85, "5.0° from the critical -90.0°"},
		{r, 100, "10.0° beyond the critical +90.0°"},
		{tiltRange{up: 20, okUp: true}, -170, "190.0° from the critical +20.0°"},
		{tiltRange{}, 5, "no critical angle"},
	} {
		if got := tc.r.margin(tc.a); got != tc.want {
			t.Errorf("margin(%v) of %v = %q, want %q", tc.a, tc.r, got, tc.want)
		}
	}
	if got := (tiltRange{99.46, -80.54, true, true}).String(); got != "+99.5° / -80.5°" {
		t.Errorf("String = %q", got)
	}
}

// A hovered angle copied into a .loop file must read back as the same
// angle: the file format's numbers are ASCII, so the minus must be '-'.
func TestTiltAnglesCopyIntoLoopFile(t *testing.T) {
	for _, v := range []float64{-90, -80.54, 99.46, 12.3} {
		s := fmtAngle(v)
		q, _, err := lang.ParseQuantity(s)
		if err != nil {
			t.Errorf("fmtAngle(%v) = %q does not parse as a quantity: %v", v, s, err)
			continue
		}
		// 1° = π/180 rad (SI Brochure, table 8).
		want := math.Round(v*10) / 10 * math.Pi / 180
		if math.Abs(q.SI-want) > 1e-12 {
			t.Errorf("fmtAngle(%v) = %q reads as %v rad, want %v", v, s, q.SI, want)
		}
	}
}
