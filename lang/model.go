package lang

import (
	"iter"

	"circa/units"
)

// The typed model: what a set of .loop files says, in SI, with every value
// remembering where it was written. The checker reads only this.

// Value is a scalar in SI units. Set is false when the file did not give it;
// SI then holds the default, if there is one. Bad is true when the file gave
// it but it could not be resolved (the error is reported where it was
// written): Set is then false and nothing may be computed from it.
//
// Where the value was written is kept in the value itself (File, Span and
// Unit are methods): the offset and length of the expression and one
// pointer to the file and the unit, which the values written in one file
// with one unit share. A value is 24 bytes, written or not: a file writes
// hundreds of thousands of values, and a place of their own would cost
// another 24 bytes and a pointer each.
type Value struct {
	SI    float64
	Set   bool
	Bad   bool
	n     uint16 // the expression's length as written (longSpan: see site.end)
	start int32  // where the expression starts
	at    *site  // nil for a value the file did not write
}

// longSpan is the length of a value's expression that is at least that
// long: its end is kept in a site of its own.
const longSpan = 1<<16 - 1

// site is the file a value or a vector was written in and the unit it was
// written with. No file is longer than MaxFileSize, so int32 offsets do.
type site struct {
	file *string
	unit *string // the unit as written (nil for bare numbers)
	end  int32   // the end of an expression of longSpan bytes or more (else 0)
}

// unitText returns the unit as written ("" for bare numbers).
func (s *site) unitText() string {
	if s.unit == nil {
		return ""
	}
	return *s.unit
}

// spanAt returns the span of the expression at start of length n, as a
// value keeps it with its site s.
func spanAt(start int32, n uint16, s *site) Span {
	if n == longSpan {
		return Span{int(start), int(s.end)}
	}
	return Span{int(start), int(start) + int(n)}
}

// spanLen returns the length a value keeps of span and the end its site
// keeps (0 for a span shorter than longSpan).
func spanLen(span Span) (uint16, int32) {
	if l := span.End - span.Start; l >= 0 && l < longSpan {
		return uint16(l), 0
	}
	return longSpan, int32(span.End)
}

// At returns v written at span of file with the unit text unit ("" for a
// bare number).
func (v Value) At(file string, span Span, unit string) Value {
	v.start, v.n, v.at = placeAt(file, span, unit)
	return v
}

// placeAt returns what a value or vector written at span of file with the
// unit text unit keeps of where it was written.
func placeAt(file string, span Span, unit string) (int32, uint16, *site) {
	st := site{file: &file, unit: &unit}
	n, end := spanLen(span)
	st.end = end
	return int32(span.Start), n, &st
}

// File returns the path of the file the value was written in ("" for a
// default).
func (v Value) File() string {
	if v.at == nil {
		return ""
	}
	return *v.at.file
}

// Span returns the expression as written.
func (v Value) Span() Span {
	if v.at == nil {
		return Span{}
	}
	return spanAt(v.start, v.n, v.at)
}

// Unit returns the unit as written ("" for bare numbers and defaults).
func (v Value) Unit() string {
	if v.at == nil {
		return ""
	}
	return v.at.unitText()
}

// Loc returns where the value was written.
func (v Value) Loc() Location {
	if v.at == nil {
		return Location{}
	}
	return Location{File: *v.at.file, Span: v.Span()}
}

// Vec is a vector in SI units in the equipment frame (x forward, y left, z up).
// Bad is as for Value, and so are File, Span and Unit.
type Vec struct {
	X, Y, Z float64
	Set     bool
	Bad     bool
	n       uint16
	start   int32
	at      *site
}

// At returns v written at span of file with the unit text unit.
func (v Vec) At(file string, span Span, unit string) Vec {
	v.start, v.n, v.at = placeAt(file, span, unit)
	return v
}

// File returns the path of the file the vector was written in.
func (v Vec) File() string {
	if v.at == nil {
		return ""
	}
	return *v.at.file
}

