package flow

import (
	"errors"
	"fmt"
	"math"
	"runtime"
	"strings"
	"sync"

	"circa/check/correlate"
	"circa/check/fluid"
	"circa/check/geom"
	"circa/lang"
)

// Options adjust an estimate.
type Options struct {
	// Case restricts the estimate to one case ("" for every case).
	Case string
	// Void and Friction override the methods block (names as in loop files,
	// underscores or hyphens).
	Void, Friction string
	// Saturation overrides the methods block's saturation_state ("auto",
	// "single" or "local").
	Saturation string
	// Pinned fixes, where saturation_state is auto, the state ("single" or
	// "local") of a case at its own attitude, keyed by PinKey(loop, case),
	// instead of the liquid column's choice: the variants of a design that
	// a search compares are then estimated in the states the design as
	// written got (PinnedStates), and their margins do not jump where a
	// variant's column crosses AutoLocalShift. Sweep, profile and envelope
	// points take their case's state; cases not in the map keep the
	// column's choice at their own attitude.
	Pinned map[string]string
	// Cells overrides the number of cells per heated component.
	Cells int
	// NoTilt skips the search for the attitudes at which circulation stops.
	NoTilt bool
	// Sweep adds a grid of attitudes and accelerations to every case.
	Sweep *Sweep
	// Workers bounds the parallel evaluations (0: GOMAXPROCS).
	Workers int
	// Cancel, when closed, stops the estimate early (between cases and
	// between the tilt search's steps); the result is then incomplete and
	// is to be dropped.
	Cancel <-chan struct{}
	// Layout is the layout of the loop that EstimateLoop estimates
	// (geom.Place of it) when the caller has made it already, nil to make
	// it here: a large loop's layout is a few words per node and component.
	// Estimate, which estimates every loop, ignores it.
	Layout *geom.Layout
	// SweepMargins keeps of each sweep point only what does not run over
	// the components: its circulation, flows, totals, margins and tilt
	// limits, not its component states and findings; of the case's own
	// point (unless the case has a profile), not its states. For a caller that
	// reads no more (the tilt envelope): a large loop's states and
	// per-component findings, kept for every point of a sweep, were
	// hundreds of bytes per component and point.
	SweepMargins bool
}

// Sweep is a grid of attitudes (radians) and accelerations (m/s², equipment
// frame) evaluated for every case, each combination replacing the case's own
// attitude and acceleration. An empty list keeps the case's value.
type Sweep struct {
	Pitch, Roll []float64
	Accel       [][3]float64
}

// point is one attitude and acceleration of a case.
type point struct {
	c                *lang.Case
	grid             bool
	profile          bool // an instant of the case's profile
	envelope         bool // a combination of the case's envelope search
	yaw, pitch, roll float64
	accel            geom.Vec3
	// warm, for an instant of a profile, is what its worker kept from the
	// instant before (nil: a cold search).
	warm *ringWarm
}

// derived reports whether the point is one of a sweep or a profile rather
// than the case's own attitude: it gets no tilt search, stability check or
// override list of its own.
func (pt point) derived() bool { return pt.grid || pt.profile || pt.envelope }

// prepared is what a loop needs for every case.
type prepared struct {
	l        *lang.Loop
	net      *network
	fl       fluid.Fluid
	info     fluid.Info
	methods  MethodsUsed
	void     correlate.VoidMethod
	fric     correlate.Friction
	chfK     float64
	chfFlow  bool      // flow-boiling CHF (Katto–Ohno) instead of the pool-boiling form
	cond     condModel // the in-tube coefficient of geometry condensers
	limits   lang.Limits
	lay      *geom.Layout      // node positions, for liquid-column heights
	pinned   map[string]string // Options.Pinned
	findings []Finding
	cancel   <-chan struct{}
	// sweepMargins is Options.SweepMargins.
	sweepMargins bool
}

// cancelled reports whether the caller has given up on the estimate.
func (p *prepared) cancelled() bool {
	select {
	case <-p.cancel:
		return true
	default:
		return false
	}
}

