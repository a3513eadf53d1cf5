package lang

import (
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"

	"circa/units"
)

// FS reads the files a model includes. The language server supplies one that
// prefers open editor buffers to the disk.
type FS interface {
	ReadFile(path string) ([]byte, error)
}

// OSFS reads from the operating system.
type OSFS struct{}

// ReadFile reads a file from disk.
func (OSFS) ReadFile(path string) ([]byte, error) { return os.ReadFile(path) }

// MaxFileSize bounds what the loader reads, so a wrong include cannot make
// the checker swallow a disk image.
const MaxFileSize = 64 << 20

// Load reads, parses and resolves the file at root and everything it includes.
func Load(root string, fsys FS) *Model {
	if fsys == nil {
		fsys = OSFS{}
	}
	src, err := fsys.ReadFile(root)
	m := newModel(root)
	if err != nil {
		m.Diags = append(m.Diags, Diagnostic{Rule: "file-unreadable", Severity: Error,
			Loc: Location{File: root}, Format: "cannot read %s: %v", Args: []any{root, errors.Unwrap(err)}})
		if errors.Unwrap(err) == nil {
			m.Diags[0].Args[1] = err
		}
		return m
	}
	return resolveRoot(m, root, src, fsys)
}

// LoadSource resolves root whose text is already in memory (standard input or
// an editor buffer); includes are read through fsys.
func LoadSource(root string, src []byte, fsys FS) *Model {
	if fsys == nil {
		fsys = OSFS{}
	}
	return resolveRoot(newModel(root), root, src, fsys)
}

func newModel(root string) *Model {
	return &Model{Root: root, Files: map[string]*File{}, Limits: DefaultLimits(), Methods: DefaultMethods()}
}

func resolveRoot(m *Model, root string, src []byte, fsys FS) *Model {
	r := &resolver{m: m, fs: fsys, params: map[string]*paramState{}, parts: map[string]*Part{},
		comps: map[string]*Component{}, cases: map[string]*Case{}, loops: map[string]*Loop{}}
	r.read(root, src, nil, Location{})
	r.declare()
	r.fill()
	r.allows()
	m.Diags = dedupe(m.Diags)
	return m
}

// dedupe drops findings of the same rule at the same place: a part's bad
// field is read once for every component that uses it.
func dedupe(ds []Diagnostic) []Diagnostic {
	type key struct {
		rule string
		loc  Location
	}
	seen := make(map[key]bool, len(ds))
	out := ds[:0]
	for _, d := range ds {
		k := key{d.Rule, d.Loc}
		if seen[k] {
			continue
		}
		seen[k] = true
		out = append(out, d)
	}
	return out
}

type paramState struct {
	p     *Param
	state int // 0 unevaluated, 1 evaluating, 2 done
	q     units.Quantity
	ok    bool
}

type resolver struct {
	m      *Model
	fs     FS
	params map[string]*paramState
	parts  map[string]*Part
	comps  map[string]*Component
	cases  map[string]*Case
	loops  map[string]*Loop
	// loop statements kept for pass two
	loopStmts map[*Loop]*Stmt
	compStmts map[*Component]*Stmt
	caseStmts map[*Case]*Stmt
	limStmts  []fileStmt
	methStmts []fileStmt
	// unitHint is the dimension the quantity being evaluated must have,
	// when it is a lone quantity.
	unitHint *units.Need
}

type fileStmt struct {
	file string
	st   *Stmt
}

func (r *resolver) diag(rule string, sev Severity, file string, span Span, format string, args ...any) *Diagnostic {
	r.m.Diags = append(r.m.Diags, Diagnostic{Rule: rule, Severity: sev, Loc: Location{File: file, Span: span}, Format: format, Args: args})
	return &r.m.Diags[len(r.m.Diags)-1]
}

func (r *resolver) errorf(rule, file string, span Span, format string, args ...any) *Diagnostic {
	return r.diag(rule, Error, file, span, format, args...)
}

