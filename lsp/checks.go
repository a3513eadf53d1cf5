package lsp

import (
	"context"
	"fmt"
	"sort"
	"strings"
	"time"

	"circa/check"
	"circa/check/flow"
	"circa/lang"
	"circa/units"
)

// estimates are the checker's and the circulation estimate's results for
// one analysis, which the diagnostics, hover and inlay hints share.
type estimates struct {
	report  *check.Report
	flow    *flow.Result
	flowErr error
	tilt    bool          // the estimate searched the tilt limits
	took    time.Duration // the estimate's run time, to judge the margin checks' cost
	version int32         // the root document's version it was made from (-1: not open)
}

// checkModel runs the command line's checks and the circulation estimate
// once: the margin rules report that estimate, which hover and inlay hints
// show too. The mode says whether the margin rules run and whether the
// estimate searches the tilt limits.
func (s *Server) checkModel(ctx context.Context, m *lang.Model, mode marginMode) (diags []lang.Diagnostic, est *estimates) {
	if ctx.Err() != nil {
		return nil, nil
	}
	defer func() {
		if r := recover(); r != nil {
			diags, est = failedChecks(s.recovered(m.Root, "checking the loop", r), mode)
		}
	}()
	if s.beforeCheck != nil {
		s.beforeCheck(m.Root)
	}
	est = &estimates{tilt: mode == marginsFull}
	t0 := time.Now()
	est.flow, est.flowErr = flow.Estimate(m, flow.Options{NoTilt: !est.tilt, Cancel: ctx.Done()})
	est.took = time.Since(t0)
	if ctx.Err() != nil {
		return nil, nil
	}
	opts := check.Options{SkipEstimates: mode == marginsOff, NoTilt: !est.tilt}
	if est.flowErr == nil {
		// Otherwise the rules report the request's error themselves.
		opts.Estimate = est.flow
	}
	est.report = check.RunReport(m, opts)
	return est.report.Diagnostics, est
}

// autoMarginBudget is the longest single estimate (without the tilt-limit
// search) for which "auto" runs the search: it repeats the estimate many
// times.
const autoMarginBudget = 10 * time.Millisecond

// autoTiltBudget is the longest estimate with the tilt-limit search for
// which "auto" keeps running the search with every check.
const autoTiltBudget = 150 * time.Millisecond

// marginMode says how the margin rules run for an analysis under the
// settings: not at all, without the tilt-limit search, or in full.
type marginMode int

const (
	marginsOff marginMode = iota
	marginsNoTilt
	marginsFull
)

// wantMarginChecks decides how the margin rules run, given the previous
// estimate of the same root (nil: none yet). "auto" runs them in full
// unless the previous estimate says that would be slow: then the checks
// run without the tilt-limit search and the complete checks follow in the
// background.
func wantMarginChecks(st Settings, prev *estimates) marginMode {
	switch st.MarginChecks {
	case "always":
		return marginsFull
	case "never":
		return marginsOff
	}
	switch {
	case prev == nil:
		return marginsFull
	case prev.tilt && prev.took < autoTiltBudget, !prev.tilt && prev.took < autoMarginBudget:
		return marginsFull
	}
	return marginsNoTilt
}

// estimatesFor returns the finished estimates of an analysis, else the
// latest finished ones for the same root (shown until the new ones land).
func (s *Server) estimatesFor(sn *snapshot, a *analysis) *estimates {
	if _, est, ok := a.checks(); ok {
		return est
	}
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.lastEst[a.root]
}

// staleNote marks an estimate made from an older version of the root
// document than the snapshot's (shown while the new one is computed).
func (est *estimates) staleNote(sn *snapshot, a *analysis) string {
	if est == nil || sn == nil || a == nil {
		return ""
	}
	if v := rootVersion(sn, a); v >= 0 && est.version >= 0 && est.version != v {
		return fmt.Sprintf(" (from version %d; version %d is being checked)", est.version, v)
	}
	return ""
}

// nominalCase returns the estimate of a loop in the nominal case.
func (est *estimates) nominalCase(m *lang.Model, loop string) (*flow.CaseResult, bool) {
	if est == nil || est.flow == nil {
		return nil, false
	}
	name := ""
	if m.Nominal != nil {
		name = m.Nominal.Name
	}
	return est.caseResult(loop, name)
}

