package lsp

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"circa/lang"
)

// tiltRange is a loop's critical angles about one axis, in degrees: the
// nearest angles above and below the nominal attitude at which the
// condensers' thermal centre stops being above the evaporators'.
type tiltRange struct {
	up, down     float64
	okUp, okDown bool
}

// tiltLimits is what the tilt-limits rule found for one loop.
type tiltLimits struct {
	pitch, roll tiltRange
	about       string // the rule's note on the attitude the angles are taken about
}

// loopTilt reads a loop's critical angles from the tilt-limits finding of
// the analysis's checks, so the hover shows exactly what the checker
// reported. It reports false before the checks ran, when the rule had
// nothing to say (no evaporator or condenser, no head at the nominal
// attitude) or when the finding is silenced.
func loopTilt(diags []lang.Diagnostic, l *lang.Loop) (tiltLimits, bool) {
	for _, d := range diags {
		if d.Rule != "tilt-limits" || d.Loc != l.NameLoc() || len(d.Args) < 4 {
			continue
		}
		name, ok0 := d.Args[0].(string)
		pitch, ok1 := d.Args[1].(string)
		roll, ok2 := d.Args[2].(string)
		about, _ := d.Args[3].(string)
		if !ok0 || !ok1 || !ok2 || name != l.Name {
			continue
		}
		p, ok1 := parseTiltRange(pitch)
		r, ok2 := parseTiltRange(roll)
		if !ok1 || !ok2 {
			continue
		}
		return tiltLimits{pitch: p, roll: r, about: strings.TrimSpace(about)}, true
	}
	return tiltLimits{}, false
}

// parseTiltRange reads the rule's rendering of a pair of angles: "±55.1°",
// "+80.5° / -99.5°", "+40.0° (none below)", "-40.0° (none above)" or "none".
func parseTiltRange(s string) (tiltRange, bool) {
	s = strings.TrimSpace(s)
	var r tiltRange
	switch {
	case s == "none":
		return r, true
	case strings.HasPrefix(s, "±"):
		v, ok := parseDegrees(strings.TrimPrefix(s, "±"))
		return tiltRange{up: v, down: -v, okUp: true, okDown: true}, ok
	case strings.HasSuffix(s, "(none below)"):
		v, ok := parseDegrees(strings.TrimSuffix(s, "(none below)"))
		return tiltRange{up: v, okUp: true}, ok
	case strings.HasSuffix(s, "(none above)"):
		v, ok := parseDegrees(strings.TrimSuffix(s, "(none above)"))
		return tiltRange{down: v, okDown: true}, ok
	}
	a, b, found := strings.Cut(s, " / ")
	if !found {
		return r, false
	}
	up, ok1 := parseDegrees(a)
	down, ok2 := parseDegrees(b)
	return tiltRange{up: up, down: down, okUp: true, okDown: true}, ok1 && ok2
}

func parseDegrees(s string) (float64, bool) {
	s = strings.TrimSuffix(strings.TrimSpace(s), "°")
	s = strings.ReplaceAll(s, "−", "-")
	v, err := strconv.ParseFloat(s, 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
		return 0, false
	}
	return v, true
}

// fmtAngle renders degrees with an explicit sign. The minus is the ASCII
// hyphen-minus, not U+2212: users copy hovered angles into .loop files,
// whose numbers are ASCII.
func fmtAngle(v float64) string {
	if math.Abs(v) < 0.05 {
		return "0°"
	}
	return fmt.Sprintf("%+.1f°", v)
}

// String renders the pair as "±90.0°", "+80.5° / -99.5°" or "none".
func (r tiltRange) String() string {
	switch {
	case r.okUp && r.okDown && math.Abs(r.up+r.down) < 0.05:
		return fmt.Sprintf("±%.1f°", math.Abs(r.up))
	case r.okUp && r.okDown:
		return fmtAngle(r.up) + " / " + fmtAngle(r.down)
	case r.okUp:
		return fmtAngle(r.up) + " (none below)"
	case r.okDown:
		return fmtAngle(r.down) + " (none above)"
	}
	return "none"
}

// margin describes how far an angle a (degrees) lies from the range's
// nearer critical angle, or how far beyond it.
func (r tiltRange) margin(a float64) string {
	switch {
	case r.okUp && a >= r.up:
		return fmt.Sprintf("%.1f° beyond the critical %s", a-r.up, fmtAngle(r.up))
	case r.okDown && a <= r.down:
		return fmt.Sprintf("%.1f° beyond the critical %s", r.down-a, fmtAngle(r.down))
	}
	gap, near, found := math.Inf(1), 0.0, false
	if r.okUp && r.up-a < gap {
		gap, near, found = r.up-a, r.up, true
	}
	if r.okDown && a-r.down < gap {
		gap, near, found = a-r.down, r.down, true
	}
	if !found {
		return "no critical angle"
	}
	return fmt.Sprintf("%.1f° from the critical %s", gap, fmtAngle(near))
}

// loopTiltHover renders a loop's critical angles for its hover.
func loopTiltHover(diags []lang.Diagnostic, l *lang.Loop) string {
	t, ok := loopTilt(diags, l)
	if !ok {
		return ""
	}
	s := fmt.Sprintf("critical pitch %s, roll %s", t.pitch, t.roll)
	if t.about != "" {
		s += " " + t.about
	}
	return s + "\n"
}

// caseTiltHover renders, for each loop with critical angles, how far the
// case's pitch and roll are from them. The angles are the loop's about the
// nominal attitude, so for a case that also changes the other angle the
// distance is a guide, not the case's own critical angle.
func caseTiltHover(diags []lang.Diagnostic, m *lang.Model, cs *lang.Case) string {
	var b strings.Builder
	pitch, roll := cs.Pitch.SI*180/math.Pi, cs.Roll.SI*180/math.Pi
	for _, l := range m.Loops {
		t, ok := loopTilt(diags, l)
		if !ok {
			continue
		}
		fmt.Fprintf(&b, "- tilt, loop `%s`: pitch %s is %s pitch; roll %s is %s roll\n",
			l.Name, fmtAngle(pitch), t.pitch.margin(pitch), fmtAngle(roll), t.roll.margin(roll))
	}
	return b.String()
}
