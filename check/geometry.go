package check

import (
	"fmt"
	"math"
	"strings"

	"circa/check/geom"
	"circa/lang"
	"circa/units"
)

// Geometry rules: lengths, rises, coordinates and sizes.
//
// Tolerances:
//   - a rise may exceed the length by at most 1 mm (rounding of written values);
//   - a stated rise or run agrees with coordinates within the larger of 5 mm
//     and 1 % of the component's length (drawing accuracy grows with size);
//   - the signed rises around an independent cycle close within the larger
//     of 5 mm and 1 % of the sum of their magnitudes.
//
// These tolerances are common practice for layout drawings, not a standard.
const (
	riseTol    = 1e-3
	agreeAbs   = 5e-3
	agreeRel   = 0.01
	closureAbs = 5e-3
	closureRel = 0.01
	// maxRelRoughness is the largest relative roughness e/D of the Moody
	// chart (Moody 1944, Trans. ASME 66, p. 671); beyond it the friction
	// correlations are extrapolated.
	maxRelRoughness = 0.05
)

func init() {
	Register(&Rule{ID: "missing-geometry", Category: CategoryGeometry, Severity: lang.Error,
		Summary:   "a component without a bore (or flow area) or without a length",
		Rationale: "Friction, velocity and the liquid inventory need the flow area and the length of every tube. Bends and fittings default to zero length but still need a bore for their velocity head.",
		Example:   "pipe riser from a to b { length 1 m }   # no bore",
		Fix:       "Add bore (round tube) or flow_area and hydraulic_diameter, and length; a part with \"use PART\" can carry the bore.",
		Run:       missingGeometry, Partial: true})
	Register(&Rule{ID: "not-positive", Category: CategoryGeometry, Severity: lang.Error,
		Summary:   "a size that must be positive is zero or negative",
		Rationale: "Lengths, bores, areas and volumes are magnitudes; a zero or negative one is a typo (a sign belongs on rise only).",
		Example:   "pipe p from a to b { length 1 m; bore -8 mm }",
		Fix:       "Write the magnitude; put a direction in rise or run.",
		Run:       notPositive, Partial: true})
	Register(&Rule{ID: "rough-wall", Category: CategoryGeometry, Severity: lang.Warning,
		Summary:   "wall roughness not well below the bore (e/D ≥ 0.05)",
		Rationale: "Friction factor charts and correlations cover relative roughness up to 0.05 (Moody 1944); a larger value is usually a unit slip (mm for µm).",
		Example:   "pipe p from a to b { length 1 m; bore 8 mm; roughness 1.5 mm }",
		Fix:       "Check the roughness unit: drawn copper is about 1.5 µm.",
		Run:       roughWall, Partial: true})
	Register(&Rule{ID: "heated-length-exceeds-length", Category: CategoryGeometry, Severity: lang.Error,
		Summary:   "an evaporator heated over more than its length",
		Rationale: "The heated length is part of the evaporator's length; a longer one puts the heat flux and the quality march outside the tube.",
		Example:   "evaporator e from a to b { length 0.3 m; heated_length 0.4 m; bore 8 mm }",
		Fix:       "Make heated_length at most length.",
		Run:       heatedLength, Partial: true})
	Register(&Rule{ID: "rise-exceeds-length", Category: CategoryGeometry, Severity: lang.Error,
		Summary:   "a component rises (or falls) more than its length",
		Rationale: "A tube cannot climb more than its own length: |rise| ≤ length (within 1 mm). One of the two values is wrong, or the rise belongs to a longer run of components.",
		Example:   "pipe riser from a to b { length 0.5 m; rise 0.8 m; bore 12 mm }",
		Fix:       "Correct the rise or the length.",
		Run:       riseExceedsLength, Partial: true})
	Register(&Rule{ID: "span-exceeds-length", Category: CategoryGeometry, Severity: lang.Error,
		Summary:   "a component's ends lie further apart than its length",
		Rationale: "The straight distance between a component's ends (from coordinates or its run) is the least length a tube between them can have.",
		Example:   "node a at (0, 0, 0) m\nnode b at (2, 0, 0) m\npipe p from a to b { length 1 m; bore 8 mm }",
		Fix:       "Correct the length or the coordinates.",
		Run:       spanExceedsLength, Partial: true})
	Register(&Rule{ID: "rise-mismatch", Category: CategoryGeometry, Severity: lang.Error,
		Summary:   "a stated rise disagrees with the end coordinates (or the run)",
		Rationale: "When both the rise and the end positions are written they must agree (within 5 mm or 1 % of the length); otherwise the driving head depends on which one the estimate believes.",
		Example:   "node a at (0, 0, 0) m\nnode b at (0, 0, 1) m\npipe p from a to b { length 1 m; rise 0.8 m; bore 8 mm }",
		Fix:       "Correct the rise (the fix writes the coordinates' value), or the coordinates, or drop the rise.",
		Run:       riseMismatch, Partial: true})
	Register(&Rule{ID: "run-mismatch", Category: CategoryGeometry, Severity: lang.Error,
		Summary:   "a stated run disagrees with the end coordinates",
		Rationale: "When both a component's run and its end positions are written they must agree (within 5 mm or 1 % of the length).",
		Example:   "node a at (0, 0, 0) m\nnode b at (1, 0, 0) m\npipe p from a to b { length 1 m; run (0.5, 0, 0) m; bore 8 mm }",
		Fix:       "Correct the run (the fix writes the coordinates' value) or the coordinates.",
		Run:       runMismatch, Partial: true})
	Register(&Rule{ID: "rise-misclosure", Category: CategoryGeometry, Severity: lang.Error,
		Summary:   "the rises around a closed circuit do not sum to zero",
		Rationale: "Going once around any closed circuit returns to the starting height, so the signed rises of its components must sum to zero (within 5 mm or 1 % of their magnitudes). A misclosure means a rise is wrong, and with it the driving head.",
		Example:   "evaporator e from a to b { rise 0.3 m ... }\npipe up from b to c { rise 1 m ... }\ncondenser k from c to d { rise -0.2 m ... }\npipe down from d to a { rise -1.05 m ... }   # sums to +0.05 m",
		Fix:       "Find the wrong rise among the listed components; giving nodes coordinates makes the rises follow from them.",
		Run:       riseMisclosure})
	Register(&Rule{ID: "run-misclosure", Category: CategoryGeometry, Severity: lang.Error,
		Summary:   "the horizontal runs around a closed circuit do not sum to zero",
		Rationale: "Going once around a closed circuit returns to the starting point, so the horizontal parts (x, y) of the components' runs must sum to zero as well (within 5 mm or 1 % of their magnitudes). The check applies to circuits whose every component's horizontal displacement is known (a run, coordinates at both ends, or a bend or fitting of no length); a misclosure means a run is wrong, and with it the attitude at which the loop stops.",
		Example:   "pipe up from b to c { run (0, 0, 1) m ... }\ncondenser k from c to d { run (-0.3, 0, 0) m ... }\npipe down from d to a { run (0.25, 0, -1) m ... }   # x sums to -0.05 m",
		Fix:       "Find the wrong run among the listed components; giving nodes coordinates makes the runs follow from them.",
		Run:       runMisclosure})
}

