package lsp

import (
	"context"
	"fmt"
	"math"
	"runtime"
	"strconv"
	"strings"
	"sync"
	"time"

	"go.lsp.dev/jsonrpc2"

	"circa/check/flow"
	"circa/check/guide"
	"circa/check/output"
	"circa/check/suggest"
	"circa/lang"
	"circa/units"
)

// guidance is the design guidance of one analysis: every parameter's
// feasible range and sensitivities, and the quick fixes of its margin
// findings. It is computed in the background once the diagnostics are out,
// and a newer edit cancels it.
type guidance struct {
	g     *guide.Guidance // nil for a model with errors
	fixes map[fixKey][]lang.Fix
	note  string // why there is none
	// onDemand says the guidance was too costly to compute in the
	// background: a hover on a parameter or a code action on a margin
	// finding computes what it needs.
	onDemand bool
}

// fixKey names a finding: its rule and where it is.
type fixKey struct {
	rule string
	loc  lang.Location
}

// guideStore holds the guidance of the latest analyses and the snapshot
// waiting for it.
type guideStore struct {
	mu      sync.Mutex
	by      map[*analysis]*guidance
	pending *snapshot
	work    chan struct{}
	// onGuided is a testing hook: the guidance of a snapshot is stored.
	onGuided func(snapID uint64)
}

func (gs *guideStore) get(a *analysis) *guidance {
	if a == nil {
		return nil
	}
	gs.mu.Lock()
	defer gs.mu.Unlock()
	return gs.by[a]
}

// put stores a's guidance and forgets that of analyses the snapshot no
// longer holds. The guidance of a replaced snapshot is dropped: keepOnly
// has forgotten that snapshot's analyses, or will.
func (gs *guideStore) put(sn *snapshot, a *analysis, g *guidance) {
	gs.mu.Lock()
	defer gs.mu.Unlock()
	if sn.ctx.Err() != nil {
		return
	}
	if gs.by == nil {
		gs.by = map[*analysis]*guidance{}
	}
	for old := range gs.by {
		if sn.roots[old.root] != old {
			delete(gs.by, old)
		}
	}
	gs.by[a] = g
}

// keepOnly forgets the guidance of analyses sn does not hold, and a
// waiting snapshot that sn replaced: the guidance is kept by analysis, and
// an old analysis holds its whole model, trees and estimates, which would
// otherwise stay live beside the new ones until the new guidance is done.
func (gs *guideStore) keepOnly(sn *snapshot) {
	gs.mu.Lock()
	defer gs.mu.Unlock()
	for old := range gs.by {
		if sn.roots[old.root] != old {
			delete(gs.by, old)
		}
	}
	if gs.pending != nil && gs.pending != sn && gs.pending.ctx.Err() != nil {
		gs.pending = nil
	}
}

func (gs *guideStore) signal() chan struct{} {
	gs.mu.Lock()
	defer gs.mu.Unlock()
	if gs.work == nil {
		gs.work = make(chan struct{}, 1)
	}
	return gs.work
}

// queueGuidance asks for the guidance of a snapshot whose diagnostics are
// published; a newer one replaces it.
func (s *Server) queueGuidance(sn *snapshot) {
	if sn.settings.MarginChecks == "never" {
		return
	}
	s.guides.mu.Lock()
	s.guides.pending = sn
	s.guides.mu.Unlock()
	select {
	case s.guides.signal() <- struct{}{}:
	default:
	}
}

