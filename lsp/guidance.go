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
// longer holds.
func (gs *guideStore) put(sn *snapshot, a *analysis, g *guidance) {
	gs.mu.Lock()
	defer gs.mu.Unlock()
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
			g := s.computeGuidance(sn.ctx, a)
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

// computeGuidance works out the guidance of an analysis whose checks are
// done: nil when cancelled or when the checks are not there.
func (s *Server) computeGuidance(ctx context.Context, a *analysis) (out *guidance) {
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
	opts := guide.Options{Flow: fo, Workers: max(1, runtime.GOMAXPROCS(0)-1)}
	if est != nil && !est.tilt && est.flowErr == nil {
		opts.Base = est.flow
	} else {
		t0 := time.Now()
		base, err := flow.Estimate(m, flow.Options{NoTilt: true, Cancel: ctx.Done()})
		if ctx.Err() != nil {
			return nil
		}
		if err == nil {
			opts.Base = base
		}
		if cost := guidanceCost(m, time.Since(t0)); cost > guideBudget && a.settings.MarginChecks != "always" {
			return &guidance{note: fmt.Sprintf("not computed while editing: it would take about %s (one estimate takes %s); circa estimate prints it, and marginChecks \"always\" computes it here",
				cost.Round(time.Second), time.Since(t0).Round(time.Millisecond))}
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

// guideBudget bounds the background work the guidance may take; a
// costlier file (a large network with many parameters) gets none unless
// marginChecks is "always".
const guideBudget = 20 * time.Second

// guidanceCost guesses what the guidance of m costs from one estimate's
// time: a few dozen estimates per parameter and per loop's charge, on one
// worker.
func guidanceCost(m *lang.Model, one time.Duration) time.Duration {
	return one * time.Duration(40*(len(m.Params)+len(m.Loops)))
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