// read parses one file and, depth first, the files it includes.
func (r *resolver) read(path string, src []byte, stack []string, from Location) {
	if len(src) > MaxFileSize {
		r.errorf("file-unreadable", from.File, from.Span, "%s is larger than %d MiB", path, MaxFileSize>>20)
		return
	}
	f := Parse(path, src)
	r.m.Files[path] = f
	r.m.Order = append(r.m.Order, path)
	r.m.Diags = append(r.m.Diags, f.Errors...)
	stack = append(stack, path)
	for _, st := range f.Stmts {
		if st.Keyword() != "include" || st.Bad {
			continue
		}
		s, ok := r.stringArg(path, st)
		if !ok {
			continue
		}
		inc := s.Value()
		target := inc
		if !filepath.IsAbs(target) {
			target = filepath.Join(filepath.Dir(path), filepath.FromSlash(inc))
		}
		loc := Location{File: path, Span: s.Span()}
		if i := indexOf(stack, target); i >= 0 {
			d := r.errorf("include-cycle", path, s.Span(), "include cycle: %s", strings.Join(append(append([]string(nil), stack[i:]...), target), " → "))
			d.Related = append(d.Related, Related{Loc: Location{File: target}, Message: "the cycle starts here"})
			continue
		}
		if _, done := r.m.Files[target]; done {
			continue // diamond includes are read once
		}
		data, err := r.fs.ReadFile(target)
		if err != nil {
			msg := err.Error()
			var pe *os.PathError
			if errors.As(err, &pe) {
				msg = pe.Err.Error()
			}
			r.errorf("include-unreadable", path, s.Span(), "cannot read included file %s: %s", inc, msg)
			continue
		}
		r.read(target, data, stack, loc)
	}
}

func indexOf(list []string, s string) int {
	for i, x := range list {
		if x == s {
			return i
		}
	}
	return -1
}

// stringArg returns the single string part of st.
func (r *resolver) stringArg(file string, st *Stmt) (*Str, bool) {
	if len(st.Args) == 1 && st.Args[0].Expr != nil {
		if a := singleAtom(st.Args[0].Expr); a != nil && a.Str != nil {
			return a.Str, true
		}
	}
	r.errorf("syntax", file, st.Span(), "%s needs one quoted path, e.g. %s \"parts.loop\"", st.Keyword(), st.Keyword())
	return nil, false
}

// singleAtom returns the atom of an expression that is one unsigned atom.
func singleAtom(e *Expr) *Atom {
	if e == nil || len(e.Ops) > 0 || e.Left == nil || len(e.Left.Ops) > 0 || e.Left.Left == nil {
		return nil
	}
	f := e.Left.Left
	if f.Sign != "" || f.Power != nil {
		return nil
	}
	return f.Atom
}

