package flow

import (
	"fmt"
	"math"
	"slices"
	"strconv"

	"circa/check/geom"
	"circa/lang"
)

// Profile is a case's manoeuvre: every instant of its profile estimated as
// a steady state, the worst instant per margin, and the stretches where
// the body force changes faster than the loop's fluid can follow.
type Profile struct {
	Instants []Instant `json:"instants"`
	// Worst lists, for each margin, the instant closest to its limit (its
	// Time set).
	Worst []Margin `json:"worst"`
	// Fast lists the changes the quasi-static estimate cannot follow.
	Fast []FastChange `json:"fast_changes,omitempty"`
	// OtherState counts, under saturation_state auto, the instants whose
	// own liquid column would take the other saturation state than the
	// case's; every instant is estimated in the case's state.
	OtherState int `json:"other_state,omitempty"`
}

// Instant is one row of a profile at its operating point.
type Instant struct {
	Time       float64    `json:"time"` // s
	Yaw        float64    `json:"yaw"`
	Pitch      float64    `json:"pitch"`
	Roll       float64    `json:"roll"`
	Accel      [3]float64 `json:"accel"`
	BodyForce  [3]float64 `json:"body_force"`
	Circulates bool       `json:"circulates"`
	Reason     string     `json:"reason,omitempty"`
	MassFlow   float64    `json:"mass_flow"`
	// Transit is the fluid's time round the loop at this instant, s: the
	// inventory over the loop flow (for a network, over the condensers'
	// flow); 0 when the loop does not circulate.
	Transit float64 `json:"transit_time"`
	// ColumnShift is the instant's own column shift, K (CaseResult's).
	ColumnShift float64  `json:"column_shift,omitempty"`
	Margins     []Margin `json:"margins,omitempty"`
}

// FastChange is a stretch of a profile where, within one transit time of
// the fluid round the loop, the body force changes by most of what it
// changes over the whole stretch (a step, a quick turn): the loop cannot
// follow it in steady states.
type FastChange struct {
	From     float64 `json:"from"`     // s, start of the change
	To       float64 `json:"to"`       // s, its end
	Change   float64 `json:"change"`   // largest change of body force within one transit time, m/s²
	Duration float64 `json:"duration"` // To − From, s
	Transit  float64 `json:"transit_time"`
}

// manoeuvreNoise is the smallest change of body force a profile's rate
// check considers: 1 % of standard gravity (about half a degree of tilt),
// below which a change does not move any margin the estimate reports.
const manoeuvreNoise = 0.01 * geom.Gn

// CautionManoeuvre is added to an estimate's cautions when a profile
// changes faster than its loop can follow.
const CautionManoeuvre = "Where a manoeuvre changes attitude or acceleration within less than the fluid's transit time round the loop, the quasi-static estimate no longer holds: liquid and vapour lag behind the body force, so a transient model or a test is needed there."

// profilePoints returns a point for each distinct body force of a case's
// profile, and for each row the index of its point among them. An instant
// is a steady state of the body force alone (a turn about the vertical, a
// change of yaw alone, leaves it as it was), so rows that share one share
// its solution.
func profilePoints(c *lang.Case) ([]point, []int) {
	pr := c.Profile
	at := map[geom.Vec3]int{}
	var pts []point
	idx := make([]int, len(pr.Rows))
	for i, r := range pr.Rows {
		k := geom.BodyForceAt(r.Yaw, r.Pitch, r.Roll, geom.Vec3(r.Accel))
		j, ok := at[k]
		if !ok {
			j = len(pts)
			at[k] = j
			pts = append(pts, point{c: c, profile: true, yaw: r.Yaw, pitch: r.Pitch, roll: r.Roll, accel: geom.Vec3(r.Accel)})
		}
		idx[i] = j
	}
	return pts, idx
}

// gatherProfiles moves the results of profile points out of the case list
// into the profiles of their cases (a case's own point, not its sweep
// points, which may lie between them).
func (p *prepared) gatherProfiles(points []point, results []CaseResult) []CaseResult {
	instants := map[*lang.Case][]CaseResult{}
	for i, pt := range points {
		if pt.profile {
			instants[pt.c] = append(instants[pt.c], results[i])
		}
	}
	if len(instants) == 0 {
		return results
	}
	out := make([]CaseResult, 0, len(results))
	for i, pt := range points {
		if pt.profile {
			continue
		}
		base := results[i]
		if res := instants[pt.c]; !pt.grid && len(res) > 0 {
			_, idx := profilePoints(pt.c)
			base.Profile = p.profileResult(&base, pt.c, res, idx)
		}
		out = append(out, base)
	}
	return out
}

