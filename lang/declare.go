// Declaring: the first pass records every named thing (parameters, parts,
// loops with their nodes and components, cases) so later passes may refer to
// names declared anywhere, in any file.

package lang

import (
	"fmt"
)

var topKeywords = []string{"include", "param", "part", "loop", "case", "limits", "methods"}

var loopKeywords = []string{"fluid", "charge", "design_pressure", "saturation", "node", "junction", "pipe", "evaporator", "condenser", "bend", "fitting", "reservoir"}

func kindOf(word string) (Kind, bool) {
	for i, n := range kindNames {
		if n == word {
			return Kind(i), true
		}
	}
	return 0, false
}

// declare walks every file's top level and records the named things.
func (r *resolver) declare() {
	r.loopStmts = map[*Loop]*Stmt{}
	r.compStmts = map[*Loop][]*Stmt{}
	r.nodeAt = map[*Loop][]*Stmt{}
	r.compHeads = map[*Loop][]compHead{}
	r.nodeOffs = map[*Loop][]int32{}
	r.caseStmts = map[*Case]*Stmt{}
	for _, path := range r.m.Order {
		f := r.m.Files[path]
		for i, st := range f.Stmts {
			if r.heads {
				// The heads are the resolver's own and read once: each
				// goes as soon as it is declared, so that a chunk of
				// them can be collected while the model fills, not at
				// the end.
				f.Stmts[i] = nil
			}
			if st.Bad {
				continue
			}
			kw := st.Keyword()
			switch kw {
			case "param":
				// declareParam reads the parts itself.
			case "loop":
				// The loop's own parts; its statements are read one at a
				// time.
				st = r.kept(path, st, false)
			default:
				// What the model keeps of a part, a case, limits or
				// methods is their whole tree; they are few.
				st = r.kept(path, st, true)
			}
			switch kw {
			case "include":
			case "param":
				r.declareParam(path, st)
			case "part":
				name, ok := r.head(path, st, true)
				if !ok {
					continue
				}
				p := &Part{Decl: r.decl(path, st, name)}
				if st.Block != nil {
					p.Stmts = st.Block.Stmts
				}
				if prev, dup := r.parts[name.Name]; dup {
					r.duplicate(path, name, "part", prev.Decl)
					continue
				}
				r.parts[name.Name] = p
				r.m.Parts = append(r.m.Parts, p)
			case "loop":
				r.declareLoop(path, st)
			case "case":
				r.declareCase(path, st)
			case "limits":
				r.limStmts = append(r.limStmts, fileStmt{path, st})
				r.needBlock(path, st)
			case "methods":
				r.methStmts = append(r.methStmts, fileStmt{path, st})
				r.needBlock(path, st)
			default:
				r.unknownWord(path, st, topKeywords, "at the top level")
			}
		}
	}
	// The nominal case: the one marked, else the first.
	for _, c := range r.m.Cases {
		if c.Nominal {
			if r.m.Nominal != nil {
				d := r.errorf("duplicate-nominal", c.File(), c.NameSpan(), "case %s is marked nominal, but %s already is", c.Name, r.m.Nominal.Name)
				d.Related = append(d.Related, Related{Loc: r.m.Nominal.NameLoc(), Message: "the first nominal case"})
				c.Nominal = false
				continue
			}
			r.m.Nominal = c
		}
	}
	if r.m.Nominal == nil && len(r.m.Cases) > 0 {
		r.m.Nominal = r.m.Cases[0]
	}
}

func (r *resolver) decl(file string, st *Stmt, name *Ident) Decl {
	ns, hs := name.Span(), st.Span()
	d := Decl{Name: name.Name, file: r.path(file), nameStart: int32(ns.Start), nameEnd: int32(ns.End),
		start: int32(hs.Start), end: int32(hs.End), blockClose: -1}
	if st.Block != nil {
		d.blockClose = int32(st.Block.Close)
	}
	return d
}

func (r *resolver) needBlock(file string, st *Stmt) {
	if st.Block == nil {
		r.errorf("syntax", file, st.Span(), "%s needs a block: %s { … }", st.Keyword(), st.Keyword())
	}
}

