// Package suggest turns the design guidance into edits: for a margin
// finding, the value a top-level parameter (or a loop's charge) can be set
// to for the finding to go away — the nearest value inside its feasible
// range, rounded to a round step — each checked by checking the variant.
package suggest

import (
	"context"
	"fmt"
	"math"
	"sort"
	"strconv"

	"circa/check"
	"circa/check/flow"
	"circa/check/guide"
	"circa/lang"
	"circa/units"
)

// marginOf maps a margin finding's rule to the margin it reports.
var marginOf = map[string]string{
	flow.RuleExitQuality: flow.MarginExitQuality, flow.RuleDryout: flow.MarginExitQuality,
	flow.RuleCHF: flow.MarginCHF, flow.RuleFlooding: flow.MarginFlooding, flow.RuleWall: flow.MarginWall,
	flow.RuleJunction: flow.MarginJunction, flow.RulePressure: flow.MarginPressure, flow.RuleCondenser: flow.MarginCondenser,
	flow.RuleCharge: flow.MarginCharge, flow.RuleHead: flow.MarginHead, flow.RuleTilt: flow.MarginTilt,
}

// MaxTiltChecks bounds the candidates a tilt-margin finding's fixes are
// checked with: each check runs the tilt search, some tens of estimates,
// where another margin's check is one estimate per case.
const MaxTiltChecks = 6

// IsMargin reports whether a finding is a margin the guidance can act on.
func IsMargin(d lang.Diagnostic) bool {
	_, ok := marginOf[d.Rule]
	return ok && d.Severity <= lang.Warning
}

// Options adjust the suggestions.
type Options struct {
	// Flow are the estimate's options; the tilt search is left out, except
	// for a tilt-margin finding, whose fixes are searched and checked with
	// it.
	Flow flow.Options
	// Workers bounds the estimates run at once (0: GOMAXPROCS).
	Workers int
	// Max bounds the fixes per finding (0: 3).
	Max int
}

// target is the margin a finding reports: its rule, its margin, its loop
// and (when it concerns one) its component.
type target struct {
	rule, margin string
	loop         *lang.Loop
	component    string
	loc          lang.Location
}

// locate finds the loop and component of a margin finding from its
// location.
func locate(m *lang.Model, d lang.Diagnostic) (target, bool) {
	mg, ok := marginOf[d.Rule]
	if !ok {
		return target{}, false
	}
	t := target{rule: d.Rule, margin: mg, loc: d.Loc}
	for _, l := range m.Loops {
		for _, c := range l.Components {
			if c.NameLoc() == d.Loc {
				t.loop, t.component = l, c.Name
				return t, true
			}
		}
	}
	for _, l := range m.Loops {
		if l.NameLoc() == d.Loc || l.Loc() == d.Loc || (l.Charge.Set && l.Charge.Loc() == d.Loc) || len(m.Loops) == 1 {
			t.loop = l
			return t, true
		}
	}
	return target{}, false
}

// keep says which margins the finding covers: its margin in its loop (at
// its component) in every case.
func (t target) keep(w guide.Where) bool {
	return w.Margin == t.margin && w.Loop == t.loop.Name && (t.component == "" || w.Component == t.component)
}

// candidate is one value to try: a parameter's or a loop's charge.
type candidate struct {
	param  *lang.Param // nil for the charge
	loop   *lang.Loop  // the charge's loop
	value  float64     // SI
	text   string      // as it is written into the file
	change float64     // relative change from the value as written
	every  bool        // from the range in which every margin holds
}

