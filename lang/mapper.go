package lang

import (
	"bytes"
	"sort"
	"unicode/utf8"
)

// Encoding names a way of counting columns.
type Encoding int

const (
	UTF16 Encoding = iota // the editor protocol's default
	UTF8                  // bytes
)

// Position is a zero-based line and column.
type Position struct {
	Line, Col int
}

// Mapper converts between byte offsets and line/column positions for one
// version of a document. It is immutable and safe for concurrent use.
type Mapper struct {
	text  []byte
	lines []int // byte offset of the start of each line
}

// NewMapper indexes the line starts of text.
func NewMapper(text []byte) *Mapper {
	lines := make([]int, 1, len(text)/30+1)
	for i, c := range text {
		if c == '\n' {
			lines = append(lines, i+1)
		}
	}
	return &Mapper{text: text, lines: lines}
}

// Text returns the text the mapper indexes.
func (m *Mapper) Text() []byte { return m.text }

// Lines returns the number of lines.
func (m *Mapper) Lines() int { return len(m.lines) }

// clampOffset limits an offset to the text.
func (m *Mapper) clampOffset(off int) int {
	if off < 0 {
		return 0
	}
	if off > len(m.text) {
		return len(m.text)
	}
	return off
}

// LineStart returns the byte offset of a line's start (clamped).
func (m *Mapper) LineStart(line int) int {
	if line < 0 {
		return 0
	}
	if line >= len(m.lines) {
		return len(m.text)
	}
	return m.lines[line]
}

// LineEnd returns the byte offset of a line's end, before its newline.
func (m *Mapper) LineEnd(line int) int {
	if line < 0 {
		line = 0
	}
	if line+1 >= len(m.lines) {
		if line >= len(m.lines) {
			return len(m.text)
		}
		e := len(m.text)
		if e > m.lines[line] && m.text[e-1] == '\r' {
			e--
		}
		return e
	}
	e := m.lines[line+1] - 1
	if e > m.lines[line] && m.text[e-1] == '\r' {
		e--
	}
	return e
}

// OffsetLine returns the zero-based line holding a byte offset.
func (m *Mapper) OffsetLine(off int) int {
	off = m.clampOffset(off)
	return sort.Search(len(m.lines), func(i int) bool { return m.lines[i] > off }) - 1
}

// OffsetPosition converts a byte offset to a line and a column counted in enc.
// An offset inside a multi-byte character maps to that character's start.
func (m *Mapper) OffsetPosition(off int, enc Encoding) Position {
	off = m.clampOffset(off)
	line := m.OffsetLine(off)
	start := m.lines[line]
	for off > start && off < len(m.text) && !utf8.RuneStart(m.text[off]) {
		off--
	}
	if enc == UTF8 {
		return Position{line, off - start}
	}
	col := 0
	for p := start; p < off; {
		r, n := utf8.DecodeRune(m.text[p:])
		if r >= 0x10000 {
			col += 2
		} else {
			col++
		}
		p += n
	}
	return Position{line, col}
}

// PositionOffset converts a line and column in enc to a byte offset. Lines
// and columns past the end are clamped to the end of the text or line; a
// column inside a surrogate pair maps to the character's start.
func (m *Mapper) PositionOffset(p Position, enc Encoding) int {
	if p.Line < 0 {
		return 0
	}
	if p.Line >= len(m.lines) {
		return len(m.text)
	}
	start, end := m.lines[p.Line], m.LineEnd(p.Line)
	if p.Col <= 0 {
		return start
	}
	if enc == UTF8 {
		off := start + p.Col
		if off > end {
			off = end
		}
		for off > start && off < end && !utf8.RuneStart(m.text[off]) {
			off--
		}
		return off
	}
	col := 0
	for q := start; q < end; {
		r, n := utf8.DecodeRune(m.text[q:])
		w := 1
		if r >= 0x10000 {
			w = 2
		}
		if col+w > p.Col {
			return q
		}
		col += w
		q += n
	}
	return end
}

// SpanRange converts a span to start and end positions; a reversed span
// becomes an empty range at its start. Multi-line spans stay multi-line
// (edits need them); callers that underline text clip to one line.
func (m *Mapper) SpanRange(s Span, enc Encoding) (Position, Position) {
	start := m.OffsetPosition(s.Start, enc)
	end := m.OffsetPosition(s.End, enc)
	if end.Line < start.Line || (end.Line == start.Line && end.Col < start.Col) {
		end = start
	}
	return start, end
}

// RangeOffsets converts two positions to a span of byte offsets.
func (m *Mapper) RangeOffsets(a, b Position, enc Encoding) Span {
	s, e := m.PositionOffset(a, enc), m.PositionOffset(b, enc)
	if e < s {
		e = s
	}
	return Span{s, e}
}

// LineText returns the text of a zero-based line without its newline.
func (m *Mapper) LineText(line int) string {
	return string(m.text[m.LineStart(line):m.LineEnd(line)])
}

// SplitLines cuts text into lines that keep their "\n"; a last line without
// one is kept as it is. Line diffs (circa fmt -d, editor formatting) work on
// these.
func SplitLines(b []byte) []string {
	var out []string
	for len(b) > 0 {
		i := bytes.IndexByte(b, '\n')
		if i < 0 {
			out = append(out, string(b))
			break
		}
		out = append(out, string(b[:i+1]))
		b = b[i+1:]
	}
	return out
}