// stmtHasLangError reports whether the language already reported an error
// inside a component's statement (then its missing values are explained).
func stmtHasLangError(m *lang.Model, c *lang.Component) bool {
	end := c.BlockClose()
	if end < c.Span().End {
		end = c.Span().End
	}
	for _, d := range m.Diags {
		if d.Loc.File == c.File() && d.Loc.Span.Start >= c.Span().Start && d.Loc.Span.Start <= end {
			return true
		}
	}
	return false
}

func missingGeometry(c *Context) {
	for _, comp := range c.Components() {
		if comp.Kind == lang.Reservoir || stmtHasLangError(c.Model, comp) {
			continue
		}
		var missing []string
		if !comp.Bore.Set && !comp.FlowArea.Set && !comp.HydDiameter.Set {
			missing = append(missing, "bore (or flow_area)")
		}
		if !comp.Length.Set && comp.Kind != lang.Bend && comp.Kind != lang.Fitting {
			missing = append(missing, "length")
		}
		if len(missing) > 0 {
			c.Reportf(compLoc(comp), "%s %s has no %s", comp.Kind, comp.Name, strings.Join(missing, " and no "))
		}
	}
}

func notPositive(c *Context) {
	for _, comp := range c.Components() {
		type field struct {
			name   string
			v      lang.Value
			unit   string
			zeroOK bool
		}
		fs := []field{
			{"length", comp.Length, "m", comp.Kind == lang.Bend || comp.Kind == lang.Fitting},
			{"bore", comp.Bore, "mm", false},
			{"flow_area", comp.FlowArea, "mm²", false},
			{"hydraulic_diameter", comp.HydDiameter, "mm", false},
			{"roughness", comp.Roughness, "µm", true},
			{"heated_length", comp.HeatedLength, "m", false},
			{"wetted_area", comp.WettedArea, "cm²", false},
			{"volume", comp.Volume, "L", false},
		}
		for _, f := range fs {
			if !f.v.Set || f.v.SI > 0 || (f.zeroOK && f.v.SI == 0) {
				continue
			}
			want := "positive"
			if f.zeroOK {
				want = "zero or positive"
			}
			got := qAs(f.v.SI, f.v, f.unit)
			if ps := c.Model.ParamsIn(f.v.Loc()); len(ps) > 0 {
				got += " (from param " + strings.Join(ps, ", ") + ")"
			}
			c.Reportf(valueLoc(f.v, compLoc(comp)), "%s of %s %s must be %s, not %s", f.name, comp.Kind, comp.Name, want, got)
		}
	}
}

