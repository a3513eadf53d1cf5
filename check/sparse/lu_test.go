package sparse

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// randomSystem is an n×n matrix with a few entries a row, a nonzero
// diagonal of varying size, and rows of unlike scale; dense is the same
// matrix.
func randomSystem(r *rand.Rand, n int) (*Matrix, *mat.Dense) {
	a := NewMatrix(n)
	d := mat.NewDense(n, n, nil)
	for i := 0; i < n; i++ {
		s := math.Pow(10, float64(r.IntN(13)-6))
		set := func(j int, v float64) {
			a.Add(i, j, v*s)
			d.Set(i, j, d.At(i, j)+v*s)
		}
		set(i, r.NormFloat64())
		for k := r.IntN(4); k > 0; k-- {
			set(r.IntN(n), r.NormFloat64())
		}
	}
	return a, d
}

// The solution agrees with gonum's dense LU with partial pivoting to the
// accuracy the condition number allows.
func TestSolveMatchesDense(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	for trial := 0; trial < 200; trial++ {
		n := 1 + r.IntN(60)
		a, d := randomSystem(r, n)
		b := make([]float64, n)
		for i := range b {
			b[i] = r.NormFloat64()
		}
		var dlu mat.LU
		dlu.Factorize(d)
		cond := dlu.Cond()
		if cond > 1e8 {
			continue
		}
		var want mat.VecDense
		if err := dlu.SolveVecTo(&want, false, mat.NewVecDense(n, b)); err != nil {
			continue
		}
		var lu LU
		if err := lu.Factorize(a); err != nil {
			t.Fatalf("trial %d: %v (dense cond %.3g)", trial, err, cond)
		}
		x := lu.Solve(b)
		var wn, dn float64
		for i := range x {
			wn = math.Max(wn, math.Abs(want.AtVec(i)))
			dn = math.Max(dn, math.Abs(x[i]-want.AtVec(i)))
		}
		if dn > 1e-13*cond*wn {
			t.Errorf("trial %d (n %d, cond %.3g): |x − x_dense| = %.3g of %.3g", trial, n, cond, dn, wn)
		}
		// The residual is small against the right-hand side.
		ax := a.MulVec(x)
		for i := range ax {
			if res := math.Abs(ax[i] - b[i]); res > 1e-9*(1+math.Abs(b[i]))*cond*1e-3 && res > 1e-12 {
				t.Errorf("trial %d: residual %.3g in row %d", trial, res, i)
			}
		}
	}
}

// An arrow matrix (a hub coupled to every leaf) factorises without fill
// when the leaves go first.
func TestArrowNoFill(t *testing.T) {
	const n = 1000
	a := NewMatrix(n)
	for i := 1; i < n; i++ {
		a.Add(i, i, 2)
		a.Add(i, 0, 1)
		a.Add(0, i, 1)
	}
	a.Add(0, 0, float64(n))
	var lu LU
	if err := lu.Factorize(a); err != nil {
		t.Fatal(err)
	}
	if f := lu.Fill(); f > 3*n {
		t.Errorf("fill %d entries, want at most %d", f, 3*n)
	}
	b := make([]float64, n)
	for i := range b {
		b[i] = 1
	}
	x := lu.Solve(b)
	for i, v := range a.MulVec(x) {
		if math.Abs(v-1) > 1e-12*n { // row 0 sums n terms of order n
			t.Fatalf("row %d: %g", i, v)
		}
	}
}

// A singular matrix (a zero column, or two equal rows) is refused.
func TestSingular(t *testing.T) {
	a := NewMatrix(2)
	a.Add(0, 0, 1)
	a.Add(1, 0, 1)
	var lu LU
	if err := lu.Factorize(a); err != ErrSingular {
		t.Errorf("zero column: %v", err)
	}
	b := NewMatrix(2)
	b.Add(0, 0, 1)
	b.Add(0, 1, 2)
	b.Add(1, 0, 1)
	b.Add(1, 1, 2)
	if err := lu.Factorize(b); err != ErrSingular {
		t.Errorf("equal rows: %v", err)
	}
	if err := lu.Factorize(NewMatrix(1)); err != ErrSingular {
		t.Errorf("zero row: %v", err)
	}
}
