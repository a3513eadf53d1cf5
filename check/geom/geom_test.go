package geom

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"circa/lang"
)

const deg = math.Pi / 180

func near(a, b, tol float64) bool { return math.Abs(a-b) <= tol }

func nearVec(a, b Vec3, tol float64) bool { return a.Sub(b).Norm() <= tol }

// One standard gravity of forward acceleration on a level loop: by
// d'Alembert's principle the fluid feels g − a, tilted from the vertical by
// atan(a/g) = 45° towards the rear, with magnitude √(g² + a²) = √2·g_n —
// the same direction as gravity alone with the nose raised 45°.
func TestForwardAccelerationTiltsBy45Degrees(t *testing.T) {
	b := BodyForceAt(0, 0, 0, Vec3{Gn, 0, 0})
	// g_n = 9.80665 m/s² (3rd CGPM, 1901).
	if !near(b.Norm(), math.Sqrt2*9.80665, 1e-12) {
		t.Errorf("|b| = %v, want √2·g_n = %v", b.Norm(), math.Sqrt2*9.80665)
	}
	p := BodyForceAt(0, 45*deg, 0, Vec3{})
	if !nearVec(b.Unit(), p.Unit(), 1e-12) {
		t.Errorf("direction %v, want that of a 45° nose-up pitch %v", b.Unit(), p.Unit())
	}
	// Angle from the equipment's −z axis: atan(a/g) = 45°.
	if got := math.Atan2(-b[0], -b[2]) / deg; !near(got, 45, 1e-12) {
		t.Errorf("tilt %v°, want 45°", got)
	}
}

func TestRotationsPreserveMagnitude(t *testing.T) {
	for yaw := -180.0; yaw <= 180; yaw += 37 {
		for pitch := -90.0; pitch <= 90; pitch += 23 {
			for roll := -180.0; roll <= 180; roll += 41 {
				b := BodyForceAt(yaw*deg, pitch*deg, roll*deg, Vec3{})
				if !near(b.Norm(), Gn, 1e-12) {
					t.Fatalf("|b| = %v at yaw %v pitch %v roll %v, want g_n", b.Norm(), yaw, pitch, roll)
				}
				r := Attitude(yaw*deg, pitch*deg, roll*deg)
				// A rotation matrix is orthonormal: RᵀR = I.
				id := r.T().MulMat(r)
				for i := 0; i < 3; i++ {
					for j := 0; j < 3; j++ {
						want := 0.0
						if i == j {
							want = 1
						}
						if !near(id[i][j], want, 1e-12) {
							t.Fatalf("RᵀR[%d][%d] = %v", i, j, id[i][j])
						}
					}
				}
			}
		}
	}
}

func TestYawAloneChangesNothing(t *testing.T) {
	for _, pr := range [][2]float64{{0, 0}, {10, 0}, {0, -20}, {15, 30}} {
		ref := BodyForceAt(0, pr[0]*deg, pr[1]*deg, Vec3{})
		for yaw := -170.0; yaw <= 180; yaw += 10 {
			if b := BodyForceAt(yaw*deg, pr[0]*deg, pr[1]*deg, Vec3{}); !nearVec(b, ref, 1e-12) {
				t.Fatalf("yaw %v° pitch %v° roll %v°: b = %v, want %v", yaw, pr[0], pr[1], b, ref)
			}
		}
	}
}

func TestAxes(t *testing.T) {
	if b := BodyForceAt(0, 90*deg, 0, Vec3{}); !nearVec(b, Vec3{-Gn, 0, 0}, 1e-12) {
		t.Errorf("pitch 90°: b = %v, want gravity along −x", b)
	}
	if b := BodyForceAt(0, 0, 90*deg, Vec3{}); !nearVec(b, Vec3{0, -Gn, 0}, 1e-12) {
		t.Errorf("roll 90°: b = %v, want gravity along −y (left side up)", b)
	}
	// Positive pitch raises the front: the +x axis gains world height sin θ.
	if z := Attitude(0, 10*deg, 0).Mul(Vec3{1, 0, 0})[2]; !near(z, math.Sin(10*deg), 1e-12) {
		t.Errorf("pitch 10°: front end height %v, want sin 10° = %v", z, math.Sin(10*deg))
	}
	// Positive roll raises the left side: the +y axis gains world height sin φ.
	if z := Attitude(0, 0, 10*deg).Mul(Vec3{0, 1, 0})[2]; !near(z, math.Sin(10*deg), 1e-12) {
		t.Errorf("roll 10°: left side height %v, want sin 10°", z)
	}
	if b := BodyForce(nil); b != (Vec3{0, 0, -Gn}) {
		t.Errorf("nil case: b = %v", b)
	}
	// Upward acceleration of 0.5 g_n adds to gravity: |b| = 1.5 g_n.
	if b := BodyForceAt(0, 0, 0, Vec3{0, 0, 0.5 * Gn}); !nearVec(b, Vec3{0, 0, -1.5 * Gn}, 1e-12) {
		t.Errorf("accelerating up: b = %v", b)
	}
	if b := BodyForceAt(math.NaN(), math.Inf(1), 0, Vec3{math.NaN(), 0, 0}); b != (Vec3{0, 0, -Gn}) {
		t.Errorf("non-finite input: b = %v, want level at rest", b)
	}
}