// Span returns the vector as written.
func (v Vec) Span() Span {
	if v.at == nil {
		return Span{}
	}
	return spanAt(v.start, v.n, v.at)
}

// Unit returns the unit written after the parenthesis ("" for none).
func (v Vec) Unit() string {
	if v.at == nil {
		return ""
	}
	return v.at.unitText()
}

// Loc returns where the vector was written.
func (v Vec) Loc() Location {
	if v.at == nil {
		return Location{}
	}
	return Location{File: *v.at.file, Span: v.Span()}
}

// Decl is what every named declaration shares. A file declares about one
// name a statement, so a Decl keeps the one copy of its path and int32
// offsets (File, NameSpan, Span and BlockClose are methods): 48 bytes
// instead of 72.
type Decl struct {
	Name               string
	file               *string
	nameStart, nameEnd int32 // the name
	start, end         int32 // the statement head
	blockClose         int32
}

// File returns the path of the file the declaration was written in.
func (d Decl) File() string {
	if d.file == nil {
		return ""
	}
	return *d.file
}

// NameSpan returns where the name was written.
func (d Decl) NameSpan() Span { return Span{int(d.nameStart), int(d.nameEnd)} }

// Span returns where the statement head was written.
func (d Decl) Span() Span { return Span{int(d.start), int(d.end)} }

// BlockClose returns the offset of the block's '}' (-1 without a closed
// block); fixes insert missing fields before it.
func (d Decl) BlockClose() int { return int(d.blockClose) }

// NameLoc returns where the name was written.
func (d Decl) NameLoc() Location { return Location{File: d.File(), Span: d.NameSpan()} }

// Loc returns where the declaration's head was written.
func (d Decl) Loc() Location { return Location{File: d.File(), Span: d.Span()} }

// Model is the resolved content of one root file and everything it includes.
type Model struct {
	Root    string           // path of the root file
	Files   map[string]*File // every file read, by path
	Order   []string         // paths in the order they were read
	Params  []*Param
	Parts   []*Part
	Loops   []*Loop
	Cases   []*Case
	Nominal *Case // the case marked nominal, else the first case; nil without cases
	Limits  Limits
	Methods Methods
	Allows  []*Allow
	// refs lists the uses of names that the declarations do not imply,
	// in the order read; Refs yields them with the others.
	refs []Ref
	// Diags holds the syntax, unit and name findings, in file order.
	Diags []Diagnostic
	// Overrides lists the parameters given a value for this resolution in
	// place of their files' (With), in the order given.
	Overrides []Overridden
	// readDiags are the findings of reading and parsing, which a variant
	// resolved from the same files (With) repeats.
	readDiags []Diagnostic
	// syntaxDropped is set by DropSyntax: the trees are gone.
	syntaxDropped bool
	// tables holds the profile tables the model read, by path, so that a
	// variant resolves its profiles without reading them again.
	tables map[string]tableRead
}

// Param is a named quantity.
type Param struct {
	Decl
	Value Value
	Expr  *Expr
	// Dim and AbsTemp are the value's dimension and whether it is an
	// absolute temperature, so that a variant can give it another value of
	// the same kind.
	Dim     units.Dim
	AbsTemp bool
}

// Part is a named set of component fields.
type Part struct {
	Decl
	Stmts []*Stmt
}

// FluidSpec names the working fluid: a built-in name or a CSV table.
type FluidSpec struct {
	Name  string // built-in name as written; for tables, the file's base name
	Table string // path of a CSV table, resolved against the including file
	Set   bool
	Bad   bool // written, but not a known fluid (reported by the resolver)
	File  string
	Span  Span
}

// Loc returns where the fluid was named.
func (f FluidSpec) Loc() Location { return Location{File: f.File, Span: f.Span} }

// Loop is one loop (or network) with its own fluid, nodes and components.
type Loop struct {
	Decl
	Fluid          FluidSpec
	Charge         Value
	DesignPressure Value
	Saturation     Value
	Nodes          []*Node
	Components     []*Component
	// Unresolved is true when some of the loop's text could not be resolved
	// (an unknown or duplicate name, a bad value, a statement that did not
	// parse). That error is the finding; rules that need the whole loop skip
	// it rather than report what follows from the error.
	Unresolved bool
}