// Estimate evaluates every loop of m in every case (or the one named in
// opts), with the tilt limits of each case unless opts.NoTilt. It returns an
// error only for an unusable request (an unknown case or method name);
// everything the model itself makes impossible is a finding in the result.
func Estimate(m *lang.Model, opts Options) (*Result, error) {
	res := &Result{Cautions: append([]string(nil), Cautions...)}
	if m == nil {
		return res, nil
	}
	opts.Layout = nil
	res.Set = ParamsSet(m)
	cases := m.Cases
	if opts.Case != "" {
		c := m.Case(opts.Case)
		if c == nil {
			var names []string
			for _, c := range m.Cases {
				names = append(names, c.Name)
			}
			return nil, fmt.Errorf("no case %q (cases: %s)", opts.Case, strings.Join(names, ", "))
		}
		cases = []*lang.Case{c}
	}
	methods, err := chooseMethods(m.Methods, opts)
	if err != nil {
		return nil, err
	}
	points := casePoints(cases, opts.Sweep)
	for _, l := range m.Loops {
		res.Loops = append(res.Loops, estimateLoop(m, l, methods, points, opts))
	}
	if fastManoeuvre(res.Loops) {
		res.Cautions = append(res.Cautions, CautionManoeuvre)
	}
	return res, nil
}

// EstimateLoop is Estimate for one loop of m in every case (or the one named
// in opts; an unknown name gives a finding).
func EstimateLoop(m *lang.Model, l *lang.Loop, opts Options) LoopResult {
	if m == nil || l == nil {
		return LoopResult{}
	}
	methods, err := chooseMethods(m.Methods, opts)
	if err != nil {
		return LoopResult{Loop: l.Name, Findings: []Finding{{Rule: RuleMethod, Severity: "error", Loop: l.Name, Message: err.Error()}}}
	}
	cases := m.Cases
	if opts.Case != "" {
		cases = nil
		if c := m.Case(opts.Case); c != nil {
			cases = []*lang.Case{c}
		} else {
			return LoopResult{Loop: l.Name, Findings: []Finding{{Rule: RuleUnknownCase, Severity: "error", Loop: l.Name,
				Message: fmt.Sprintf("no case %q", opts.Case)}}}
		}
	}
	return estimateLoop(m, l, methods, casePoints(cases, opts.Sweep), opts)
}

// casePoints returns the points to solve. A case whose text did not fully
// resolve is left out: its error is reported where it was written, and an
// estimate with a value missing would report what follows from it.
func casePoints(cases []*lang.Case, sw *Sweep) []point {
	var points []point
	for _, c := range cases {
		if c.Unresolved {
			continue
		}
		points = append(points, pointsOf(c, sw)...)
		if c.Profile != nil {
			pts, _ := profilePoints(c)
			points = append(points, pts...)
		}
	}
	if len(cases) == 0 {
		points = append(points, point{})
	}
	return points
}

