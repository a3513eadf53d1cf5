package check

import (
	"fmt"
	"math"

	"circa/check/geom"
	"circa/lang"
)

// Circulation direction: gravity drives the loop only while the condensers'
// thermal centre lies above the evaporators' along the body force. The
// driving elevation is h = (c_cond − c_evap)·(−b̂), with the centres from
// geom.ThermalCentre (evaporators weighted by their heat in the case,
// condensers by their conductance) and b the case's body force.

func init() {
	Register(&Rule{ID: "no-gravity-head", Category: CategoryDirection, Severity: lang.Error,
		Summary:   "the condenser is not above the evaporator along the body force",
		Rationale: "A thermosiphon circulates because the liquid column returning from the condenser is heavier than the vapour-filled riser. That needs the condensers' thermal centre above the evaporators' along the effective gravity (including tilt and acceleration) in every case.",
		Example:   "node a at (0, 0, 1) m   # evaporator inlet\nnode c at (0, 0, 0) m   # condenser below it",
		Fix:       "Raise the condenser or lower the evaporator, or limit the attitude the case allows.",
		Run:       noGravityHead})
	Register(&Rule{ID: "tilt-limits", Category: CategoryDirection, Severity: lang.Info,
		Summary:   "the pitch and roll angles at which gravity circulation stops",
		Rationale: "Tilting the equipment moves the effective gravity; beyond a critical angle the condenser is no longer above the evaporator. Knowing the angles tells how much slope, heel or trim the design tolerates.",
		Example:   "(any loop with an evaporator and a condenser)",
		Fix:       "Nothing to fix; raise the condenser or bring it closer above the evaporator to widen the angles.",
		Run:       tiltLimits})
	Register(&Rule{ID: "tilt-margin", Category: CategoryDirection, Severity: lang.Warning,
		Summary:   "a case's pitch or roll comes within the tilt margin of a critical angle",
		Rationale: "Close to a critical angle the driving elevation nearly vanishes, so the flow (and the heat the loop can carry) collapses; small extra tilt stops it.",
		Example:   "limits { tilt_margin 5 deg }\ncase slope { pitch 33 deg }   # critical pitch 36°",
		Fix:       "Move the condenser so the critical angles widen, or reduce the case's angle.",
		Run:       tiltMargin})
}

type centres struct {
	d       geom.Vec3 // condensers' centre minus evaporators' centre
	partial bool      // horizontal positions only partly known
	evaps   []*lang.Component
	conds   []*lang.Component
}

// loopCentres returns the thermal centres of a loop in a case (nil: the
// components' own loads).
func loopCentres(c *Context, cs *lang.Case) (centres, bool) {
	var out centres
	l, lay := c.Loop, c.Layout
	for _, comp := range l.Components {
		switch comp.Kind {
		case lang.Evaporator:
			out.evaps = append(out.evaps, comp)
		case lang.Condenser:
			out.conds = append(out.conds, comp)
		default:
			continue
		}
		if comp.From != nil && lay.ZOnly[comp.From.Index] {
			out.partial = true
		}
	}
	// The case's heat loads by component, the first one set for each, looked
	// up once: a scan of the case per evaporator is quadratic in a loop of
	// many parallel evaporators.
	caseHeat := map[*lang.Component]float64{}
	if cs != nil {
		for _, h := range cs.Heat {
			if _, dup := caseHeat[h.Comp]; h.Value.Set && !dup {
				caseHeat[h.Comp] = h.Value.SI
			}
		}
	}
	heat := func(comp *lang.Component) float64 {
		if q, ok := caseHeat[comp]; ok {
			return q
		}
		return comp.Heat.SI
	}
	ce, ok1 := geom.ThermalCentre(lay, l, lang.Evaporator, heat)
	cc, ok2 := geom.ThermalCentre(lay, l, lang.Condenser, func(comp *lang.Component) float64 { return comp.Conductance.SI })
	if !ok1 || !ok2 {
		return out, false
	}
	out.d = cc.Sub(ce)
	return out, true
}

// head returns the driving elevation along the body force b.
func head(d, b geom.Vec3) float64 {
	n := b.Norm()
	if n == 0 {
		return 0
	}
	return -d.Dot(b) / n
}

// attitude is a case's angles and acceleration.
type attitude struct {
	yaw, pitch, roll float64
	accel            geom.Vec3
}

func attitudeOf(cs *lang.Case) attitude {
	if cs == nil {
		return attitude{}
	}
	return attitude{cs.Yaw.SI, cs.Pitch.SI, cs.Roll.SI, geom.Vec3{cs.Accel.X, cs.Accel.Y, cs.Accel.Z}}
}

func (a attitude) body() geom.Vec3 { return geom.BodyForceAt(a.yaw, a.pitch, a.roll, a.accel) }

// crossings returns the nearest angles above and below a0 (within half a
// turn) where f changes sign from its value at a0, found by scanning in
// half-degree steps and bisecting.
func crossings(f func(float64) float64, a0 float64) (up, down float64, okUp, okDown bool) {
	const step = 0.5 * math.Pi / 180
	find := func(dir float64) (float64, bool) {
		prev := a0
		for i := 1; i <= 360; i++ {
			a := a0 + dir*float64(i)*step
			if f(a) <= 0 {
				lo, hi := prev, a // f(lo) > 0, f(hi) <= 0
				for k := 0; k < 60; k++ {
					mid := (lo + hi) / 2
					if f(mid) > 0 {
						lo = mid
					} else {
						hi = mid
					}
				}
				return (lo + hi) / 2, true
			}
			prev = a
		}
		return 0, false
	}
	up, okUp = find(1)
	down, okDown = find(-1)
	return
}

