package flow

import (
	"fmt"
	"math"

	"circa/check/correlate"
	"circa/lang"
)

// correlationRanges records, at the case's own operating point, each
// correlation the estimate applied to a component with an input outside
// the range its source states: one finding per component and correlation,
// naming the input furthest outside. Only correlations that were used
// count: Friedel and Lockhart–Martinelli where the flow is two-phase, Katto & Ohno on heated
// evaporators when chosen, Cooper where a wall or junction temperature is
// estimated, a forced-convection condensation correlation on condensers
// given by geometry. The findings are information: they say where a
// number is an extrapolation, not that the design fails.
func (p *prepared) correlationRanges(s *state, cr *CaseResult) {
	for ci, cs := range cr.Components {
		if ci >= len(s.net.comps) {
			break
		}
		cp := &s.net.comps[ci]
		if twoPhase(cs) && (p.fric.Method == correlate.Friedel || p.fric.Method == correlate.LockhartMartinelliChisholm) {
			// cos θ between the flow and the body force: above 0 in downflow.
			cos := math.NaN()
			if ci < len(s.cosInc) && cs.MassFlow != 0 && s.bmag > 0 {
				cos = s.cosInc[ci] * math.Copysign(1, cs.MassFlow)
			}
			if p.fric.Method == correlate.Friedel && s.p.MuV > 0 {
				p.rangeFinding(cr, cp, correlate.ValidityFriedel, map[string]float64{
					"μl/μv": s.p.MuL / s.p.MuV, "D": cp.D, "cos θ": cos})
			} else if p.fric.Method == correlate.LockhartMartinelliChisholm {
				p.rangeFinding(cr, cp, correlate.ValidityLockhartMartinelli, map[string]float64{"|cos θ|": math.Abs(cos)})
			}
		}
		if cp.kind == lang.Evaporator && s.heat[ci] > 0 {
			if p.chfFlow && s.p.RhoL > 0 {
				lh := cp.L
				if cp.c.HeatedLength.Set && cp.c.HeatedLength.SI > 0 {
					lh = cp.c.HeatedLength.SI
				}
				v := map[string]float64{"ρv/ρl": s.p.RhoV / s.p.RhoL}
				if cp.D > 0 {
					v["L/D"] = lh / cp.D
				}
				p.rangeFinding(cr, cp, correlate.ValidityKattoOhno, v)
			}
			_, stack := cp.c.StackResistance()
			if (cp.c.WallLimit.Set || stack) && wallFlux(cp.c, s.heat[ci], cp.D, cp.L) > 0 {
				pr := s.p.ReducedPressure
				if s.local && cs.Local != nil && p.info.Pc > 0 {
					pr = cs.Local.PressureIn / p.info.Pc
				}
				p.rangeFinding(cr, cp, correlate.ValidityCooper, map[string]float64{"p_r": pr})
			}
		}
		if cp.kind == lang.Condenser && p.cond.forced && byGeometryIn(cr.pointCase, *cp) && hasSink(cr.pointCase, cp) {
			v, ok := p.cond.m.Validity()
			af := math.Pi / 4 * cp.D * cp.D * tubeCount(cp.c)
			if !ok || !(af > 0) || !(s.p.Hlv > 0) || !(s.p.MuL > 0) || !(math.Abs(cs.Heat) > 0) {
				continue
			}
			// The mass flux that condenses the heat this condenser rejects,
			// at which the estimate takes the correlation's mean.
			re := math.Abs(cs.Heat) / (s.p.Hlv * af) * cp.D / s.p.MuL
			p.rangeFinding(cr, cp, v, map[string]float64{"Re_lo": re, "Re_eq": re, "p_r": s.p.ReducedPressure})
		}
	}
}

// hasSink reports whether a condenser has a coolant temperature in case
// c, without which the estimate does not evaluate its coefficient.
func hasSink(c *lang.Case, cp *comp) bool {
	if cp.c.Sink.Set {
		return true
	}
	if c == nil {
		return false
	}
	for _, sv := range c.Sinks {
		if sv.Comp == cp.c {
			return true
		}
	}
	return c.Sink.Set
}

// twoPhase reports whether a component carries two-phase flow somewhere.
func twoPhase(cs ComponentState) bool {
	lo, hi := math.Min(cs.XIn, cs.XOut), math.Max(cs.XIn, cs.XOut)
	return hi > 0 && lo < 1
}

// rangeFinding adds the finding for correlation v at component cp when an
// input lies outside v's stated ranges.
func (p *prepared) rangeFinding(cr *CaseResult, cp *comp, v correlate.Validity, values map[string]float64) {
	o, ok := v.Worst(values)
	if !ok {
		return
	}
	side := "above"
	if o.Below() {
		side = "below"
	}
	f := p.finding(RuleCorrelationRange, "info", cr.Case, cp.name, o.Value, o.Limit, o.Bound.Unit, "",
		"%s is applied outside its stated range at %s %s in case %s: %s (%s) = %s, %s the range %s (%s)",
		v.Correlation, cp.kind, cp.name, cr.Case, o.Bound.Quantity, o.Bound.What, sig(o.Value, o.Bound.Unit), side,
		o.Bound.Text(), o.Bound.Source)
	f.Correlation = v.Correlation
	cr.Findings = append(cr.Findings, f)
}

// sig writes v to four significant digits with its unit.
func sig(v float64, unit string) string {
	s := fmt.Sprintf("%.4g", v)
	if unit != "" {
		s += " " + unit
	}
	return s
}