func estimateLoop(m *lang.Model, l *lang.Loop, methods MethodsUsed, points []point, opts Options) LoopResult {
	p := prepareLaidOut(m, l, methods, opts.Layout)
	p.cancel = opts.Cancel
	p.pinned = opts.Pinned
	p.sweepMargins = opts.SweepMargins
	lr := LoopResult{Loop: l.Name, Fluid: l.Fluid.Name, Methods: p.methods, Assumptions: assumptions(),
		Findings: p.findings}
	if p.fl != nil {
		lr.Safety = p.info.Safety
		lr.Fluid = p.info.Name
	}
	if p.net != nil {
		lr.Network = !p.net.ring
		for i, a := range lr.Assumptions {
			if !strings.HasPrefix(a, "one saturation state") {
				continue
			}
			switch {
			case p.methods.Saturation == "auto":
				lr.Assumptions[i] = fmt.Sprintf("saturation at the local pressure in the cases where the weight of the liquid column raises the saturation temperature at an evaporator inlet by more than %g K (circa's screening rule), one saturation state per loop and case in the others; each case names its state", AutoLocalShift)
			case p.methods.Saturation == "local" && p.net.ring:
				lr.Assumptions[i] = "saturation at the local pressure, marched around the loop from the condenser outlet at the case's saturation pressure; liquid density and viscosity at the liquid's own temperature"
			case p.methods.Saturation == "local":
				lr.Assumptions[i] = "saturation at the local pressure, marched through each branch from its upstream junction; the junction pressures follow from the first condenser's outlet, at the case's saturation pressure, through the branches' pressure changes; liquid density and viscosity at the liquid's own temperature"
			}
		}
		for _, cp := range p.net.comps {
			if byGeometry(cp) && p.cond.forced {
				lr.Assumptions = append(lr.Assumptions, "condensers given by geometry: forced-convection condensation inside their tubes "+
					"("+p.cond.source()+"), averaged over the quality from saturated vapour to liquid at the mass flux that condenses the "+
					"condenser's share of the load; the tube wall at the coolant temperature unless coolant_htc gives the coolant side")
				break
			}
			if byGeometry(cp) {
				lr.Assumptions = append(lr.Assumptions, "condensers given by geometry: laminar film condensation inside their tubes "+
					"(Nusselt 1916 within 45° of the body force, Chato 1962 flatter), the tube wall at the coolant temperature "+
					"unless coolant_htc gives the coolant side; vapour shear neglected")
				break
			}
		}
	}
	lr.Cases = make([]CaseResult, len(points))
	if p.net != nil && p.fl != nil {
		// Each worker takes a run of consecutive points, so a network's
		// Newton iteration starts from the previous point's balance.
		runChunks(len(points), opts.Workers, func(i int, start []float64, w *ringWarm) []float64 {
			if p.cancelled() {
				return nil
			}
			var f []float64
			pt := points[i]
			if pt.profile {
				if w.c != pt.c {
					*w = ringWarm{c: pt.c}
				}
				pt.warm = w
			}
			lr.Cases[i], f = p.run(pt, !opts.NoTilt && !pt.derived(), start)
			if p.sweepMargins && pt.grid {
				lr.Cases[i].Components, lr.Cases[i].Findings = nil, nil
			} else if p.sweepMargins && !pt.profile && (pt.c == nil || pt.c.Profile == nil) {
				// The case's own point leads the sweep: its states
				// would be kept through every point after it. A profile
				// case's instants are gathered onto them, so those stay.
				lr.Cases[i].Components = nil
			}
			return f
		})
		lr.Cases = p.gatherProfiles(points, lr.Cases)
	} else {
		for i, pt := range points {
			lr.Cases[i] = CaseResult{Case: caseName(pt.c), Reason: "the loop cannot be estimated (see the loop's findings)"}
		}
	}
	lr.Worst = worst(lr.Cases)
	lr.ChargeRange = chargeRange(lr.Cases)
	if l.DesignPressure.Set {
		lr.DesignPressureUnit = l.DesignPressure.Unit()
	}
	finishLoop(&lr)
	return lr
}

// NoCase names the single point estimated for a model without cases.
const NoCase = "(no case)"

func caseName(c *lang.Case) string {
	if c == nil {
		return NoCase
	}
	return c.Name
}

// runChunks splits 0..n−1 into up to workers runs of consecutive indices
// and calls f on each run in order, on its own goroutine, passing what f
// returned for the previous index of the run (nil for the first) and the
// run's own warm start for a profile's instants.
func runChunks(n, workers int, f func(i int, prev []float64, w *ringWarm) []float64) {
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	workers = max(min(workers, n), 1)
	if workers == 1 {
		var prev []float64
		w := new(ringWarm)
		for i := 0; i < n; i++ {
			prev = f(i, prev, w)
		}
		return
	}
	var wg sync.WaitGroup
	for k := 0; k < workers; k++ {
		lo, hi := k*n/workers, (k+1)*n/workers
		wg.Add(1)
		go func() {
			defer wg.Done()
			var prev []float64
			w := new(ringWarm)
			for i := lo; i < hi; i++ {
				prev = f(i, prev, w)
			}
		}()
	}
	wg.Wait()
}

func pointsOf(c *lang.Case, sw *Sweep) []point {
	base := point{c: c, yaw: c.Yaw.SI, pitch: c.Pitch.SI, roll: c.Roll.SI,
		accel: geom.Vec3{c.Accel.X, c.Accel.Y, c.Accel.Z}}
	out := []point{base}
	if sw == nil || len(sw.Pitch)+len(sw.Roll)+len(sw.Accel) == 0 {
		return out
	}
	pitches, rolls := sw.Pitch, sw.Roll
	if len(pitches) == 0 {
		pitches = []float64{base.pitch}
	}
	if len(rolls) == 0 {
		rolls = []float64{base.roll}
	}
	accels := sw.Accel
	if len(accels) == 0 {
		accels = [][3]float64{base.accel}
	}
	for _, p := range pitches {
		for _, r := range rolls {
			for _, a := range accels {
				out = append(out, point{c: c, grid: true, yaw: base.yaw, pitch: p, roll: r, accel: geom.Vec3(a)})
			}
		}
	}
	return out
}

