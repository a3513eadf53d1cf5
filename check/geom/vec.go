// Package geom places a loop's nodes in space and turns a case's attitude and
// acceleration into the body force the fluid feels.
//
// Frame: the equipment frame has x forward, y to the left and z up when the
// equipment stands level. Every position and displacement here is in that
// frame, in metres.
package geom

import "math"

// Vec3 is a vector in the equipment frame.
type Vec3 [3]float64

// Add returns v + w.
func (v Vec3) Add(w Vec3) Vec3 { return Vec3{v[0] + w[0], v[1] + w[1], v[2] + w[2]} }

// Sub returns v − w.
func (v Vec3) Sub(w Vec3) Vec3 { return Vec3{v[0] - w[0], v[1] - w[1], v[2] - w[2]} }

// Scale returns s·v.
func (v Vec3) Scale(s float64) Vec3 { return Vec3{s * v[0], s * v[1], s * v[2]} }

// Dot returns v·w.
func (v Vec3) Dot(w Vec3) float64 { return v[0]*w[0] + v[1]*w[1] + v[2]*w[2] }

// Norm returns |v|.
func (v Vec3) Norm() float64 { return math.Sqrt(v.Dot(v)) }

// Unit returns v/|v|, or the zero vector when v is zero (or not finite), so
// that no NaN leaks out.
func (v Vec3) Unit() Vec3 {
	n := v.Norm()
	if n == 0 || math.IsInf(n, 0) || math.IsNaN(n) {
		return Vec3{}
	}
	return v.Scale(1 / n)
}

// Mat3 is a 3×3 matrix, row major.
type Mat3 [3][3]float64

// Mul returns m·v.
func (m Mat3) Mul(v Vec3) Vec3 {
	return Vec3{
		m[0][0]*v[0] + m[0][1]*v[1] + m[0][2]*v[2],
		m[1][0]*v[0] + m[1][1]*v[1] + m[1][2]*v[2],
		m[2][0]*v[0] + m[2][1]*v[1] + m[2][2]*v[2],
	}
}

// MulMat returns m·n.
func (m Mat3) MulMat(n Mat3) Mat3 {
	var r Mat3
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			for k := 0; k < 3; k++ {
				r[i][j] += m[i][k] * n[k][j]
			}
		}
	}
	return r
}

// T returns the transpose of m (the inverse of a rotation).
func (m Mat3) T() Mat3 {
	var r Mat3
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			r[i][j] = m[j][i]
		}
	}
	return r
}