// Node is a point of a loop.
type Node struct {
	Decl
	Loop     *Loop
	At       Vec // coordinates, when given
	Junction bool
	Index    int // position in Loop.Nodes
}

// Kind is a component's kind. It is a byte so that a Component packs it
// with Unresolved.
type Kind uint8

const (
	Pipe Kind = iota
	Evaporator
	Condenser
	Bend
	Fitting
	Reservoir
)

var kindNames = [...]string{"pipe", "evaporator", "condenser", "bend", "fitting", "reservoir"}

func (k Kind) String() string {
	if int(k) < len(kindNames) {
		return kindNames[k]
	}
	return "component"
}

// Kinds returns every component keyword.
func Kinds() []string { return append([]string(nil), kindNames[:]...) }

// Component joins two nodes (a reservoir hangs off one node).
type Component struct {
	Decl
	Kind Kind
	// Unresolved is true when an end or a field could not be resolved; rules
	// that need the component skip it.
	Unresolved bool
	// where the ends were named (FromSpan, ToSpan)
	fromStart, fromEnd, toStart, toEnd int32
	Loop                               *Loop
	From, To                           *Node // To is nil for a reservoir
	Index                              int   // position in Loop.Components

	Length Value
	Bore   Value
	// The fields most components leave unwritten, those of evaporators
	// and of condensers, and the parts used, are read as the component's
	// own (c.Rise, c.Heat, c.Conductance, c.Uses) through one pointer:
	// a component that writes none of them shares one set, with the
	// defaults, which nothing writes. A pipe of length and bore so keeps
	// 40 bytes less than with a pointer to each set and a list of its own.
	*fields
}

// fields are a component's fields beyond length and bore. Only an
// evaporator has room for the fields of evaporators and only a condenser
// for those of condensers; the extra fields are shared too until one is
// written.
type fields struct {
	*extraFields
	*evaporatorFields
	*condenserFields
	Uses []*Part
}

// FromSpan returns where the inlet node was named.
func (c *Component) FromSpan() Span { return Span{int(c.fromStart), int(c.fromEnd)} }

// ToSpan returns where the outlet node was named.
func (c *Component) ToSpan() Span { return Span{int(c.toStart), int(c.toEnd)} }

// extraFields are the fields a component of any kind may write but most
// leave unset.
type extraFields struct {
	Rise        Value
	Run         Vec
	FlowArea    Value
	HydDiameter Value
	Roughness   Value // default 1.5 µm
	Loss        Value // local loss coefficient K
	// Channels is the number of identical parallel channels the component
	// stands for (default 1): its geometry fields describe one channel, its
	// heat, conductance and the flow through it are the whole component's.
	Channels Value
	Volume   Value // reservoir
}

// evaporatorFields are the fields of an evaporator.
type evaporatorFields struct {
	Heat          Value // evaporator: default load
	HeatedLength  Value
	WettedArea    Value
	HeatFlux      Value
	WallLimit     Value
	BoilRoughness Value // default 1 µm
	// The device's thermal stack above the boiling wall, K/W each, and the
	// junction's limit: T_junction = T_wall + Q·(junction_to_case +
	// interface_resistance + spreading_resistance).
	JunctionToCase Value
	InterfaceRes   Value
	SpreadingRes   Value
	JunctionLimit  Value
}

// condenserFields are the fields of a condenser.
type condenserFields struct {
	Conductance Value // condenser UA
	Sink        Value
	Outlet      Value
	Subcool     Value
	Tubes       Value // parallel condensing tubes of the component's bore and length (default 1)
	CoolantHTC  Value // coolant-side coefficient of a condenser given by geometry
}

