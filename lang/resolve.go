// Resolving turns parsed files into a Model in passes, one file each:
// reading the root and its includes (include.go), declaring every named
// thing (declare.go), filling fields now that all names are known
// (fields.go), evaluating expressions with their units (eval.go), and
// collecting "# allow:" silencers (allow.go).

package lang

import (
	"errors"
	"math"
	"slices"
	"strings"

	"circa/units"
)

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

// LoadSourceModel is LoadSource followed by DropSyntax, for a caller that
// needs only the model, the texts and their silencers (circa check): the
// files keep of each statement only its head while they are resolved, and
// the resolver parses a statement's parts again when it reads them, so a
// large file's whole tree, several times the size of its model, never
// exists at once. The model is the one LoadSource and DropSyntax give.
func LoadSourceModel(root string, src []byte, fsys FS) *Model {
	if fsys == nil {
		fsys = OSFS{}
	}
	m := newModel(root)
	r := newResolver(m, fsys)
	r.heads = true
	r.read(root, src, nil, Location{})
	m.readDiags = slices.Clone(m.Diags)
	r.resolve()
	m.DropSyntax()
	return m
}

// LoadParsed resolves the parsed file f as the root (an editor buffer
// parsed by Reparse); includes are read through fsys. The model holds f
// itself, which it does not change.
func LoadParsed(f *File, fsys FS) *Model {
	if fsys == nil {
		fsys = OSFS{}
	}
	if len(f.Src) > MaxFileSize {
		return LoadSource(f.Path, f.Src, fsys)
	}
	m := newModel(f.Path)
	r := newResolver(m, fsys)
	r.readParsed(f, nil)
	m.readDiags = slices.Clone(m.Diags) // for resolving variants (With)
	r.resolve()
	return m
}

func newModel(root string) *Model {
	return &Model{Root: root, Files: map[string]*File{}, Limits: DefaultLimits(), Methods: DefaultMethods()}
}

func newResolver(m *Model, fsys FS) *resolver {
	return &resolver{m: m, fs: fsys, params: map[string]*paramState{}, parts: map[string]*Part{},
		comps: map[string]*Component{}, cases: map[string]*Case{}, loops: map[string]*Loop{}}
}

func resolveRoot(m *Model, root string, src []byte, fsys FS) *Model {
	r := newResolver(m, fsys)
	r.read(root, src, nil, Location{})
	m.readDiags = slices.Clone(m.Diags) // for resolving variants (With)
	r.resolve()
	return m
}

