// Evaluating: expressions, quantities with their units, vectors and
// parameters, checked against the dimension a field needs.

package lang

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"

	"circa/units"
)

// qty reads a field that takes one quantity.
func (r *resolver) qty(file string, s *Stmt, need units.Need) Value {
	if len(s.Args) != 1 || s.Args[0].Expr == nil {
		if len(s.Args) == 0 {
			r.errorf("missing-value", file, s.Span(), "%s needs a value (%s)", s.Keyword(), needNoun(need))
		} else {
			r.shapeError(file, s, "%s takes one value (%s); write a negative value after a space as -2, or put an expression in parentheses", s.Keyword(), needNoun(need))
		}
		return r.atV(Value{Bad: true}, file, s.Span(), "")
	}
	return r.expr(file, s.Args[0].Expr, need)
}

func needNoun(n units.Need) string {
	if n.Dim == units.Temperature && n.Difference {
		return "a temperature difference"
	}
	return units.Name(n.Dim)
}

// expr evaluates an expression and checks it against need.
func (r *resolver) expr(file string, e *Expr, need units.Need) Value {
	if singleAtom(e) != nil {
		// A lone quantity: a misspelt unit's suggestions can be narrowed to
		// the dimension the field needs.
		r.unitHint, r.hinted = need, true
		defer func() { r.hinted = false }()
	}
	q, unitText, ok := r.eval(file, e)
	if !ok {
		return r.atV(Value{Bad: true}, file, e.Span(), "")
	}
	if err := units.Check(q, unitText, need); err != nil {
		d := r.errorf("unit", file, e.Span(), "%s", err.Error())
		r.unitFix(d, file, e, q, need)
		return r.atV(Value{Bad: true}, file, e.Span(), "")
	}
	if math.Abs(q.SI) > ModelRange || math.IsNaN(q.SI) {
		r.errorf("model-range", file, e.Span(), "%s is out of the model's range: the estimate works with values below 1e12 in SI units (here %s)",
			src(r.m.Files[file], e.Span()), strconv.FormatFloat(q.SI, 'g', 4, 64))
		return r.atV(Value{Bad: true}, file, e.Span(), "")
	}
	return r.atV(Value{SI: q.SI, Set: true}, file, e.Span(), unitText)
}

// ModelRange bounds the magnitude, in SI units, of every value a field
// takes. Past it the estimate's arithmetic overflows into numbers that mean
// nothing (a conductance of 1e308 W/K gave a temperature of 309 digits);
// no passive loop comes near it (a terawatt, a thousand kilometres).
const ModelRange = 1e12

// unitFix suggests a mechanical repair of a unit error when there is one.
func (r *resolver) unitFix(d *Diagnostic, file string, e *Expr, q units.Quantity, need units.Need) {
	a := singleAtom(e)
	if a == nil {
		return
	}
	switch {
	case a.Unit == nil && a.Number != "" && !need.Dim.IsZero():
		// A bare number where a unit is needed: offer the SI unit.
		if cu := units.Common(need.Dim); len(cu) > 0 {
			end := a.Span().End
			d.Fixes = append(d.Fixes, Fix{Title: "Add the unit " + cu[0].Text, Edits: []Edit{{Loc: Location{File: file, Span: Span{end, end}}, NewText: " " + cu[0].Text}}})
		}
	case a.Unit != nil && need.Difference && q.AbsTemp:
		repl := "K"
		if strings.Contains(a.Unit.Text, "F") {
			repl = "degF_diff"
		}
		d.Fixes = append(d.Fixes, Fix{Title: "Write the difference in " + repl, Edits: []Edit{{Loc: Location{File: file, Span: a.Unit.Span()}, NewText: repl}}})
	}
}

// vectorField reads a field that takes one vector.
func (r *resolver) vectorField(file string, s *Stmt, need units.Need) Vec {
	if len(s.Args) != 1 || s.Args[0].Expr == nil {
		r.shapeError(file, s, "%s takes one vector: %s (X, Y, Z) UNIT", s.Keyword(), s.Keyword())
		return r.atVec(Vec{Bad: true}, file, s.Span(), "")
	}
	return r.vector(file, s.Args[0].Expr, need)
}

