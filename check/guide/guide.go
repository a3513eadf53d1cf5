package guide

import (
	"context"
	"errors"
	"runtime"
	"slices"
	"sync"

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
}

// Guidance says what to change in a design: the feasible range and the
// sensitivities of each parameter, the acceptable charge of each loop and,
// when asked for, how the other working fluids would fare.
type Guidance struct {
	// Message says why there is no guidance (a file with errors).
	Message string `json:"message,omitempty"`
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
}

// Param is one parameter's guidance.
type Param struct {
	Param string  `json:"param"`
	Value float64 `json:"value"` // SI
	// Unit is the unit the value was written in (for an expression, the SI
	// unit of its dimension); ranges are shown and sensitivities given per
	// this unit.
	Unit string `json:"unit,omitempty"`
	// Influences is false for a parameter no estimate depends on (a label,
	// a coordinate used only by geometry checks): it has no range.
	Influences bool `json:"influences"`
	// Range is the feasible range, other parameters as written.
	Range *Range `json:"range,omitempty"`
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
	keep       func(Where) bool
	sem        chan struct{}
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
	workers := opts.Workers
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	gd := &guider{ctx: ctx, m: m, full: opts.Flow, keep: opts.Margins, sem: make(chan struct{}, workers)}
	gd.full.Workers, gd.full.Cancel, gd.full.Sweep = 1, ctx.Done(), nil
	gd.fast = gd.full
	gd.fast.NoTilt = true
	var todo []*lang.Param
	g.Params = make([]Param, 0, len(m.Params))
	for _, p := range m.Params {
		if opts.Params != nil && !slices.Contains(opts.Params, p.Name) {
			continue
		}
		g.Params = append(g.Params, Param{Param: p.Name, Value: p.Value.SI, Unit: displayUnit(p)})
		todo = append(todo, p)
	}
	// The design as written, in full and, for the searches, without the
	// tilt search; the first on every worker (its cases in parallel) while
	// nothing else runs.
	baseOpts := gd.full
	baseOpts.Workers = workers
	var base, fast *flow.Result
	var err, errFast error
	var wg sync.WaitGroup
	if !gd.full.NoTilt && len(todo) > 0 {
		wg.Add(1)
		go func() {
			defer wg.Done()
			fast, errFast = flow.Estimate(m, gd.fast)
		}()
	}
	if base = opts.Base; base == nil {
		base, err = flow.Estimate(m, baseOpts)
	}
	wg.Wait()
	if err == nil {
		err = errFast
	}
	if cerr := ctx.Err(); cerr != nil {
		return nil, cerr
	}
	if err != nil {
		return nil, err
	}
	if fast == nil {
		fast = base
	}
	s0, ms0 := summarize(base, 0, gd.keep)
	f0, _ := summarize(fast, 0, gd.keep)
	g.Use, g.Limit = s0.Use, s0.Limit
	if s0.Stop != nil {
		g.Stop = s0.Stop.Kind
	}
	for i, p := range todo {
		if !used(m, p.Name) || !p.Value.Set {
			continue
		}
		wg.Add(1)
		go func() {
			defer wg.Done()
			gd.param(&g.Params[i], p, s0, f0, ms0)
		}()
	}
	for _, l := range m.Loops {
		lg := Loop{Loop: l.Name}
		if lr := base.LoopOf(m, l); lr != nil {
			lg.Charge = chargeGuide(l, lr, base, gd.keep)
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
	return g, nil
}

// used reports whether any expression names the parameter.
func used(m *lang.Model, name string) bool {
	for _, r := range m.Refs {
		if r.Kind == lang.RefParam && !r.IsDecl && r.Name == name {
			return true
		}
	}
	return false
}

// at estimates the design with parameter p set to x (SI), with the options
// o (full or fast), one estimate per worker at a time.
func (gd *guider) at(p *lang.Param, x float64, o *flow.Options) (Sample, margins) {
	if gd.ctx.Err() != nil {
		return Sample{X: x, Stop: &Stop{Kind: StopError, Message: "cancelled"}}, nil
	}
	v, err := gd.m.With(lang.Override{Name: p.Name, Value: units.Quantity{SI: x, Dim: p.Dim, AbsTemp: p.AbsTemp}})
	if st := invalid(v, err); st != nil {
		return Sample{X: x, Stop: st}, nil
	}
	gd.sem <- struct{}{}
	res, err := flow.Estimate(v, *o)
	<-gd.sem
	if err != nil {
		return Sample{X: x, Stop: &Stop{Kind: StopError, Message: err.Error()}}, nil
	}
	return summarize(res, x, gd.keep)
}

// param fills in one parameter's sensitivities and, when it influences the
// estimate, its feasible range. The range is searched without the tilt
// search (s0 and f0 are the design as written with and without it); its
// ends are then checked with it, and only if the tilt margin fails there,
// or at the value as written, is the search run again with it.
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
	full := func(x float64) Sample { s, _ := gd.at(p, x, &gd.full); return s }
	fast := func(x float64) Sample { s, _ := gd.at(p, x, &gd.fast); return s }
	var r Range
	var ok bool
	if gd.full.NoTilt || f0.Feasible() != s0.Feasible() {
		r, ok = findRange(gd.ctx, full, ax, s0)
	} else {
		r, ok = findRange(gd.ctx, fast, ax, f0)
		if ok && r.Feasible && !gd.endsHold(full, r) {
			r, ok = findRange(gd.ctx, full, ax, s0)
		}
	}
	if !ok {
		return
	}
	r.Use, r.Limit, r.Stop = s0.Use, s0.Limit, ""
	if s0.Stop != nil {
		r.Stop, r.Limit = s0.Stop.Kind, Where{Case: s0.Stop.Case}
		if !r.Feasible || r.Reason == "" {
			r.Reason = s0.Stop.Message
		}
	}
	out.Range = &r
}

// endsHold checks both ends of a range with the full estimate, at once.
func (gd *guider) endsHold(full eval, r Range) bool {
	var lo, hi Sample
	var wg sync.WaitGroup
	wg.Add(1)
	go func() {
		defer wg.Done()
		lo = full(r.Low.Value)
	}()
	hi = full(r.High.Value)
	wg.Wait()
	return lo.Feasible() && hi.Feasible()
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
