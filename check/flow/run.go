package flow

import (
	"fmt"
	"math"
	"strings"

	"circa/lang"
	"circa/units"
)

// run estimates one case; a network's Newton iteration starts from start
// when given (the previous case's cycle flows). It returns the case's cycle
// flows when it circulates.
func (p *prepared) run(pt point, tilt bool, start []float64) (CaseResult, []float64) {
	cr := CaseResult{Case: caseName(pt.c), Grid: pt.grid, Yaw: pt.yaw, Pitch: pt.pitch, Roll: pt.roll,
		Accel: [3]float64(pt.accel), pointCase: pt.c}
	if !pt.derived() {
		cr.Overrides = overrides(pt.c, p.net.comps)
	}
	s, fs := p.newState(pt, &cr)
	cr.Findings = append(cr.Findings, fs...)
	if s == nil {
		cr.Reason = "no operating state (see the findings)"
		return cr, nil
	}
	cr.BodyForce = [3]float64(s.b)
	p.phaseCautions(s, &cr)
	ev := s.newEval()
	var f []float64
	ok := false
	if p.net.ring {
		s.warm = pt.warm
		roots, e0 := s.instantRoots(ev, s.warm)
		if best := p.recordBalances(roots, "excess head", &cr); best >= 0 {
			f, ok = []float64{roots[best].m}, true
		} else {
			cr.Reason = p.noFlowReason(s, ev, cr.Heat, e0)
		}
	} else {
		var it int
		var err error
		f, it, err = s.solveNetwork(ev, start)
		cr.Iterations = it
		if err != nil {
			cr.Findings = append(cr.Findings, p.finding(RuleConverge, "error", cr.Case, "", float64(it), 60, "", "",
				"the network did not converge in case %s after %d Newton steps: no estimate", cr.Case, it))
			cr.Reason = "the network solution did not converge"
		} else {
			ok = true
			if !pt.derived() {
				f = p.networkBalances(s, ev, f, &cr)
			}
		}
	}
	if !ok {
		switch {
		case cr.Heat > 0 && strings.HasPrefix(cr.Reason, beyondRange):
			// Not "no circulation": the loop circulates, faster than any
			// flow the model was asked to try.
			cr.Findings = append(cr.Findings, p.finding(RuleNoCirculation, "error", cr.Case, "", 0, 0, "", "",
				"no estimate in case %s: %s", cr.Case, cr.Reason))
		case cr.Heat > 0:
			cr.Findings = append(cr.Findings, p.finding(RuleNoCirculation, "error", cr.Case, "", 0, 0, "", "",
				"no circulation in case %s: %s", cr.Case, cr.Reason))
		}
		if cr.Heat == 0 && cr.Reason == "" {
			cr.Reason = "no heat input"
		}
		p.pressureMargin(s, &cr)
		p.heatPipeFlooding(s, &cr)
		return cr, nil
	}
	s.evaluate(f, ev)
	p.record(s, ev, f, &cr)
	geyserFlowing(&cr)
	if !p.net.ring {
		// Circulation means a positive flow through every heated branch.
		for _, c := range cr.Components {
			if c.Kind == "evaporator" && c.Heat > 0 && !(c.MassFlow > 0) {
				cr.Findings = append(cr.Findings, p.finding(RuleReverse, "error", cr.Case, c.Component, c.MassFlow, 0, "kg/s", "",
					"evaporator %s carries %.3g g/s against its direction in case %s", c.Component, c.MassFlow*1e3, cr.Case))
			}
		}
	}
	cr.Circulates = cr.MassFlow > 0
	if cr.Circulates && !pt.derived() {
		p.stability(s, ev, &cr)
	}
	p.margins(s, &cr, f)
	if !pt.derived() {
		p.correlationRanges(s, &cr)
	}
	if tilt {
		p.tilt(s, pt, &cr, f)
	}
	if !pt.derived() && pt.c != nil && pt.c.Envelope != nil {
		p.envelope(pt, &cr, f)
	}
	if !cr.Circulates {
		f = nil
	}
	return cr, f
}

// finding builds a finding for this loop.
func (p *prepared) finding(rule, sev, cs, comp string, v, lim float64, unit, field, format string, args ...any) Finding {
	return Finding{Rule: rule, Severity: sev, Loop: p.l.Name, Case: cs, Component: comp, Value: v, Limit: lim,
		Unit: unit, LimitField: field, Message: fmt.Sprintf(format, args...)}
}

