package fluid

import (
	"fmt"
	"math"
	"sort"
)

// The cached table holds every saturated property as a cubic spline over a
// grid that is uniform in x = (1 − T/Tc)^(1/3). In that variable the
// power laws that govern the approach to the critical point are nearly
// linear, so the grid is dense in temperature near Tmax and sparse at low
// temperature. Properties spanning decades are interpolated as logarithms
// (pressure as ln p, which is nearly linear in 1/T). The grid is refined by
// halving until the interval midpoints, checked against the fluid's
// equations, agree within tableTol, or are near enough that one more halving
// will make them agree.

const (
	tableTol       = 2e-5 // build target at midpoints; the promise to callers is 1e-4
	tableMinN      = 16   // first grid, intervals
	tableMaxN      = 2048 // finest grid tried before giving up
	tableNumFields = 12
)

// Table fields, in coefficient order. HV is not stored: it is HL + Hlv, so the
// latent heat and the two enthalpies always agree.
const (
	fP = iota
	fRhoL
	fRhoV
	fHL
	fHlv
	fCpL
	fCpV
	fMuL
	fMuV
	fKL
	fKV
	fSigma
)

// tableFieldNames names the fields in error messages.
var tableFieldNames = [tableNumFields]string{"pressure", "liquid density", "vapour density",
	"liquid enthalpy", "latent heat", "liquid specific heat", "vapour specific heat",
	"liquid viscosity", "vapour viscosity", "liquid conductivity", "vapour conductivity", "surface tension"}

// tableLog marks the fields interpolated as logarithms: those spanning
// decades (pressure, vapour density, liquid viscosity). The others need no
// more nodes as they are, and each logarithm costs an exponential per look-up.
var tableLog = [tableNumFields]bool{fP: true, fRhoV: true, fMuL: true}

// tabulated is an immutable cached table of one fluid's saturated states.
type tabulated struct {
	info   Info
	n      int     // intervals
	x0, dx float64 // grid: x_i = x0 + i·dx, i = 0..n
	cbrtTc bool    // grid variable is (1−T/Tc)^(1/3); otherwise T itself
	lnp    []float64
	pmin   float64
	pmax   float64
	// coef[(i*tableNumFields+f)*4+k] is the k-th coefficient of field f's cubic
	// in the local coordinate t ∈ [0, 1] of interval i.
	coef []float64
}

// newTabulated builds the cached table of an evaluator.
func newTabulated(e Evaluator) (Fluid, error) {
	info := e.Info()
	if !(info.Tmin > 0 && info.Tmax > info.Tmin) || math.IsInf(info.Tmax, 0) {
		return nil, fmt.Errorf("%s: invalid temperature range %g to %g K", info.Name, info.Tmin, info.Tmax)
	}
	tb := &tabulated{info: info, cbrtTc: info.Tc > info.Tmax && !math.IsInf(info.Tc, 0)}
	tb.x0 = tb.gridX(info.Tmin)
	x1 := tb.gridX(info.Tmax)

	n := tableMinN
	ys, err := tb.sample(e, n, x1)
	if err != nil {
		return nil, err
	}
	for {
		tb.fit(n, x1, ys)
		if n >= tableMaxN {
			return nil, fmt.Errorf("%s: saturated properties too irregular to tabulate within %.3g%%", info.Name, 100*tableTol)
		}
		// Evaluate the midpoints: they check this grid and are the new nodes of the next.
		mids := make([][tableNumFields]float64, n)
		worst := 0.0
		for i := 0; i < n; i++ {
			s, err := e.Direct(tb.gridT(tb.x0 + (float64(i)+0.5)*tb.dx))
			if err != nil {
				return nil, fmt.Errorf("%s: building the property table: %w", info.Name, err)
			}
			y, err := tableValues(info.Name, s)
			if err != nil {
				return nil, err
			}
			mids[i] = y
			got := tb.eval(i, 0.5, s.T)
			worst = math.Max(worst, satDeviation(got, s))
		}
		if worst <= tableTol {
			return tb, nil
		}
		merged := make([][tableNumFields]float64, 2*n+1)
		for i := 0; i <= n; i++ {
			merged[2*i] = ys[i]
			if i < n {
				merged[2*i+1] = mids[i]
			}
		}
		ys, n = merged, 2*n
		// A cubic spline's error falls sixteenfold when its intervals are
		// halved, so a grid 16 times too coarse is followed by its halving
		// without a further check: that halves the build time.
		if worst <= 16*tableTol {
			tb.fit(n, x1, ys)
			return tb, nil
		}
	}
}

