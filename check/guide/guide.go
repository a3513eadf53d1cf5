package guide

import (
	"context"
	"errors"
	"fmt"
	"math"
	"runtime"
	"slices"
	"strconv"
	"strings"
	"sync"
	"sync/atomic"

	"circa/check"
	"circa/check/flow"
	"circa/lang"
	"circa/units"
)

// Options adjust the guidance.
type Options struct {
	// Flow are the estimate's options (case, methods, tilt); its Workers
	// and Cancel are set by the guidance.
	Flow flow.Options
	// Workers bounds the estimates run at once (0: GOMAXPROCS).
	Workers int
	// Params restricts the parameters given a range and sensitivities to
	// those named (nil: every top-level parameter).
	Params []string
	// Margins says which margins must hold for a value to be feasible (nil:
	// every margin): a quick fix for one finding asks for its margin alone.
	Margins func(Where) bool
	// Fluids ranks every built-in fluid (and each table the file names) in
	// each loop: one more estimate per fluid.
	Fluids bool
	// Base, when not nil, is the estimate of the model as written with the
	// same Flow options (sweep points are ignored), so that it is not
	// computed again.
	Base *flow.Result
	// NoOwnState leaves out the estimate of each range end in its own
	// saturation state where it differs from the pinned one: the end's note
	// then only says that it differs. Quick fixes, which check each
	// candidate as the file would have it, set it.
	NoOwnState bool
}

// Guidance says what to change in a design: the feasible range and the
// sensitivities of each parameter, the acceptable charge of each loop and,
// when asked for, how the other working fluids would fare.
type Guidance struct {
	// Message says why there is no guidance (a file with errors).
	Message string `json:"message,omitempty"`
	// Skipped says why no parameter was searched: more of them reach the
	// estimate than the guidance searches (MaxSearched, MaxWork), or
	// searching them would take more steady states than MaxStates.
	Skipped string `json:"skipped,omitempty"`
	// Use and Limit are the largest margin use of the design as written and
	// where it is; Stop says why the design has no usable estimate.
	Use   float64 `json:"use"`
	Limit Where   `json:"limit"`
	Stop  string  `json:"stop,omitempty"`
	// Params holds every top-level parameter, in file order.
	Params []Param `json:"params"`
	// Loops holds each loop's charge range and fluid ranking.
	Loops []Loop `json:"loops"`
	// Levers are the sensitivities of every parameter, largest change per
	// 10 % first.
	Levers []Lever `json:"levers,omitempty"`
	// Estimates counts the estimates the guidance ran (the design as
	// written not counted).
	Estimates int `json:"estimates"`
}

// Param is one parameter's guidance.
type Param struct {
	Param string  `json:"param"`
	Value float64 `json:"value"` // SI
	// Unit is the unit the value was written in (for an expression, the SI
	// unit of its dimension); ranges are shown and sensitivities given per
	// this unit.
	Unit string `json:"unit,omitempty"`
	// AbsTemp marks an absolute temperature: its sensitivities' change
	// "per 10 %" is per 10 K.
	AbsTemp bool `json:"absolute_temperature,omitempty"`
	// Influences is false for a parameter no estimate depends on (a label,
	// a coordinate used only by geometry checks): it has no range.
	Influences bool `json:"influences"`
	// Skipped marks a parameter that reaches the estimate but was not
	// searched (Guidance.Skipped says why): it has no range.
	Skipped bool `json:"skipped,omitempty"`
	// Range is the feasible range, other parameters as written.
	Range *Range `json:"range,omitempty"`
	// Recharged is, where the charge margin ends or blocks Range, the range
	// with the loop's charge re-set to suit each value: every other margin
	// holds and some charge suits every case.
	Recharged *Range `json:"range_recharged,omitempty"`
	// Sensitivities are the margins' changes with the parameter, largest
	// first.
	Sensitivities []Sensitivity `json:"sensitivities,omitempty"`
}

// Loop is one loop's charge range and fluid ranking.
type Loop struct {
	Loop string `json:"loop"`
	// Charge is the fill charge's guidance (when the loop states one).
	Charge *Param `json:"charge,omitempty"`
	// Fluids ranks the built-in fluids and the file's tables by the
	// limiting margin they leave (Options.Fluids).
	Fluids []Fluid `json:"fluids,omitempty"`
}

