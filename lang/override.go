// Overriding: a model resolved again with some top-level parameters given
// other values, so a variant of a design can be tried without editing its
// files. The files already parsed are reused; nothing is read again.

package lang

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"

	"circa/units"
)

// Override gives a top-level parameter a value in place of the one its file
// writes.
type Override struct {
	Name  string
	Value units.Quantity // in SI, with its dimension
	// Text is the value as written ("10 mm"); empty when the value was
	// given in SI by a program.
	Text string
	// Unit is the unit as written when the value is one quantity ("mm"),
	// as Value.Unit.
	Unit string
}

// String writes the override as NAME=VALUE.
func (o Override) String() string { return o.Name + "=" + o.Written() }

// Written returns the value as written, or in SI units when it was given
// in SI.
func (o Override) Written() string {
	if o.Text != "" {
		return o.Text
	}
	v := strconv.FormatFloat(o.Value.SI, 'g', -1, 64)
	if !o.Value.Dim.IsZero() {
		v += " " + o.Value.Dim.String()
	}
	return v
}

// Overridden is an override as applied to a model: the parameter it set
// and the value the file itself gives.
type Overridden struct {
	Override
	Param *Param
	File  Value // the file's own value (Bad when the file's expression is in error)
	// FileText is the file's expression as written ("14 mm").
	FileText string
}

// OverrideError says why an override could not be applied.
type OverrideError struct {
	Name string // the parameter named
	Msg  string
}

func (e *OverrideError) Error() string { return e.Name + ": " + e.Msg }

const overridePrefix = "param _ = "

// ParseOverride reads NAME=VALUE, the value a quantity written as in a
// file ("riser_bore=10mm", "sink = 28 degC", "heat=(2+1) kW"). Names of
// other parameters are not allowed in the value.
func ParseOverride(s string) (Override, error) {
	name, text, ok := strings.Cut(s, "=")
	name, text = strings.TrimSpace(name), strings.TrimSpace(text)
	if !ok || name == "" {
		return Override{}, fmt.Errorf("%q: want NAME=VALUE, e.g. riser_bore=10mm", s)
	}
	if !IsIdent(name) {
		return Override{}, &OverrideError{Name: name, Msg: "not a parameter name (letters, digits and _, starting with a letter)"}
	}
	q, ut, err := ParseQuantity(text)
	if err != nil {
		return Override{}, &OverrideError{Name: name, Msg: err.Error()}
	}
	return Override{Name: name, Value: q, Text: text, Unit: ut}, nil
}

// ParseQuantity evaluates a value written as in a file: a number with its
// unit, or an expression of such. It returns the unit as written when the
// value is a single quantity. Errors name the column of the text they
// concern.
func ParseQuantity(text string) (units.Quantity, string, error) {
	if strings.TrimSpace(text) == "" {
		return units.Quantity{}, "", fmt.Errorf("no value: write a quantity such as 10 mm")
	}
	if strings.ContainsAny(text, "\n\r") {
		return units.Quantity{}, "", fmt.Errorf("a value is one line")
	}
	const path = "<value>"
	f := Parse(path, []byte(overridePrefix+text))
	fail := func(d Diagnostic) error {
		col := d.Loc.Span.Start - len(overridePrefix)
		if col < 0 {
			col = 0
		}
		return fmt.Errorf("column %d: %s", col+1, d.Message())
	}
	if len(f.Errors) > 0 {
		return units.Quantity{}, "", fail(f.Errors[0])
	}
	if len(f.Stmts) != 1 || len(f.Stmts[0].Args) != 3 || f.Stmts[0].Args[2].Expr == nil {
		return units.Quantity{}, "", fmt.Errorf("%q is not one value; write a quantity such as 10 mm", text)
	}
	e := f.Stmts[0].Args[2].Expr
	if id := firstRef(e); id != nil {
		return units.Quantity{}, "", fmt.Errorf("column %d: %s is a name; a value is a quantity such as 10 mm", id.Pos.Offset-len(overridePrefix)+1, id.Name)
	}
	m := newModel(path)
	m.Files[path] = f
	r := &resolver{m: m, params: map[string]*paramState{}}
	q, ut, ok := r.eval(path, e)
	if !ok {
		if len(m.Diags) > 0 {
			return units.Quantity{}, "", fail(m.Diags[0])
		}
		return units.Quantity{}, "", fmt.Errorf("%q is not a value", text)
	}
	if math.Abs(q.SI) > ModelRange || math.IsNaN(q.SI) {
		return units.Quantity{}, "", fmt.Errorf("%s is out of the model's range (values below 1e12 in SI units)", text)
	}
	return q, ut, nil
}

// firstRef returns the first name an expression uses.
func firstRef(e *Expr) *Ident {
	var found *Ident
	var expr func(*Expr)
	term := func(t *Term) {
		if t == nil {
			return
		}
		fs := []*Factor{t.Left}
		for _, op := range t.Ops {
			fs = append(fs, op.Factor)
		}
		for _, f := range fs {
			if f == nil || f.Atom == nil || found != nil {
				continue
			}
			if f.Atom.Ref != nil {
				found = f.Atom.Ref
				return
			}
			for _, g := range f.Atom.Group {
				expr(g)
			}
		}
	}
	expr = func(e *Expr) {
		if e == nil || found != nil {
			return
		}
		term(e.Left)
		for _, op := range e.Ops {
			term(op.Term)
		}
	}
	expr(e)
	return found
}

