package flow

import (
	"fmt"
	"math"
	"strings"

	"gonum.org/v1/gonum/mat"

	"circa/check/sparse"
	"circa/lang"
)

// Stability indicators at the operating point. They are indicators for early
// design, not a dynamic analysis.
//
// Static (Ledinegg) stability of a network branch: the branch's own
// pressure-drop curve between its junctions, slope S = d(p_from − p_to)/dṁ
// at its inlet state with the momentum flux it carries in drawn from its
// upstream junction (see branchSlope), is set against the external curve of the rest of the network seen from the
// branch's two junctions, slope −R_ext, where R_ext is the effective slope
// of all the other branches (combined as a linear network of slopes). The
// branch is statically stable when S + R_ext > 0; for two parallel channels
// A, B closed by the rest R of the loop, R_ext = S_B S_R/(S_B + S_R).
//
// That test takes the rest as a passive network and misses modes that move
// flow among branches which are themselves unstable: two channels of slope
// −150 closed by a return of +100 each see an external slope of −300 and
// pass, while shifting flow from one channel to the other changes the loop
// balance by S_A + S_B = −300 < 0. The network's operating point is
// statically stable when the Jacobian of the cycle balances with respect to
// the cycle flows, Cᵀ diag(S) C with C the branch–cycle incidence, is
// positive definite; staticMode finds its least mode.
//
// Density-wave oscillations: the phase-change and subcooling numbers of
// Ishii (1971, Ph.D. thesis, Georgia Institute of Technology; Saha, Ishii and
// Zuber 1976, J. Heat Transfer 98:616), N_pch = Q/(ṁ h_fg)·Δρ/ρ_g and
// N_sub = Δh_sub/h_fg·Δρ/ρ_g, against Ishii's simplified boundary
// N_pch − N_sub = 2 (K_i + f L/2D + K_e)/(1 + ½ (f L/2D + 2 K_e)), with the
// inlet (liquid side) and exit (two-phase side) losses and the heated
// channel's friction as coefficients on the liquid velocity head of the
// channel (the boundary as quoted from memory).
//
// Geysering reuses the geyser-risk caution of the case. The density-wave
// indicator is reported in the stability output only, not as a finding:
// Ishii's boundary holds for channels under a fixed pressure difference, and
// most thermosiphons with a saturated inlet lie beyond it without
// oscillating.

// Stability of one case.
type Stability struct {
	Branches []BranchStability  `json:"branches,omitempty"` // networks: every branch
	Channels []ChannelStability `json:"channels,omitempty"` // every heated evaporator
	// Maldistribution lists groups of parallel heated branches whose flow
	// per unit heat differs by more than MaldistributionRatio, or one of
	// which is statically unstable.
	Maldistribution []string `json:"maldistribution,omitempty"`
	// Mode is the least static mode of a network's cycle balances when it
	// is unstable; ModeNote says why the modes were not checked.
	Mode     *StaticMode `json:"unstable_mode,omitempty"`
	ModeNote string      `json:"mode_note,omitempty"`
}

// StaticMode is a pattern of branch flow shifts around the network's cycles
// along which the balance falls: Slope is Σ S_b δṁ_b² / Σ δṁ_b² over the
// mode's branch shifts δṁ, Pa/(kg/s), negative when unstable.
type StaticMode struct {
	Slope float64  `json:"slope"`
	Gain  []string `json:"gain"` // branches whose flow the mode raises, by their first component
	Lose  []string `json:"lose"` // branches whose flow it lowers
}

// BranchStability is the static stability of one network branch.
type BranchStability struct {
	Components []string `json:"components"`
	MassFlow   float64  `json:"mass_flow"`
	Slope      float64  `json:"slope"`          // d(p_from − p_to)/dṁ of the branch, Pa/(kg/s)
	External   float64  `json:"external_slope"` // slope of the rest of the network's curve at the branch, Pa/(kg/s)
	Stable     bool     `json:"stable"`
}

// ChannelStability is the density-wave and geysering indicator of one
// evaporator.
type ChannelStability struct {
	Component string  `json:"component"`
	Npch      float64 `json:"phase_change_number"`
	Nsub      float64 `json:"subcooling_number"`
	Boundary  float64 `json:"boundary"` // Ishii's N_pch − N_sub at the stability boundary
	Stable    bool    `json:"stable"`   // N_pch − N_sub below the boundary
	Geysering bool    `json:"geysering,omitempty"`
}

