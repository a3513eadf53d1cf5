package lsp

import "circa/lang"

// stmtPath returns the statements whose head or block holds off, outermost
// first.
func stmtPath(f *lang.File, off int) []*lang.Stmt {
	var path []*lang.Stmt
	stmts := f.Stmts
	for {
		var next *lang.Stmt
		for _, st := range stmts {
			if stmtHolds(st, off, len(f.Src)) {
				next = st
				break
			}
		}
		if next == nil {
			return path
		}
		path = append(path, next)
		if next.Block == nil || off <= next.Block.Open {
			return path
		}
		stmts = next.Block.Stmts
	}
}

func stmtHolds(st *lang.Stmt, off, size int) bool {
	sp := st.Span()
	if sp.Start <= off && off <= sp.End {
		return true
	}
	if b := st.Block; b != nil {
		end := b.Close
		if end < 0 {
			end = size
		}
		return b.Open < off && off <= end
	}
	return false
}

// exprVisit calls fn for every atom in e, with the factor that holds it.
func exprVisit(e *lang.Expr, fn func(*lang.Factor, *lang.Atom)) {
	if e == nil {
		return
	}
	termVisit(e.Left, fn)
	for _, op := range e.Ops {
		termVisit(op.Term, fn)
	}
}

func termVisit(t *lang.Term, fn func(*lang.Factor, *lang.Atom)) {
	if t == nil {
		return
	}
	factorVisit(t.Left, fn)
	for _, op := range t.Ops {
		factorVisit(op.Factor, fn)
	}
}

func factorVisit(f *lang.Factor, fn func(*lang.Factor, *lang.Atom)) {
	if f == nil || f.Atom == nil {
		return
	}
	fn(f, f.Atom)
	for _, g := range f.Atom.Group {
		exprVisit(g, fn)
	}
}

// atomAt returns the innermost atom of a statement's parts at off.
func atomAt(st *lang.Stmt, off int) (*lang.Factor, *lang.Atom) {
	var bf *lang.Factor
	var ba *lang.Atom
	for _, a := range st.Args {
		exprVisit(a.Expr, func(f *lang.Factor, at *lang.Atom) {
			if contains(at.Span(), off) {
				if ba == nil || at.Span().End-at.Span().Start <= ba.Span().End-ba.Span().Start {
					bf, ba = f, at
				}
			}
		})
	}
	return bf, ba
}

// walkStmts calls fn for every statement of a file, depth first, with its depth.
func walkStmts(stmts []*lang.Stmt, depth int, fn func(*lang.Stmt, int)) {
	for _, st := range stmts {
		fn(st, depth)
		if st.Block != nil {
			walkStmts(st.Block.Stmts, depth+1, fn)
		}
	}
}
