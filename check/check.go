// Package check runs the checker's rules over a resolved .loop model.
//
// Rules are data: each Rule carries its identifier, category, severity and
// the text that "circa explain" prints, and a Run function that reports
// findings through a Context. Rules register themselves from init functions
// (one file per family), so rules of other families — the flow margins,
// for instance — join the same registry and the same output.
package check

import (
	"fmt"
	"sort"
	"sync"

	"circa/check/flow"
	"circa/check/geom"
	"circa/lang"
)

// Scope says how often a rule runs.
type Scope int

const (
	// PerLoop rules run once for every loop, with Context.Loop and
	// Context.Layout set.
	PerLoop Scope = iota
	// PerModel rules run once per model, with Context.Loop nil.
	PerModel
)

// Categories of rules. Rules of CategoryMargin need the flow estimate and
// are skipped with Options.SkipEstimates.
const (
	CategoryLanguage  = "language"
	CategoryTopology  = "topology"
	CategoryGeometry  = "geometry"
	CategoryDirection = "direction"
	CategoryTraps     = "traps"
	CategoryAllow     = "allow"
	CategoryMargin    = "margin"
	CategoryInternal  = "internal"
)

// Rule is one check. Rules with a nil Run are documented here but found
// elsewhere (the language's own findings, and those produced by Run itself).
type Rule struct {
	ID       string // stable kebab-case identifier, used in "# allow:" comments
	Category string
	Severity lang.Severity // default severity of its findings
	// Escalation, when not empty, says when a finding is reported as an
	// error instead of Severity ("the ratio is below 1"), so that "circa
	// explain" tells what --fail-on will do.
	Escalation string
	Scope      Scope
	Summary    string // one line
	Rationale  string // why it matters
	Example    string // a .loop fragment that triggers it
	Fix        string // how to fix it
	Run        func(*Context)
	// Partial rules also run on a loop whose text did not fully resolve
	// (lang.Loop.Unresolved), looking only at its resolved components
	// (Context.Components). The others need the whole loop and skip such a
	// loop: the resolver's error is the cause, and what they would report
	// follows from it.
	Partial bool
}

// Options tune a run.
type Options struct {
	// FailOn is the least severe finding that makes a run fail (see Fails);
	// the zero value is lang.Error.
	FailOn lang.Severity
	// Disabled rules do not run.
	Disabled map[string]bool
	// SkipEstimates skips the rules that need the flow estimate
	// (CategoryMargin), leaving the structural checks.
	SkipEstimates bool
	// Severity overrides the severity of a rule's findings.
	Severity map[string]lang.Severity
	// NoTilt skips the estimate's search for the attitudes at which
	// circulation stops: the other margins are still checked, the tilt
	// margin is not. The search repeats the estimate many times.
	NoTilt bool
	// Estimate, when set, is the flow estimate of this model (flow.Estimate
	// with NoTilt as above) that the margin rules report instead of running
	// their own, so a caller that also shows the estimate runs it once.
	Estimate *flow.Result
}

// Fails reports whether any finding is at least as severe as FailOn.
func (o Options) Fails(ds []lang.Diagnostic) bool {
	for _, d := range ds {
		if d.Severity <= o.FailOn {
			return true
		}
	}
	return false
}

// Margin is how much of an allowed limit a case uses, noted by the margin
// rules so that front ends can print the worst one.
type Margin struct {
	Rule      string
	Case      string
	Component string
	Message   string  // value and limit in the file's units, and how far inside or past it: "exit quality 0.42 at plate, limit 0.5: 84 % of the limit"
	Used      float64 // fraction of the limit used: 1 is at the limit, above 1 fails
	Loc       lang.Location
}

// Report is the outcome of a run.
type Report struct {
	Diagnostics []lang.Diagnostic
	Margins     []Margin
}

// Worst returns the margin closest to (or furthest past) its limit.
func (r *Report) Worst() (Margin, bool) {
	if r == nil || len(r.Margins) == 0 {
		return Margin{}, false
	}
	w := r.Margins[0]
	for _, m := range r.Margins[1:] {
		if m.Used > w.Used {
			w = m
		}
	}
	return w, true
}

