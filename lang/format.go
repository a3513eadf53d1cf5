package lang

import (
	"bytes"
	"errors"
	"fmt"
	"strings"
)

// Format prints a parsed file in the one canonical layout. It changes only
// layout, never what was written: names, numbers, unit spellings, strings
// and comment text come out byte for byte.
//
// Layout rules:
//   - one statement per line, indented two spaces per block level; a block
//     written on one line ("{ a; b }") is expanded to one statement per line;
//   - "{" ends its statement's line after one space, "}" stands on its own line;
//   - parts of a statement are separated by single spaces; "+ - * /" and "="
//     have a space on each side, "^" is written tight (with a space before it
//     only when it follows a unit, where tight writing would change the unit);
//   - a quantity is NUMBER, one space, UNIT; a vector is "(x, y, z) unit";
//   - at most one blank line is kept between statements, and none right
//     after "{" or right before "}";
//   - a comment on a line of its own is indented like the statement after it
//     (or like the block's statements, before a "}"); a comment after a
//     statement follows the first statement of its line, two spaces after it;
//   - the text ends with exactly one newline, and lines end in "\n".
//
// A file with syntax errors is not formatted: Format returns an error and
// no text, so nothing the parser could not read is ever lost.
func Format(f *File) ([]byte, error) {
	if f == nil {
		return nil, errors.New("format: no file")
	}
	if len(f.Errors) > 0 {
		d := f.Errors[0]
		pos := f.Mapper.OffsetPosition(d.Loc.Span.Start, UTF8)
		return nil, fmt.Errorf("%s:%d:%d: %s (the file has %d syntax error(s); it is not formatted)",
			f.Path, pos.Line+1, pos.Col+1, d.Message(), len(f.Errors))
	}
	fm := &formatter{f: f}
	fm.collect(f.Stmts, 0)
	return fm.print(), nil
}

// item is one output line before comments are merged in: a statement head
// or a closing brace.
type item struct {
	off      int // source offset where the item starts
	line     int // source line
	depth    int
	text     string
	opens    bool // the statement opens a block
	close    bool // a closing brace
	trailing []string
}

type formatter struct {
	f     *File
	items []item
	buf   strings.Builder
}

// lineOf is the line of an offset: lines end at "\n", "\r\n" or a lone
// "\r", for the language as for positions.
func (fm *formatter) lineOf(off int) int { return fm.f.Mapper.OffsetLine(off) }

// collect flattens statements and closing braces in source order.
func (fm *formatter) collect(stmts []*Stmt, depth int) {
	for _, s := range stmts {
		fm.buf.Reset()
		fm.stmt(s)
		it := item{off: s.Pos.Offset, line: fm.lineOf(s.Pos.Offset), depth: depth}
		if s.Block != nil {
			fm.buf.WriteString(" {")
			it.opens = true
		}
		it.text = fm.buf.String()
		fm.items = append(fm.items, it)
		if s.Block != nil {
			fm.collect(s.Block.Stmts, depth+1)
			off := s.Block.Close
			if off < 0 {
				off = len(fm.f.Src)
			}
			fm.items = append(fm.items, item{off: off, line: fm.lineOf(off), depth: depth, text: "}", close: true})
		}
	}
}