// gridX maps a temperature to the grid variable.
func (tb *tabulated) gridX(T float64) float64 {
	if tb.cbrtTc {
		return math.Cbrt(1 - T/tb.info.Tc)
	}
	return T
}

// gridT maps the grid variable back to a temperature.
func (tb *tabulated) gridT(x float64) float64 {
	if tb.cbrtTc {
		return tb.info.Tc * (1 - x*x*x)
	}
	return x
}

// sample evaluates the transformed fields at the n+1 nodes of a grid.
func (tb *tabulated) sample(e Evaluator, n int, x1 float64) ([][tableNumFields]float64, error) {
	ys := make([][tableNumFields]float64, n+1)
	dx := (x1 - tb.x0) / float64(n)
	for i := 0; i <= n; i++ {
		T := tb.gridT(tb.x0 + float64(i)*dx)
		switch i { // the ends exactly, free of round-off in the grid map
		case 0:
			T = tb.info.Tmin
		case n:
			T = tb.info.Tmax
		}
		s, err := e.Direct(T)
		if err != nil {
			return nil, fmt.Errorf("%s: building the property table: %w", tb.info.Name, err)
		}
		if ys[i], err = tableValues(tb.info.Name, s); err != nil {
			return nil, err
		}
	}
	return ys, nil
}

// tableValues converts a saturated state to the interpolated fields.
func tableValues(name string, s Sat) ([tableNumFields]float64, error) {
	var y [tableNumFields]float64
	raw := [tableNumFields]float64{s.P, s.RhoL, s.RhoV, s.HL, s.Hlv, s.CpL, s.CpV, s.MuL, s.MuV, s.KL, s.KV, s.Sigma}
	for f, v := range raw {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return y, fmt.Errorf("%s: saturated %s is %g at %g K", name, tableFieldNames[f], v, s.T)
		}
		if f != fHL && v <= 0 { // every property but the enthalpy, whose zero is arbitrary
			return y, fmt.Errorf("%s: saturated %s is %g at %g K, not positive", name, tableFieldNames[f], v, s.T)
		}
		if tableLog[f] {
			v = math.Log(v)
		}
		y[f] = v
	}
	return y, nil
}

// fit computes the spline coefficients of the n-interval grid through ys.
// Slopes come from the uniform-grid spline equations with fourth-order
// one-sided differences at the ends, which keeps the ends as accurate as the
// interior.
func (tb *tabulated) fit(n int, x1 float64, ys [][tableNumFields]float64) {
	tb.n = n
	tb.dx = (x1 - tb.x0) / float64(n)
	tb.coef = make([]float64, n*tableNumFields*4)
	tb.lnp = make([]float64, n+1)
	y := make([]float64, n+1)
	m := make([]float64, n+1)
	c := make([]float64, n+1)
	for f := 0; f < tableNumFields; f++ {
		for i := range y {
			y[i] = ys[i][f]
		}
		m[0] = (-25*y[0] + 48*y[1] - 36*y[2] + 16*y[3] - 3*y[4]) / 12
		m[n] = (25*y[n] - 48*y[n-1] + 36*y[n-2] - 16*y[n-3] + 3*y[n-4]) / 12
		// Thomas algorithm for m[i-1] + 4 m[i] + m[i+1] = 3 (y[i+1] − y[i-1]).
		d := make([]float64, n+1)
		for i := 1; i < n; i++ {
			d[i] = 3 * (y[i+1] - y[i-1])
		}
		d[1] -= m[0]
		d[n-1] -= m[n]
		c[1] = 1.0 / 4
		d[1] /= 4
		for i := 2; i < n; i++ {
			w := 4 - c[i-1]
			c[i] = 1 / w
			d[i] = (d[i] - d[i-1]) / w
		}
		m[n-1] = d[n-1]
		for i := n - 2; i >= 1; i-- {
			m[i] = d[i] - c[i]*m[i+1]
		}
		for i := 0; i < n; i++ {
			k := (i*tableNumFields + f) * 4
			tb.coef[k] = y[i]
			tb.coef[k+1] = m[i]
			tb.coef[k+2] = 3*(y[i+1]-y[i]) - 2*m[i] - m[i+1]
			tb.coef[k+3] = 2*(y[i]-y[i+1]) + m[i] + m[i+1]
		}
		if f == fP {
			copy(tb.lnp, y)
		}
	}
	// The pressure range is that of the interpolant at its ends, which may
	// differ from the nodes in the last bit, so that AtT and AtP agree on it.
	tb.pmin = tb.eval(0, 0, 0).P
	tb.pmax = tb.eval(n-1, 1, 0).P
}