func roughWall(c *Context) {
	for _, comp := range c.Components() {
		d := comp.Diameter()
		if comp.Kind == lang.Reservoir || !(d > 0) || !(comp.Roughness.SI > 0) {
			continue
		}
		if r := comp.Roughness.SI / d; r >= maxRelRoughness {
			c.Reportf(valueLoc(comp.Roughness, compLoc(comp)), "roughness %s of %s %s is %s %% of its %s diameter (relative roughness %s; at most 0.05 expected)",
				qAs(comp.Roughness.SI, comp.Roughness, "mm"), comp.Kind, comp.Name, units.Sig(100*r, 3), q(d, "mm"), units.Sig(r, 3))
		}
	}
}

func heatedLength(c *Context) {
	for _, comp := range c.Components() {
		if comp.Kind != lang.Evaporator || !comp.HeatedLength.Set || !comp.Length.Set || !(comp.Length.SI > 0) {
			continue
		}
		if comp.HeatedLength.SI > comp.Length.SI+riseTol {
			c.Reportf(valueLoc(comp.HeatedLength, compLoc(comp)), "heated_length %s of evaporator %s exceeds its length %s",
				qAs(comp.HeatedLength.SI, comp.HeatedLength, "m"), comp.Name, qAs(comp.Length.SI, comp.Length, "m"))
		}
	}
}

// lengthOf returns a component's length when it can be compared: given and
// non-negative, or the zero default of bends and fittings.
func lengthOf(comp *lang.Component) (float64, bool) {
	if comp.Kind == lang.Reservoir {
		return 0, false
	}
	if comp.Length.Set {
		return comp.Length.SI, comp.Length.SI >= 0
	}
	return 0, comp.Kind == lang.Bend || comp.Kind == lang.Fitting
}

// where names the source of a component's displacement.
func where(comp *lang.Component, src geom.Source) string {
	switch src {
	case geom.FromCoords:
		return fmt.Sprintf("the coordinates of %s and %s", comp.From.Name, comp.To.Name)
	case geom.FromRun:
		return "its run"
	}
	return "its rise"
}

func riseExceedsLength(c *Context) {
	for _, comp := range c.Components() {
		L, ok := lengthOf(comp)
		if !ok || comp.To == nil {
			continue
		}
		dz := c.Layout.Disp(comp.Index)[2]
		if comp.Rise.Set {
			dz = comp.Rise.SI
		} else if c.Layout.Source[comp.Index] == geom.FromRise {
			continue
		}
		if math.Abs(dz) > L+riseTol {
			// Where the rise comes from is told only in a finding: most
			// components have none, and a large loop would make a string
			// for each.
			what := ""
			if !comp.Rise.Set {
				what = " (from " + where(comp, c.Layout.Source[comp.Index]) + ")"
			}
			c.Reportf(valueLoc(comp.Rise, valueLoc(comp.Length, compLoc(comp))), "%s %s rises %s%s but is only %s long",
				comp.Kind, comp.Name, qAs(dz, comp.Rise, "m"), what, qAs(L, comp.Length, "m"))
		}
	}
}

