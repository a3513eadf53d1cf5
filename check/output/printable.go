package output

import (
	"fmt"
	"strings"
	"unicode/utf8"
)

// escaped returns how r (of n bytes, as decoded from s) is printed to a
// terminal, or "" when it is printed as it is. Control characters (ESC,
// NUL, DEL, the C1 range…), bytes that are not UTF-8 and the controls that
// reorder text on screen would otherwise let a line of a file move the
// cursor, clear the screen or hide what it says. A tab is kept: excerpts
// line their carets up with it.
func escaped(r rune, n int, b byte) string {
	switch {
	case r == utf8.RuneError && n == 1:
		return fmt.Sprintf(`\x%02x`, b)
	case r == '\t':
		return ""
	case r < 0x20 || r == 0x7f:
		return fmt.Sprintf(`\x%02x`, r)
	case r >= 0x80 && r < 0xa0,
		r >= 0x202a && r <= 0x202e, r >= 0x2066 && r <= 0x2069,
		r == 0x200e || r == 0x200f || r == 0x061c:
		return fmt.Sprintf(`\u%04x`, r)
	}
	return ""
}

// Printable returns s with every character a terminal would act on
// instead of showing written as an escape (\x1b, \u202e).
func Printable(s string) string {
	clean := true
	for i := 0; i < len(s); {
		r, n := utf8.DecodeRuneInString(s[i:])
		if escaped(r, n, s[i]) != "" {
			clean = false
			break
		}
		i += n
	}
	if clean {
		return s
	}
	var b strings.Builder
	for i := 0; i < len(s); {
		r, n := utf8.DecodeRuneInString(s[i:])
		if e := escaped(r, n, s[i]); e != "" {
			b.WriteString(e)
		} else {
			b.WriteString(s[i : i+n])
		}
		i += n
	}
	return b.String()
}