// MaldistributionRatio is the largest ratio of flow per unit heat between
// parallel heated branches before the estimate flags maldistribution
// (circa's choice, common practice).
const MaldistributionRatio = 2.0

// stability fills cr.Stability at the solution f.
func (p *prepared) stability(s *state, ev *eval, cr *CaseResult) {
	st := &Stability{}
	n := s.net
	if !n.ring {
		p.branchStability(s, ev, cr, st)
	}
	p.channelStability(s, cr, st)
	if len(st.Branches)+len(st.Channels) > 0 {
		cr.Stability = st
	}
}

// branchSlope is d(p_from − p_to)/dṁ of branch bi at its inlet state, the
// branch taken between its two junctions as between plenums: the momentum
// flux it carries in is drawn from the pressure of its upstream junction.
// branchDP counts acceleration from the branch's own inlet momentum flux,
// which telescopes to the right balance around any cycle but, differentiated
// branch by branch, credits a condensing branch with a deceleration recovery
// G²x(1/ρ_g − 1/ρ_l) that grows as ṁ² while the junction pays nothing for
// the faster inflow: two identical condensing returns in parallel would each
// show a falling curve.
func (s *state) branchSlope(bi int, ev *eval) float64 {
	b := &s.net.branches[bi]
	m := ev.mb[bi]
	up := b.from
	if m < 0 {
		up = b.to
	}
	dp := func(m float64) float64 {
		return s.branchDP(bi, m, ev.xj[up], nil) + math.Copysign(s.inletMomentum(bi, m, ev.xj[up]), m)
	}
	h := math.Max(1e-4*math.Abs(m), 1e-9)
	return (dp(m+h) - dp(m-h)) / (2 * h)
}

// inletMomentum is the momentum flux G²/ρ (two-phase: its separated-flow
// form) with which flow m enters branch bi at quality xin.
func (s *state) inletMomentum(bi int, m, xin float64) float64 {
	b := &s.net.branches[bi]
	if len(b.legs) == 0 {
		return 0
	}
	first := b.legs[0].ci
	if m < 0 {
		first = b.legs[len(b.legs)-1].ci
	}
	return s.momentum(first, m, xin)
}

// externalSlope is the effective slope of every branch but skip between
// junctions a and b, taking each as a linear element of slope S_j: the
// pressure rise from a to b needed to push a unit of flow in at b and out
// at a.
func externalSlope(nj int, from, to []int, slopes []float64, skip, a, b int) float64 {
	return externalSlopeWith(nj, from, to, slopes, skip, a, b, nj >= sparseMinJunctions)
}

// externalSlopeWith is externalSlope by the sparse LU or the dense one.
func externalSlopeWith(nj int, from, to []int, slopes []float64, skip, a, b int, wide bool) float64 {
	if a == b {
		return 0
	}
	if wide {
		return externalSlopeSparse(nj, from, to, slopes, skip, a, b)
	}
	L := mat.NewDense(nj, nj, nil)
	for j, S := range slopes {
		if j == skip || from[j] == to[j] {
			continue
		}
		if math.Abs(S) < 1e-9 {
			S = math.Copysign(1e-9, S)
		}
		g := 1 / S
		u, v := from[j], to[j]
		L.Set(u, u, L.At(u, u)+g)
		L.Set(v, v, L.At(v, v)+g)
		L.Set(u, v, L.At(u, v)-g)
		L.Set(v, u, L.At(v, u)-g)
	}
	// Ground junction a; inject a unit at b.
	idx := make([]int, 0, nj-1)
	for k := 0; k < nj; k++ {
		if k != a {
			idx = append(idx, k)
		}
	}
	r := len(idx)
	A := mat.NewDense(r, r, nil)
	rhs := mat.NewVecDense(r, nil)
	for i, u := range idx {
		for k, v := range idx {
			A.Set(i, k, L.At(u, v))
		}
		if u == b {
			rhs.SetVec(i, 1)
		}
	}
	var x mat.VecDense
	if err := x.SolveVec(A, rhs); err != nil {
		return math.Inf(1) // the rest does not connect the two junctions
	}
	for i, u := range idx {
		if u == b {
			return x.AtVec(i)
		}
	}
	return 0
}