var errNoModel = errors.New("no model")

// guider runs the estimates of one guidance.
type guider struct {
	ctx context.Context
	m   *lang.Model
	// full is the estimate as asked for; fast leaves out the tilt search,
	// which only adds the tilt margin, for the range searches.
	full, fast flow.Options
	// own is full without the saturation states pinned: each variant in
	// the state its own liquid column gives it under saturation_state
	// auto; ownFast leaves out its tilt search, as fast does full's.
	own, ownFast flow.Options
	// noOwn is Options.NoOwnState.
	noOwn bool
	// plain counts the margins of the guidance (Options.Margins), the
	// charge margin as written among them; recharged counts, instead of
	// the charge margin, whether some charge suits every case.
	plain, recharged func(Where) bool
	base             *flow.Result
	sem              chan struct{}
	estimates        atomic.Int64
	// points are where the cases with a profile or an envelope were worst
	// in the design as written (nil when there are none).
	points fixed
}

// Compute works out the guidance for m. A model with errors gets none,
// with a message saying so. It returns ctx's error when cancelled, and an
// error for an unusable request (an unknown case or method).
func Compute(ctx context.Context, m *lang.Model, opts Options) (*Guidance, error) {
	if m == nil {
		return nil, errNoModel
	}
	g := &Guidance{Params: []Param{}, Loops: []Loop{}}
	for _, d := range m.Diags {
		if d.Severity == lang.Error {
			g.Message = "the file has errors: no design guidance until they are fixed"
			return g, nil
		}
	}
	if v, err := m.With(); err == nil {
		if _, bad := structuralError(v); bad {
			g.Message = "the file has errors: no design guidance until they are fixed"
			return g, nil
		}
	}
	workers := opts.Workers
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	gd := &guider{ctx: ctx, m: m, full: opts.Flow, sem: make(chan struct{}, workers)}
	user := opts.Margins
	gd.plain = func(w Where) bool { return w.Margin != MarginChargeWindow && (user == nil || user(w)) }
	gd.recharged = func(w Where) bool {
		if w.Margin == MarginChargeWindow {
			return user == nil || user(Where{Loop: w.Loop, Margin: flow.MarginCharge})
		}
		return w.Margin != flow.MarginCharge && (user == nil || user(w))
	}
	gd.full.Workers, gd.full.Cancel, gd.full.Sweep = 1, ctx.Done(), nil
	gd.fast = gd.full
	gd.fast.NoTilt = true
	var todo []*lang.Param
	g.Params = make([]Param, 0, len(m.Params))
	for _, p := range m.Params {
		if opts.Params != nil && !slices.Contains(opts.Params, p.Name) {
			continue
		}
		g.Params = append(g.Params, Param{Param: p.Name, Value: p.Value.SI, Unit: displayUnit(p), AbsTemp: p.AbsTemp})
		todo = append(todo, p)
	}
	// The design as written, on every worker (its cases in parallel) while
	// nothing else runs. Without the tilt search it is the same less its
	// tilt margins.
	baseOpts := gd.full
	baseOpts.Workers = workers
	base := opts.Base
	if base == nil {
		var err error
		if base, err = flow.Estimate(m, baseOpts); err != nil {
			return nil, err
		}
	}
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	gd.base = base
	// Every variant is estimated in the saturation state the design as
	// written got, case by case: under saturation_state auto a variant
	// whose liquid column crosses the switch would otherwise change state
	// and its margins jump there, a step a range search can take for a
	// limit. The ends found are then checked in their own states
	// (stateNotes).
	gd.own, gd.noOwn = gd.full, opts.NoOwnState
	gd.own.Pinned = nil
	gd.ownFast = gd.own
	gd.ownFast.NoTilt = true
	if gd.full.Pinned == nil {
		pins := flow.PinnedStates(base)
		gd.full.Pinned, gd.fast.Pinned = pins, pins
	}
	var wg sync.WaitGroup
	if needed(m) {
		gd.points = fixed{}.with(base)
	}
	s0, ms0 := summarize(base, 0, gd.plain)
	f0, _ := summarize(base, 0, func(w Where) bool { return w.Margin != flow.MarginTilt && gd.plain(w) })
	g.Use, g.Limit = s0.Use, s0.Limit
	if s0.Stop != nil {
		g.Stop = s0.Stop.Kind
	}
	// A parameter that reaches no field of the estimate is inert whatever
	// its value: only the others are searched.
	reach := m.ParamsReaching()
	var search []int
	for i, p := range todo {
		if reach[p.Name] && p.Value.Set {
			search = append(search, i)
		}
	}
	if limit := searchLimit(m); len(search) > limit {
		g.Skipped = skipped(len(search), limit)
	} else if why := tooCostly(m, len(search), workOf(base, gd.points, !gd.full.NoTilt)); why != "" {
		g.Skipped = why
	}
	if g.Skipped != "" {
		for _, i := range search {
			g.Params[i].Influences, g.Params[i].Skipped = true, true
		}
		search = nil
	}
	for _, i := range search {
		p := todo[i]
		wg.Add(1)
		go func() {
			defer wg.Done()
			gd.param(&g.Params[i], p, s0, f0, ms0)
		}()
	}
	for _, l := range m.Loops {
		lg := Loop{Loop: l.Name}
		if lr := base.LoopOf(m, l); lr != nil {
			lg.Charge = chargeGuide(l, lr, base, gd.plain)
		}
		g.Loops = append(g.Loops, lg)
	}
	if opts.Fluids {
		gd.fluids(g)
	}
	wg.Wait()
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	g.Levers = levers(g.Params)
	g.Estimates = int(gd.estimates.Load())
	return g, nil
}

