package lang

import (
	"errors"
	"fmt"
	"strings"
	"unsafe"

	"github.com/alecthomas/participle/v2"
	"github.com/alecthomas/participle/v2/lexer"
)

// MaxNesting bounds how deeply parentheses may nest in one statement. The
// grammar is parsed recursively; the bound keeps hostile text from using
// unbounded stack, and no real expression comes near it. Blocks may nest
// as deeply too: the statements of a block deeper than that are read for
// their errors but not kept in the tree (its statement is kept, with no
// statements in its block), and each brace open below costs 8 bytes.
const MaxNesting = 100

// Parse parses one .loop text. It never fails: syntax errors are collected
// in File.Errors (at most one per line) and every statement that parsed is
// kept, so a half-typed line leaves the rest of the file usable.
// The file keeps src as its text and its strings share src's memory: src
// must not change afterwards.
func Parse(path string, src []byte) *File { return parse(path, src, false) }

// parse is Parse; grammarOnly turns the fast path off, so tests can compare
// its trees with the grammar's.
func parse(path string, src []byte, grammarOnly bool) *File {
	f, _ := parseMapped(path, src, NewMapper(src), grammarOnly)
	return f
}

// parseMapped is parse with the text's mapper already made; it returns the
// finished parser too, for what it saw.
func parseMapped(path string, src []byte, m *Mapper, grammarOnly bool) (*File, *parser) {
	f := &File{Path: path, Src: src, Mapper: m}
	// The tree's names and numbers share src's memory, which the file
	// holds as its text anyway, instead of a copy of it.
	sc := newScannerOf(src, unsafe.String(unsafe.SliceData(src), len(src)))
	p := &parser{f: f, sc: sc, toks: sc.toks, grammarOnly: grammarOnly}
	p.run()
	f.Comments = sc.comments
	return f, p
}

type parser struct {
	f  *File
	sc *scanner
	// toks are tokens of the current line, from the first one not yet
	// consumed when they were last all consumed; the scanner adds them as
	// they are looked at (see at), so a line of a million bad tokens is
	// never held whole.
	toks []lexer.Token
	// ahead is the scratch buffer of tooDeep's look ahead.
	ahead []lexer.Token
	cur   int // raw index in toks of the next token, elided ones included
	// lexBase is the raw index in toks where the lexer lexAt last made
	// starts.
	lexBase int
	// open blocks, innermost last
	stack []*Stmt
	// the statements of each open block so far, carved into the block's
	// Stmts when it closes
	open [][]*Stmt
	// line of the last error, to keep one error per line
	errLine int
	// deepBlocks is set once nesting too deep has been reported
	deepBlocks bool
	// deep are the blocks open inside edge, the block of the statement
	// that opened one block more than MaxNesting: they are not in the
	// tree, and only what closing them and reporting them never closed
	// needs is kept. The block, not its statement, whose nodes a sink
	// hands out again once it is written.
	deep        deepStack
	edge        *Block
	nodes       nodes // the fast path's node chunks
	grammarOnly bool  // parse every statement with the grammar
	tooMany     bool  // MaxErrors reached: no more errors, no explanations
	stray       bool  // a '}' closed no block
	// sink, when set, receives each statement as it is read instead of the
	// tree: the statements are not kept (see FormatSource).
	sink formatSink
	held []*heldStmt // with a sink, the open blocks' statements by depth
	// heads, when set, keeps of each statement that the fast path reads
	// only its head (span, word, block), from heads' own chunks: its
	// parts are given back at once (see parseHeads).
	heads *headNodes
}

// heldStmt is what an open block's statement keeps while its block is read
// with a sink.
type heldStmt struct {
	stmt Stmt
	word Ident
}

// MaxErrors bounds the syntax errors reported for one file. Past it the
// text is most likely not a .loop file at all (a binary, a file of another
// kind): one note says so, and bad statements are skipped without being
// explained, which is also what keeps such input cheap.
const MaxErrors = 100

func (p *parser) errorf(span Span, format string, args ...any) {
	line := p.f.Mapper.OffsetLine(span.Start)
	if len(p.f.Errors) > 0 && p.errLine == line {
		return
	}
	p.errLine = line
	if p.tooMany {
		return
	}
	if len(p.f.Errors) == MaxErrors {
		p.tooMany = true
		format, args = "more than %d syntax errors: the rest are not reported; this does not look like a .loop file", []any{MaxErrors}
	}
	p.f.Errors = append(p.f.Errors, Diagnostic{
		Rule: "syntax", Severity: Error,
		Loc:    Location{File: p.f.Path, Span: span},
		Format: format, Args: args,
	})
}

func (p *parser) add(s *Stmt) {
	if p.sink != nil || p.deep.n > 0 {
		return
	}
	if n := len(p.stack); n > 0 {
		p.open[n-1] = append(p.open[n-1], s)
		return
	}
	p.f.Stmts = append(p.f.Stmts, s)
}

// shut gives the innermost open block the statements gathered for it.
func (p *parser) shut() {
	n := len(p.stack)
	p.stack[n-1].Block.Stmts = p.nodes.stmtPtrs.carve(p.open[n-1])
	clear(p.open[n-1])
	p.open[n-1] = p.open[n-1][:0]
	p.stack = p.stack[:n-1]
}

func tokSpan(t *lexer.Token) Span { return Span{t.Pos.Offset, t.Pos.Offset + len(t.Value)} }

func isPunctTok(t *lexer.Token, v string) bool { return t.Type == TokPunct && t.Value == v }