// guideWorker computes the guidance of the latest snapshot queued, one
// root at a time, on fewer workers than processors so that the next
// edit's diagnostics find one free; the snapshot's cancellation stops it.
func (s *Server) guideWorker(ctx context.Context) {
	work := s.guides.signal()
	for {
		select {
		case <-ctx.Done():
			return
		case <-work:
		}
		s.guides.mu.Lock()
		sn := s.guides.pending
		s.guides.pending = nil
		hook := s.guides.onGuided
		s.guides.mu.Unlock()
		if sn == nil || sn.ctx.Err() != nil {
			continue
		}
		for _, a := range sn.sortedRoots() {
			if sn.ctx.Err() != nil {
				break
			}
			if s.guides.get(a) != nil {
				continue
			}
			var g *guidance
			switch why := s.backgroundGuidance(a); why {
			case "":
				g = s.computeGuidance(sn.ctx, a, nil)
			case noGuidance:
				continue
			default:
				g = &guidance{onDemand: true, note: why}
			}
			if g == nil || sn.ctx.Err() != nil {
				break
			}
			s.guides.put(sn, a, g)
		}
		if sn.ctx.Err() == nil {
			s.refreshRangeHints(ctx, sn)
			if hook != nil {
				hook(sn.id)
			}
		}
	}
}

// refreshRangeHints asks the client to ask for its inlay hints again once
// the ranges they show are computed, when it shows them and can be asked.
func (s *Server) refreshRangeHints(ctx context.Context, sn *snapshot) {
	s.mu.Lock()
	can := s.caps.inlayRefresh && s.conn != nil
	s.mu.Unlock()
	if !can || !sn.settings.InlayHints || !sn.settings.RangeHints {
		return
	}
	// A call back to the client must not wait on the read loop.
	cctx := jsonrpc2.DetachContext(ctx)
	go func() {
		if _, err := s.conn.Call(cctx, "workspace/inlayHint/refresh", nil, nil); err != nil {
			s.logf("asking for the inlay hints again: %v", err)
		}
	}()
}

// noGuidance says a root has nothing to guide: no parameter and no loop.
const noGuidance = "nothing to guide"

// backgroundGuidance says why the guidance of an analysis whose checks are
// done is not computed in the background ("" when it is): a root with no
// parameter and no charge has none, and one whose guidance would cost more
// than guideBudget of estimates gets it on demand, so that it never
// competes with the next edit's diagnostics for long.
func (s *Server) backgroundGuidance(a *analysis) string {
	diags, est, ok := a.checks()
	if !ok {
		return noGuidance
	}
	m := a.Model()
	for _, d := range m.Diags {
		if d.Severity == lang.Error {
			return ""
		}
	}
	if len(m.Params)+len(m.Loops) == 0 {
		return noGuidance
	}
	if a.settings.MarginChecks == "always" {
		return ""
	}
	if n := sourceBytes(m); n > guideSize {
		return fmt.Sprintf("computed on demand in this file: its %d KB would be resolved again for every value searched", n>>10)
	}
	budget := guideBudget
	if s.opts.guideBudget > 0 {
		budget = s.opts.guideBudget
	}
	s.mu.Lock()
	resolve := s.modelCost[a.root]
	s.mu.Unlock()
	cost := guidanceCost(m, est.tookOrZero(), resolve)
	if tiltFinding(diags) {
		// A tilt-margin finding's fixes are searched again with the tilt
		// search: about as many estimates again, each a full one.
		cost *= 2
	}
	if cost > budget {
		return fmt.Sprintf("computed on demand in this file: all of it would take about %s of estimates", cost.Round(100*time.Millisecond))
	}
	return ""
}

// tiltFinding reports whether a tilt-margin finding is among the margin
// findings that get fixes.
func tiltFinding(ds []lang.Diagnostic) bool {
	for _, d := range ds {
		if d.Rule == flow.RuleTilt && suggest.IsMargin(d) {
			return true
		}
	}
	return false
}

// guidanceOnDemand computes the guidance a request asks for (the named
// parameters, or all of it for nil) when the background left it out; a
// newer edit or the request's cancellation stops it. Guidance of the whole
// file is kept for the next request.
func (s *Server) guidanceOnDemand(ctx context.Context, sn *snapshot, a *analysis, params []string) *guidance {
	g := s.guides.get(a)
	if g == nil || !g.onDemand {
		return g
	}
	ctx, cancel := context.WithCancel(ctx)
	defer cancel()
	stop := context.AfterFunc(sn.ctx, cancel)
	defer stop()
	out := s.computeGuidance(ctx, a, params)
	if out == nil {
		return g
	}
	if params == nil && sn.ctx.Err() == nil {
		s.guides.put(sn, a, out)
	}
	return out
}

