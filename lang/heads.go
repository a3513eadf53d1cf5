package lang

import "unsafe"

// A file read for its model alone (LoadSourceModel) keeps of each
// statement only its head: span, word and block. The parts of a statement
// (names, connectives, values) are most of a tree's size, some 700 bytes
// for a line of 40, so they are given back as soon as the statement is
// read, and the resolver parses a statement's line again when it reads
// its parts. The whole tree of a large file then never exists at once.

// headNodes keeps heads, a chunk at a time; those in a component's block
// are each an allocation of their own, so that the ones a one-line block
// drops (reread) are freed. The nodes of a loop have chunks of their own:
// the resolver reads them first and lets them go (see declareLoop), and
// their chunks go with them, not held by the components between them.
type headNodes struct{ chunk, nodes slab[headStmt] }

// headStmt is a head with its word.
type headStmt struct {
	Stmt
	word Ident
}

// keep returns a head-only copy of s, which the fast path has just read
// in the block of in (nil at the top).
func (h *headNodes) keep(s, in *Stmt) *Stmt {
	k := (*headStmt)(nil)
	if in != nil {
		if _, comp := kindOf(in.Keyword()); comp {
			k = new(headStmt)
		} else if kw := s.Keyword(); in.Keyword() == "loop" && (kw == "node" || kw == "junction") {
			k = h.nodes.alloc()
		}
	}
	if k == nil {
		k = h.chunk.alloc()
	}
	k.Stmt = Stmt{Pos: s.Pos, EndPos: s.EndPos, Block: s.Block, Bad: s.Bad, head: true}
	if s.Word != nil {
		k.word = *s.Word
		k.Word = &k.word
	}
	return &k.Stmt
}

// reread reports whether the block of s, which has just closed with the
// statements list, is a component's block on one line of statements the
// fast path read, without errors or blocks of their own; it then marks the
// block to be parsed again from its line (Block.reread) and keeps none of
// its statements. Such blocks hold most statements of a large loop.
func (h *headNodes) reread(src []byte, s *Stmt, list []*Stmt) bool {
	b := s.Block
	if !s.head || s.Bad || b.Close < 0 || len(list) == 0 {
		return false
	}
	if _, ok := kindOf(s.Keyword()); !ok {
		return false
	}
	for _, c := range src[s.Pos.Offset:b.Close] {
		if c == '\n' || c == '\r' {
			return false
		}
	}
	for _, c := range list {
		if !c.head || c.Bad || c.Block != nil {
			return false
		}
	}
	b.reread, b.n, b.Stmts = true, int32(len(list)), nil
	return true
}

// parseHeads is Parse keeping of the statements that parse only their
// heads.
func parseHeads(path string, src []byte) *File {
	f := &File{Path: path, Src: src, Mapper: NewMapper(src)}
	sc := newScannerOf(src, unsafe.String(unsafe.SliceData(src), len(src)))
	sc.allowsOnly = true
	p := &parser{f: f, sc: sc, toks: sc.toks, heads: &headNodes{}}
	p.run()
	f.Comments = sc.comments
	return f
}

// headParser parses again the statements of which a file keeps only the
// head, with one scanner for all of them. What the model keeps (parts,
// cases, limits, methods, loops' own parts) is parsed into keep; what the
// resolver reads and forgets (a parameter's value, a component's fields)
// into tmp, whose nodes are handed out again once the reader is done
// with them (mark, release), so resolving a large file does not make a
// whole tree's worth of garbage for each pass.
type headParser struct {
	sc   scanner
	q    fastParser
	keep nodes
	tmp  nodes
}

// tmpMark is how much of the temporary nodes is in use.
type tmpMark struct {
	nodes nodesMark
	args  **Arg
	nargs int
}

// mark returns the temporary nodes' fill, for release.
func (h *headParser) mark() tmpMark {
	return tmpMark{h.tmp.mark(), unsafe.SliceData(h.tmp.argPtrs.buf), len(h.tmp.argPtrs.buf)}
}