// resolve declares, fills and evaluates what the files read say.
func (r *resolver) resolve() {
	m := r.m
	// The declarations are the model's own (Refs): only the uses the
	// declarations do not imply are recorded, as they are found.
	params := 0
	for _, f := range m.Files {
		for _, s := range f.Stmts {
			if !s.Bad && s.Keyword() == "param" {
				params++
			}
		}
	}
	if params > 0 {
		r.params = make(map[string]*paramState, params)
		m.Params = make([]*Param, 0, params)
		// The parameters and their states are allocated a chunk at a
		// time as they are declared, not all at once before: the heads
		// of a file read for its model alone go as they are declared,
		// and the chunks take their place instead of adding to them.
	}
	r.declare()
	if r.heads {
		// Filling reads what declaring kept (loops, cases, parts, the
		// offsets of parameters), not the files' statements: the heads of
		// the top level go now. The files are the resolver's own.
		for _, f := range m.Files {
			f.Stmts = nil
		}
	}
	r.fill()
	r.allows()
	m.Diags = dedupe(m.Diags)
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

// paramState is a parameter's evaluation state. Its value, once
// evaluated, is the parameter's own (Value, Dim and AbsTemp): a file of
// parameters keeps 16 bytes a parameter here.
type paramState struct {
	p *Param
	// off is where the statement starts when head is set: the parameter
	// keeps no expression, which is parsed again from there. A file is
	// at most MaxFileSize bytes.
	off   int32
	head  bool
	state int8 // 0 unevaluated, 1 evaluating, 2 done
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
	compStmts map[*Loop][]*Stmt // by component index
	nodeAt    map[*Loop][]*Stmt // by node index: statements with coordinates, evaluated when filling
	// compHeads and nodeOffs take the place of compStmts and nodeAt for
	// a file read for its model alone (heads): what filling needs of
	// each statement, which is parsed again from its offset (-1 for a
	// node without coordinates).
	compHeads map[*Loop][]compHead
	nodeOffs  map[*Loop][]int32
	// headStmt and headBlock hold the component head being filled.
	headStmt  Stmt
	headBlock Block
	caseStmts map[*Case]*Stmt
	limStmts  []fileStmt
	methStmts []fileStmt
	// unitHint is the dimension the quantity being evaluated must have,
	// when it is a lone quantity (hinted).
	unitHint units.Need
	hinted   bool
	// paramSlab holds the declared parameters, stateSlab their evaluation
	// state.
	paramSlab slab[Param]
	stateSlab slab[paramState]
	// compBuf holds the components, a chunk at a time.
	compBuf slab[Component]
	// overrides replace parameters' values (With); overrideErr is the
	// first that could not be applied.
	overrides   map[string]*Overridden
	overrideErr *OverrideError
	// sites holds the one site of each file and unit the values were
	// written with; paths holds the one copy of each file's path.
	sites    map[site]*site
	lastSite *site
	paths    map[string]*string
	lastPath *string
	// units holds the one copy of each unit text the sites point to.
	units    map[string]*string
	lastUnit *string
	// heads is set when the files are read keeping only the heads of
	// their statements (LoadSourceModel); hp parses their parts again.
	heads bool
	hp    *headParser
}

// atV returns v written at span of file with the unit text unit, its
// site the resolver's one of that file and unit.
func (r *resolver) atV(v Value, file string, span Span, unit string) Value {
	var end int32
	v.n, end = spanLen(span)
	v.start, v.at = int32(span.Start), r.siteOf(file, unit, end)
	return v
}

// atVec is atV for a vector.
func (r *resolver) atVec(v Vec, file string, span Span, unit string) Vec {
	var end int32
	v.n, end = spanLen(span)
	v.start, v.at = int32(span.Start), r.siteOf(file, unit, end)
	return v
}

// siteOf returns the resolver's one site of file, the unit text unit and
// the end of a long expression (0 for another).
func (r *resolver) siteOf(file, unit string, end int32) *site {
	k := site{file: r.path(file), unit: r.unitOf(unit), end: end}
	if r.lastSite != nil && *r.lastSite == k {
		return r.lastSite // most values follow one of the same file and unit
	}
	p, ok := r.sites[k]
	if !ok {
		if r.sites == nil {
			r.sites = map[site]*site{}
		}
		p = new(site)
		*p = k
		r.sites[k] = p
	}
	r.lastSite = p
	return p
}

// unitOf returns the resolver's one copy of the unit text u, nil for "".
// The copy is the text as first written: it keeps no more of the source
// than the values already do.
func (r *resolver) unitOf(u string) *string {
	if u == "" {
		return nil
	}
	if r.lastUnit != nil && *r.lastUnit == u {
		return r.lastUnit
	}
	p, ok := r.units[u]
	if !ok {
		if r.units == nil {
			r.units = map[string]*string{}
		}
		p = new(string)
		*p = u
		r.units[u] = p
	}
	r.lastUnit = p
	return p
}

// path returns the resolver's one copy of the path file.
func (r *resolver) path(file string) *string {
	if r.lastPath != nil && *r.lastPath == file {
		return r.lastPath // most values follow one of the same file
	}
	if p, ok := r.paths[file]; ok {
		r.lastPath = p
		return p
	}
	if r.paths == nil {
		r.paths = map[string]*string{}
	}
	p := new(string) // not &file, which would move every caller's file to the heap
	*p = file
	r.paths[file] = p
	r.lastPath = p
	return p
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

func src(f *File, s Span) string {
	if f == nil || s.Start < 0 || s.End > len(f.Src) || s.Start > s.End {
		return ""
	}
	return string(f.Src[s.Start:s.End])
}

// Closest returns the candidate nearest to s by edit distance, or "" when
// none is close enough to be a likely typo.
func Closest(s string, cands []string) string {
	limit := len(s)/3 + 1
	if limit > 3 {
		limit = 3
	}
	// Only a candidate within the limit can be the answer, and one whose
	// length differs by more is not: a file of many names is searched
	// without computing most distances, into one table.
	rs := []rune(strings.ToLower(s))
	var rc []rune
	var table []int
	best, bestD := "", 1<<30
	for _, c := range cands {
		rc = rc[:0]
		for _, r := range strings.ToLower(c) {
			rc = append(rc, r)
		}
		if len(rc) > len(rs)+limit || len(rc) < len(rs)-limit {
			continue
		}
		var d int
		d, table = runeDistance(rs, rc, table)
		if d < bestD || (d == bestD && c < best) {
			best, bestD = c, d
		}
	}
	if bestD > limit {
		return ""
	}
	return best
}

// editDistance is the optimal-string-alignment distance: insertions,
// deletions, substitutions and swaps of two neighbours each count one, so
// a transposed pair of letters ("ez" for "ze") is one slip.
func editDistance(a, b string) int {
	d, _ := runeDistance([]rune(a), []rune(b), nil)
	return d
}

// runeDistance is editDistance over runes, its table taken from buf when
// it is large enough; it returns the table for the next call.
func runeDistance(ra, rb []rune, buf []int) (int, []int) {
	w := len(rb) + 1
	n := (len(ra) + 1) * w
	if cap(buf) < n {
		buf = make([]int, n)
	}
	d := buf[:n]
	for i := 0; i <= len(ra); i++ {
		d[i*w] = i
	}
	for j := 0; j < w; j++ {
		d[j] = j
	}
	for i := 1; i <= len(ra); i++ {
		for j := 1; j <= len(rb); j++ {
			cost := 1
			if ra[i-1] == rb[j-1] {
				cost = 0
			}
			v := min(d[(i-1)*w+j]+1, d[i*w+j-1]+1, d[(i-1)*w+j-1]+cost)
			if i > 1 && j > 1 && ra[i-1] == rb[j-2] && ra[i-2] == rb[j-1] {
				v = min(v, d[(i-2)*w+j-2]+1)
			}
			d[i*w+j] = v
		}
	}
	return d[len(ra)*w+len(rb)], buf
}

func sqrt(x float64) float64 { return math.Sqrt(x) }
