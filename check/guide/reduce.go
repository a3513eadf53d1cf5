package guide

import (
	"strings"

	"circa/check/flow"
	"circa/lang"
)

// A case with a profile (a manoeuvre against time) or an envelope (bounds
// searched for the worst attitude and acceleration) costs many steady
// states per estimate. The searches hold such a case at the attitudes and
// accelerations where its margins were worst instead: each becomes a plain
// case. The worst of a margin over the instants or the envelope moves with
// a parameter as the margin at its worst point does (the envelope theorem),
// so the reduced model gives the same sensitivities and, where the worst
// points stay put, the same ranges; every range's ends are then checked
// with the full estimate, and the points it finds worst there are added.

// Points of a case as the guidance names them.
const (
	PointProfile  = "profile"  // the worst instant of the case's profile
	PointEnvelope = "envelope" // the worst combination within its envelope
)

// attitude is one attitude and acceleration.
type attitude struct {
	yaw, pitch, roll float64
	accel            [3]float64
}

// fixed holds, for each case with a profile or an envelope, the points at
// which the reduced model holds it. It is not changed once built: adding
// points makes a new one.
type fixed map[string][]attitude

// with returns f with the worst points of res added.
func (f fixed) with(res *flow.Result) fixed {
	out := fixed{}
	for k, v := range f {
		out[k] = append([]attitude(nil), v...)
	}
	add := func(cs string, a attitude) {
		for _, b := range out[cs] {
			if b == a {
				return
			}
		}
		out[cs] = append(out[cs], a)
	}
	for _, l := range res.Loops {
		for ci := range l.Cases {
			c := &l.Cases[ci]
			if c.Grid {
				continue
			}
			if e := c.Envelope; e != nil {
				for _, w := range e.Worst {
					add(c.Case, attitude{w.At.Yaw, w.At.Pitch, w.At.Roll, w.At.Accel})
				}
				if s := e.Stops; s != nil {
					add(c.Case, attitude{s.Yaw, s.Pitch, s.Roll, s.Accel})
				}
			}
			if p := c.Profile; p != nil {
				for _, w := range p.Worst {
					for _, in := range p.Instants {
						if w.Time != nil && in.Time == *w.Time {
							add(c.Case, attitude{in.Yaw, in.Pitch, in.Roll, in.Accel})
						}
					}
				}
				for _, in := range p.Instants {
					if !in.Circulates {
						add(c.Case, attitude{in.Yaw, in.Pitch, in.Roll, in.Accel})
					}
				}
			}
		}
	}
	return out
}

// needed reports whether m has a case with a profile or an envelope.
func needed(m *lang.Model) bool {
	for _, c := range m.Cases {
		if c.Profile != nil || c.Envelope != nil {
			return true
		}
	}
	return false
}

// apply turns v, a model of its own, into the reduced model: every case
// with a profile or an envelope is held at its own attitude and at each of
// its points, each a plain case named "CASE (profile)" or
// "CASE (envelope)". only, when not empty, keeps that case alone (with its
// points).
func (f fixed) apply(v *lang.Model, only string) {
	cases := make([]*lang.Case, 0, len(v.Cases))
	for _, c := range v.Cases {
		if only != "" && c.Name != only {
			continue
		}
		if c.Profile == nil && c.Envelope == nil {
			cases = append(cases, c)
			continue
		}
		point := PointEnvelope
		if c.Envelope == nil {
			point = PointProfile
		}
		own := *c
		own.Profile, own.Envelope = nil, nil
		cases = append(cases, &own)
		if v.Nominal == c {
			v.Nominal = &own
		}
		for _, a := range f[c.Name] {
			fc := own
			fc.Nominal = false
			fc.Name = c.Name + " (" + point + ")"
			fc.Yaw = lang.Value{SI: a.yaw, Set: true}
			fc.Pitch = lang.Value{SI: a.pitch, Set: true}
			fc.Roll = lang.Value{SI: a.roll, Set: true}
			fc.Accel = lang.Vec{X: a.accel[0], Y: a.accel[1], Z: a.accel[2], Set: true}
			cases = append(cases, &fc)
		}
	}
	v.Cases = cases
}

// caseOf splits a case name of the reduced model into the case and its
// point ("" for the case's own attitude).
func caseOf(name string) (cs, point string) {
	if c, p, ok := strings.Cut(name, " ("); ok && strings.HasSuffix(p, ")") {
		return c, strings.TrimSuffix(p, ")")
	}
	return name, ""
}