// beyondRange starts the reason given when the flow is above every flow the
// search tries.
const beyondRange = "the flow is beyond the range searched"

// noFlowReason explains why a single loop has no balance.
func (p *prepared) noFlowReason(s *state, ev *eval, heat, e0 float64) string {
	if heat == 0 {
		return "no heat input"
	}
	if e0 > 0 {
		return fmt.Sprintf("%s: the excess head is still positive at %g kg/s, the largest flow searched", beyondRange, flowCeiling)
	}
	// The numbers are quoted at the flow the heat just evaporates (exit
	// quality about 1): below it the evaporator would dry out, and at a
	// vanishing flow the quality is meaningless.
	m1 := heat / s.p.Hlv
	head, losses := s.ringParts(ev, m1)
	at := fmt.Sprintf("at %s g/s, the flow the heat just evaporates (exit quality about 1)", units.Sig(m1*1e3, 3))
	if head <= 0 {
		return fmt.Sprintf("the gravity head is %s Pa %s, with the riser full of vapour: the condenser is not above the evaporator along the body force", units.Sig(head, 3), at)
	}
	return fmt.Sprintf("the losses exceed the gravity head at every flow searched: %s the gravity head is %s Pa and the friction, local and acceleration losses %s Pa", at, units.Sig(head, 3), units.Sig(losses, 3))
}

// ringParts returns a single loop's gravity head and its friction, local
// and acceleration losses at loop flow m.
func (s *state) ringParts(ev *eval, m float64) (head, losses float64) {
	s.evaluate([]float64{m}, ev)
	for bi, b := range s.net.branches {
		up := b.from
		if ev.mb[bi] < 0 {
			up = b.to
		}
		s.branchDP(bi, ev.mb[bi], ev.xj[up], func(ci int, dir, m, xin, xout float64, q parts) {
			head += q.grav
			losses += q.fric + q.local + q.acc
		})
	}
	return head, losses
}

// headAtVanishingFlow is the net gravity head with the flow pattern f (of
// loop flow mf) scaled down to the bottom of the grid: the heated side as
// dry as the heat makes it. Each component counts with its share of the
// loop flow. A nil f is the single loop's own flow.
func (s *state) headAtVanishingFlow(f []float64, mf float64) float64 {
	ev := s.newEval()
	nc := len(s.net.cycles)
	g := make([]float64, nc)
	scale := 1.0
	if f != nil && mf > 0 {
		scale = flowMin / mf
	}
	for k := range g {
		if f != nil {
			g[k] = f[k] * scale
		} else {
			g[k] = flowMin
		}
	}
	// Only the branch flows and the junction qualities are needed: the
	// branches are marched for their gravity alone.
	s.branchFlows(g, ev)
	s.mix(ev)
	ref := flowMin
	if f == nil || mf <= 0 {
		ref = 0
		for _, m := range ev.mb {
			ref = math.Max(ref, math.Abs(m))
		}
	}
	var head float64
	for bi, b := range s.net.branches {
		up := b.from
		m := ev.mb[bi]
		if m < 0 {
			up = b.to
		}
		if m == 0 || ref == 0 {
			continue
		}
		w := math.Abs(m) / ref
		if s.net.ring {
			w = 1
		}
		head += w * s.branchGrav(bi, m, ev.xj[up])
	}
	return head
}

