package flow

import (
	"circa/check/geom"
	"circa/lang"
)

// A long chain of pipes, bends and fittings in series carries one quality
// from end to end. While that quality is liquid, every tube of one bore,
// flow area and relative roughness has the same friction gradient, the
// local losses add as one loss coefficient per flow area, the gravity term
// is the liquid density times the body force along the chain's whole
// displacement, and the acceleration terms telescope to the last tube's
// momentum flux: the chain collapses to a few equivalent elements, and its
// pressure change costs a handful of evaluations instead of one per tube.

// passive reports whether a component passes its inlet quality on
// unchanged (see outletX): no heat in or out.
func passive(k lang.Kind) bool { return k != lang.Evaporator && k != lang.Condenser }

// chainMin is the shortest run of passive legs that is collapsed; shorter
// runs are marched tube by tube.
var chainMin = 12

// chainTube is one equivalent element of a collapsed chain: the tubes of
// one flow area, bore and relative roughness, with their summed length and
// loss coefficients.
type chainTube struct {
	A, D, rr float64
	L, K     float64
}

// chain is a run of passive legs, legs[from:to] of its branch, collapsed.
type chain struct {
	from, to int
	tubes    []chainTube
	disp     geom.Vec3 // Σ sign·displacement: inlet to outlet along the branch
}

// collapseChains finds each branch's runs of at least chainMin passive legs
// and lists the legs that change the quality.
func (n *network) collapseChains() {
	for bi := range n.branches {
		b := &n.branches[bi]
		b.active = b.active[:0]
		b.chains = b.chains[:0]
		for i := 0; i < len(b.legs); {
			if !passive(n.comps[b.legs[i].ci].kind) {
				b.active = append(b.active, i)
				i++
				continue
			}
			j := i
			for j < len(b.legs) && passive(n.comps[b.legs[j].ci].kind) {
				j++
			}
			if j-i >= chainMin {
				b.chains = append(b.chains, n.chain(b.legs, i, j))
			}
			i = j
		}
	}
}

func (n *network) chain(legs []leg, from, to int) chain {
	c := chain{from: from, to: to}
	for _, lg := range legs[from:to] {
		cp := &n.comps[lg.ci]
		c.disp = c.disp.Add(cp.disp.Scale(lg.sign))
		k := -1
		for t := range c.tubes {
			if tb := &c.tubes[t]; tb.A == cp.A && tb.D == cp.D && tb.rr == cp.rr {
				k = t
				break
			}
		}
		if k < 0 {
			k = len(c.tubes)
			c.tubes = append(c.tubes, chainTube{A: cp.A, D: cp.D, rr: cp.rr})
		}
		c.tubes[k].L += cp.L
		c.tubes[k].K += cp.K
	}
	return c
}

// chainLiquid is a collapsed chain's pressure-change parts at flow m
// (kg/s, along the branch when positive) with liquid of quality x ≤ 0,
// and the momentum flux of its first and last tubes in flow order.
func (s *state) chainLiquid(b *branch, c *chain, m, x float64) (q parts, first, last float64) {
	rho, mu := s.liquid(x)
	am := m
	dir := 1.0
	if m < 0 {
		am, dir = -m, -1
	}
	for _, t := range c.tubes {
		G := am / t.A
		if t.L != 0 {
			q.fric += s.liquidGradient(G, t.D, t.rr, rho, mu) * t.L
		}
		q.local += t.K * G * G / (2 * rho)
	}
	q.grav = rho * s.b.Dot(c.disp) * dir
	in, out := b.legs[c.from].ci, b.legs[c.to-1].ci
	if m < 0 {
		in, out = out, in
	}
	Gi, Go := am/s.net.comps[in].A, am/s.net.comps[out].A
	return s.scaled(q), Gi * Gi / rho, Go * Go / rho
}