// With returns the model resolved again from the same parsed files with
// the given parameters overridden. Nothing is read or parsed again, and m
// is not changed, so several variants of one model may be resolved at once
// from different goroutines. A parameter the files do not declare, given
// twice, or given a value of another dimension than the file's is an
// *OverrideError; the model is then nil. A variant's own overrides hold in
// its variants, unless given again.
func (m *Model) With(ovs ...Override) (*Model, error) {
	if m.syntaxDropped {
		return nil, errors.New("the model's syntax trees were dropped: it cannot be resolved again")
	}
	v := newModel(m.Root)
	v.Files, v.Order = m.Files, m.Order
	v.Diags = slices.Clone(m.readDiags)
	v.readDiags = m.readDiags
	v.tables = m.tables
	r := newResolver(v, nil)
	r.overrides = make(map[string]*Overridden, len(ovs))
	for _, o := range ovs {
		if _, dup := r.overrides[o.Name]; dup {
			return nil, &OverrideError{Name: o.Name, Msg: "given twice"}
		}
		r.overrides[o.Name] = &Overridden{Override: o}
	}
	// The base's own overrides, first, where not given again.
	var all []Override
	for _, o := range m.Overrides {
		if _, again := r.overrides[o.Name]; !again {
			r.overrides[o.Name] = &Overridden{Override: o.Override}
			all = append(all, o.Override)
		}
	}
	ovs = append(all, ovs...)
	r.resolve()
	if err := r.overrideErr; err != nil {
		return nil, err
	}
	keepUnset(v, m)
	for _, o := range ovs {
		if r.overrides[o.Name].Param == nil {
			cands := make([]string, 0, len(r.params))
			for n := range r.params {
				cands = append(cands, n)
			}
			msg := "no such parameter at the top level"
			if best := Closest(o.Name, cands); best != "" {
				msg += fmt.Sprintf("; did you mean %s?", best)
			} else if len(cands) == 0 {
				msg = "no such parameter: the file declares none"
			}
			return nil, &OverrideError{Name: o.Name, Msg: msg}
		}
		v.Overrides = append(v.Overrides, *r.overrides[o.Name])
	}
	return v, nil
}

// overridden replaces a parameter's value, just evaluated from its file,
// by its override, when it has one of the same dimension.
func (r *resolver) overridden(ps *paramState, q units.Quantity, ut string, ok bool) (units.Quantity, string, bool) {
	o := r.overrides[ps.p.Name]
	if o == nil {
		return q, ut, ok
	}
	o.Param = ps.p
	o.File = r.atV(Value{Bad: !ok}, ps.p.File(), ps.p.Expr.Span(), "")
	o.FileText = src(r.m.Files[ps.p.File()], ps.p.Expr.Span())
	if !ok {
		// The file's own value is in error (reported there): its dimension
		// is unknown, so the override is taken as it is.
		return o.Value, o.Unit, true
	}
	o.File = r.atV(Value{SI: q.SI, Set: true}, ps.p.File(), ps.p.Expr.Span(), ut)
	need := units.Need{Dim: q.Dim}
	if u, err := units.Parse(ut); err == nil && u.IsDifference() {
		need.Difference = true
	}
	if err := units.Check(o.Value, o.Unit, need); err != nil {
		msg := fmt.Sprintf("%s; the file gives %s", err.Error(), o.FileText)
		if f := r.m.Files[ps.p.File()]; f != nil && f.Mapper != nil {
			pos := f.Mapper.OffsetPosition(ps.p.Expr.Span().Start, UTF8)
			msg += fmt.Sprintf(" at %s:%d:%d", ps.p.File(), pos.Line+1, pos.Col+1)
		}
		if r.overrideErr == nil {
			r.overrideErr = &OverrideError{Name: ps.p.Name, Msg: msg}
		}
		return q, ut, ok
	}
	return o.Value, o.Unit, true
}

// DropSyntax lets the model's syntax trees go, for a caller that needs only
// the model, the texts and their silencers ("# allow: RULE") from here on
// (circa check once the model is resolved): the files get copies without
// statements and without the other comments, and parameters and parts
// forget their expressions and statements. A large
// file's tree is several times the size of its model. The files the model
// shared with others are left as they were; the model can no longer be
// resolved again (With fails).
func (m *Model) DropSyntax() {
	files := make(map[string]*File, len(m.Files))
	for path, f := range m.Files {
		nf := *f
		nf.Stmts = nil
		nf.Comments = allowComments(f.Comments)
		files[path] = &nf
	}
	m.Files = files
	for _, p := range m.Params {
		p.Expr = nil
	}
	for _, p := range m.Parts {
		p.Stmts = nil
	}
	m.syntaxDropped = true
}

// keepUnset carries into the variant v the limits and methods of its base
// m where v's files set none: defaults the caller changed after resolving
// m (an editor's settings) hold for the variant too.
func keepUnset(v, m *Model) {
	lv, lm := &v.Limits, &m.Limits
	for _, f := range []struct {
		dst *Value
		src Value
	}{{&lv.ExitQuality, lm.ExitQuality}, {&lv.CHFRatio, lm.CHFRatio}, {&lv.Flooding, lm.Flooding}, {&lv.TiltMargin, lm.TiltMargin},
		{&lv.WallMargin, lm.WallMargin}, {&lv.HeadRatio, lm.HeadRatio}, {&lv.SaturationMax, lm.SaturationMax}} {
		if !f.dst.Set && !f.dst.Bad {
			*f.dst = f.src
		}
	}
	mv, mm := &v.Methods, &m.Methods
	for _, f := range []struct {
		dst *Choice
		src Choice
	}{{&mv.Void, mm.Void}, {&mv.Friction, mm.Friction}, {&mv.SinglePhase, mm.SinglePhase}, {&mv.CHF, mm.CHF},
		{&mv.SatState, mm.SatState}, {&mv.Condensation, mm.Condensation}} {
		if !f.dst.Set {
			*f.dst = f.src
		}
	}
	if !mv.CellsSet {
		mv.Cells = mm.Cells
	}
}
