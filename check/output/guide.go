package output

import (
	"encoding/json"
	"fmt"
	"io"
	"math"
	"strings"

	"circa/check/flow"
	"circa/check/guide"
	"circa/units"
)

// EstimateGuidedJSON writes the estimate with its design guidance as one
// indented JSON document: the estimate's fields and "guidance"
// (docs/estimate-json.md).
func EstimateGuidedJSON(w io.Writer, res *flow.Result, g *guide.Guidance) error {
	doc := struct {
		*flow.Result
		Guidance *guide.Guidance `json:"guidance,omitempty"`
	}{res, g}
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(doc)
}

// levers is how many sensitivities each parameter shows in text.
const levers = 3

// GuidanceText writes the design guidance for people: each parameter's
// feasible range with what ends it and its biggest levers, each loop's
// charge range and, when computed, the fluid ranking. res is the estimate
// the guidance was computed from (for the units of the design pressure).
func GuidanceText(w io.Writer, g *guide.Guidance, res *flow.Result) error {
	ew := &errWriter{w: w}
	fmt.Fprintln(ew, "\ndesign guidance (each value alone, everything else as written; a range keeps every margin in every case):")
	if g.Message != "" {
		fmt.Fprintf(ew, "  %s\n", g.Message)
		return ew.err
	}
	if g.Skipped != "" {
		fmt.Fprintf(ew, "  %s\n", g.Skipped)
	}
	if line := limitingLevers(g); line != "" {
		fmt.Fprintln(ew, line)
	}
	for i := range g.Params {
		p := &g.Params[i]
		paramText(ew, "param "+p.Param, p)
	}
	for _, l := range g.Loops {
		if l.Charge != nil {
			paramText(ew, "charge of loop "+l.Loop, l.Charge)
		}
	}
	if len(g.Params) == 0 && !hasCharge(g) {
		fmt.Fprintln(ew, "  the file has no parameters and no charge to guide")
	}
	for _, l := range g.Loops {
		if len(l.Fluids) > 0 {
			fluidsText(ew, l, designUnit(res, l.Loop))
		}
	}
	return ew.err
}

func hasCharge(g *guide.Guidance) bool {
	for _, l := range g.Loops {
		if l.Charge != nil {
			return true
		}
	}
	return false
}

func designUnit(res *flow.Result, loop string) string {
	if res == nil {
		return ""
	}
	for _, l := range res.Loops {
		if l.Loop == loop {
			return l.DesignPressureUnit
		}
	}
	return ""
}

// limitingLevers names the parameters that move the design's limiting
// margin, the biggest lever first.
func limitingLevers(g *guide.Guidance) string {
	var parts []string
	for _, l := range g.Levers {
		if l.Where != g.Limit {
			continue
		}
		step := "10 %"
		for _, p := range g.Params {
			if p.Param == l.Param && p.AbsTemp {
				step = "10 K"
			}
		}
		parts = append(parts, fmt.Sprintf("%s %s per %s", l.Param, signed(l.PerTenPercent), step))
	}
	if len(parts) == 0 {
		return ""
	}
	return fmt.Sprintf("  the limiting margin, %s (use %s), moves with: %s", g.Limit.Describe(), sig(g.Use, 3), strings.Join(parts, ", "))
}

// paramText writes one value's range and levers.
func paramText(w io.Writer, what string, p *guide.Param) {
	fmt.Fprintf(w, "  %s = %s: ", what, ValueIn(p.Value, p.Unit))
	if !p.Influences {
		fmt.Fprintln(w, "influences no estimate")
		return
	}
	if p.Skipped {
		fmt.Fprintln(w, "reaches the estimate; not searched")
		return
	}
	fmt.Fprintln(w, RangeText(p.Range, p.Unit))
	if p.Recharged != nil {
		fmt.Fprintf(w, "    with the charge re-set to suit each value: %s\n", RangeText(p.Recharged, p.Unit))
	}
	if len(p.Sensitivities) == 0 {
		return
	}
	var parts []string
	for i, s := range p.Sensitivities {
		if i == levers {
			break
		}
		approx := ""
		if s.Coarse {
			approx = "≈"
		}
		parts = append(parts, fmt.Sprintf("%s %s%s", s.Where.Describe(), approx, signed(s.PerTenPercent)))
	}
	step := "+10 %"
	if p.AbsTemp {
		step = "+10 K"
	}
	fmt.Fprintf(w, "    biggest levers (change of margin use for %s): %s\n", step, strings.Join(parts, "; "))
}

