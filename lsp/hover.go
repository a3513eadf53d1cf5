package lsp

import (
	"context"
	"fmt"
	"math"
	"strconv"
	"strings"

	"go.lsp.dev/protocol"

	"circa/check/fluid"
	"circa/lang"
	"circa/units"
)

// cursor is a position resolved in a snapshot: the file, the byte offset
// and the analysis whose model holds the file.
type cursor struct {
	snap *snapshot
	path string
	off  int
	a    *analysis
	m    *lang.Model
	f    *lang.File
	// ctx is the request's, for what a hover computes on demand (nil:
	// nothing is).
	ctx context.Context
}

func (c *cursor) snapServer() *Server { return c.snap.srv }

func (sn *snapshot) cursorAt(u protocol.TextDocumentPositionParams) (*cursor, bool) {
	path := pathOf(u.TextDocument.URI)
	a := sn.analysisFor(path)
	if a == nil {
		return nil, false
	}
	m := a.Model()
	f := m.Files[path]
	if f == nil {
		return nil, false
	}
	off, ok := sn.offsetIn(path, u.Position)
	if !ok {
		return nil, false
	}
	return &cursor{snap: sn, path: path, off: off, a: a, m: m, f: f}, true
}

// refAt returns the name reference under the cursor.
func (c *cursor) refAt() (lang.Ref, bool) {
	for r := range c.m.Refs() {
		if r.File() == c.path && contains(r.Span(), c.off) {
			return r, true
		}
	}
	return lang.Ref{}, false
}

func hoverRequest(ctx context.Context, s *Server, sn *snapshot, params []byte) (any, error) {
	p, err := decode[protocol.HoverParams](params)
	if err != nil {
		return nil, err
	}
	path := pathOf(p.TextDocument.URI)
	var text string
	var sp lang.Span
	var ok bool
	if isTable(path) {
		if text, sp, ok = s.tableRowHover(sn, path, p.Position); !ok {
			return nil, nil
		}
	} else {
		var c *cursor
		if c, ok = sn.cursorAt(p.TextDocumentPositionParams); !ok {
			return nil, nil
		}
		c.ctx = ctx
		if text, sp, ok = s.hoverText(c); !ok {
			return nil, nil
		}
	}
	r := sn.rangeIn(path, sp, true)
	kind := protocol.MarkupKindMarkdown
	if s.caps.hoverPlain {
		kind = protocol.MarkupKindPlainText
	}
	return &protocol.Hover{Contents: &protocol.MarkupContent{Kind: kind, Value: shapeHover(text, s.caps.hoverPlain)}, Range: &r}, nil
}

func (s *Server) hoverText(c *cursor) (string, lang.Span, bool) {
	for _, al := range c.m.Allows {
		if al.File == c.path && contains(al.Span, c.off) {
			return ruleHover(al.Rule), al.Span, true
		}
	}
	for _, l := range c.m.Loops {
		if l.File() == c.path && contains(l.NameSpan(), c.off) {
			return loopHover(c, l), l.NameSpan(), true
		}
	}
	if r, ok := c.refAt(); ok {
		if t := s.refHover(c, r); t != "" {
			return t, r.Span(), true
		}
	}
	path := stmtPath(c.f, c.off)
	if len(path) == 0 {
		return "", lang.Span{}, false
	}
	st := path[len(path)-1]
	if st.Keyword() == "row" && st.Word != nil && contains(st.Word.Span(), c.off) {
		if t := s.rowHover(c, st); t != "" {
			return t, st.Word.Span(), true
		}
	}
	if fac, at := atomAt(st, c.off); at != nil && at.Number != "" {
		if t, ok := quantityHover(fac, at, st.Keyword()); ok {
			return t, at.Span(), true
		}
	}
	return "", lang.Span{}, false
}