// Fixes returns quick fixes for the margin finding d of m: setting a
// parameter or a loop's charge to the nearest round value inside its
// feasible range — where every margin holds when there is one, else where
// the finding's margin does — each kept only if checking the variant (the
// tilt search left out, unless the finding is the tilt margin's: then at
// most MaxTiltChecks candidates are checked, with it) no longer reports
// the finding and reports no more errors. A parameter that leaves the loop short of charge, or with too
// much, gets the charge set in the same fix when that settles it. every,
// when not nil, is m's guidance for every margin, computed with the same
// options. It returns nil for a finding that is not a margin's, and ctx's
// error when cancelled.
func Fixes(ctx context.Context, m *lang.Model, d lang.Diagnostic, every *guide.Guidance, o Options) ([]lang.Fix, error) {
	t, ok := locate(m, d)
	if !ok || !IsMargin(d) {
		return nil, nil
	}
	tilt := t.margin == flow.MarginTilt
	o.Flow.NoTilt, o.Flow.Sweep = !tilt, nil
	maxFixes := o.Max
	if maxFixes <= 0 {
		maxFixes = 3
	}
	var err error
	if every == nil {
		if every, err = guide.Compute(ctx, m, guide.Options{Flow: o.Flow, Workers: o.Workers, NoOwnState: true}); err != nil {
			return nil, err
		}
	}
	cands := candidates(m, every, true)
	own, err := guide.Compute(ctx, m, guide.Options{Flow: o.Flow, Workers: o.Workers, Margins: t.keep, NoOwnState: true})
	if err != nil {
		return nil, err
	}
	cands = append(cands, candidates(m, own, false)...)
	sort.SliceStable(cands, func(i, j int) bool {
		if cands[i].every != cands[j].every {
			return cands[i].every
		}
		return cands[i].change < cands[j].change
	})
	base := check.RunReport(m, check.Options{NoTilt: !tilt})
	baseErrors := errorsIn(base.Diagnostics)
	var out []lang.Fix
	tried := map[string]bool{}
	for _, c := range cands {
		if len(out) == maxFixes || tilt && len(tried) == MaxTiltChecks {
			break
		}
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		key := c.text + "\x00" + c.name()
		if tried[key] {
			continue
		}
		tried[key] = true
		set := []candidate{c}
		v, rep := verify(m, set, tilt)
		if v == nil {
			continue
		}
		if c.param != nil && reports(rep, flow.RuleCharge, lang.Location{}) {
			// The parameter moves the liquid: try the charge the variant
			// needs with it.
			if ch, ok := chargeFor(ctx, v, t.loop.Name, o); ok {
				if v2, rep2 := verify(m, append(set, ch), tilt); v2 != nil && !reports(rep2, flow.RuleCharge, lang.Location{}) {
					set, rep = append(set, ch), rep2
				}
			}
		}
		if reports(rep, t.rule, t.loc) || errorsIn(rep.Diagnostics) > baseErrors {
			continue
		}
		out = append(out, fixOf(set, t))
	}
	return out, nil
}

func (c candidate) name() string {
	if c.param != nil {
		return c.param.Name
	}
	return "charge of loop " + c.loop.Name
}

// candidates lists the values to try from one guidance: each parameter
// and charge whose value as written lies outside a feasible range.
func candidates(m *lang.Model, g *guide.Guidance, every bool) []candidate {
	var out []candidate
	if g == nil {
		return nil
	}
	for _, gp := range g.Params {
		p := paramNamed(m, gp.Param)
		if p == nil || !gp.Influences {
			continue
		}
		if v, text, ok := nearestInside(gp.Value, gp.Range, gp.Unit); ok {
			out = append(out, candidate{param: p, value: v, text: text, change: relChange(v, gp.Value), every: every})
		}
	}
	for _, gl := range g.Loops {
		l := loopNamed(m, gl.Loop)
		if l == nil || gl.Charge == nil || !l.Charge.Set {
			continue
		}
		if v, text, ok := nearestInside(gl.Charge.Value, gl.Charge.Range, chargeUnit(gl.Charge)); ok {
			out = append(out, candidate{loop: l, value: v, text: text, change: relChange(v, gl.Charge.Value), every: every})
		}
	}
	return out
}

func relChange(v, was float64) float64 {
	if was == 0 {
		return math.Abs(v)
	}
	return math.Abs(v-was) / math.Abs(was)
}

// chargeFor returns the charge of the loop that the variant v accepts in
// every case, nearest to its charge, when there is one.
func chargeFor(ctx context.Context, v *lang.Model, loop string, o Options) (candidate, bool) {
	g, err := guide.Compute(ctx, v, guide.Options{Flow: o.Flow, Workers: o.Workers, Params: []string{}, NoOwnState: true})
	if err != nil {
		return candidate{}, false
	}
	for _, gl := range g.Loops {
		l := loopNamed(v, gl.Loop)
		if gl.Loop != loop || gl.Charge == nil || l == nil || !l.Charge.Set {
			continue
		}
		if x, text, ok := nearestInside(gl.Charge.Value, gl.Charge.Range, chargeUnit(gl.Charge)); ok {
			return candidate{loop: l, value: x, text: text}, true
		}
	}
	return candidate{}, false
}

// verify resolves m with the candidates' values and checks it (with the
// tilt search when tilt is set). The model is nil when the values do not
// resolve.
func verify(m *lang.Model, set []candidate, tilt bool) (*lang.Model, *check.Report) {
	var ovs []lang.Override
	for _, c := range set {
		if c.param != nil {
			ovs = append(ovs, lang.Override{Name: c.param.Name, Value: units.Quantity{SI: c.value, Dim: c.param.Dim, AbsTemp: c.param.AbsTemp}, Text: c.text})
		}
	}
	v, err := m.With(ovs...)
	if err != nil {
		return nil, nil
	}
	for _, c := range set {
		if c.param == nil {
			if l := loopNamed(v, c.loop.Name); l != nil {
				l.Charge.SI = c.value
			}
		}
	}
	if errorsIn(v.Diags) > errorsIn(m.Diags) {
		return nil, nil
	}
	return v, check.RunReport(v, check.Options{NoTilt: !tilt})
}

// reports says whether the report has a finding of rule at loc (anywhere,
// for a zero loc) at warning or above.
func reports(rep *check.Report, rule string, loc lang.Location) bool {
	for _, d := range rep.Diagnostics {
		if d.Rule == rule && d.Severity <= lang.Warning && (loc == lang.Location{} || d.Loc == loc) {
			return true
		}
	}
	return false
}

