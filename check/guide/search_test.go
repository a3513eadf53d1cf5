package guide

import (
	"context"
	"math"
	"sync/atomic"
	"testing"
)

type counter struct{ atomic.Int64 }

// synthetic is an estimate of margin use u(x), with a stop where stop says
// so; n counts the evaluations.
func synthetic(u func(x float64) float64, stop func(x float64) bool, n *counter) eval {
	return func(x float64) Sample {
		n.Add(1)
		if stop != nil && stop(x) {
			return Sample{X: x, Stop: &Stop{Kind: StopNoCirculation, Case: "c", Message: "no circulation in case c"}}
		}
		return Sample{X: x, Use: u(x), Limit: Where{Margin: "exit_quality", Case: "c"}}
	}
}

func TestRangeBothSides(t *testing.T) {
	// use = (x − 3)² / 4: feasible on [1, 5].
	var n counter
	f := synthetic(func(x float64) float64 { return (x - 3) * (x - 3) / 4 }, nil, &n)
	r, ok := findRange(context.Background(), f, axis{x0: 2.5}, f(2.5), nil)
	if !ok || !r.Feasible || !r.Contains {
		t.Fatalf("%+v", r)
	}
	if math.Abs(r.Low.Value-1) > 2e-3 || math.Abs(r.High.Value-5) > 5e-3 || r.Low.Value < 1-1e-12 || r.High.Value > 5 {
		t.Errorf("range %g–%g, want 1–5 from inside", r.Low.Value, r.High.Value)
	}
	if r.Low.Unbounded || r.High.Unbounded || r.High.Limit.Margin != "exit_quality" || r.High.Reason == "" {
		t.Errorf("bounds %+v %+v", r.Low, r.High)
	}
	// Bracketing and Brent's method close each end in a few evaluations
	// (a fine scan to 0.1 % would take hundreds).
	if n.Load() > 40 {
		t.Errorf("%d evaluations", n.Load())
	}
}

func TestRangeUnbounded(t *testing.T) {
	var n counter
	f := synthetic(func(x float64) float64 { return 0.5 * x }, nil, &n)
	r, _ := findRange(context.Background(), f, axis{x0: 1}, f(1), nil)
	if !r.Low.Unbounded || r.High.Unbounded {
		t.Fatalf("low %+v high %+v", r.Low, r.High)
	}
	if math.Abs(r.High.Value-2) > 2*1e-3 {
		t.Errorf("high %g, want 2", r.High.Value)
	}
	if r.Low.Value > 0.011 {
		t.Errorf("unbounded below, searched to %g: want a hundredth of the value", r.Low.Value)
	}
}

func TestRangeEndsAtStop(t *testing.T) {
	// Feasible everywhere by its margins, but the loop stops circulating
	// above 1.7: the range ends there and says why.
	var n counter
	f := synthetic(func(x float64) float64 { return 0.1 }, func(x float64) bool { return x > 1.7 }, &n)
	r, _ := findRange(context.Background(), f, axis{x0: 1}, f(1), nil)
	if r.High.Stop != StopNoCirculation || r.High.Reason == "" || r.High.Limit.Case != "c" {
		t.Fatalf("high %+v", r.High)
	}
	if r.High.Value > 1.7 || r.High.Value < 1.7*(1-1.5e-3) {
		t.Errorf("high %g, want just below 1.7", r.High.Value)
	}
}

func TestRangeStopInsideMarginBracket(t *testing.T) {
	// The margin would reach its limit at 3, but circulation stops at 2.8,
	// inside the bracket 2.5–3.2 of the steps, both of whose ends are
	// usable.
	var n counter
	f := synthetic(func(x float64) float64 { return x / 3 }, func(x float64) bool { return x > 2.8 && x < 3.1 }, &n)
	r, _ := findRange(context.Background(), f, axis{x0: 2}, f(2), nil)
	if r.High.Stop != StopNoCirculation || math.Abs(r.High.Value-2.8) > 2.8*1.5e-3 {
		t.Fatalf("high %+v, want the stop at 2.8", r.High)
	}
}

func TestRangeOutsideCurrent(t *testing.T) {
	// The value as written (10) is infeasible; the feasible range is 2–4
	// below it.
	var n counter
	f := synthetic(func(x float64) float64 { return 1 + (x-3)*(x-3) - 1.0 }, nil, &n)
	r, _ := findRange(context.Background(), f, axis{x0: 10}, f(10), nil)
	if !r.Feasible || r.Contains {
		t.Fatalf("%+v", r)
	}
	if math.Abs(r.Low.Value-2) > 4e-3 || math.Abs(r.High.Value-4) > 8e-3 {
		t.Errorf("range %g–%g, want 2–4", r.Low.Value, r.High.Value)
	}
}

func TestRangeInfeasible(t *testing.T) {
	// Never below 1.2, least at x = 5.
	var n counter
	f := synthetic(func(x float64) float64 { return 1.2 + math.Abs(math.Log(x/5)) }, nil, &n)
	r, _ := findRange(context.Background(), f, axis{x0: 1}, f(1), nil)
	if r.Feasible || r.Low != nil || r.High != nil || r.Reason == "" {
		t.Fatalf("%+v", r)
	}
	if r.Best == nil || math.Abs(r.Best.Value-5) > 1e-9 || r.Best.Use > 1.21 {
		t.Errorf("best %+v, want the step at 5", r.Best)
	}
	// A side that only gets worse is given up after three steps.
	if n.Load() > int64(2*len(steps)) {
		t.Errorf("%d evaluations", n.Load())
	}
}

func TestRangeAboutZero(t *testing.T) {
	// A value of zero moves by its unit's scale: feasible on (−0.4, 0.25).
	var n counter
	f := synthetic(func(x float64) float64 {
		if x > 0 {
			return x / 0.25
		}
		return -x / 0.4
	}, nil, &n)
	r, _ := findRange(context.Background(), f, axis{x0: 0, scale: 0.1}, f(0), nil)
	if math.Abs(r.High.Value-0.25) > 2e-4 || math.Abs(r.Low.Value+0.4) > 2e-4 {
		t.Errorf("range %g–%g, want −0.4–0.25", r.Low.Value, r.High.Value)
	}
}

func TestRangeNegativeValue(t *testing.T) {
	// A negative value keeps its sign: use = −x/2 on x < 0 holds for x ≥ −2.
	var n counter
	f := synthetic(func(x float64) float64 { return -x / 2 }, nil, &n)
	r, _ := findRange(context.Background(), f, axis{x0: -1}, f(-1), nil)
	if math.Abs(r.Low.Value+2) > 4e-3 || !r.High.Unbounded || r.High.Value >= 0 {
		t.Errorf("range %+v – %+v", r.Low, r.High)
	}
}

func TestRangeCancelled(t *testing.T) {
	ctx, cancel := context.WithCancel(context.Background())
	var n counter
	f := synthetic(func(x float64) float64 {
		if n.Load() > 3 {
			cancel()
		}
		return x / 3
	}, nil, &n)
	if _, ok := findRange(ctx, f, axis{x0: 1}, f(1), nil); ok {
		t.Fatal("a cancelled search reported a range")
	}
	if n.Load() > 8 {
		t.Errorf("%d evaluations after cancelling", n.Load())
	}
}
