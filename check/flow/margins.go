package flow

import (
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"

	"circa/check/correlate"
	"circa/check/fluid"
	"circa/check/geom"
	"circa/lang"
	"circa/units"
)

// Margin names.
const (
	MarginExitQuality = "exit_quality"
	MarginCHF         = "chf_ratio"
	MarginFlooding    = "flooding"
	MarginWall        = "wall_temperature"
	MarginJunction    = "junction_temperature"
	MarginPressure    = "design_pressure"
	MarginCondenser   = "condenser"
	MarginCharge      = "charge"
	MarginHead        = "loss_reserve"
	MarginTilt        = "tilt"
)

func status(use float64, errAt float64) string {
	switch {
	case use >= errAt:
		return "error"
	case use > 1:
		return "warning"
	}
	return "ok"
}

func (cr *CaseResult) add(m Margin) {
	m.Case = cr.Case
	if !finite(m.Use) {
		m.Use = math.MaxFloat64
	}
	cr.Margins = append(cr.Margins, m)
}

// wallFlux is an evaporator's wall heat flux, W/m², at heat q; wetted_area
// is one channel's, so the heat spreads over every channel's wall.
func wallFlux(c *lang.Component, q, D, L float64) float64 {
	switch {
	case c.HeatFlux.Set && c.HeatFlux.SI > 0:
		if c.Heat.Set && c.Heat.SI > 0 {
			return c.HeatFlux.SI * q / c.Heat.SI
		}
		return c.HeatFlux.SI
	case c.WettedArea.Set && c.WettedArea.SI > 0:
		return q / (c.WettedArea.SI * c.ChannelCount())
	}
	lh := L
	if c.HeatedLength.Set && c.HeatedLength.SI > 0 {
		lh = c.HeatedLength.SI
	}
	if D > 0 && lh > 0 {
		return q / (math.Pi * D * lh * c.ChannelCount())
	}
	return 0
}

// chf is an evaporator's critical heat flux, W/m², and a phrase giving it
// with the form used: the pool-boiling form at the local body force, or Katto–Ohno's
// flow-boiling form at the evaporator's mass flux, heated length and inlet
// subcooling.
func (p *prepared) chf(s *state, cp *comp, cs ComponentState) (float64, string) {
	if p.chfFlow {
		lh := cp.L
		if cp.c.HeatedLength.Set && cp.c.HeatedLength.SI > 0 {
			lh = cp.c.HeatedLength.SI
		}
		dh := math.Max(0, -cs.XIn) * s.p.Hlv
		if q := correlate.CHFKattoOhno(cs.MassFlux, lh, cp.D, dh, s.p); q > 0 {
			return q, fmt.Sprintf("flow-boiling CHF (Katto–Ohno) %.3g W/cm² at G = %.0f kg/(m²·s)", q/1e4, math.Abs(cs.MassFlux))
		}
	}
	q := correlate.CHFPool(p.chfK, s.p.Hlv, s.p.RhoL, s.p.RhoV, s.p.Sigma, s.bmag)
	return q, fmt.Sprintf("pool-boiling CHF %.3g W/cm² at |b| = %.2f m/s²", q/1e4, s.bmag)
}

// wallTemperature is an evaporator's boiling wall temperature at wall flux
// qw: its saturation temperature plus Cooper's nucleate-boiling superheat.
// With saturation at local pressure the wall boils at the evaporator's own
// saturation temperature, highest at its inlet (the bottom of the liquid
// column).
func (p *prepared) wallTemperature(s *state, cp *comp, cs ComponentState, qw float64) (tw, ts float64) {
	rp := 1.0
	if cp.c.BoilRoughness.Set && cp.c.BoilRoughness.SI > 0 {
		rp = cp.c.BoilRoughness.SI * 1e6
	}
	ts, pr := s.sat.T, s.p.ReducedPressure
	if s.local && cs.Local != nil {
		ts = cs.Local.SatTempIn
		if p.info.Pc > 0 {
			pr = cs.Local.PressureIn / p.info.Pc
		}
	}
	return ts + correlate.CooperSuperheat(pr, s.p.MolarMass, rp, qw), ts
}

// junctionMargin carries the device's heat q from the boiling wall at tw
// through its series stack (junction to case, interface, spreading) to the
// junction, reports it on the component and checks it against the
// junction limit.
func (p *prepared) junctionMargin(cr *CaseResult, ci int, cp *comp, tw, ts, q float64) {
	c := cp.c
	js := &Junction{Wall: tw}
	js.Resistance, _ = c.StackResistance()
	js.Case = tw + q*(c.InterfaceRes.SI+c.SpreadingRes.SI)
	js.Junction = tw + q*js.Resistance
	cr.Components[ci].Junction = js
	if !c.JunctionLimit.Set {
		return
	}
	tl := c.JunctionLimit.SI
	use := math.MaxFloat64
	if tl > ts {
		use = (js.Junction - ts) / (tl - ts)
	}
	m := Margin{Margin: MarginJunction, Component: cp.name, Value: js.Junction, Limit: tl, Unit: "K", Use: use, Status: "ok"}
	if js.Junction > tl {
		m.Status = "error"
		cr.Findings = append(cr.Findings, p.finding(RuleJunction, "error", cr.Case, cp.name, js.Junction, tl, "K", "junction_limit",
			"junction temperature %.1f °C of the device on evaporator %s in case %s exceeds its limit %.1f °C (wall %.1f °C plus %.0f W through %.3g K/W)",
			js.Junction-273.15, cp.name, cr.Case, tl-273.15, tw-273.15, q, js.Resistance))
	}
	cr.add(m)
}

