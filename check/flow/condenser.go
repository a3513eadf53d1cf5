package flow

import (
	"fmt"
	"math"
	"strings"

	"circa/check/correlate"
	"circa/check/fluid"
	"circa/check/geom"
	"circa/lang"
)

// A condenser given by geometry (no conductance) rejects heat through a
// condensing film on the inside of its tubes, in series with the coolant
// side when coolant_htc is given (else the wall is taken at the coolant
// temperature). The film coefficient is Nusselt's for a tube within 45° of
// the body force (a vertical condensing length) and Chato's stratified form
// for a flatter one, each with the body-force component it feels. With
// methods { condensation shah } (or boyko_kruzhilin, akers_deans_crosser,
// cavallini_smith_zecchin) the coefficient is instead that forced-convection
// correlation, averaged over the quality from saturated vapour to liquid, at
// the mass flux that condenses the heat the condenser rejects: the least
// flow that can carry that heat, so the lowest coefficient a wet inflow
// would give.

// condModel is the in-tube coefficient of geometry condensers: the laminar
// film, or the forced-convection correlation m when forced is set.
type condModel struct {
	forced bool
	m      correlate.CondensationMethod
}

// parseCondensation reads a condensation method name as written in loop
// files ("film", "shah", "boyko_kruzhilin", ...).
func parseCondensation(name string) (condModel, error) {
	if name == "film" {
		return condModel{}, nil
	}
	m, err := correlate.ParseCondensationMethod(hyphen(name))
	if err != nil {
		return condModel{}, fmt.Errorf("unknown condensation method %q (want film, %s)", name,
			strings.ReplaceAll(strings.Join(correlate.CondensationMethodNames(), ", "), "-", "_"))
	}
	return condModel{forced: true, m: m}, nil
}

// source names the forced-convection correlation and its year.
func (cm condModel) source() string {
	switch cm.m {
	case correlate.CondBoykoKruzhilin:
		return "Boyko & Kruzhilin 1967"
	case correlate.CondAkersDeansCrosser:
		return "Akers, Deans & Crosser 1959"
	case correlate.CondCavalliniSmithZecchin:
		return "Cavallini, Smith & Zecchin 1974"
	}
	return "Shah 1979"
}

// byGeometry reports whether a condenser's conductance comes from its
// geometry: no conductance and no outlet temperature, and a bore and length.
func byGeometry(cp comp) bool {
	return cp.kind == lang.Condenser && !cp.c.Conductance.Set && !cp.c.Outlet.Set && cp.D > 0 && cp.L > 0
}

// conductanceIn is a condenser's conductance UA in case c: the case's
// value when it gives one, else the component's; set is false when neither does.
func conductanceIn(c *lang.Case, cp comp) (ua float64, set bool) {
	if c != nil {
		for _, cv := range c.Conductances {
			if cv.Comp == cp.c {
				return cv.Value.SI, true
			}
		}
	}
	return cp.c.Conductance.SI, cp.c.Conductance.Set
}

// byGeometryIn reports whether a condenser rejects by its geometry in case
// c: by geometry, and the case gives it no conductance.
func byGeometryIn(c *lang.Case, cp comp) bool {
	_, set := conductanceIn(c, cp)
	return !set && byGeometry(cp)
}

// overrides lists what case c replaces of the loop's components: an
// evaporator's heat or a condenser's sink where the component gives its own,
// and every conductance the case gives.
func overrides(c *lang.Case, comps []comp) []Override {
	if c == nil {
		return nil
	}
	var out []Override
	own := func(v lang.Value) *float64 {
		if !v.Set {
			return nil
		}
		x := v.SI
		return &x
	}
	for _, cp := range comps {
		switch cp.kind {
		case lang.Evaporator:
			for _, h := range c.Heat {
				if h.Comp == cp.c && cp.c.Heat.Set && h.Value.SI != cp.c.Heat.SI {
					out = append(out, Override{Component: cp.name, Field: "heat", Value: h.Value.SI, Own: own(cp.c.Heat)})
				}
			}
		case lang.Condenser:
			sink, set := c.Sink.SI, c.Sink.Set
			for _, sv := range c.Sinks {
				if sv.Comp == cp.c {
					sink, set = sv.Value.SI, true
				}
			}
			if set && cp.c.Sink.Set && sink != cp.c.Sink.SI {
				out = append(out, Override{Component: cp.name, Field: "sink", Value: sink, Own: own(cp.c.Sink)})
			}
			for _, cv := range c.Conductances {
				if cv.Comp == cp.c {
					out = append(out, Override{Component: cp.name, Field: "conductance", Value: cv.Value.SI, Own: own(cp.c.Conductance)})
				}
			}
		}
	}
	return out
}

// tubeCount is a condenser's number of parallel tubes: tubes, else its
// channels (default 1).
func tubeCount(c *lang.Component) float64 {
	if c.Tubes.Set && c.Tubes.SI >= 1 && finite(c.Tubes.SI) {
		return math.Floor(c.Tubes.SI)
	}
	return c.ChannelCount()
}