// head reads "WORD NAME" and returns the name.
func (r *resolver) head(file string, st *Stmt, block bool) (*Ident, bool) {
	if len(st.Args) == 0 || st.Args[0].Expr == nil || nameOf(st.Args[0].Expr) == nil {
		r.errorf("syntax", file, st.Span(), "%s needs a name: %s NAME%s", st.Keyword(), st.Keyword(), map[bool]string{true: " { … }", false: ""}[block])
		return nil, false
	}
	if block {
		r.needBlock(file, st)
	}
	return nameOf(st.Args[0].Expr), true
}

func (r *resolver) duplicate(file string, name *Ident, what string, prev Decl) {
	d := r.errorf("duplicate-name", file, name.Span(), "%s %s is declared twice", what, name.Name)
	d.Related = append(d.Related, Related{Loc: prev.NameLoc(), Message: "first declared here"})
}

func (r *resolver) ref(kind RefKind, name string, loop *Loop, file string, span Span, decl bool) {
	r.m.refs = append(r.m.refs, Ref{Kind: kind, Name: name, Loop: loop, file: r.path(file), start: int32(span.Start), end: int32(span.End), IsDecl: decl})
}

func (r *resolver) unknownWord(file string, st *Stmt, known []string, where string) {
	w := st.Word
	d := r.errorf("unknown-field", file, w.Span(), "unknown statement %q %s", w.Name, where)
	if best := Closest(w.Name, known); best != "" {
		d.Format = "unknown statement %q %s; did you mean %q?"
		d.Args = append(d.Args, best)
		d.Fixes = append(d.Fixes, Fix{Title: fmt.Sprintf("Change to %q", best), Edits: []Edit{{Loc: Location{File: file, Span: w.Span()}, NewText: best}}})
	}
}

func (r *resolver) declareParam(file string, st *Stmt) {
	head := st
	defer r.release(r.mark())
	st = r.full(file, st)
	if len(st.Args) != 3 || st.Args[0].Expr == nil || nameOf(st.Args[0].Expr) == nil || st.Args[1].Key != "=" || st.Args[2].Expr == nil {
		r.shapeError(file, st, "param needs a name and a value: param NAME = VALUE")
		return
	}
	name := nameOf(st.Args[0].Expr)
	if prev, dup := r.params[name.Name]; dup {
		r.duplicate(file, name, "parameter", prev.p.Decl)
		return
	}
	// Parameters and their evaluation states come from chunks of their
	// own: a file of many parameters costs a few hundred allocations, not
	// two per line, and the model does not keep the states alive.
	p := r.paramSlab.allocLarge()
	*p = Param{Decl: r.decl(file, st, name), Expr: st.Args[2].Expr}
	ps := r.stateSlab.alloc()
	ps.p = p
	if head.head {
		// The value is parsed again when it is evaluated, so that the
		// tree of a large file of parameters is not kept whole.
		p.Expr, ps.off, ps.head = nil, int32(head.Pos.Offset), true
	}
	r.params[name.Name] = ps
	r.m.Params = append(r.m.Params, p)
}