// margins evaluates every margin of a circulating case.
func (p *prepared) margins(s *state, cr *CaseResult, f []float64) {
	lim := p.limits
	n := s.net
	for ci, cs := range cr.Components {
		cp := &n.comps[ci]
		if cp.kind == lang.Evaporator && s.heat[ci] > 0 {
			// Exit quality.
			x := cs.XOut
			xl := lim.ExitQuality.SI
			m := Margin{Margin: MarginExitQuality, Component: cp.name, Value: x, Limit: xl, Unit: "", Use: x / xl}
			switch {
			case x >= 1:
				m.Status = "error"
				cr.Findings = append(cr.Findings, p.finding(RuleDryout, "error", cr.Case, cp.name, x, 1, "", "exit_quality",
					"dryout: evaporator %s in case %s %s%s", cp.name, cr.Case, dryText(x), p.starvedNote(cr, ci)))
			case x > xl:
				m.Status = "warning"
				cr.Findings = append(cr.Findings, p.finding(RuleExitQuality, "warning", cr.Case, cp.name, x, xl, "", "exit_quality",
					"exit quality %s at evaporator %s in case %s exceeds the limit %s%s", units.Sig(x, 3), cp.name, cr.Case, units.Sig(xl, 3), p.starvedNote(cr, ci)))
			default:
				m.Status = "ok"
			}
			cr.add(m)
			// Critical heat flux.
			qw := wallFlux(cp.c, s.heat[ci], cp.D, cp.L)
			if qw > 0 {
				chf, form := p.chf(s, cp, cs)
				ratio := chf / qw
				rl := lim.CHFRatio.SI
				m := Margin{Margin: MarginCHF, Component: cp.name, Value: ratio, Limit: rl, Use: rl / math.Max(ratio, 1e-300)}
				m.Status = status(m.Use, rl)
				cr.add(m)
				if ratio < rl {
					sev := "warning"
					if ratio < 1 {
						sev = "error"
					}
					cr.Findings = append(cr.Findings, p.finding(RuleCHF, sev, cr.Case, cp.name, ratio, rl, "", "chf_ratio",
						"critical heat flux ratio %s at evaporator %s in case %s is below the limit %s (wall flux %.3g W/cm², %s)",
						units.Sig(ratio, 3), cp.name, cr.Case, units.Sig(rl, 3), qw/1e4, form))
				}
				// Wall temperature, and the device's junction above it.
				_, stack := cp.c.StackResistance()
				if cp.c.WallLimit.Set || stack {
					tw, ts := p.wallTemperature(s, cp, cs, qw)
					if cp.c.WallLimit.Set {
						tl := cp.c.WallLimit.SI - lim.WallMargin.SI
						use := math.MaxFloat64
						if tl > ts {
							use = (tw - ts) / (tl - ts)
						}
						m := Margin{Margin: MarginWall, Component: cp.name, Value: tw, Limit: tl, Unit: "K", Use: use}
						m.Status = "ok"
						if tw > tl {
							m.Status = "error"
							cr.Findings = append(cr.Findings, p.finding(RuleWall, "error", cr.Case, cp.name, tw, tl, "K", "wall_limit",
								"wall temperature %.1f °C at evaporator %s in case %s exceeds the limit %.1f °C (saturation %.1f °C plus Cooper nucleate-boiling superheat)",
								tw-273.15, cp.name, cr.Case, tl-273.15, ts-273.15))
						}
						cr.add(m)
					}
					if stack {
						p.junctionMargin(cr, ci, cp, tw, ts, s.heat[ci])
					}
				}
			}
		}
		if cp.kind != lang.Evaporator && (cs.XIn > 1 || cs.XOut > 1) {
			cr.Findings = append(cr.Findings, p.finding(RuleSuperheatCells, "warning", cr.Case, cp.name, math.Max(cs.XIn, cs.XOut), 1, "", "",
				"%s %s carries superheated vapour in case %s (the heat added upstream is %.2f times what evaporates its flow); its properties are taken as saturated vapour", cp.kind, cp.name, cr.Case, math.Max(cs.XIn, cs.XOut)))
		}
		// Flooding where vapour and liquid flow counter-current: two-phase
		// flow running along the body force whose vapour drift against it
		// (Rouhani–Axelsson drift velocity) exceeds the mixture's flux.
		along := s.bDisp[ci] * math.Copysign(1, cs.MassFlow)
		if along > 0 && cp.L > 0 {
			G := math.Abs(cs.MassFlux)
			worstF := 0.0
			for _, x := range []float64{cs.XIn, cs.XOut, 0.5 * (cs.XIn + cs.XOut)} {
				if x <= 0 || x >= 1 {
					continue
				}
				jg, jf := G*x/s.p.RhoV, G*(1-x)/s.p.RhoL
				if s.drift(x)*math.Abs(s.cosInc[ci]) <= (1+0.2*(1-x))*(jg+jf) {
					continue // the vapour is carried along: co-current
				}
				worstF = math.Max(worstF, s.wallis(jg, jf, cp.D, ci))
			}
			if worstF > 0 {
				p.floodMargin(cr, cp, worstF)
			}
		}
	}
	p.pressureMargin(s, cr)
	p.condenserMargin(s, cr)
	p.chargeMargin(s, cr)
	p.lossReserve(s, cr, f)
}

