package check

import (
	"fmt"
	"math"
	"strings"

	"circa/lang"
)

// Topology rules: how the components join.

func init() {
	Register(&Rule{ID: "dangling-end", Category: CategoryTopology, Severity: lang.Error,
		Summary:   "a component end joins nothing else",
		Rationale: "Fluid leaving a component must enter another. A node used by a single component end (and holding no reservoir) is an open tube: usually a misspelt or forgotten node name.",
		Example:   "pipe riser from plate_out to coil_in { length 1 m; bore 12 mm }   # nothing starts at coil_in",
		Fix:       "Join the end to the next component (check the node names), or hang a reservoir off it if it is a deliberate liquid leg.",
		Run:       danglingEnds})
	Register(&Rule{ID: "unused-node", Category: CategoryTopology, Severity: lang.Warning,
		Summary:   "a node that no component uses",
		Rationale: "A declared node that nothing joins is dead text, or a sign that a component names the wrong node.",
		Example:   "node spare at (0, 0, 1) m   # no component starts or ends here",
		Fix:       "Delete the node or use it in the component that should join it.",
		Run:       unusedNodes})
	Register(&Rule{ID: "loop-not-closed", Category: CategoryTopology, Severity: lang.Error,
		Summary:   "the components form no closed path",
		Rationale: "A gravity-driven loop circulates only around a closed path: evaporator, riser, condenser, downcomer and back. Without a cycle there is no circulation.",
		Example:   "loop l { ...  pipe down from coil_out to sump { ... } }   # nothing leads from sump back to the evaporator inlet",
		Fix:       "Add the missing return line; the suggested fix adds a pipe from the open outlet to the open inlet with the length and rise the layout implies.",
		Run:       loopNotClosed})
	Register(&Rule{ID: "disconnected", Category: CategoryTopology, Severity: lang.Error,
		Summary:   "a loop falls apart into pieces that do not join",
		Rationale: "Every component of a loop shares its fluid; pieces that do not join are separate loops (declare them so) or a node name is wrong.",
		Example:   "pipe extra from x to y { length 1 m; bore 8 mm }   # x and y join nothing else in the loop",
		Fix:       "Join the pieces with the right node names, or move the piece to a loop of its own.",
		Run:       disconnected})
	Register(&Rule{ID: "dead-end", Category: CategoryTopology, Severity: lang.Error,
		Summary:   "a branch with no path for the flow to return",
		Rationale: "In steady flow what enters a branch must come back around a closed path. A component on no directed cycle (for example a single pipe joining two otherwise separate circuits) can carry no steady flow.",
		Example:   "pipe bridge from loop_a_node to loop_b_node { ... }   # flow can go from circuit A to B but never back",
		Fix:       "Add the return path, or split the circuits into separate loops; reservoirs are the only dead ends allowed.",
		Run:       deadEnds})
	Register(&Rule{ID: "blocked-node", Category: CategoryTopology, Severity: lang.Error,
		Summary:   "every component at a node points in (or every one points out)",
		Rationale: "Flow must pass through a node. When all the components joining a node run towards it (or all away from it), flow cannot pass: usually one branch is written from/to the wrong way round.",
		Example:   "pipe a from n1 to m { ... }\npipe b from n2 to m { ... }   # nothing leaves m",
		Fix:       "Swap the from and to nodes of the branch that runs the wrong way.",
		Run:       blockedNodes})
	Register(&Rule{ID: "duplicate-branch", Category: CategoryTopology, Severity: lang.Warning,
		Summary:   "two components of the same kind with the same ends",
		Rationale: "Two pipes (bends, fittings) from the same node to the same node are almost always a copied line whose node names were not changed. Parallel evaporators or condensers are normal and not reported.",
		Example:   "pipe p1 from a to b { ... }\npipe p2 from a to b { ... }",
		Fix:       "Correct the ends of the copied component; if the parallel tubes are meant, add \"# allow: duplicate-branch\" on its line.",
		Run:       duplicateBranches})
	Register(&Rule{ID: "no-evaporator", Category: CategoryTopology, Severity: lang.Error,
		Summary:   "a loop without an evaporator",
		Rationale: "Without a heated section nothing boils and nothing drives the loop.",
		Example:   "loop l { fluid water; node a; node b; pipe p from a to b { ... }; condenser c from b to a { ... } }",
		Fix:       "Declare the heated section as an evaporator. A loop with no components at all gets this one finding (not no-condenser too), and its nodes are not reported unused.",
		Run:       func(c *Context) { needKind(c, lang.Evaporator) }})
	Register(&Rule{ID: "no-condenser", Category: CategoryTopology, Severity: lang.Error,
		Summary:   "a loop without a condenser",
		Rationale: "Without a cooled section the heat has nowhere to go and the vapour does not return as liquid.",
		Example:   "loop l { fluid water; node a; node b; evaporator e from a to b { ... }; pipe p from b to a { ... } }",
		Fix:       "Declare the cooled section as a condenser.",
		Run:       func(c *Context) { needKind(c, lang.Condenser) }})
}

