package flow

import (
	"math"
	"sort"

	"circa/lang"
)

// Several operating points of a network. A single loop's balances are the
// roots of its excess head over the one flow; a network's are the
// solutions of its cycle balances, which Newton's iteration finds one at a
// time. Along the flow pattern of the solution found, the projected excess
// head P(m) = u·E(m·u)/(u·u) (u the cycle flows per unit loop flow) is a
// single loop's excess head; its sign changes on the single-loop grid,
// refined in the boiling band, start Newton's iteration for the others.
// Each distinct solution is a balance; it is statically stable when P falls
// with flow along its own pattern (the Ledinegg criterion of a single
// loop), whose slope it reports. Only networks whose condensers return
// subcooled liquid, or under local saturation, are searched.

// maxRootCycles bounds the networks searched for further balances: each
// sign change costs a Newton solve.
const maxRootCycles = 12

// loopFlow is the flow through the condensers at cycle flows f, kg/s.
func (s *state) loopFlow(f []float64, ev *eval) float64 {
	s.branchFlows(f, ev)
	var m float64
	for bi, b := range s.net.branches {
		for _, lg := range b.legs {
			if s.net.comps[lg.ci].kind == lang.Condenser {
				m += math.Abs(ev.mb[bi])
				break
			}
		}
	}
	return m
}

// patternHead is P(m) along pattern u.
func (s *state) patternHead(u, f []float64, ev *eval, m float64) float64 {
	var uu, ue float64
	for k := range u {
		f[k] = m * u[k]
	}
	s.evaluate(f, ev)
	for k := range u {
		uu += u[k] * u[k]
		ue += u[k] * ev.e[k]
	}
	return ue / uu
}

// networkRoots lists the balances of a network whose solution f0 was found.
func (s *state) networkRoots(ev *eval, f0 []float64) []root {
	if len(f0) > maxRootCycles || !(s.coldest() < 0) && !s.local {
		// The excess head can rise with flow only with a subcooled inlet
		// (the Ledinegg excursion; see TestLedineggLoop): without
		// subcooled condenser outlets or local saturation there is no
		// second balance to look for.
		return nil
	}
	l0 := s.loopFlow(f0, ev)
	if !(l0 > 0) {
		return nil
	}
	u := make([]float64, len(f0))
	for k := range u {
		u[k] = f0[k] / l0
	}
	f := make([]float64, len(f0))
	found, _ := findRoots(func(m float64) float64 { return s.patternHead(u, f, ev, m) }, s.ringGrid())
	sols := [][]float64{append([]float64(nil), f0...)}
	for _, r := range found {
		start := make([]float64, len(u))
		for k := range u {
			start[k] = r.m * u[k]
		}
		fi, _, err := s.newton(ev, start, nil)
		if err != nil {
			continue
		}
		li := s.loopFlow(fi, ev)
		dup := !(li > 0)
		for _, sj := range sols {
			if lj := s.loopFlow(sj, ev); math.Abs(li-lj) <= 1e-6*lj {
				dup = true
			}
		}
		if !dup {
			sols = append(sols, fi)
		}
	}
	roots := make([]root, 0, len(sols))
	for _, fi := range sols {
		li := s.loopFlow(fi, ev)
		ui := make([]float64, len(fi))
		for k := range ui {
			ui[k] = fi[k] / li
		}
		h := 1e-6 * li
		slope := (s.patternHead(ui, f, ev, li+h) - s.patternHead(ui, f, ev, li-h)) / (2 * h)
		roots = append(roots, root{m: li, slope: slope, f: fi})
	}
	sort.Slice(roots, func(i, j int) bool { return roots[i].m < roots[j].m })
	return roots
}

// networkBalances records a network's balances in cr when it has more than
// one, with a finding for each statically unstable one, and returns the
// cycle flows to report: the stable balance of highest flow, as for a
// single loop (f when none is stable).
func (p *prepared) networkBalances(s *state, ev *eval, f []float64, cr *CaseResult) []float64 {
	roots := s.networkRoots(ev, f)
	if len(roots) < 2 {
		return f
	}
	if best := p.recordBalances(roots, "the excess head along the network's flow pattern", cr); best >= 0 {
		return roots[best].f
	}
	return f
}

// recordBalances records the balances roots (ascending in flow) in cr, with
// a finding for each statically unstable one, where head (the excess head
// the balance is on) rises with flow, and returns the index of the stable
// balance of highest flow (−1: none is stable).
func (p *prepared) recordBalances(roots []root, head string, cr *CaseResult) int {
	best := -1
	for i, r := range roots {
		cr.Roots = append(cr.Roots, Root{MassFlow: r.m, Slope: r.slope, Stable: r.slope < 0})
		if r.slope < 0 {
			best = i
		} else {
			cr.Findings = append(cr.Findings, p.finding(RuleUnstable, "warning", cr.Case, "", r.m, 0, "kg/s", "",
				"statically unstable balance (Ledinegg: %s rises with flow) at %.3g g/s in case %s", head, r.m*1e3, cr.Case))
		}
	}
	return best
}