func (p *prepared) branchStability(s *state, ev *eval, cr *CaseResult, st *Stability) {
	n := s.net
	nb := len(n.branches)
	slopes := make([]float64, nb)
	from, to := make([]int, nb), make([]int, nb)
	for bi, b := range n.branches {
		slopes[bi] = s.branchSlope(bi, ev)
		from[bi], to[bi] = b.from, b.to
	}
	type group struct {
		names    []string
		first    []string
		perHeat  []float64
		unstable bool
	}
	mode, modeFlow, checked := staticMode(nb, n.cycles, slopes)
	if !checked {
		st.ModeNote = fmt.Sprintf("the network's static modes were not checked (%d independent cycles, more than %d); each branch was checked against the rest of the network", len(n.cycles), maxModeCycles)
	}
	groups := map[[2]int]*group{}
	anyBranch := false
	var keys [][2]int // in order of first appearance, for a stable output
	for bi, b := range n.branches {
		ext := -externalSlope(n.nj, from, to, slopes, bi, b.from, b.to)
		bs := BranchStability{MassFlow: ev.mb[bi], Slope: slopes[bi], External: ext, Stable: slopes[bi] > ext}
		var heat float64
		for _, lg := range b.legs {
			bs.Components = append(bs.Components, n.comps[lg.ci].name)
			heat += s.heat[lg.ci]
		}
		st.Branches = append(st.Branches, bs)
		name := strings.Join(bs.Components, " → ")
		if !bs.Stable {
			cr.Findings = append(cr.Findings, p.finding(RuleUnstable, "warning", cr.Case, bs.Components[0], slopes[bi], ext, "Pa/(kg/s)", "",
				"branch %s in case %s is statically unstable (Ledinegg): its pressure drop changes by %.4g Pa per kg/s, less than the %.4g Pa per kg/s of the rest of the network at its junctions, so a small disturbance moves its flow away from the balance",
				name, cr.Case, slopes[bi], ext))
		}
		if heat > 0 {
			k := [2]int{min(b.from, b.to), max(b.from, b.to)}
			g := groups[k]
			if g == nil {
				g = &group{}
				groups[k] = g
				keys = append(keys, k)
			}
			g.names = append(g.names, name)
			g.first = append(g.first, bs.Components[0])
			g.perHeat = append(g.perHeat, ev.mb[bi]/heat)
			g.unstable = g.unstable || !bs.Stable || (mode != nil && modeFlow[bi] != 0)
		}
		anyBranch = anyBranch || !bs.Stable
	}
	p.reportMode(n, ev.mb, mode, modeFlow, anyBranch, cr, st)
	for _, k := range keys {
		g := groups[k]
		if len(g.names) < 2 {
			continue
		}
		lo, hi := math.Inf(1), math.Inf(-1)
		weak := ""
		for i, v := range g.perHeat {
			if v < lo {
				weak = g.first[i]
			}
			lo, hi = math.Min(lo, v), math.Max(hi, v)
		}
		ratio := math.Inf(1)
		if lo > 0 {
			ratio = hi / lo
		}
		if ratio > MaldistributionRatio || g.unstable {
			msg := fmt.Sprintf("parallel heated branches %s: flow per unit heat differs by a factor %.2f", strings.Join(g.names, "; "), ratio)
			if g.unstable {
				msg += ", and one of them is statically unstable"
			}
			st.Maldistribution = append(st.Maldistribution, msg)
			cr.Findings = append(cr.Findings, p.finding(RuleMaldistribution, "warning", cr.Case, weak, ratio, MaldistributionRatio, "", "",
				"%s in case %s (limit %.2f): the weaker channels run at higher quality and nearer dryout", msg, cr.Case, MaldistributionRatio))
		}
	}
}