func danglingEnds(c *Context) {
	g, l := c.Graph, c.Loop
	for _, ci := range g.Edges {
		comp := l.Components[ci]
		for _, end := range [2]struct {
			n    *lang.Node
			span lang.Span
			what string
		}{{comp.From, comp.FromSpan(), "inlet"}, {comp.To, comp.ToSpan(), "outlet"}} {
			v := end.n.Index
			if g.Ends(v) != 1 || len(g.Reservoirs(v)) > 0 {
				continue
			}
			d := c.Reportf(lang.Location{File: comp.File(), Span: end.span}, "the %s of %s %s at node %s joins no other component", end.what, comp.Kind, comp.Name, end.n.Name)
			d.Related = append(d.Related, lang.Related{Loc: end.n.NameLoc(), Message: "node " + end.n.Name + " is declared here"})
		}
	}
	// A reservoir hanging off a node that no component joins.
	for v := range l.Nodes {
		if g.Ends(v) == 0 {
			for _, ri := range g.Reservoirs(v) {
				r := l.Components[ri]
				c.Reportf(lang.Location{File: r.File(), Span: r.FromSpan()}, "reservoir %s hangs off node %s, which no component joins", r.Name, l.Nodes[v].Name)
			}
		}
	}
}

func unusedNodes(c *Context) {
	if len(c.Loop.Components) == 0 {
		return // nodes come first; no-evaporator says the loop has no components
	}
	// A component whose other end did not resolve still uses this one (its
	// unknown name is reported by itself).
	named := make([]bool, len(c.Loop.Nodes))
	for _, comp := range c.Loop.Components {
		for _, n := range []*lang.Node{comp.From, comp.To} {
			if n != nil && n.Index < len(named) && c.Loop.Nodes[n.Index] == n {
				named[n.Index] = true
			}
		}
	}
	for _, n := range c.Loop.Nodes {
		if !named[n.Index] {
			c.Reportf(n.NameLoc(), "node %s is not used by any component", n.Name)
		}
	}
}

func loopNotClosed(c *Context) {
	g, l := c.Graph, c.Loop
	if len(g.Edges) == 0 || len(g.Chords) > 0 {
		return
	}
	var outs, ins []int // open outlets and open inlets
	for v := range l.Nodes {
		if g.Ends(v) == 1 && len(g.Reservoirs(v)) == 0 {
			if len(g.In(v)) == 1 {
				outs = append(outs, v)
			} else {
				ins = append(ins, v)
			}
		}
	}
	d := c.Reportf(l.NameLoc(), "loop %s has no closed path: its %d components form no cycle, so it cannot circulate", l.Name, len(g.Edges))
	for _, v := range append(append([]int(nil), outs...), ins...) {
		d.Related = append(d.Related, lang.Related{Loc: l.Nodes[v].NameLoc(), Message: "open end at node " + l.Nodes[v].Name})
	}
	if len(outs) != 1 || len(ins) != 1 || g.Piece[outs[0]] != g.Piece[ins[0]] {
		return
	}
	from, to := l.Nodes[outs[0]], l.Nodes[ins[0]]
	last := l.Components[g.In(from.Index)[0]]
	lay := c.Layout
	disp := lay.Pos[to.Index].Sub(lay.Pos[from.Index])
	rise := disp[2]
	length := disp.Norm()
	if length < math.Abs(rise) {
		length = math.Abs(rise)
	}
	length = math.Ceil(length*1000) / 1000
	if length < 0.01 {
		length = 0.01
	}
	fields := []string{"length " + q(length, "m"), "rise " + q(rise, "m")}
	if dia := last.Diameter(); dia > 0 && !math.IsInf(dia, 0) {
		fields = append(fields, "bore "+q(dia, "mm"))
	}
	name := uniqueName(c.Model, "return")
	stmt := fmt.Sprintf("pipe %s from %s to %s { %s }", name, from.Name, to.Name, strings.Join(fields, "; "))
	if e, ok := insertBeforeClose(c.Model, l.Decl, blockIndent(c.Model, l), stmt); ok {
		d.Fixes = append(d.Fixes, lang.Fix{Title: fmt.Sprintf("add a pipe from %s back to %s", from.Name, to.Name), Edits: []lang.Edit{e}})
	}
}