// isOperator reports whether t is one of the binary operators + - * / ^.
func isOperator(t *lexer.Token) bool {
	return t.Type == TokPunct && len(t.Value) == 1 && strings.Contains("+-*/^", t.Value)
}

// refill drops the tokens once all are consumed and scans the next one. A
// token pointer or raw index taken before it is not used after it.
func (p *parser) refill() {
	if p.cur < len(p.toks) {
		return
	}
	p.sc.toks = p.sc.toks[:0]
	p.sc.step()
	p.toks, p.cur = p.sc.toks, 0
}

// at returns the token at raw index j of toks, scanning on to it. Callers
// look no further than the line's newline or the EOF token. A pointer
// taken before stays readable (the tokens it may move are copied, never
// changed).
func (p *parser) at(j int) *lexer.Token {
	for j >= len(p.toks) {
		p.sc.step()
		p.toks = p.sc.toks
	}
	return &p.toks[j]
}

// scanLine scans the rest of the current line: a sink is handed the
// line's comments with its first statement.
func (p *parser) scanLine() {
	for j := max(len(p.toks)-1, 0); ; j++ {
		if t := p.at(j); t.Type == TokNewline || t.Type == TokEOF {
			return
		}
	}
}

func elided(t *lexer.Token) bool { return t.Type == TokSpace || t.Type == TokComment }

// peek returns the next token that is not elided.
func (p *parser) peek() *lexer.Token {
	p.refill()
	j := p.cur
	for elided(p.at(j)) {
		j++
	}
	return &p.toks[j]
}

// next consumes the next token that is not elided; the end stays put.
func (p *parser) next() *lexer.Token {
	p.refill()
	for elided(p.at(p.cur)) {
		p.cur++
	}
	t := &p.toks[p.cur]
	if t.Type != TokEOF {
		p.cur++
	}
	return t
}

// lexAt returns participle's lexer over the tokens of the line from cur
// on: a statement never continues onto the next line, and a lexer over the
// whole file would copy every token of it for each bad statement. Raw
// cursors of the lexer count from lexBase.
func (p *parser) lexAt() *lexer.PeekingLexer { return p.lexUpTo(false) }

// lexUpTo is lexAt; with first, its window ends after the first token
// that is not elided, which is all the grammar reads of a statement that
// does not start with a name before it fails.
func (p *parser) lexUpTo(first bool) *lexer.PeekingLexer {
	end := p.cur
	for t := p.at(end); t.Type != TokNewline && t.Type != TokEOF && !endsStmt(t); t = p.at(end) {
		if first && !elided(t) {
			break
		}
		end++
	}
	window := p.toks[p.cur : end+1]
	switch t := p.toks[end]; {
	case first && t.Type != TokNewline && t.Type != TokEOF:
		window = append(window[:len(window):len(window)], lexer.EOFToken(lexer.Position{Offset: t.Pos.Offset + len(t.Value), Line: t.Pos.Line, Column: t.Pos.Column + len(t.Value)}))
	case t.Type == TokNewline:
		// Ends like the file would, after the newline.
		window = append(window[:len(window):len(window)], lexer.EOFToken(lexer.Position{Offset: t.Pos.Offset + 1, Line: t.Pos.Line + 1, Column: 1}))
	case t.Type != TokEOF:
		// No statement or part reads past its ';', '{' or '}', so the
		// window stops there: a line of many bad statements (a line of
		// '{', say) would otherwise lex the rest of the line for each,
		// quadratic in the line's length.
		window = append(window[:len(window):len(window)], lexer.EOFToken(lexer.Position{Offset: t.Pos.Offset + len(t.Value), Line: t.Pos.Line, Column: t.Pos.Column + len(t.Value)}))
	}
	p.lexBase = p.cur
	lex, err := lexer.Upgrade(&sliceLexer{toks: window}, TokSpace, TokComment)
	if err != nil {
		// sliceLexer never fails; keep a usable lexer regardless.
		lex, _ = lexer.Upgrade(&sliceLexer{toks: p.toks[len(p.toks)-1:]})
	}
	return lex
}

// endsStmt reports whether t ends a statement within its line.
func endsStmt(t *lexer.Token) bool {
	return t.Type == TokPunct && (t.Value == ";" || t.Value == "{" || t.Value == "}")
}

func (p *parser) run() {
	for {
		t := p.peek()
		switch {
		case t.EOF():
			p.closeAll(tokSpan(t))
			return
		case t.Type == TokNewline || isPunctTok(t, ";"):
			p.next()
		case isPunctTok(t, "}"):
			sp := tokSpan(t)
			p.next()
			p.close(sp)
		default:
			p.statement()
		}
	}
}

// push opens the block of s. Blocks nested deeper than MaxNesting are an
// error (reported once, at the first brace too many): real files nest two
// or three levels, and the canonical layout of deeper nesting grows with
// the square of the depth.
func (p *parser) push(s *Stmt) {
	if len(p.stack) == MaxNesting {
		if !p.deepBlocks {
			p.deepBlocks = true
			p.errorf(Span{s.Block.Open, s.Block.Open + 1}, "blocks nested too deeply: more than %d levels", MaxNesting)
		}
		if p.deep.n == 0 {
			p.edge = s.Block
		}
		p.pushDeep(s.Block.Open, wordStart(s))
		return
	}
	if p.sink != nil {
		// The statement's nodes go back to the chunks once it is written;
		// the open block keeps a copy of what closing it needs, one per
		// depth.
		d := len(p.stack)
		if d == len(p.held) {
			p.held = append(p.held, new(heldStmt))
		}
		h := p.held[d]
		h.stmt = Stmt{Pos: s.Pos, EndPos: s.EndPos, Block: s.Block, Bad: s.Bad}
		if s.Word != nil {
			h.word = *s.Word
			h.stmt.Word = &h.word
		}
		s = &h.stmt
	}
	p.stack = append(p.stack, s)
	if len(p.open) < len(p.stack) {
		p.open = append(p.open, nil)
	}
}

