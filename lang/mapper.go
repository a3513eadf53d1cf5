package lang

import (
	"bytes"
	"unicode/utf8"
)

// Encoding names a way of counting columns.
type Encoding int

const (
	UTF16 Encoding = iota // UTF-16 code units: the editor protocol's default
	UTF8                  // bytes
	UTF32                 // Unicode code points
)

// Position is a zero-based line and column.
type Position struct {
	Line, Col int
}

// Mapper converts between byte offsets and line/column positions for one
// version of a document. It is immutable and safe for concurrent use.
//
// Lines end at "\n", "\r\n" or a lone "\r", the line ends the editor protocol
// names, so a client and the server split a text into the same lines.
// Columns count characters as UTF-8 decoding steps through them: an
// invalid byte is one character of its own.
type Mapper struct {
	text  []byte
	lines []int // byte offset of the start of each line
}

// NewMapper indexes the line starts of text.
func NewMapper(text []byte) *Mapper {
	if bytes.IndexByte(text, '\r') < 0 {
		// Counted first, so a text of short lines does not grow the
		// index by copies (a megabyte of "a {" lines allocated 9 MB for
		// an index of 2).
		lines := make([]int, 1, bytes.Count(text, []byte{'\n'})+1)
		for i := 0; ; {
			j := bytes.IndexByte(text[i:], '\n')
			if j < 0 {
				break
			}
			i += j + 1
			lines = append(lines, i)
		}
		return &Mapper{text: text, lines: lines}
	}
	lines := make([]int, 1, len(text)/30+1)
	for i, c := range text {
		if c == '\n' || (c == '\r' && (i+1 == len(text) || text[i+1] != '\n')) {
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

// LineEnd returns the byte offset of a line's end, before its line ending.
func (m *Mapper) LineEnd(line int) int {
	if line < 0 {
		line = 0
	}
	if line+1 >= len(m.lines) {
		return len(m.text)
	}
	e := m.lines[line+1] - 1 // the '\n' or lone '\r'
	if m.text[e] == '\n' && e > m.lines[line] && m.text[e-1] == '\r' {
		e--
	}
	return e
}

// OffsetLine returns the zero-based line holding a byte offset; the bytes of
// a line ending belong to the line they end.
func (m *Mapper) OffsetLine(off int) int {
	off = m.clampOffset(off)
	// The last line start at or before off.
	lo, hi := 0, len(m.lines)
	for lo < hi {
		h := int(uint(lo+hi) >> 1)
		if m.lines[h] > off {
			hi = h
		} else {
			lo = h + 1
		}
	}
	return lo - 1
}

// charStart returns the start of the character holding off, a byte offset
// in the line starting at start.
func (m *Mapper) charStart(off, start int) int {
	if off >= len(m.text) || utf8.RuneStart(m.text[off]) {
		return off
	}
	for p := off - 1; p >= start && p > off-utf8.UTFMax; p-- {
		if utf8.RuneStart(m.text[p]) {
			if _, n := utf8.DecodeRune(m.text[p:]); p+n > off {
				return p
			}
			break
		}
	}
	return off // a stray continuation byte is a character of its own
}

// width is a character's length in enc.
func width(r rune, n int, enc Encoding) int {
	switch enc {
	case UTF8:
		return n
	case UTF32:
		return 1
	}
	if r >= 0x10000 {
		return 2
	}
	return 1
}

// OffsetPosition converts a byte offset to a line and a column counted in enc.
// An offset inside a multi-byte character maps to that character's start,
// one inside a line ending to the end of the line.
func (m *Mapper) OffsetPosition(off int, enc Encoding) Position {
	off = m.clampOffset(off)
	line := m.OffsetLine(off)
	start := m.lines[line]
	if end := m.LineEnd(line); off > end {
		off = end
	}
	off = m.charStart(off, start)
	if enc == UTF8 {
		return Position{line, off - start}
	}
	col := 0
	for p := start; p < off; {
		if m.text[p] < utf8.RuneSelf {
			col++ // one unit in every encoding
			p++
			continue
		}
		r, n := utf8.DecodeRune(m.text[p:off])
		col += width(r, n, enc)
		p += n
	}
	return Position{line, col}
}

// OffsetPositionFrom is OffsetPosition(off, enc), given p, the position
// of an offset from: when off is at or after from on the same line, it
// counts only the characters between them, so converting the offsets of a
// line's many tokens in order reads the line once instead of once per
// token.
func (m *Mapper) OffsetPositionFrom(from int, p Position, off int, enc Encoding) Position {
	from, off = m.clampOffset(from), m.clampOffset(off)
	if off < from || p.Line < 0 || p.Line >= len(m.lines) {
		return m.OffsetPosition(off, enc)
	}
	start := m.lines[p.Line]
	end := m.LineEnd(p.Line)
	if from < start || from > end || off > end {
		return m.OffsetPosition(off, enc)
	}
	from, off = m.charStart(from, start), m.charStart(off, start)
	if enc == UTF8 {
		return Position{p.Line, off - start}
	}
	col := p.Col
	for q := from; q < off; {
		if m.text[q] < utf8.RuneSelf {
			col++
			q++
			continue
		}
		r, n := utf8.DecodeRune(m.text[q:off])
		col += width(r, n, enc)
		q += n
	}
	return Position{p.Line, col}
}

// PositionOffset converts a line and column in enc to a byte offset. Lines
// and columns past the end are clamped to the end of the text or line; a
// column inside a character (a UTF-8 sequence or a surrogate pair) maps to
// the character's start.
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
		if p.Col >= end-start {
			return end
		}
		return m.charStart(start+p.Col, start)
	}
	col := 0
	for q := start; q < end; {
		r, n := utf8.DecodeRune(m.text[q:end])
		w := width(r, n, enc)
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

// CommonEnds returns how many lines a and b share at their start and, of
// the rest, at their end: the part of a line diff that needs no search.
func CommonEnds(a, b []string) (pre, suf int) {
	for pre < len(a) && pre < len(b) && a[pre] == b[pre] {
		pre++
	}
	for suf < len(a)-pre && suf < len(b)-pre && a[len(a)-1-suf] == b[len(b)-1-suf] {
		suf++
	}
	return pre, suf
}