func TestUnitOfZero(t *testing.T) {
	if u := (Vec3{}).Unit(); u != (Vec3{}) {
		t.Errorf("unit of zero = %v", u)
	}
}

func load(t *testing.T, src string) *lang.Loop {
	t.Helper()
	m := lang.LoadSource("t.loop", []byte(src), nil)
	for _, d := range m.Diags {
		if d.Severity == lang.Error {
			t.Fatalf("%s: %s", d.Rule, d.Message())
		}
	}
	if len(m.Loops) != 1 {
		t.Fatalf("%d loops", len(m.Loops))
	}
	return m.Loops[0]
}

// Worked by hand:
//
//	a = (0, 0, 0)               coordinates                       Known
//	b = a + run p1 = (0.5, 0, 0)                                  Known
//	c: reached from b through the evaporator's rise 0.4 → z = 0.4 ZOnly
//	d: reached from a through the condenser's rise −1.4 backwards
//	   → z = 0 − (−1.4) = 1.4                                     ZOnly
//	   (and through p2 from c: 0.4 + 1.0 = 1.4, the same elevation)
//	Disp(p2) = run (0, 0.3, 1.0), |Disp| = √1.09 = 1.04403 m
//	evaporator heated over 0.2 m of 0.4 m from the inlet: its centre is at
//	a quarter of the chord, b + 0.25·(0, 0, 0.4) = (0.5, 0, 0.1)
//	condenser centre: d + 0.5·(0, 0, −1.4) → z = 0.7
//	separate piece: e at the origin (no coordinates), f = e + (0, 0, 2)
func TestPlaceWorkedExample(t *testing.T) {
	l := load(t, `
loop l {
  fluid water
  node a at (0, 0, 0) m
  node b
  node c
  node d
  node e
  node f
  pipe p1 from a to b { length 0.5 m; run (0.5, 0, 0) m; bore 8 mm }
  evaporator ev from b to c { length 0.4 m; rise 0.4 m; heated_length 0.2 m; bore 8 mm }
  pipe p2 from c to d { length 1.2 m; run (0, 0.3, 1.0) m; bore 8 mm }
  condenser k from d to a { length 1.5 m; rise -1.4 m; bore 8 mm }
  pipe q from e to f { length 2 m; rise 2 m; bore 8 mm }
}
`)
	lay := Place(l)
	idx := map[string]int{}
	for _, n := range l.Nodes {
		idx[n.Name] = n.Index
	}
	check := func(name string, known, zonly bool, z float64) {
		i := idx[name]
		if lay.Known[i] != known || lay.ZOnly[i] != zonly {
			t.Errorf("%s: known %v zonly %v, want %v %v", name, lay.Known[i], lay.ZOnly[i], known, zonly)
		}
		if !near(lay.Pos[i][2], z, 1e-12) {
			t.Errorf("%s: z = %v, want %v", name, lay.Pos[i][2], z)
		}
	}
	check("a", true, false, 0)
	check("b", true, false, 0)
	check("c", false, true, 0.4)
	check("d", false, true, 1.4)
	check("e", true, false, 0)
	check("f", false, true, 2)
	if lay.Pos[idx["b"]] != (Vec3{0.5, 0, 0}) {
		t.Errorf("b at %v", lay.Pos[idx["b"]])
	}
	if lay.Piece[idx["a"]] != lay.Piece[idx["d"]] || lay.Piece[idx["a"]] == lay.Piece[idx["e"]] {
		t.Errorf("pieces %v", lay.Piece)
	}
	p2 := l.Components[2]
	if !lay.Horizontal(p2.Index) || lay.Source[p2.Index] != FromRun || !near(lay.Disp(p2.Index).Norm(), 1.04403, 1e-5) {
		t.Errorf("p2: %v %v %v", lay.Horizontal(p2.Index), lay.Source[p2.Index], lay.Disp(p2.Index))
	}
	if !nearVec(lay.Disp(p2.Index).Unit(), Vec3{0, 0.3, 1}.Scale(1/math.Sqrt(1.09)), 1e-12) {
		t.Errorf("p2 dir %v", lay.Disp(p2.Index).Unit())
	}
	if lay.Horizontal(1) || lay.Source[1] != FromRise {
		t.Errorf("evaporator displacement should be rise only")
	}
	ce, ok := ThermalCentre(lay, l, lang.Evaporator, nil)
	if !ok || !nearVec(ce, Vec3{0.5, 0, 0.1}, 1e-12) {
		t.Errorf("evaporator centre %v %v, want (0.5, 0, 0.1)", ce, ok)
	}
	cc, ok := ThermalCentre(lay, l, lang.Condenser, nil)
	if !ok || !near(cc[2], 0.7, 1e-12) {
		t.Errorf("condenser centre %v %v, want z 0.7", cc, ok)
	}
	if _, ok := ThermalCentre(lay, l, lang.Reservoir, nil); ok {
		t.Errorf("no reservoir, yet a centre")
	}
}