// vector evaluates "(X, Y, Z) UNIT". The unit after the parenthesis applies
// to elements written as bare numbers.
func (r *resolver) vector(file string, e *Expr, need units.Need) Vec {
	a := singleAtom(e)
	if a == nil || len(a.Group) != 3 {
		if id := notDecimalExpr(e); id != nil {
			r.errorf("syntax", file, id.Span(), notDecimalMsg, id.Name)
			return r.atVec(Vec{Bad: true}, file, e.Span(), "")
		}
		r.errorf("syntax", file, e.Span(), "expected a vector of three components: (X, Y, Z) UNIT")
		return r.atVec(Vec{Bad: true}, file, e.Span(), "")
	}
	var unit *units.Unit
	unitText := ""
	if a.Unit != nil {
		u, ok := r.unit(file, a.Unit)
		if !ok {
			return r.atVec(Vec{Bad: true}, file, e.Span(), "")
		}
		unit, unitText = &u, a.Unit.Text
	}
	var xyz [3]float64
	for i, el := range a.Group {
		q, ut, ok := r.eval(file, el)
		if !ok {
			return r.atVec(Vec{Bad: true}, file, e.Span(), "")
		}
		if unit != nil && q.Dim.IsZero() {
			q = unit.Quantity(q.SI)
			ut = unitText
		} else if q.Dim.IsZero() && q.SI == 0 && !need.Dim.IsZero() {
			// A bare zero needs no unit: (0, 0, h) is a point above the origin.
			q.Dim = need.Dim
		}
		if err := units.Check(q, ut, need); err != nil {
			r.errorf("unit", file, el.Span(), "%s", err.Error())
			return r.atVec(Vec{Bad: true}, file, e.Span(), "")
		}
		xyz[i] = q.SI
	}
	return r.atVec(Vec{X: xyz[0], Y: xyz[1], Z: xyz[2], Set: true}, file, e.Span(), unitText)
}

func (r *resolver) unit(file string, t *UnitTok) (units.Unit, bool) {
	u, err := units.Parse(t.Text)
	if err != nil {
		start := t.Span().Start
		var ue *units.Error
		if errors.As(err, &ue) {
			sp := Span{start + ue.Offset, start + ue.End}
			if sp.End <= sp.Start || sp.End > t.Span().End {
				sp = t.Span()
			}
			d := r.errorf("unit", file, sp, "%s", ue.Msg)
			// A suggestion replaces the piece that failed (the "k" of W/k);
			// the fix writes the whole unit it gives.
			var whole []string
			for _, sg := range ue.Suggestions {
				whole = append(whole, t.Text[:sp.Start-start]+sg+t.Text[sp.End-start:])
			}
			for _, sg := range r.fitting(whole) {
				d.Fixes = append(d.Fixes, Fix{Title: fmt.Sprintf("Change to %q", sg), Edits: []Edit{{Loc: Location{File: file, Span: t.Span()}, NewText: sg}}})
			}
		} else {
			r.errorf("unit", file, t.Span(), "%v", err)
		}
		return units.Unit{}, false
	}
	return u, true
}

// fitting keeps the suggested units that parse and, when the field's
// dimension is known and any suggestion has it, those of that dimension.
func (r *resolver) fitting(sugg []string) []string {
	var valid, keep []string
	for _, sg := range sugg {
		u, err := units.Parse(sg)
		if err != nil {
			continue
		}
		valid = append(valid, sg)
		if r.hinted && u.Dim == r.unitHint.Dim {
			keep = append(keep, sg)
		}
	}
	if len(keep) == 0 {
		return valid
	}
	return keep
}

// eval computes an expression's quantity. It returns the unit text when the
// expression is a single quantity, for messages.
func (r *resolver) eval(file string, e *Expr) (units.Quantity, string, bool) {
	if e == nil || e.Left == nil {
		return units.Quantity{}, "", false
	}
	q, ut, ok := r.term(file, e.Left)
	if !ok {
		return q, "", false
	}
	for _, op := range e.Ops {
		b, _, ok := r.term(file, op.Term)
		if !ok {
			return q, "", false
		}
		var err error
		if op.Op == "+" {
			q, err = units.Add(q, b)
		} else {
			q, err = units.Sub(q, b)
		}
		if err != nil {
			r.errorf("unit", file, Span{e.Pos.Offset, op.Term.EndPos.Offset}, "%s", err.Error())
			return q, "", false
		}
		ut = ""
	}
	return q, ut, true
}

func (r *resolver) term(file string, t *Term) (units.Quantity, string, bool) {
	if t == nil || t.Left == nil {
		return units.Quantity{}, "", false
	}
	q, ut, ok := r.factor(file, t.Left)
	if !ok {
		return q, "", false
	}
	for _, op := range t.Ops {
		b, _, ok := r.factor(file, op.Factor)
		if !ok {
			return q, "", false
		}
		var err error
		if op.Op == "*" {
			q, err = units.Mul(q, b)
		} else {
			q, err = units.Div(q, b)
		}
		if err != nil {
			r.errorf("unit", file, Span{t.Pos.Offset, op.Factor.EndPos.Offset}, "%s", err.Error())
			return q, "", false
		}
		ut = ""
	}
	return q, ut, true
}