// computeGuidance works out the guidance of an analysis whose checks are
// done, for the named parameters (nil: all of them, with the quick fixes
// of the margin findings): nil when cancelled or when the checks are not
// there.
func (s *Server) computeGuidance(ctx context.Context, a *analysis, params []string) (out *guidance) {
	diags, est, ok := a.checks()
	if !ok {
		return nil
	}
	m := a.Model()
	defer func() {
		if r := recover(); r != nil {
			s.recovered(a.root, "computing the design guidance", r)
			out = &guidance{}
		}
	}()
	for _, d := range m.Diags {
		if d.Severity == lang.Error {
			return &guidance{note: "none until the file's errors are fixed"}
		}
	}
	fo := flow.Options{NoTilt: true}
	opts := guide.Options{Flow: fo, Workers: max(1, runtime.GOMAXPROCS(0)-1), Params: params}
	if est != nil && !est.tilt && est.flowErr == nil {
		opts.Base = est.flow
	} else {
		base, err := flow.Estimate(m, flow.Options{NoTilt: true, Cancel: ctx.Done()})
		if ctx.Err() != nil {
			return nil
		}
		if err == nil {
			opts.Base = base
		}
	}
	g, err := guide.Compute(ctx, m, opts)
	if err != nil || ctx.Err() != nil {
		if ctx.Err() != nil {
			return nil
		}
		return &guidance{}
	}
	out = &guidance{g: g, fixes: map[fixKey][]lang.Fix{}}
	if params != nil {
		return out
	}
	for _, d := range diags {
		if !suggest.IsMargin(d) {
			continue
		}
		fixes, err := suggest.Fixes(ctx, m, d, g, suggest.Options{Flow: fo, Workers: opts.Workers})
		if ctx.Err() != nil {
			return nil
		}
		if err == nil && len(fixes) > 0 {
			out.fixes[fixKey{d.Rule, d.Loc}] = fixes
		}
	}
	return out
}

// guideSize is the most text whose guidance runs in the background. Each
// value the guidance tries is estimated on a model resolved again from the
// trees, as large as the file's own (some 30 bytes a byte of text), and an
// edit's new model and trees are built while the old ones finish their
// estimate: a file past this size (a network of about 2,000 components) is
// guided on demand, so that background work does not double what the
// server holds.
const guideSize = 256 << 10

// sourceBytes is the size of the texts a model was read from.
func sourceBytes(m *lang.Model) int {
	n := 0
	for _, f := range m.Files {
		if f != nil {
			n += len(f.Src)
		}
	}
	return n
}

// guideBudget bounds the background work the guidance may take, about a
// second or two of estimates; a costlier file (a large network, a file of
// many parameters) gets it on demand unless marginChecks is "always".
const guideBudget = 2 * time.Second

// guidanceCost guesses what the guidance of m costs from one estimate's
// time and the time m took to resolve: a few dozen estimates per parameter
// and per loop's charge, on one worker, each estimate of a parameter's
// value on a model resolved again with that value. An estimate is taken
// to cost at least a few tens of microseconds, so that a file of thousands
// of parameters whose estimate stops early is not guided in the
// background. The resolving matters for a large loop: a network of
// thousands of components resolves in about as long as it estimates, and
// every variant is a model as large as the file's.
func guidanceCost(m *lang.Model, one, resolve time.Duration) time.Duration {
	one = max(one, minEstimate)
	return 40 * (time.Duration(len(m.Params))*(one+resolve) + time.Duration(len(m.Loops))*one)
}

// minEstimate is the least an estimate is taken to cost.
const minEstimate = 50 * time.Microsecond

