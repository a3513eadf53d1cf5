package guide

import (
	"fmt"
	"math"
	"strings"

	"circa/check/flow"
	"circa/lang"
)

// margins maps each margin of an estimate, where it is evaluated, to its use.
type margins map[Where]float64

// summarize turns an estimate at value x into a sample: the largest use of
// the margins that count (keep; nil: all) and where it is, or why the
// estimate is not usable there; and every margin's use.
func summarize(res *flow.Result, x float64, keep func(Where) bool) (Sample, margins) {
	s := Sample{X: x}
	ms := margins{}
	first := true
	note := func(w Where, use float64) {
		if old, ok := ms[w]; ok && old >= use {
			return
		}
		ms[w] = use
		if keep != nil && !keep(w) {
			return
		}
		if first || use > s.Use {
			s.Use, s.Limit, first = use, w, false
		}
	}
	stop := func(st *Stop) {
		if st != nil && s.Stop == nil {
			s.Stop = st
		}
	}
	for _, l := range res.Loops {
		if w, use, ok := chargeWindow(&l); ok {
			note(w, use)
		}
		for _, f := range l.Findings {
			if f.Severity == "error" {
				stop(&Stop{Kind: StopError, Message: f.Message})
			}
		}
		for ci := range l.Cases {
			c := &l.Cases[ci]
			if c.Grid {
				continue
			}
			stop(caseStop(c))
			cs, point := caseOf(c.Case)
			for _, m := range c.Margins {
				note(Where{Loop: l.Loop, Margin: m.Margin, Case: cs, Component: m.Component, Point: point}, m.Use)
			}
			if e := c.Envelope; e != nil {
				for _, w := range e.Worst {
					note(Where{Loop: l.Loop, Margin: w.Margin.Margin, Case: cs, Component: w.Component, Point: PointEnvelope}, w.Use)
				}
				if e.Stops != nil {
					stop(&Stop{Kind: StopNoCirculation, Case: c.Case,
						Message: fmt.Sprintf("no circulation within the envelope of case %s: %s", c.Case, e.Stops.Reason)})
				}
			}
			if p := c.Profile; p != nil {
				for _, m := range p.Worst {
					note(Where{Loop: l.Loop, Margin: m.Margin, Case: cs, Component: m.Component, Point: PointProfile}, m.Use)
				}
				for _, in := range p.Instants {
					if !in.Circulates {
						stop(&Stop{Kind: StopNoCirculation, Case: c.Case,
							Message: fmt.Sprintf("no circulation at t = %g s of the profile of case %s: %s", in.Time, c.Case, in.Reason)})
					}
				}
			}
		}
	}
	return s, ms
}

// MarginChargeWindow is the guidance's own margin for a loop's charge
// re-set to suit: whether some charge suits every case. Its use is
// 1 + (largest low end − smallest high end)/charge, at most 1 while the
// cases' charge ranges overlap.
const MarginChargeWindow = "charge_window"

// chargeWindow is a loop's charge window margin, when its cases give charge
// ranges.
func chargeWindow(l *flow.LoopResult) (Where, float64, bool) {
	var lo, hi, ch float64
	have := false
	for ci := range l.Cases {
		c := &l.Cases[ci]
		r := c.ChargeRange
		if c.Grid || r == nil {
			continue
		}
		if !have {
			lo, hi, ch, have = r.Low, r.High, r.Charge, true
			continue
		}
		lo, hi = math.Max(lo, r.Low), math.Min(hi, r.High)
	}
	if !have || !(ch > 0) {
		return Where{}, 0, false
	}
	return Where{Loop: l.Loop, Margin: MarginChargeWindow}, 1 + (lo-hi)/ch, true
}

// caseStop says why a case's estimate is not usable, or returns nil: it
// does not circulate (under heat), it has several balances, or it carries
// an error that is no margin's.
func caseStop(c *flow.CaseResult) *Stop {
	if !c.Circulates && c.Heat > 0 {
		return &Stop{Kind: StopNoCirculation, Case: c.Case, Message: fmt.Sprintf("no circulation in case %s: %s", c.Case, c.Reason)}
	}
	if len(c.Roots) > 1 {
		var flows []string
		for _, r := range c.Roots {
			kind := "stable"
			if !r.Stable {
				kind = "unstable"
			}
			flows = append(flows, fmt.Sprintf("%.3g g/s %s", r.MassFlow*1e3, kind))
		}
		return &Stop{Kind: StopSeveralBalances, Case: c.Case,
			Message: fmt.Sprintf("the momentum balance has %d roots in case %s (%s)", len(c.Roots), c.Case, strings.Join(flows, ", "))}
	}
	for _, f := range c.Findings {
		if f.Severity == "error" && !strings.HasPrefix(f.Rule, "margin-") {
			return &Stop{Kind: StopError, Case: c.Case, Message: f.Message}
		}
	}
	return nil
}

// invalid is the stop for a value that makes the file invalid.
func invalid(m *lang.Model, err error) *Stop {
	if err != nil {
		return &Stop{Kind: StopInvalid, Message: "the file is invalid at this value: " + err.Error()}
	}
	for _, d := range m.Diags {
		if d.Severity == lang.Error {
			return &Stop{Kind: StopInvalid, Message: "the file is invalid at this value: " + d.Message()}
		}
	}
	return nil
}

// marginWords names each margin in words.
var marginWords = map[string]string{
	flow.MarginExitQuality: "exit quality",
	flow.MarginCHF:         "critical heat flux ratio",
	flow.MarginFlooding:    "flooding",
	flow.MarginWall:        "wall temperature",
	flow.MarginJunction:    "junction temperature",
	flow.MarginPressure:    "design pressure",
	flow.MarginCondenser:   "condenser capacity",
	flow.MarginCharge:      "charge",
	flow.MarginHead:        "loss reserve",
	flow.MarginTilt:        "tilt margin",
	MarginChargeWindow:     "the charge range every case accepts",
}

// Describe says where a margin is, in words: "exit quality at cold_plate in
// case desert_peak".
func (w Where) Describe() string {
	s := marginWords[w.Margin]
	if s == "" {
		s = strings.ReplaceAll(w.Margin, "_", " ")
	}
	if w.Component != "" {
		s += " at " + w.Component
	}
	if w.Case != "" && w.Case != flow.NoCase {
		s += " in case " + w.Case
	}
	switch w.Point {
	case PointEnvelope:
		s += " (its envelope's worst)"
	case PointProfile:
		s += " (its profile's worst instant)"
	}
	return s
}