// profileResult builds a case's profile from the results of its distinct
// attitudes (idx maps each row to one).
func (p *prepared) profileResult(base *CaseResult, c *lang.Case, res []CaseResult, idx []int) *Profile {
	pr := &Profile{Instants: make([]Instant, len(idx))}
	for i, row := range c.Profile.Rows {
		r := &res[idx[i]]
		in := Instant{Time: row.Time, Yaw: row.Yaw, Pitch: row.Pitch, Roll: row.Roll, Accel: row.Accel, BodyForce: r.BodyForce,
			Circulates: r.Circulates, Reason: r.Reason, MassFlow: r.MassFlow, ColumnShift: r.ColumnShift}
		if r.Circulates {
			in.Transit = r.Totals.Transit
			if in.Transit == 0 && r.MassFlow > 0 {
				in.Transit = r.Totals.Inventory / r.MassFlow
			}
		}
		for _, m := range r.Margins {
			t := row.Time
			m.Time = &t
			in.Margins = append(in.Margins, m)
		}
		if in.BodyForce == [3]float64{} {
			in.BodyForce = [3]float64(geom.BodyForceAt(row.Yaw, row.Pitch, row.Roll, geom.Vec3(row.Accel)))
		}
		pr.Instants[i] = in
	}
	pr.Worst = worstInstants(pr.Instants)
	for _, i := range idx {
		if p.otherState(&res[i]) {
			pr.OtherState++
		}
	}
	p.instantFindings(base, c, res, idx)
	pr.Fast = fastChanges(pr.Instants)
	for _, fc := range pr.Fast {
		at := fc.To
		from, to := secPair(fc.From, fc.To)
		base.Findings = append(base.Findings, p.findingAt(&at, RuleManoeuvre, "warning", base.Case, "", fc.Transit, fc.Duration, "s", "",
			"the profile of case %s changes the body force by %s gn between t = %s s and %s s, within less than the fluid's transit time round the loop (%s s): the quasi-static estimate no longer holds there; a transient model or a test is needed",
			base.Case, strconv.FormatFloat(fc.Change/geom.Gn, 'g', 2, 64), from, to, secText(fc.Transit)))
	}
	return pr
}

// secText writes a time in seconds to three significant figures.
func secText(t float64) string { return strconv.FormatFloat(t, 'g', 3, 64) }

// secPair writes the two ends of a stretch of time to a tenth of their
// difference or finer (three significant figures at least): a step from
// 30 s to 30.01 s is not "from 30 s to 30 s".
func secPair(a, b float64) (string, string) {
	n := 3
	if d := math.Abs(b - a); d > 0 {
		if k := math.Ceil(math.Log10(math.Max(math.Abs(a), math.Abs(b))/d)) + 2; k > 3 {
			n = int(math.Min(k, 17))
		}
	}
	return strconv.FormatFloat(a, 'g', n, 64), strconv.FormatFloat(b, 'g', n, 64)
}

// worstInstants picks, for each margin, the instant and component closest
// to its limit (the earliest of equals).
func worstInstants(ins []Instant) []Margin {
	best := map[string]Margin{}
	for _, in := range ins {
		for _, m := range in.Margins {
			if b, ok := best[m.Margin]; !ok || m.Use > b.Use {
				best[m.Margin] = m
			}
		}
	}
	return byMargin(best)
}

// instantFindings adds to the case the findings of its profile's instants,
// one per rule and component (the first instant that has it), naming the
// instant and how many others share it.
func (p *prepared) instantFindings(base *CaseResult, c *lang.Case, res []CaseResult, idx []int) {
	type key struct{ rule, comp string }
	first := map[key]int{}
	count := map[key]int{}
	var order []key
	var found []Finding
	for i, row := range c.Profile.Rows {
		for _, f := range res[idx[i]].Findings {
			k := key{f.Rule, f.Component}
			count[k]++
			if _, ok := first[k]; ok {
				continue
			}
			first[k] = len(found)
			order = append(order, k)
			f.Message = fmt.Sprintf("at t = %s s of its profile: %s", secText(row.Time), f.Message)
			t := row.Time
			f.Time = &t
			found = append(found, f)
		}
	}
	for _, k := range order {
		f := found[first[k]]
		if n := count[k] - 1; n > 0 {
			word := "instants"
			if n == 1 {
				word = "instant"
			}
			f.Message += fmt.Sprintf(" (and at %d other %s)", n, word)
		}
		base.Findings = append(base.Findings, f)
	}
}