// eval returns the state at local coordinate t of interval i; T is the
// temperature it stands for.
func (tb *tabulated) eval(i int, t, T float64) Sat {
	c := tb.coef[i*tableNumFields*4 : (i+1)*tableNumFields*4]
	var v [tableNumFields]float64
	for f := range v {
		k := f * 4
		y := c[k] + t*(c[k+1]+t*(c[k+2]+t*c[k+3]))
		if tableLog[f] {
			y = math.Exp(y)
		}
		v[f] = y
	}
	return Sat{
		T: T, P: v[fP],
		RhoL: v[fRhoL], RhoV: v[fRhoV],
		HL: v[fHL], HV: v[fHL] + v[fHlv], Hlv: v[fHlv],
		CpL: v[fCpL], CpV: v[fCpV],
		MuL: v[fMuL], MuV: v[fMuV],
		KL: v[fKL], KV: v[fKV],
		Sigma: v[fSigma],
	}
}

func (tb *tabulated) Info() Info { return tb.info }

// AtT interpolates the saturated state at T (K).
func (tb *tabulated) AtT(T float64) (Sat, error) {
	if !(T >= tb.info.Tmin && T <= tb.info.Tmax) {
		return Sat{}, &RangeError{Fluid: tb.info.Name, Quantity: "temperature", Value: T,
			Min: tb.info.Tmin, Max: tb.info.Tmax, Unit: "K"}
	}
	var i int
	var t float64
	switch T {
	case tb.info.Tmin: // the ends exactly, free of round-off in the grid map
		i, t = 0, 0
	case tb.info.Tmax:
		i, t = tb.n-1, 1
	default:
		u := (tb.gridX(T) - tb.x0) / tb.dx
		i = min(max(int(u), 0), tb.n-1)
		t = min(max(u-float64(i), 0), 1)
	}
	s := tb.eval(i, t, T)
	s.P = min(max(s.P, tb.pmin), tb.pmax) // AtP accepts every pressure AtT gives
	return s, nil
}

// AtP finds the saturated state at p (Pa) by solving the interpolated ln p(T)
// for T, so that AtT(AtP(p).T) reproduces p.
func (tb *tabulated) AtP(p float64) (Sat, error) {
	i, t, err := tb.locateP(p)
	if err != nil {
		return Sat{}, err
	}
	T := tb.gridT(tb.x0 + (float64(i)+t)*tb.dx)
	T = min(max(T, tb.info.Tmin), tb.info.Tmax)
	s := tb.eval(i, t, T)
	s.P = p
	return s, nil
}

// enthalpiesAtP is AtP's liquid enthalpy and latent heat alone, the same
// bits without the other fields' interpolation.
func (tb *tabulated) enthalpiesAtP(p float64) (hl, hlv float64, err error) {
	i, t, err := tb.locateP(p)
	if err != nil {
		return 0, 0, err
	}
	c := tb.coef[i*tableNumFields*4 : (i+1)*tableNumFields*4]
	k := fHL * 4
	hl = c[k] + t*(c[k+1]+t*(c[k+2]+t*c[k+3]))
	k = fHlv * 4
	hlv = c[k] + t*(c[k+1]+t*(c[k+2]+t*c[k+3]))
	return hl, hlv, nil
}