func (r *resolver) declareLoop(file string, st *Stmt) {
	name, ok := r.head(file, st, true)
	if !ok {
		return
	}
	l := &Loop{Decl: r.decl(file, st, name)}
	if prev, dup := r.loops[name.Name]; dup {
		r.duplicate(file, name, "loop", prev.Decl)
		return
	}
	r.loops[name.Name] = l
	r.m.Loops = append(r.m.Loops, l)
	r.loopStmts[l] = st
	if st.Block == nil {
		return
	}
	if st.Block.Close < 0 {
		// Still being written: the unclosed block is the finding.
		l.Unresolved = true
	}
	// The loop's nodes and components come from one array each, sized by
	// a count of their statements: a loop of thousands of components costs
	// a few allocations, not one per component.
	nNodes, nComps := 0, 0
	for _, s := range st.Block.Stmts {
		if s.Bad {
			continue
		}
		if kw := s.Keyword(); kw == "node" || kw == "junction" {
			nNodes++
		} else if _, isComp := kindOf(kw); isComp {
			nComps++
		}
	}
	nodes := make(map[string]*Node, nNodes)
	if nNodes > 0 {
		l.Nodes = make([]*Node, 0, nNodes)
	}
	if nComps > 0 {
		l.Components = make([]*Component, 0, nComps)
	}
	// The nodes and components come from chunks, not from one array
	// each: the heads of a file read for its model alone go as they are
	// declared, and the chunks take their place instead of adding to
	// them.
	var nodeBuf slab[Node]
	var nodeAt []*Stmt
	var nodeOffs []int32
	if r.heads {
		nodeOffs = make([]int32, 0, nNodes)
		r.compHeads[l] = make([]compHead, 0, nComps)
	} else {
		nodeAt = make([]*Stmt, 0, nNodes)
		r.compStmts[l] = make([]*Stmt, 0, nComps)
	}
	// Nodes first, so components may name nodes declared after them. Each
	// node's parts are read into the same temporary nodes.
	nodeMark := r.mark()
	defer r.release(nodeMark)
	for i, s := range st.Block.Stmts {
		r.release(nodeMark)
		if s.Bad {
			// What the statement meant is unknown: it may be a node or a
			// component the loop needs.
			l.Unresolved = true
			continue
		}
		if s.Keyword() != "node" && s.Keyword() != "junction" {
			continue
		}
		head := s
		if r.heads {
			// Read once: what filling needs is kept in nodeOffs.
			st.Block.Stmts[i] = nil
		}
		s = r.full(file, s)
		if len(s.Args) == 0 || nameOf(s.Args[0].Expr) == nil {
			r.errorf("syntax", file, s.Span(), "%s needs a name: %s NAME [at (X, Y, Z) UNIT]", s.Keyword(), s.Keyword())
			l.Unresolved = true
			continue
		}
		nm := nameOf(s.Args[0].Expr)
		if prev, dup := nodes[nm.Name]; dup {
			r.duplicate(file, nm, "node", prev.Decl)
			l.Unresolved = true
			continue
		}
		n := nodeBuf.allocLarge()
		*n = Node{Decl: r.decl(file, s, nm), Loop: l, Junction: s.Keyword() == "junction", Index: len(l.Nodes)}
		nodes[nm.Name] = n
		l.Nodes = append(l.Nodes, n)
		if r.heads {
			nodeOffs = append(nodeOffs, -1)
		} else {
			nodeAt = append(nodeAt, nil)
		}
		rest := s.Args[1:]
		if len(rest) > 0 {
			if rest[0].Key != "at" || len(rest) != 2 || rest[1].Expr == nil {
				r.errorf("syntax", file, s.Span(), "a node's coordinates are written: %s %s at (X, Y, Z) UNIT", s.Keyword(), nm.Name)
				n.At.Bad = true
				continue
			}
			// Evaluated when filling, once every file's parameters are
			// declared, from Args[2], which is rest[1].
			if r.heads {
				nodeOffs[n.Index] = int32(head.Pos.Offset)
			} else {
				nodeAt[n.Index] = head
			}
		}
		if s.Block != nil {
			r.errorf("syntax", file, Span{s.Block.Open, s.Block.Open + 1}, "a node takes no block")
		}
	}
	if r.heads {
		r.nodeOffs[l] = nodeOffs
	} else {
		r.nodeAt[l] = nodeAt
	}
	for i, s := range st.Block.Stmts {
		if s == nil || s.Bad {
			continue
		}
		kw := s.Keyword()
		k, isComp := kindOf(kw)
		if !isComp {
			continue
		}
		if r.heads {
			// Read once: what filling needs is kept in compHeads.
			st.Block.Stmts[i] = nil
		}
		r.declareComponent(file, s, l, k, nodes)
	}
	if r.heads {
		// Filling reads the nodes and components through nodeOffs and
		// compHeads, one at a time; the loop's block keeps only the
		// loop's own statements, so that it does not hold the heads of a
		// large loop: each went as it was declared.
		// A list of their own: the block's list, a pointer a statement,
		// would stay whole under the few kept.
		var keep []*Stmt
		for _, s := range st.Block.Stmts {
			if s != nil {
				keep = append(keep, s)
			}
		}
		clear(st.Block.Stmts)
		st.Block.Stmts = keep
	}
}

