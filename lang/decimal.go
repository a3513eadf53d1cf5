// Numbers the language does not have: NaN, Inf and hexadecimal.

package lang

import "strings"

// notDecimalMsg explains a spelling of a number the language does not read.
const notDecimalMsg = "%s is not a number here: numbers are decimal, like 12, 0.5 or 1.5e-3"

// notDecimalName reports whether a name spells a number other languages
// have and .loop does not: NaN, Inf, Infinity (any case).
func notDecimalName(name string) bool {
	switch strings.ToLower(name) {
	case "nan", "inf", "infinity":
		return true
	}
	return false
}

// notDecimalIn returns the first name in args that spells NaN or Inf, or
// nil.
func notDecimalIn(args []*Arg) *Ident {
	for _, a := range args {
		if a.Expr != nil {
			if id := notDecimalExpr(a.Expr); id != nil {
				return id
			}
		}
	}
	return nil
}

func notDecimalExpr(e *Expr) *Ident {
	if id := notDecimalTerm(e.Left); id != nil {
		return id
	}
	for _, op := range e.Ops {
		if id := notDecimalTerm(op.Term); id != nil {
			return id
		}
	}
	return nil
}

func notDecimalTerm(t *Term) *Ident {
	if t == nil {
		return nil
	}
	if id := notDecimalAtom(t.Left); id != nil {
		return id
	}
	for _, op := range t.Ops {
		if id := notDecimalAtom(op.Factor); id != nil {
			return id
		}
	}
	return nil
}

func notDecimalAtom(f *Factor) *Ident {
	if f == nil || f.Atom == nil {
		return nil
	}
	a := f.Atom
	if a.Ref != nil && notDecimalName(a.Ref.Name) {
		return a.Ref
	}
	for _, e := range a.Group {
		if id := notDecimalExpr(e); id != nil {
			return id
		}
	}
	return nil
}

// shapeError reports a statement whose parts do not have the shape its
// keyword needs; when a part spells NaN or Inf, that is the error named.
func (r *resolver) shapeError(file string, s *Stmt, format string, args ...any) {
	if id := notDecimalIn(s.Args); id != nil {
		r.errorf("syntax", file, id.Span(), notDecimalMsg, id.Name)
		return
	}
	r.errorf("syntax", file, s.Span(), format, args...)
}
