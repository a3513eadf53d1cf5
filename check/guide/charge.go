package guide

import (
	"fmt"
	"math"

	"circa/check/flow"
	"circa/lang"
	"circa/units"
)

// chargeGuide is the feasible range of a loop's fill charge. The charge
// changes no operating point (the loop adjusts its liquid level to it), so
// the range is the one the estimate's charge margin accepts in every case,
// and it holds only when every other margin holds too. Its ends are exact:
// the charge margin's use is linear in the charge on each side.
func chargeGuide(l *lang.Loop, lr *flow.LoopResult, res *flow.Result, keep func(Where) bool) *Param {
	cr := casesCharge(lr)
	if !l.Charge.Set || cr == nil {
		return nil
	}
	p := &Param{Param: "charge", Value: l.Charge.SI, Unit: l.Charge.Unit(), Influences: true}
	r := &Range{}
	p.Range = r
	// At the charge as written, and without the charge margin: a charge
	// cannot mend the other margins.
	s0, _ := summarize(res, l.Charge.SI, keep)
	r.Use, r.Limit = s0.Use, s0.Limit
	if s0.Stop != nil {
		r.Stop, r.Reason, r.Limit = s0.Stop.Kind, s0.Stop.Message, Where{Case: s0.Stop.Case}
	}
	other, _ := summarize(res, l.Charge.SI, func(w Where) bool {
		return (w.Loop != l.Name || w.Margin != flow.MarginCharge) && (keep == nil || keep(w))
	})
	low := Bound{Value: cr.Low, Limit: Where{Loop: l.Name, Margin: flow.MarginCharge, Case: cr.LowCase},
		Reason: fmt.Sprintf("evaporator starved: the liquid level falls through more than %.0f %% of the liquid lines in case %s",
			flow.ChargeLevelWarn*100, cr.LowCase)}
	high := Bound{Value: cr.High, Limit: Where{Loop: l.Name, Margin: flow.MarginCharge, Case: cr.HighCase}}
	switch cr.HighBy {
	case flow.ChargeByFull:
		high.Reason = fmt.Sprintf("no room for vapour: liquid fills the whole loop in case %s", cr.HighCase)
	case flow.ChargeByReservoir:
		high.Reason = fmt.Sprintf("reservoir overfull: the reservoirs are full and the surplus floods more than %.0f %% of the condenser volume in case %s",
			flow.ChargeFloodWarn*100, cr.HighCase)
	default:
		high.Reason = fmt.Sprintf("condenser flooded: the surplus floods more than %.0f %% of the condenser volume in case %s",
			flow.ChargeFloodWarn*100, cr.HighCase)
	}
	switch {
	case cr.Low > cr.High:
		r.Reason = fmt.Sprintf("no charge suits every case: case %s needs at least %s kg, case %s takes at most %s kg",
			cr.LowCase, units.Sig(cr.Low, 3), cr.HighCase, units.Sig(cr.High, 3))
	case other.Stop != nil || other.Use > 1:
		if r.Reason == "" {
			r.Reason = fmt.Sprintf("no charge keeps every margin: %s uses %.3g of its limit whatever the charge",
				other.Limit.Describe(), other.Use)
		}
	default:
		r.Feasible = true
		r.Contains = l.Charge.SI >= cr.Low && l.Charge.SI <= cr.High
		r.Low, r.High = &low, &high
	}
	p.Sensitivities = chargeSens(l, lr)
	return p
}

// casesCharge intersects the charge ranges of the loop's cases, leaving
// out sweep points as the rest of the guidance does.
func casesCharge(lr *flow.LoopResult) *flow.ChargeRange {
	var out *flow.ChargeRange
	for ci := range lr.Cases {
		c := &lr.Cases[ci]
		r := c.ChargeRange
		if c.Grid || r == nil {
			continue
		}
		if out == nil {
			out = &flow.ChargeRange{Charge: r.Charge, Low: r.Low, High: r.High, LowCase: c.Case, HighCase: c.Case, HighBy: r.HighBy}
			continue
		}
		if r.Low > out.Low {
			out.Low, out.LowCase = r.Low, c.Case
		}
		if r.High < out.High {
			out.High, out.HighCase, out.HighBy = r.High, c.Case, r.HighBy
		}
	}
	return out
}

// chargeSens differentiates each case's charge margin: on the short side its
// use is the deficit over the one at the low end, on the surplus side the
// surplus over the one at the high end (docs/estimate-json.md).
func chargeSens(l *lang.Loop, lr *flow.LoopResult) []Sensitivity {
	var out []Sensitivity
	ch := l.Charge.SI
	scale := unitScale(l.Charge.Unit())
	unit := l.Charge.Unit()
	if unit == "" {
		unit = "kg"
	}
	for ci := range lr.Cases {
		c := &lr.Cases[ci]
		if c.Grid || c.ChargeRange == nil {
			continue
		}
		for _, m := range c.Margins {
			if m.Margin != flow.MarginCharge || m.Use == 0 {
				continue
			}
			var d float64
			switch {
			case ch < m.Limit && m.Limit > c.ChargeRange.Low:
				d = -1 / (m.Limit - c.ChargeRange.Low)
			case ch > m.Limit && c.ChargeRange.HighBy != flow.ChargeByFull && c.ChargeRange.High > m.Limit:
				d = 1 / (c.ChargeRange.High - m.Limit)
			default:
				continue
			}
			out = append(out, Sensitivity{Where: Where{Loop: l.Name, Margin: m.Margin, Case: c.Case}, Use: m.Use,
				PerUnit: d * scale, Unit: unit, PerTenPercent: d * 0.1 * math.Abs(ch)})
		}
	}
	sortSens(out)
	return out
}
