package output

import (
	"fmt"
	"unicode/utf8"

	"circa/lang"
)

// Pos is a one-based line with one-based columns counted three ways: in
// bytes, in characters (Unicode code points) and in UTF-16 code units.
type Pos struct {
	Line, Byte, Char, UTF16 int
}

// Position locates a byte offset in a file the model read (a loop file or
// a table); ok is false when the file is not known (then only the path can be shown).
func Position(m *lang.Model, file string, off int) (Pos, bool) {
	mp := m.Mapper(file)
	if mp == nil {
		return Pos{Line: 1, Byte: 1, Char: 1, UTF16: 1}, false
	}
	return mapperPos(mp, off), true
}

func mapperPos(mp *lang.Mapper, off int) Pos {
	b := mp.OffsetPosition(off, lang.UTF8)
	u := mp.OffsetPosition(off, lang.UTF16)
	start := mp.LineStart(b.Line)
	chars := utf8.RuneCount(mp.Text()[start : start+b.Col])
	return Pos{Line: b.Line + 1, Byte: b.Col + 1, Char: chars + 1, UTF16: u.Col + 1}
}

// Span returns a location's start and end; a reversed span ends where it
// starts. ok is false when the file is not known.
func Span(m *lang.Model, loc lang.Location) (start, end Pos, ok bool) {
	s, ok := Position(m, loc.File, loc.Span.Start)
	e, _ := Position(m, loc.File, loc.Span.End)
	if e.Line < s.Line || (e.Line == s.Line && e.Byte < s.Byte) {
		e = s
	}
	return s, e, ok
}

// Range converts a span to zero-based positions counted in enc. With clip,
// a span that runs past its first line ends at that line's end, which is
// what an underline needs (editors underline the wrong text otherwise);
// edits keep their full extent.
func Range(mp *lang.Mapper, sp lang.Span, enc lang.Encoding, clip bool) (start, end lang.Position) {
	a, b := mp.SpanRange(sp, enc)
	if clip && b.Line > a.Line {
		b = mp.OffsetPosition(mp.LineEnd(a.Line), enc)
	}
	return a, b
}

// Where renders a location as FILE:LINE:COL, the column counted in
// characters, or just FILE when the file is not known.
func Where(m *lang.Model, loc lang.Location) string {
	p, ok := Position(m, loc.File, loc.Span.Start)
	if !ok {
		return loc.File
	}
	return fmt.Sprintf("%s:%d:%d", loc.File, p.Line, p.Char)
}