// uniqueName returns base, or base with a number, not used by any
// component of the model.
func uniqueName(m *lang.Model, base string) string {
	name := base
	for i := 2; m.Component(name) != nil; i++ {
		name = fmt.Sprintf("%s_%d", base, i)
	}
	return name
}

func disconnected(c *Context) {
	g, l := c.Graph, c.Loop
	if g.NPieces < 2 {
		return
	}
	// The piece holding the most components is the loop; the others are
	// reported at their first component.
	count := make([]int, g.NPieces)
	first := make([]int, g.NPieces)
	for i := range first {
		first[i] = -1
	}
	for _, ci := range g.Edges {
		p := g.Piece[l.Components[ci].From.Index]
		count[p]++
		if first[p] < 0 {
			first[p] = int(ci)
		}
	}
	main := 0
	for p := range count {
		if count[p] > count[main] {
			main = p
		}
	}
	for p := range count {
		if p == main || first[p] < 0 {
			continue
		}
		comp := l.Components[first[p]]
		var d *lang.Diagnostic
		if count[p] == 1 {
			d = c.Reportf(compLoc(comp), "%s %s does not join the rest of loop %s", comp.Kind, comp.Name, l.Name)
		} else {
			d = c.Reportf(compLoc(comp), "%s %s and %d other component(s) do not join the rest of loop %s", comp.Kind, comp.Name, count[p]-1, l.Name)
		}
		d.Related = append(d.Related, related(l.Components[first[main]], "the main part of the loop starts here"))
	}
}

// blocked returns whether flow cannot pass node v: at least two component
// ends meet there and they all point in, or all out.
func blocked(g *Graph, v int) bool {
	return g.Ends(v) >= 2 && (len(g.In(v)) == 0 || len(g.Out(v)) == 0)
}

func blockedNodes(c *Context) {
	g, l := c.Graph, c.Loop
	for _, n := range l.Nodes {
		v := n.Index
		if !blocked(g, v) {
			continue
		}
		way, list := "into", g.In(v)
		if len(list) == 0 {
			way, list = "out of", g.Out(v)
		}
		d := c.Reportf(n.NameLoc(), "flow cannot pass node %s: all %d components there run %s it", n.Name, len(list), way)
		for _, ci := range list {
			comp := l.Components[ci]
			d.Related = append(d.Related, related(comp, "%s %s from %s to %s", comp.Kind, comp.Name, comp.From.Name, comp.To.Name))
		}
	}
}

func deadEnds(c *Context) {
	g, l := c.Graph, c.Loop
	if len(g.Chords) == 0 {
		return // reported as loop-not-closed
	}
	for v := range l.Nodes {
		if blocked(g, v) {
			return // reported as blocked-node: a reversed branch stops every circuit through it
		}
	}
	for _, ci := range g.Edges {
		comp := l.Components[ci]
		if g.OnCycle[ci] || g.Hanging[ci] || blocked(g, comp.From.Index) || blocked(g, comp.To.Index) {
			continue
		}
		c.Reportf(compLoc(comp), "flow through %s %s (from %s to %s) has no path back to %s: it lies on no closed circuit", comp.Kind, comp.Name, comp.From.Name, comp.To.Name, comp.From.Name)
	}
}

func duplicateBranches(c *Context) {
	type key struct {
		from, to int
		kind     lang.Kind
	}
	seen := map[key]*lang.Component{}
	for _, ci := range c.Graph.Edges {
		comp := c.Loop.Components[ci]
		if comp.Kind == lang.Evaporator || comp.Kind == lang.Condenser {
			continue
		}
		k := key{comp.From.Index, comp.To.Index, comp.Kind}
		if prev, ok := seen[k]; ok {
			d := c.Reportf(compLoc(comp), "%s %s runs from %s to %s, like %s %s: a copied line with unchanged ends?", comp.Kind, comp.Name, comp.From.Name, comp.To.Name, prev.Kind, prev.Name)
			d.Related = append(d.Related, related(prev, "%s %s has the same ends", prev.Kind, prev.Name))
			continue
		}
		seen[k] = comp
	}
}

// needKind reports a loop without a component of kind k. A loop with no
// components at all gets one finding, from no-evaporator, not two.
func needKind(c *Context, k lang.Kind) {
	if len(c.Loop.Components) == 0 {
		if k == lang.Evaporator {
			c.Reportf(c.Loop.NameLoc(), "loop %s has no components yet: add an evaporator, a condenser and the tubes between them", c.Loop.Name)
		}
		return
	}
	for _, comp := range c.Loop.Components {
		if comp.Kind == k {
			return
		}
	}
	c.Reportf(c.Loop.NameLoc(), "loop %s has no %s", c.Loop.Name, k)
}
