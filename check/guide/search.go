package guide

import (
	"context"
	"math"

	"circa/check/rootfind"
)

// Sample is what the estimate says at one value of a parameter.
type Sample struct {
	X float64
	// Use is the largest fraction of its limit any margin uses in any case:
	// every margin holds while it is at most 1.
	Use float64
	// Limit is the margin that uses the most.
	Limit Where
	// Stop is set where the estimate gives no usable answer at X (no
	// circulation, several balances, a file the value makes invalid).
	Stop *Stop
}

// Feasible reports whether every margin holds in every case at s.X.
func (s Sample) Feasible() bool { return s.Stop == nil && s.Use <= 1 }

// Where names a margin and where it is evaluated.
type Where struct {
	Loop      string `json:"loop,omitempty"`
	Margin    string `json:"margin,omitempty"`
	Case      string `json:"case,omitempty"`
	Component string `json:"component,omitempty"`
	// Point is PointProfile or PointEnvelope for the worst of a case's
	// profile or envelope, "" for the case's own attitude.
	Point string `json:"point,omitempty"`
}

// Stop says why the estimate gives no usable answer at a value.
type Stop struct {
	Kind    string // StopNoCirculation, StopSeveralBalances, StopInvalid, StopError
	Case    string
	Message string
}

// Kinds of Stop.
const (
	StopNoCirculation   = "no-circulation"
	StopSeveralBalances = "several-balances"
	StopInvalid         = "invalid"
	StopError           = "estimate-error"
	// StopNoCharge: in a fluid ranking, no charge suits every case.
	StopNoCharge = "no-charge"
)

// axis maps a search coordinate u to a parameter value: geometric about a
// nonzero value x0 (x = x0·e^u keeps the value's sign), linear with a
// scale about zero. Increasing u moves away from x0 on the side dir.
type axis struct {
	x0, scale float64
}

// at returns the value at coordinate u on side dir (+1 larger values, −1
// smaller).
func (a axis) at(u float64, dir int) float64 {
	if a.x0 == 0 {
		return float64(dir) * a.scale * u
	}
	// Larger values of a positive x0 are x0·e^u; of a negative x0, x0·e^−u.
	s := float64(dir)
	if a.x0 < 0 {
		s = -s
	}
	return a.x0 * math.Exp(s*u)
}

// coord is the search coordinate of the value x, on whichever side of x0
// it lies (x of x0's sign when x0 is nonzero).
func (a axis) coord(x float64) float64 {
	if a.x0 == 0 {
		return math.Abs(x) / a.scale
	}
	return math.Abs(math.Log(x / a.x0))
}

// steps are the search coordinates tried outward from the current value: a
// value grows by 10 %, 25 %, 60 %, then by about 25 % a step (ten a decade)
// up to tenfold, then a hundredfold (or shrinks as much; about zero, moves
// by 0.1 to 100 of its unit); the geometric growth brackets a limit in a
// few evaluations and the root-finding closes it. A region where the
// estimate stops being usable that lies wholly between two steps is not
// seen: ten a decade is where that cost balances.
var steps = func() []float64 {
	factors := []float64{1.1, 1.25, 1.6, 2, 2.5, 3.2, 4, 5, 6.3, 8, 10, 100}
	u := make([]float64, len(factors))
	for i, f := range factors {
		u[i] = math.Log(f)
	}
	return u
}()

var zeroSteps = []float64{0.1, 0.2, 0.3, 0.5, 1, 2, 3, 5, 10, 100}

func (a axis) steps() []float64 {
	if a.x0 == 0 {
		return zeroSteps
	}
	return steps
}

// tol is the width, in search coordinates, to which a limit is closed:
// 0.1 % on a geometric axis (a range is printed to three digits), a
// thousandth of the unit about zero.
func (a axis) tol() float64 { return 1e-3 }