// deepBlock is a block open deeper than MaxNesting: the offsets of its
// '{' and of its statement's word (-1 for none).
type deepBlock struct{ open, word int32 }

// deepStack is a stack of deepBlocks in chunks, which are never copied as
// it grows.
type deepStack struct {
	chunks [][]deepBlock
	n      int
}

const deepChunk = 4096

func (d *deepStack) push(b deepBlock) {
	if d.n == len(d.chunks)*deepChunk {
		d.chunks = append(d.chunks, make([]deepBlock, deepChunk))
	}
	d.chunks[d.n/deepChunk][d.n%deepChunk] = b
	d.n++
}

func (d *deepStack) pop() deepBlock {
	d.n--
	return d.chunks[d.n/deepChunk][d.n%deepChunk]
}

// wordStart is the offset of the word of s, or -1.
func wordStart(s *Stmt) int {
	if s.Word == nil {
		return -1
	}
	return s.Word.Pos.Offset
}

// pushDeep opens a block deeper than MaxNesting at the '{' at offset open,
// of a statement whose word starts at offset word (-1 for none).
func (p *parser) pushDeep(open, word int) {
	p.deep.push(deepBlock{int32(open), int32(word)})
}

// wordAtOffset is the word that starts at offset off, as the scanner read it.
func (p *parser) wordAtOffset(off int) string {
	if off < 0 {
		return ""
	}
	sc := scanner{src: p.sc.src, str: p.sc.str, pos: off, line: 1}
	sc.scanIdent()
	return sc.toks[0].Value
}

// close ends the innermost block at the '}' at span sp.
func (p *parser) close(sp Span) {
	if p.deep.n > 0 {
		p.deep.pop()
		if p.deep.n == 0 {
			p.edge.Close = sp.Start
			p.edge = nil
		}
		return
	}
	n := len(p.stack)
	if n == 0 {
		p.stray = true
		p.errorf(sp, "unmatched '}': no block is open here")
		return
	}
	p.stack[n-1].Block.Close = sp.Start
	if p.sink != nil && len(p.f.Errors) == 0 {
		p.scanLine()
		p.sink.close(sp.Start, n-1)
	}
	if p.heads != nil && p.heads.reread(p.f.Src, p.stack[n-1], p.open[n-1]) {
		clear(p.open[n-1])
		p.open[n-1] = p.open[n-1][:0]
		p.stack = p.stack[:n-1]
		return
	}
	p.shut()
}

func (p *parser) closeAll(eof Span) {
	// Past the error limit nothing more is reported: a line of a million
	// '{' leaves as many blocks open.
	for p.deep.n > 0 && !p.tooMany {
		b := p.deep.pop()
		p.errLine = -1
		p.errorf(Span{int(b.open), int(b.open) + 1}, "block of %q opened here is never closed: add '}'", p.wordAtOffset(int(b.word)))
	}
	p.deep, p.edge = deepStack{}, nil
	for i := len(p.stack) - 1; i >= 0 && !p.tooMany; i-- {
		s := p.stack[i]
		p.errLine = -1
		p.errorf(Span{s.Block.Open, s.Block.Open + 1}, "block of %q opened here is never closed: add '}'", s.Keyword())
	}
	for len(p.stack) > 0 {
		p.shut()
	}
	p.stack = nil
}

// statement parses one statement and what ends it.
func (p *parser) statement() {
	first := *p.peek()
	start := p.cur
	if deep, why := p.tooDeep(start, first.Type == TokIdent); why != 0 {
		if why == tooLong {
			p.reportCapped(first, deep)
		} else {
			p.errorf(tokSpan(&deep), "expression nested too deeply: more than %d parentheses are open here", MaxNesting)
		}
		p.skipBad(first)
		return
	}
	if !p.grammarOnly {
		q := fastParser{toks: p.toks, i: start, nodes: &p.nodes, p: p, partial: true}
		mark := p.nodes.mark()
		if stmt, ok := q.stmt(); ok {
			p.cur = q.i
			if p.deep.n > 0 {
				// Deeper than the tree keeps: read only for what ends it.
				p.terminator(stmt)
				p.nodes.release(mark)
				return
			}
			if q.stopped && p.sink == nil && p.heads == nil {
				// A statement cut short is kept whole, as the grammar's
				// would be, in its own slice of parts.
				stmt.Args = append([]*Arg(nil), stmt.Args...)
			}
			if p.heads != nil && p.sink == nil {
				// Read for its model, a statement keeps its head alone;
				// one cut short is marked Bad by its terminator and
				// nothing reads its parts.
				var in *Stmt
				if len(p.stack) > 0 {
					in = p.stack[len(p.stack)-1]
				}
				stmt = p.heads.keep(stmt, in)
				p.nodes.release(mark)
				p.nodes.argPtrs.reset()
			}
			depth := len(p.stack)
			p.add(stmt)
			p.terminator(stmt)
			if p.sink != nil {
				if len(p.f.Errors) == 0 {
					p.scanLine()
					p.sink.head(stmt, depth)
				}
				p.nodes.release(mark)
				p.nodes.argPtrs.reset()
			}
			return
		}
		// Give back the nodes of the attempt: a file of bad lines would
		// otherwise keep a half tree of each.
		p.nodes.release(mark)
	}
	if p.tooMany {
		p.skipBad(first)
		return
	}
	if first.Type != TokIdent && !p.grammarOnly {
		// The grammar's statement starts with a name, so it fails at
		// first as surely as the fast path did. Its explanation is wanted
		// only for the line's first error (one is reported per line): a
		// line of many such statements ('{' or '}' after '{') would
		// otherwise have each explained in vain. Off with grammarOnly, so
		// the fuzzers compare this with the grammar's own answer.
		if len(p.f.Errors) > 0 && p.errLine == p.f.Mapper.OffsetLine(first.Pos.Offset) {
			p.skipBad(first)
			return
		}
	}
	lex := p.lexUpTo(first.Type != TokIdent && !p.grammarOnly)
	cp := lex.MakeCheckpoint()
	stmt, err := parseStmt(lex)
	if err == nil {
		p.cur = p.lexBase + int(lex.MakeCheckpoint().RawCursor())
		depth := len(p.stack)
		p.add(stmt)
		p.terminator(stmt)
		if p.sink != nil && len(p.f.Errors) == 0 {
			p.scanLine()
			p.sink.head(stmt, depth)
		}
		return
	}
	// Recover: report, keep what can be kept, skip to the end of the line,
	// opening a block if the bad line opens one so later lines nest right.
	lex.LoadCheckpoint(cp)
	p.reportParseError(err, first)
	p.skipBad(first)
}