// release hands the temporary nodes parsed since m out again: nothing
// parsed since may be used afterwards. Nodes in chunks started since stay
// as they are, as slab.release leaves them.
func (h *headParser) release(m tmpMark) {
	h.tmp.release(m.nodes)
	if p := &h.tmp.argPtrs; unsafe.SliceData(p.buf) == m.args && m.nargs <= len(p.buf) {
		clear(p.buf[m.nargs:])
		p.buf = p.buf[:m.nargs]
	}
}

// full returns st with its parts, parsed into n: st itself when it has
// them, else a copy parsed again from its line, exactly as Parse reads it.
// The copy shares st's block, whose statements may be heads too.
func (h *headParser) full(f *File, st *Stmt, n *nodes) *Stmt {
	if !st.head {
		return st
	}
	s, ok := h.parseAt(f, st.Pos.Offset, n)
	if !ok {
		// A head is kept only of a statement the fast path read, which it
		// reads again the same way; keep what is known regardless.
		return st
	}
	s.Block, s.Bad = st.Block, st.Bad
	if b := st.Block; b != nil && b.reread {
		nb := *b
		nb.reread, nb.n = false, 0
		nb.Stmts = h.blockAt(f, b, n)
		s.Block = &nb
	}
	return s
}

// blockAt parses again the statements of the one-line block b of f into
// n, as Parse read them: statements the fast path reads, between ';'.
func (h *headParser) blockAt(f *File, b *Block, n *nodes) []*Stmt {
	list := make([]*Stmt, 0, b.n)
	i := h.scanLine(f, b.Open+1)
	toks := h.sc.toks
	for i < len(toks) {
		h.q = fastParser{toks: toks, i: i, nodes: n}
		s, ok := h.q.stmt()
		j := h.q.i
		h.q = fastParser{}
		if ok {
			list = append(list, s)
			i = j
			continue
		}
		// No statement starts here: a ';' goes on to the next one;
		// anything else is the block's '}'.
		for i < len(toks) && (toks[i].Type == TokSpace || toks[i].Type == TokComment) {
			i++
		}
		if i == len(toks) || !isPunctTok(&toks[i], ";") || toks[i].Pos.Offset >= b.Close {
			return list
		}
		i++
	}
	return list
}

// parseAt parses the head of the statement at offset start of f into n,
// as the fast path read it.
func (h *headParser) parseAt(f *File, start int, n *nodes) (*Stmt, bool) {
	return h.parseTok(h.scanLine(f, start), n)
}

// parseTok parses the head of the statement at token i of the line last
// scanned into n.
func (h *headParser) parseTok(i int, n *nodes) (*Stmt, bool) {
	h.q = fastParser{toks: h.sc.toks, i: i, nodes: n}
	s, ok := h.q.stmt()
	h.q = fastParser{}
	return s, ok
}

// scanLine scans the line of f that holds offset start and returns the
// index of its first token at or after start.
func (h *headParser) scanLine(f *File, start int) int {
	src := f.Src
	ls := start
	for ls > 0 && src[ls-1] != '\n' && !(src[ls-1] == '\r' && loneCR(src, ls-1)) {
		ls--
	}
	// The line is scanned from its start, as Parse scanned it: a sign
	// reads by the token before it.
	str := unsafe.String(unsafe.SliceData(src), len(src))
	toks, comments := h.sc.toks[:0], h.sc.comments[:0]
	if ls == 0 {
		h.sc = *newScannerOf(src, str)
		h.sc.toks = append(toks, h.sc.toks...)
		h.sc.comments = comments
	} else {
		h.sc = scanner{src: src, str: str, pos: ls, line: 1, lineStart: ls, toks: toks, comments: comments}
	}
	h.sc.nextLine()
	i := 0
	for i < len(h.sc.toks) && h.sc.toks[i].Pos.Offset < start {
		i++
	}
	return i
}