func agreeTol(L float64) float64 { return math.Max(agreeAbs, agreeRel*L) }

func spanExceedsLength(c *Context) {
	for _, comp := range c.Components() {
		L, ok := lengthOf(comp)
		src := c.Layout.Source[comp.Index]
		if !ok || comp.To == nil || src == geom.FromRise {
			continue
		}
		disp := c.Layout.Disp(comp.Index)
		if !comp.Rise.Set && math.Abs(disp[2]) > L+riseTol {
			continue // reported as rise-exceeds-length
		}
		if span := disp.Norm(); span > L+agreeTol(L) {
			c.Reportf(valueLoc(comp.Length, compLoc(comp)), "the ends of %s %s are %s apart (from %s) but it is only %s long",
				comp.Kind, comp.Name, q(span, "m"), where(comp, src), qAs(L, comp.Length, "m"))
		}
	}
}

func riseMismatch(c *Context) {
	for _, comp := range c.Components() {
		src := c.Layout.Source[comp.Index]
		if !comp.Rise.Set || comp.To == nil || src == geom.FromRise {
			continue
		}
		dz := c.Layout.Disp(comp.Index)[2]
		L, _ := lengthOf(comp)
		if math.Abs(comp.Rise.SI-dz) <= agreeTol(L) {
			continue
		}
		d := c.Reportf(comp.Rise.Loc(), "rise %s of %s %s disagrees with %s, which give %s (tolerance %s)",
			qAs(comp.Rise.SI, comp.Rise, "m"), comp.Kind, comp.Name, where(comp, src), qAs(dz, comp.Rise, "m"), q(agreeTol(L), "mm"))
		d.Fixes = append(d.Fixes, lang.Fix{Title: "use the rise the " + strings.TrimPrefix(where(comp, src), "the ") + " give",
			Edits: []lang.Edit{{Loc: comp.Rise.Loc(), NewText: qAs(dz, comp.Rise, "m")}}})
	}
}

func runMismatch(c *Context) {
	for _, comp := range c.Components() {
		if !comp.Run.Set || comp.From == nil || comp.To == nil || c.Layout.Source[comp.Index] != geom.FromCoords {
			continue
		}
		coords := c.Layout.Disp(comp.Index)
		run := geom.Vec3{comp.Run.X, comp.Run.Y, comp.Run.Z}
		L, _ := lengthOf(comp)
		off := run.Sub(coords).Norm()
		if off <= agreeTol(L) {
			continue
		}
		d := c.Reportf(comp.Run.Loc(), "run %s of %s %s is %s away from the coordinates of %s and %s, which give %s",
			vec(run), comp.Kind, comp.Name, q(off, "mm"), comp.From.Name, comp.To.Name, vec(coords))
		d.Fixes = append(d.Fixes, lang.Fix{Title: "use the run the coordinates give",
			Edits: []lang.Edit{{Loc: comp.Run.Loc(), NewText: vec(coords)}}})
	}
}

// vec writes a displacement in metres as .loop text.
func vec(v geom.Vec3) string {
	n := func(x float64) string { return strings.TrimSuffix(q(x, "m"), " m") }
	return fmt.Sprintf("(%s, %s, %s) m", n(v[0]), n(v[1]), n(v[2]))
}