// quantityHover shows a number with its unit in SI and in the other common
// units of its dimension.
func quantityHover(fac *lang.Factor, at *lang.Atom, field string) (string, bool) {
	v, err := strconv.ParseFloat(at.Number, 64)
	if err != nil || math.IsInf(v, 0) || math.IsNaN(v) {
		return "", false
	}
	if fac != nil && fac.Sign == "-" {
		v = -v
	}
	var u units.Unit
	if at.Unit != nil {
		u, err = units.Parse(at.Unit.Text)
		if err != nil {
			return fmt.Sprintf("`%s`: %v", at.Unit.Text, err), true
		}
	}
	q := u.Quantity(v)
	difference := false
	if need, ok := lang.FieldNeeds[field]; ok && need.Dim == units.Temperature {
		difference = need.Difference
	}
	if u.Dim == units.Temperature && !u.Affine && !difference {
		difference = u.IsDifference()
	}
	return quantityTable(q.SI, u, difference), true
}

// quantityTable renders an SI value in its own unit, in SI and in the other
// common units of the dimension.
func quantityTable(si float64, u units.Unit, difference bool) string {
	var b strings.Builder
	name := units.Name(u.Dim)
	fmt.Fprintf(&b, "**%s** — %s\n\n", prettyFormat(si, u), name)
	common := units.Common(u.Dim)
	b.WriteString("| unit | value |\n|---|---|\n")
	shown := 0
	for i, cu := range common {
		if u.Dim == units.Temperature {
			if difference && cu.Affine || !difference && cu.IsDifference() {
				continue
			}
		}
		label := units.Pretty(cu.Text)
		if i == 0 {
			label += " (SI)"
		}
		val := si
		if u.Dim == units.Temperature && difference {
			// A difference converts by scale alone.
			val = si
			fmt.Fprintf(&b, "| %s | %s %s |\n", label, fmtNum(cu.FromSI(val)-cu.FromSI(0)), units.Pretty(cu.Text))
			shown++
			continue
		}
		fmt.Fprintf(&b, "| %s | %s |\n", label, prettyFormat(val, cu))
		shown++
	}
	if shown == 0 {
		fmt.Fprintf(&b, "| SI | %s |\n", fmtNum(si))
	}
	return b.String()
}

func fmtNum(v float64) string {
	return units.Format(v, units.Unit{})
}

func (s *Server) refHover(c *cursor, r lang.Ref) string {
	m := c.m
	switch r.Kind {
	case lang.RefParam:
		for _, p := range m.Params {
			if p.Name == r.Name && p.Value.Set {
				u, err := units.Parse(p.Value.Unit())
				if err != nil {
					u = units.Unit{}
				}
				return fmt.Sprintf("param `%s`\n\n", p.Name) + quantityTable(p.Value.SI, siUnit(u), isDifferenceText(p.Value.Unit())) +
					paramGuidanceHover(s.paramGuidance(c, p.Name), p.Name)
			}
		}
	case lang.RefComponent:
		if comp := m.Component(r.Name); comp != nil {
			return s.componentHover(c, comp)
		}
	case lang.RefCase:
		if cs := m.Case(r.Name); cs != nil {
			return s.caseHover(c, cs)
		}
	case lang.RefFluid:
		return fluidHover(c, r)
	case lang.RefNode:
		for _, l := range m.Loops {
			if r.Loop != nil && l != r.Loop {
				continue
			}
			for _, n := range l.Nodes {
				if n.Name == r.Name {
					return nodeHover(l, n)
				}
			}
		}
	case lang.RefPart:
		for _, p := range m.Parts {
			if p.Name == r.Name {
				return fmt.Sprintf("part `%s`: %d fields", p.Name, len(p.Stmts))
			}
		}
	}
	return ""
}

// siUnit returns the coherent SI unit of u's dimension (first of its
// common units), so a value is shown from SI outward.
func siUnit(u units.Unit) units.Unit {
	if c := units.Common(u.Dim); len(c) > 0 {
		return c[0]
	}
	return u
}

func nodeHover(l *lang.Loop, n *lang.Node) string {
	kind := "node"
	if n.Junction {
		kind = "junction"
	}
	s := fmt.Sprintf("%s `%s` of loop `%s`", kind, n.Name, l.Name)
	if n.At.Set {
		s += fmt.Sprintf("\n\nat (%s, %s, %s) m", fmtNum(n.At.X), fmtNum(n.At.Y), fmtNum(n.At.Z))
	}
	return s
}

