package flow

import (
	"fmt"
	"math"
	"strings"

	"circa/units"
)

// maxSplitListed is the most parallel branches whose flows starvedNote
// lists one by one; past it the note gives their range.
const maxSplitListed = 8

// starvedNote says, for an evaporator in a branch of a parallel network,
// how the flow splits between its branch and the branches beside it (those
// joining the same two junctions), and which element of its branch has the
// largest friction and local loss: what starves it. It is "" for a single
// loop.
func (p *prepared) starvedNote(cr *CaseResult, ci int) string {
	n := p.net
	if n == nil || n.ring || ci >= len(cr.Components) {
		return ""
	}
	of := -1
	for bi, b := range n.branches {
		for _, lg := range b.legs {
			if lg.ci == ci {
				of = bi
			}
		}
	}
	if of < 0 {
		return ""
	}
	b := n.branches[of]
	flow := func(bi int) float64 { return math.Abs(cr.Components[n.branches[bi].legs[0].ci].MassFlow) }
	name := func(bi int) string {
		for _, lg := range n.branches[bi].legs {
			if n.comps[lg.ci].kind.String() == "evaporator" {
				return n.comps[lg.ci].name
			}
		}
		return n.comps[n.branches[bi].legs[0].ci].name
	}
	heated := func(bi int) bool {
		for _, lg := range n.branches[bi].legs {
			if n.comps[lg.ci].kind.String() == "evaporator" {
				return true
			}
		}
		return false
	}
	beside := func(bi int) bool {
		o := n.branches[bi]
		return heated(bi) && ((o.from == b.from && o.to == b.to) || (o.from == b.to && o.to == b.from))
	}
	total := 0.0
	var split []string
	for bi := range n.branches {
		if beside(bi) {
			total += flow(bi)
		}
	}
	if !(total > 0) {
		return ""
	}
	count, lo, hi := 0, math.Inf(1), 0.0
	for bi := range n.branches {
		if beside(bi) {
			count++
			lo, hi = math.Min(lo, flow(bi)), math.Max(hi, flow(bi))
		}
	}
	note := ""
	switch {
	case count > maxSplitListed:
		// Every evaporator's finding listing every branch beside it would
		// grow as the square of the branches.
		note = fmt.Sprintf("; %d parallel branches split the flow, %s to %s g/s each; %s takes %s g/s (%.2g %%)",
			count, units.Sig(lo*1e3, 3), units.Sig(hi*1e3, 3), name(of), units.Sig(flow(of)*1e3, 3), 100*flow(of)/total)
	case count > 1:
		for bi := range n.branches {
			if beside(bi) {
				split = append(split, fmt.Sprintf("%s %s g/s (%.0f %%)", name(bi), units.Sig(flow(bi)*1e3, 3), 100*flow(bi)/total))
			}
		}
		note = "; the parallel branches split the flow " + strings.Join(split, ", ")
	}
	worst, wl, sum := -1, 0.0, 0.0
	for _, lg := range b.legs {
		cs := cr.Components[lg.ci]
		loss := math.Abs(cs.DpFriction) + math.Abs(cs.DpLocal)
		sum += loss
		if loss > wl {
			worst, wl = lg.ci, loss
		}
	}
	if worst >= 0 && sum > 0 {
		cp := n.comps[worst]
		note += fmt.Sprintf("; the largest loss in its branch is %s %s, %.0f %% of the branch's friction and local losses (%s kPa; bore %s mm",
			cp.kind, cp.name, 100*wl/sum, units.Sig(wl/1e3, 3), units.Sig(cp.D*1e3, 3))
		if cp.K > 0 {
			note += fmt.Sprintf(", loss coefficient %.3g", cp.K)
		}
		note += ")"
	}
	return note
}