// fastChanges finds the stretches of a profile that change faster than the
// loop can follow. The rows are split into runs over which the body force
// keeps moving the same way (each step within a right angle of the one
// before); a run whose body force changes, within one transit time, by at
// least manoeuvreNoise and by half or more of its whole change is faster
// than the loop: a step, or a ramp shorter than about two transit times.
// The transit time is the longest of the run's circulating instants.
func fastChanges(ins []Instant) []FastChange {
	b := func(i int) geom.Vec3 { return geom.Vec3(ins[i].BodyForce) }
	var out []FastChange
	for s := 0; s+1 < len(ins); {
		// A run from s to e: the steps s→s+1 … e−1→e point the same way.
		e := s + 1
		for e+1 < len(ins) && b(e+1).Sub(b(e)).Dot(b(e).Sub(b(e-1))) > 0 {
			e++
		}
		if fc, ok := fastRun(ins, s, e); ok {
			out = append(out, fc)
		}
		s = e
	}
	return out
}

// fastRun checks one run of a profile, rows s to e.
func fastRun(ins []Instant, s, e int) (FastChange, bool) {
	b := func(i int) geom.Vec3 { return geom.Vec3(ins[i].BodyForce) }
	var tau float64
	for i := s; i <= e; i++ {
		tau = math.Max(tau, ins[i].Transit)
	}
	whole := 0.0
	for i := s + 1; i <= e; i++ {
		whole = math.Max(whole, b(i).Sub(b(s)).Norm())
	}
	if !(tau > 0) || whole < manoeuvreNoise {
		return FastChange{}, false
	}
	// The largest change within a window of one transit time starting at a
	// row, the window's end interpolated between rows.
	bestD, from, to := 0.0, 0, 0
	for i := s; i < e; i++ {
		end := ins[i].Time + tau
		for j := i + 1; j <= e; j++ {
			var d float64
			if ins[j].Time <= end {
				d = b(j).Sub(b(i)).Norm()
			} else {
				f := (end - ins[j-1].Time) / (ins[j].Time - ins[j-1].Time)
				d = b(j - 1).Add(b(j).Sub(b(j - 1)).Scale(f)).Sub(b(i)).Norm()
			}
			if d > bestD {
				bestD, from, to = d, i, j
			}
			if ins[j].Time > end {
				break
			}
		}
	}
	if bestD < manoeuvreNoise || bestD < 0.5*whole {
		return FastChange{}, false
	}
	return FastChange{From: ins[from].Time, To: ins[to].Time, Change: bestD, Duration: ins[to].Time - ins[from].Time, Transit: tau}, true
}

// fastManoeuvre reports whether some case's profile changes faster than its
// loop can follow.
func fastManoeuvre(loops []LoopResult) bool {
	for _, l := range loops {
		for _, c := range l.Cases {
			if c.Profile != nil && len(c.Profile.Fast) > 0 {
				return true
			}
		}
	}
	return false
}

// findingAt is a finding at instant t of the case's profile.
func (p *prepared) findingAt(t *float64, rule, sev, cs, comp string, v, lim float64, unit, field, format string, args ...any) Finding {
	f := p.finding(rule, sev, cs, comp, v, lim, unit, field, format, args...)
	f.Time = t
	return f
}

// ringWarm carries a single loop's excess head on its bracketing grid from
// one instant of a profile to the next, on one worker. Each instant is a
// steady state a small change of body force away from the one before, so
// the head curve moves little between rows: the next instant evaluates the
// head only where its sign could have changed, and refines each balance
// from where the one before was.
type ringWarm struct {
	c    *lang.Case // the case whose instants these are
	grid []float64
	// e is the excess head at each grid point as last evaluated, and drift
	// the most it may have moved since: the sum, over the instants that
	// skipped the point, of the largest change seen at the sampled points.
	e, drift []float64
	// roots are the balances of the last instant.
	roots []root
	// loss is the search of the same instants with the losses scaled by
	// lossK (the head-ratio margin's solve).
	loss  *ringWarm
	lossK float64
}

// scaled is the warm start of the instants' solves with the losses scaled
// by k (nil without a warm start).
func (w *ringWarm) scaled(k float64) *ringWarm {
	if w == nil {
		return nil
	}
	if w.loss == nil || w.lossK != k {
		w.loss, w.lossK = &ringWarm{c: w.c}, k
	}
	return w.loss
}

// stableRootAt is highestStableRoot, warm-started at an instant of a
// profile.
func (s *state) stableRootAt(ev *eval) (float64, bool) {
	if s.warm == nil {
		return s.highestStableRoot(ev)
	}
	roots, _ := s.instantRoots(ev, s.warm)
	for i := len(roots) - 1; i >= 0; i-- {
		if roots[i].slope < 0 {
			return roots[i].m, true
		}
	}
	return 0, false
}

// Warm-start constants: every warmSample-th grid point (and both ends) is
// evaluated at every instant, which measures how far the head curve
// moved; another point is evaluated again once its last head is within
// warmSafety times its accumulated drift of zero, so that no sign change
// of the cold search's grid is missed.
const (
	warmSample = 8
	warmSafety = 4
)