// noEvaporator and noCondenser are the unset fields every component of
// another kind shares, noExtra those of every component that writes none,
// and noFields all of them, with no parts. They are never written: the
// resolver sets only the fields of the component's kind, and gives a
// component its own before it writes one.
var (
	noExtra      = extraFields{Roughness: Value{SI: 1.5e-6}}
	noEvaporator = evaporatorFields{BoilRoughness: Value{SI: 1e-6}}
	noCondenser  condenserFields
	noFields     = fields{extraFields: &noExtra, evaporatorFields: &noEvaporator, condenserFields: &noCondenser}
)

// ownFields gives c its own fields before a part or an extra field is
// written.
func (c *Component) ownFields() {
	if c.fields == &noFields {
		f := noFields
		c.fields = &f
	}
}

// ownExtra gives c its own extra fields before one is written.
func (c *Component) ownExtra() {
	c.ownFields()
	if c.extraFields == &noExtra {
		e := noExtra
		c.extraFields = &e
	}
}

// kindFields gives c room for the fields of its kind and the others'
// shared unset ones, with the defaults.
func (c *Component) kindFields() {
	c.fields = &noFields
	switch c.Kind {
	case Evaporator:
		c.fields = &fields{extraFields: &noExtra, evaporatorFields: &evaporatorFields{BoilRoughness: Value{SI: 1e-6}}, condenserFields: &noCondenser}
	case Condenser:
		c.fields = &fields{extraFields: &noExtra, evaporatorFields: &noEvaporator, condenserFields: &condenserFields{}}
	}
}

// anyBad reports whether a field failed to resolve.
func (c *Component) anyBad() bool {
	for _, v := range []*Value{&c.Length, &c.Rise, &c.Bore, &c.FlowArea, &c.HydDiameter, &c.Roughness, &c.Loss,
		&c.Heat, &c.HeatedLength, &c.WettedArea, &c.HeatFlux, &c.WallLimit, &c.BoilRoughness,
		&c.Conductance, &c.Sink, &c.Outlet, &c.Subcool, &c.Volume, &c.Channels,
		&c.JunctionToCase, &c.InterfaceRes, &c.SpreadingRes, &c.JunctionLimit} {
		if v.Bad {
			return true
		}
	}
	return c.Run.Bad
}

// Diameter returns the hydraulic diameter: bore, else hydraulic_diameter,
// else from the flow area of a round tube.
func (c *Component) Diameter() float64 {
	switch {
	case c.Bore.Set:
		return c.Bore.SI
	case c.HydDiameter.Set:
		return c.HydDiameter.SI
	case c.FlowArea.Set && c.FlowArea.SI > 0:
		return sqrt(4 * c.FlowArea.SI / 3.141592653589793)
	}
	return 0
}

// StackResistance returns the device's series thermal resistance from
// junction to boiling wall, K/W, and whether the component gives any of it.
func (c *Component) StackResistance() (float64, bool) {
	var r float64
	set := false
	for _, v := range []Value{c.JunctionToCase, c.InterfaceRes, c.SpreadingRes} {
		if v.Set {
			r += v.SI
			set = true
		}
	}
	return r, set
}

// ChannelCount returns the number of identical parallel channels: the
// channels field when it is a whole number of at least 1, else 1.
func (c *Component) ChannelCount() float64 {
	if n := c.Channels.SI; c.Channels.Set && n >= 1 && n <= MaxChannels && n == float64(int64(n)) {
		return n
	}
	return 1
}

// MaxChannels is the most parallel channels (or tubes) one component may have.
const MaxChannels = 1e6

// Area returns one channel's flow area: flow_area, else from the bore or hydraulic diameter.
func (c *Component) Area() float64 {
	if c.FlowArea.Set {
		return c.FlowArea.SI
	}
	d := c.Diameter()
	return 3.141592653589793 / 4 * d * d
}