// reportMode names the branches an unstable static mode moves flow in
// (modeFlow by branch, in each branch's reference direction; mb the branch
// flows) and, when no branch failed its own test, reports the mode.
func (p *prepared) reportMode(n *network, mb []float64, mode *StaticMode, modeFlow []float64, anyBranch bool, cr *CaseResult, st *Stability) {
	if mode == nil {
		return
	}
	for bi, b := range n.branches {
		d := modeFlow[bi]
		if mb[bi] < 0 {
			d = -d // a gain is more flow in the branch's own direction
		}
		if d > 0 {
			mode.Gain = append(mode.Gain, n.comps[b.legs[0].ci].name)
		} else if d < 0 {
			mode.Lose = append(mode.Lose, n.comps[b.legs[0].ci].name)
		}
	}
	st.Mode = mode
	if !anyBranch {
		// Each branch passes against the rest; the mode is what is unstable.
		first := mode.Gain
		if len(first) == 0 {
			first = mode.Lose
		}
		cr.Findings = append(cr.Findings, p.finding(RuleUnstable, "warning", cr.Case, first[0], mode.Slope, 0, "Pa/(kg/s)", "",
			"case %s is statically unstable (Ledinegg) in a mode that shifts flow from the branches at %s to those at %s: along it the loop balances change by %.4g Pa per kg/s, below zero, though each branch alone passes against the rest of the network",
			cr.Case, strings.Join(mode.Lose, ", "), strings.Join(mode.Gain, ", "), mode.Slope))
	}
}

// maxModeCycles is the most independent cycles whose static modes
// staticMode checks by a dense eigen-decomposition; larger networks keep the
// branch-by-branch test only.
const maxModeCycles = 48

// staticMode returns the least mode of the cycle balances' Jacobian
// Cᵀ diag(S) C when it is not positive definite, with its branch flow
// shifts (zero on the branches it barely moves), or nil when every mode
// rises. The cycle basis is made orthonormal in branch flows first, so the
// mode's slope Σ S δṁ² / Σ δṁ² does not depend on the spanning tree the
// cycles came from; positive definiteness does not either (Sylvester's law
// of inertia). checked is false for more than maxModeCycles cycles.
func staticMode(nb int, cycles [][]term, slopes []float64) (mode *StaticMode, flow []float64, checked bool) {
	nc := len(cycles)
	if nc == 0 {
		return nil, nil, true
	}
	if nc > maxModeCycles {
		return nil, nil, false
	}
	C := mat.NewDense(nb, nc, nil)
	for k, cyc := range cycles {
		for _, t := range cyc {
			C.Set(t.i, k, t.c)
		}
	}
	var qr mat.QR
	qr.Factorize(C)
	var qf mat.Dense
	qr.QTo(&qf)
	Q := qf.Slice(0, nb, 0, nc)
	SQ := mat.NewDense(nb, nc, nil)
	scale := 0.0
	for b := 0; b < nb; b++ {
		scale = math.Max(scale, math.Abs(slopes[b]))
		for k := 0; k < nc; k++ {
			SQ.Set(b, k, slopes[b]*Q.At(b, k))
		}
	}
	M := mat.NewSymDense(nc, nil)
	for i := 0; i < nc; i++ {
		for j := i; j < nc; j++ {
			var v float64
			for b := 0; b < nb; b++ {
				v += Q.At(b, i) * SQ.At(b, j)
			}
			M.SetSym(i, j, v)
		}
	}
	var es mat.EigenSym
	if !es.Factorize(M, true) {
		return nil, nil, true
	}
	vals := es.Values(nil)
	if !(vals[0] < -1e-9*scale) {
		return nil, nil, true
	}
	var vecs mat.Dense
	es.VectorsTo(&vecs)
	flow = make([]float64, nb)
	big := 0.0
	for b := 0; b < nb; b++ {
		for k := 0; k < nc; k++ {
			flow[b] += Q.At(b, k) * vecs.At(k, 0)
		}
		if math.Abs(flow[b]) > math.Abs(big)*(1+1e-9) {
			big = flow[b] // the first of the largest shifts, taken as a gain
		}
	}
	for b := range flow {
		flow[b] /= big
		if math.Abs(flow[b]) < 0.5 {
			flow[b] = 0 // not among the mode's dominant branches
		}
	}
	return &StaticMode{Slope: vals[0]}, flow, true
}

