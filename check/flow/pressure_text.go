package flow

import (
	"math"
	"strconv"
	"strings"

	"circa/units"
)

// PressureText writes an absolute pressure (Pa) in the unit the design
// pressure was written in ("bar(g)", "psi"), or in bar absolute: to two
// decimals, or to three significant figures where that needs more (a
// vacuum loop's 4247 Pa is 0.0425 bar abs, not 0.04 beside the 4.25 kPa
// of its local-saturation table). Every output that prints the saturation
// or the design pressure uses it, so the same pressure prints the same way.
func PressureText(pa float64, written string) string {
	if written != "" {
		if u, err := units.Parse(written); err == nil && u.Text != "" && u.Dim == units.MustParse("Pa").Dim {
			s := pressureFigures(u.FromSI(pa)) + " " + u.Text
			if !u.Gauge {
				s += absMark(u.Text)
			}
			return s
		}
	}
	return pressureFigures(pa/1e5) + " bar abs"
}

// pressureFigures is v to two decimals, or to three significant figures
// when it is smaller than 1 in magnitude (and not zero).
func pressureFigures(v float64) string {
	d := 2
	if a := math.Abs(v); a > 0 && a < 1 && !math.IsNaN(a) {
		d = max(d, units.SigDecimals(a, 3))
	}
	s := strconv.FormatFloat(v, 'f', d, 64)
	if strings.HasPrefix(s, "-") && strings.Trim(s, "-0.") == "" {
		s = s[1:]
	}
	return s
}

// absMark labels an absolute pressure whose unit does not say so.
func absMark(unit string) string {
	switch unit {
	case "bar(a)", "psia":
		return ""
	}
	return " abs"
}