// lossReserve solves the case again with the friction and local losses
// limits.head_ratio times the estimate (default 1.5: available head at
// least 1.5–2 times the predicted losses, common practice) and reports how
// the evaporators fare: a design whose losses were underestimated by that
// factor should still circulate, stay wet and, if it meets the exit-quality
// limit now, still meet it. Sweep points are not re-solved.
func (p *prepared) lossReserve(s *state, cr *CaseResult, f []float64) {
	k := p.limits.HeadRatio.SI
	if !(k > 1) || cr.Grid {
		return
	}
	xl := p.limits.ExitQuality.SI
	x0 := math.Inf(-1)
	for ci, cs := range cr.Components {
		if s.net.comps[ci].kind == lang.Evaporator && s.heat[ci] > 0 {
			x0 = math.Max(x0, cs.XOut)
		}
	}
	if math.IsInf(x0, -1) {
		return
	}
	xk, where, ok := p.underLosses(s, k, f)
	m := Margin{Margin: MarginHead, Component: where, Value: xk, Limit: xl, Use: xk / xl, Status: "ok"}
	switch {
	case !ok:
		m.Value, m.Use, m.Status = 1, math.Inf(1), "warning"
		cr.Findings = append(cr.Findings, p.finding(RuleHead, "warning", cr.Case, "", k, k, "", "head_ratio",
			"with friction and local losses %.2g times the estimate, the loop no longer circulates in case %s: the gravity head has little reserve over the losses", k, cr.Case))
	case xk >= 1:
		m.Status = "warning"
		cr.Findings = append(cr.Findings, p.finding(RuleHead, "warning", cr.Case, where, xk, xl, "", "head_ratio",
			"with friction and local losses %.2g times the estimate, evaporator %s dries out in case %s: it %s; the gravity head has little reserve over the losses", k, where, cr.Case, dryText(xk)))
	case xk > xl:
		m.Status = "warning"
		// Already above the limit as estimated: the exit-quality margin
		// says so; this one reports only a design that loses the limit.
		if x0 <= xl {
			from := units.Sig(x0, 3)
			if x0 < 0 {
				// A subcooled outlet (local saturation): "-0.00" would hide it.
				from = fmt.Sprintf("a subcooled outlet (x = %.2g)", x0)
			}
			cr.Findings = append(cr.Findings, p.finding(RuleHead, "warning", cr.Case, where, xk, xl, "", "head_ratio",
				"with friction and local losses %.2g times the estimate, the exit quality of evaporator %s rises from %s to %s, above the limit %s, in case %s", k, where, from, units.Sig(xk, 3), units.Sig(xl, 3), cr.Case))
		}
	}
	if m.Use > 1e300 {
		m.Use = 1e300
	}
	cr.add(m)
}

// underLosses solves the case with friction and local losses scaled by k
// and returns the highest evaporator exit quality and where it is; ok is
// false when the loop then does not circulate (or an evaporator runs
// backwards). A network's Newton iteration starts from the estimate's
// cycle flows start.
func (p *prepared) underLosses(s *state, k float64, start []float64) (x float64, where string, ok bool) {
	t := s.withLossScale(k)
	ev := t.newEval()
	var f []float64
	if p.net.ring {
		m, ok := t.stableRootAt(ev)
		if !ok {
			return 0, "", false
		}
		f = []float64{m}
	} else {
		var err error
		if f, _, err = t.solveNetwork(ev, start); err != nil {
			return 0, "", false
		}
	}
	t.evaluate(f, ev)
	x, ok = math.Inf(-1), true
	for bi, br := range t.net.branches {
		up := br.from
		if ev.mb[bi] < 0 {
			up = br.to
		}
		t.branchDP(bi, ev.mb[bi], ev.xj[up], func(ci int, _, m, _, xout float64, _ parts) {
			cp := &t.net.comps[ci]
			if cp.kind != lang.Evaporator || !(t.heat[ci] > 0) {
				return
			}
			if !(m > 0) { // visit gets the flow along the component's direction
				ok = false
			}
			if xout > x {
				x, where = xout, cp.name
			}
		})
	}
	if math.IsInf(x, -1) || math.IsNaN(x) {
		return 0, "", false
	}
	return x, where, ok
}

// drift is the Rouhani–Axelsson drift velocity of the vapour, m/s.
func (s *state) drift(x float64) float64 {
	d := s.bmag * s.p.Sigma * (s.p.RhoL - s.p.RhoV)
	if !(d > 0) {
		return 0
	}
	return 1.18 * (1 - x) * math.Sqrt(math.Sqrt(d)/s.p.RhoL)
}

// wallis is the fraction of the Wallis flooding limit used in component ci
// with superficial velocities jg and jf.
func (s *state) wallis(jg, jf, D float64, ci int) float64 {
	return correlate.WallisFraction(jg, jf, s.p.RhoL, s.p.RhoV, D, s.bmag*math.Abs(s.cosInc[ci]),
		correlate.WallisM, correlate.WallisCSharpEdge)
}

// floodMargin records a flooding fraction.
func (p *prepared) floodMargin(cr *CaseResult, cp *comp, f float64) {
	fl := p.limits.Flooding.SI
	m := Margin{Margin: MarginFlooding, Component: cp.name, Value: f, Limit: fl, Use: f / fl}
	m.Status = status(m.Use, 1/fl)
	cr.add(m)
	if f > fl {
		sev := "warning"
		if f >= 1 {
			sev = "error"
		}
		cr.Findings = append(cr.Findings, p.finding(RuleFlooding, sev, cr.Case, cp.name, f, fl, "", "flooding",
			"flooding fraction %s in %s %s in case %s exceeds the limit %s (Wallis, vapour and liquid counter-current)",
			units.Sig(f, 3), cp.kind, cp.name, cr.Case, units.Sig(fl, 3)))
	}
}

