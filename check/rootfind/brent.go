// Package rootfind finds where a scalar function of one variable changes sign,
// by Brent's method (Brent 1973, Algorithms for Minimization without
// Derivatives, ch. 4): inverse quadratic or linear interpolation while it
// closes the bracket fast, bisection when it does not. Each evaluation
// carries the caller's state, so that what was computed at the root (which
// margin limits there, say) comes back with it.
package rootfind

import "math"

// Point is the function searched, evaluated at X: its value F and what the
// caller computed on the way.
type Point[S any] struct {
	X, F  float64
	State S
}

// Func evaluates the function searched at x, with the caller's state
// there. ok is false where it has no usable value at x: the search ends
// there.
type Func[S any] func(x float64) (fx float64, state S, ok bool)

// Options set how a search ends.
type Options struct {
	// Tol is the width of bracket the search closes to.
	Tol float64
	// WidthOnly ends the search on the bracket's width alone (within Tol);
	// otherwise it also ends within the rounding of the estimate's
	// magnitude (2·1e-15·|x|), as Brent's own procedure does.
	WidthOnly bool
	// Cancelled, when given, is asked before each step; true ends the
	// search with the bracket so far.
	Cancelled func() bool
}

// Result is where a search ended.
type Result[S any] struct {
	// Root is the best estimate and Other the far end of the bracket: F
	// changes sign between them, or Root.F is zero. After a point without a
	// usable value they are the bracket that point fell in, Root the
	// estimate before it.
	Root, Other Point[S]
	// Unusable is set when the search ended at a point where f had no
	// usable value; that point is At.
	Unusable bool
	At       Point[S]
	// Cancelled is set when Options.Cancelled ended the search.
	Cancelled bool
}

// maxSteps bounds the evaluations of one search; Brent's method needs far
// fewer for any bracket and tolerance in use.
const maxSteps = 100

// Brent searches the bracket between a and b, whose values F differ in
// sign, for a root of f.
func Brent[S any](f Func[S], a, b Point[S], o Options) Result[S] {
	// b is the latest estimate, c the other end of the sign change, a the
	// previous b.
	c := a
	d := b.X - a.X
	e := d
	for i := 0; i < maxSteps; i++ {
		if o.Cancelled != nil && o.Cancelled() {
			return Result[S]{Root: b, Other: c, Cancelled: true}
		}
		if (b.F > 0) == (c.F > 0) {
			c = a
			d = b.X - a.X
			e = d
		}
		if math.Abs(c.F) < math.Abs(b.F) {
			a, b, c = b, c, b
		}
		t := 2*1e-15*math.Abs(b.X) + 0.5*o.Tol
		mid := 0.5 * (c.X - b.X)
		end := math.Abs(mid) <= t
		if o.WidthOnly {
			end = math.Abs(c.X-b.X) <= o.Tol
		}
		if end || b.F == 0 {
			return Result[S]{Root: b, Other: c}
		}
		if math.Abs(e) >= t && math.Abs(a.F) > math.Abs(b.F) {
			var p, q float64
			sv := b.F / a.F
			if a.X == c.X {
				p = 2 * mid * sv
				q = 1 - sv
			} else {
				q0 := a.F / c.F
				r := b.F / c.F
				p = sv * (2*mid*q0*(q0-r) - (b.X-a.X)*(r-1))
				q = (q0 - 1) * (r - 1) * (sv - 1)
			}
			if p > 0 {
				q = -q
			} else {
				p = -p
			}
			if 2*p < math.Min(3*mid*q-math.Abs(t*q), math.Abs(e*q)) {
				e, d = d, p/q
			} else {
				d, e = mid, mid
			}
		} else {
			d, e = mid, mid
		}
		a = b
		x := b.X
		if math.Abs(d) > t {
			x += d
		} else {
			x += math.Copysign(t, mid)
		}
		fx, st, ok := f(x)
		if !ok {
			return Result[S]{Root: a, Other: c, Unusable: true, At: Point[S]{X: x, F: fx, State: st}}
		}
		b = Point[S]{X: x, F: fx, State: st}
	}
	return Result[S]{Root: b, Other: c}
}