// nameOf returns the bare name an expression consists of.
func nameOf(e *Expr) *Ident {
	if a := singleAtom(e); a != nil && a.Ref != nil && a.Unit == nil {
		return a.Ref
	}
	return nil
}

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
	r.compStmts = map[*Component]*Stmt{}
	r.caseStmts = map[*Case]*Stmt{}
	for _, path := range r.m.Order {
		f := r.m.Files[path]
		for _, st := range f.Stmts {
			if st.Bad {
				continue
			}
			switch kw := st.Keyword(); kw {
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
				r.ref(RefPart, name.Name, nil, path, name.Span(), true)
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
				d := r.errorf("duplicate-nominal", c.File, c.NameSpan, "case %s is marked nominal, but %s already is", c.Name, r.m.Nominal.Name)
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
	d := Decl{Name: name.Name, File: file, NameSpan: name.Span(), Span: st.Span(), BlockClose: -1}
	if st.Block != nil {
		d.BlockClose = st.Block.Close
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
	r.m.Refs = append(r.m.Refs, Ref{Kind: kind, Name: name, Loop: loop, File: file, Span: span, IsDecl: decl})
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
	if len(st.Args) != 3 || st.Args[0].Expr == nil || nameOf(st.Args[0].Expr) == nil || st.Args[1].Key != "=" || st.Args[2].Expr == nil {
		r.errorf("syntax", file, st.Span(), "param needs a name and a value: param NAME = VALUE")
		return
	}
	name := nameOf(st.Args[0].Expr)
	p := &Param{Decl: r.decl(file, st, name), Expr: st.Args[2].Expr}
	if prev, dup := r.params[name.Name]; dup {
		r.duplicate(file, name, "parameter", prev.p.Decl)
		return
	}
	r.params[name.Name] = &paramState{p: p}
	r.m.Params = append(r.m.Params, p)
	r.ref(RefParam, name.Name, nil, file, name.Span(), true)
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
	nodes := map[string]*Node{}
	// Nodes first, so components may name nodes declared after them.
	for _, s := range st.Block.Stmts {
		if s.Bad || (s.Keyword() != "node" && s.Keyword() != "junction") {
			continue
		}
		if len(s.Args) == 0 || nameOf(s.Args[0].Expr) == nil {
			r.errorf("syntax", file, s.Span(), "%s needs a name: %s NAME [at (X, Y, Z) UNIT]", s.Keyword(), s.Keyword())
			continue
		}
		nm := nameOf(s.Args[0].Expr)
		if prev, dup := nodes[nm.Name]; dup {
			r.duplicate(file, nm, "node", prev.Decl)
			continue
		}
		n := &Node{Decl: r.decl(file, s, nm), Loop: l, Junction: s.Keyword() == "junction", Index: len(l.Nodes)}
		nodes[nm.Name] = n
		l.Nodes = append(l.Nodes, n)
		r.ref(RefNode, nm.Name, l, file, nm.Span(), true)
		rest := s.Args[1:]
		if len(rest) > 0 {
			if rest[0].Key != "at" || len(rest) != 2 || rest[1].Expr == nil {
				r.errorf("syntax", file, s.Span(), "a node's coordinates are written: %s %s at (X, Y, Z) UNIT", s.Keyword(), nm.Name)
				continue
			}
			n.At = r.vector(file, rest[1].Expr, units.Need{Dim: units.Length})
		}
		if s.Block != nil {
			r.errorf("syntax", file, Span{s.Block.Open, s.Block.Open + 1}, "a node takes no block")
		}
	}
	for _, s := range st.Block.Stmts {
		if s.Bad {
			continue
		}
		kw := s.Keyword()
		k, isComp := kindOf(kw)
		if !isComp {
			continue
		}
		r.declareComponent(file, s, l, k, nodes)
	}
}

func (r *resolver) declareComponent(file string, s *Stmt, l *Loop, k Kind, nodes map[string]*Node) {
	parts := s.Args
	if len(parts) == 0 || nameOf(parts[0].Expr) == nil {
		if k == Reservoir {
			r.errorf("syntax", file, s.Span(), "reservoir needs a name and a node: reservoir NAME at NODE")
		} else {
			r.errorf("syntax", file, s.Span(), "%s needs a name and its ends: %s NAME from NODE to NODE", k, k)
		}
		return
	}
	nm := nameOf(parts[0].Expr)
	c := &Component{Decl: r.decl(file, s, nm), Kind: k, Loop: l, Index: len(l.Components)}
	c.Roughness = Value{SI: 1.5e-6}
	c.BoilRoughness = Value{SI: 1e-6}
	node := func(p *Arg) (*Node, Span) {
		id := nameOf(p.Expr)
		if id == nil {
			r.errorf("syntax", file, p.Span(), "expected a node name")
			return nil, p.Span()
		}
		n, ok := nodes[id.Name]
		if !ok {
			cands := make([]string, 0, len(l.Nodes))
			for _, n := range l.Nodes {
				cands = append(cands, n.Name)
			}
			r.unknownName(file, id, "node", cands, fmt.Sprintf(" in loop %s", l.Name))
			return nil, id.Span()
		}
		r.ref(RefNode, id.Name, l, file, id.Span(), false)
		return n, id.Span()
	}
	rest := parts[1:]
	if k == Reservoir {
		if len(rest) != 2 || rest[0].Key != "at" || rest[1].Expr == nil {
			r.errorf("syntax", file, s.Span(), "reservoir needs the node it hangs from: reservoir %s at NODE", nm.Name)
		} else {
			c.From, c.FromSpan = node(rest[1])
		}
	} else {
		if len(rest) != 4 || rest[0].Key != "from" || rest[2].Key != "to" || rest[1].Expr == nil || rest[3].Expr == nil {
			r.errorf("syntax", file, s.Span(), "%s needs its ends: %s %s from NODE to NODE", k, k, nm.Name)
		} else {
			c.From, c.FromSpan = node(rest[1])
			c.To, c.ToSpan = node(rest[3])
		}
	}
	if prev, dup := r.comps[nm.Name]; dup {
		r.duplicate(file, nm, "component", prev.Decl)
		return
	}
	r.comps[nm.Name] = c
	l.Components = append(l.Components, c)
	r.compStmts[c] = s
	r.ref(RefComponent, nm.Name, l, file, nm.Span(), true)
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
	r.ref(RefCase, name.Name, nil, file, name.Span(), true)
}

func src(f *File, s Span) string {
	if f == nil || s.Start < 0 || s.End > len(f.Src) || s.Start > s.End {
		return ""
	}
	return string(f.Src[s.Start:s.End])
}

func (r *resolver) unknownName(file string, id *Ident, what string, cands []string, where string) {
	d := r.errorf("unknown-name", file, id.Span(), "unknown %s %q%s", what, id.Name, where)
	if best := Closest(id.Name, cands); best != "" {
		d.Format += "; did you mean %q?"
		d.Args = append(d.Args, best)
		d.Fixes = append(d.Fixes, Fix{Title: fmt.Sprintf("Change to %q", best), Edits: []Edit{{Loc: Location{File: file, Span: id.Span()}, NewText: best}}})
	}
}

// fill evaluates every field now that all names are known.
func (r *resolver) fill() {
	for _, l := range r.m.Loops {
		st := r.loopStmts[l]
		var body []*Stmt // a loop written without a block has none
		if st.Block != nil {
			body = st.Block.Stmts
		}
		for _, s := range body {
			if s.Bad {
				continue
			}
			kw := s.Keyword()
			switch kw {
			case "node", "junction":
				continue
			case "param":
				r.errorf("syntax", l.File, s.Word.Span(), "parameters are declared at the top level, outside loops")
				continue
			}
			if k, ok := kindOf(kw); ok {
				_ = k
				continue
			}
			r.loopField(l, s)
		}
		if !l.Fluid.Set {
			r.errorf("missing-field", l.File, l.NameSpan, "loop %s names no working fluid: add \"fluid NAME\"", l.Name)
		}
	}
	for _, l := range r.m.Loops {
		for _, c := range l.Components {
			r.componentFields(c, r.compStmts[c])
		}
	}
	for _, c := range r.m.Cases {
		st := r.caseStmts[c]
		if st.Block == nil {
			continue
		}
		for _, s := range st.Block.Stmts {
			if !s.Bad {
				r.caseField(c, s)
			}
		}
	}
	for _, fs := range r.limStmts {
		if fs.st.Block == nil {
			continue
		}
		for _, s := range fs.st.Block.Stmts {
			if !s.Bad {
				r.limitField(fs.file, s)
			}
		}
	}
	for _, fs := range r.methStmts {
		if fs.st.Block == nil {
			continue
		}
		for _, s := range fs.st.Block.Stmts {
			if !s.Bad {
				r.methodField(fs.file, s)
			}
		}
	}
	// Parameters nobody used still get evaluated, so their errors show.
	for _, p := range r.m.Params {
		r.param(p.Name)
	}
}

var (
	needLength   = units.Need{Dim: units.Length}
	needArea     = units.Need{Dim: units.Area}
	needVolume   = units.Need{Dim: units.Volume}
	needTemp     = units.Need{Dim: units.Temperature}
	needTempDiff = units.Need{Dim: units.Temperature, Difference: true}
	needPower    = units.Need{Dim: units.Power}
	needPressure = units.Need{Dim: units.Pressure}
	needMass     = units.Need{Dim: units.Mass}
	needNumber   = units.Need{Dim: units.Dimensionless}
	needFlux     = units.Need{Dim: units.HeatFlux}
	needUA       = units.Need{Dim: units.Conductance}
	needAngle    = units.Need{Dim: units.Angle}
	needAccel    = units.Need{Dim: units.Acceleration}
)

// FieldNeeds maps each field to the dimension it needs, for completion.
var FieldNeeds = map[string]units.Need{
	"charge": needMass, "design_pressure": needPressure, "saturation": needTemp,
	"length": needLength, "rise": needLength, "run": needLength, "bore": needLength, "flow_area": needArea,
	"hydraulic_diameter": needLength, "roughness": needLength, "loss": needNumber,
	"heat": needPower, "heated_length": needLength, "wetted_area": needArea, "heat_flux": needFlux,
	"wall_limit": needTemp, "roughness_boiling": needLength, "conductance": needUA, "sink": needTemp,
	"outlet": needTemp, "subcool": needTempDiff, "volume": needVolume,
	"pitch": needAngle, "roll": needAngle, "yaw": needAngle, "accel": needAccel,
	"exit_quality": needNumber, "chf_ratio": needNumber, "flooding": needNumber, "tilt_margin": needAngle,
	"wall_margin": needTempDiff, "head_ratio": needNumber, "saturation_max": needTemp,
}

// Field lists per scope, for messages and completion.
var (
	LoopFields      = []string{"fluid", "charge", "design_pressure", "saturation"}
	ComponentFields = map[Kind][]string{
		Pipe:       {"use", "length", "rise", "run", "bore", "flow_area", "hydraulic_diameter", "roughness", "loss"},
		Bend:       {"use", "length", "rise", "run", "bore", "flow_area", "hydraulic_diameter", "roughness", "loss"},
		Fitting:    {"use", "length", "rise", "run", "bore", "flow_area", "hydraulic_diameter", "roughness", "loss"},
		Evaporator: {"use", "length", "rise", "run", "bore", "flow_area", "hydraulic_diameter", "roughness", "loss", "heat", "heated_length", "wetted_area", "heat_flux", "wall_limit", "roughness_boiling"},
		Condenser:  {"use", "length", "rise", "run", "bore", "flow_area", "hydraulic_diameter", "roughness", "loss", "conductance", "sink", "outlet", "subcool"},
		Reservoir:  {"use", "volume", "rise", "length", "bore"},
	}
	CaseFields   = []string{"heat", "sink", "pitch", "roll", "yaw", "accel", "saturation"}
	LimitFields  = []string{"exit_quality", "chf_ratio", "flooding", "tilt_margin", "wall_margin", "head_ratio", "saturation_max"}
	MethodFields = []string{"void_fraction", "friction", "single_phase", "chf", "cells"}
)

func (r *resolver) loopField(l *Loop, s *Stmt) {
	file := l.File
	switch s.Keyword() {
	case "fluid":
		r.fluidField(l, s)
	case "charge":
		l.Charge = r.qty(file, s, needMass)
	case "design_pressure":
		l.DesignPressure = r.qty(file, s, needPressure)
	case "saturation":
		l.Saturation = r.qty(file, s, needTemp)
	default:
		r.unknownWord(file, s, append(append([]string(nil), loopKeywords...), "param"), "in a loop")
	}
	r.noBlock(file, s)
}

func (r *resolver) noBlock(file string, s *Stmt) {
	if s.Block != nil {
		r.errorf("syntax", file, Span{s.Block.Open, s.Block.Open + 1}, "%s takes no block", s.Keyword())
	}
}

func (r *resolver) fluidField(l *Loop, s *Stmt) {
	file := l.File
	if len(s.Args) == 1 {
		if id := nameOf(s.Args[0].Expr); id != nil {
			l.Fluid = FluidSpec{Name: id.Name, Set: true, File: file, Span: id.Span()}
			r.ref(RefFluid, id.Name, l, file, id.Span(), false)
			return
		}
		if a := singleAtom(s.Args[0].Expr); a != nil && a.Str != nil {
			// fluid "R134a" is accepted as a name too.
			l.Fluid = FluidSpec{Name: a.Str.Value(), Set: true, File: file, Span: a.Str.Span()}
			return
		}
	}
	if len(s.Args) == 2 {
		if id := nameOf(s.Args[0].Expr); id != nil && id.Name == "table" {
			if a := singleAtom(s.Args[1].Expr); a != nil && a.Str != nil {
				p := a.Str.Value()
				if !filepath.IsAbs(p) {
					p = filepath.Join(filepath.Dir(file), filepath.FromSlash(p))
				}
				base := strings.TrimSuffix(filepath.Base(p), filepath.Ext(p))
				l.Fluid = FluidSpec{Name: base, Table: p, Set: true, File: file, Span: a.Str.Span()}
				return
			}
		}
	}
	r.errorf("syntax", file, s.Span(), "fluid needs a built-in name (fluid R134a) or a table (fluid table \"coolant.csv\")")
}

func (r *resolver) componentFields(c *Component, st *Stmt) {
	if st.Block == nil {
		return
	}
	// Parts first, then the component's own fields, which win.
	var own []*Stmt
	for _, s := range st.Block.Stmts {
		if s.Bad {
			continue
		}
		if s.Keyword() == "use" {
			id := (*Ident)(nil)
			if len(s.Args) == 1 {
				id = nameOf(s.Args[0].Expr)
			}
			if id == nil {
				r.errorf("syntax", c.File, s.Span(), "use needs a part name: use PART")
				continue
			}
			p, ok := r.parts[id.Name]
			if !ok {
				cands := make([]string, 0, len(r.parts))
				for n := range r.parts {
					cands = append(cands, n)
				}
				r.unknownName(c.File, id, "part", cands, "")
				continue
			}
			r.ref(RefPart, id.Name, nil, c.File, id.Span(), false)
			c.Uses = append(c.Uses, p)
			for _, ps := range p.Stmts {
				if !ps.Bad {
					r.componentField(c, p.File, ps)
				}
			}
			continue
		}
		own = append(own, s)
	}
	for _, s := range own {
		r.componentField(c, c.File, s)
	}
	r.conflicts(c)
}

// conflicts reports fields that say the same thing twice in different ways.
func (r *resolver) conflicts(c *Component) {
	pairs := []struct {
		a, b   string
		va, vb bool
		spanB  Span
		fileB  string
	}{
		{"rise", "run", c.Rise.Set, c.Run.Set, c.Run.Span, c.Run.File},
		{"bore", "flow_area", c.Bore.Set, c.FlowArea.Set, c.FlowArea.Span, c.FlowArea.File},
		{"bore", "hydraulic_diameter", c.Bore.Set, c.HydDiameter.Set, c.HydDiameter.Span, c.HydDiameter.File},
		{"wetted_area", "heat_flux", c.WettedArea.Set, c.HeatFlux.Set, c.HeatFlux.Span, c.HeatFlux.File},
		{"conductance", "outlet", c.Conductance.Set, c.Outlet.Set, c.Outlet.Span, c.Outlet.File},
	}
	for _, p := range pairs {
		if p.va && p.vb {
			r.errorf("conflicting-fields", p.fileB, p.spanB, "%s %s gives both %s and %s; keep one", c.Kind, c.Name, p.a, p.b)
		}
	}
	if c.FlowArea.Set && !c.HydDiameter.Set && !c.Bore.Set {
		// A flow area alone is taken as a round tube; say so only through Diameter's doc.
		return
	}
}

func (r *resolver) componentField(c *Component, file string, s *Stmt) {
	kw := s.Keyword()
	allowed := ComponentFields[c.Kind]
	if indexOf(allowed, kw) < 0 {
		all := map[string]bool{}
		for _, fs := range ComponentFields {
			for _, f := range fs {
				all[f] = true
			}
		}
		if all[kw] {
			r.errorf("field-not-allowed", file, s.Word.Span(), "%s is not a field of a %s (it applies to %s)", kw, c.Kind, kindsWith(kw))
			return
		}
		r.unknownWord(file, s, allowed, "in a "+c.Kind.String())
		return
	}
	r.noBlock(file, s)
	var dst *Value
	switch kw {
	case "length":
		dst = &c.Length
	case "rise":
		dst = &c.Rise
	case "run":
		c.Run = r.vectorField(file, s, needLength)
		return
	case "bore":
		dst = &c.Bore
	case "flow_area":
		dst = &c.FlowArea
	case "hydraulic_diameter":
		dst = &c.HydDiameter
	case "roughness":
		dst = &c.Roughness
	case "loss":
		dst = &c.Loss
	case "heat":
		dst = &c.Heat
	case "heated_length":
		dst = &c.HeatedLength
	case "wetted_area":
		dst = &c.WettedArea
	case "heat_flux":
		dst = &c.HeatFlux
	case "wall_limit":
		dst = &c.WallLimit
	case "roughness_boiling":
		dst = &c.BoilRoughness
	case "conductance":
		dst = &c.Conductance
	case "sink":
		dst = &c.Sink
	case "outlet":
		dst = &c.Outlet
	case "subcool":
		dst = &c.Subcool
	case "volume":
		dst = &c.Volume
	}
	if dst == nil {
		return
	}
	v := r.qty(file, s, FieldNeeds[kw])
	if v.Set || !dst.Set {
		if !v.Set {
			v.SI = dst.SI // keep the default when the value was bad
		}
		*dst = v
	}
}

func kindsWith(field string) string {
	var ks []string
	for k := Pipe; k <= Reservoir; k++ {
		if indexOf(ComponentFields[k], field) >= 0 {
			ks = append(ks, k.String())
		}
	}
	return strings.Join(ks, ", ")
}

func (r *resolver) caseField(c *Case, s *Stmt) {
	file := c.File
	r.noBlock(file, s)
	switch kw := s.Keyword(); kw {
	case "heat", "sink":
		need := FieldNeeds[kw]
		if kw == "sink" && len(s.Args) == 1 {
			c.Sink = r.qty(file, s, need)
			return
		}
		if len(s.Args) != 2 || nameOf(s.Args[0].Expr) == nil || s.Args[1].Expr == nil {
			if kw == "heat" {
				r.errorf("syntax", file, s.Span(), "heat in a case names its evaporator: heat EVAPORATOR 2 kW")
			} else {
				r.errorf("syntax", file, s.Span(), "sink in a case is: sink 35 degC, or sink CONDENSER 35 degC")
			}
			return
		}
		id := nameOf(s.Args[0].Expr)
		want := Evaporator
		if kw == "sink" {
			want = Condenser
		}
		comp, ok := r.comps[id.Name]
		if !ok {
			var cands []string
			for n, cc := range r.comps {
				if cc.Kind == want {
					cands = append(cands, n)
				}
			}
			r.unknownName(file, id, want.String(), cands, "")
			return
		}
		r.ref(RefComponent, id.Name, comp.Loop, file, id.Span(), false)
		if comp.Kind != want {
			r.errorf("wrong-kind", file, id.Span(), "%s is a %s, not a %s", id.Name, comp.Kind, want)
			return
		}
		v := r.expr(file, s.Args[1].Expr, need)
		ld := CompValue{Comp: comp, NameSpan: id.Span(), File: file, Value: v}
		for _, prev := range append(c.Heat, c.Sinks...) {
			if prev.Comp == comp && ((kw == "heat") == (comp.Kind == Evaporator)) {
				d := r.errorf("duplicate-name", file, id.Span(), "%s is given twice in case %s", id.Name, c.Name)
				d.Related = append(d.Related, Related{Loc: Location{File: prev.File, Span: prev.NameSpan}, Message: "first given here"})
				return
			}
		}
		if kw == "heat" {
			c.Heat = append(c.Heat, ld)
		} else {
			c.Sinks = append(c.Sinks, ld)
		}
	case "pitch":
		c.Pitch = r.qty(file, s, needAngle)
	case "roll":
		c.Roll = r.qty(file, s, needAngle)
	case "yaw":
		c.Yaw = r.qty(file, s, needAngle)
	case "accel":
		c.Accel = r.vectorField(file, s, needAccel)
	case "saturation":
		c.Saturation = r.qty(file, s, needTemp)
	default:
		r.unknownWord(file, s, CaseFields, "in a case")
	}
}

func (r *resolver) limitField(file string, s *Stmt) {
	r.noBlock(file, s)
	l := &r.m.Limits
	var dst *Value
	switch kw := s.Keyword(); kw {
	case "exit_quality":
		dst = &l.ExitQuality
	case "chf_ratio":
		dst = &l.CHFRatio
	case "flooding":
		dst = &l.Flooding
	case "tilt_margin":
		dst = &l.TiltMargin
	case "wall_margin":
		dst = &l.WallMargin
	case "head_ratio":
		dst = &l.HeadRatio
	case "saturation_max":
		dst = &l.SaturationMax
	default:
		r.unknownWord(file, s, LimitFields, "in limits")
		return
	}
	v := r.qty(file, s, FieldNeeds[s.Keyword()])
	if v.Set {
		*dst = v
	}
}

func (r *resolver) methodField(file string, s *Stmt) {
	r.noBlock(file, s)
	kw := s.Keyword()
	m := &r.m.Methods
	if kw == "cells" {
		v := r.qty(file, s, needNumber)
		if !v.Set {
			return
		}
		n := v.SI
		if n != math.Trunc(n) || n < 4 || n > 10000 {
			r.errorf("bad-value", file, v.Span, "cells must be a whole number from 4 to 10000, not %s", strconv.FormatFloat(n, 'g', -1, 64))
			return
		}
		m.Cells, m.CellsSet = int(n), true
		return
	}
	choices, ok := MethodChoices[kw]
	if !ok {
		r.unknownWord(file, s, MethodFields, "in methods")
		return
	}
	if len(s.Args) != 1 || nameOf(s.Args[0].Expr) == nil {
		r.errorf("syntax", file, s.Span(), "%s needs one of: %s", kw, strings.Join(choices, ", "))
		return
	}
	id := nameOf(s.Args[0].Expr)
	if indexOf(choices, id.Name) < 0 {
		d := r.errorf("unknown-name", file, id.Span(), "unknown %s method %q (choices: %s)", kw, id.Name, strings.Join(choices, ", "))
		if best := Closest(id.Name, choices); best != "" {
			d.Fixes = append(d.Fixes, Fix{Title: fmt.Sprintf("Change to %q", best), Edits: []Edit{{Loc: Location{File: file, Span: id.Span()}, NewText: best}}})
		}
		return
	}
	ch := Choice{Name: id.Name, Set: true, File: file, Span: id.Span()}
	switch kw {
	case "void_fraction":
		m.Void = ch
	case "friction":
		m.Friction = ch
	case "single_phase":
		m.SinglePhase = ch
	case "chf":
		m.CHF = ch
	}
}

// qty reads a field that takes one quantity.
func (r *resolver) qty(file string, s *Stmt, need units.Need) Value {
	if len(s.Args) != 1 || s.Args[0].Expr == nil {
		if len(s.Args) == 0 {
			r.errorf("missing-value", file, s.Span(), "%s needs a value (%s)", s.Keyword(), needNoun(need))
		} else {
			r.errorf("syntax", file, s.Span(), "%s takes one value (%s); write a negative value after a space as -2, or put an expression in parentheses", s.Keyword(), needNoun(need))
		}
		return Value{}
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
		r.unitHint = &need
		defer func() { r.unitHint = nil }()
	}
	q, unitText, ok := r.eval(file, e)
	if !ok {
		return Value{}
	}
	if err := units.Check(q, unitText, need); err != nil {
		d := r.errorf("unit", file, e.Span(), "%s", err.Error())
		r.unitFix(d, file, e, q, need)
		return Value{}
	}
	return Value{SI: q.SI, Set: true, File: file, Span: e.Span(), Unit: unitText}
}

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
			repl = "delta_degF"
		}
		d.Fixes = append(d.Fixes, Fix{Title: "Write the difference in " + repl, Edits: []Edit{{Loc: Location{File: file, Span: a.Unit.Span()}, NewText: repl}}})
	}
}