// MaxSearched is the most parameters the guidance searches, each with
// some tens of estimates; MaxWork bounds that number times the file's
// parameters, which every estimate resolves again. Beyond either, no
// parameter is searched, so that the guidance of a large file ends in time
// proportional to its size.
const (
	MaxSearched = 200
	MaxWork     = 2_000_000
)

// searchLimit is the most parameters the guidance searches in m.
func searchLimit(m *lang.Model) int {
	n := MaxWork / max(len(m.Params), 1)
	return max(min(n, MaxSearched), 1)
}

// skipped says why n parameters that reach the estimate were not searched.
func skipped(n, limit int) string {
	return fmt.Sprintf("guidance skipped: %s parameters reach the estimate; the limit for a file of this size is %s — use --set or --vary to study a few",
		thousands(n), thousands(limit))
}

// thousands writes n with a comma between groups of three digits.
func thousands(n int) string {
	s := strconv.Itoa(n)
	for i := len(s) - 3; i > 0; i -= 3 {
		s = s[:i] + "," + s[i:]
	}
	return s
}

// mode is how a variant is evaluated: with which estimate options (full or
// fast; nil for the structural checks alone), whether the structural checks
// run too, and whether the cases with a profile or an envelope are held at
// fixed points (reduce, when not nil).
type mode struct {
	opts       *flow.Options
	structural bool
	reduce     fixed
	// keep says which margins count (nil: those of the guidance, plain).
	keep func(Where) bool
}

// at estimates the design with parameter p set to x (SI), in mode md, one
// estimate per worker at a time. It returns the sample, every margin's use
// and the estimate (nil when there is none).
func (gd *guider) at(p *lang.Param, x float64, md mode) (Sample, margins, *flow.Result) {
	if gd.ctx.Err() != nil {
		return Sample{X: x, Stop: &Stop{Kind: StopError, Message: "cancelled"}}, nil, nil
	}
	v, err := gd.m.With(lang.Override{Name: p.Name, Value: units.Quantity{SI: x, Dim: p.Dim, AbsTemp: p.AbsTemp}})
	if st := invalid(v, err); st != nil {
		return Sample{X: x, Stop: st}, nil, nil
	}
	gd.sem <- struct{}{}
	defer func() { <-gd.sem }()
	if md.structural {
		if d, bad := structuralError(v); bad {
			return Sample{X: x, Stop: &Stop{Kind: StopInvalid, Message: "the file is inconsistent at this value: " + d.Message()}}, nil, nil
		}
	}
	if md.opts == nil {
		// The structural checks alone.
		return Sample{X: x}, nil, nil
	}
	opts := *md.opts
	if md.reduce != nil {
		md.reduce.apply(v, opts.Case)
		opts.Case = ""
	}
	gd.estimates.Add(1)
	res, err := flow.Estimate(v, opts)
	if err != nil {
		return Sample{X: x, Stop: &Stop{Kind: StopError, Message: err.Error()}}, nil, nil
	}
	keep := md.keep
	if keep == nil {
		keep = gd.plain
	}
	s, ms := summarize(res, x, keep)
	return s, ms, res
}

