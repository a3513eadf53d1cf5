package flow

import (
	"fmt"
	"math"
	"sort"
)

// Envelope is the search of a case's envelope: for each margin the worst
// combination of attitude and acceleration found within the bounds, and
// where circulation stops inside them.
type Envelope struct {
	Axes []EnvelopeAxis `json:"axes"`
	// Worst lists, for each margin and component, the combination closest
	// to its limit among those that circulate.
	Worst []EnvelopeWorst `json:"worst"`
	// Stops is a combination within the bounds where the loop does not
	// circulate, when one is found.
	Stops *EnvelopePoint `json:"stops,omitempty"`
	// Estimates counts the steady states solved by the search.
	Estimates int `json:"estimates"`
	// OtherState counts, under saturation_state auto, the combinations
	// solved whose own liquid column would take the other saturation state
	// than the case's; every combination is estimated in the case's state.
	OtherState int `json:"other_state,omitempty"`
}

// EnvelopeAxis is one bounded axis, SI (rad, m/s²).
type EnvelopeAxis struct {
	Name string  `json:"name"` // pitch, roll, accel_x, accel_y, accel_z
	Lo   float64 `json:"low"`
	Hi   float64 `json:"high"`
}

// EnvelopePoint is one combination of attitude and acceleration.
type EnvelopePoint struct {
	Yaw    float64    `json:"yaw"`
	Pitch  float64    `json:"pitch"`
	Roll   float64    `json:"roll"`
	Accel  [3]float64 `json:"accel"`
	Reason string     `json:"reason,omitempty"` // why it does not circulate
}

// EnvelopeWorst is a margin at the combination that makes it worst.
type EnvelopeWorst struct {
	Margin
	At EnvelopePoint `json:"at"`
	// Uniform is set when the margin is the same at every combination
	// solved: At is then merely one of them.
	Uniform bool `json:"uniform,omitempty"`
}

// envelopeTol is the search's resolution along each axis, as a fraction of
// the axis's range.
const envelopeTol = 0.01

// envelopeSearch holds one case's search: its axes, the case's own point,
// and every combination solved so far.
type envelopeSearch struct {
	p     *prepared
	base  point
	axes  []EnvelopeAxis
	start []float64
	seen  map[[5]float64]*CaseResult
	stops *EnvelopePoint
}

// at returns the point of the search's coordinates x (one per axis).
func (e *envelopeSearch) at(x []float64) point {
	pt := e.base
	pt.envelope = true
	for i, a := range e.axes {
		switch a.Name {
		case "pitch":
			pt.pitch = x[i]
		case "roll":
			pt.roll = x[i]
		case "accel_x":
			pt.accel[0] = x[i]
		case "accel_y":
			pt.accel[1] = x[i]
		case "accel_z":
			pt.accel[2] = x[i]
		}
	}
	return pt
}

// eval solves the combination x, once.
func (e *envelopeSearch) eval(x []float64) *CaseResult {
	pt := e.at(x)
	k := [5]float64{pt.pitch, pt.roll, pt.accel[0], pt.accel[1], pt.accel[2]}
	if cr, ok := e.seen[k]; ok {
		return cr
	}
	cr, _ := e.p.run(pt, false, e.start)
	e.seen[k] = &cr
	if !cr.Circulates && cr.Heat > 0 && e.stops == nil {
		e.stops = &EnvelopePoint{Yaw: pt.yaw, Pitch: pt.pitch, Roll: pt.roll, Accel: [3]float64(pt.accel), Reason: cr.Reason}
	}
	return &cr
}

// use is margin key's use at x: −∞ where the loop does not circulate or
// the margin is absent, so the search looks for the worst among the
// combinations that run.
func (e *envelopeSearch) use(key string, x []float64) float64 {
	cr := e.eval(x)
	if !cr.Circulates {
		return math.Inf(-1)
	}
	for _, m := range cr.Margins {
		if m.Margin+"/"+m.Component == key {
			return m.Use
		}
	}
	return math.Inf(-1)
}

