package output

import (
	"fmt"
	"io"
	"strings"
	"unicode/utf8"

	"circa/lang"
)

const (
	ansiReset = "\x1b[0m"
	ansiBold  = "\x1b[1m"
	ansiRed   = "\x1b[1;31m"
	ansiYel   = "\x1b[1;33m"
	ansiCyan  = "\x1b[1;36m"
	ansiGreen = "\x1b[1;32m"
)

// Text writes findings as a compiler does: FILE:LINE:COL: severity: message
// [rule], the source line with a caret under the span, related locations
// as notes, fixes by title, and a summary line. With colour, severities
// and locations are painted with ANSI escapes.
func Text(w io.Writer, files []File, fs []Finding, colour bool) error {
	paint := func(code, s string) string {
		if !colour {
			return s
		}
		return code + s + ansiReset
	}
	var b strings.Builder
	counts := map[lang.Severity]int{}
	for _, f := range fs {
		d := f.Diagnostic
		counts[d.Severity]++
		s, e, ok := Span(f.Model, d.Loc)
		code := ansiCyan
		switch d.Severity {
		case lang.Error:
			code = ansiRed
		case lang.Warning:
			code = ansiYel
		}
		file, msg := Printable(d.Loc.File), Printable(d.Message())
		if ok {
			fmt.Fprintf(&b, "%s: %s: %s [%s]\n", paint(ansiBold, fmt.Sprintf("%s:%d:%d", file, s.Line, s.Char)), paint(code, d.Severity.String()), msg, d.Rule)
			caret(&b, f.Model, d.Loc, s, e, func(x string) string { return paint(ansiGreen, x) })
		} else {
			fmt.Fprintf(&b, "%s: %s: %s [%s]\n", paint(ansiBold, file), paint(code, d.Severity.String()), msg, d.Rule)
		}
		for _, r := range d.Related {
			rs, _, rok := Span(f.Model, r.Loc)
			if rok {
				fmt.Fprintf(&b, "    %s %s:%d:%d: %s\n", paint(ansiCyan, "note:"), Printable(r.Loc.File), rs.Line, rs.Char, Printable(r.Message))
			} else {
				fmt.Fprintf(&b, "    %s %s\n", paint(ansiCyan, "note:"), Printable(r.Message))
			}
		}
		for _, fx := range d.Fixes {
			fmt.Fprintf(&b, "    %s %s\n", paint(ansiGreen, "fix:"), Printable(fx.Title))
		}
	}
	fmt.Fprintln(&b, Summary(files, counts))
	_, err := io.WriteString(w, b.String())
	return err
}

// A line longer than excerptLine bytes is shown under a finding only
// excerptAround characters before and after its span, and excerptSpan of
// the span itself: a finding on a line of a megabyte would otherwise print
// the megabyte, once for each finding on it.
const (
	excerptLine   = 240
	excerptAround = 60
	excerptSpan   = 120
)

// caret prints the source line and a caret line under the span; tabs
// before the span are kept so the caret lines up. Characters a terminal
// would act on are printed escaped (see Printable), the caret widened to
// match. Of a long line only the part about the span is printed, its cut
// ends marked with "…".
func caret(b *strings.Builder, m *lang.Model, loc lang.Location, s, e Pos, paint func(string) string) {
	mp := m.Mapper(loc.File)
	if mp == nil {
		return
	}
	// The line is read in place: a copy of a line of a megabyte for each
	// finding on it was most of what printing them allocated.
	text := mp.Text()[mp.LineStart(s.Line-1):mp.LineEnd(s.Line-1)]
	var line, pad strings.Builder
	n := 0 // printed width of the span
	last := s.Char
	if e.Line == s.Line && e.Char > s.Char {
		last = e.Char - 1
	}
	lo, hi := 1, len(text)
	if len(text) > excerptLine {
		lo = max(1, s.Char-excerptAround)
		hi = min(last, s.Char+excerptSpan-1) + excerptAround
	}
	if lo > 1 {
		line.WriteString("…")
		pad.WriteByte(' ')
	}
	char := 1 // 1-based character of text being printed
	for i := 0; i < len(text); char++ {
		if char < lo {
			size := 1
			if text[i] >= utf8.RuneSelf {
				_, size = utf8.DecodeRune(text[i:])
			}
			i += size
			continue
		}
		if char > hi {
			line.WriteString("…")
			break
		}
		r, size := utf8.DecodeRune(text[i:])
		shown := escaped(r, size, text[i])
		if shown == "" {
			shown = string(text[i : i+size])
		}
		line.WriteString(shown)
		width := utf8.RuneCountInString(shown)
		switch {
		case char < s.Char && r == '\t':
			pad.WriteByte('\t')
		case char < s.Char:
			pad.WriteString(strings.Repeat(" ", width))
		case char <= last:
			n += width
		}
		i += size
	}
	n = max(n, 1)
	fmt.Fprintf(b, "  %s\n", line.String())
	fmt.Fprintf(b, "  %s%s\n", pad.String(), paint("^"+strings.Repeat("~", n-1)))
}