// RangeText says in words what a feasible range is and what ends it.
func RangeText(r *guide.Range, unit string) string {
	// Ends and the values searched keep their trailing zeros: a charge
	// range's 0.150 kg, printed 0.15 kg, read as another figure than the
	// margin table's 0.110–0.150 kg for the same end.
	v := func(x float64) string { return valueZeros(x, unit) }
	if r == nil {
		return "range not searched"
	}
	if !r.Feasible {
		s := "no value searched keeps every margin"
		if r.Reason != "" {
			s = r.Reason
		}
		if b := r.Best; b != nil {
			s += fmt.Sprintf("; closest at %s, where %s uses %s of its limit", v(b.Value), b.Limit.Describe(), sig(b.Use, 3))
		}
		return s
	}
	end := func(b *guide.Bound, side string) string {
		if b.Note != "" {
			return fmt.Sprintf("%s (%s: %s; note: %s%s)", v(b.Value), side, b.Reason, b.Note, switchText(b, v))
		}
		return fmt.Sprintf("%s (%s: %s)", v(b.Value), side, b.Reason)
	}
	var s string
	switch {
	case r.Low.Unbounded && r.High.Unbounded:
		s = fmt.Sprintf("keeps every margin at every value searched, %s to %s", v(r.Low.Value), v(r.High.Value))
	case r.Low.Unbounded:
		s = fmt.Sprintf("keeps every margin up to %s, with no limit down to %s (the farthest searched)", end(r.High, "above"), v(r.Low.Value))
	case r.High.Unbounded:
		s = fmt.Sprintf("keeps every margin from %s, with no limit up to %s (the farthest searched)", end(r.Low, "below"), v(r.High.Value))
	default:
		s = fmt.Sprintf("keeps every margin from %s to %s", end(r.Low, "below"), end(r.High, "above"))
	}
	// An unbounded end's note, which end() does not show.
	for _, b := range []*guide.Bound{r.Low, r.High} {
		if b.Unbounded && b.Note != "" {
			s += fmt.Sprintf("; note at %s: %s%s", v(b.Value), b.Note, switchText(b, v))
		}
	}
	if !r.Contains {
		if r.Stop != "" {
			s += "; the value as written is outside: " + r.Reason
		} else {
			s += fmt.Sprintf("; the value as written is outside: %s uses %s of its limit", r.Limit.Describe(), sig(r.Use, 3))
		}
	}
	return s
}

// switchText says where a range end's cases would switch saturation state.
func switchText(b *guide.Bound, v func(float64) string) string {
	if b.Switch == 0 {
		return ""
	}
	if b.Own {
		return fmt.Sprintf("; the first would switch at about %s", v(b.Switch))
	}
	return fmt.Sprintf("; the first would switch at about %s, beyond which the range assumes the state of the value as written", v(b.Switch))
}

// ValueIn formats an SI value in the unit it was written in, to three
// significant digits.
func ValueIn(si float64, unit string) string {
	if unit == "" {
		return sig(si, 3)
	}
	u, err := units.Parse(unit)
	if err != nil {
		return sig(si, 3)
	}
	return sig(u.FromSI(si), 3) + " " + unit
}

// valueZeros is ValueIn keeping trailing zeros (0.150 kg, 9.20 mm).
func valueZeros(si float64, unit string) string {
	if unit == "" {
		return sigZeros(si, 3)
	}
	u, err := units.Parse(unit)
	if err != nil {
		return sigZeros(si, 3)
	}
	return sigZeros(u.FromSI(si), 3) + " " + unit
}

func signed(v float64) string {
	s := sig(v, 2)
	if !strings.HasPrefix(s, "-") && s != "0" {
		s = "+" + s
	}
	return s
}

// fluidsText writes a loop's fluid ranking.
func fluidsText(w io.Writer, l guide.Loop, designUnit string) {
	fmt.Fprintf(w, "  fluids for loop %s, by the largest margin use each leaves (everything else as written):\n", l.Loop)
	var outside []string
	n := 0
	for _, f := range l.Fluids {
		if !f.Covers {
			outside = append(outside, f.Fluid)
			continue
		}
		n++
		name := f.Fluid
		if f.Safety != "" {
			name += " (" + f.Safety + ")"
		}
		if f.Current {
			name += " [in use]"
		}
		s := fmt.Sprintf("    %d. %s: ", n, name)
		if f.Stop != "" {
			s += f.Reason
		} else {
			s += fmt.Sprintf("use %s, %s", sig(f.Use, 3), f.Limit.Describe())
		}
		if f.SaturationPressure > 0 {
			s += fmt.Sprintf("; %s in case %s", pressureAs(f.SaturationPressure, designUnit), f.HottestCase)
			if f.DesignPressure > 0 {
				s += fmt.Sprintf(" against %s design (%s)", pressureAs(f.DesignPressure, designUnit), sig(f.PressureUse, 2))
			}
		}
		if c := f.Charge; c != nil && !math.IsInf(c.Low, 0) {
			if c.Low > c.High {
				s += "; no charge suits every case"
			} else {
				s += "; charge " + sigRange(c.Low, c.High, 3) + " kg"
			}
		}
		fmt.Fprintln(w, s)
	}
	if len(outside) > 0 {
		fmt.Fprintf(w, "    range not covering the cases: %s\n", strings.Join(outside, ", "))
	}
}