func (r *resolver) factor(file string, f *Factor) (units.Quantity, string, bool) {
	if f == nil || f.Atom == nil {
		return units.Quantity{}, "", false
	}
	q, ut, ok := r.atom(file, f.Atom)
	if !ok {
		return q, "", false
	}
	if f.Power != nil {
		n, err := strconv.Atoi(f.Power.Sign + f.Power.Digits)
		if err != nil || n < -12 || n > 12 {
			r.errorf("syntax", file, Span{f.Power.Pos.Offset, f.Power.EndPos.Offset}, "a power must be a whole number from -12 to 12, not %s", f.Power.Sign+f.Power.Digits)
			return q, "", false
		}
		q, err = units.Pow(q, n)
		if err != nil {
			r.errorf("unit", file, Span{f.Pos.Offset, f.EndPos.Offset}, "%s", err.Error())
			return q, "", false
		}
		ut = ""
	}
	if f.Sign == "-" {
		q = units.Neg(q)
	}
	return q, ut, true
}

func (r *resolver) atom(file string, a *Atom) (units.Quantity, string, bool) {
	switch {
	case a.Number != "":
		v, err := strconv.ParseFloat(a.Number, 64)
		if err != nil || math.IsInf(v, 0) || math.IsNaN(v) {
			r.errorf("syntax", file, Span{a.Pos.Offset, a.Pos.Offset + len(a.Number)}, "number %s is out of range", a.Number)
			return units.Quantity{}, "", false
		}
		if a.Unit == nil {
			return units.Quantity{SI: v}, "", true
		}
		u, ok := r.unit(file, a.Unit)
		if !ok {
			return units.Quantity{}, "", false
		}
		return u.Quantity(v), a.Unit.Text, true
	case a.Ref != nil:
		ps, ok := r.params[a.Ref.Name]
		if !ok && notDecimalName(a.Ref.Name) {
			r.errorf("syntax", file, a.Ref.Span(), notDecimalMsg, a.Ref.Name)
			return units.Quantity{}, "", false
		}
		if !ok {
			cands := make([]string, 0, len(r.params))
			for n := range r.params {
				cands = append(cands, n)
			}
			r.unknownName(file, a.Ref, "parameter", cands, "")
			return units.Quantity{}, "", false
		}
		r.ref(RefParam, a.Ref.Name, nil, file, a.Ref.Span(), false)
		q, ok := r.param(a.Ref.Name)
		if !ok {
			return q, "", false
		}
		if a.Unit != nil {
			r.errorf("syntax", file, a.Unit.Span(), "a unit cannot follow a parameter name; multiply instead: %s * 1 %s", a.Ref.Name, a.Unit.Text)
			return q, "", false
		}
		_ = ps
		return q, "", true
	case a.Str != nil:
		r.errorf("syntax", file, a.Span(), "expected a quantity, found a string")
		return units.Quantity{}, "", false
	case len(a.Group) == 1:
		q, ut, ok := r.eval(file, a.Group[0])
		if !ok {
			return q, "", false
		}
		if a.Unit != nil {
			u, ok := r.unit(file, a.Unit)
			if !ok {
				return q, "", false
			}
			if !q.Dim.IsZero() {
				r.errorf("unit", file, a.Unit.Span(), "the unit after the parenthesis applies to a bare number, but the expression is already %s", units.Name(q.Dim))
				return q, "", false
			}
			return u.Quantity(q.SI), a.Unit.Text, true
		}
		return q, ut, true
	case len(a.Group) > 1:
		r.errorf("syntax", file, a.Span(), "a vector (X, Y, Z) is not allowed here")
		return units.Quantity{}, "", false
	}
	return units.Quantity{}, "", false
}

// param evaluates a parameter once, reporting cycles.
func (r *resolver) param(name string) (units.Quantity, bool) {
	ps := r.params[name]
	switch ps.state {
	case 2:
		if !ps.ok {
			return units.Quantity{}, false
		}
		return units.Quantity{SI: ps.p.Value.SI, Dim: ps.p.Dim, AbsTemp: ps.p.AbsTemp}, true
	case 1:
		r.errorf("param-cycle", ps.p.File(), ps.p.NameSpan(), "parameter %s is defined in terms of itself", name)
		ps.state, ps.ok = 2, false
		return units.Quantity{}, false
	}
	ps.state = 1
	defer r.release(r.mark())
	e := r.paramExpr(ps)
	if e == nil {
		ps.state, ps.ok = 2, false
		return units.Quantity{}, false
	}
	q, ut, ok := r.eval(ps.p.File(), e)
	if ps.state == 2 { // a cycle was reported while evaluating
		return units.Quantity{}, false
	}
	if r.overrides != nil {
		q, ut, ok = r.overridden(ps, q, ut, ok)
	}
	ps.state, ps.ok = 2, ok
	if ok {
		ps.p.Value = r.atV(Value{SI: q.SI, Set: true}, ps.p.File(), e.Span(), ut)
		ps.p.Dim, ps.p.AbsTemp = q.Dim, q.AbsTemp
	}
	return q, ok
}
