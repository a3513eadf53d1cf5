package check

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"circa/lang"
	"circa/units"
)

// q formats an SI value in the named unit: q(0.012, "mm") == "12 mm".
func q(si float64, unit string) string {
	u, err := units.Parse(unit)
	if err != nil {
		return fmt.Sprintf("%g", si)
	}
	return units.Format(si, u)
}

// qs formats a signed length, with an explicit + for gains.
func qs(si float64, unit string) string {
	s := q(si, unit)
	if si > 0 && !strings.HasPrefix(s, "+") {
		s = "+" + s
	}
	return s
}

// qAs formats an SI value in the unit a value was written in, falling back
// to unit (for defaults, or units that do not parse alone).
func qAs(si float64, v lang.Value, unit string) string {
	if v.Unit() != "" {
		if u, err := units.Parse(v.Unit()); err == nil && u.Text != "" {
			return units.Format(si, u)
		}
	}
	return q(si, unit)
}

// degrees formats an angle in radians as signed degrees with one decimal.
func degrees(rad float64) string {
	d := rad * 180 / math.Pi
	if math.Abs(d) < 0.05 {
		return "0°"
	}
	return fmt.Sprintf("%+.1f°", d)
}

// valueLoc is where a value was written, else fallback.
func valueLoc(v lang.Value, fallback lang.Location) lang.Location {
	if v.Set && v.File() != "" {
		return v.Loc()
	}
	return fallback
}

// compLoc is where a component's name was written.
func compLoc(c *lang.Component) lang.Location { return c.NameLoc() }

func related(c *lang.Component, format string, args ...any) lang.Related {
	return lang.Related{Loc: c.NameLoc(), Message: fmt.Sprintf(format, args...)}
}

// blockIndent returns the indentation of the first statement inside a
// loop's block (two spaces when it has none).
func blockIndent(m *lang.Model, l *lang.Loop) string {
	f := m.Files[l.File()]
	if f == nil {
		return "  "
	}
	var off = -1
	switch {
	case len(l.Nodes) > 0:
		off = l.Nodes[0].Span().Start
	case len(l.Components) > 0:
		off = l.Components[0].Span().Start
	}
	if off < 0 {
		return "  "
	}
	line := f.Mapper.OffsetLine(off)
	text := f.Mapper.LineText(line)
	return text[:len(text)-len(strings.TrimLeft(text, " \t"))]
}

// insertBeforeClose returns an edit that adds a statement to a block just
// before its closing brace, on its own line when the brace starts a line.
func insertBeforeClose(m *lang.Model, d lang.Decl, indent, stmt string) (lang.Edit, bool) {
	f := m.Files[d.File()]
	if f == nil || d.BlockClose() < 0 || d.BlockClose() > len(f.Src) {
		return lang.Edit{}, false
	}
	line := f.Mapper.OffsetLine(d.BlockClose())
	start := f.Mapper.LineStart(line)
	if strings.TrimSpace(string(f.Src[start:d.BlockClose()])) == "" {
		return lang.Edit{Loc: lang.Location{File: d.File(), Span: lang.Span{Start: start, End: start}}, NewText: indent + stmt + "\n"}, true
	}
	return lang.Edit{Loc: lang.Location{File: d.File(), Span: lang.Span{Start: d.BlockClose(), End: d.BlockClose()}}, NewText: "; " + stmt + " "}, true
}

// sigAs formats an SI value to three significant figures in the unit a
// value was written in (as written), else in unit.
func sigAs(si float64, v lang.Value, unit string) string {
	u, text, ok := unitAs(v, unit)
	if !ok {
		return units.Sig(si, 3)
	}
	return units.Sig(u.FromSI(si), 3) + " " + text
}

// unitAs is the unit a value was written in (as written), else unit.
func unitAs(v lang.Value, unit string) (units.Unit, string, bool) {
	text := unit
	if v.Unit() != "" {
		text = v.Unit()
	}
	u, err := units.Parse(text)
	if err != nil {
		if u, err = units.Parse(unit); err != nil {
			return u, "", false
		}
		text = unit
	}
	return u, text, true
}

// sigAsRange is sigAs for the two ends of a range, both to the decimals
// of three significant figures of the larger end: "0.110 kg to 0.150 kg",
// not "0.11 kg to 0.15 kg", whose dropped zeros read as a cruder figure.
func sigAsRange(lo, hi float64, v lang.Value, unit string) (string, string) {
	u, text, ok := unitAs(v, unit)
	if !ok {
		return sigAs(lo, v, unit), sigAs(hi, v, unit)
	}
	a, b := u.FromSI(lo), u.FromSI(hi)
	m := math.Max(math.Abs(a), math.Abs(b))
	if m == 0 || math.IsNaN(m) || math.IsInf(m, 0) {
		return sigAs(lo, v, unit), sigAs(hi, v, unit)
	}
	r, _ := strconv.ParseFloat(strconv.FormatFloat(m, 'e', 2, 64), 64)
	d := max(2-int(math.Floor(math.Log10(r))), 0)
	return strconv.FormatFloat(a, 'f', d, 64) + " " + text, strconv.FormatFloat(b, 'f', d, 64) + " " + text
}