// Case is an operating case.
type Case struct {
	Decl
	Nominal bool
	Heat    []CompValue // per evaporator
	Sink    Value       // every condenser's sink
	Sinks   []CompValue // per condenser
	// Conductances replace condensers' conductance UA in this case (a fan
	// off, a vehicle standing or running).
	Conductances []CompValue
	Pitch        Value
	Roll         Value
	Yaw          Value
	Accel        Vec
	Saturation   Value
	// Profile gives the attitude and acceleration against time (nil: held).
	Profile *Profile
	// Envelope bounds a search for the worst attitude and acceleration.
	Envelope *Envelope
	// Unresolved is true when a field could not be resolved; the estimate
	// skips the case.
	Unresolved bool
}

// anyBad reports whether a field failed to resolve.
func (c *Case) anyBad() bool {
	for _, v := range []*Value{&c.Sink, &c.Pitch, &c.Roll, &c.Yaw, &c.Saturation} {
		if v.Bad {
			return true
		}
	}
	for _, cv := range append(append(append([]CompValue(nil), c.Heat...), c.Sinks...), c.Conductances...) {
		if cv.Value.Bad {
			return true
		}
	}
	return c.Accel.Bad
}

// CompValue is a value given in a case for one component.
type CompValue struct {
	Comp     *Component
	NameSpan Span
	File     string
	Value    Value
}

// Limits are the design margin limits, with defaults filled in.
type Limits struct {
	ExitQuality   Value // default 0.5 (common practice)
	CHFRatio      Value // default 2 (common practice)
	Flooding      Value // default 0.7 (common practice)
	TiltMargin    Value // default 5° (common practice)
	WallMargin    Value // default 0 K
	HeadRatio     Value // default 1.5 (common practice)
	SaturationMax Value // no default
}

// DefaultLimits returns the documented defaults.
func DefaultLimits() Limits {
	return Limits{
		ExitQuality: Value{SI: 0.5},
		CHFRatio:    Value{SI: 2},
		Flooding:    Value{SI: 0.7},
		TiltMargin:  Value{SI: 5 * 3.141592653589793 / 180},
		WallMargin:  Value{SI: 0},
		HeadRatio:   Value{SI: 1.5},
	}
}

// Methods are the correlation choices for the estimates.
type Methods struct {
	Void        Choice
	Friction    Choice
	SinglePhase Choice
	CHF         Choice
	SatState    Choice // "auto", "single" or "local"
	// Condensation is the in-tube coefficient of condensers given by
	// geometry: "film" (Nusselt, Chato), or a forced-convection correlation:
	// "shah" (Shah 1979), "boyko_kruzhilin", "akers_deans_crosser" or
	// "cavallini_smith_zecchin".
	Condensation Choice
	Cells        int
	CellsSet     bool
}

// Choice is a method name as written (underscores, e.g. "rouhani_axelsson").
type Choice struct {
	Name string
	Set  bool
	File string
	Span Span
}

// MethodChoices lists the accepted names of each method field, default first.
var MethodChoices = map[string][]string{
	"void_fraction":    {"rouhani_axelsson", "homogeneous", "zivi", "chisholm", "rouhani_axelsson_vertical", "rouhani_axelsson_horizontal"},
	"friction":         {"muller_steinhagen_heck", "friedel", "lockhart_martinelli", "homogeneous_mcadams", "homogeneous_cicchitti", "homogeneous_dukler"},
	"single_phase":     {"churchill", "colebrook"},
	"chf":              {"lienhard_dhir", "zuber", "katto_ohno"},
	"saturation_state": {"auto", "single", "local"},
	"condensation":     {"film", "shah", "boyko_kruzhilin", "akers_deans_crosser", "cavallini_smith_zecchin"},
}

// DefaultMethods returns the documented defaults.
func DefaultMethods() Methods {
	return Methods{
		Void:         Choice{Name: "rouhani_axelsson"},
		Friction:     Choice{Name: "muller_steinhagen_heck"},
		SinglePhase:  Choice{Name: "churchill"},
		CHF:          Choice{Name: "lienhard_dhir"},
		SatState:     Choice{Name: "auto"},
		Condensation: Choice{Name: "film"},
		Cells:        40,
	}
}