// structuralError returns the first error of the structural checks
// (topology, geometry, directions) on v, a model of its own (the checks
// mark its silencers).
func structuralError(v *lang.Model) (lang.Diagnostic, bool) {
	for _, d := range check.Run(v, check.Options{SkipEstimates: true}) {
		if d.Severity == lang.Error {
			return d, true
		}
	}
	return lang.Diagnostic{}, false
}

// param fills in one parameter's sensitivities and, when it influences the
// estimate, its feasible range. The range is searched without the tilt
// search and the structural checks (s0 and f0 are the design as written
// with and without the tilt search), with the cases that have a profile or
// an envelope held at their worst points; its ends are then checked with
// the full estimate and the structural checks. Where an end fails, the
// search is run again with what failed there: the tilt search, the
// structural checks, or the points the end finds worst added; after two
// such rounds, with the full estimate throughout.
func (gd *guider) param(out *Param, p *lang.Param, s0, f0 Sample, ms0 margins) {
	x0 := p.Value.SI
	s0.X, f0.X = x0, x0
	ax := axis{x0: x0, scale: unitScale(out.Unit)}
	sens, influences := gd.sensitivities(p, out.Unit, ax, s0, ms0)
	out.Influences = influences
	if !influences {
		return
	}
	out.Sensitivities = sens
	r, ok := gd.rangeOf(p, ax, sens, s0, f0, gd.plain)
	if !ok {
		return
	}
	out.Range = &r
	if !chargeBound(r) {
		return
	}
	// The fill charge ends or blocks the range: the range again with the
	// charge re-set to suit each value.
	keep := gd.recharged
	rs0, _ := summarize(gd.base, x0, keep)
	rf0, _ := summarize(gd.base, x0, func(w Where) bool { return w.Margin != flow.MarginTilt && keep(w) })
	if rr, ok := gd.rangeOf(p, ax, sens, rs0, rf0, keep); ok {
		out.Recharged = &rr
	}
}

// chargeBound reports whether the charge margin ends a range, or limits
// the design where no value is feasible.
func chargeBound(r Range) bool {
	switch {
	case r.Feasible:
		return r.Low.Limit.Margin == flow.MarginCharge || r.High.Limit.Margin == flow.MarginCharge
	case r.Best != nil:
		return r.Best.Limit.Margin == flow.MarginCharge
	}
	return r.Limit.Margin == flow.MarginCharge
}

// rangeOf searches p's feasible range counting the margins keep counts (s0
// and f0 are the design as written with and without the tilt search).
func (gd *guider) rangeOf(p *lang.Param, ax axis, sens []Sensitivity, s0, f0 Sample, keep func(Where) bool) (Range, bool) {
	pts := gd.points
	search, start := mode{opts: &gd.fast, reduce: pts, keep: keep}, f0
	if f0.Feasible() != s0.Feasible() {
		search, start = mode{opts: &gd.full, reduce: pts, keep: keep}, s0
	}
	var r Range
	// checked are the full estimates of the last range's ends, when
	// they were checked.
	var checked [2]*flow.Result
	for round := 0; ; round++ {
		checked = [2]*flow.Result{}
		f := func(x float64) Sample { s, _, _ := gd.at(p, x, search); return s }
		var ok bool
		r, ok = findRange(gd.ctx, f, ax, start, foretell(sens, search.opts == &gd.full, keep, perLog(p)))
		if !ok {
			return r, false
		}
		exact := search.opts == &gd.full && search.structural && search.reduce == nil
		if exact || !r.Feasible {
			// A range the reduced search finds infeasible is so in full:
			// the full estimate only adds margins.
			break
		}
		ends, results := gd.ends(p, r, keep)
		if ends[0].Feasible() && ends[1].Feasible() {
			checked = results
			break
		}
		if round >= 2 || pts == nil && search.opts == &gd.full && search.structural {
			search, start = mode{opts: &gd.full, structural: true, keep: keep}, s0
			continue
		}
		next := mode{opts: search.opts, structural: search.structural, reduce: pts, keep: keep}
		for i, e := range ends {
			switch {
			case e.Feasible():
			case e.Stop != nil && e.Stop.Kind == StopInvalid:
				next.structural = true
			case e.Limit.Margin == flow.MarginTilt:
				next.opts = &gd.full
			case pts != nil:
				pts = pts.with(results[i])
				next.reduce = pts
			default:
				next.opts, next.structural = &gd.full, true
			}
		}
		search, start = next, f0
		if next.opts == &gd.full {
			start = s0
		}
	}
	if r.Feasible && gd.full.Pinned != nil {
		gd.stateNotes(p, ax, &r, checked, keep)
	}
	r.Use, r.Limit, r.Stop = s0.Use, s0.Limit, ""
	if s0.Stop != nil {
		r.Stop, r.Limit = s0.Stop.Kind, Where{Case: s0.Stop.Case}
		if !r.Feasible || r.Reason == "" {
			r.Reason = s0.Stop.Message
		}
	}
	return r, true
}