// heatPipeFlooding is the flooding fraction of each heated component when
// the loop does not circulate: the vapour it makes rises through the
// liquid that has to come back down the same tube.
func (p *prepared) heatPipeFlooding(s *state, cr *CaseResult) {
	for ci, cp := range s.net.comps {
		q := s.heat[ci]
		if cp.kind != lang.Evaporator || !(q > 0) || s.bDisp[ci] >= 0 {
			continue
		}
		mv := q / s.p.Hlv
		jg, jf := mv/(s.p.RhoV*cp.A), mv/(s.p.RhoL*cp.A)
		p.floodMargin(cr, &s.net.comps[ci], s.wallis(jg, jf, cp.D, ci))
	}
}

// pressureMargin compares the saturation pressure with the design rating.
func (p *prepared) pressureMargin(s *state, cr *CaseResult) {
	dp := p.l.DesignPressure
	if !dp.Set || !(dp.SI > 0) || s == nil {
		return
	}
	use := s.sat.P / dp.SI
	m := Margin{Margin: MarginPressure, Value: s.sat.P, Limit: dp.SI, Unit: "Pa", Use: use, Status: status(use, 1)}
	if use > 1 {
		m.Status = "error"
		cr.Findings = append(cr.Findings, p.finding(RulePressure, "error", cr.Case, "", s.sat.P, dp.SI, "Pa", "design_pressure",
			"saturation pressure %s in case %s exceeds the design pressure %s; pressure equipment must satisfy local pressure-equipment codes and be approved by licensed engineers",
			PressureText(s.sat.P, dp.Unit()), cr.Case, PressureText(dp.SI, dp.Unit())))
	}
	cr.add(m)
}

// LimitFluidRange is the LimitField of a condenser margin whose limit is
// the top of the fluid's range, for want of a lower saturation_max.
const LimitFluidRange = "fluid_range"

// RangeTopText names the top of a fluid's range as a limit, to the
// hundredth of a kelvin its range is listed with, and how far it lies
// below the critical point: "372.85 °C, the top of water's property range
// (1.10 K below its critical point, 373.95 °C)".
func RangeTopText(info fluid.Info) string {
	s := fmt.Sprintf("%.2f °C, the top of %s's property range", info.Tmax-273.15, info.Name)
	if info.Tc > info.Tmax && !math.IsInf(info.Tc, 0) {
		s += fmt.Sprintf(" (%.2f K below its critical point, %.2f °C)", info.Tc-info.Tmax, info.Tc-273.15)
	}
	return s
}

// condenserMargin checks that the condensers reject the load within the
// allowed saturation temperature. A condenser given by geometry counts with
// its film conductance at the operating saturation temperature.
func (p *prepared) condenserMargin(s *state, cr *CaseResult) {
	var ua, uaT float64
	for _, cp := range s.net.comps {
		geo := byGeometryIn(cr.pointCase, cp)
		g, gSet := conductanceIn(cr.pointCase, cp)
		if cp.kind != lang.Condenser || !gSet && !geo {
			continue
		}
		ts, ok := cp.c.Sink.SI, cp.c.Sink.Set
		if cr.pointCase != nil {
			if cr.pointCase.Sink.Set {
				ts, ok = cr.pointCase.Sink.SI, true
			}
			for _, sv := range cr.pointCase.Sinks {
				if sv.Comp == cp.c {
					ts, ok = sv.Value.SI, true
				}
			}
		}
		if !ok {
			continue
		}
		if geo {
			g = 0
			if dT := s.sat.T - ts; dT > 0 {
				g = filmRejection(p.cond, cp, s.b, s.sat.T, ts, s.p) / dT
			}
		}
		ua += g
		uaT += g * ts
	}
	if ua <= 0 {
		return
	}
	tSink := uaT / ua
	// Without a lower saturation_max the limit is where the fluid's
	// properties end, which is no design limit: the margin says so.
	tMax, field := p.info.Tmax, LimitFluidRange
	if sm := p.limits.SaturationMax; sm.Set && sm.SI < tMax {
		tMax, field = sm.SI, "saturation_max"
	}
	if cr.SatSource == "condenser balance" {
		use := math.MaxFloat64
		if tMax > tSink {
			use = (s.sat.T - tSink) / (tMax - tSink)
		}
		m := Margin{Margin: MarginCondenser, Value: s.sat.T, Limit: tMax, Unit: "K", Use: use, Status: status(use, 1), LimitField: field}
		if use > 1 {
			m.Status = "error"
			limit, ff := fmt.Sprintf("the limits' saturation_max of %.1f °C", tMax-273.15), field
			if field == LimitFluidRange {
				limit, ff = RangeTopText(p.info), ""
			}
			cr.Findings = append(cr.Findings, p.finding(RuleCondenser, "error", cr.Case, "", s.sat.T, tMax, "K", ff,
				"the condensers (UA %.0f W/K) need a saturation temperature of %.1f °C to reject %.0f W in case %s, above %s",
				ua, s.sat.T-273.15, cr.Heat, cr.Case, limit))
		}
		cr.add(m)
		return
	}
	capac := ua * (s.sat.T - tSink)
	use := math.MaxFloat64
	if capac > 0 {
		use = cr.Heat / capac
	}
	m := Margin{Margin: MarginCondenser, Value: capac, Limit: cr.Heat, Unit: "W", Use: use, Status: status(use, 1)}
	if use > 1 {
		m.Status = "error"
		cr.Findings = append(cr.Findings, p.finding(RuleCondenser, "error", cr.Case, "", capac, cr.Heat, "W", "",
			"the condensers can reject only %.0f W at the saturation temperature %.1f °C in case %s, less than the load %.0f W",
			math.Max(capac, 0), s.sat.T-273.15, cr.Case, cr.Heat))
	}
	cr.add(m)
}