// vectorField reads a field that takes one vector.
func (r *resolver) vectorField(file string, s *Stmt, need units.Need) Vec {
	if len(s.Args) != 1 || s.Args[0].Expr == nil {
		r.errorf("syntax", file, s.Span(), "%s takes one vector: %s (X, Y, Z) UNIT", s.Keyword(), s.Keyword())
		return Vec{}
	}
	return r.vector(file, s.Args[0].Expr, need)
}

// vector evaluates "(X, Y, Z) UNIT". The unit after the parenthesis applies
// to elements written as bare numbers.
func (r *resolver) vector(file string, e *Expr, need units.Need) Vec {
	a := singleAtom(e)
	if a == nil || len(a.Group) != 3 {
		r.errorf("syntax", file, e.Span(), "expected a vector of three components: (X, Y, Z) UNIT")
		return Vec{}
	}
	var unit *units.Unit
	unitText := ""
	if a.Unit != nil {
		u, ok := r.unit(file, a.Unit)
		if !ok {
			return Vec{}
		}
		unit, unitText = &u, a.Unit.Text
	}
	var xyz [3]float64
	for i, el := range a.Group {
		q, ut, ok := r.eval(file, el)
		if !ok {
			return Vec{}
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
			return Vec{}
		}
		xyz[i] = q.SI
	}
	return Vec{X: xyz[0], Y: xyz[1], Z: xyz[2], Set: true, File: file, Span: e.Span(), Unit: unitText}
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
			for _, sg := range r.fitting(ue.Suggestions) {
				d.Fixes = append(d.Fixes, Fix{Title: fmt.Sprintf("Change to %q", sg), Edits: []Edit{{Loc: Location{File: file, Span: t.Span()}, NewText: sg}}})
			}
		} else {
			r.errorf("unit", file, t.Span(), "%v", err)
		}
		return units.Unit{}, false
	}
	return u, true
}

