package flow

import (
	"math"

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
// for a flatter one, each with the body-force component it feels.

// byGeometry reports whether a condenser's conductance comes from its
// geometry: no conductance and no outlet temperature, and a bore and length.
func byGeometry(cp comp) bool {
	return cp.kind == lang.Condenser && !cp.c.Conductance.Set && !cp.c.Outlet.Set && cp.D > 0 && cp.L > 0
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
// temperature T with its coolant at ts, body force b, saturated properties p.
func filmRejection(cp comp, b geom.Vec3, T, ts float64, p correlate.Props) float64 {
	dT := T - ts
	if !(dT > 0) {
		return 0
	}
	area := math.Pi * cp.D * cp.L * tubeCount(cp.c)
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

// geometrySaturation finds the saturation temperature at which the
// condensers reject qTot: conductance condensers by UA·(T − T_sink),
// geometry condensers by their film. It bisects on T between the highest
// sink and the fluid's top; ok is false when even the top cannot reject it.
func geometrySaturation(fl fluid.Fluid, info fluid.Info, conds []comp, sinks []float64, b geom.Vec3, qTot float64) (float64, bool) {
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
		var q float64
		for i, cp := range conds {
			if byGeometry(cp) {
				q += filmRejection(cp, b, T, sinks[i], p)
			} else {
				q += cp.c.Conductance.SI * (T - sinks[i])
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
