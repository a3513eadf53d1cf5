package lsp

import (
	"strings"
	"unicode/utf8"

	"circa/lang"
	"circa/units"
)

// hoverWidth is the longest hover line, in characters.
const hoverWidth = 80

// prettyFormat formats an SI value in u with the unit's display symbols
// (°C, µm, m²).
func prettyFormat(si float64, u units.Unit) string {
	s := units.Format(si, u)
	if u.Text == "" {
		return s
	}
	return strings.TrimSuffix(s, u.Text) + units.Pretty(u.Text)
}

// shapeHover fits a hover's Markdown to the client: for one that reads only
// plain text the emphasis and code marks go and table rows become
// "label: value" lines; in both, lines longer than hoverWidth are wrapped at
// spaces (Markdown table rows cannot be, and are kept).
func shapeHover(md string, plain bool) string {
	var out []string
	for _, line := range strings.Split(md, "\n") {
		if plain {
			var keep bool
			if line, keep = plainLine(line); !keep {
				continue
			}
		}
		if !plain && strings.HasPrefix(line, "|") {
			out = append(out, line)
			continue
		}
		out = append(out, wrap(line, hoverWidth)...)
	}
	return strings.Join(out, "\n")
}

// plainLine turns one Markdown line into plain text; it returns false for a
// line that only shapes a table.
func plainLine(line string) (string, bool) {
	line = strings.NewReplacer("**", "", "`", "").Replace(line)
	if len(line) > 1 && line[0] == '_' && line[len(line)-1] == '_' {
		line = line[1 : len(line)-1]
	}
	t := strings.TrimSpace(line)
	if !strings.HasPrefix(t, "|") {
		return line, true
	}
	cells := strings.Split(strings.Trim(t, "|"), "|")
	var parts []string
	for _, c := range cells {
		c = strings.TrimSpace(c)
		if strings.Trim(c, "-: ") == "" {
			continue
		}
		parts = append(parts, c)
	}
	switch len(parts) {
	case 0:
		return "", false
	case 1:
		return parts[0], true
	}
	return parts[0] + ": " + strings.Join(parts[1:], ", "), true
}

// wrap breaks a line at spaces so that no piece is longer than width
// characters (a single longer word stays whole); continuation lines keep
// the first line's indentation.
func wrap(line string, width int) []string {
	if utf8.RuneCountInString(line) <= width {
		return []string{line}
	}
	indent := line[:len(line)-len(strings.TrimLeft(line, " "))]
	var out []string
	cur := ""
	for _, w := range strings.Fields(line) {
		switch {
		case cur == "":
			cur = indent + w
		case utf8.RuneCountInString(cur)+1+utf8.RuneCountInString(w) <= width:
			cur += " " + w
		default:
			out = append(out, cur)
			cur = indent + w
		}
	}
	return append(out, cur)
}

// asWritten formats a value in the unit it was written in, spelt as
// written (°C stays °C, µm stays µm), else in unit with its display
// symbols.
func asWritten(v lang.Value, unit string) string {
	text := v.Unit()
	u, err := units.Parse(text)
	if text == "" || err != nil {
		u = units.MustParse(unit)
		text = units.Pretty(u.Text)
	}
	s := units.Format(v.SI, u)
	if u.Text == "" {
		return s
	}
	return strings.TrimSuffix(s, u.Text) + text
}