// EnthalpiesAtP returns the saturated liquid enthalpy and latent heat at
// p (Pa), as AtP gives them; from a table it skips the other properties.
func EnthalpiesAtP(f Fluid, p float64) (hl, hlv float64, err error) {
	if tb, ok := f.(*tabulated); ok {
		return tb.enthalpiesAtP(p)
	}
	s, err := f.AtP(p)
	return s.HL, s.Hlv, err
}

// locateP finds the interval i and local coordinate t of pressure p.
func (tb *tabulated) locateP(p float64) (i int, t float64, err error) {
	if !(p >= tb.pmin && p <= tb.pmax) {
		return 0, 0, &RangeError{Fluid: tb.info.Name, Quantity: "pressure", Value: p,
			Min: tb.pmin, Max: tb.pmax, Unit: "Pa"}
	}
	lp := math.Log(p)
	i = sort.SearchFloat64s(tb.lnp, lp) - 1 // lnp[i] < lp <= lnp[i+1]
	if i < 0 {
		i = 0
	} else if i >= tb.n {
		i = tb.n - 1
	}
	k := i * tableNumFields * 4 // fP is field 0
	c := tb.coef[k : k+4]
	return i, solveCubicUnit(c, lp), nil
}

// solveCubicUnit solves c0 + t(c1 + t(c2 + t c3)) = y for t in [0, 1], the
// cubic taking its end values at 0 and 1 with y between them: Newton steps
// kept inside a shrinking bracket.
func solveCubicUnit(c []float64, y float64) float64 {
	f := func(t float64) float64 { return c[0] + t*(c[1]+t*(c[2]+t*c[3])) - y }
	lo, hi := 0.0, 1.0
	flo := f(lo)
	if flo == 0 {
		return 0
	}
	fhi := f(hi)
	if fhi == 0 {
		return 1
	}
	if (flo > 0) == (fhi > 0) { // not bracketed by round-off: nearest end
		if math.Abs(flo) < math.Abs(fhi) {
			return 0
		}
		return 1
	}
	t := flo / (flo - fhi)
	for iter := 0; iter < 60; iter++ {
		ft := f(t)
		if ft == 0 {
			return t
		}
		if (ft > 0) == (flo > 0) {
			lo, flo = t, ft
		} else {
			hi = t
		}
		d := c[1] + t*(2*c[2]+t*3*c[3])
		next := t - ft/d
		if !(next > lo && next < hi) {
			next = (lo + hi) / 2
		}
		if math.Abs(next-t) < 1e-15 {
			return next
		}
		t = next
	}
	return t
}

// satDeviation is the largest relative difference between two saturated
// states over every field. Enthalpies have an arbitrary zero, so their
// differences are taken relative to |h| + h_lv.
func satDeviation(got, want Sat) float64 {
	worst := 0.0
	rel := func(a, b, scale float64) {
		d := math.Abs(a-b) / scale
		if !(d <= worst) { // NaN counts as the worst
			worst = math.Max(worst, d)
			if math.IsNaN(d) {
				worst = math.Inf(1)
			}
		}
	}
	r := func(a, b float64) { rel(a, b, math.Abs(b)) }
	r(got.P, want.P)
	r(got.RhoL, want.RhoL)
	r(got.RhoV, want.RhoV)
	rel(got.HL, want.HL, math.Abs(want.HL)+want.Hlv)
	rel(got.HV, want.HV, math.Abs(want.HV)+want.Hlv)
	r(got.Hlv, want.Hlv)
	r(got.CpL, want.CpL)
	r(got.CpV, want.CpV)
	r(got.MuL, want.MuL)
	r(got.MuV, want.MuV)
	r(got.KL, want.KL)
	r(got.KV, want.KV)
	r(got.Sigma, want.Sigma)
	return worst
}
