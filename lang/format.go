package lang

import (
	"bytes"
	"errors"
	"fmt"
	"strings"
	"unsafe"
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
	fm := newFormatter(f.Mapper, len(f.Src), &f.Comments)
	fm.walk(f.Stmts, 0, len(f.Src))
	return fm.finish(), nil
}

// FormatSource parses src and formats it as Format does, statement by
// statement as the parser reads them, without keeping a syntax tree: its
// memory is the text, its output and one statement. The file returned
// holds the syntax errors, the comments not yet written and the Mapper, but
// no statements; with errors there is no text. Its strings share src's
// memory, which must not change while it is in use.
func FormatSource(path string, src []byte) ([]byte, *File) {
	f := &File{Path: path, Src: src, Mapper: NewMapper(src)}
	// The tokens are written out and dropped: their text may share src's
	// memory instead of a copy (the file returned holds src anyway).
	sc := newScannerOf(src, unsafe.String(unsafe.SliceData(src), len(src)))
	fm := newFormatter(f.Mapper, len(src), &sc.comments)
	fm.stream = true
	p := &parser{f: f, sc: sc, toks: sc.toks, sink: fm}
	p.run()
	f.Comments = sc.comments
	if len(f.Errors) > 0 {
		return nil, f
	}
	return fm.finish(), f
}

// formatSink receives the statements of a file in source order as the
// parser reads them: each statement's head at its block depth (after its
// block, if any, was opened) and each closing brace.
type formatSink interface {
	head(s *Stmt, depth int)
	close(off, depth int)
}

// formatter writes the canonical layout as it is given statement heads and
// closing braces in source order, merging the comments in.
type formatter struct {
	m   *Mapper
	out bytes.Buffer
	// comments are the file's comments in order; those before ci are
	// written. In a streaming run they are the scanner's, which the
	// formatter empties as it writes them.
	comments *[]Comment
	ci       int
	srcLen   int
	stream   bool

	lastLine  int  // source line of the last thing written
	afterOpen bool // the last line written opened a block
	wrote     bool // anything written yet
	itemLine  int  // source line of the last statement or brace written
}

func newFormatter(m *Mapper, srcLen int, comments *[]Comment) *formatter {
	return &formatter{m: m, comments: comments, srcLen: srcLen, lastLine: -1, itemLine: -1}
}

// lineOf is the line of an offset: lines end at "\n", "\r\n" or a lone
// "\r", for the language as for positions.
func (fm *formatter) lineOf(off int) int { return fm.m.OffsetLine(off) }

// walk gives the statements of a tree to the formatter in source order.
func (fm *formatter) walk(stmts []*Stmt, depth, srcLen int) {
	for _, s := range stmts {
		fm.head(s, depth)
		if s.Block != nil {
			fm.walk(s.Block.Stmts, depth+1, srcLen)
			off := s.Block.Close
			if off < 0 {
				off = srcLen
			}
			fm.close(off, depth)
		}
	}
}

func (fm *formatter) blankBefore(line int) bool {
	return fm.wrote && !fm.afterOpen && fm.lastLine >= 0 && line-fm.lastLine >= 2
}

func (fm *formatter) indent(d int) {
	for i := 0; i < d; i++ {
		fm.out.WriteString("  ")
	}
}

// lones writes the comments before off that no statement's line took, as
// lines of their own at depth d.
func (fm *formatter) lones(off, d int) {
	cs := *fm.comments
	for fm.ci < len(cs) && cs[fm.ci].Span.Start < off {
		c := cs[fm.ci]
		fm.ci++
		line := fm.lineOf(c.Span.Start)
		if fm.blankBefore(line) {
			fm.out.WriteByte('\n')
		}
		fm.indent(d)
		fm.out.WriteString(strings.TrimRight(c.Text, "\r"))
		fm.out.WriteByte('\n')
		fm.lastLine, fm.afterOpen, fm.wrote = line, false, true
	}
	fm.drop()
}

// drop forgets the comments written, in a streaming run, so they are not
// all held at once.
func (fm *formatter) drop() {
	if fm.comments != nil && fm.ci == len(*fm.comments) && fm.ci > 0 && fm.streaming() {
		*fm.comments = (*fm.comments)[:0]
		fm.ci = 0
	}
}

// streaming reports whether the comments are the scanner's.
func (fm *formatter) streaming() bool { return fm.stream }

// begin starts an item at off: the comments before it, a blank line when
// the source has one, the indentation.
func (fm *formatter) begin(off, depth int, closing bool) int {
	if fm.out.Cap() == 0 {
		// The layout is about as long as the text: one allocation.
		fm.out.Grow(fm.srcLen + fm.srcLen/8 + 1)
	}
	d := depth
	if closing {
		d++
	}
	fm.lones(off, d)
	line := fm.lineOf(off)
	if !closing && fm.blankBefore(line) {
		fm.out.WriteByte('\n')
	}
	fm.indent(depth)
	return line
}

// end finishes an item's line: the comment after it, when the item is the
// first on its source line, then the newline.
func (fm *formatter) end(line int, opens bool) {
	if line != fm.itemLine {
		cs := *fm.comments
		for fm.ci < len(cs) && fm.lineOf(cs[fm.ci].Span.Start) == line {
			fm.out.WriteString("  ")
			fm.out.WriteString(strings.TrimRight(cs[fm.ci].Text, "\r"))
			fm.ci++
		}
	}
	fm.out.WriteByte('\n')
	fm.itemLine = line
	fm.lastLine, fm.afterOpen, fm.wrote = line, opens, true
	fm.drop()
}

func (fm *formatter) head(s *Stmt, depth int) {
	line := fm.begin(s.Pos.Offset, depth, false)
	fm.stmt(s)
	if s.Block != nil {
		fm.out.WriteString(" {")
	}
	fm.end(line, s.Block != nil)
}

func (fm *formatter) close(off, depth int) {
	line := fm.begin(off, depth, true)
	fm.out.WriteByte('}')
	fm.end(line, false)
}

// finish writes the comments after the last statement and returns the text.
func (fm *formatter) finish() []byte {
	cs := *fm.comments
	for ; fm.ci < len(cs); fm.ci++ {
		c := cs[fm.ci]
		line := fm.lineOf(c.Span.Start)
		if fm.blankBefore(line) {
			fm.out.WriteByte('\n')
		}
		fm.out.WriteString(strings.TrimRight(c.Text, "\r"))
		fm.out.WriteByte('\n')
		fm.lastLine, fm.afterOpen, fm.wrote = line, false, true
	}
	return fm.out.Bytes()
}

func (fm *formatter) stmt(s *Stmt) {
	b := &fm.out
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
		fm.out.WriteByte(' ')
		fm.out.WriteString(op.Op)
		fm.out.WriteByte(' ')
		fm.term(op.Term)
	}
}

func (fm *formatter) term(t *Term) {
	if t == nil {
		return
	}
	fm.factor(t.Left)
	for _, op := range t.Ops {
		fm.out.WriteByte(' ')
		fm.out.WriteString(op.Op)
		fm.out.WriteByte(' ')
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
	b := &fm.out
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
	b := &fm.out
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