// Two evaporators at z 0 and z 1, loaded 3 kW and 1 kW: the heat-weighted
// centre is (3·0 + 1·1)/4 = 0.25 m up (arithmetic by hand).
func TestThermalCentreWeights(t *testing.T) {
	l := load(t, `
loop l {
  fluid water
  node a at (0, 0, 0) m
  node b at (0, 0, 0) m
  node c at (0, 0, 1) m
  node d at (0, 0, 1) m
  evaporator e1 from a to b { length 0.1 m; bore 8 mm; heat 3 kW }
  pipe p from b to c { length 1 m; bore 8 mm }
  evaporator e2 from c to d { length 0.1 m; bore 8 mm; heat 1 kW }
  pipe r from d to a { length 1 m; bore 8 mm }
}
`)
	lay := Place(l)
	c, ok := ThermalCentre(lay, l, lang.Evaporator, func(c *lang.Component) float64 { return c.Heat.SI })
	if !ok || !near(c[2], 0.25, 1e-12) {
		t.Errorf("centre %v, want z 0.25", c)
	}
	c, _ = ThermalCentre(lay, l, lang.Evaporator, func(*lang.Component) float64 { return math.NaN() })
	if !near(c[2], 0.5, 1e-12) {
		t.Errorf("unweighted centre %v, want z 0.5", c)
	}
}

func TestPlaceNil(t *testing.T) {
	if Place(nil) != nil {
		t.Error("Place(nil) != nil")
	}
	if _, ok := ThermalCentre(nil, nil, lang.Evaporator, nil); ok {
		t.Error("centre of nothing")
	}
}

// manyNodes returns a loop of n nodes, no coordinates, joined in pairs by
// pipes of known rise: n/2 separate pieces, each placed from its own origin.
func manyNodes(b *testing.B, n int) *lang.Loop {
	b.Helper()
	var sb strings.Builder
	sb.WriteString("loop l {\n  fluid water\n")
	for i := 0; i < n; i++ {
		fmt.Fprintf(&sb, "  node n%d\n", i)
	}
	for i := 0; i+1 < n; i += 2 {
		fmt.Fprintf(&sb, "  pipe p%d from n%d to n%d { length 1 m; rise 1 m; bore 8 mm }\n", i, i, i+1)
	}
	sb.WriteString("}\n")
	m := lang.LoadSource("many.loop", []byte(sb.String()), nil)
	if len(m.Loops) != 1 || len(m.Loops[0].Nodes) != n {
		b.Fatalf("loops %d", len(m.Loops))
	}
	return m.Loops[0]
}

// Placement must grow about linearly with the number of nodes: every piece
// without coordinates restarts the walk, and a restart must not revisit the
// pieces already placed.
func BenchmarkPlaceManyNodes(b *testing.B) {
	l := manyNodes(b, 20000)
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		Place(l)
	}
}