// Allow is a "# allow: RULE" silencer on one line.
type Allow struct {
	File string
	Line int // zero-based
	Rule string
	Span Span // the rule name in the comment
	Used bool
}

// RefKind says what a reference names. It is a byte so that a Ref, of
// which a file has about one a statement, packs it with IsDecl.
type RefKind uint8

const (
	RefParam RefKind = iota
	RefNode
	RefComponent
	RefCase
	RefPart
	RefFluid
)

// Ref is one use or declaration of a name. A file has about one a
// statement, so it keeps its place in 16 bytes (File and Span are
// methods): the one copy of the path and the offsets of the name.
type Ref struct {
	Name       string
	Loop       *Loop // for nodes
	file       *string
	start, end int32
	Kind       RefKind
	IsDecl     bool
}

// File returns the path of the file the reference was written in.
func (r Ref) File() string {
	if r.file == nil {
		return ""
	}
	return *r.file
}

// Span returns the name as written.
func (r Ref) Span() Span { return Span{int(r.start), int(r.end)} }

// Loc returns where the reference was written.
func (r Ref) Loc() Location { return Location{File: r.File(), Span: r.Span()} }

// Refs yields every place a name is declared or used, for navigation and
// rename. The declarations of parameters, parts, nodes, components and
// cases and the nodes each component joins come from the model itself,
// which holds them anyway: a large loop, four names a node and pipe, so
// keeps no second copy of each. They come first, by kind in model order,
// then the other uses in the order they were read (a name in a part used
// by several components is read, and yielded, once for each).
func (m *Model) Refs() iter.Seq[Ref] {
	return func(yield func(Ref) bool) {
		for _, p := range m.Params {
			if !yield(p.Decl.ref(RefParam, nil)) {
				return
			}
		}
		for _, p := range m.Parts {
			if !yield(p.Decl.ref(RefPart, nil)) {
				return
			}
		}
		for _, l := range m.Loops {
			for _, n := range l.Nodes {
				if !yield(n.Decl.ref(RefNode, l)) {
					return
				}
			}
			for _, c := range l.Components {
				if c.From != nil && !yield(c.endRef(c.From, c.fromStart, c.fromEnd)) {
					return
				}
				if c.To != nil && !yield(c.endRef(c.To, c.toStart, c.toEnd)) {
					return
				}
				if !yield(c.Decl.ref(RefComponent, l)) {
					return
				}
			}
		}
		for _, c := range m.Cases {
			if !yield(c.Decl.ref(RefCase, nil)) {
				return
			}
		}
		for _, r := range m.refs {
			if !yield(r) {
				return
			}
		}
	}
}

// ref is the reference of the declaration d.
func (d *Decl) ref(kind RefKind, loop *Loop) Ref {
	return Ref{Kind: kind, Name: d.Name, Loop: loop, file: d.file, start: d.nameStart, end: d.nameEnd, IsDecl: true}
}

// endRef is the use of the node n that c names as an end at start:end.
func (c *Component) endRef(n *Node, start, end int32) Ref {
	return Ref{Kind: RefNode, Name: n.Name, Loop: c.Loop, file: c.file, start: start, end: end}
}

// Component returns the named component in any loop, or nil.
func (m *Model) Component(name string) *Component {
	for _, l := range m.Loops {
		for _, c := range l.Components {
			if c.Name == name {
				return c
			}
		}
	}
	return nil
}

// Case returns the named case, or nil.
func (m *Model) Case(name string) *Case {
	for _, c := range m.Cases {
		if c.Name == name {
			return c
		}
	}
	return nil
}

// Silenced reports whether an allow comment silences rule at loc, marking
// the silencer used.
func (m *Model) Silenced(rule string, loc Location) bool {
	f := m.Files[loc.File]
	if f == nil {
		return false
	}
	line := f.Mapper.OffsetLine(loc.Span.Start)
	hit := false
	for _, a := range m.Allows {
		if a.File == loc.File && a.Line == line && a.Rule == rule {
			a.Used = true
			hit = true
		}
	}
	return hit
}