// envelope searches a case's envelope for the worst combination per
// margin. It starts from every corner of the box (where monotone margins
// are worst), then for each margin walks the axes one at a time from the
// worst combination seen: five samples along the axis bracket its worst,
// a golden-section search closes an interior bracket to envelopeTol of
// the range, and the walk repeats until a sweep of all axes improves
// nothing. Far fewer solves than a full grid of the same resolution.
func (p *prepared) envelope(pt point, cr *CaseResult, start []float64) {
	env := pt.c.Envelope
	e := &envelopeSearch{p: p, base: pt, start: start, seen: map[[5]float64]*CaseResult{}}
	for _, a := range env.Axes {
		e.axes = append(e.axes, EnvelopeAxis{Name: a.Name, Lo: a.Lo, Hi: a.Hi})
	}
	n := len(e.axes)
	if n == 0 || n > 5 {
		return
	}
	// The tilt search already knows where circulation stops along pitch
	// and roll from the case's own attitude.
	e.tiltStops(cr.Tilt)
	keys := map[string]bool{}
	var order []string
	note := func(r *CaseResult) {
		for _, m := range r.Margins {
			if k := m.Margin + "/" + m.Component; m.Margin != MarginTilt && !keys[k] {
				keys[k] = true
				order = append(order, k)
			}
		}
	}
	corners := make([][]float64, 0, 1<<n)
	for mask := 0; mask < 1<<n; mask++ {
		x := make([]float64, n)
		for i, a := range e.axes {
			x[i] = a.Lo
			if mask&(1<<i) != 0 {
				x[i] = a.Hi
			}
		}
		corners = append(corners, x)
		note(e.eval(x))
		if p.cancelled() {
			return
		}
	}
	centre := make([]float64, n)
	for i, a := range e.axes {
		centre[i] = 0.5 * (a.Lo + a.Hi)
	}
	note(e.eval(centre))
	sort.Strings(order)
	out := &Envelope{Axes: e.axes}
	var worstAt []*CaseResult
	for _, key := range order {
		best, bu := centre, e.use(key, centre)
		for _, x := range corners {
			if u := e.use(key, x); u > bu {
				best, bu = x, u
			}
		}
		if math.IsInf(bu, -1) {
			continue
		}
		best = append([]float64(nil), best...)
		for sweep := 0; sweep < 4 && !p.cancelled(); sweep++ {
			improved := false
			for i := range e.axes {
				if u := e.line(key, best, i, bu); u > bu*(1+1e-9)+1e-12 {
					bu, improved = u, true
				}
			}
			if !improved {
				break
			}
		}
		r := e.eval(best)
		for _, m := range r.Margins {
			if m.Margin+"/"+m.Component == key {
				at := e.at(best)
				out.Worst = append(out.Worst, EnvelopeWorst{Margin: m, Uniform: e.uniform(key, m.Use),
					At: EnvelopePoint{Yaw: at.yaw, Pitch: at.pitch, Roll: at.roll, Accel: [3]float64(at.accel)}})
				worstAt = append(worstAt, r)
			}
		}
	}
	// The findings of the worst combinations, once per rule and component.
	type fkey struct{ rule, comp string }
	had := map[fkey]bool{}
	for _, f := range cr.Findings {
		had[fkey{f.Rule, f.Component}] = true
	}
	for _, r := range worstAt {
		for _, f := range r.Findings {
			if k := (fkey{f.Rule, f.Component}); !had[k] {
				had[k] = true
				f.Message = "at the envelope's worst, " + r.PointLabel() + ": " + f.Message
				cr.Findings = append(cr.Findings, f)
			}
		}
	}
	out.Stops = e.stops
	out.Estimates = len(e.seen)
	for _, r := range e.seen {
		if p.otherState(r) {
			out.OtherState++
		}
	}
	cr.Envelope = out
	if e.stops != nil {
		s := e.stops
		lab := (&CaseResult{Yaw: s.Yaw, Pitch: s.Pitch, Roll: s.Roll, Accel: s.Accel}).PointLabel()
		cr.Findings = append(cr.Findings, p.finding(RuleNoCirculation, "error", cr.Case, "", 0, 0, "", "",
			"circulation stops within the envelope of case %s, at %s%s", cr.Case, lab, reasonText(s.Reason)))
	}
}

