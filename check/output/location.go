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
	start := mp.LineStart(b.Line)
	return Pos{Line: b.Line + 1, Byte: 1, Char: 1, UTF16: 1}.on(mp.Text()[start : start+b.Col])
}

// on is p moved on over text, which starts at p and holds no line end:
// the characters and UTF-16 units are counted in one pass.
func (p Pos) on(text []byte) Pos {
	p.Byte += len(text)
	for i := 0; i < len(text); {
		p.Char++
		p.UTF16++
		if text[i] < utf8.RuneSelf {
			i++
			continue
		}
		r, n := utf8.DecodeRune(text[i:])
		if r >= 0x10000 {
			p.UTF16++ // a surrogate pair
		}
		i += n
	}
	return p
}

// Span returns a location's start and end; a reversed span ends where it
// starts. ok is false when the file is not known. An end on the start's
// line is counted on from the start, so a finding far into a long line
// reads the line once.
func Span(m *lang.Model, loc lang.Location) (start, end Pos, ok bool) {
	s, ok := Position(m, loc.File, loc.Span.Start)
	var e Pos
	if mp := m.Mapper(loc.File); mp != nil && loc.Span.End >= loc.Span.Start {
		b := mp.OffsetPosition(loc.Span.End, lang.UTF8)
		ls := mp.LineStart(b.Line)
		if from := ls + s.Byte - 1; b.Line+1 == s.Line && ls+b.Col >= from {
			e = s.on(mp.Text()[from : ls+b.Col])
		} else {
			e = mapperPos(mp, loc.Span.End)
		}
	} else {
		e, _ = Position(m, loc.File, loc.Span.End)
	}
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
