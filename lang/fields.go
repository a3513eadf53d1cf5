// Filling: the second pass reads every field of loops, components, cases,
// limits and methods now that all names are known.

package lang

import (
	"fmt"
	"math"
	"path/filepath"
	"strconv"
	"strings"

	"circa/check/fluid"

	"circa/units"
)

// fill evaluates every field now that all names are known.
func (r *resolver) fill() {
	for _, l := range r.m.Loops {
		nodeAt, nodeOffs := r.nodeAt[l], r.nodeOffs[l]
		for _, n := range l.Nodes {
			if r.heads {
				if off := nodeOffs[n.Index]; off >= 0 {
					m := r.mark()
					h := r.parser()
					if s, ok := h.parseAt(r.m.Files[n.File()], int(off), &h.tmp); ok && len(s.Args) == 3 {
						n.At = r.vector(n.File(), s.Args[2].Expr, needLength)
					}
					r.release(m)
				}
			} else if st := nodeAt[n.Index]; st != nil {
				m := r.mark()
				n.At = r.vector(n.File(), r.full(n.File(), st).Args[2].Expr, needLength)
				r.release(m)
			}
			if n.At.Bad {
				l.Unresolved = true
			}
		}
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
				r.errorf("syntax", l.File(), s.Word.Span(), "parameters are declared at the top level, outside loops")
				continue
			}
			if k, ok := kindOf(kw); ok {
				_ = k
				continue
			}
			m := r.mark()
			r.loopField(l, r.fullTree(l.File(), s))
			r.release(m)
		}
		if l.Charge.Bad || l.DesignPressure.Bad || l.Saturation.Bad {
			l.Unresolved = true
		}
		if !l.Fluid.Set && (st.Block == nil || st.Block.Close >= 0) {
			r.errorf("missing-field", l.File(), l.NameSpan(), "loop %s names no working fluid: add \"fluid NAME\"", l.Name)
		}
	}
	for _, l := range r.m.Loops {
		stmts, heads := r.compStmts[l], r.compHeads[l]
		for _, c := range l.Components {
			if r.heads {
				r.componentFields(c, heads[c.Index].stmt(&r.headStmt, &r.headBlock))
				heads[c.Index] = compHead{} // read once (see declareLoop)
			} else {
				r.componentFields(c, stmts[c.Index])
			}
			if c.Unresolved || c.anyBad() {
				c.Unresolved = true
				l.Unresolved = true
			}
		}
	}
	for _, c := range r.m.Cases {
		st := r.caseStmts[c]
		if st.Block == nil {
			continue
		}
		for _, s := range st.Block.Stmts {
			if s.Bad {
				c.Unresolved = true
				continue
			}
			r.caseField(c, s)
		}
		if c.anyBad() {
			c.Unresolved = true
		}
		finishProfile(c)
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
	needHTC      = units.Need{Dim: units.HeatTransferCoefficient}
	needAngle    = units.Need{Dim: units.Angle}
	needAccel    = units.Need{Dim: units.Acceleration}
	needRth      = units.Need{Dim: units.ThermalResistance}
)

// FieldNeeds maps each field to the dimension it needs, for completion.
var FieldNeeds = map[string]units.Need{
	"charge": needMass, "design_pressure": needPressure, "saturation": needTemp,
	"length": needLength, "rise": needLength, "run": needLength, "bore": needLength, "flow_area": needArea,
	"hydraulic_diameter": needLength, "roughness": needLength, "loss": needNumber,
	"heat": needPower, "heated_length": needLength, "wetted_area": needArea, "heat_flux": needFlux,
	"wall_limit": needTemp, "roughness_boiling": needLength, "conductance": needUA, "sink": needTemp,
	"outlet": needTemp, "subcool": needTempDiff, "volume": needVolume,
	"tubes": needNumber, "coolant_htc": needHTC, "channels": needNumber,
	"junction_to_case": needRth, "interface_resistance": needRth, "spreading_resistance": needRth, "junction_limit": needTemp,
	"pitch": needAngle, "roll": needAngle, "yaw": needAngle, "accel": needAccel,
	"exit_quality": needNumber, "chf_ratio": needNumber, "flooding": needNumber, "tilt_margin": needAngle,
	"wall_margin": needTempDiff, "head_ratio": needNumber, "saturation_max": needTemp,
}