// critical returns the critical pitch or roll angles of a loop about an
// attitude, other angles held.
func critical(d geom.Vec3, at attitude, roll bool) (up, down float64, okUp, okDown bool) {
	f := func(x float64) float64 {
		a := at
		if roll {
			a.roll = x
		} else {
			a.pitch = x
		}
		return head(d, a.body())
	}
	a0 := at.pitch
	if roll {
		a0 = at.roll
	}
	return crossings(f, a0)
}

func cases(m *lang.Model) []*lang.Case {
	if len(m.Cases) == 0 {
		return []*lang.Case{nil}
	}
	return m.Cases
}

func caseName(cs *lang.Case) string {
	if cs == nil {
		return "level, at rest"
	}
	return cs.Name
}

func noGravityHead(c *Context) {
	for _, cs := range cases(c.Model) {
		cen, ok := loopCentres(c, cs)
		if !ok {
			return
		}
		b := attitudeOf(cs).body()
		loc := c.Loop.NameLoc()
		if cs != nil {
			loc = cs.NameLoc()
		}
		if b.Norm() < 1e-9 {
			c.Reportf(loc, "no body force in case %s (the acceleration cancels gravity): loop %s cannot circulate by gravity", caseName(cs), c.Loop.Name)
			continue
		}
		h := head(cen.d, b)
		if h > 0 {
			continue
		}
		d := c.Reportf(loc, "driving elevation %s in case %s: the condensers' centre of loop %s is not above the evaporators' along the body force, so it cannot circulate by gravity",
			qs(h, "m"), caseName(cs), c.Loop.Name)
		for _, e := range cen.evaps {
			d.Related = append(d.Related, related(e, "evaporator %s", e.Name))
		}
		for _, k := range cen.conds {
			d.Related = append(d.Related, related(k, "condenser %s", k.Name))
		}
	}
}

// pair formats two critical angles, "±55.1°" when they mirror each other.
func pair(up, down float64, okUp, okDown bool) string {
	switch {
	case okUp && okDown && math.Abs(up+down) < 0.05*math.Pi/180:
		return fmt.Sprintf("±%.1f°", math.Abs(up)*180/math.Pi)
	case okUp && okDown:
		return degrees(up) + " / " + degrees(down)
	case okUp:
		return degrees(up) + " (none below)"
	case okDown:
		return degrees(down) + " (none above)"
	}
	return "none"
}

func tiltLimits(c *Context) {
	cs := c.Model.Nominal
	cen, ok := loopCentres(c, cs)
	if !ok {
		return
	}
	at := attitudeOf(cs)
	if head(cen.d, at.body()) <= 0 {
		return // reported as no-gravity-head
	}
	pu, pd, opu, opd := critical(cen.d, at, false)
	ru, rd, oru, ord := critical(cen.d, at, true)
	about := ""
	if cs != nil {
		about = fmt.Sprintf(" (other angles as in case %s)", cs.Name)
	}
	note := ""
	if cen.partial {
		note = "; horizontal positions partly unknown (rises only), taken as no horizontal offset"
	}
	c.Reportf(c.Loop.NameLoc(), "loop %s: critical pitch %s, roll %s%s; beyond them the condensers' centre is no longer above the evaporators'%s (geometry only: the estimate's margin-tilt finds where circulation stops, which also depends on the liquid and vapour columns and the losses)",
		c.Loop.Name, pair(pu, pd, opu, opd), pair(ru, rd, oru, ord), about, note)
}

func tiltMargin(c *Context) {
	margin := c.Model.Limits.TiltMargin.SI
	if !(margin > 0) {
		return
	}
	for _, cs := range c.Model.Cases {
		if estimateTilt(c, cs) {
			continue // margin-tilt reports the estimate's own angles for the case
		}
		cen, ok := loopCentres(c, cs)
		if !ok {
			return
		}
		at := attitudeOf(cs)
		if head(cen.d, at.body()) <= 0 {
			continue // reported as no-gravity-head
		}
		for _, axis := range []struct {
			name string
			roll bool
			v    lang.Value
			a0   float64
		}{{"pitch", false, cs.Pitch, at.pitch}, {"roll", true, cs.Roll, at.roll}} {
			up, down, okUp, okDown := critical(cen.d, at, axis.roll)
			near, gap, found := 0.0, math.Inf(1), false
			if okUp && up-axis.a0 < gap {
				near, gap, found = up, up-axis.a0, true
			}
			if okDown && axis.a0-down < gap {
				near, gap, found = down, axis.a0-down, true
			}
			if !found || gap >= margin {
				continue
			}
			c.Reportf(valueLoc(axis.v, cs.NameLoc()), "%s %s in case %s is %.1f° from loop %s's critical %s %s, within the tilt margin of %.1f°",
				axis.name, degrees(axis.a0), cs.Name, gap*180/math.Pi, c.Loop.Name, axis.name, degrees(near), margin*180/math.Pi)
		}
	}
}

// estimateTilt reports whether the estimate runs in this check and found
// the attitudes at which circulation stops for case cs: margin-tilt then
// reports the case's margin, and tilt-margin would say the same fact again
// with the geometric angle, a different number.
func estimateTilt(c *Context, cs *lang.Case) bool {
	o := c.Options
	if o.SkipEstimates || o.NoTilt || o.Disabled["margin-tilt"] || !c.Loop.Fluid.Set || c.Loop.Fluid.Bad {
		return false
	}
	lr := loopEstimate(c)
	for i := range lr.Cases {
		if cr := &lr.Cases[i]; cr.Case == cs.Name && !cr.Grid && cr.Tilt != nil {
			return true
		}
	}
	return false
}