// fullTree returns st with its parts and those of every statement of its
// blocks, parsed into n.
func (h *headParser) fullTree(f *File, st *Stmt, n *nodes) *Stmt {
	s := h.full(f, st, n)
	if s.Block == nil || !anyHead(s.Block.Stmts) {
		return s
	}
	if s == st {
		c := *st
		s = &c
	}
	b := *s.Block
	b.Stmts = make([]*Stmt, len(s.Block.Stmts))
	for i, c := range s.Block.Stmts {
		b.Stmts[i] = h.fullTree(f, c, n)
	}
	s.Block = &b
	return s
}

func anyHead(ss []*Stmt) bool {
	for _, s := range ss {
		if s.head || (s.Block != nil && anyHead(s.Block.Stmts)) {
			return true
		}
	}
	return false
}

// compHead is what filling needs of the head of a component's statement
// (see declareLoop): where it starts and its block. A one-line block read
// again from its line (Block.reread), the block of most components, is
// kept as its braces and count; the head and its Block go.
type compHead struct {
	off         int32
	open, close int32 // the braces of a one-line block read again
	n           int32 // its statements (0 for any other block)
	block       *Block
}

// headOf returns what filling needs of the component head s.
func headOf(s *Stmt) compHead {
	h := compHead{off: int32(s.Pos.Offset)}
	if b := s.Block; b != nil && b.reread {
		h.open, h.close, h.n = int32(b.Open), int32(b.Close), b.n
	} else {
		h.block = b
	}
	return h
}

// stmt returns the head h describes, in st and b, which it overwrites.
func (h *compHead) stmt(st *Stmt, b *Block) *Stmt {
	*st = Stmt{Pos: Pos{int(h.off)}, Block: h.block, head: true}
	if h.n > 0 {
		*b = Block{Open: int(h.open), Close: int(h.close), OneLine: true, reread: true, n: h.n}
		st.Block = b
	}
	return st
}

// parser returns the resolver's head parser.
func (r *resolver) parser() *headParser {
	if r.hp == nil {
		r.hp = &headParser{}
	}
	return r.hp
}

// full returns st of file with its parts for a reader that forgets them:
// they may be used only until the release of a mark taken before.
func (r *resolver) full(file string, st *Stmt) *Stmt {
	if !st.head {
		return st
	}
	h := r.parser()
	return h.full(r.m.Files[file], st, &h.tmp)
}

// fullTree is full with the parts of st's blocks too.
func (r *resolver) fullTree(file string, st *Stmt) *Stmt {
	if !st.head && (st.Block == nil || !anyHead(st.Block.Stmts)) {
		return st
	}
	h := r.parser()
	return h.fullTree(r.m.Files[file], st, &h.tmp)
}

// kept returns st of file with its parts for the model or a later pass
// to keep; tree adds the parts of its blocks.
func (r *resolver) kept(file string, st *Stmt, tree bool) *Stmt {
	if !st.head && (!tree || st.Block == nil || !anyHead(st.Block.Stmts)) {
		return st
	}
	h := r.parser()
	if tree {
		return h.fullTree(r.m.Files[file], st, &h.keep)
	}
	return h.full(r.m.Files[file], st, &h.keep)
}

// mark returns the fill of the temporary parts, for release.
func (r *resolver) mark() tmpMark {
	if !r.heads {
		return tmpMark{}
	}
	return r.parser().mark()
}

// release hands out again the temporary parts parsed since m (from
// mark): nothing full or fullTree returned since may be used afterwards.
func (r *resolver) release(m tmpMark) {
	if r.hp != nil {
		r.hp.release(m)
	}
}

// paramExpr returns the expression of ps's parameter, until the release
// of a mark taken before.
func (r *resolver) paramExpr(ps *paramState) *Expr {
	if ps.p.Expr != nil || !ps.head {
		return ps.p.Expr
	}
	h := r.parser()
	if s, ok := h.parseAt(r.m.Files[ps.p.File()], int(ps.off), &h.tmp); ok && len(s.Args) == 3 {
		return s.Args[2].Expr
	}
	return nil
}
