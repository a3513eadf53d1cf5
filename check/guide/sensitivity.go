package guide

import (
	"math"
	"sort"
	"sync"

	"circa/check/flow"
	"circa/lang"
)

// Sensitivity is how fast one margin's use changes with a parameter.
type Sensitivity struct {
	Where
	// Use is the margin's use at the parameter's value.
	Use float64 `json:"use"`
	// PerUnit is the change of use per one Unit of the parameter.
	PerUnit float64 `json:"per_unit"`
	Unit    string  `json:"unit,omitempty"`
	// PerTenPercent is the change of use when the parameter is 10 % larger
	// (to first order; 0 for a parameter of value zero). For an absolute
	// temperature, whose 10 % depends on the scale, it is the change for
	// 10 K more.
	PerTenPercent float64 `json:"per_ten_percent"`
	// Coarse marks a slope below what the margin itself resolves (the tilt
	// limits are closed to 0.02°): it may be off by more than 1 %.
	Coarse bool `json:"coarse,omitempty"`
}

// Lever is a sensitivity with its parameter, for ranking across them.
type Lever struct {
	Param string `json:"param"`
	Sensitivity
}

// sensStep is the relative step of the central differences: small enough
// that the curvature of a margin's use costs well under 1 % of its slope,
// large enough that the estimate's own resolution (the flow's Brent
// tolerance, the cells) does not show.
const sensStep = 1e-3

// sensitivities differentiates every margin's use with respect to p by
// central differences about its value; margins that do not change are left
// out. It reports that p influences no
// estimate when neither step changes any margin or whether the design has a
// usable estimate.
func (gd *guider) sensitivities(p *lang.Param, unit string, ax axis, s0 Sample, ms0 margins) ([]Sensitivity, bool) {
	x0 := p.Value.SI
	h := sensStep * math.Abs(x0)
	if x0 == 0 {
		h = sensStep * ax.scale
	}
	var sp, sm Sample
	var mp, mm margins
	var wg sync.WaitGroup
	wg.Add(1)
	go func() {
		defer wg.Done()
		sm, mm, _ = gd.at(p, x0-h, mode{opts: &gd.full, reduce: gd.points})
	}()
	sp, mp, _ = gd.at(p, x0+h, mode{opts: &gd.full, reduce: gd.points})
	wg.Wait()
	// With the cases held at fixed points the steps are compared with each
	// other, not with the full estimate as written.
	if !changed(sp, mp, sm, mm) && (gd.points != nil || !changed(s0, ms0, sp, mp)) {
		return nil, false
	}
	scale := unitScale(unit)
	var out []Sensitivity
	for w, u0 := range ms0 {
		if w.Margin == MarginChargeWindow {
			continue
		}
		up, okP := mp[w]
		um, okM := mm[w]
		if !okP || !okM || !usable(u0) || !usable(up) || !usable(um) {
			continue
		}
		if up == um {
			continue
		}
		d := (up - um) / (2 * h)
		out = append(out, Sensitivity{Where: w, Use: u0, PerUnit: d * scale, Unit: unit, PerTenPercent: d * tenth(p),
			Coarse: math.Abs(up-um) < 100*resolution(w, u0, gd.m.Limits.TiltMargin.SI)})
	}
	sortSens(out)
	return out, true
}

// tiltResolution is the angle to which the estimate closes a tilt limit,
// rad (0.02°, docs/estimate-json.md).
const tiltResolution = 0.02 * math.Pi / 180

// resolution is the smallest change of a margin's use that the estimate
// resolves, at use u: for the tilt margin, limit/angle with the angle
// closed to tiltResolution, twice (both differences' ends) u²·0.02°/limit;
// the other margins follow the flow, which is solved to far below 1e-6.
func resolution(w Where, u, tiltLimit float64) float64 {
	if w.Margin == flow.MarginTilt && tiltLimit > 0 {
		return 2 * u * u * tiltResolution / tiltLimit
	}
	return 0
}

// tenth is the step "per 10 %" stands for: a tenth of the value, or 10 K
// for an absolute temperature.
func tenth(p *lang.Param) float64 {
	if p.AbsTemp {
		return 10
	}
	return 0.1 * math.Abs(p.Value.SI)
}

// usable reports whether a margin's use is a number to differentiate (an
// unreachable limit is reported as a huge use).
func usable(u float64) bool { return u < 1e6 && !math.IsNaN(u) }

// changed reports whether sample b differs from a in any margin or in
// having a usable estimate.
func changed(a Sample, ma margins, b Sample, mb margins) bool {
	if (a.Stop == nil) != (b.Stop == nil) || a.Stop != nil && *a.Stop != *b.Stop {
		return true
	}
	if len(ma) != len(mb) {
		return true
	}
	for w, u := range ma {
		if v, ok := mb[w]; !ok || v != u {
			return true
		}
	}
	return false
}

// sortSens orders sensitivities by the size of their change per 10 %
// (per unit for a parameter of value zero), then by name for a stable order.
func sortSens(s []Sensitivity) {
	sort.Slice(s, func(i, j int) bool {
		a, b := math.Abs(s[i].PerTenPercent), math.Abs(s[j].PerTenPercent)
		if a == 0 && b == 0 {
			a, b = math.Abs(s[i].PerUnit), math.Abs(s[j].PerUnit)
		}
		if a != b {
			return a > b
		}
		return whereLess(s[i].Where, s[j].Where)
	})
}

func whereLess(a, b Where) bool {
	if a.Loop != b.Loop {
		return a.Loop < b.Loop
	}
	if a.Margin != b.Margin {
		return a.Margin < b.Margin
	}
	if a.Case != b.Case {
		return a.Case < b.Case
	}
	return a.Component < b.Component
}

// levers ranks every parameter's sensitivities together by their change
// per 10 %.
func levers(ps []Param) []Lever {
	var out []Lever
	for _, p := range ps {
		for _, s := range p.Sensitivities {
			if s.PerTenPercent != 0 {
				out = append(out, Lever{Param: p.Param, Sensitivity: s})
			}
		}
	}
	sort.SliceStable(out, func(i, j int) bool {
		a, b := math.Abs(out[i].PerTenPercent), math.Abs(out[j].PerTenPercent)
		if a != b {
			return a > b
		}
		if out[i].Param != out[j].Param {
			return out[i].Param < out[j].Param
		}
		return whereLess(out[i].Where, out[j].Where)
	})
	return out
}