// MaxStmtTokens bounds the tokens of one statement that starts with a
// name, which bounds its parts and the terms of each of its expressions.
// The tree of a statement costs some hundred bytes a part, and the grammar
// keeps all of a statement's tokens: a line of a million parts took 376 MB.
// The longest statement of the shipped examples has a few dozen tokens.
// A statement longer than that is one error, at its first token beyond
// the bound, and is skipped to the end of its line like any bad statement.
const MaxStmtTokens = 4096

// What tooDeep found.
const (
	tooDeepParen = 1 // a parenthesis opens more than MaxNesting levels
	tooLong      = 2 // the statement has more than MaxStmtTokens tokens
)

// tooDeep returns the parenthesis that opens one level too many in the
// statement starting at raw token index i, or, with count, the first of
// its tokens beyond MaxStmtTokens, and which of the two it is (0 for
// neither). Tokens are counted up to the first that neither starts a part
// nor continues an expression outside parentheses: the statement is cut
// short there anyway, and its error is that token's. What of the statement
// is not scanned yet is read by a copy of the scanner that keeps nothing,
// so a statement of a million tokens is not held for it.
func (p *parser) tooDeep(i int, count bool) (lexer.Token, int) {
	depth, n := 0, 0
	// deeper reports whether t ends the search, and what it found.
	deeper := func(t *lexer.Token) (stop bool, why int) {
		if t.Type == TokNewline || t.Type == TokEOF {
			return true, 0
		}
		if count && !elided(t) {
			if depth <= 0 && !startsArg(t) && t.Type != TokUnit && !isOperator(t) {
				count = false
			} else if n++; n > MaxStmtTokens {
				return true, tooLong
			}
		}
		if t.Type != TokPunct {
			return false, 0
		}
		switch t.Value {
		case "(":
			depth++
			if depth > MaxNesting {
				return true, tooDeepParen
			}
		case ")":
			depth--
		case ";", "{", "}":
			return true, 0
		}
		return false, 0
	}
	for ; i < len(p.toks); i++ {
		if stop, why := deeper(&p.toks[i]); stop {
			return p.toks[i], why
		}
	}
	ahead := *p.sc
	ahead.toks, ahead.lookahead = p.ahead[:0], true
	defer func() { p.ahead = ahead.toks[:0] }()
	for {
		ahead.step()
		for j := range ahead.toks {
			if stop, why := deeper(&ahead.toks[j]); stop {
				return ahead.toks[j], why
			}
		}
		ahead.toks = ahead.toks[:0]
	}
}

