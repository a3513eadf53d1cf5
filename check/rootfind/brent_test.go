package rootfind

import (
	"math"
	"testing"
)

func plain(f func(float64) float64) Func[int] {
	n := 0
	return func(x float64) (float64, int, bool) {
		n++
		return f(x), n, true
	}
}

func at(f Func[int], x float64) Point[int] {
	fx, s, _ := f(x)
	return Point[int]{X: x, F: fx, State: s}
}

func TestBrentRoots(t *testing.T) {
	tests := []struct {
		name string
		f    func(float64) float64
		a, b float64
		want float64
	}{
		// √2, from math.Sqrt.
		{"x²−2", func(x float64) float64 { return x*x - 2 }, 0, 2, math.Sqrt2},
		// The fixed point of cos, 0.739085133215160641655… (OEIS A003957,
		// from memory).
		{"cos x − x", func(x float64) float64 { return math.Cos(x) - x }, 0, 1, 0.7390851332151607},
		// π, from math.Pi: a root with steep sides.
		{"sin x", math.Sin, 3, 4, math.Pi},
		// A cube root (math.Cbrt), flat at the root's side.
		{"x³−10", func(x float64) float64 { return x*x*x - 10 }, -5, 5, math.Cbrt(10)},
	}
	for _, tt := range tests {
		for _, widthOnly := range []bool{false, true} {
			f := plain(tt.f)
			r := Brent(f, at(f, tt.a), at(f, tt.b), Options{Tol: 1e-12, WidthOnly: widthOnly})
			if r.Unusable || r.Cancelled {
				t.Fatalf("%s: ended early: %+v", tt.name, r)
			}
			if math.Abs(r.Root.X-tt.want) > 1e-11 {
				t.Errorf("%s (width only %v): root %.17g, want %.17g", tt.name, widthOnly, r.Root.X, tt.want)
			}
			if r.Root.F != 0 && (r.Root.F > 0) == (r.Other.F > 0) {
				t.Errorf("%s: no sign change between %v and %v", tt.name, r.Root, r.Other)
			}
			if fx, _, _ := f(r.Root.X); fx != r.Root.F {
				t.Errorf("%s: the root's value %g is not f there (%g)", tt.name, r.Root.F, fx)
			}
			if r.Root.State < 2 {
				t.Errorf("%s: state %d is not of an evaluation inside the bracket", tt.name, r.Root.State)
			}
		}
	}
}

// The state handed back is the one computed at the root's own point.
func TestBrentState(t *testing.T) {
	f := func(x float64) (float64, float64, bool) { return x - 0.3, 10 * x, true }
	a := Point[float64]{X: 0, F: -0.3, State: 0}
	b := Point[float64]{X: 1, F: 0.7, State: 10}
	r := Brent(f, a, b, Options{Tol: 1e-9})
	if r.Root.State != 10*r.Root.X || r.Other.State != 10*r.Other.X {
		t.Errorf("states %v, %v do not belong to their points", r.Root, r.Other)
	}
}

// A point without a usable value ends the search there, with the bracket it
// fell in.
func TestBrentUnusable(t *testing.T) {
	// No value above 0.6; the sign change is at 0.8.
	f := func(x float64) (float64, string, bool) {
		if x > 0.6 {
			return 0, "none", false
		}
		return x - 0.8, "ok", true
	}
	a := Point[string]{X: 0, F: -0.8, State: "ok"}
	b := Point[string]{X: 1, F: 0.2, State: "end"}
	r := Brent(f, a, b, Options{Tol: 1e-9})
	if !r.Unusable || r.At.State != "none" || !(r.At.X > 0.6) {
		t.Fatalf("want a stop above 0.6, got %+v", r)
	}
	lo, hi := math.Min(r.Root.X, r.Other.X), math.Max(r.Root.X, r.Other.X)
	if !(lo < r.At.X && r.At.X < hi) || (r.Root.F > 0) == (r.Other.F > 0) {
		t.Errorf("the stop at %g is not inside the sign change [%g, %g]", r.At.X, lo, hi)
	}
}

func TestBrentCancelled(t *testing.T) {
	calls := 0
	f := func(x float64) (float64, struct{}, bool) { calls++; return x*x - 2, struct{}{}, true }
	a := Point[struct{}]{X: 0, F: -2}
	b := Point[struct{}]{X: 2, F: 2}
	steps := 0
	r := Brent(f, a, b, Options{Tol: 1e-12, Cancelled: func() bool { steps++; return steps > 2 }})
	if !r.Cancelled || calls != 2 {
		t.Errorf("cancelled %v after %d evaluations, want after 2", r.Cancelled, calls)
	}
	if (r.Root.F > 0) == (r.Other.F > 0) {
		t.Errorf("the bracket so far %v, %v has no sign change", r.Root, r.Other)
	}
}

// An exact zero ends the search at once.
func TestBrentExactZero(t *testing.T) {
	n := 0
	f := func(x float64) (float64, struct{}, bool) { n++; return x - 0.5, struct{}{}, true }
	r := Brent(f, Point[struct{}]{X: 0, F: -0.5}, Point[struct{}]{X: 1, F: 0.5}, Options{Tol: 1e-12})
	if r.Root.X != 0.5 || r.Root.F != 0 || n != 1 {
		t.Errorf("root %v after %d evaluations, want 0.5 after 1", r.Root, n)
	}
}