// channelStability evaluates Ishii's density-wave numbers for every heated
// evaporator, and marks those with a geyser-risk caution.
func (p *prepared) channelStability(s *state, cr *CaseResult, st *Stability) {
	n := s.net
	geyser := map[string]bool{}
	for _, f := range cr.Findings {
		if f.Rule == RuleGeyser {
			geyser[f.Component] = true
		}
	}
	// Flow order around a single loop; in a network, the evaporator's own
	// branch.
	var orders [][]int
	if n.ring {
		var seq []int
		for _, ld := range s.ringOrder(0, cr.MassFlow) {
			seq = append(seq, ld.ci)
		}
		orders = append(orders, seq)
	} else {
		for _, b := range n.branches {
			var seq []int
			for _, lg := range b.legs {
				seq = append(seq, lg.ci)
			}
			orders = append(orders, seq)
		}
	}
	dRho := s.p.RhoL - s.p.RhoV
	for _, seq := range orders {
		for k, ci := range seq {
			cp := &n.comps[ci]
			cs := cr.Components[ci]
			if cp.kind != lang.Evaporator || !(s.heat[ci] > 0) || !(math.Abs(cs.MassFlow) > 0) {
				continue
			}
			m := math.Abs(cs.MassFlow)
			G := m / cp.A
			vh := G * G / (2 * s.p.RhoL) // liquid velocity head of the channel
			var ki, ke float64
			for j := 0; j < k; j++ {
				c := cr.Components[seq[j]]
				if n.comps[seq[j]].kind == lang.Condenser {
					ki = 0 // the inlet side starts at the condenser outlet
					continue
				}
				ki += (c.DpFriction + c.DpLocal) / vh
			}
			for j := k + 1; j < len(seq); j++ {
				if n.comps[seq[j]].kind == lang.Condenser {
					break
				}
				c := cr.Components[seq[j]]
				ke += (c.DpFriction + c.DpLocal) / vh
			}
			fl := cs.DpFriction / (2 * vh) // f L/(2D)
			ke += cs.DpLocal / vh
			dhSub := math.Max(0, -cs.XIn) * s.p.Hlv
			if s.local && cs.Local != nil {
				// Under local saturation the inlet's subcooling is the
				// march's; a single state keeps its own inlet, and its
				// local table only shows what it leaves out.
				dhSub = cs.Local.SubcoolingIn * s.p.CpL
			}
			ch := ChannelStability{Component: cp.name,
				Npch:      s.heat[ci] / (m * s.p.Hlv) * dRho / s.p.RhoV,
				Nsub:      dhSub / s.p.Hlv * dRho / s.p.RhoV,
				Boundary:  2 * (ki + fl + ke) / (1 + 0.5*(fl+2*ke)),
				Geysering: geyser[cp.name]}
			ch.Stable = ch.Npch-ch.Nsub < ch.Boundary
			st.Channels = append(st.Channels, ch)
		}
	}
}

// sparseMinJunctions is the number of junctions from which externalSlope
// solves its network of slopes by the sparse LU: the dense solve of every
// branch's costs O(junctions³), which a ladder of a thousand junctions
// would take minutes over.
const sparseMinJunctions = 64

// externalSlopeSparse is externalSlope by the sparse LU, junction a's row
// replaced by x_a = 0. The network is connected, so without branch skip it
// falls apart only when skip is a bridge between a and b, where the dense
// system is singular.
func externalSlopeSparse(nj int, from, to []int, slopes []float64, skip, a, b int) float64 {
	adj := make([][]int, nj)
	for j := range slopes {
		if j != skip && from[j] != to[j] {
			adj[from[j]] = append(adj[from[j]], to[j])
			adj[to[j]] = append(adj[to[j]], from[j])
		}
	}
	seen := make([]bool, nj)
	flood(adj, a, seen)
	if !seen[b] {
		return math.Inf(1) // the rest does not connect the two junctions
	}
	L := sparse.NewMatrix(nj)
	for j, S := range slopes {
		if j == skip || from[j] == to[j] {
			continue
		}
		if math.Abs(S) < 1e-9 {
			S = math.Copysign(1e-9, S)
		}
		g := 1 / S
		u, v := from[j], to[j]
		if u != a {
			L.Add(u, u, g)
			L.Add(u, v, -g)
		}
		if v != a {
			L.Add(v, v, g)
			L.Add(v, u, -g)
		}
	}
	L.Add(a, a, 1)
	var lu sparse.LU
	if lu.Factorize(L) != nil {
		return math.Inf(1) // the rest does not connect the two junctions
	}
	rhs := make([]float64, nj)
	rhs[b] = 1
	return lu.Solve(rhs)[b]
}