// reportCapped reports the error of the statement that starts with first
// and has more than MaxStmtTokens tokens, cap the first beyond the bound:
// the first error of the statement cut short at cap, which is where the
// statement read whole would report it (one error is reported per line,
// and the bound's would hide it), or else that the statement is too long.
// An error found only by reading on past cap (an operator before cap with
// its value beyond, a part that runs past cap) is the bound's. The grammar
// reads the statement up to cap alone: at most MaxStmtTokens tokens and
// the blanks between them.
func (p *parser) reportCapped(first, cap lexer.Token) {
	if p.tooMany || len(p.f.Errors) > 0 && p.errLine == p.f.Mapper.OffsetLine(first.Pos.Offset) {
		// The line's error is reported already.
		return
	}
	end := p.cur
	for p.at(end).Pos.Offset < cap.Pos.Offset {
		end++
	}
	cut := p.cur
	if !p.grammarOnly {
		// The fast path reads most such statements whole up to cap, and
		// then the grammar, which allocates some kilobytes a token, need
		// not read them. Off with grammarOnly, so the fuzzers compare
		// this with the grammar's own answer.
		// It reads the tokens in place, cap made the end for the while.
		capTok := p.toks[end]
		p.toks[end] = lexer.EOFToken(lexer.Position{Offset: capTok.Pos.Offset, Line: capTok.Pos.Line, Column: capTok.Pos.Column})
		window := p.toks[p.cur : end+1]
		q := fastParser{toks: window, nodes: &p.nodes, partial: true}
		mark := p.nodes.mark()
		_, ok := q.stmt()
		p.nodes.release(mark)
		p.toks[end] = capTok
		if ok {
			stop := q.i
			for elided(&window[stop]) {
				stop++
			}
			if stop+p.cur == end || !p.explainCapped(stop+p.cur, end) {
				p.errorf(tokSpan(&cap), "statement has more than %d tokens: the rest of the line is skipped", MaxStmtTokens)
			}
			return
		}
	}
	// The grammar's error for a statement cut inside a parenthesis or
	// after an operator may lie before the cut (for "(1 +" it is "+",
	// where ")" was expected): it reads the statement up to its last
	// token at depth 0 that is not an operator, where a statement may
	// end, and an error beyond that is the bound's.
	depth := 0
	for j := p.cur; j < end; j++ {
		t := &p.toks[j]
		if elided(t) {
			continue
		}
		switch {
		case isPunctTok(t, "("):
			depth++
		case isPunctTok(t, ")"):
			depth--
		}
		if depth == 0 && !isOperator(t) && !isPunctTok(t, "(") {
			cut = j + 1
		}
	}
	for cut < end && elided(&p.toks[cut]) {
		cut++
	}
	lex := p.lexBefore(p.cur, cut)
	_, err := parseStmt(lex)
	var perr participle.Error
	switch {
	case err != nil && (!errors.As(err, &perr) || perr.Position().Offset < p.toks[cut].Pos.Offset):
		p.reportParseError(err, first)
		return
	case err == nil:
		stop := p.lexBase + int(lex.MakeCheckpoint().RawCursor())
		for stop < cut && elided(&p.toks[stop]) {
			stop++
		}
		if stop < cut && p.explainCapped(stop, cut) {
			return
		}
	}
	p.errorf(tokSpan(&cap), "statement has more than %d tokens: the rest of the line is skipped", MaxStmtTokens)
}

// explainCapped is explainStop for a statement stopped at raw index stop
// before the bound at raw index end: it reports the error found in the
// tokens before end, and whether there is one.
func (p *parser) explainCapped(stop, end int) bool {
	t := p.toks[stop]
	if isOperator(&t) {
		j := stop + 1
		for j < end && elided(&p.toks[j]) {
			j++
		}
		if j == end {
			// Its value may be past the bound.
			return false
		}
	}
	if !startsArg(&t) {
		p.errorf(tokSpan(&t), "%s", unexpected(&t, "at the end of the statement"))
		return true
	}
	_, err := parseArg(p.lexBefore(stop, end))
	var perr participle.Error
	if err != nil && errors.As(err, &perr) && perr.Position().Offset > t.Pos.Offset {
		if perr.Position().Offset >= p.toks[end].Pos.Offset {
			return false
		}
		p.reportParseError(err, t)
		return true
	}
	p.errorf(tokSpan(&t), "%s", unexpected(&t, "at the end of the statement"))
	return true
}

// lexBefore returns participle's lexer over the raw tokens from index
// from up to index end, which it ends at the start of toks[end].
func (p *parser) lexBefore(from, end int) *lexer.PeekingLexer {
	pos := p.toks[end].Pos
	window := append(p.toks[from:end:end], lexer.EOFToken(lexer.Position{Offset: pos.Offset, Line: pos.Line, Column: pos.Column}))
	p.lexBase = from
	lex, err := lexer.Upgrade(&sliceLexer{toks: window}, TokSpace, TokComment)
	if err != nil {
		// sliceLexer never fails; keep a usable lexer regardless.
		lex, _ = lexer.Upgrade(&sliceLexer{toks: window[len(window)-1:]})
	}
	return lex
}

// skipBad keeps a statement that did not parse as a Bad one and skips to
// the end of its line, opening a block if the line opens one so later
// lines nest right.
func (p *parser) skipBad(first lexer.Token) {
	end := first.Pos.Offset + len(first.Value)
	for {
		t := p.peek()
		if t.EOF() || t.Type == TokNewline || isPunctTok(t, "}") {
			break
		}
		p.next()
		end = t.Pos.Offset + len(t.Value)
		if isPunctTok(t, "{") {
			if p.deep.n > 0 {
				word := -1
				if first.Type == TokIdent {
					word = first.Pos.Offset
				}
				p.pushDeep(t.Pos.Offset, word)
				return
			}
			bad := badStmt(first)
			bad.EndPos = Pos{Offset: t.Pos.Offset}
			bad.Block = &Block{Open: t.Pos.Offset, Close: -1}
			p.add(bad)
			p.push(bad)
			return
		}
	}
	if p.deep.n > 0 {
		return
	}
	bad := badStmt(first)
	bad.EndPos = Pos{Offset: end}
	p.add(bad)
}

// badStmt is the Bad statement that starts with token first.
func badStmt(first lexer.Token) *Stmt {
	bad := &Stmt{Pos: at(first.Pos), Bad: true}
	if first.Type == TokIdent {
		bad.Word = &Ident{Pos: at(first.Pos), EndPos: Pos{Offset: first.Pos.Offset + len(first.Value)}, Name: first.Value}
	}
	return bad
}