// chargeMargin compares the fill charge with the inventory at the
// operating point. A loop adjusts to its charge: a deficit lowers the liquid
// level in the liquid lines (downcomers and subcooled pipes) and takes away
// driving head; a surplus first fills the reservoirs, then backs up into the
// condensers and takes away condensing area. The estimate warns when the
// deficit empties more than ChargeLevelWarn of the liquid lines or the
// surplus floods more than ChargeFloodWarn of the condensers, and reports an
// error when the liquid lines would empty or the condensers fill (circa's
// choices, documented in docs/estimate-json.md).
func (p *prepared) chargeMargin(s *state, cr *CaseResult) {
	ch := p.l.Charge
	if !ch.Set || !(ch.SI > 0) {
		return
	}
	least := cr.Totals.Inventory
	most := cr.Totals.Inventory + cr.Totals.Reservoirs
	var vCond, vol float64
	for _, cp := range s.net.comps {
		vol += cp.A * cp.L
		if cp.kind == lang.Condenser {
			vCond += cp.A * cp.L
		}
	}
	// Liquid lines: unheated components that carry liquid only.
	var vLiquid float64
	for i, st := range cr.Components {
		if i < len(s.net.comps) && st.Kind != lang.Evaporator.String() && st.Kind != lang.Condenser.String() && st.XIn <= 0 && st.XOut <= 0 {
			cp := s.net.comps[i]
			vLiquid += cp.A * cp.L
		}
	}
	for _, r := range s.net.res {
		if r.Volume.SI > 0 {
			vol += r.Volume.SI
		}
	}
	drho := math.Max(s.p.RhoL-s.p.RhoV, 1e-9)
	full := vol * s.p.RhoL
	cr.ChargeRange = &ChargeRange{Charge: ch.SI, Low: least - ChargeLevelWarn*drho*vLiquid,
		High: math.Min(most+ChargeFloodWarn*drho*vCond, full), HighBy: ChargeByCondenser}
	switch {
	case cr.ChargeRange.High == full:
		cr.ChargeRange.HighBy = ChargeByFull
	case cr.Totals.Reservoirs > 0:
		cr.ChargeRange.HighBy = ChargeByReservoir
	}
	if ch.SI > full {
		m := Margin{Margin: MarginCharge, Value: ch.SI, Limit: full, Unit: "kg", Use: ch.SI / math.Max(full, 1e-300), Status: "error"}
		cr.add(m)
		cr.Findings = append(cr.Findings, p.finding(RuleCharge, "error", cr.Case, "", ch.SI, full, "kg", "",
			"charge %s kg is more than the %s kg of liquid that fills the whole loop (%s L) at %.1f °C in case %s: there is no room for vapour",
			strconv.FormatFloat(ch.SI, 'g', 3, 64), units.Sig(full, 3), units.Sig(vol*1e3, 3), s.sat.T-273.15, cr.Case))
		return
	}
	switch {
	case ch.SI < least:
		emptied := 1.0
		if vLiquid > 0 {
			emptied = (least - ch.SI) / drho / vLiquid
		}
		use := emptied / ChargeLevelWarn
		m := Margin{Margin: MarginCharge, Value: ch.SI, Limit: least, Unit: "kg", Use: use, Status: status(use, 1/ChargeLevelWarn)}
		if emptied >= 1 {
			m.Status = "error"
		}
		cr.add(m)
		if m.Status != "ok" {
			cr.Findings = append(cr.Findings, p.finding(RuleCharge, m.Status, cr.Case, "", ch.SI, least, "kg", "",
				"charge %s kg is below the %s kg the flow path holds at the operating point in case %s: the liquid level falls through about %.0f %% of the liquid lines and the evaporators risk being starved",
				strconv.FormatFloat(ch.SI, 'g', 3, 64), units.Sig(least, 3), cr.Case, math.Min(emptied, 9.99)*100))
		}
	case ch.SI > most:
		flooded := 1.0
		if vCond > 0 {
			flooded = (ch.SI - most) / drho / vCond
		}
		use := flooded / ChargeFloodWarn
		m := Margin{Margin: MarginCharge, Value: ch.SI, Limit: most, Unit: "kg", Use: use, Status: status(use, 1/ChargeFloodWarn)}
		if flooded >= 1 {
			m.Status = "error"
		}
		cr.add(m)
		if m.Status != "ok" {
			cr.Findings = append(cr.Findings, p.finding(RuleCharge, m.Status, cr.Case, "", ch.SI, most, "kg", "",
				"charge %s kg exceeds the %s kg the loop holds at the operating point in case %s: the excess liquid floods about %.0f %% of the condenser volume",
				strconv.FormatFloat(ch.SI, 'g', 3, 64), units.Sig(most, 3), cr.Case, math.Min(flooded, 9.99)*100))
		}
	default:
		m := Margin{Margin: MarginCharge, Value: ch.SI, Limit: most, Unit: "kg", Status: "ok"}
		cr.add(m)
	}
}

