package lang

import "unsafe"

// A file read for its model alone (LoadSourceModel) keeps of each
// statement only its head: span, word and block. The parts of a statement
// (names, connectives, values) are most of a tree's size, some 700 bytes
// for a line of 40, so they are given back as soon as the statement is
// read, and the resolver parses a statement's line again when it reads
// its parts. The whole tree of a large file then never exists at once.

// headNodes holds the heads kept, a chunk at a time.
type headNodes struct {
	stmts  slab[Stmt]
	idents slab[Ident]
}

// keep returns a head-only copy of s, which the fast path has just read.
func (h *headNodes) keep(s *Stmt) *Stmt {
	k := h.stmts.alloc()
	*k = Stmt{Pos: s.Pos, EndPos: s.EndPos, Block: s.Block, Bad: s.Bad, head: true}
	if s.Word != nil {
		w := h.idents.alloc()
		*w = *s.Word
		k.Word = w
	}
	return k
}

// parseHeads is Parse keeping of the statements that parse only their
// heads.
func parseHeads(path string, src []byte) *File {
	f := &File{Path: path, Src: src, Mapper: NewMapper(src)}
	sc := newScannerOf(src, unsafe.String(unsafe.SliceData(src), len(src)))
	sc.nextLine()
	p := &parser{f: f, sc: sc, toks: sc.toks, heads: &headNodes{}}
	p.run()
	f.Comments = sc.comments
	return f
}

// headParser parses again the statements of which a file keeps only the
// head, with one scanner and one set of node chunks for all of them.
type headParser struct {
	f     *File
	sc    scanner
	nodes nodes
}

// full returns st with its parts: st itself when it has them, else a copy
// parsed again from its line, exactly as Parse reads it. The copy shares
// st's block, whose statements may be heads too.
func (h *headParser) full(f *File, st *Stmt) *Stmt {
	if !st.head {
		return st
	}
	src := f.Src
	start := st.Pos.Offset
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
	} else {
		h.sc = scanner{src: src, str: str, pos: ls, line: 1, lineStart: ls, toks: toks}
	}
	h.sc.nextLine()
	h.sc.comments = comments[:0]
	i := 0
	for i < len(h.sc.toks) && h.sc.toks[i].Pos.Offset < start {
		i++
	}
	q := fastParser{toks: h.sc.toks, i: i, nodes: &h.nodes}
	s, ok := q.stmt()
	if !ok {
		// A head is kept only of a statement the fast path read, which it
		// reads again the same way; keep what is known regardless.
		return st
	}
	s.Block, s.Bad = st.Block, st.Bad
	return s
}

// fullTree returns st with its parts and those of every statement of its
// blocks, for what the model keeps (parts, cases, limits, methods).
func (h *headParser) fullTree(f *File, st *Stmt) *Stmt {
	s := h.full(f, st)
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
		b.Stmts[i] = h.fullTree(f, c)
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

// full returns st of file with its parts (see headParser.full).
func (r *resolver) full(file string, st *Stmt) *Stmt {
	if !st.head {
		return st
	}
	if r.hp == nil {
		r.hp = &headParser{}
	}
	return r.hp.full(r.m.Files[file], st)
}

// fullTree returns st of file with its parts and its blocks' (see
// headParser.fullTree).
func (r *resolver) fullTree(file string, st *Stmt) *Stmt {
	if !st.head && (st.Block == nil || !anyHead(st.Block.Stmts)) {
		return st
	}
	if r.hp == nil {
		r.hp = &headParser{}
	}
	return r.hp.fullTree(r.m.Files[file], st)
}

// paramExpr returns the expression of ps's parameter.
func (r *resolver) paramExpr(ps *paramState) *Expr {
	if ps.p.Expr != nil || ps.st == nil {
		return ps.p.Expr
	}
	return r.full(ps.p.File, ps.st).Args[2].Expr
}