func (fm *formatter) print() []byte {
	items := fm.items
	comments := fm.f.Comments
	var out bytes.Buffer
	out.Grow(len(fm.f.Src) + len(fm.f.Src)/8 + 1)

	// Attach trailing comments to the first item of their line; the rest
	// stand on lines of their own.
	type lone struct {
		off, line int
		text      string
	}
	var lones []lone
	j := 0 // first item not before the comment's line
	for _, c := range comments {
		text := strings.TrimRight(c.Text, "\r")
		line := fm.lineOf(c.Span.Start)
		for j < len(items) && items[j].line < line {
			j++
		}
		if j < len(items) && items[j].line == line && items[j].off < c.Span.Start {
			items[j].trailing = append(items[j].trailing, text)
			continue
		}
		lones = append(lones, lone{c.Span.Start, line, text})
	}

	lastLine := -1     // source line of the last thing written
	afterOpen := false // the last line written opened a block
	wrote := false     // anything written yet
	blankBefore := func(line int) bool {
		return wrote && !afterOpen && lastLine >= 0 && line-lastLine >= 2
	}
	indent := func(d int) {
		for i := 0; i < d; i++ {
			out.WriteString("  ")
		}
	}
	ci := 0
	for i := range items {
		it := &items[i]
		// Comments on lines of their own before this item.
		for ci < len(lones) && lones[ci].off < it.off {
			c := lones[ci]
			ci++
			if blankBefore(c.line) {
				out.WriteByte('\n')
			}
			d := it.depth
			if it.close {
				d++
			}
			indent(d)
			out.WriteString(c.text)
			out.WriteByte('\n')
			lastLine, afterOpen, wrote = c.line, false, true
		}
		if !it.close && blankBefore(it.line) {
			out.WriteByte('\n')
		}
		indent(it.depth)
		out.WriteString(it.text)
		for _, t := range it.trailing {
			out.WriteString("  ")
			out.WriteString(t)
		}
		out.WriteByte('\n')
		lastLine, afterOpen, wrote = it.line, it.opens, true
	}
	for ; ci < len(lones); ci++ {
		c := lones[ci]
		if blankBefore(c.line) {
			out.WriteByte('\n')
		}
		out.WriteString(c.text)
		out.WriteByte('\n')
		lastLine, afterOpen, wrote = c.line, false, true
	}
	return out.Bytes()
}

func (fm *formatter) stmt(s *Stmt) {
	b := &fm.buf
	if s.Word != nil {
		b.WriteString(s.Word.Name)
	}
	for _, a := range s.Args {
		b.WriteByte(' ')
		if a.Key != "" {
			b.WriteString(a.Key)
			continue
		}
		fm.expr(a.Expr)
	}
}

func (fm *formatter) expr(e *Expr) {
	if e == nil {
		return
	}
	fm.term(e.Left)
	for _, op := range e.Ops {
		fm.buf.WriteByte(' ')
		fm.buf.WriteString(op.Op)
		fm.buf.WriteByte(' ')
		fm.term(op.Term)
	}
}

func (fm *formatter) term(t *Term) {
	if t == nil {
		return
	}
	fm.factor(t.Left)
	for _, op := range t.Ops {
		fm.buf.WriteByte(' ')
		fm.buf.WriteString(op.Op)
		fm.buf.WriteByte(' ')
		fm.factor(op.Factor)
	}
}

// startsUnsignedNumber reports whether a number's text begins with a digit
// or a point, so a sign written just before it would join it.
func startsUnsignedNumber(s string) bool {
	return s != "" && (isDigit(s[0]) || s[0] == '.')
}

func (fm *formatter) factor(f *Factor) {
	if f == nil {
		return
	}
	b := &fm.buf
	if f.Sign != "" {
		b.WriteString(f.Sign)
		// "- 2" was written apart: written together it would read as the
		// number -2, a different tree.
		if f.Atom != nil && startsUnsignedNumber(f.Atom.Number) {
			b.WriteByte(' ')
		}
	}
	fm.atom(f.Atom)
	if p := f.Power; p != nil {
		if f.Atom != nil && f.Atom.Unit != nil {
			// "2 m^2" would read as the unit m^2.
			b.WriteByte(' ')
		}
		b.WriteByte('^')
		b.WriteString(p.Sign)
		if p.Sign != "" && startsUnsignedNumber(p.Digits) {
			b.WriteByte(' ')
		}
		b.WriteString(p.Digits)
	}
}

func (fm *formatter) atom(a *Atom) {
	if a == nil {
		return
	}
	b := &fm.buf
	switch {
	case a.Number != "":
		b.WriteString(a.Number)
	case a.Ref != nil:
		b.WriteString(a.Ref.Name)
	case a.Str != nil:
		b.WriteString(a.Str.Quoted)
	default:
		b.WriteByte('(')
		for i, e := range a.Group {
			if i > 0 {
				b.WriteString(", ")
			}
			fm.expr(e)
		}
		b.WriteByte(')')
	}
	if a.Unit != nil {
		b.WriteByte(' ')
		b.WriteString(a.Unit.Text)
	}
}