func underscore(s string) string { return strings.ReplaceAll(s, "-", "_") }
func hyphen(s string) string     { return strings.ReplaceAll(s, "_", "-") }

func chooseMethods(ms lang.Methods, opts Options) (MethodsUsed, error) {
	def := lang.DefaultMethods()
	pick := func(c lang.Choice, d lang.Choice) string {
		if c.Name != "" {
			return c.Name
		}
		return d.Name
	}
	mu := MethodsUsed{
		Void: pick(ms.Void, def.Void), Friction: pick(ms.Friction, def.Friction),
		SinglePhase: pick(ms.SinglePhase, def.SinglePhase), CHF: pick(ms.CHF, def.CHF), Saturation: pick(ms.SatState, def.SatState), Cells: def.Cells,
		Condensation: pick(ms.Condensation, def.Condensation),
	}
	if ms.CellsSet && ms.Cells > 0 {
		mu.Cells = ms.Cells
	}
	if opts.Cells > 0 {
		mu.Cells = opts.Cells
	}
	if opts.Void != "" {
		mu.Void = underscore(opts.Void)
	}
	if opts.Friction != "" {
		mu.Friction = underscore(opts.Friction)
	}
	if opts.Saturation != "" {
		mu.Saturation = opts.Saturation
	}
	if _, err := correlate.ParseVoidMethod(hyphen(mu.Void)); err != nil {
		return mu, err
	}
	if _, err := correlate.ParseFrictionMethod(hyphen(mu.Friction)); err != nil {
		return mu, err
	}
	if mu.SinglePhase != "churchill" && mu.SinglePhase != "colebrook" {
		return mu, fmt.Errorf("unknown single-phase friction method %q (want churchill or colebrook)", mu.SinglePhase)
	}
	if mu.CHF != "lienhard_dhir" && mu.CHF != "zuber" && mu.CHF != "katto_ohno" {
		return mu, fmt.Errorf("unknown critical heat flux method %q (want lienhard_dhir, zuber or katto_ohno)", mu.CHF)
	}
	if mu.Saturation != "single" && mu.Saturation != "local" && mu.Saturation != "auto" {
		return mu, fmt.Errorf("unknown saturation state %q (want auto, single or local)", mu.Saturation)
	}
	if _, err := parseCondensation(mu.Condensation); err != nil {
		return mu, err
	}
	if mu.Cells > 100000 {
		mu.Cells = 100000
	}
	return mu, nil
}

func assumptions() []string {
	return []string{
		"steady, one-dimensional, quasi-static in attitude and acceleration",
		"one saturation state per loop and case for all properties",
		"condensing-side temperature uniform when the condenser balance sets the saturation temperature",
		"evaporator heat uniform over the heated length, centred on the component",
		"condensers bring their outflow to saturated (or subcooled) liquid linearly over their length",
		"subcooled liquid: saturated-liquid density and viscosity at its own temperature",
		"reservoirs hold liquid only and carry no flow",
	}
}

// prepare resolves the fluid, methods and network of a loop.
func prepare(m *lang.Model, l *lang.Loop, mu MethodsUsed) *prepared {
	return prepareLaidOut(m, l, mu, nil)
}

