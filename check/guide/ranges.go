package guide

import (
	"context"
	"sync"
)

// Range is the feasible range of one value: the values over which every
// margin holds in every case, everything else as written.
type Range struct {
	// Feasible is false when no value searched keeps every margin.
	Feasible bool `json:"feasible"`
	// Contains is true when the current value is inside the range.
	Contains bool `json:"contains"`
	// Low and High are the range's ends (when Feasible).
	Low  *Bound `json:"low,omitempty"`
	High *Bound `json:"high,omitempty"`
	// Use and Limit are the largest margin use at the current value and
	// where it is; Stop says why the current value has no usable estimate.
	Use   float64 `json:"use"`
	Limit Where   `json:"limit"`
	Stop  string  `json:"stop,omitempty"`
	// Reason explains an infeasible range or a current value without a
	// usable estimate.
	Reason string `json:"reason,omitempty"`
	// Best is, for an infeasible range, the value searched whose largest
	// margin use is least, with that margin (Limit) and its use (Use).
	Best *Nearest `json:"best,omitempty"`
}

// Nearest is the value that comes closest to keeping every margin.
type Nearest struct {
	Value float64 `json:"value"`
	Use   float64 `json:"use"`
	Limit Where   `json:"limit"`
}

// findRange searches the feasible range of f about the current sample s0
// on axis ax: outward on both sides at once from a feasible current value;
// from an infeasible one, outward on both sides for the nearest feasible
// value, then on from it. It returns false when ctx was cancelled.
func findRange(ctx context.Context, f eval, ax axis, s0 Sample, guess func(dir int) float64) (Range, bool) {
	if guess == nil {
		guess = func(int) float64 { return 0 }
	}
	r := Range{Use: s0.Use, Limit: s0.Limit}
	if s0.Stop != nil {
		r.Stop, r.Reason, r.Limit = s0.Stop.Kind, s0.Stop.Message, Where{Case: s0.Stop.Case}
	}
	if s0.Feasible() {
		var lo, hi Bound
		var okLo, okHi bool
		var wg sync.WaitGroup
		wg.Add(1)
		go func() {
			defer wg.Done()
			lo, okLo = side(ctx, f, ax, -1, s0, guess(-1))
		}()
		hi, okHi = side(ctx, f, ax, +1, s0, guess(+1))
		wg.Wait()
		if !okLo || !okHi {
			return r, false
		}
		r.Feasible, r.Contains = true, true
		r.Low, r.High = &lo, &hi
		return r, true
	}
	type found struct {
		inner Bound
		seed  Sample
		u     float64
		ok    bool
		best  Sample
	}
	var down, up found
	var wg sync.WaitGroup
	wg.Add(1)
	go func() {
		defer wg.Done()
		down.inner, down.seed, down.u, down.ok, down.best = seek(ctx, f, ax, -1, s0)
	}()
	up.inner, up.seed, up.u, up.ok, up.best = seek(ctx, f, ax, +1, s0)
	wg.Wait()
	if ctx.Err() != nil {
		return r, false
	}
	dir, pick := +1, up
	if down.ok && (!up.ok || down.u < up.u) {
		dir, pick = -1, down
	}
	if !pick.ok {
		if r.Reason == "" {
			r.Reason = "no value searched keeps every margin"
		}
		best := up.best
		if down.best.Stop == nil && (best.Stop != nil || down.best.Use < best.Use) {
			best = down.best
		}
		if best.Stop == nil {
			r.Best = &Nearest{Value: best.X, Use: best.Use, Limit: best.Limit}
		}
		return r, true
	}
	outer, ok := sideFrom(ctx, f, ax, dir, pick.seed, pick.u)
	if !ok {
		return r, false
	}
	r.Feasible = true
	inner := pick.inner
	if dir > 0 {
		r.Low, r.High = &inner, &outer
	} else {
		r.Low, r.High = &outer, &inner
	}
	return r, true
}