// filmRejection is the heat (W) a geometry condenser rejects at saturation
// temperature T with its coolant at ts, body force b, saturated properties
// p; by the forced-convection correlation when cm has one, else by the
// laminar film.
func filmRejection(cm condModel, cp comp, b geom.Vec3, T, ts float64, p correlate.Props) float64 {
	dT := T - ts
	if !(dT > 0) {
		return 0
	}
	area := math.Pi * cp.D * cp.L * tubeCount(cp.c)
	if cm.forced {
		return forcedRejection(cm.m, cp, area, dT, p)
	}
	bm := b.Norm()
	cos := 0.0
	if dl := cp.disp.Norm(); dl > 0 && bm > 0 {
		cos = math.Abs(cp.disp.Dot(b)) / (dl * bm)
	}
	film := func(d float64) float64 {
		if cos >= math.Sqrt2/2 {
			return correlate.FilmVertical(cp.L, bm*cos, d, p)
		}
		return correlate.FilmHorizontalTube(cp.D, bm*math.Sqrt(math.Max(0, 1-cos*cos)), d, p)
	}
	ho := cp.c.CoolantHTC.SI
	if !cp.c.CoolantHTC.Set || !(ho > 0) || !finite(ho) {
		return film(dT) * area * dT
	}
	// Film and coolant side in series: find the film temperature drop d
	// with h(d)·d = ho·(dT − d); the left side rises with d (h ∝ d^-¼).
	lo, hi := 0.0, dT
	for i := 0; i < 60; i++ {
		d := (lo + hi) / 2
		if film(d)*d > ho*(dT-d) {
			hi = d
		} else {
			lo = d
		}
	}
	return ho * area * (dT - (lo+hi)/2)
}

// forcedRejection is the heat (W) a geometry condenser of inner area area
// rejects across dT by the mean coefficient of m at the mass flux
// G = q/(h_lv·A_flow) that condenses it. Where m's h is h1·G^n (h1 at
// G = 1 kg/m²s; n = 0.8 for Shah, Boyko–Kruzhilin, Cavallini–Smith–Zecchin)
// and the tube wall is at the coolant temperature, q = h1 (q/(h_lv A_flow))^n
// area dT has the closed form q = (c area dT)^(1/(1−n)), c = h1/(h_lv A_flow)^n;
// otherwise (a coolant side in series, or Akers–Deans–Crosser's two
// exponents) q is bisected.
func forcedRejection(m correlate.CondensationMethod, cp comp, area, dT float64, p correlate.Props) float64 {
	af := math.Pi / 4 * cp.D * cp.D * tubeCount(cp.c)
	if !(af > 0) || !(p.Hlv > 0) || !(area > 0) {
		return 0
	}
	h := func(q float64) float64 { return m.Mean(q/(p.Hlv*af), 1, 0, cp.D, p) }
	if n, ok := m.MassFluxExponent(); ok {
		h1 := m.Mean(1, 1, 0, cp.D, p)
		if !(h1 > 0) {
			return 0
		}
		c := h1 / math.Pow(p.Hlv*af, n)
		h = func(q float64) float64 { return c * math.Pow(q, n) }
	}
	ho := cp.c.CoolantHTC.SI
	coolant := cp.c.CoolantHTC.Set && ho > 0 && finite(ho)
	if n, ok := m.MassFluxExponent(); ok && !coolant {
		return math.Pow(h(1)*area*dT, 1/(1-n))
	}
	// f(q) = q − area·dT/(1/h(q) + 1/ho): negative for small q (h rises
	// slower than q), not negative at the coolant-side limit q = ho·area·dT;
	// without a coolant side the upper end is found by growing it.
	rej := func(q float64) float64 {
		hq := h(q)
		if !(hq > 0) {
			return 0
		}
		if !coolant {
			return hq * area * dT
		}
		return area * dT / (1/hq + 1/ho)
	}
	lo, hi := 0.0, ho*area*dT
	if !coolant {
		hi = 1.0
		for i := 0; i < 200 && hi-rej(hi) < 0; i++ {
			hi *= 4
		}
	}
	for i := 0; i < 200 && hi-lo > 1e-12*hi; i++ {
		q := (lo + hi) / 2
		if q-rej(q) < 0 {
			lo = q
		} else {
			hi = q
		}
	}
	return (lo + hi) / 2
}

// geometrySaturation finds the saturation temperature at which the
// condensers reject qTot in case c: conductance condensers by UA·(T − T_sink),
// geometry condensers by their film. It bisects on T between the highest
// sink and the fluid's top; ok is false when even the top cannot reject it.
func geometrySaturation(cm condModel, fl fluid.Fluid, info fluid.Info, c *lang.Case, conds []comp, sinks []float64, b geom.Vec3, qTot float64) (float64, bool) {
	lo := info.Tmin
	for _, ts := range sinks {
		lo = math.Max(lo, ts)
	}
	hi := info.Tmax
	rej := func(T float64) float64 {
		sat, err := fl.AtT(T)
		if err != nil {
			return math.NaN()
		}
		p := correlate.Props{RhoL: sat.RhoL, RhoV: sat.RhoV, MuL: sat.MuL, KL: sat.KL, CpL: sat.CpL, Hlv: sat.Hlv}
		if info.Pc > 0 {
			p.ReducedPressure = sat.P / info.Pc
		}
		var q float64
		for i, cp := range conds {
			if byGeometryIn(c, cp) {
				q += filmRejection(cm, cp, b, T, sinks[i], p)
			} else {
				ua, _ := conductanceIn(c, cp)
				q += ua * (T - sinks[i])
			}
		}
		return q
	}
	if !(lo < hi) || !(rej(hi) >= qTot) {
		return hi, false
	}
	for i := 0; i < 80 && hi-lo > 1e-9; i++ {
		m := (lo + hi) / 2
		if rej(m) >= qTot {
			hi = m
		} else {
			lo = m
		}
	}
	return hi, true
}