// prepareLaidOut is prepare with the loop's layout, or nil to make it.
func prepareLaidOut(m *lang.Model, l *lang.Loop, mu MethodsUsed, lay *geom.Layout) *prepared {
	p := &prepared{l: l, methods: mu, limits: m.Limits}
	p.void, _ = correlate.ParseVoidMethod(hyphen(mu.Void))
	fm, _ := correlate.ParseFrictionMethod(hyphen(mu.Friction))
	p.fric = correlate.Friction{Method: fm, SinglePhase: correlate.Churchill}
	if mu.SinglePhase == "colebrook" {
		p.fric.SinglePhase = correlate.Colebrook
	}
	p.chfK = correlate.LienhardDhir
	if mu.CHF == "zuber" {
		p.chfK = correlate.Zuber
	}
	p.chfFlow = mu.CHF == "katto_ohno"
	p.cond, _ = parseCondensation(mu.Condensation)
	var err error
	switch {
	case l.Fluid.Table != "":
		p.fl, err = fluid.LoadCSV(l.Fluid.Table)
	case l.Fluid.Name != "":
		p.fl, err = fluid.Lookup(l.Fluid.Name)
	default:
		err = errors.New("the loop names no fluid")
	}
	if err != nil {
		p.fl = nil
		// A table's errors are one finding each, as a profile table's are.
		errs := []error{err}
		if tes := (*fluid.TableErrors)(nil); errors.As(err, &tes) {
			errs = tes.Unwrap()
		}
		for _, e := range errs {
			p.findings = append(p.findings, Finding{Rule: RuleFluidUnknown, Severity: "error", Loop: l.Name,
				Message: fmt.Sprintf("no estimate for loop %s: %v", l.Name, e)})
		}
	} else {
		p.info = p.fl.Info()
		if s := p.info.Safety; s != "" && s != "A1" {
			p.findings = append(p.findings, Finding{Rule: RuleFluidSafety, Severity: "info", Loop: l.Name,
				Message: fmt.Sprintf("%s is safety class %s: flammability and toxicity rules, charge limits and local codes apply", p.info.Name, s)})
		}
	}
	p.lay = lay
	if p.lay == nil {
		p.lay = geom.Place(l)
	}
	net, fs := buildNetwork(l, p.lay)
	for i := range fs {
		fs[i].Loop = l.Name
	}
	p.findings = append(p.findings, fs...)
	p.net = net
	if net != nil {
		nc := 0
		for _, cp := range net.comps {
			if cp.kind == lang.Condenser {
				nc++
			}
		}
		if nc == 0 {
			p.findings = append(p.findings, Finding{Rule: RuleNoCondenser, Severity: "error", Loop: l.Name,
				Message: fmt.Sprintf("loop %s has no condenser: the heat has nowhere to go and there is no steady state", l.Name)})
			p.net = nil
		}
	}
	return p
}