func (s *Server) componentHover(c *cursor, comp *lang.Component) string {
	var b strings.Builder
	b.WriteString(headlined(fmt.Sprintf("%s `%s`", comp.Kind, comp.Name), s.componentHeadline(c, comp)))
	fmt.Fprintf(&b, "\n\nin loop `%s`", comp.Loop.Name)
	if comp.From != nil {
		fmt.Fprintf(&b, ", from `%s`", comp.From.Name)
	}
	if comp.To != nil {
		fmt.Fprintf(&b, " to `%s`", comp.To.Name)
	}
	b.WriteString("\n\n")
	var rows [][2]string
	add := func(name string, v lang.Value, u string) {
		if v.Set {
			rows = append(rows, [2]string{name, asWritten(v, u)})
		}
	}
	add("length", comp.Length, "m")
	add("rise", comp.Rise, "m")
	if d := comp.Diameter(); d > 0 {
		rows = append(rows, [2]string{"hydraulic diameter", units.Format(d, units.MustParse("mm"))})
	}
	add("loss K", comp.Loss, "")
	add("identical channels", comp.Channels, "")
	add("heat", comp.Heat, "W")
	if r, ok := comp.StackResistance(); ok {
		rows = append(rows, [2]string{"junction to wall", units.Format(r, units.MustParse("K/W"))})
	}
	add("junction limit", comp.JunctionLimit, "degC")
	add("conductance", comp.Conductance, "W/K")
	add("tubes", comp.Tubes, "")
	add("coolant side", comp.CoolantHTC, "W/(m2*K)")
	if len(rows) > 0 {
		b.WriteString("| | |\n|---|---|\n")
		for _, r := range rows {
			fmt.Fprintf(&b, "| %s | %s |\n", r[0], r[1])
		}
	}
	b.WriteString(s.componentEstimate(c, comp))
	return b.String()
}

// ownValue is " (own X)" for a component value a case replaces, "" when the
// component gives none.
func ownValue(v lang.Value, unit string) string {
	if !v.Set {
		return ""
	}
	return " (own " + asWritten(v, unit) + ")"
}

func (s *Server) caseHover(c *cursor, cs *lang.Case) string {
	var b strings.Builder
	what := fmt.Sprintf("case `%s`", cs.Name)
	if c.m.Nominal == cs {
		what += " (nominal)"
	}
	b.WriteString(headlined(what, s.caseHeadline(c, cs)) + "\n\n")
	for _, h := range cs.Heat {
		if h.Comp != nil {
			fmt.Fprintf(&b, "- heat on `%s`: %s%s\n", h.Comp.Name, asWritten(h.Value, "W"), ownValue(h.Comp.Heat, "W"))
		}
	}
	if cs.Sink.Set {
		fmt.Fprintf(&b, "- sink: %s\n", asWritten(cs.Sink, "degC"))
	}
	for _, sk := range cs.Sinks {
		if sk.Comp != nil {
			fmt.Fprintf(&b, "- sink at `%s`: %s%s\n", sk.Comp.Name, asWritten(sk.Value, "degC"), ownValue(sk.Comp.Sink, "degC"))
		}
	}
	for _, g := range cs.Conductances {
		if g.Comp != nil {
			own := ownValue(g.Comp.Conductance, "W/K")
			if own == "" {
				own = " (own: by geometry)"
			}
			fmt.Fprintf(&b, "- conductance of `%s`: %s%s\n", g.Comp.Name, asWritten(g.Value, "W/K"), own)
		}
	}
	for _, at := range []struct {
		n string
		v lang.Value
	}{{"pitch", cs.Pitch}, {"roll", cs.Roll}, {"yaw", cs.Yaw}} {
		if at.v.Set {
			fmt.Fprintf(&b, "- %s: %s\n", at.n, asWritten(at.v, "deg"))
		}
	}
	if cs.Saturation.Set {
		fmt.Fprintf(&b, "- saturation: %s\n", asWritten(cs.Saturation, "degC"))
	}
	b.WriteString(manoeuvreHover(cs))
	diags, _, _ := c.a.checks()
	b.WriteString(caseTiltHover(diags, c.m, cs))
	b.WriteString(s.caseEstimate(c, cs))
	return b.String()
}