// Bound is one end of a feasible range.
type Bound struct {
	// Value is the last value at which every margin holds (SI), or for an
	// unbounded side the farthest value searched.
	Value float64 `json:"value"`
	// Unbounded is true when no limit was met up to Value.
	Unbounded bool `json:"unbounded,omitempty"`
	// Limit is the margin that reaches its limit past Value.
	Limit Where `json:"limit"`
	// Stop is why the range ends when it is not a margin: "no-circulation",
	// "several-balances", "invalid" or "estimate-error".
	Stop string `json:"stop,omitempty"`
	// Reason says in words why the range ends.
	Reason string `json:"reason,omitempty"`
	// Note says where the range is searched with a case in another
	// saturation state than its own liquid column would choose at this
	// value (saturation_state auto), and what the value gives in its own.
	Note string `json:"saturation_note,omitempty"`
	// Switch is, with a Note, about where between the value as written
	// and this end the first case's own column would switch its state
	// (SI; 0 when not located): the range past it is the pinned state's.
	Switch float64 `json:"saturation_switch,omitempty"`
	// Own is true when the range beyond Switch was searched in the
	// variants' own saturation states: the pinned state's end there failed
	// a margin in its own, so this end, its limit and case are the own
	// state's (at Switch itself when the own state fails just past it).
	Own bool `json:"saturation_own,omitempty"`
}

// eval is the function searched: a sample of the estimate at a value.
type eval func(x float64) Sample

// side searches from the feasible sample s0 outward on side dir and returns
// the bound there. A guess (> 0) is where the margins' slopes foretell the
// first limit on this side: the search tries just past it first, so that
// the bracket is tight, then steps on beyond it.
func side(ctx context.Context, f eval, ax axis, dir int, s0 Sample, guess float64) (Bound, bool) {
	us := ax.steps()
	if guess > 0 && guess < us[len(us)-1] {
		first := guess * guessPast
		rest := []float64{first}
		for _, u := range us {
			if u > first {
				rest = append(rest, u)
			}
		}
		us = rest
	}
	return outward(ctx, f, ax, dir, s0, 0, us)
}

// guessPast is how far past a foretold limit the first step goes: a margin
// whose use curves up meets its limit a little before the straight line
// does, one whose use flattens a little after.
const guessPast = 1.05

// seek looks outward from an infeasible current value on side dir for the
// nearest feasible value. It returns the limit between them (the range's
// inner end) and the feasible sample found with its coordinate; without
// one, the usable sample of least use met (best). A side along which the
// limiting margin's use has grown three steps running, beyond the first
// doubling of the value, is given up: the design only gets worse that way.
func seek(ctx context.Context, f eval, ax axis, dir int, s0 Sample) (inner Bound, seed Sample, seedU float64, found bool, best Sample) {
	out, outU := s0, 0.0
	best = s0
	worse := 0
	for _, u := range ax.steps() {
		if ctx.Err() != nil {
			return Bound{}, Sample{}, 0, false, best
		}
		s := f(ax.at(u, dir))
		if s.Feasible() {
			lo, hi, ok := refine(ctx, f, ax, dir, u, outU, s, out)
			if !ok {
				return Bound{}, Sample{}, 0, false, best
			}
			return boundOf(lo, hi), s, u, true, best
		}
		if s.Stop == nil && (best.Stop != nil || s.Use < best.Use) {
			best = s
		}
		if s.Stop == nil && out.Stop == nil && s.Use > out.Use {
			worse++
		} else {
			worse = 0
		}
		out, outU = s, u
		if worse >= 3 && u > math.Log(2) {
			break
		}
	}
	return Bound{}, Sample{}, 0, false, best
}

// sideFrom continues outward past a feasible seed at coordinate u0.
func sideFrom(ctx context.Context, f eval, ax axis, dir int, seed Sample, u0 float64) (Bound, bool) {
	return outward(ctx, f, ax, dir, seed, u0, ax.steps())
}