// terminator handles what follows a parsed statement: '{', '}', ';', a
// newline or the end.
func (p *parser) terminator(s *Stmt) {
	t := p.peek()
	switch {
	case t.EOF() || t.Type == TokNewline || isPunctTok(t, ";") || isPunctTok(t, "}"):
		return
	case isPunctTok(t, "{"):
		p.next()
		if p.deep.n > 0 {
			p.pushDeep(t.Pos.Offset, wordStart(s))
			return
		}
		s.Block = &Block{Open: t.Pos.Offset, Close: -1}
		nt := p.peek()
		s.Block.OneLine = !(nt.Type == TokNewline || nt.EOF())
		p.push(s)
		return
	}
	// The statement is incomplete: keep its head but mark it Bad so no
	// later pass reads half an expression as the whole value.
	s.Bad = true
	if !p.tooMany {
		p.explainStop(t)
	}
	for {
		t := p.peek()
		if t.EOF() || t.Type == TokNewline || isPunctTok(t, "}") || isPunctTok(t, ";") {
			return
		}
		p.next()
		if isPunctTok(t, "{") {
			if p.deep.n > 0 {
				p.pushDeep(t.Pos.Offset, wordStart(s))
				return
			}
			s.Block = &Block{Open: t.Pos.Offset, Close: -1}
			p.push(s)
			return
		}
	}
}

// explainStop reports why the statement parser stopped at t, which is not
// the end of the statement: an operator with nothing after it, or the
// error found by parsing one more part from t.
func (p *parser) explainStop(t *lexer.Token) {
	if isOperator(t) {
		// The token after t, looked at without consuming t.
		j := p.cur
		for elided(p.at(j)) {
			j++
		}
		j++
		for elided(p.at(j)) {
			j++
		}
		n := p.at(j)
		if n.EOF() || n.Type == TokNewline || isPunctTok(n, ";") || isPunctTok(n, "}") || isPunctTok(n, "{") {
			p.errorf(tokSpan(t), "%q needs a value after it", t.Value)
			return
		}
	}
	if !p.grammarOnly && !startsArg(t) {
		// No part starts with t, so the grammar fails at t itself, the
		// same answer as below without lexing the rest of the statement
		// (a million tokens, on a line of them).
		p.errorf(tokSpan(t), "%s", unexpected(t, "at the end of the statement"))
		return
	}
	lex := p.lexAt()
	cp := lex.MakeCheckpoint()
	_, err := parseArg(lex)
	lex.LoadCheckpoint(cp)
	var perr participle.Error
	if err != nil && errors.As(err, &perr) && perr.Position().Offset > t.Pos.Offset {
		p.reportParseError(err, *t)
		return
	}
	p.errorf(tokSpan(t), "%s", unexpected(t, "at the end of the statement"))
}

func (p *parser) reportParseError(err error, first lexer.Token) {
	var perr participle.Error
	if errors.As(err, &perr) {
		off := perr.Position().Offset
		t := p.tokenAt(off)
		msg := perr.Message()
		if t != nil {
			msg = unexpected(t, "")
			if strings.Contains(perr.Message(), "expected") {
				if i := strings.Index(perr.Message(), "(expected"); i >= 0 {
					msg += " " + friendlyExpected(perr.Message()[i:])
				}
			}
			p.errorf(tokSpan(t), "%s", msg)
			return
		}
		p.errorf(Span{off, off}, "%s", msg)
		return
	}
	p.errorf(tokSpan(&first), "%s", err.Error())
}

func (p *parser) tokenAt(off int) *lexer.Token {
	// Binary search over token offsets.
	lo, hi := 0, len(p.toks)
	for lo < hi {
		m := (lo + hi) / 2
		if p.toks[m].Pos.Offset < off {
			lo = m + 1
		} else {
			hi = m
		}
	}
	for lo < len(p.toks) && (p.toks[lo].Type == TokSpace || p.toks[lo].Type == TokComment) {
		lo++
	}
	if lo < len(p.toks) {
		return &p.toks[lo]
	}
	return nil
}

func friendlyExpected(s string) string {
	s = strings.TrimPrefix(s, "(")
	s = strings.TrimSuffix(s, ")")
	// The grammar's mirror types are named gAtom, gExpr, …; participle
	// capitalises them in its messages.
	for _, g := range []string{"GAtom", "GExpr", "GFactor", "GTerm", "GIdent", "GStr", "GUnitTok", "GArg", "GPower"} {
		s = strings.ReplaceAll(s, g, strings.TrimPrefix(g, "G"))
	}
	s = strings.ReplaceAll(s, "<ident>", "a name")
	s = strings.ReplaceAll(s, "<number>", "a number")
	s = strings.ReplaceAll(s, "<string>", "a string")
	s = strings.ReplaceAll(s, "Atom", "a value")
	s = strings.ReplaceAll(s, "Expr", "a value")
	s = strings.ReplaceAll(s, "Factor", "a value")
	s = strings.ReplaceAll(s, "Term", "a value")
	// After a statement's word every name is part of a value.
	s = strings.ReplaceAll(s, "expected Ident", "expected a value")
	return "(" + s + ")"
}

func unexpected(t *lexer.Token, where string) string {
	var what string
	switch t.Type {
	case lexer.EOF:
		what = "end of file"
	case TokNewline:
		what = "end of line"
	case TokBad:
		if strings.HasPrefix(t.Value, `"`) {
			return "string is not closed: add '\"' before the end of the line"
		}
		if c := strings.TrimLeft(t.Value, "+-"); c != "" && isDigit(c[0]) {
			return fmt.Sprintf(notDecimalMsg, t.Value)
		}
		what = fmt.Sprintf("character %q", t.Value)
	case TokUnit:
		what = fmt.Sprintf("unit %q", t.Value)
	case TokNumber:
		what = fmt.Sprintf("number %s", t.Value)
	case TokString:
		what = fmt.Sprintf("string %s", t.Value)
	default:
		what = fmt.Sprintf("%q", t.Value)
	}
	if where != "" {
		return "unexpected " + what + " " + where
	}
	return "unexpected " + what
}