// Field lists per scope, for messages and completion.
var (
	LoopFields      = []string{"fluid", "charge", "design_pressure", "saturation"}
	ComponentFields = map[Kind][]string{
		Pipe:       {"use", "length", "rise", "run", "bore", "flow_area", "hydraulic_diameter", "roughness", "loss", "channels"},
		Bend:       {"use", "length", "rise", "run", "bore", "flow_area", "hydraulic_diameter", "roughness", "loss", "channels"},
		Fitting:    {"use", "length", "rise", "run", "bore", "flow_area", "hydraulic_diameter", "roughness", "loss", "channels"},
		Evaporator: {"use", "length", "rise", "run", "bore", "flow_area", "hydraulic_diameter", "roughness", "loss", "channels", "heat", "heated_length", "wetted_area", "heat_flux", "wall_limit", "roughness_boiling", "junction_to_case", "interface_resistance", "spreading_resistance", "junction_limit"},
		Condenser:  {"use", "length", "rise", "run", "bore", "flow_area", "hydraulic_diameter", "roughness", "loss", "channels", "conductance", "sink", "outlet", "subcool", "tubes", "coolant_htc"},
		Reservoir:  {"use", "volume", "rise", "length", "bore"},
	}
	CaseFields   = []string{"heat", "sink", "conductance", "pitch", "roll", "yaw", "accel", "saturation", "profile", "envelope"}
	LimitFields  = []string{"exit_quality", "chf_ratio", "flooding", "tilt_margin", "wall_margin", "head_ratio", "saturation_max"}
	MethodFields = []string{"void_fraction", "friction", "single_phase", "chf", "saturation_state", "condensation", "cells"}
)

func (r *resolver) loopField(l *Loop, s *Stmt) {
	file := l.File()
	switch s.Keyword() {
	case "fluid":
		r.fluidField(l, s)
	case "charge":
		l.Charge = r.inRange("charge", file, r.qty(file, s, needMass))
	case "design_pressure":
		l.DesignPressure = r.inRange("design_pressure", file, r.qty(file, s, needPressure))
	case "saturation":
		l.Saturation = r.inRange("saturation", file, r.qty(file, s, needTemp))
	default:
		r.unknownWord(file, s, append(append([]string(nil), loopKeywords...), "param"), "in a loop")
		// It may be a misspelt component, whose absence the whole-loop
		// rules would report.
		l.Unresolved = true
	}
	r.noBlock(file, s)
}

func (r *resolver) noBlock(file string, s *Stmt) {
	if s.Block != nil {
		r.errorf("syntax", file, Span{s.Block.Open, s.Block.Open + 1}, "%s takes no block", s.Keyword())
	}
}