// instantRoots is ringRoots for one instant of a profile, warm-started
// from the instant before on the same worker (w; nil: a cold search). The
// brackets it refines are the cold search's, the grid points whose head
// it does not evaluate keep their sign; a balance is refined from a
// bracket around the one before, to the cold search's tolerance.
func (s *state) instantRoots(ev *eval, w *ringWarm) ([]root, float64) {
	if w == nil {
		return s.ringRoots(ev)
	}
	E := s.excessHead(ev)
	g := s.ringGrid()
	n := len(g)
	cold := !slices.Equal(g, w.grid)
	cur := make([]float64, n)
	have := make([]bool, n)
	get := func(j int) {
		if !have[j] {
			cur[j], have[j] = E(g[j]), true
		}
	}
	if cold {
		w.grid = append(w.grid[:0], g...)
		w.e = make([]float64, n)
		w.drift = make([]float64, n)
		w.roots = nil
		for j := range g {
			get(j)
		}
	} else {
		d := 0.0
		for j := 0; j < n; j += warmSample {
			get(j)
			d = math.Max(d, math.Abs(cur[j]-w.e[j]))
		}
		get(n - 1)
		d = math.Max(d, math.Abs(cur[n-1]-w.e[n-1]))
		if !finite(d) {
			for j := range g {
				get(j)
			}
		}
		for j := range g {
			if have[j] {
				continue
			}
			w.drift[j] += d
			if !(math.Abs(w.e[j]) > warmSafety*w.drift[j]) {
				get(j)
			}
		}
	}
	val := func(j int) float64 {
		if have[j] {
			return cur[j]
		}
		return w.e[j]
	}
	// Both ends of every sign change are evaluated at this instant; each
	// new value may reveal another change, so go on until none is left.
	for again := true; again; {
		again = false
		for j := 1; j < n; j++ {
			if (val(j) > 0) != (val(j-1) > 0) && (!have[j] || !have[j-1]) {
				get(j)
				get(j - 1)
				again = true
			}
		}
	}
	var roots []root
	for j := 1; j < n; j++ {
		if (cur[j] > 0) == (cur[j-1] > 0) || !have[j] || !have[j-1] {
			continue
		}
		a, b, ea, eb := g[j-1], g[j], cur[j-1], cur[j]
		if prev, ok := rootIn(w.roots, a, b); ok {
			a, b, ea, eb = narrowBracket(E, prev, a, b, ea, eb)
		}
		r := brent(E, a, b, ea, eb, 1e-12*g[j])
		h := 1e-6 * r
		roots = append(roots, root{m: r, slope: (E(r+h) - E(r-h)) / (2 * h)})
	}
	for j := range g {
		if have[j] {
			w.e[j], w.drift[j] = cur[j], 0
		}
	}
	w.roots = append(w.roots[:0], roots...)
	if cur[n-1] > 0 {
		roots = append(roots, extendRoots(E, g[n-1])...)
		w.grid = w.grid[:0] // above the grid: the next instant searches cold
	}
	return roots, cur[0]
}

// rootIn returns the balance of roots that lies in (a, b).
func rootIn(roots []root, a, b float64) (root, bool) {
	for _, r := range roots {
		if r.m > a && r.m < b {
			return r, true
		}
	}
	return root{}, false
}

// narrowBracket shrinks the bracket [a, b] of a sign change of E around
// the balance of the instant before: it steps out from it, first by one
// and a half times the Newton step its slope there gives, each step then
// four times the last, until E changes sign, and returns the smaller
// bracket with E at its ends.
func narrowBracket(E func(float64) float64, was root, a, b, ea, eb float64) (float64, float64, float64, float64) {
	prev := was.m
	ep := E(prev)
	if ep == 0 || !finite(ep) {
		return a, b, ea, eb
	}
	// The sign change lies on the side of prev whose end differs from it.
	up := (ep > 0) == (ea > 0)
	h := 1e-4 * prev
	if n := math.Abs(ep / was.slope); finite(n) && n > 0 {
		h = math.Max(1.5*n, 1e-9*prev)
	}
	for ; ; h *= 4 {
		if up {
			x := prev + h
			if x >= b {
				return prev, b, ep, eb
			}
			ex := E(x)
			if (ex > 0) != (ep > 0) {
				return prev, x, ep, ex
			}
			prev, ep = x, ex
		} else {
			x := prev - h
			if x <= a {
				return a, prev, ea, ep
			}
			ex := E(x)
			if (ex > 0) != (ep > 0) {
				return x, prev, ex, ep
			}
			prev, ep = x, ex
		}
	}
}