func (r *resolver) declareComponent(file string, s *Stmt, l *Loop, k Kind, nodes map[string]*Node) {
	// Filling reads the statement again; the head is all it keeps.
	head := s
	defer r.release(r.mark())
	s = r.full(file, s)
	parts := s.Args
	if len(parts) == 0 || nameOf(parts[0].Expr) == nil {
		if k == Reservoir {
			r.errorf("syntax", file, s.Span(), "reservoir needs a name and a node: reservoir NAME at NODE")
		} else {
			r.errorf("syntax", file, s.Span(), "%s needs a name and its ends: %s NAME from NODE to NODE", k, k)
		}
		l.Unresolved = true
		return
	}
	nm := nameOf(parts[0].Expr)
	c := r.compBuf.allocLarge()
	*c = Component{Decl: r.decl(file, s, nm), Kind: k, Loop: l, Index: len(l.Components)}
	c.kindFields()
	node := func(p *Arg) (*Node, Span) {
		id := nameOf(p.Expr)
		if id == nil {
			r.errorf("syntax", file, p.Span(), "expected a node name")
			c.Unresolved = true
			return nil, p.Span()
		}
		n, ok := nodes[id.Name]
		if !ok {
			cands := make([]string, 0, len(l.Nodes))
			for _, n := range l.Nodes {
				cands = append(cands, n.Name)
			}
			r.unknownName(file, id, "node", cands, fmt.Sprintf(" in loop %s", l.Name))
			c.Unresolved = true
			return nil, id.Span()
		}
		return n, id.Span()
	}
	rest := parts[1:]
	if k == Reservoir {
		if len(rest) != 2 || rest[0].Key != "at" || rest[1].Expr == nil {
			r.errorf("syntax", file, s.Span(), "reservoir needs the node it hangs from: reservoir %s at NODE", nm.Name)
			c.Unresolved = true
		} else {
			var sp Span
			c.From, sp = node(rest[1])
			c.fromStart, c.fromEnd = int32(sp.Start), int32(sp.End)
		}
	} else {
		if len(rest) != 4 || rest[0].Key != "from" || rest[2].Key != "to" || rest[1].Expr == nil || rest[3].Expr == nil {
			r.errorf("syntax", file, s.Span(), "%s needs its ends: %s %s from NODE to NODE", k, k, nm.Name)
			c.Unresolved = true
		} else {
			var sp Span
			c.From, sp = node(rest[1])
			c.fromStart, c.fromEnd = int32(sp.Start), int32(sp.End)
			c.To, sp = node(rest[3])
			c.toStart, c.toEnd = int32(sp.Start), int32(sp.End)
		}
	}
	if c.Unresolved {
		l.Unresolved = true
	}
	if prev, dup := r.comps[nm.Name]; dup {
		// The model keeps no second component of the name, whose ends
		// Refs would yield: they are recorded here.
		for _, e := range []struct {
			n          *Node
			start, end int32
		}{{c.From, c.fromStart, c.fromEnd}, {c.To, c.toStart, c.toEnd}} {
			if e.n != nil {
				r.ref(RefNode, e.n.Name, l, file, Span{int(e.start), int(e.end)}, false)
			}
		}
		r.duplicate(file, nm, "component", prev.Decl)
		l.Unresolved = true
		return
	}
	r.comps[nm.Name] = c
	l.Components = append(l.Components, c)
	if r.heads {
		r.compHeads[l] = append(r.compHeads[l], headOf(head))
	} else {
		r.compStmts[l] = append(r.compStmts[l], head)
	}
}

func (r *resolver) declareCase(file string, st *Stmt) {
	name, ok := r.head(file, st, true)
	if !ok {
		return
	}
	c := &Case{Decl: r.decl(file, st, name)}
	for _, p := range st.Args[1:] {
		if id := nameOf(p.Expr); id != nil && id.Name == "nominal" {
			c.Nominal = true
			continue
		}
		d := r.errorf("syntax", file, p.Span(), "unexpected %q after the case name; only \"nominal\" may follow it", src(r.m.Files[file], p.Span()))
		_ = d
	}
	if prev, dup := r.cases[name.Name]; dup {
		r.duplicate(file, name, "case", prev.Decl)
		return
	}
	r.cases[name.Name] = c
	r.m.Cases = append(r.m.Cases, c)
	r.caseStmts[c] = st
}

func (r *resolver) unknownName(file string, id *Ident, what string, cands []string, where string) {
	d := r.errorf("unknown-name", file, id.Span(), "unknown %s %q%s", what, id.Name, where)
	if best := Closest(id.Name, cands); best != "" {
		d.Format += "; did you mean %q?"
		d.Args = append(d.Args, best)
		d.Fixes = append(d.Fixes, Fix{Title: fmt.Sprintf("Change to %q", best), Edits: []Edit{{Loc: Location{File: file, Span: id.Span()}, NewText: best}}})
	}
}