// outward steps from the feasible sample in at coordinate inU through the
// coordinates us beyond it, on side dir, to the first infeasible sample,
// and returns the bound between them; unbounded at the last step when every
// one is feasible.
func outward(ctx context.Context, f eval, ax axis, dir int, in Sample, inU float64, us []float64) (Bound, bool) {
	u0 := inU
	for _, u := range us {
		if u <= u0 {
			continue
		}
		if ctx.Err() != nil {
			return Bound{}, false
		}
		s := f(ax.at(u, dir))
		if !s.Feasible() {
			lo, hi, ok := refine(ctx, f, ax, dir, inU, u, in, s)
			if !ok {
				return Bound{}, false
			}
			return boundOf(lo, hi), true
		}
		in, inU = s, u
	}
	return Bound{Value: in.X, Unbounded: true}, true
}

// boundOf is the bound between the feasible sample in and the infeasible
// sample out next to it.
func boundOf(in, out Sample) Bound {
	b := Bound{Value: in.X}
	if out.Stop != nil {
		b.Stop = out.Stop.Kind
		b.Reason = out.Stop.Message
		b.Limit = Where{Case: out.Stop.Case}
		return b
	}
	b.Limit = out.Limit
	b.Reason = out.Limit.Describe() + " reaches its limit"
	if out.Limit.Margin == MarginChargeWindow {
		b.Reason = "no charge suits every case"
	}
	return b
}

// gap is a margin's distance from its limit as the root-finding sees it:
// negative while it holds. Uses beyond a millionfold are clipped so that
// interpolation stays meaningful.
func gap(s Sample) float64 { return math.Min(s.Use, 1e6) - 1 }

// refine closes the bracket between the feasible sample in (coordinate ui)
// and the infeasible sample out (coordinate uo) to the axis tolerance. Where
// the infeasible end is a stop (no usable estimate) it bisects; between two
// usable estimates it follows the limiting margin's use by Brent's method
// (Brent 1973, Algorithms for Minimization without Derivatives, ch. 4). A
// stop met inside a Brent bracket becomes its new infeasible end. It returns
// the closest feasible and infeasible samples.
func refine(ctx context.Context, f eval, ax axis, dir int, ui, uo float64, in, out Sample) (Sample, Sample, bool) {
	tol := ax.tol()
	for iter := 0; iter < 200 && math.Abs(uo-ui) > tol; iter++ {
		if ctx.Err() != nil {
			return in, out, false
		}
		if out.Stop != nil {
			um := 0.5 * (ui + uo)
			s := f(ax.at(um, dir))
			if s.Feasible() {
				in, ui = s, um
			} else {
				out, uo = s, um
			}
			continue
		}
		var ok bool
		in, out, ui, uo, ok = brent(ctx, f, ax, dir, ui, uo, in, out, tol)
		if !ok {
			return in, out, false
		}
	}
	return in, out, true
}

// brent runs Brent's method on the gap between a feasible and an infeasible
// usable sample until the bracket is within tol, returning the bracket. It
// returns early, with the bracket so far, when it meets a stop.
func brent(ctx context.Context, f eval, ax axis, dir int, ui, uo float64, in, out Sample, tol float64) (Sample, Sample, float64, float64, bool) {
	g := func(u float64) (float64, Sample, bool) {
		s := f(ax.at(u, dir))
		if s.Stop != nil {
			return 0, s, false
		}
		return gap(s), s, true
	}
	a := rootfind.Point[Sample]{X: ui, F: gap(in), State: in}
	b := rootfind.Point[Sample]{X: uo, F: gap(out), State: out}
	r := rootfind.Brent(g, a, b, rootfind.Options{Tol: tol, WidthOnly: true, Cancelled: func() bool { return ctx.Err() != nil }})
	if r.Unusable {
		// A stop between the ends: the bracket's feasible end and this
		// point continue by bisection.
		held := r.Root
		if r.Other.State.Feasible() {
			held = r.Other
		}
		return held.State, r.At.State, held.X, r.At.X, true
	}
	lo, hi := r.Root, r.Other
	if !lo.State.Feasible() {
		lo, hi = hi, lo
	}
	return lo.State, hi.State, lo.X, hi.X, !r.Cancelled
}