func (est *estimates) caseResult(loop, name string) (*flow.CaseResult, bool) {
	if est == nil || est.flow == nil {
		return nil, false
	}
	for i := range est.flow.Loops {
		l := &est.flow.Loops[i]
		if l.Loop != loop {
			continue
		}
		for j := range l.Cases {
			if c := &l.Cases[j]; c.Case == name && !c.Grid {
				return c, true
			}
		}
	}
	return nil, false
}

func (est *estimates) methods(loop string) (flow.MethodsUsed, bool) {
	for _, l := range est.flow.Loops {
		if l.Loop == loop {
			return l.Methods, true
		}
	}
	return flow.MethodsUsed{}, false
}

func componentState(cr *flow.CaseResult, name string) (*flow.ComponentState, bool) {
	for i := range cr.Components {
		if cr.Components[i].Component == name {
			return &cr.Components[i], true
		}
	}
	return nil, false
}

var (
	uGs   = units.MustParse("g/s")
	uPa   = units.MustParse("Pa")
	uW    = units.MustParse("W")
	uDegC = units.MustParse("degC")
	uBar  = units.MustParse("bar")
)

// componentEstimate renders a component's estimated state in the nominal
// case as a small table.
func (s *Server) componentEstimate(c *cursor, comp *lang.Component) string {
	est := s.estimatesFor(c.snap, c.a)
	cr, ok := est.nominalCase(c.m, comp.Loop.Name)
	if !ok {
		return "\n_No estimate yet._\n"
	}
	var b strings.Builder
	fmt.Fprintf(&b, "\n**Estimate, case `%s`**%s", cr.Case, est.staleNote(c.snap, c.a))
	if !cr.Circulates {
		fmt.Fprintf(&b, ": no circulation — %s\n", cr.Reason)
		return b.String()
	}
	st, ok := componentState(cr, comp.Name)
	if !ok {
		b.WriteString(": no state for this component\n")
		return b.String()
	}
	fmt.Fprintf(&b, " (saturation %s, %s)\n\n", prettyFormat(cr.SatTemperature, uDegC), cr.SatSource)
	if mu, ok := est.methods(comp.Loop.Name); ok {
		fmt.Fprintf(&b, "void fraction %s, friction %s\n\n", mu.Void, mu.Friction)
	}
	b.WriteString("| | |\n|---|---|\n")
	fmt.Fprintf(&b, "| mass flow | %s |\n", prettyFormat(st.MassFlow, uGs))
	fmt.Fprintf(&b, "| quality in → out | %.3f → %.3f |\n", st.XIn, st.XOut)
	fmt.Fprintf(&b, "| void fraction outlet / mean | %.3f / %.3f |\n", st.VoidOut, st.VoidMean)
	if st.Heat != 0 {
		fmt.Fprintf(&b, "| heat | %s |\n", prettyFormat(st.Heat, uW))
	}
	// One sign convention, as every estimate output: each term is a drop
	// along the flow, and they add up to p_in − p_out.
	bu := st.Budget
	fmt.Fprintf(&b, "| pressure drop: friction | %s |\n", prettyFormat(bu.Friction, uPa))
	fmt.Fprintf(&b, "| pressure drop: gravity | %s |\n", prettyFormat(bu.Gravity, uPa))
	fmt.Fprintf(&b, "| pressure drop: acceleration (phase change) | %s |\n", prettyFormat(bu.Acceleration, uPa))
	if bu.AreaChange != 0 {
		fmt.Fprintf(&b, "| pressure drop: flow-area change at the inlet | %s |\n", prettyFormat(bu.AreaChange, uPa))
	}
	fmt.Fprintf(&b, "| pressure drop: local | %s |\n", prettyFormat(bu.Local, uPa))
	fmt.Fprintf(&b, "| pressure drop p_in − p_out | %s |\n", prettyFormat(bu.Total, uPa))
	for _, mg := range cr.Margins {
		if mg.Component == comp.Name {
			fmt.Fprintf(&b, "| margin %s | %s of %s (%.0f %% used, %s) |\n", mg.Margin, fmtNum(mg.Value), fmtLimit(mg.Limit, mg.Unit), 100*mg.Use, mg.Status)
		}
	}
	return b.String()
}