// perLog converts a change per 10 % of p into one per unit of the
// logarithm of its value.
func perLog(p *lang.Param) float64 {
	if t := tenth(p); t > 0 {
		return math.Abs(p.Value.SI) / t
	}
	return 0
}

// foretell returns, for each side, the search coordinate (the logarithm of
// the value's ratio to its own) at which the first margin reaches its limit
// along its slope, 0 when none does: the slope of a use along side dir is
// dir·perLog times its change per 10 % (perLog is 10, or for an absolute
// temperature the value over 10 K). The tilt margin is left out of a search
// without the tilt search.
func foretell(sens []Sensitivity, tilt bool, keep func(Where) bool, perLog float64) func(dir int) float64 {
	return func(dir int) float64 {
		best := 0.0
		for _, s := range sens {
			if !tilt && s.Margin == flow.MarginTilt || s.Use >= 1 || keep != nil && !keep(s.Where) {
				continue
			}
			if k := perLog * s.PerTenPercent * float64(dir); k > 0 {
				if du := (1 - s.Use) / k; best == 0 || du < best {
					best = du
				}
			}
		}
		return best
	}
}

// ends checks both ends of a range, at once: first with the structural
// checks alone, which are quick, then, when both pass, with the full
// estimate.
func (gd *guider) ends(p *lang.Param, r Range, keep func(Where) bool) ([2]Sample, [2]*flow.Result) {
	var out [2]Sample
	var res [2]*flow.Result
	xs := [2]float64{r.Low.Value, r.High.Value}
	both := func(md mode) {
		var wg sync.WaitGroup
		wg.Add(1)
		go func() {
			defer wg.Done()
			out[0], _, res[0] = gd.at(p, xs[0], md)
		}()
		out[1], _, res[1] = gd.at(p, xs[1], md)
		wg.Wait()
	}
	both(mode{structural: true})
	if out[0].Stop != nil || out[1].Stop != nil {
		return out, res
	}
	both(mode{opts: &gd.full, keep: keep})
	return out, res
}

// displayUnit is the unit a parameter was written in, else the SI unit of
// its dimension ("" for a bare number).
func displayUnit(p *lang.Param) string {
	if p.Value.Unit() != "" || p.Dim.IsZero() {
		return p.Value.Unit()
	}
	if cu := units.Common(p.Dim); len(cu) > 0 {
		return cu[0].Text
	}
	return ""
}

// unitScale is one of the unit a value was written in, in SI (1 for SI and
// bare numbers): the step about a value of zero.
func unitScale(unit string) float64 {
	if unit == "" {
		return 1
	}
	u, err := units.Parse(unit)
	if err != nil {
		return 1
	}
	if d := u.ToSI(1) - u.ToSI(0); d > 0 {
		return d
	}
	return 1
}