// Charge tolerances (circa's choices): the share of the liquid lines a
// charge deficit may empty, and of the condensers a surplus may flood,
// before a warning.
const (
	ChargeLevelWarn = 0.25
	ChargeFloodWarn = 0.25
)

// Tilt search: from the case's attitude, each way about each axis, the
// attitude is stepped by tiltStep until the circulation condition fails or
// half a turn is reached; the bracket is then closed to tiltTol by Brent's
// method on the condition (or, for a network, on its head at vanishing
// flow), or by refineTilt where the condition has no value past the limit.
const (
	tiltStep  = 10 * math.Pi / 180
	tiltReach = math.Pi
	tiltTol   = 0.02 * math.Pi / 180
	tiltCheck = 0.5 * math.Pi / 180 // how far inside a head-refined limit a solve confirms it
	// tiltNewtonSteps bounds Newton's iteration at each attitude: from the
	// last attitude's balance it converges in a few steps where a balance
	// exists, and near a limit it should fail fast.
	tiltNewtonSteps = 20
	// tiltStepTol is the relative tolerance of the solves while stepping
	// towards a limit: they tell whether a balance exists, how far the
	// condition is from zero and where the next step starts.
	tiltStepTol = 1e-4
)

// tiltWalk is what the search carries from one attitude to the next: the
// cycle flows of the last two attitudes that circulated (a network's
// Newton iteration starts from their straight-line extrapolation) and the
// factorised Jacobian, reused while it still converges fast.
type tiltWalk struct {
	f       []float64 // at the last circulating attitude d
	d       float64
	prev    []float64 // at the one before, dPrev (nil: none)
	dPrev   float64
	jac     jacobianCache
	scratch []float64
	at      state // the state at the attitude being tried
}

// guess is the walk's starting flows for attitude d: the last circulating
// flows moved along the line through the last two, at most one interval
// further.
func (w *tiltWalk) guess(d float64) []float64 {
	if w.prev == nil || w.d == w.dPrev || d <= w.d {
		return w.f
	}
	r := math.Min((d-w.d)/(w.d-w.dPrev), 1)
	w.scratch = append(w.scratch[:0], w.f...)
	for k := range w.scratch {
		w.scratch[k] += r * (w.f[k] - w.prev[k])
	}
	return w.scratch
}

// moved records the circulating flows f at attitude d.
func (w *tiltWalk) moved(d float64, f []float64) {
	if d > w.d {
		w.prev, w.dPrev = w.f, w.d
	}
	w.f, w.d = f, d
}

// circulation is the circulation condition under body force b as a number
// whose sign says whether the loop circulates, and the gravity head at
// vanishing flow it starts from. For a single loop it is the excess head at
// the bottom of the flow grid when positive, else the largest excess head
// on the grid: positive exactly when some flow balances. For a network it
// is the gravity head at vanishing flow with the last circulating flow
// pattern, times the least flow through a heated branch (along its
// direction) over the largest branch flow, once Newton's iteration has
// found the balance; it is negative when the head is gone or a heated
// branch runs backwards, and NaN when no balance is found. It is continuous
// in the attitude where the loop stops by losing its head or by a branch
// reversing. cold, when the walk's start fails, tries Newton's iteration
// without bounds from the last balance before concluding that none exists.
func (p *prepared) circulation(s *state, b geom.Vec3, d float64, w *tiltWalk, cold bool) (c, head float64) {
	t := s.withBodyIn(&w.at, b)
	ev := t.newEval()
	if p.net.ring {
		c = t.ringCirculation(ev)
		return c, c
	}
	h := t.headAtVanishingFlow(w.f, t.largestBranchFlow(w.f, ev))
	if !(h > 0) {
		return math.Min(h, 0) - 1e-300, h
	}
	f, err := t.solveWarm(ev, w.guess(d), &w.jac, false)
	if err != nil && cold {
		// Newton's iteration without bounds from the last balance.
		full := *t
		full.newtonCap = 0
		w.jac.valid = false
		f, _, err = full.newton(ev, append([]float64(nil), w.f...), &w.jac)
	}
	if err != nil {
		return math.NaN(), h
	}
	// ev holds the evaluation at f: Newton's iteration returns a balance
	// with it.
	least, most := math.Inf(1), 0.0
	for bi, br := range t.net.branches {
		most = math.Max(most, math.Abs(ev.mb[bi]))
		for _, lg := range br.legs {
			if t.heat[lg.ci] > 0 {
				least = math.Min(least, ev.mb[bi]*lg.sign)
			}
		}
	}
	if !(most > 0) || math.IsInf(least, 1) {
		return -1e-3 * h, h
	}
	if least > 0 {
		w.moved(d, f)
	}
	return h * least / most, h
}

// headAt is a network's gravity head at vanishing flow under body force b
// with the walk's flow pattern: one evaluation, no solve.
func (p *prepared) headAt(s *state, b geom.Vec3, w *tiltWalk) float64 {
	t := s.withBodyIn(&w.at, b)
	return t.headAtVanishingFlow(w.f, t.largestBranchFlow(w.f, t.newEval()))
}

// largestBranchFlow is the largest branch flow of cycle flows f.
func (s *state) largestBranchFlow(f []float64, ev *eval) float64 {
	s.branchFlows(f, ev)
	var m float64
	for _, v := range ev.mb {
		m = math.Max(m, math.Abs(v))
	}
	return m
}

