package check

import (
	"circa/units"
	"fmt"
	"math"

	"circa/check/flow"
	"circa/check/fluid"
	"circa/lang"
)

// marginText describes a margin for the summary line: the value and the
// limit in the units the file wrote them in (temperatures in °C, angles in
// degrees otherwise), and one measure of how far inside or past the limit
// the value is.
func marginText(c *Context, m flow.Margin, cr *flow.CaseResult) string {
	l, lim := c.Loop, c.Model.Limits
	at := ""
	if m.Component != "" {
		at = " at " + m.Component
	}
	num := func(v float64) string { return units.Sig(v, 3) }
	pct := func(v, limit float64) string {
		if !(limit > 0) || math.IsInf(v/limit, 0) {
			return "far past the limit"
		}
		return fmt.Sprintf("%.0f %% of the limit", 100*v/limit)
	}
	temp := func(k float64, v lang.Value) string { return sigAs(k, v, "°C") }
	over := func(d float64, unit string) string {
		if d > 0 {
			return fmt.Sprintf("%s over", fmt.Sprintf("%.1f %s", d, unit))
		}
		return fmt.Sprintf("%.1f %s to spare", -d, unit)
	}
	switch m.Margin {
	case flow.MarginExitQuality, flow.MarginHead:
		with := ""
		if m.Margin == flow.MarginHead {
			with = " with the losses ×" + num(lim.HeadRatio.SI)
		}
		if m.Value > 1.005 {
			return fmt.Sprintf("dryout%s%s: the vapour superheats, taking in %s times the heat that evaporates the flow (exit-quality limit %s)", at, with, num(m.Value), num(m.Limit))
		}
		return fmt.Sprintf("exit quality %s%s%s, limit %s: %s", num(m.Value), at, with, num(m.Limit), pct(m.Value, m.Limit))
	case flow.MarginFlooding:
		return fmt.Sprintf("%s %s%s, limit %s: %s", marginLabel(m.Margin, 0), num(m.Value), at, num(m.Limit), pct(m.Value, m.Limit))
	case flow.MarginCHF:
		return fmt.Sprintf("critical heat flux ratio %s%s, at least %s: %s times the minimum", num(m.Value), at, num(m.Limit), num(m.Value/m.Limit))
	case flow.MarginWall:
		wl := lang.Value{}
		if comp := c.Model.Component(m.Component); comp != nil {
			wl = comp.WallLimit
		}
		return fmt.Sprintf("wall temperature %s%s, limit %s: %s", temp(m.Value, wl), at, temp(m.Limit, wl), over(m.Value-m.Limit, "K"))
	case flow.MarginJunction:
		jl := lang.Value{}
		if comp := c.Model.Component(m.Component); comp != nil {
			jl = comp.JunctionLimit
		}
		return fmt.Sprintf("junction temperature %s%s, limit %s: %s", temp(m.Value, jl), at, temp(m.Limit, jl), over(m.Value-m.Limit, "K"))
	case flow.MarginPressure:
		dp := l.DesignPressure
		return fmt.Sprintf("saturation pressure %s, design pressure %s: %s", sigAs(m.Value, dp, "bar"), sigAs(m.Limit, dp, "bar"), pct(m.Value, m.Limit))
	case flow.MarginCondenser:
		if m.Unit == "K" && m.LimitField == flow.LimitFluidRange {
			return fmt.Sprintf("saturation temperature %.2f °C, below %s: %s", m.Value-273.15, rangeTop(l.Fluid, m.Limit), over(m.Value-m.Limit, "K"))
		}
		if m.Unit == "K" {
			return fmt.Sprintf("saturation temperature %s, saturation_max %s: %s", temp(m.Value, lim.SaturationMax), temp(m.Limit, lim.SaturationMax), over(m.Value-m.Limit, "K"))
		}
		return fmt.Sprintf("condenser capacity %.0f W for a load of %.0f W: %s", m.Value, m.Limit, pct(m.Limit, m.Value))
	case flow.MarginCharge:
		kg := func(v float64) string { return sigAs(v, l.Charge, "kg") }
		if cr == nil || cr.ChargeRange == nil {
			return fmt.Sprintf("charge %s, limit %s", kg(m.Value), kg(m.Limit))
		}
		r := cr.ChargeRange
		lo, hi := sigAsRange(math.Max(r.Low, 0), r.High, l.Charge, "kg")
		s := fmt.Sprintf("charge %s, the case accepts %s to %s: ", kg(r.Charge), lo, hi)
		switch {
		case r.Charge < r.Low:
			return s + kg(r.Low-r.Charge) + " short"
		case r.Charge > r.High:
			return s + kg(r.Charge-r.High) + " over"
		}
		return s + kg(math.Min(r.Charge-r.Low, r.High-r.Charge)) + " inside"
	case flow.MarginTilt:
		d := (m.Value - m.Limit) * 180 / math.Pi
		msg := fmt.Sprintf("%.1f° from an attitude where circulation stops, margin %.1f°: ", m.Value*180/math.Pi, m.Limit*180/math.Pi)
		if d < 0 {
			return msg + fmt.Sprintf("%.1f° inside the margin", -d)
		}
		return msg + fmt.Sprintf("%.1f° to spare", d)
	}
	return fmt.Sprintf("%s %s%s, limit %s", marginLabel(m.Margin, lim.HeadRatio.SI), num(m.Value), at, num(m.Limit))
}

// rangeTop names the top of a loop's fluid's range, tMax (K), as the limit
// of its condenser margin when no lower saturation_max is set.
func rangeTop(fs lang.FluidSpec, tMax float64) string {
	if fs.Table == "" {
		if fl, err := fluid.Lookup(fs.Name); err == nil {
			return flow.RangeTopText(fl.Info())
		}
	}
	return fmt.Sprintf("%.2f °C, the top of the fluid table's range", tMax-273.15)
}