// Context is what a rule sees while it runs.
type Context struct {
	Model   *lang.Model
	Loop    *lang.Loop   // nil for PerModel rules
	Layout  *geom.Layout // the loop's layout; nil for PerModel rules
	Graph   *Graph       // the loop's flow graph; nil for PerModel rules
	Options Options

	rule  *Rule
	state *runState
	memo  map[string]any // shared by every rule of one loop (or of the model)
}

type runState struct {
	diags   []lang.Diagnostic
	margins []Margin
}

// Components returns the loop's components whose ends and fields all
// resolved.
func (c *Context) Components() []*lang.Component {
	// Every rule of a loop asks for the list: it is made once per loop,
	// not once per rule. Callers only read it.
	if v, ok := c.memo[componentsMemo].([]*lang.Component); ok {
		return v
	}
	out := make([]*lang.Component, 0, len(c.Loop.Components))
	for _, comp := range c.Loop.Components {
		if !comp.Unresolved {
			out = append(out, comp)
		}
	}
	if c.memo != nil {
		c.memo[componentsMemo] = out
	}
	return out
}

// componentsMemo is the memo key of the loop's resolved components.
const componentsMemo = "check.Components"

// SeverityText describes the severities a rule's findings can have:
// "warning", or "warning (error when the ratio is below 1)".
func (r *Rule) SeverityText() string {
	if r.Escalation == "" {
		return r.Severity.String()
	}
	return fmt.Sprintf("%s (error when %s)", r.Severity, r.Escalation)
}

// Rule returns the rule being run.
func (c *Context) Rule() *Rule { return c.rule }

// Report records a finding. An empty Rule is the running rule's identifier.
func (c *Context) Report(d lang.Diagnostic) {
	if d.Rule == "" && c.rule != nil {
		d.Rule = c.rule.ID
	}
	c.state.diags = append(c.state.diags, d)
}

// Reportf records a finding of the running rule with its default severity
// and returns it for adding related locations and fixes.
func (c *Context) Reportf(loc lang.Location, format string, args ...any) *lang.Diagnostic {
	d := lang.Diagnostic{Rule: c.rule.ID, Severity: c.rule.Severity, Loc: loc, Format: format, Args: args}
	c.state.diags = append(c.state.diags, d)
	return &c.state.diags[len(c.state.diags)-1]
}

// NoteMargin records a margin for the summary.
func (c *Context) NoteMargin(m Margin) {
	if m.Rule == "" && c.rule != nil {
		m.Rule = c.rule.ID
	}
	c.state.margins = append(c.state.margins, m)
}

// Memo returns the value stored under key for this loop (or model), making
// it with f the first time. Rules use it to share work, such as one flow
// solution per case for every margin rule.
func (c *Context) Memo(key string, f func() any) any {
	if v, ok := c.memo[key]; ok {
		return v
	}
	v := f()
	c.memo[key] = v
	return v
}

var (
	regMu    sync.RWMutex
	registry = map[string]*Rule{}
)

// Register adds a rule; it panics on a duplicate or empty identifier, which
// is a programming error caught by any test run.
func Register(r *Rule) {
	regMu.Lock()
	defer regMu.Unlock()
	if r == nil || r.ID == "" {
		panic("check: rule without an identifier")
	}
	if _, dup := registry[r.ID]; dup {
		panic("check: rule " + r.ID + " registered twice")
	}
	registry[r.ID] = r
}

// Rules returns every registered rule, by category then identifier.
func Rules() []*Rule {
	regMu.RLock()
	defer regMu.RUnlock()
	out := make([]*Rule, 0, len(registry))
	for _, r := range registry {
		out = append(out, r)
	}
	sort.Slice(out, func(i, j int) bool {
		if ci, cj := categoryOrder(out[i].Category), categoryOrder(out[j].Category); ci != cj {
			return ci < cj
		}
		return out[i].ID < out[j].ID
	})
	return out
}

func categoryOrder(c string) int {
	for i, k := range []string{CategoryLanguage, CategoryTopology, CategoryGeometry, CategoryDirection, CategoryTraps, CategoryMargin, CategoryAllow, CategoryInternal} {
		if k == c {
			return i
		}
	}
	return 100
}