// newState fixes the operating state of one case. A nil state comes with
// the findings that prevented it.
func (p *prepared) newState(pt point, cr *CaseResult) (*state, []Finding) {
	l := p.l
	net := p.net
	s := &state{net: net, void: p.void, fric: p.fric, sp: p.fric.SinglePhase, cells: p.methods.Cells, info: p.info}
	s.heat = make([]float64, len(net.comps))
	s.xCond = make([]float64, len(net.comps))
	s.pfc = &frictionCache{}
	var fs []Finding
	cname := caseName(pt.c)
	find := func(rule, sev, comp string, v, lim float64, unit, format string, args ...any) {
		fs = append(fs, Finding{Rule: rule, Severity: sev, Loop: l.Name, Case: cname, Component: comp,
			Value: v, Limit: lim, Unit: unit, Message: fmt.Sprintf(format, args...)})
	}
	var qTot float64
	for ci, cp := range net.comps {
		if cp.kind != lang.Evaporator {
			continue
		}
		q := cp.c.Heat.SI
		if pt.c != nil {
			for _, h := range pt.c.Heat {
				if h.Comp == cp.c {
					q = h.Value.SI
				}
			}
		}
		if !finite(q) || q < 0 {
			find(RuleNegativeHeat, "error", cp.name, q, 0, "W", "evaporator %s has heat %g W in case %s; the estimate needs a heat input of zero or more", cp.name, q, cname)
			q = 0
		}
		s.heat[ci] = q
		qTot += q
	}
	cr.Heat = qTot
	// Saturation temperature.
	var T float64
	sinkOf := func(cp comp) (float64, bool) {
		if pt.c != nil {
			for _, sv := range pt.c.Sinks {
				if sv.Comp == cp.c {
					return sv.Value.SI, true
				}
			}
			if pt.c.Sink.Set {
				return pt.c.Sink.SI, true
			}
		}
		return cp.c.Sink.SI, cp.c.Sink.Set
	}
	var ua, uaT float64
	var outletT float64
	outletSet := false
	missing := ""
	var conds []comp
	var sinks []float64
	film := false
	for _, cp := range net.comps {
		if cp.kind != lang.Condenser {
			continue
		}
		if cp.c.Outlet.Set && !outletSet {
			outletT, outletSet = cp.c.Outlet.SI, true
		}
		ts, ok := sinkOf(cp)
		if ok && byGeometryIn(pt.c, cp) {
			conds, sinks, film = append(conds, cp), append(sinks, ts), true
			continue
		}
		g, gSet := conductanceIn(pt.c, cp)
		if ok && gSet {
			conds, sinks = append(conds, cp), append(sinks, ts)
		}
		if !gSet || !ok {
			if !cp.c.Outlet.Set && missing == "" {
				missing = cp.name
			}
			continue
		}
		ua += g
		uaT += g * ts
	}
	switch {
	case pt.c != nil && pt.c.Saturation.Set:
		T, cr.SatSource = pt.c.Saturation.SI, "case"
	case l.Saturation.Set:
		T, cr.SatSource = l.Saturation.SI, "loop"
	case outletSet:
		T, cr.SatSource = outletT, "condenser outlet"
	case film && missing == "":
		var ok bool
		T, ok = geometrySaturation(p.cond, p.fl, p.info, pt.c, conds, sinks, geom.BodyForceAt(pt.yaw, pt.pitch, pt.roll, pt.accel), qTot)
		cr.SatSource = "condenser balance"
		if !ok {
			find(RuleCondenser, "error", conds[0].name, T, p.info.Tmax, "K", "the condensers cannot reject %.0f W in case %s below %s: no estimate", qTot, cname, RangeTopText(p.info))
			return nil, fs
		}
	case ua > 0 && missing == "":
		T, cr.SatSource = (qTot+uaT)/ua, "condenser balance"
	case len(conds) > 0 && missing == "" && qTot > 0:
		find(RuleCondenser, "error", conds[0].name, 0, qTot, "W", "the condensers have no conductance in case %s, so they cannot reject %.0f W: no estimate", cname, qTot)
		return nil, fs
	default:
		name := missing
		find(RuleNoSink, "error", name, 0, 0, "", "no saturation temperature in case %s: give condenser %s a conductance and a sink temperature (or an outlet temperature), or give the loop or the case a saturation", cname, name)
		return nil, fs
	}
	cr.SatTemperature = T
	sat, err := p.fl.AtT(T)
	if err != nil || !(sat.RhoL > sat.RhoV) || !(sat.Hlv > 0) {
		why := "outside the fluid's range"
		if T >= p.info.Tc && p.info.Tc > 0 {
			why = "at or above the critical temperature " + fmt.Sprintf("%.2f °C", p.info.Tc-273.15)
		}
		find(RuleFluidRange, "error", "", T, p.info.Tmax, "K", "saturation temperature %s in case %s is %s of %s (%.2f to %.2f °C): no estimate", TempText(T), cname, why, p.info.Name, p.info.Tmin-273.15, p.info.Tmax-273.15)
		return nil, fs
	}
	s.sat = sat
	cr.SatPressure = sat.P
	s.fl = p.fl
	s.pIn = make([]float64, len(net.comps))
	s.refCond = -1
	pr := 0.0
	if p.info.Pc > 0 {
		pr = sat.P / p.info.Pc
	}
	s.p = correlate.Props{RhoL: sat.RhoL, RhoV: sat.RhoV, MuL: sat.MuL, MuV: sat.MuV, Sigma: sat.Sigma,
		KL: sat.KL, CpL: sat.CpL, Hlv: sat.Hlv, ReducedPressure: pr, MolarMass: p.info.MolarMass}
	if err := s.p.Validate(); err != nil {
		find(RuleFluidRange, "error", "", T, p.info.Tmax, "K", "the properties of %s at %s are unusable (%v): no estimate", p.info.Name, TempText(T), err)
		return nil, fs
	}
	// Subcooled-liquid table.
	s.liqDT = liquidSpan / (liquidPoints - 1)
	for k := 0; k < liquidPoints; k++ {
		Tk := T - float64(k)*s.liqDT
		s.liqRho[k], s.liqMu[k] = sat.RhoL, sat.MuL
		if k > 0 {
			s.liqRho[k], s.liqMu[k] = s.liqRho[k-1], s.liqMu[k-1]
		}
		if st, err := p.fl.AtT(Tk); err == nil && Tk >= p.info.Tmin {
			s.liqRho[k], s.liqMu[k] = st.RhoL, st.MuL
		}
	}
	for ci, cp := range net.comps {
		if cp.kind == lang.Condenser {
			sub := cp.c.Subcool.SI
			if !(sub > 0) || !finite(sub) {
				sub = 0
			}
			s.xCond[ci] = -sub * sat.CpL / sat.Hlv
		}
	}
	s.setBody(geom.BodyForceAt(pt.yaw, pt.pitch, pt.roll, pt.accel))
	p.saturationState(s, cr, p.caseShift(s, pt))
	return s, fs
}