// record fills the component states and totals at the solution.
func (p *prepared) record(s *state, ev *eval, f []float64, cr *CaseResult) {
	n := s.net
	states := make([]ComponentState, len(n.comps))
	dirs := make([]float64, len(n.comps))
	for bi, b := range n.branches {
		m := ev.mb[bi]
		up := b.from
		if m < 0 {
			up = b.to
		}
		s.branchDP(bi, m, ev.xj[up], func(ci int, dir, mc, xin, xout float64, q parts) {
			dirs[ci] = dir
			cp := &n.comps[ci]
			cs := ComponentState{Component: cp.name, Kind: cp.kind.String(), MassFlow: mc, MassFlux: mc / cp.A,
				XIn: xin, XOut: xout, DpFriction: q.fric, DpLocal: q.local, DpAccel: q.acc, DpGravity: q.grav,
				DpTotal: q.loss()}
			// The inlet step (q.acc beyond the change inside) is the
			// momentum-flux change of an area step.
			inside := q.mOut - q.mIn
			cs.Budget = Budget{Friction: q.fric, Gravity: -q.grav, Acceleration: inside, AreaChange: q.acc - inside,
				Local: q.local, Total: q.loss()}
			cs.Heat = math.Abs(mc) * s.p.Hlv * (xout - xin)
			G := math.Abs(cs.MassFlux)
			var sumA, sumL, mass float64
			s.march(ci, dir, mc, xin, func(c cellRec) {
				sumA += c.alpha * c.ds
				sumL += c.ds
				mass += c.rhoM * cp.A * c.ds
			})
			if sumL > 0 {
				cs.VoidMean = sumA / sumL
			}
			cs.Mass = mass
			cs.VoidOut = s.voidAt(xout, G, s.cosInc[ci])
			xo := math.Min(math.Max(xout, 0), 1)
			if cs.VoidOut < 1 {
				cs.VelLiquid = G * (1 - xo) / (s.homogLiquid(xout) * (1 - cs.VoidOut))
			}
			if cs.VoidOut > 0 {
				cs.VelVapour = G * xo / (s.p.RhoV * cs.VoidOut)
			}
			if mc < 0 {
				cs.VelLiquid, cs.VelVapour = -cs.VelLiquid, -cs.VelVapour
			}
			states[ci] = cs
		})
	}
	if n.ring {
		s.localStates(ev.mb[0], states)
	} else if s.local {
		s.localStatesNet(dirs, states)
	}
	cr.Components = states
	// The loop flow: through the condensers.
	var mf float64
	for _, c := range states {
		if c.Kind == "condenser" {
			mf += math.Abs(c.MassFlow)
		}
	}
	if n.ring {
		mf = math.Abs(ev.mb[0])
	}
	// Totals weight each component by its share of the loop flow, so that
	// parallel branches add like one loop (for a single loop every weight
	// is 1).
	var t Totals
	for _, c := range states {
		if c.Heat > 0 {
			t.Heat += c.Heat
		} else {
			t.Rejected -= c.Heat
		}
		w := 1.0
		if !n.ring && mf > 0 {
			w = math.Abs(c.MassFlow) / mf
		}
		t.Friction += w * c.DpFriction
		t.Local += w * c.DpLocal
		t.Accel += w * c.DpAccel
		t.Gravity += w * c.DpGravity
		t.Budget.Friction += w * c.Budget.Friction
		t.Budget.Gravity += w * c.Budget.Gravity
		t.Budget.Acceleration += w * c.Budget.Acceleration
		t.Budget.AreaChange += w * c.Budget.AreaChange
		t.Budget.Local += w * c.Budget.Local
		t.Budget.Total += w * c.Budget.Total
		t.Inventory += c.Mass
		if n.ring && mf > 0 {
			t.Transit += c.Mass / mf
		}
	}
	for i, r := range n.res {
		switch {
		case !(r.Volume.SI > 0):
		case n.resVap[i]:
			// On the vapour line it fills with vapour: part of the
			// inventory, no store of liquid.
			t.Inventory += r.Volume.SI * s.p.RhoV
		default:
			t.Reservoirs += r.Volume.SI * s.p.RhoL
		}
	}
	if t.Heat > 0 {
		t.EnergyGap = math.Abs(t.Heat-t.Rejected) / t.Heat
	}
	// Mass at each junction.
	in := make([]float64, n.nj)
	tot := 0.0
	for bi, b := range n.branches {
		in[b.to] += ev.mb[bi]
		in[b.from] -= ev.mb[bi]
		tot = math.Max(tot, math.Abs(ev.mb[bi]))
	}
	for _, v := range in {
		if tot > 0 {
			t.MassGap = math.Max(t.MassGap, math.Abs(v)/tot)
		}
	}
	t.HeadMax = s.headAtVanishingFlow(f, mf)
	cr.Totals = t
	cr.MassFlow = mf
	if t.EnergyGap > 1e-9 {
		cr.Findings = append(cr.Findings, p.finding(RuleEnergyClosure, "warning", cr.Case, "", t.EnergyGap, 1e-9, "", "",
			"the energy balance closes only to %.2g relative in case %s", t.EnergyGap, cr.Case))
	}
}

// homogLiquid is the liquid density at quality-equivalent x.
func (s *state) homogLiquid(x float64) float64 {
	if x < 0 {
		rho, _ := s.liquid(x)
		return rho
	}
	return s.p.RhoL
}

// unusedKind keeps lang imported for kind comparisons in this file.
var _ = lang.Pipe