// stateNotes notes on each end of the feasible range r where a case's own
// liquid column would, under saturation_state auto, have it estimated in
// another saturation state than the pinned one of the design as written,
// and what the end gives in its own state. Where a margin fails there in
// its own state, the end is searched again beyond the switch in the
// variants' own states (beyond).
// checked are the ends' full estimates when the search has them.
func (gd *guider) stateNotes(p *lang.Param, ax axis, r *Range, checked [2]*flow.Result, keep func(Where) bool) {
	var wg sync.WaitGroup
	for i, b := range []*Bound{r.Low, r.High} {
		wg.Add(1)
		go func() {
			defer wg.Done()
			var own Sample
			var state string
			b.Note, own, state = gd.stateNote(p, b.Value, checked[i], keep)
			if b.Note == "" || gd.noOwn {
				return
			}
			var last float64
			last, b.Switch = gd.stateSwitch(p, b.Value)
			if !own.Feasible() && b.Switch != b.Value {
				// Searched without the tilt search, which only adds
				// the tilt margin, and the end checked with it; where
				// the check fails, searched again with it.
				pinned := *b
				gd.beyond(p, ax, 2*i-1, b, own, state, last, keep, &gd.ownFast)
				if !b.Own || !gd.ownFeasible(p, b.Value, keep) {
					*b = pinned
					gd.beyond(p, ax, 2*i-1, b, own, state, last, keep, &gd.own)
				}
			}
		}()
	}
	wg.Wait()
}

// ownSteps is how many equal steps (in search coordinates) the search
// beyond a state switch takes from the switch toward the end before
// closing the bracket by Brent's method: with the bracket's tolerance this
// keeps an end to about two dozen estimates.
const ownSteps = 6

// beyond searches again the end b on side dir (−1 low, +1 high), whose
// own-state estimate end fails, in the variants' own saturation states
// (the unpinned estimate) from the switch b.Switch outward: the pinned
// search's end past the switch assumes a state the variants' own liquid
// column would not choose, and a limit they meet in their own is a real
// one. Below the switch every variant's own state is the pinned one, so
// the range there is the pinned search's. It steps from the switch toward
// b.Value to the first infeasible own-state value and closes the bracket
// by Brent's method; where the own state fails just past the switch, the
// end is the switch. state is the state the end's cases would take.
func (gd *guider) beyond(p *lang.Param, ax axis, dir int, b *Bound, end Sample, state string, last float64, keep func(Where) bool, opts *flow.Options) {
	f := func(x float64) Sample { s, _, _ := gd.at(p, x, mode{opts: opts, keep: keep}); return s }
	u0, u1 := ax.coord(b.Switch), ax.coord(b.Value)
	in, inU := f(b.Switch), u0
	if !in.Feasible() {
		// The last value found before the switch: its own state there
		// is the pinned one, in which the range holds; between it and
		// the switch the own-state limit is closed to the tolerance.
		nb := boundOf(Sample{X: last}, in)
		if pre := f(last); pre.Feasible() {
			if lo, hi, ok := refine(gd.ctx, f, ax, dir, ax.coord(last), u0, pre, in); ok {
				nb, in = boundOf(lo, hi), hi
			}
		}
		nb.Switch, nb.Own = b.Switch, true
		nb.Reason += fmt.Sprintf(" in the %s state just past the switch of saturation state", state)
		what := "there is no usable estimate"
		if in.Stop == nil {
			what = fmt.Sprintf("%s uses %.3g of its limit", in.Limit.Describe(), in.Use)
		}
		nb.Note = fmt.Sprintf("the range ends at the switch of saturation state: just past it the variants' own liquid column has saturation_state auto take the %s state, in which %s", state, what)
		*b = nb
		return
	}
	out, outU := end, u1
	for k := 1; k < ownSteps; k++ {
		u := u0 + (u1-u0)*float64(k)/ownSteps
		s := f(ax.at(u, dir))
		if !s.Feasible() {
			out, outU = s, u
			break
		}
		in, inU = s, u
	}
	lo, hi, ok := refine(gd.ctx, f, ax, dir, inU, outU, in, out)
	if !ok {
		return
	}
	nb := boundOf(lo, hi)
	nb.Switch, nb.Own = b.Switch, true
	nb.Reason += fmt.Sprintf(" in the %s state the variants take beyond the switch of saturation state", state)
	note, _, _ := gd.stateNote(p, lo.X, nil, keep)
	if note == "" {
		note = "here every case keeps the state of the value as written"
	}
	nb.Note = note + fmt.Sprintf("; the range beyond the switch follows the %s state, each variant's own", state)
	*b = nb
}