func reasonText(r string) string {
	if r == "" {
		return ""
	}
	return ": " + r
}

// tiltStops records a tilt limit of the case's own attitude that lies
// inside the envelope's pitch or roll bounds (other axes at the case's
// own values).
func (e *envelopeSearch) tiltStops(tl *TiltLimits) {
	if tl == nil {
		return
	}
	for _, a := range e.axes {
		var lims []*float64
		switch a.Name {
		case "pitch":
			lims = []*float64{tl.PitchUp, tl.PitchDown}
		case "roll":
			lims = []*float64{tl.RollLeft, tl.RollRight}
		default:
			continue
		}
		for _, v := range lims {
			if v != nil && *v >= a.Lo && *v <= a.Hi && e.stops == nil {
				pt := e.base
				if a.Name == "pitch" {
					pt.pitch = *v
				} else {
					pt.roll = *v
				}
				e.stops = &EnvelopePoint{Yaw: pt.yaw, Pitch: pt.pitch, Roll: pt.roll, Accel: [3]float64(pt.accel),
					Reason: fmt.Sprintf("the tilt limit of the case's own attitude (%s)", tl.describe())}
			}
		}
	}
}

// line maximises key's use along axis i from x (changed in place to the
// best point found), given its use u at x; it returns the best use.
func (e *envelopeSearch) line(key string, x []float64, i int, u float64) float64 {
	a := e.axes[i]
	if a.Hi <= a.Lo {
		return u
	}
	const samples = 5
	y := append([]float64(nil), x...)
	f := func(v float64) float64 { y[i] = v; return e.use(key, y) }
	xs := make([]float64, samples)
	us := make([]float64, samples)
	bi := -1
	for k := range xs {
		xs[k] = a.Lo + (a.Hi-a.Lo)*float64(k)/(samples-1)
		us[k] = f(xs[k])
		if bi < 0 || us[k] > us[bi] {
			bi = k
		}
	}
	bx, bu := xs[bi], us[bi]
	if bi > 0 && bi < samples-1 && !math.IsInf(bu, -1) {
		// Golden-section search on the bracket around the best sample.
		const g = 0.6180339887498949
		lo, hi := xs[bi-1], xs[bi+1]
		c, d := hi-g*(hi-lo), lo+g*(hi-lo)
		fc, fd := f(c), f(d)
		for hi-lo > envelopeTol*(a.Hi-a.Lo) {
			if fc > fd {
				hi, d, fd = d, c, fc
				c = hi - g*(hi-lo)
				fc = f(c)
			} else {
				lo, c, fc = c, d, fd
				d = lo + g*(hi-lo)
				fd = f(d)
			}
		}
		if fc > bu {
			bx, bu = c, fc
		}
		if fd > bu {
			bx, bu = d, fd
		}
	}
	if bu > u {
		x[i] = bx
		return bu
	}
	return u
}

// uniform reports whether margin key has use u at every circulating
// combination solved.
func (e *envelopeSearch) uniform(key string, u float64) bool {
	for _, cr := range e.seen {
		if !cr.Circulates {
			continue
		}
		for _, m := range cr.Margins {
			if m.Margin+"/"+m.Component == key && math.Abs(m.Use-u) > 1e-9*math.Max(1, math.Abs(u)) {
				return false
			}
		}
	}
	return true
}

// otherState reports whether a sweep, profile or envelope point, estimated
// in its case's saturation state under saturation_state auto, would take
// the other state by its own liquid column.
func (p *prepared) otherState(r *CaseResult) bool {
	return p.methods.Saturation == "auto" && r.SatState != "" && r.AutoState() != r.SatState
}
