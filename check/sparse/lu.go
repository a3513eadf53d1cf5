// Package sparse solves square sparse linear systems by Gaussian elimination
// with a fill-reducing choice of pivots: the column of fewest entries first
// (the leaves of the system's graph before its hubs), and in it, among the
// rows whose entry passes a threshold of partial pivoting, the row of
// fewest entries. Rows are scaled to a largest entry of one first, so the
// threshold compares entries of unlike units fairly. Ties are broken by
// index, so a factorisation is the same to the bit on every run.
package sparse

import (
	"cmp"
	"container/heap"
	"errors"
	"math"
	"slices"
)

// ErrSingular is returned when no pivot passes in some column.
var ErrSingular = errors.New("sparse: matrix is singular")

// threshold is the least ratio of a pivot to the largest entry of its
// column (partial pivoting is 1; 0.1 trades a bounded growth for less fill).
const threshold = 0.1

// Matrix is a square matrix under assembly: Add sums entries.
type Matrix struct {
	n    int
	rows []map[int]float64
}

// NewMatrix returns an n×n zero matrix.
func NewMatrix(n int) *Matrix {
	m := &Matrix{n: n, rows: make([]map[int]float64, n)}
	for i := range m.rows {
		m.rows[i] = map[int]float64{}
	}
	return m
}

// N is the matrix's order.
func (m *Matrix) N() int { return m.n }

// Add adds v to entry (i, j).
func (m *Matrix) Add(i, j int, v float64) {
	m.rows[i][j] += v
}

// MulVec returns m·x.
func (m *Matrix) MulVec(x []float64) []float64 {
	y := make([]float64, m.n)
	for i, r := range m.rows {
		js := make([]int, 0, len(r))
		for j := range r {
			js = append(js, j)
		}
		slices.Sort(js)
		var s float64
		for _, j := range js {
			s += r[j] * x[j]
		}
		y[i] = s
	}
	return y
}

// entry is a value at an index.
type entry struct {
	j int
	v float64
}

// LU is a factorisation P·D·A·Q = L·U of a Matrix (D the row scaling).
type LU struct {
	n     int
	scale []float64 // by row
	// Step k eliminates column col[k] with row row[k] and pivot piv[k]; lower
	// holds (row, multiplier) of the rows it updated, upper the pivot row's
	// other entries (all in columns eliminated later).
	row, col []int
	piv      []float64
	lower    [][]entry
	upper    [][]entry
}

// colHeap orders columns by entry count, then index; entries go stale when
// a count changes and are skipped when popped.
type colHeap [][2]int

func (h colHeap) Len() int { return len(h) }
func (h colHeap) Less(a, b int) bool {
	if h[a][0] != h[b][0] {
		return h[a][0] < h[b][0]
	}
	return h[a][1] < h[b][1]
}
func (h colHeap) Swap(a, b int) { h[a], h[b] = h[b], h[a] }
func (h *colHeap) Push(x any)   { *h = append(*h, x.([2]int)) }
func (h *colHeap) Pop() any {
	old := *h
	x := old[len(old)-1]
	*h = old[:len(old)-1]
	return x
}

// Factorize factorises a; a itself is left unchanged.
func (lu *LU) Factorize(a *Matrix) error {
	n := a.n
	*lu = LU{n: n, scale: make([]float64, n), row: make([]int, 0, n), col: make([]int, 0, n),
		piv: make([]float64, 0, n), lower: make([][]entry, 0, n), upper: make([][]entry, 0, n)}
	rows := make([]map[int]float64, n)
	cols := make([]map[int]struct{}, n)
	for j := range cols {
		cols[j] = map[int]struct{}{}
	}
	for i, r := range a.rows {
		big := 0.0
		for _, v := range r {
			big = math.Max(big, math.Abs(v))
		}
		if !(big > 0) || math.IsInf(big, 0) {
			return ErrSingular
		}
		lu.scale[i] = 1 / big
		rows[i] = make(map[int]float64, len(r))
		for j, v := range r {
			if v != 0 {
				rows[i][j] = v / big
				cols[j][i] = struct{}{}
			}
		}
	}
	h := make(colHeap, 0, n)
	for j := range cols {
		h = append(h, [2]int{len(cols[j]), j})
	}
	heap.Init(&h)
	done := make([]bool, n)
	cand := make([]int, 0, 16)
	for len(lu.col) < n {
		if h.Len() == 0 {
			return ErrSingular
		}
		top := heap.Pop(&h).([2]int)
		c := top[1]
		if done[c] || top[0] != len(cols[c]) {
			continue
		}
		// The pivot row: fewest entries among those within the threshold.
		big := 0.0
		cand = cand[:0]
		for i := range cols[c] {
			big = math.Max(big, math.Abs(rows[i][c]))
			cand = append(cand, i)
		}
		if !(big > 0) {
			return ErrSingular
		}
		p := -1
		for _, i := range cand {
			if math.Abs(rows[i][c]) < threshold*big {
				continue
			}
			if p < 0 || len(rows[i]) < len(rows[p]) || len(rows[i]) == len(rows[p]) && i < p {
				p = i
			}
		}
		pv := rows[p][c]
		up := make([]entry, 0, len(rows[p])-1)
		for j, v := range rows[p] {
			if j != c {
				up = append(up, entry{j, v})
			}
		}
		slices.SortFunc(up, func(a, b entry) int { return cmp.Compare(a.j, b.j) })
		for _, e := range up {
			delete(cols[e.j], p)
		}
		delete(cols[c], p)
		var low []entry
		slices.Sort(cand)
		for _, i := range cand {
			if i == p {
				continue
			}
			ri := rows[i]
			l := ri[c] / pv
			delete(ri, c)
			low = append(low, entry{i, l})
			for _, e := range up {
				if _, ok := ri[e.j]; !ok {
					cols[e.j][i] = struct{}{}
				}
				ri[e.j] -= l * e.v
			}
		}
		done[c] = true
		cols[c] = nil
		rows[p] = nil
		for _, e := range up {
			heap.Push(&h, [2]int{len(cols[e.j]), e.j})
		}
		lu.row = append(lu.row, p)
		lu.col = append(lu.col, c)
		lu.piv = append(lu.piv, pv)
		lu.lower = append(lu.lower, low)
		lu.upper = append(lu.upper, up)
	}
	return nil
}

// Solve returns x with A·x = b for the factorised A; b is left unchanged.
func (lu *LU) Solve(b []float64) []float64 {
	y := make([]float64, lu.n)
	for i := range y {
		y[i] = b[i] * lu.scale[i]
	}
	for k, p := range lu.row {
		yp := y[p]
		for _, e := range lu.lower[k] {
			y[e.j] -= e.v * yp
		}
	}
	x := make([]float64, lu.n)
	for k := lu.n - 1; k >= 0; k-- {
		s := y[lu.row[k]]
		for _, e := range lu.upper[k] {
			s -= e.v * x[e.j]
		}
		x[lu.col[k]] = s / lu.piv[k]
	}
	return x
}

// Fill is the number of stored entries of the factors, pivots included.
func (lu *LU) Fill() int {
	f := len(lu.piv)
	for k := range lu.lower {
		f += len(lu.lower[k]) + len(lu.upper[k])
	}
	return f
}
