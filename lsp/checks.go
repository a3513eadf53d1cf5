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
// one analysis, which hover and inlay hints show.
type estimates struct {
	report  *check.Report
	flow    *flow.Result
	flowErr error
	took    time.Duration // the estimate's run time, to judge the margin checks' cost
}

// checkModel runs the quick part of the command line's checks (every rule
// but the margins, which need the estimate's tilt-limit search) and the
// circulation estimate that hover and inlay hints show, without that search.
// The search takes seconds on large networks, far longer than typing allows;
// fullCheck runs it afterwards.
func checkModel(ctx context.Context, m *lang.Model) ([]lang.Diagnostic, *estimates) {
	if ctx.Err() != nil {
		return nil, nil
	}
	est := &estimates{}
	est.report = check.RunReport(m, check.Options{SkipEstimates: true})
	if ctx.Err() != nil {
		return nil, nil
	}
	t0 := time.Now()
	est.flow, est.flowErr = flow.Estimate(m, flow.Options{NoTilt: true})
	est.took = time.Since(t0)
	return est.report.Diagnostics, est
}

// autoMarginBudget is the longest single estimate for which "auto" runs the
// margin checks: their tilt search repeats the estimate hundreds of times.
const autoMarginBudget = 10 * time.Millisecond

// marginMode says how the margin rules run for an analysis under the
// settings: not at all, without the tilt-limit search, or in full.
type marginMode int

const (
	marginsOff marginMode = iota
	marginsNoTilt
	marginsFull
)

// wantMarginChecks decides how the margin rules run. "auto" runs them in
// full when one estimate is quick, else without the tilt-limit search
// (which repeats the estimate hundreds of times).
func wantMarginChecks(st Settings, est *estimates) marginMode {
	switch st.MarginChecks {
	case "always":
		return marginsFull
	case "never":
		return marginsOff
	}
	if est != nil && est.took < autoMarginBudget {
		return marginsFull
	}
	return marginsNoTilt
}

// fullCheck runs the command line's checks, margins included.
func fullCheck(m *lang.Model, mode marginMode) []lang.Diagnostic {
	return check.RunReport(m, check.Options{NoTilt: mode == marginsNoTilt}).Diagnostics
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
	fmt.Fprintf(&b, "\n**Estimate, case `%s`**", cr.Case)
	if !cr.Circulates {
		fmt.Fprintf(&b, ": no circulation — %s\n", cr.Reason)
		return b.String()
	}
	st, ok := componentState(cr, comp.Name)
	if !ok {
		b.WriteString(": no state for this component\n")
		return b.String()
	}
	fmt.Fprintf(&b, " (saturation %s, %s)\n\n", units.Format(cr.SatTemperature, uDegC), cr.SatSource)
	if mu, ok := est.methods(comp.Loop.Name); ok {
		fmt.Fprintf(&b, "void fraction %s, friction %s\n\n", mu.Void, mu.Friction)
	}
	b.WriteString("| | |\n|---|---|\n")
	fmt.Fprintf(&b, "| mass flow | %s |\n", units.Format(st.MassFlow, uGs))
	fmt.Fprintf(&b, "| quality in → out | %.3f → %.3f |\n", st.XIn, st.XOut)
	fmt.Fprintf(&b, "| void fraction outlet / mean | %.3f / %.3f |\n", st.VoidOut, st.VoidMean)
	if st.Heat != 0 {
		fmt.Fprintf(&b, "| heat | %s |\n", units.Format(st.Heat, uW))
	}
	fmt.Fprintf(&b, "| Δp friction | %s |\n", units.Format(st.DpFriction, uPa))
	fmt.Fprintf(&b, "| Δp local | %s |\n", units.Format(st.DpLocal, uPa))
	fmt.Fprintf(&b, "| Δp acceleration | %s |\n", units.Format(st.DpAccel, uPa))
	fmt.Fprintf(&b, "| Δp gravity | %s |\n", units.Format(st.DpGravity, uPa))
	fmt.Fprintf(&b, "| Δp total (in − out) | %s |\n", units.Format(st.DpTotal, uPa))
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
		fmt.Fprintf(&b, "mass flow %s, saturation %s (%s, %s)\n", units.Format(cr.MassFlow, uGs),
			units.Format(cr.SatTemperature, uDegC), units.Format(cr.SatPressure, uBar), cr.SatSource)
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
	return fmt.Sprintf("ṁ %s, x_out %.2f", units.Format(st.MassFlow, uGs), st.XOut)
}

// ruleText explains a rule by its registry entry.
func ruleText(id string) (string, bool) {
	r, ok := check.Lookup(id)
	if !ok {
		return "", false
	}
	var b strings.Builder
	fmt.Fprintf(&b, "**%s** (%s, %s): %s\n", r.ID, r.Category, r.Severity, r.Summary)
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
	return &estimates{flow: est.flow, flowErr: est.flowErr, took: est.took}
}