// tilt finds the pitch and roll angles, from the case's attitude, at which
// circulation stops, each way about each axis within half a turn. A
// network that stops because its head at vanishing flow is gone has its
// limit refined on that head alone (one evaluation per attitude, where
// Newton's iteration would struggle with vanishing flows), checked by a
// solve just inside it; otherwise the limit is refined on the full
// condition.
func (p *prepared) tilt(s *state, pt point, cr *CaseResult, start []float64) {
	tl := &TiltLimits{Margin: tiltReach}
	// The solves only tell whether a balance exists and start the next
	// one: a loose tolerance and a short iteration do.
	ts := *s
	if ts.looseTol == 0 {
		ts.looseTol = 1e-6
	}
	ts.newtonCap = tiltNewtonSteps
	s = &ts
	sc := ts
	sc.looseTol = math.Max(ts.looseTol, tiltStepTol)
	search := func(axis int, sign float64) *float64 {
		w := &tiltWalk{f: append([]float64(nil), start...)}
		body := func(d float64) geom.Vec3 {
			pitch, roll := pt.pitch, pt.roll
			if axis == 0 {
				pitch += sign * d
			} else {
				roll += sign * d
			}
			return geom.BodyForceAt(pt.yaw, pitch, roll, pt.accel)
		}
		var good [][2]float64 // the attitudes that circulate, ascending, and their condition
		// The state of the steps, then of the refinement.
		at := &sc
		eval := func(d float64, cold bool) (c, h float64) {
			c, h = p.circulation(at, body(d), d, w, cold)
			if c > 0 {
				good = append(good, [2]float64{d, c})
			}
			return c, h
		}
		lo, clo, hlo := 0.0, math.Inf(1), 0.0
		for i := 1; float64(i-1)*tiltStep < tiltReach-1e-9; i++ {
			if p.cancelled() {
				return nil
			}
			d := math.Min(float64(i)*tiltStep, tiltReach)
			// A failure the trend of the condition does not foretell may be
			// the warm start's: Newton's iteration is tried again without
			// bounds. One it foretells is the limit.
			c, h := eval(d, !foretold(good, d))
			if c > 0 {
				lo, clo, hlo = d, c, h
				continue
			}
			at = s
			if math.IsInf(clo, 1) {
				// The first step already fails: bracket from the case's
				// own attitude.
				clo, hlo = eval(0, true)
			}
			var crit float64
			switch {
			case !(clo > 0):
				crit = lo
			case p.net.ring:
				crit = brent(func(d float64) float64 { c, _ := eval(d, false); return c }, lo, d, clo, c, tiltTol)
			case !(h > 0) && hlo > 0:
				crit = brent(func(d float64) float64 { return p.headAt(s, body(d), w) }, lo, d, hlo, h, tiltTol)
				if inside := crit - tiltCheck; inside > lo {
					if c, _ := eval(inside, false); !(c > 0) {
						crit = refineTilt(eval, &good, lo, inside)
					}
				}
			default:
				crit = refineTilt(eval, &good, lo, d)
			}
			tl.Margin = math.Min(tl.Margin, crit)
			a := pt.roll + sign*crit
			if axis == 0 {
				a = pt.pitch + sign*crit
			}
			return &a
		}
		return nil
	}
	tl.PitchUp = search(0, 1)
	tl.PitchDown = search(0, -1)
	tl.RollLeft = search(1, 1)
	tl.RollRight = search(1, -1)
	cr.Tilt = tl
	lim := p.limits.TiltMargin.SI
	use := lim / math.Max(tl.Margin, 1e-300)
	m := Margin{Margin: MarginTilt, Value: tl.Margin, Limit: lim, Unit: "rad", Use: use, Status: "ok"}
	if tl.Margin < lim {
		m.Status = "warning"
		cr.Findings = append(cr.Findings, p.finding(RuleTilt, "warning", cr.Case, "", tl.Margin, lim, "rad", "tilt_margin",
			"case %s is %.1f° from an attitude where circulation stops (%s), within the tilt margin %.1f°; these are the angles at which the estimate's circulation stops, weighing the whole liquid and vapour columns and the losses, not tilt-limits' angles between thermal centres",
			cr.Case, tl.Margin*180/math.Pi, tl.describe(), lim*180/math.Pi))
	}
	cr.add(m)
}

// refineTilt closes the bracket [lo, hi] of a network's tilt limit (the
// loop circulates at lo, not at hi) where the condition has no value past
// the limit (no balance is found there): each step aims just past the zero
// of the straight line through the two nearest circulating attitudes, so a
// condition that falls smoothly to its limit is closed in a few solves,
// and bisects when that aim leaves the bracket.
func refineTilt(eval func(float64, bool) (float64, float64), good *[][2]float64, lo, hi float64) float64 {
	for it := 0; it < 60 && hi-lo > tiltTol; it++ {
		x := 0.5 * (lo + hi)
		if n := len(*good); n >= 2 {
			p0, p1 := (*good)[n-2], (*good)[n-1]
			if p1[0] == lo && p0[1] > p1[1] && p0[0] < p1[0] {
				// Short of the line's zero while it is far, where the
				// loop still circulates and the solve is quick; just past
				// it once it is close, to close the bracket.
				xr := p1[0] + p1[1]*(p1[0]-p0[0])/(p0[1]-p1[1])
				if xr-lo > 4*tiltTol {
					xr = lo + 0.8*(xr-lo)
				} else {
					xr += 0.5 * tiltTol
				}
				if xr > lo && xr < hi {
					x = xr
				}
			}
		}
		if c, _ := eval(x, false); c > 0 {
			lo = x
		} else {
			hi = x
		}
	}
	return 0.5 * (lo + hi)
}

