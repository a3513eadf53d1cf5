package flow

import (
	"math"
	"testing"

	"circa/lang"
	"circa/lang/loopgen"
)

// A collapsed chain gives the pressure change the tube-by-tube march gives,
// to rounding, for liquid of any subcooling, either way along the branch,
// under a tilted body force and with scaled losses. A two-phase chain is
// marched tube by tube.
func TestChainMatchesTubeByTube(t *testing.T) {
	m := lang.LoadSource("chain.loop", loopgen.Network(400, 3), lang.OSFS{})
	p := prepare(m, m.Loops[0], mustMethods(t, m))
	if p.net == nil {
		t.Fatal("no network")
	}
	chains := 0
	for _, b := range p.net.branches {
		chains += len(b.chains)
	}
	if chains == 0 {
		t.Fatal("no chain collapsed in a network with a 370-tube downcomer")
	}
	var cr CaseResult
	s, _ := p.newState(point{c: m.Cases[0], pitch: 0.3, roll: -0.2}, &cr)
	if s == nil {
		t.Fatal("no state")
	}
	tube := *s.net
	tube.branches = append([]branch(nil), s.net.branches...)
	for bi := range tube.branches {
		tube.branches[bi].chains = nil
	}
	plain := *s
	plain.net = &tube
	for _, k := range []float64{1, 0.5} {
		a, b := s, &plain
		if k != 1 {
			a, b = s.withLossScale(k), plain.withLossScale(k)
		}
		for bi, br := range s.net.branches {
			if len(br.chains) == 0 {
				continue
			}
			for _, mf := range []float64{3e-3, -3e-3, 1e-6, 0.2} {
				for _, x := range []float64{0, -0.05, 0.2} { // 0.2: two-phase, marched tube by tube
					got, gg := a.branchParts(bi, mf, x, nil)
					want, wg := b.branchParts(bi, mf, x, nil)
					if d := math.Abs(got - want); d > 1e-9*math.Max(1, math.Abs(want)) {
						t.Errorf("branch %d, flow %g, x %g, scale %g: collapsed Δp %.15g, tube by tube %.15g", bi, mf, x, k, got, want)
					}
					if d := math.Abs(gg - wg); d > 1e-9*math.Max(1, math.Abs(wg)) {
						t.Errorf("branch %d, flow %g, x %g: collapsed gravity %.15g, tube by tube %.15g", bi, mf, x, gg, wg)
					}
				}
			}
		}
	}
}

// The whole estimate, tilt limits included, is the same with and without
// collapsed chains, to the solver's tolerance.
func TestChainEstimateUnchanged(t *testing.T) {
	m := lang.LoadSource("chain.loop", loopgen.Network(300, 3), lang.OSFS{})
	with := estimate(t, m, Options{Workers: 1})
	old := chainMin
	chainMin = math.MaxInt
	defer func() { chainMin = old }()
	without := estimate(t, m, Options{Workers: 1})
	for i, a := range with.Loops[0].Cases {
		b := without.Loops[0].Cases[i]
		if !a.Circulates || !b.Circulates {
			t.Fatalf("case %s circulates %v / %v", a.Case, a.Circulates, b.Circulates)
		}
		if d := math.Abs(a.MassFlow-b.MassFlow) / b.MassFlow; d > 1e-6 {
			t.Errorf("case %s: flow %.9g with chains, %.9g without", a.Case, a.MassFlow, b.MassFlow)
		}
		if a.Tilt == nil || b.Tilt == nil {
			t.Fatalf("case %s: no tilt limits", a.Case)
		}
		for _, lim := range [][2]*float64{{a.Tilt.PitchUp, b.Tilt.PitchUp}, {a.Tilt.PitchDown, b.Tilt.PitchDown},
			{a.Tilt.RollLeft, b.Tilt.RollLeft}, {a.Tilt.RollRight, b.Tilt.RollRight}} {
			if (lim[0] == nil) != (lim[1] == nil) {
				t.Errorf("case %s: limits %+v, without chains %+v", a.Case, a.Tilt, b.Tilt)
				continue
			}
			if lim[0] != nil && math.Abs(*lim[0]-*lim[1]) > 2*tiltTol {
				t.Errorf("case %s: limit %.4f°, without chains %.4f°", a.Case, *lim[0]*180/math.Pi, *lim[1]*180/math.Pi)
			}
		}
	}
}

func mustMethods(t *testing.T, m *lang.Model) MethodsUsed {
	t.Helper()
	mu, err := chooseMethods(m.Methods, Options{})
	if err != nil {
		t.Fatal(err)
	}
	return mu
}

// The gravity-only march of the head at vanishing flow takes exactly the
// gravity term of the full march, through liquid, two-phase and dry cells
// and across the phase boundaries inside a heated tube.
func TestGravityOnlyMarch(t *testing.T) {
	m := lang.Load("../../testdata/examples/ferry-cabinet.loop", lang.OSFS{})
	p := prepare(m, m.Loops[0], mustMethods(t, m))
	var cr CaseResult
	s, _ := p.newState(point{c: m.Cases[0], roll: 0.4}, &cr)
	if s == nil || p.net.ring {
		t.Fatal("no network state")
	}
	for bi := range s.net.branches {
		for _, mf := range []float64{1e-6, 2e-3, 0.05, -0.01} {
			for _, x := range []float64{-0.02, 0, 0.4, 1.3} {
				var want float64
				s.branchDP(bi, mf, x, func(_ int, _, _, _, _ float64, q parts) { want += q.grav })
				if got := s.branchGrav(bi, mf, x); got != want {
					t.Errorf("branch %d, flow %g, x %g: gravity-only %.17g, full march %.17g", bi, mf, x, got, want)
				}
			}
		}
	}
}