func (r *resolver) fluidField(l *Loop, s *Stmt) {
	file := l.File()
	if len(s.Args) == 1 {
		if id := nameOf(s.Args[0].Expr); id != nil {
			l.Fluid = FluidSpec{Name: id.Name, Set: true, File: file, Span: id.Span()}
			r.ref(RefFluid, id.Name, l, file, id.Span(), false)
			r.knownFluid(l)
			return
		}
		if a := singleAtom(s.Args[0].Expr); a != nil && a.Str != nil {
			// fluid "R134a" is accepted as a name too.
			l.Fluid = FluidSpec{Name: a.Str.Value(), Set: true, File: file, Span: a.Str.Span()}
			r.knownFluid(l)
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

// knownFluid reports a fluid name that is not built in, with the nearest
// spelling that is.
func (r *resolver) knownFluid(l *Loop) {
	if fluid.Known(l.Fluid.Name) {
		return
	}
	l.Fluid.Bad = true
	var idents []string // spellings that can be written without quotes
	for _, sp := range fluid.Spellings() {
		if IsIdent(sp) {
			idents = append(idents, sp)
		}
	}
	d := r.errorf("unknown-name", l.Fluid.File, l.Fluid.Span, "unknown fluid %q; built-in fluids: %s", l.Fluid.Name, strings.Join(fluid.Names(), ", "))
	if best := Closest(l.Fluid.Name, idents); best != "" {
		d.Format = "unknown fluid %q; did you mean %s? (built-in fluids: %s)"
		d.Args = []any{l.Fluid.Name, best, strings.Join(fluid.Names(), ", ")}
		d.Fixes = append(d.Fixes, Fix{Title: fmt.Sprintf("Change to %s", best), Edits: []Edit{{Loc: l.Fluid.Loc(), NewText: best}}})
	}
}

func (r *resolver) componentFields(c *Component, st *Stmt) {
	if st.Block == nil {
		return
	}
	// Parts first, then the component's own fields, which win.
	defer r.release(r.mark())
	st = r.full(c.File(), st)
	var own []*Stmt
	for _, s := range st.Block.Stmts {
		if s.Bad {
			c.Unresolved = true
			continue
		}
		s = r.fullTree(c.File(), s)
		if s.Keyword() == "use" {
			id := (*Ident)(nil)
			if len(s.Args) == 1 {
				id = nameOf(s.Args[0].Expr)
			}
			if id == nil {
				r.errorf("syntax", c.File(), s.Span(), "use needs a part name: use PART")
				c.Unresolved = true
				continue
			}
			p, ok := r.parts[id.Name]
			if !ok {
				cands := make([]string, 0, len(r.parts))
				for n := range r.parts {
					cands = append(cands, n)
				}
				r.unknownName(c.File(), id, "part", cands, "")
				c.Unresolved = true
				continue
			}
			r.ref(RefPart, id.Name, nil, c.File(), id.Span(), false)
			c.ownFields()
			c.Uses = append(c.Uses, p)
			for _, ps := range p.Stmts {
				if ps.Bad {
					c.Unresolved = true
					continue
				}
				r.componentField(c, p.File(), ps)
			}
			continue
		}
		own = append(own, s)
	}
	for _, s := range own {
		r.componentField(c, c.File(), s)
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
		{"rise", "run", c.Rise.Set, c.Run.Set, c.Run.Span(), c.Run.File()},
		{"bore", "flow_area", c.Bore.Set, c.FlowArea.Set, c.FlowArea.Span(), c.FlowArea.File()},
		{"bore", "hydraulic_diameter", c.Bore.Set, c.HydDiameter.Set, c.HydDiameter.Span(), c.HydDiameter.File()},
		{"wetted_area", "heat_flux", c.WettedArea.Set, c.HeatFlux.Set, c.HeatFlux.Span(), c.HeatFlux.File()},
		{"conductance", "outlet", c.Conductance.Set, c.Outlet.Set, c.Outlet.Span(), c.Outlet.File()},
		{"conductance", "coolant_htc", c.Conductance.Set, c.CoolantHTC.Set, c.CoolantHTC.Span(), c.CoolantHTC.File()},
		{"conductance", "tubes", c.Conductance.Set, c.Tubes.Set, c.Tubes.Span(), c.Tubes.File()},
		{"channels", "tubes", c.Channels.Set, c.Tubes.Set, c.Tubes.Span(), c.Tubes.File()},
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
		c.ownExtra()
		dst = &c.Rise
	case "run":
		c.ownExtra()
		c.Run = r.vectorField(file, s, needLength)
		return
	case "bore":
		dst = &c.Bore
	case "flow_area":
		c.ownExtra()
		dst = &c.FlowArea
	case "hydraulic_diameter":
		c.ownExtra()
		dst = &c.HydDiameter
	case "roughness":
		c.ownExtra()
		dst = &c.Roughness
	case "loss":
		c.ownExtra()
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
	case "tubes":
		dst = &c.Tubes
	case "channels":
		c.ownExtra()
		dst = &c.Channels
	case "junction_to_case":
		dst = &c.JunctionToCase
	case "interface_resistance":
		dst = &c.InterfaceRes
	case "spreading_resistance":
		dst = &c.SpreadingRes
	case "junction_limit":
		dst = &c.JunctionLimit
	case "coolant_htc":
		dst = &c.CoolantHTC
	case "volume":
		c.ownExtra()
		dst = &c.Volume
	}
	if dst == nil {
		return
	}
	v := r.qty(file, s, FieldNeeds[kw])
	if (kw == "tubes" || kw == "channels") && v.Set && !(v.SI >= 1 && v.SI <= MaxChannels && v.SI == math.Floor(v.SI)) {
		if v.SI > MaxChannels {
			r.errorf("bad-value", file, v.Span(), "%s must be at most %s, not %s", kw, strconv.FormatFloat(MaxChannels, 'f', -1, 64), strconv.FormatFloat(v.SI, 'g', -1, 64))
		} else {
			r.errorf("bad-value", file, v.Span(), "%s must be a whole number of at least 1, not %s", kw, strconv.FormatFloat(v.SI, 'g', -1, 64))
		}
		v.Set = false
		// A wrong channel count would scale every flow; nothing is computed from it.
		v.Bad = kw == "channels"
	}
	v = r.inRange(kw, file, v)
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
	file := c.File()
	switch kw := s.Keyword(); kw {
	case "profile":
		r.caseProfile(c, s)
		return
	case "envelope":
		r.caseEnvelope(c, s)
		return
	}
	r.noBlock(file, s)
	switch kw := s.Keyword(); kw {
	case "conductance":
		r.caseConductance(c, s)
	case "heat", "sink":
		need := FieldNeeds[kw]
		if kw == "sink" && len(s.Args) == 1 {
			c.Sink = r.inRange(kw, file, r.qty(file, s, need))
			return
		}
		if len(s.Args) != 2 || nameOf(s.Args[0].Expr) == nil || s.Args[1].Expr == nil {
			if kw == "heat" {
				r.shapeError(file, s, "heat in a case names its evaporator: heat EVAPORATOR 2 kW")
			} else {
				r.shapeError(file, s, "sink in a case is: sink 35 degC, or sink CONDENSER 35 degC")
			}
			c.Unresolved = true
			return
		}
		id := nameOf(s.Args[0].Expr)
		want := Evaporator
		if kw == "sink" {
			want = Condenser
		}
		comp := r.caseComponent(c, file, id, want)
		if comp == nil {
			return
		}
		v := r.inRange(kw, file, r.expr(file, s.Args[1].Expr, need))
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
		c.Pitch = r.inRange(kw, file, r.qty(file, s, needAngle))
	case "roll":
		c.Roll = r.inRange(kw, file, r.qty(file, s, needAngle))
	case "yaw":
		c.Yaw = r.inRange(kw, file, r.qty(file, s, needAngle))
	case "accel":
		c.Accel = r.vectorField(file, s, needAccel)
	case "saturation":
		c.Saturation = r.inRange(kw, file, r.qty(file, s, needTemp))
	default:
		r.unknownWord(file, s, CaseFields, "in a case")
	}
}

// caseConductance reads "conductance CONDENSER UA": the condenser's
// conductance in this case only.
func (r *resolver) caseConductance(c *Case, s *Stmt) {
	file := c.File()
	var id *Ident
	if len(s.Args) == 2 && s.Args[1].Expr != nil {
		id = nameOf(s.Args[0].Expr)
	}
	if id == nil {
		r.shapeError(file, s, "conductance in a case names its condenser: conductance CONDENSER 40 W/K")
		c.Unresolved = true
		return
	}
	comp := r.caseComponent(c, file, id, Condenser)
	if comp == nil {
		return
	}
	v := r.expr(file, s.Args[1].Expr, needUA)
	if v.Set && !(v.SI >= 0) {
		r.errorf("bad-value", file, v.Span(), "a conductance must be zero or more, not %s W/K", strconv.FormatFloat(v.SI, 'g', 6, 64))
		v.Set, v.Bad = false, true
	}
	if comp.Outlet.Set {
		d := r.errorf("conflicting-fields", file, id.Span(), "condenser %s has a fixed outlet temperature, so a conductance in case %s would not be used", id.Name, c.Name)
		d.Related = append(d.Related, Related{Loc: comp.Outlet.Loc(), Message: "outlet given here"})
		c.Unresolved = true
		return
	}
	for _, prev := range c.Conductances {
		if prev.Comp == comp {
			d := r.errorf("duplicate-name", file, id.Span(), "the conductance of %s is given twice in case %s", id.Name, c.Name)
			d.Related = append(d.Related, Related{Loc: Location{File: prev.File, Span: prev.NameSpan}, Message: "first given here"})
			return
		}
	}
	c.Conductances = append(c.Conductances, CompValue{Comp: comp, NameSpan: id.Span(), File: file, Value: v})
}

// caseComponent resolves the component a case statement names, which must
// be of kind want. An unknown name or a component of another kind is
// reported, with the components of that kind as suggestions, and marks the
// case unresolved: it returns nil then.
func (r *resolver) caseComponent(c *Case, file string, id *Ident, want Kind) *Component {
	comp, ok := r.comps[id.Name]
	if !ok {
		var cands []string
		for n, cc := range r.comps {
			if cc.Kind == want {
				cands = append(cands, n)
			}
		}
		r.unknownName(file, id, want.String(), cands, "")
		c.Unresolved = true
		return nil
	}
	r.ref(RefComponent, id.Name, comp.Loop, file, id.Span(), false)
	if comp.Kind != want {
		r.errorf("wrong-kind", file, id.Span(), "%s is a %s, not a %s", id.Name, comp.Kind, want)
		c.Unresolved = true
		return nil
	}
	return comp
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
	v := r.inRange(s.Keyword(), file, r.qty(file, s, FieldNeeds[s.Keyword()]))
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
			r.errorf("bad-value", file, v.Span(), "cells must be a whole number from 4 to 10000, not %s", strconv.FormatFloat(n, 'g', -1, 64))
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
	case "saturation_state":
		m.SatState = ch
	case "condensation":
		m.Condensation = ch
	}
}