// foretold reports whether the straight line through the last two
// circulating attitudes of a walk reaches zero before d (or within one more
// step): a failure at d is then expected.
func foretold(good [][2]float64, d float64) bool {
	n := len(good)
	if n < 2 {
		return false
	}
	p0, p1 := good[n-2], good[n-1]
	if !(p0[1] > p1[1]) || !(p1[0] > p0[0]) {
		return false
	}
	return p1[0]+p1[1]*(p1[0]-p0[0])/(p0[1]-p1[1]) < d+tiltStep
}

func (tl *TiltLimits) describe() string {
	var parts []string
	add := func(name string, v *float64) {
		if v != nil {
			parts = append(parts, fmt.Sprintf("%s %+.1f°", name, *v*180/math.Pi))
		}
	}
	add("pitch", tl.PitchUp)
	add("pitch", tl.PitchDown)
	add("roll", tl.RollLeft)
	add("roll", tl.RollRight)
	if len(parts) == 0 {
		return "none within half a turn"
	}
	out := parts[0]
	for _, s := range parts[1:] {
		out += ", " + s
	}
	return out
}

// worst picks, for each margin, the case and component closest to the
// limit, naming the sweep point when one is.
func worst(cases []CaseResult) []Margin {
	best := map[string]Margin{}
	for _, c := range cases {
		for _, m := range c.Margins {
			if b, ok := best[m.Margin]; !ok || m.Use > b.Use {
				if c.Grid {
					m.Point = c.PointLabel()
				}
				best[m.Margin] = m
			}
		}
		if c.Envelope != nil {
			for _, w := range c.Envelope.Worst {
				if b, ok := best[w.Margin.Margin]; !w.Uniform && (!ok || w.Use > b.Use) {
					m := w.Margin
					m.Point = "the envelope's worst, " + (&CaseResult{Yaw: w.At.Yaw, Pitch: w.At.Pitch, Roll: w.At.Roll, Accel: w.At.Accel}).PointLabel()
					best[m.Margin] = m
				}
			}
		}
		if c.Profile == nil {
			continue
		}
		for _, m := range c.Profile.Worst {
			if b, ok := best[m.Margin]; !ok || m.Use > b.Use {
				m.Point = "t = " + secText(*m.Time) + " s of its profile"
				best[m.Margin] = m
			}
		}
	}
	return byMargin(best)
}

// byMargin lists the worst of each margin, in the order of the margins'
// names.
func byMargin(best map[string]Margin) []Margin {
	names := make([]string, 0, len(best))
	for k := range best {
		names = append(names, k)
	}
	sort.Strings(names)
	out := make([]Margin, len(names))
	for i, n := range names {
		out[i] = best[n]
	}
	return out
}

// chargeRange intersects the charge ranges of every case.
func chargeRange(cases []CaseResult) *ChargeRange {
	var out *ChargeRange
	for _, c := range cases {
		r := c.ChargeRange
		if r == nil {
			continue
		}
		point := ""
		if c.Grid {
			point = c.PointLabel()
		}
		if out == nil {
			out = &ChargeRange{Charge: r.Charge, Low: r.Low, High: r.High, LowCase: c.Case, HighCase: c.Case, LowPoint: point, HighPoint: point, HighBy: r.HighBy}
			continue
		}
		if r.Low > out.Low {
			out.Low, out.LowCase, out.LowPoint = r.Low, c.Case, point
		}
		if r.High < out.High {
			out.High, out.HighCase, out.HighPoint, out.HighBy = r.High, c.Case, point, r.HighBy
		}
	}
	return out
}

// PointLabel describes a case's attitude and acceleration in degrees and
// standard gravities, as a sweep point is named.
func (c *CaseResult) PointLabel() string {
	// Angles as the case headings, tilt lines and sweep tables write them
	// (+2.3°, 0.0°), so a point reads the same in the worst-case table.
	deg := func(r float64) string {
		s := strconv.FormatFloat(r*180/math.Pi, 'f', 1, 64)
		switch {
		case s == "-0.0" || s == "0.0":
			return "0.0°"
		case !strings.HasPrefix(s, "-"):
			s = "+" + s
		}
		return s + "°"
	}
	s := "pitch " + deg(c.Pitch) + ", roll " + deg(c.Roll)
	if math.Abs(c.Yaw) >= 0.05*math.Pi/180 {
		s = "yaw " + deg(c.Yaw) + ", " + s
	}
	if a := c.Accel; a != [3]float64{} {
		g := func(v float64) string { return strconv.FormatFloat(v/geom.Gn, 'g', 3, 64) }
		s += ", acceleration (" + g(a[0]) + ", " + g(a[1]) + ", " + g(a[2]) + ") gn"
	}
	return s
}

// dryText describes an evaporator outlet at quality x ≥ 1: dry saturated
// vapour at 1, superheated above it, where x is the heat added over the
// latent heat the flow can take up.
func dryText(x float64) string {
	if x <= 1.005 {
		return "evaporates all its flow (exit quality 1, dry vapour at the outlet)"
	}
	return fmt.Sprintf("evaporates all its flow and superheats the vapour, taking in %.2f times the heat that evaporates the flow", x)
}