func errorsIn(ds []lang.Diagnostic) int {
	n := 0
	for _, d := range ds {
		if d.Severity == lang.Error {
			n++
		}
	}
	return n
}

// fixOf writes the edit of a set of values: each parameter's expression
// and each charge replaced by the value.
func fixOf(set []candidate, t target) lang.Fix {
	var f lang.Fix
	var parts []string
	for _, c := range set {
		var loc lang.Location
		if c.param != nil {
			loc = lang.Location{File: c.param.File(), Span: c.param.Expr.Span()}
			parts = append(parts, fmt.Sprintf("%s to %s", c.param.Name, c.text))
		} else {
			loc = c.loop.Charge.Loc()
			parts = append(parts, fmt.Sprintf("the charge of loop %s to %s", c.loop.Name, c.text))
		}
		f.Edits = append(f.Edits, lang.Edit{Loc: loc, NewText: c.text})
	}
	f.Title = "Set " + parts[0]
	if len(parts) > 1 {
		f.Title += " and " + parts[1]
	}
	if set[0].every {
		f.Title += " (estimate: every margin holds)"
	} else {
		w := guide.Where{Margin: t.margin, Component: t.component}
		f.Title += " (estimate: " + w.Describe() + " holds in every case)"
	}
	return f
}

// nearestInside returns the value inside r nearest to x, rounded to a
// round step (1, 2 or 5 times a power of ten) of unit as coarse as keeps
// it inside, with its text; false when x is inside r already or r is
// empty.
func nearestInside(x float64, r *guide.Range, unit string) (float64, string, bool) {
	if r == nil || !r.Feasible || r.Contains || r.Low == nil || r.High == nil {
		return 0, "", false
	}
	u := units.Unit{Dim: units.Dim{}}
	if unit != "" {
		var err error
		if u, err = units.Parse(unit); err != nil {
			return 0, "", false
		}
	}
	lo, hi := u.FromSI(r.Low.Value), u.FromSI(r.High.Value)
	if lo > hi {
		lo, hi = hi, lo
	}
	if r.Low.Unbounded {
		lo = math.Inf(-1)
	}
	if r.High.Unbounded {
		hi = math.Inf(1)
	}
	xu := u.FromSI(x)
	var t float64
	up := xu < lo
	switch {
	case up:
		t = lo
	case xu > hi:
		t = hi
	default:
		return 0, "", false
	}
	if math.IsInf(t, 0) || math.IsNaN(t) {
		return 0, "", false
	}
	v, ok := roundInside(t, lo, hi, up)
	if !ok {
		return 0, "", false
	}
	text := strconv.FormatFloat(v, 'g', -1, 64)
	if unit != "" {
		text += " " + unit
	}
	return u.ToSI(v), text, true
}

// roundSlack bounds how far rounding may move a value, as a fraction of
// it: 9.2 mm becomes 10 mm, 1.218 m becomes 1.3 m.
const roundSlack = 0.1

// roundInside rounds t (an end of [lo, hi]) towards the inside, up from
// the low end or down from the high end, to the coarsest round step that
// keeps it in [lo, hi] and moves it by at most roundSlack of itself.
func roundInside(t, lo, hi float64, up bool) (float64, bool) {
	mag := math.Abs(t)
	if mag == 0 {
		mag = math.Max(math.Abs(lo), math.Abs(hi))
		if math.IsInf(mag, 0) || mag == 0 {
			return t, true
		}
	}
	step := math.Pow(10, math.Floor(math.Log10(mag)))
	for range 15 {
		for _, f := range []float64{1, 0.5, 0.2} {
			s := step * f
			var v float64
			if up {
				v = math.Ceil(t/s-1e-9) * s
			} else {
				v = math.Floor(t/s+1e-9) * s
			}
			// Spell the value as the step does: 1.3, not 1.3000000000000003.
			v, _ = strconv.ParseFloat(strconv.FormatFloat(v, 'f', decimals(s), 64), 64)
			if v >= lo && v <= hi && v != 0 && math.Abs(v-t) <= roundSlack*mag {
				return v, true
			}
		}
		step /= 10
	}
	return t, true
}

// decimals is how many decimals a step needs.
func decimals(s float64) int {
	d := int(math.Ceil(-math.Log10(s) - 1e-9))
	return max(d, 0)
}

func paramNamed(m *lang.Model, name string) *lang.Param {
	for _, p := range m.Params {
		if p.Name == name {
			return p
		}
	}
	return nil
}

func loopNamed(m *lang.Model, name string) *lang.Loop {
	for _, l := range m.Loops {
		if l.Name == name {
			return l
		}
	}
	return nil
}

// chargeUnit is the unit a charge is shown in: as written, else kg.
func chargeUnit(p *guide.Param) string {
	if p.Unit != "" {
		return p.Unit
	}
	return "kg"
}