// paramGuidance is the guidance a hover on the named parameter shows,
// computed for it alone when the file's is left for on demand.
func (s *Server) paramGuidance(c *cursor, name string) *guidance {
	if c.ctx == nil {
		return s.guides.get(c.a)
	}
	return s.guidanceOnDemand(c.ctx, c.snap, c.a, []string{name})
}

// paramGuidance returns the guidance of the parameter, when computed.
func (g *guidance) param(name string) *guide.Param {
	if g == nil || g.g == nil {
		return nil
	}
	for i := range g.g.Params {
		if g.g.Params[i].Param == name {
			return &g.g.Params[i]
		}
	}
	return nil
}

// hoverLevers is how many sensitivities a parameter's hover lists.
const hoverLevers = 3

// paramGuidanceHover renders a parameter's feasible range and its biggest
// levers for its hover, as circa estimate prints them, or why there are
// none.
func paramGuidanceHover(g *guidance, name string) string {
	gp := g.param(name)
	if gp == nil {
		if g != nil && g.note != "" {
			return "\n**Design guidance**: " + g.note + "\n"
		}
		return ""
	}
	var b strings.Builder
	b.WriteString("\n**Design guidance** (this value alone, everything else as written; early-design estimate)\n\n")
	if !gp.Influences {
		b.WriteString("influences no estimate\n")
		return b.String()
	}
	fmt.Fprintf(&b, "feasible range: %s\n", output.RangeText(gp.Range, gp.Unit))
	if len(gp.Sensitivities) > 0 {
		b.WriteString("\nbiggest levers (change of margin use):\n")
	}
	for i, sv := range gp.Sensitivities {
		if i == hoverLevers {
			break
		}
		approx := ""
		if sv.Coarse {
			approx = "≈"
		}
		fmt.Fprintf(&b, "- %s: %s%s per +10 %%, %s%s per %s\n", sv.Where.Describe(), approx, signedNum(sv.PerTenPercent),
			approx, signedNum(sv.PerUnit), unitOr(sv.Unit, gp.Unit))
	}
	return b.String()
}

func unitOr(u, fallback string) string {
	if u != "" {
		return u
	}
	if fallback != "" {
		return fallback
	}
	return "unit"
}

// signedNum writes a change to two significant digits with its sign, as
// circa estimate does.
func signedNum(v float64) string {
	s := strconv.FormatFloat(v, 'g', 2, 64)
	if v > 0 {
		s = "+" + s
	}
	return s
}

// rangeHint is the inlay hint after a parameter: its feasible range in
// short.
func rangeHint(gp *guide.Param) string {
	if gp == nil {
		return ""
	}
	if !gp.Influences {
		return "influences no estimate"
	}
	r := gp.Range
	if r == nil {
		return ""
	}
	if !r.Feasible {
		return "no value keeps every margin"
	}
	v := func(x float64) string { return output.ValueIn(x, gp.Unit) }
	var s string
	switch {
	case r.Low.Unbounded && r.High.Unbounded:
		s = "any value keeps every margin"
	case r.Low.Unbounded:
		s = "keeps every margin up to " + v(r.High.Value)
	case r.High.Unbounded:
		s = "keeps every margin from " + v(r.Low.Value)
	default:
		s = "keeps every margin " + rangeOf(r.Low.Value, r.High.Value, gp.Unit)
	}
	if !r.Contains {
		s += " (outside)"
	}
	return s
}

// rangeOf writes "9.2–21 mm".
func rangeOf(lo, hi float64, unit string) string {
	if unit == "" {
		return fmtSig(lo) + "–" + fmtSig(hi)
	}
	u, err := units.Parse(unit)
	if err != nil {
		return fmtSig(lo) + "–" + fmtSig(hi)
	}
	return fmtSig(u.FromSI(lo)) + "–" + fmtSig(u.FromSI(hi)) + " " + unit
}

func fmtSig(v float64) string {
	if v == 0 || math.IsNaN(v) || math.IsInf(v, 0) {
		return units.Format(v, units.Unit{})
	}
	return fmt.Sprintf("%.3g", v)
}