// caseShift is the column shift of pt's case at the case's own attitude and
// acceleration, which decides saturation_state auto for every point of the
// case: a sweep, profile or envelope point in another state would make its
// curve jump where its own column crosses AutoLocalShift (a vacuum loop's
// flow nearly triples from local to single there).
func (p *prepared) caseShift(s *state, pt point) float64 {
	if !pt.derived() || pt.c == nil {
		return p.columnShift(s)
	}
	c := pt.c
	own := *s
	own.b = geom.BodyForceAt(c.Yaw.SI, c.Pitch.SI, c.Roll.SI, geom.Vec3{c.Accel.X, c.Accel.Y, c.Accel.Z})
	own.bmag = own.b.Norm()
	return p.columnShift(&own)
}

// setBody sets the body force and what depends on it. The products with
// the body force are taken once per distinct displacement: a long chain of
// equal tubes shares one.
func (s *state) setBody(b geom.Vec3) {
	s.b = b
	s.bmag = b.Norm()
	s.vp = correlate.PrepareVoid(s.void, s.p, s.bmag)
	n := len(s.net.comps)
	if len(s.bDisp) != n {
		s.bDisp = make([]float64, n)
		s.cosInc = make([]float64, n)
	}
	nu := len(s.net.dispU)
	if len(s.bDispU) != nu {
		s.bDispU = make([]float64, nu)
		s.cosIncU = make([]float64, nu)
	}
	s.maxBDisp = 0
	for u, disp := range s.net.dispU {
		bd := b.Dot(disp)
		s.bDispU[u] = bd
		s.maxBDisp = math.Max(s.maxBDisp, math.Abs(bd))
		if d := s.net.dlenU[u]; d > 0 && s.bmag > 0 {
			s.cosIncU[u] = bd / (d * s.bmag)
		} else {
			s.cosIncU[u] = 1
		}
	}
	for ci, u := range s.net.dispIdx {
		s.bDisp[ci] = s.bDispU[u]
		s.cosInc[ci] = s.cosIncU[u]
	}
}

// withBody returns a copy of s under another body force.
// withLossScale returns a copy of s whose friction and local losses are k
// times the estimate's.
func (s *state) withLossScale(k float64) *state {
	c := *s
	c.lossScale = k
	c.warm = s.warm.scaled(k)
	// Only exit qualities to three digits are read from this solve: a
	// residual of 1e-6 of the head, and half the cells (halving them changes
	// the flow by about 1e-4), are ample.
	c.looseTol = 1e-6
	if c.cells >= 16 {
		c.cells /= 2
	}
	return &c
}

func (s *state) withBody(b geom.Vec3) *state {
	c := *s
	c.bDisp, c.cosInc, c.bDispU, c.cosIncU = nil, nil, nil, nil
	c.setBody(b)
	return &c
}

// withBodyIn is withBody into *dst, reusing the arrays a previous call
// left there: a search over many attitudes allocates them once.
func (s *state) withBodyIn(dst *state, b geom.Vec3) *state {
	bd, ci, bu, cu := dst.bDisp, dst.cosInc, dst.bDispU, dst.cosIncU
	*dst = *s
	dst.bDisp, dst.cosInc, dst.bDispU, dst.cosIncU = bd, ci, bu, cu
	dst.setBody(b)
	return dst
}

// TempText writes an absolute temperature (K) in °C, or says it is out of
// any physical range instead of printing a meaningless number.
func TempText(T float64) string {
	switch {
	case math.IsNaN(T):
		return "undefined"
	case T < 0:
		return "below absolute zero"
	case T > 1e4:
		return "far above 10000 °C"
	}
	return fmt.Sprintf("%.2f °C", T-273.15)
}