// fitting keeps the suggested units of the dimension the field needs, when
// it is known and any suggestion has it.
func (r *resolver) fitting(sugg []string) []string {
	if r.unitHint == nil {
		return sugg
	}
	var keep []string
	for _, sg := range sugg {
		if u, err := units.Parse(sg); err == nil && u.Dim == r.unitHint.Dim {
			keep = append(keep, sg)
		}
	}
	if len(keep) == 0 {
		return sugg
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
		return ps.q, ps.ok
	case 1:
		r.errorf("param-cycle", ps.p.File, ps.p.NameSpan, "parameter %s is defined in terms of itself", name)
		ps.state, ps.ok = 2, false
		return units.Quantity{}, false
	}
	ps.state = 1
	q, ut, ok := r.eval(ps.p.File, ps.p.Expr)
	if ps.state == 2 { // a cycle was reported while evaluating
		return units.Quantity{}, false
	}
	ps.state, ps.q, ps.ok = 2, q, ok
	if ok {
		ps.p.Value = Value{SI: q.SI, Set: true, File: ps.p.File, Span: ps.p.Expr.Span(), Unit: ut}
	}
	return q, ok
}

// allows collects "# allow: RULE" silencers from every file's comments.
func (r *resolver) allows() {
	for _, path := range r.m.Order {
		f := r.m.Files[path]
		for _, c := range f.Comments {
			body := strings.TrimSpace(strings.TrimPrefix(c.Text, "#"))
			if !strings.HasPrefix(body, "allow:") {
				continue
			}
			off := c.Span.Start + strings.Index(c.Text, "allow:") + len("allow:")
			line := f.Mapper.OffsetLine(c.Span.Start)
			// A list of rule names separated by commas; anything after the
			// list (a reason) is free text: "# allow: rule-a, rule-b because …".
			text := f.Src[:c.Span.End]
			p := off
			for {
				for p < len(text) && (text[p] == ' ' || text[p] == '\t') {
					p++
				}
				st := p
				for p < len(text) && isRuleChar(text[p]) {
					p++
				}
				if p == st {
					break
				}
				r.m.Allows = append(r.m.Allows, &Allow{File: path, Line: line, Rule: string(text[st:p]), Span: Span{st, p}})
				q := p
				for q < len(text) && (text[q] == ' ' || text[q] == '\t') {
					q++
				}
				if q >= len(text) || text[q] != ',' {
					break
				}
				p = q + 1
			}
		}
	}
}

func isRuleChar(c byte) bool {
	return c == '-' || c == '_' || (c >= '0' && c <= '9') || (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z')
}

// Closest returns the candidate nearest to s by edit distance, or "" when
// none is close enough to be a likely typo.
func Closest(s string, cands []string) string {
	best, bestD := "", 1<<30
	for _, c := range cands {
		d := editDistance(strings.ToLower(s), strings.ToLower(c))
		if d < bestD || (d == bestD && c < best) {
			best, bestD = c, d
		}
	}
	limit := len(s)/3 + 1
	if limit > 3 {
		limit = 3
	}
	if bestD > limit {
		return ""
	}
	return best
}

func editDistance(a, b string) int {
	ra, rb := []rune(a), []rune(b)
	prev := make([]int, len(rb)+1)
	cur := make([]int, len(rb)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(ra); i++ {
		cur[0] = i
		for j := 1; j <= len(rb); j++ {
			cost := 1
			if ra[i-1] == rb[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
		}
		prev, cur = cur, prev
	}
	return prev[len(rb)]
}

func sqrt(x float64) float64 { return math.Sqrt(x) }