// loopHover shows a loop's fluid, its size and its critical tilt angles,
// which the tilt-limits rule finds from the thermal centres alone.
func loopHover(c *cursor, l *lang.Loop) string {
	var b strings.Builder
	fmt.Fprintf(&b, "loop `%s`", l.Name)
	if l.Fluid.Name != "" {
		fmt.Fprintf(&b, ", fluid %s", l.Fluid.Name)
	}
	fmt.Fprintf(&b, ": %d nodes, %d components\n\n", len(l.Nodes), len(l.Components))
	diags, _, checked := c.a.checks()
	if !checked {
		b.WriteString("_Tilt limits after the checks run._\n")
		return b.String()
	}
	b.WriteString(loopTiltHover(diags, l))
	return b.String()
}

// saturationFor picks the temperature at which to show a loop's fluid:
// the estimate's, else a fixed saturation in the loop or the nominal case,
// else a condenser's fixed outlet.
func saturationFor(c *cursor, l *lang.Loop) (float64, string) {
	if t, ok := estimatedSaturation(c, l); ok {
		return t, "estimated for the nominal case"
	}
	if l.Saturation.Set {
		return l.Saturation.SI, "the loop's saturation"
	}
	if n := c.m.Nominal; n != nil && n.Saturation.Set {
		return n.Saturation.SI, "case " + n.Name + "'s saturation"
	}
	for _, comp := range l.Components {
		if comp.Kind == lang.Condenser && comp.Outlet.Set {
			return comp.Outlet.SI, comp.Name + "'s outlet"
		}
	}
	return 0, ""
}

func fluidHover(c *cursor, r lang.Ref) string {
	fl, err := fluid.Lookup(r.Name)
	if err != nil {
		return fmt.Sprintf("fluid `%s`: %v", r.Name, err)
	}
	info := fl.Info()
	var b strings.Builder
	fmt.Fprintf(&b, "fluid **%s**", info.Name)
	if info.Safety != "" {
		fmt.Fprintf(&b, " — safety class %s (ASHRAE 34)", info.Safety)
	}
	fmt.Fprintf(&b, "\n\ncritical point %s, %s\n\n", units.Format(info.Tc, units.MustParse("degC")), units.Format(info.Pc, units.MustParse("bar")))
	if r.Loop == nil {
		return b.String()
	}
	T, from := saturationFor(c, r.Loop)
	if from == "" {
		b.WriteString("saturated properties: give the loop a `saturation`, or open a file with cases, to see them\n")
		return b.String()
	}
	sat, err := fl.AtT(T)
	if err != nil {
		fmt.Fprintf(&b, "at %s (%s): %v\n", units.Format(T, units.MustParse("degC")), from, err)
		return b.String()
	}
	fmt.Fprintf(&b, "saturated at %s (%s):\n\n| property | liquid | vapour |\n|---|---|---|\n", units.Format(T, units.MustParse("degC")), from)
	fmt.Fprintf(&b, "| pressure | %s | |\n", units.Format(sat.P, units.MustParse("bar")))
	fmt.Fprintf(&b, "| density | %s | %s |\n", units.Format(sat.RhoL, units.MustParse("kg/m3")), units.Format(sat.RhoV, units.MustParse("kg/m3")))
	fmt.Fprintf(&b, "| latent heat | %s | |\n", units.Format(sat.Hlv, units.MustParse("kJ/kg")))
	fmt.Fprintf(&b, "| viscosity | %s | %s |\n", units.Format(sat.MuL, units.MustParse("uPa*s")), units.Format(sat.MuV, units.MustParse("uPa*s")))
	fmt.Fprintf(&b, "| surface tension | %s | |\n", units.Format(sat.Sigma, units.MustParse("mN/m")))
	return b.String()
}

// ruleHover explains a rule named in an allow comment.
func ruleHover(id string) string {
	if t, ok := ruleText(id); ok {
		return t
	}
	return fmt.Sprintf("`%s`: no rule has this name", id)
}

// isDifferenceText reports whether a unit as written writes only
// temperature differences.
func isDifferenceText(text string) bool {
	u, err := units.Parse(text)
	return err == nil && u.IsDifference()
}
