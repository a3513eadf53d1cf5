package geom

import (
	"math"

	"circa/lang"
)

// Gn is standard gravity, 9.80665 m/s² (3rd CGPM, 1901).
const Gn = 9.80665

// Attitude returns the rotation from the equipment frame to the world frame
// for angles in radians: yaw ψ about z, then pitch θ about the new y, then
// roll φ about the new x (intrinsic), R = Rz(ψ)·Ry(−θ)·Rx(φ).
//
// Signs follow the equipment convention rather than the right-hand rule
// about y: positive pitch raises the front (+x) end, positive roll raises
// the left (+y) side.
func Attitude(yaw, pitch, roll float64) Mat3 {
	cy, sy := math.Cos(yaw), math.Sin(yaw)
	// Rotating by −θ about y: a right-handed rotation by +θ about y lowers +x.
	cp, sp := math.Cos(-pitch), math.Sin(-pitch)
	cr, sr := math.Cos(roll), math.Sin(roll)
	rz := Mat3{{cy, -sy, 0}, {sy, cy, 0}, {0, 0, 1}}
	ry := Mat3{{cp, 0, sp}, {0, 1, 0}, {-sp, 0, cp}}
	rx := Mat3{{1, 0, 0}, {0, cr, -sr}, {0, sr, cr}}
	return rz.MulMat(ry).MulMat(rx)
}

// BodyForceAt returns the body force per unit mass felt by the fluid, in the
// equipment frame: b = Rᵀ·(0, 0, −g_n) − a, where a is the steady linear
// acceleration of the equipment frame (expressed in that frame). Non-finite
// inputs are treated as zero so that the result is always finite.
func BodyForceAt(yaw, pitch, roll float64, accel Vec3) Vec3 {
	fin := func(x float64) float64 {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return 0
		}
		return x
	}
	r := Attitude(fin(yaw), fin(pitch), fin(roll))
	g := r.T().Mul(Vec3{0, 0, -Gn})
	a := Vec3{fin(accel[0]), fin(accel[1]), fin(accel[2])}
	return g.Sub(a)
}

// BodyForce returns the body force of a case (see BodyForceAt). A nil case
// is the equipment level and at rest: (0, 0, −g_n).
func BodyForce(c *lang.Case) Vec3 {
	if c == nil {
		return Vec3{0, 0, -Gn}
	}
	return BodyForceAt(c.Yaw.SI, c.Pitch.SI, c.Roll.SI, Vec3{c.Accel.X, c.Accel.Y, c.Accel.Z})
}