// Lookup returns the rule with the given identifier.
func Lookup(id string) (*Rule, bool) {
	regMu.RLock()
	defer regMu.RUnlock()
	r, ok := registry[id]
	return r, ok
}

// Run returns the model's own findings and every rule's, silenced by the
// "# allow:" comments, followed by findings for silencers that silenced
// nothing, sorted by file and offset. It never panics: a rule that fails is
// reported as an "internal" finding. Run marks the model's silencers as
// used, so one model must not be checked by two goroutines at once.
func Run(m *lang.Model, opts Options) []lang.Diagnostic {
	return RunReport(m, opts).Diagnostics
}

// RunReport is Run with the margins the rules noted.
func RunReport(m *lang.Model, opts Options) *Report {
	rep := &Report{}
	if m == nil {
		return rep
	}
	for _, a := range m.Allows {
		a.Used = false
	}
	st := &runState{}
	rules := Rules()
	ran := map[string]bool{}
	active := make([]*Rule, 0, len(rules))
	for _, r := range rules {
		if r.Run == nil || opts.Disabled[r.ID] || (opts.SkipEstimates && r.Category == CategoryMargin) {
			continue
		}
		active = append(active, r)
		ran[r.ID] = true
	}
	// Findings made by Run itself count as run unless disabled.
	for _, id := range []string{"unused-allow", "unknown-rule", "internal"} {
		ran[id] = !opts.Disabled[id]
	}
	modelMemo := map[string]any{}
	for _, r := range active {
		if r.Scope == PerModel {
			runRule(&Context{Model: m, Options: opts, rule: r, state: st, memo: modelMemo}, lang.Location{File: m.Root})
		}
	}
	for _, l := range m.Loops {
		var lay *geom.Layout
		var g *Graph
		func() {
			defer func() {
				if p := recover(); p != nil {
					st.diags = append(st.diags, internal(l.NameLoc(), "laying out loop "+l.Name, p))
				}
			}()
			lay = geom.Place(l)
			g = NewGraph(l)
		}()
		if lay == nil || g == nil {
			continue
		}
		memo := map[string]any{}
		for _, r := range active {
			if r.Scope == PerLoop && (r.Partial || !l.Unresolved) {
				runRule(&Context{Model: m, Loop: l, Layout: lay, Graph: g, Options: opts, rule: r, state: st, memo: memo}, l.NameLoc())
			}
		}
	}
	var out []lang.Diagnostic
	out = append(out, m.Diags...) // the language's findings are never silenced
	for _, d := range st.diags {
		if s, ok := opts.Severity[d.Rule]; ok {
			d.Severity = s
		}
		if d.Rule != "internal" && m.Silenced(d.Rule, d.Loc) {
			continue
		}
		out = append(out, d)
	}
	out = append(out, allowFindings(m, opts, ran)...)
	sortDiagnostics(out)
	rep.Diagnostics = out
	rep.Margins = st.margins
	return rep
}

func runRule(c *Context, at lang.Location) {
	defer func() {
		if p := recover(); p != nil {
			c.state.diags = append(c.state.diags, internal(at, "rule "+c.rule.ID, p))
		}
	}()
	c.rule.Run(c)
}

func internal(at lang.Location, what string, p any) lang.Diagnostic {
	return lang.Diagnostic{Rule: "internal", Severity: lang.Error, Loc: at,
		Format: "internal error in %s: %v (please report it)", Args: []any{what, fmt.Sprint(p)}}
}

// sortDiagnostics orders findings by file, offset, then rule and message, so
// output is stable.
func sortDiagnostics(ds []lang.Diagnostic) {
	sort.SliceStable(ds, func(i, j int) bool {
		a, b := ds[i], ds[j]
		if a.Loc.File != b.Loc.File {
			return a.Loc.File < b.Loc.File
		}
		if a.Loc.Span.Start != b.Loc.Span.Start {
			return a.Loc.Span.Start < b.Loc.Span.Start
		}
		if a.Rule != b.Rule {
			return a.Rule < b.Rule
		}
		return a.Message() < b.Message()
	})
}