func fmtLimit(v float64, unit string) string {
	if unit == "" {
		return fmtNum(v)
	}
	return fmtNum(v) + " " + unit
}

// caseEstimate renders a case's operating point and its worst margin.
func (s *Server) caseEstimate(c *cursor, cs *lang.Case) string {
	est := s.estimatesFor(c.snap, c.a)
	if est == nil || est.flow == nil {
		return "\n_No estimate yet._\n"
	}
	var b strings.Builder
	if n := est.staleNote(c.snap, c.a); n != "" {
		fmt.Fprintf(&b, "\n_Estimate%s_\n", n)
	}
	for _, l := range est.flow.Loops {
		cr, ok := est.caseResult(l.Loop, cs.Name)
		if !ok {
			continue
		}
		fmt.Fprintf(&b, "\n**Loop `%s`**: ", l.Loop)
		if !cr.Circulates {
			fmt.Fprintf(&b, "no circulation — %s\n", cr.Reason)
			continue
		}
		fmt.Fprintf(&b, "mass flow %s, saturation %s (%s, %s)\n", prettyFormat(cr.MassFlow, uGs),
			prettyFormat(cr.SatTemperature, uDegC), prettyFormat(cr.SatPressure, uBar), cr.SatSource)
		ms := append([]flow.Margin(nil), cr.Margins...)
		sort.SliceStable(ms, func(i, j int) bool { return ms[i].Use > ms[j].Use })
		if len(ms) > 0 {
			w := ms[0]
			at := ""
			if w.Component != "" {
				at = " at `" + w.Component + "`"
			}
			fmt.Fprintf(&b, "\nworst margin: **%s**%s — %s of %s, %.0f %% of the limit used (%s)\n", w.Margin, at, fmtNum(w.Value), fmtLimit(w.Limit, w.Unit), 100*w.Use, w.Status)
		}
		b.WriteString(manoeuvreEstimate(cr))
	}
	return b.String()
}

func estimatedSaturation(c *cursor, l *lang.Loop) (float64, bool) {
	est := c.snapServer().estimatesFor(c.snap, c.a)
	cr, ok := est.nominalCase(c.m, l.Name)
	if !ok || cr.SatTemperature <= 0 {
		return 0, false
	}
	return cr.SatTemperature, true
}

// componentHint is the inlay hint after a component: its mass flow and exit
// quality in the nominal case.
func componentHint(c *cursor, est *estimates, comp *lang.Component) string {
	cr, ok := est.nominalCase(c.m, comp.Loop.Name)
	if !ok || !cr.Circulates {
		return ""
	}
	st, ok := componentState(cr, comp.Name)
	if !ok {
		return ""
	}
	return fmt.Sprintf("ṁ %s, x_out %.2f", prettyFormat(st.MassFlow, uGs), st.XOut)
}

// ruleText explains a rule by its registry entry.
func ruleText(id string) (string, bool) {
	r, ok := check.Lookup(id)
	if !ok {
		return "", false
	}
	var b strings.Builder
	fmt.Fprintf(&b, "**%s** (%s, %s): %s\n", r.ID, r.Category, r.SeverityText(), r.Summary)
	if r.Rationale != "" {
		fmt.Fprintf(&b, "\n%s\n", r.Rationale)
	}
	if r.Example != "" {
		fmt.Fprintf(&b, "\nExample:\n```\n%s\n```\n", r.Example)
	}
	if r.Fix != "" {
		fmt.Fprintf(&b, "\nFix: %s\n", r.Fix)
	}
	return b.String(), true
}

func (est *estimates) tookOrZero() time.Duration {
	if est == nil {
		return 0
	}
	return est.took
}

// detached keeps only the estimate of an analysis: the flow result holds
// names and numbers, no references into its model, so keeping it does not
// keep the model (or the checker's report) alive.
func (est *estimates) detached() *estimates {
	if est == nil || est.flow == nil {
		return nil
	}
	return &estimates{flow: est.flow, flowErr: est.flowErr, tilt: est.tilt, took: est.took, version: est.version}
}