func riseMisclosure(c *Context) {
	g, l, lay := c.Graph, c.Loop, c.Layout
	// Height of every node along the spanning forest, from the rises.
	h := make([]float64, len(l.Nodes))
	for _, v := range g.Order {
		p, v := int(g.Parent[v]), int(v)
		if p < 0 {
			continue
		}
		comp := l.Components[p]
		if comp.To.Index == v {
			h[v] = h[comp.From.Index] + lay.Disp(p)[2]
		} else {
			h[v] = h[comp.To.Index] - lay.Disp(p)[2]
		}
	}
	for _, ch := range g.Chords {
		comp := l.Components[ch]
		mis := h[comp.From.Index] + lay.Disp(ch)[2] - h[comp.To.Index]
		if math.Abs(mis) <= closureAbs {
			continue
		}
		cyc := g.Cycle(ch)
		sum, abs := 0.0, 0.0
		at := -1
		for _, s := range cyc {
			dz := float64(s.Sign) * lay.Disp(s.Comp)[2]
			sum += dz
			abs += math.Abs(dz)
			if lay.Source[s.Comp] != geom.FromCoords && (at < 0 || s.Comp < at) {
				at = s.Comp
			}
		}
		tol := math.Max(closureAbs, closureRel*abs)
		if at < 0 || math.Abs(sum) <= tol {
			continue
		}
		first := l.Components[at]
		names := make([]string, 0, len(cyc))
		rel := make([]lang.Related, 0, len(cyc))
		for _, s := range cyc {
			sc := l.Components[s.Comp]
			names = append(names, sc.Name)
			dir := "rise"
			if s.Sign < 0 {
				dir = "rise, walked against the flow"
			}
			loc := compLoc(sc)
			if sc.Rise.Set && sc.Rise.File() != "" {
				loc = sc.Rise.Loc()
			}
			rel = append(rel, lang.Related{Loc: loc, Message: fmt.Sprintf("%s %s: %s %s (from %s)", sc.Kind, sc.Name, dir, qs(float64(s.Sign)*lay.Disp(s.Comp)[2], "m"), where(sc, lay.Source[s.Comp]))})
		}
		loc := compLoc(first)
		if first.Rise.Set && first.Rise.File() != "" {
			loc = first.Rise.Loc()
		}
		d := c.Reportf(loc, "rises around the circuit %s do not close: they sum to %s (tolerance %s)",
			strings.Join(names, " → "), qs(sum, "m"), q(tol, "mm"))
		d.Related = rel
	}
}

// horizontalKnown reports whether a component's horizontal displacement is
// known: from a run or coordinates, or a bend or fitting of no length.
func horizontalKnown(comp *lang.Component, lay *geom.Layout) bool {
	if lay.Horizontal(comp.Index) {
		return true
	}
	L, ok := lengthOf(comp)
	return ok && L == 0
}

func runMisclosure(c *Context) {
	g, l, lay := c.Graph, c.Loop, c.Layout
	for _, ch := range g.Chords {
		cyc := g.Cycle(ch)
		var sum geom.Vec3
		abs := 0.0
		known, fromRun := true, false
		for _, s := range cyc {
			sc := l.Components[s.Comp]
			if !horizontalKnown(sc, lay) {
				known = false
				break
			}
			fromRun = fromRun || lay.Source[s.Comp] == geom.FromRun
			d := lay.Disp(s.Comp).Scale(float64(s.Sign))
			d[2] = 0
			sum = sum.Add(d)
			abs += d.Norm()
		}
		tol := math.Max(closureAbs, closureRel*abs)
		if !known || !fromRun || sum.Norm() <= tol {
			continue
		}
		at := -1
		names := make([]string, 0, len(cyc))
		rel := make([]lang.Related, 0, len(cyc))
		for _, s := range cyc {
			sc := l.Components[s.Comp]
			names = append(names, sc.Name)
			if lay.Source[s.Comp] == geom.FromRun && (at < 0 || s.Comp < at) {
				at = s.Comp
			}
			d := lay.Disp(s.Comp).Scale(float64(s.Sign))
			dir := "horizontal run"
			if s.Sign < 0 {
				dir = "horizontal run, walked against the flow"
			}
			loc := compLoc(sc)
			if sc.Run.Set && sc.Run.File() != "" {
				loc = sc.Run.Loc()
			}
			rel = append(rel, lang.Related{Loc: loc, Message: fmt.Sprintf("%s %s: %s (%s, %s) (from %s)", sc.Kind, sc.Name, dir,
				qs(d[0], "m"), qs(d[1], "m"), where(sc, lay.Source[s.Comp]))})
		}
		first := l.Components[at]
		loc := compLoc(first)
		if first.Run.Set && first.Run.File() != "" {
			loc = first.Run.Loc()
		}
		d := c.Reportf(loc, "horizontal runs around the circuit %s do not close: they sum to (%s, %s), %s off (tolerance %s)",
			strings.Join(names, " → "), qs(sum[0], "m"), qs(sum[1], "m"), q(sum.Norm(), "mm"), q(tol, "mm"))
		d.Related = rel
	}
}