// fastParser parses one well-formed statement directly from the tokens,
// building exactly the tree the participle grammar builds (the same
// alternatives chosen in the same order, the same positions), about ten
// times faster. It gives up at the first token that does not fit; the
// statement is then parsed again by the grammar, which finds and explains
// the error, so the fast path never decides what an error is.
type fastParser struct {
	toks []lexer.Token
	i    int // raw index of the next token, elided ones included
	*nodes
	// p, when set, scans on as the statement is read (see parser.at);
	// without it toks hold the whole line.
	p *parser
	// partial lets stmt end at a token that starts no part, as the
	// grammar's statement does (its parts are a repetition that ends
	// there); stopped then says it did. The parser explains that token.
	partial, stopped bool
}

// startsArg reports whether t can start a part of a statement: a key or
// the first token of an expression.
func startsArg(t *lexer.Token) bool {
	switch t.Type {
	case TokNumber, TokIdent, TokString:
		return true
	}
	switch t.Value {
	case "from", "to", "at", "=", "-", "+", "(":
		return true
	}
	return false
}

// nodes hands out tree nodes from chunks, so a large file costs a few
// hundred allocations instead of one per node.
type nodes struct {
	stmts   slab[Stmt]
	idents  slab[Ident]
	args    slab[Arg]
	exprs   slab[Expr]
	exprOps slab[ExprOp]
	terms   slab[Term]
	termOps slab[TermOp]
	factors slab[Factor]
	powers  slab[Power]
	atoms   slab[Atom]
	strs    slab[Str]
	unitsT  slab[UnitTok]

	// A statement's arguments are gathered in argTmp and carved out of
	// argPtrs once the statement parses: one allocation per few hundred
	// arguments instead of a growing slice per statement.
	argTmp   []*Arg
	argPtrs  ptrs[Arg]
	stmtPtrs ptrs[Stmt]
}

// ptrs hands out pointer slices from chunks.
type ptrs[T any] struct{ buf []*T }

// reset hands the current chunk out again from its start: the slices
// carved from it are no longer used.
func (p *ptrs[T]) reset() {
	clear(p.buf)
	p.buf = p.buf[:0]
}

// carve returns a copy of src from the current chunk, with no room to grow
// into its neighbour (nil for an empty src).
func (p *ptrs[T]) carve(src []*T) []*T {
	if len(src) == 0 {
		return nil
	}
	if cap(p.buf)-len(p.buf) < len(src) {
		p.buf = make([]*T, 0, max(256, len(src)))
	}
	i := len(p.buf)
	p.buf = append(p.buf, src...)
	return p.buf[i:len(p.buf):len(p.buf)]
}

type slab[T any] struct{ buf []T }

// nodesMark records how much of each slab is in use.
type nodesMark [12]int

// mark returns the slabs' fill, for release.
func (n *nodes) mark() nodesMark {
	return nodesMark{len(n.stmts.buf), len(n.idents.buf), len(n.args.buf), len(n.exprs.buf),
		len(n.exprOps.buf), len(n.terms.buf), len(n.termOps.buf), len(n.factors.buf),
		len(n.powers.buf), len(n.atoms.buf), len(n.strs.buf), len(n.unitsT.buf)}
}

// release returns the nodes handed out since m to their slabs, zeroed. A
// slab that moved to a new chunk since keeps those of the old chunk (they
// are few and no longer in any tree).
func (n *nodes) release(m nodesMark) {
	n.stmts.release(m[0])
	n.idents.release(m[1])
	n.args.release(m[2])
	n.exprs.release(m[3])
	n.exprOps.release(m[4])
	n.terms.release(m[5])
	n.termOps.release(m[6])
	n.factors.release(m[7])
	n.powers.release(m[8])
	n.atoms.release(m[9])
	n.strs.release(m[10])
	n.unitsT.release(m[11])
}

func (s *slab[T]) release(to int) {
	if to > len(s.buf) {
		return // a new chunk was started since the mark
	}
	clear(s.buf[to:])
	s.buf = s.buf[:to]
}

// alloc returns a zeroed T from the current chunk.
func (s *slab[T]) alloc() *T {
	if len(s.buf) == cap(s.buf) {
		s.buf = make([]T, 0, 128)
	}
	s.buf = s.buf[:len(s.buf)+1]
	return &s.buf[len(s.buf)-1]
}

// allocLarge is alloc for the model's nodes, components and parameters,
// from chunks that double from 16 to some 64 KiB, a whole number of pages:
// 128 of one of them round up to a size class that leaves up to a tenth
// unused, and a small file needs no large chunk.
func (s *slab[T]) allocLarge() *T {
	if len(s.buf) == cap(s.buf) {
		var zero T
		n := 16
		if c := cap(s.buf); c > 0 {
			n = min(2*c, max(128, (64<<10)/int(unsafe.Sizeof(zero))))
		}
		s.buf = make([]T, 0, n)
	}
	s.buf = s.buf[:len(s.buf)+1]
	return &s.buf[len(s.buf)-1]
}