// ownFeasible reports whether p at x keeps every counted margin in the full
// estimate of each variant's own saturation state.
func (gd *guider) ownFeasible(p *lang.Param, x float64, keep func(Where) bool) bool {
	s, _, _ := gd.at(p, x, mode{opts: &gd.own, keep: keep})
	return s.Feasible()
}

// stateNote is the note on one end at x ("" when every case keeps its
// state there), the end's own-state sample (when estimated) and the state
// the first changing case would take; res is the end's full estimate (nil:
// estimated here).
func (gd *guider) stateNote(p *lang.Param, x float64, res *flow.Result, keep func(Where) bool) (string, Sample, string) {
	if res == nil {
		_, _, res = gd.at(p, x, mode{opts: &gd.full, keep: keep})
	}
	if res == nil {
		return "", Sample{}, ""
	}
	// The cases that would change, grouped by the change.
	type change struct{ auto, pinned string }
	var order []change
	by := map[change][]string{}
	for _, l := range res.Loops {
		if l.Methods.Saturation != "auto" {
			continue
		}
		for _, c := range l.Cases {
			if c.Grid || c.SatState == "" || c.AutoState() == c.SatState {
				continue
			}
			if _, ok := gd.full.Pinned[flow.PinKey(l.Loop, c.Case)]; !ok {
				continue
			}
			k := change{c.AutoState(), c.SatState}
			if by[k] == nil {
				order = append(order, k)
			}
			by[k] = append(by[k], fmt.Sprintf("%s (%.2f K)", caseLabel(res, l.Loop, c.Case), c.ColumnShift))
		}
	}
	if len(order) == 0 {
		return "", Sample{}, ""
	}
	var what []string
	for _, k := range order {
		what = append(what, fmt.Sprintf("the liquid column's shift of saturation in %s would have saturation_state auto take the %s state, not the %s state of the value as written",
			strings.Join(by[k], ", "), k.auto, k.pinned))
	}
	if gd.noOwn {
		return "here " + strings.Join(what, "; "), Sample{}, order[0].auto
	}
	s, _, _ := gd.at(p, x, mode{opts: &gd.own, keep: keep})
	var own string
	switch {
	case s.Stop != nil:
		own = "no usable estimate: " + s.Stop.Message
	case s.Feasible():
		own = fmt.Sprintf("every margin holds (largest use %.3g, %s)", s.Use, s.Limit.Describe())
	default:
		own = fmt.Sprintf("%s uses %.3g of its limit", s.Limit.Describe(), s.Use)
	}
	return "here " + strings.Join(what, "; ") + "; in its own state " + own, s, order[0].auto
}

// switched reports whether a case of res, estimated in a pinned state,
// would take another under saturation_state auto.
func (gd *guider) switched(res *flow.Result) bool {
	for _, l := range res.Loops {
		if l.Methods.Saturation != "auto" {
			continue
		}
		for _, c := range l.Cases {
			if _, ok := gd.full.Pinned[flow.PinKey(l.Loop, c.Case)]; ok && !c.Grid && c.SatState != "" && c.AutoState() != c.SatState {
				return true
			}
		}
	}
	return false
}

// stateSwitch locates, by bisection between the value as written and the
// end x where a case's state would differ, about where the first does
// (to 1/1000 of the interval; the pinned estimates without the tilt
// search, whose column shifts are those of the full one): past it the
// range is the pinned state's. It returns the last value found before the
// switch and the first past it; x, x when an estimate fails.
func (gd *guider) stateSwitch(p *lang.Param, x float64) (float64, float64) {
	in, out := p.Value.SI, x
	for range 10 {
		mid := (in + out) / 2
		_, _, res := gd.at(p, mid, mode{opts: &gd.fast})
		if res == nil {
			return x, x
		}
		if gd.switched(res) {
			out = mid
		} else {
			in = mid
		}
	}
	return in, out
}

// caseLabel names a loop's case for a note ("C of loop L" when the
// estimate has several loops).
func caseLabel(res *flow.Result, loop, cs string) string {
	if len(res.Loops) > 1 {
		return cs + " of loop " + loop
	}
	return cs
}
