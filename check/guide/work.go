package guide

import (
	"fmt"

	"circa/check/flow"
	"circa/lang"
)

// The guidance's cost is counted in steady states, the unit of an
// estimate's work: each case's own, each distinct instant of its profile,
// each point of its envelope's search, and the tilt search of each case
// estimated with it. A parameter's search costs about searchEstimates
// estimates of the reduced design (its profile and envelope cases held at
// their worst points, the tilt search left out), two of them with the tilt
// search for the sensitivities, and the two ends of its range in full.
const (
	// MaxStates bounds the steady states of the guidance's searches: at
	// about 0.1 ms a steady state, some ten seconds of one core's work,
	// the most the command line waits for; the editor guides in the
	// background only what fits its own budget of about 2 s.
	MaxStates = 100_000
	// searchEstimates is how many reduced estimates a range search takes
	// (a few dozen at most; fewer where the margins' slopes foretell the
	// ends).
	searchEstimates = 20
	// tiltStates is what the tilt search of one case costs: four
	// directions of up to 18 steps of 10°, each end closed by a few more.
	tiltStates = 100
)

// work is what one estimate costs, in steady states.
type work struct {
	full    int // the design as written
	reduced int // with the profile and envelope cases held at their points
	tilt    int // the tilt searches of either
}

// workOf counts the steady states of the estimate res (the design as
// written, with or without the tilt search) and of its reduced design,
// whose cases with a profile or an envelope are held at pts.
func workOf(res *flow.Result, pts fixed, tilt bool) work {
	var w work
	if res == nil {
		return w
	}
	for _, l := range res.Loops {
		for i := range l.Cases {
			c := &l.Cases[i]
			if c.Grid {
				continue
			}
			w.full++
			w.reduced++
			if tilt {
				w.tilt += tiltStates
			}
			held := false
			if p := c.Profile; p != nil {
				w.full += distinctInstants(p)
				held = true
			}
			if e := c.Envelope; e != nil {
				w.full += e.Estimates
				held = true
			}
			if held {
				w.reduced += len(pts[c.Case])
			}
		}
	}
	return w
}

// distinctInstants counts the body forces of a profile: the estimate
// solves each once.
func distinctInstants(p *flow.Profile) int {
	seen := map[[3]float64]bool{}
	for _, in := range p.Instants {
		seen[in.BodyForce] = true
	}
	return len(seen)
}

// perParam is the steady states one parameter's search costs.
func (w work) perParam() int {
	return searchEstimates*w.reduced + 2*(w.reduced+w.tilt) + 2*(w.full+w.tilt)
}

// tooCostly says why searching n parameters of m, each estimate costing w,
// would exceed MaxStates ("" when it would not).
func tooCostly(m *lang.Model, n int, w work) string {
	per := w.perParam()
	if n == 0 || per <= 0 || n*per <= MaxStates {
		return ""
	}
	return fmt.Sprintf("guidance skipped: searching the %s parameters that reach the estimate would take about %s steady states "+
		"(each estimate solves %s: %d cases with their profiles' instants and envelopes' points%s); the limit is %s — use --set or --vary to study a few",
		thousands(n), thousands(n*per), thousands(w.full+w.tilt), caseCount(m), tiltNote(w), thousands(MaxStates))
}

func caseCount(m *lang.Model) int { return max(len(m.Cases), 1) }

func tiltNote(w work) string {
	if w.tilt == 0 {
		return ""
	}
	return ", and the tilt searches"
}