// tok returns the token at raw index j.
func (q *fastParser) tok(j int) *lexer.Token {
	if j >= len(q.toks) && q.p != nil {
		q.p.at(j)
		q.toks = q.p.toks
	}
	return &q.toks[j]
}

// peek returns the next token that is not elided.
func (q *fastParser) peek() *lexer.Token {
	j := q.i
	for elided(q.tok(j)) {
		j++
	}
	return &q.toks[j]
}

// next consumes the next token that is not elided.
func (q *fastParser) next() *lexer.Token {
	for elided(q.tok(q.i)) {
		q.i++
	}
	t := &q.toks[q.i]
	q.i++
	return t
}

// end is the position right after the last token consumed, which is what
// participle stores in EndPos.
func (q *fastParser) end() Pos { return at(q.tok(q.i).Pos) }

func endsStatement(t *lexer.Token) bool {
	if t.Type == TokEOF || t.Type == TokNewline {
		return true
	}
	return t.Type == TokPunct && (t.Value == ";" || t.Value == "{" || t.Value == "}")
}

func (q *fastParser) stmt() (*Stmt, bool) {
	t := q.peek()
	if t.Type != TokIdent {
		return nil, false
	}
	s := q.stmts.alloc()
	s.Pos = at(t.Pos)
	q.next()
	s.Word = q.idents.alloc()
	*s.Word = Ident{Pos: at(t.Pos), EndPos: q.end(), Name: t.Value}
	args := q.argTmp[:0]
	defer func() { q.argTmp = args[:0] }()
	for {
		t := q.peek()
		if endsStatement(t) {
			break
		}
		if q.partial && !startsArg(t) {
			q.stopped = true
			break
		}
		a := q.args.alloc()
		a.Pos = at(t.Pos)
		switch t.Value {
		case "from", "to", "at", "=":
			q.next()
			a.Key = t.Value
		default:
			e, ok := q.expr()
			if !ok {
				return nil, false
			}
			a.Expr = e
		}
		a.EndPos = q.end()
		args = append(args, a)
	}
	s.Args = q.argPtrs.carve(args)
	s.EndPos = q.end()
	return s, true
}

func (q *fastParser) expr() (*Expr, bool) {
	e := q.exprs.alloc()
	e.Pos = at(q.peek().Pos)
	var ok bool
	if e.Left, ok = q.term(); !ok {
		return nil, false
	}
	for {
		t := q.peek()
		if t.Value != "+" && t.Value != "-" {
			break
		}
		q.next()
		tm, ok := q.term()
		if !ok {
			return nil, false
		}
		op := q.exprOps.alloc()
		*op = ExprOp{Op: t.Value, Term: tm}
		e.Ops = append(e.Ops, op)
	}
	e.EndPos = q.end()
	return e, true
}

func (q *fastParser) term() (*Term, bool) {
	tm := q.terms.alloc()
	tm.Pos = at(q.peek().Pos)
	var ok bool
	if tm.Left, ok = q.factor(); !ok {
		return nil, false
	}
	for {
		t := q.peek()
		if t.Value != "*" && t.Value != "/" {
			break
		}
		q.next()
		f, ok := q.factor()
		if !ok {
			return nil, false
		}
		op := q.termOps.alloc()
		*op = TermOp{Op: t.Value, Factor: f}
		tm.Ops = append(tm.Ops, op)
	}
	tm.EndPos = q.end()
	return tm, true
}

func (q *fastParser) factor() (*Factor, bool) {
	t := q.peek()
	f := q.factors.alloc()
	f.Pos = at(t.Pos)
	if t.Value == "-" || t.Value == "+" {
		q.next()
		f.Sign = t.Value
	}
	var ok bool
	if f.Atom, ok = q.atom(); !ok {
		return nil, false
	}
	if q.peek().Value == "^" {
		q.next()
		t := q.peek()
		pw := q.powers.alloc()
		pw.Pos = at(t.Pos)
		if t.Value == "-" || t.Value == "+" {
			q.next()
			pw.Sign = t.Value
			t = q.peek()
		}
		if t.Type != TokNumber {
			return nil, false
		}
		q.next()
		pw.Digits = t.Value
		pw.EndPos = q.end()
		f.Power = pw
	}
	f.EndPos = q.end()
	return f, true
}

func (q *fastParser) atom() (*Atom, bool) {
	t := q.peek()
	a := q.atoms.alloc()
	a.Pos = at(t.Pos)
	switch {
	case t.Type == TokNumber:
		q.next()
		a.Number = t.Value
	case t.Type == TokIdent && t.Value != "from" && t.Value != "to" && t.Value != "at":
		q.next()
		a.Ref = q.idents.alloc()
		*a.Ref = Ident{Pos: at(t.Pos), EndPos: q.end(), Name: t.Value}
	case t.Type == TokString:
		q.next()
		a.Str = q.strs.alloc()
		*a.Str = Str{Pos: at(t.Pos), EndPos: q.end(), Quoted: t.Value}
	case t.Value == "(":
		q.next()
		for {
			e, ok := q.expr()
			if !ok {
				return nil, false
			}
			a.Group = append(a.Group, e)
			t := q.peek()
			if t.Value == "," {
				q.next()
				continue
			}
			if t.Value != ")" {
				return nil, false
			}
			q.next()
			break
		}
	default:
		return nil, false
	}
	if t := q.peek(); t.Type == TokUnit {
		q.next()
		a.Unit = q.unitsT.alloc()
		*a.Unit = UnitTok{Pos: at(t.Pos), EndPos: q.end(), Text: t.Value}
	}
	a.EndPos = q.end()
	return a, true
}
