package flow

import (
	"encoding/json"
	"math"
	"math/rand"
	"strings"
	"testing"

	"circa/lang"
	"circa/lang/loopgen"
)

func TestSanitize(t *testing.T) {
	lr := LoopResult{Loop: "x", Cases: []CaseResult{{MassFlow: math.NaN(), Components: []ComponentState{{XOut: math.Inf(1)}}}}}
	finishLoop(&lr)
	if lr.Cases[0].MassFlow != 0 || lr.Cases[0].Components[0].XOut != math.MaxFloat64 || !hasFinding(lr.Findings, RuleNonFinite, "") {
		t.Errorf("sanitize left %+v", lr)
	}
}

// Every method combination, and every generated network size, gives a
// finite result without panicking.
func TestMethodsAndNetworks(t *testing.T) {
	m := ringModel(t, "800 W")
	var flows []float64
	for _, v := range []string{"rouhani_axelsson", "homogeneous", "zivi", "chisholm", "rouhani-axelsson-horizontal"} {
		for _, f := range []string{"muller_steinhagen_heck", "friedel", "lockhart_martinelli", "homogeneous_mcadams", "homogeneous_cicchitti", "homogeneous_dukler"} {
			c := only(t, estimate(t, m, Options{NoTilt: true, Void: v, Friction: f}))
			if !c.Circulates {
				t.Errorf("%s/%s: no circulation: %s", v, f, c.Reason)
			}
			flows = append(flows, c.MassFlow)
		}
	}
	if flows[0] == flows[len(flows)-1] {
		t.Error("the methods do not change the estimate")
	}
	if _, err := Estimate(m, Options{Void: "slip"}); err == nil {
		t.Error("an unknown void method is accepted")
	}
	for _, sz := range [][2]int{{4, 1}, {7, 2}, {12, 3}, {25, 6}, {60, 15}} {
		mm := lang.LoadSource("g.loop", loopgen.Network(sz[0], sz[1]), lang.OSFS{})
		r := estimate(t, mm, Options{NoTilt: true})
		for _, c := range r.Loops[0].Cases {
			if c.Circulates && (c.Totals.EnergyGap > 1e-9 || c.Totals.MassGap > 1e-9) {
				t.Errorf("network %v case %s: energy gap %g, mass gap %g", sz, c.Case, c.Totals.EnergyGap, c.Totals.MassGap)
			}
		}
	}
}

// Unequal parallel branches: the solution balances the momentum around
// every cycle and conserves mass and energy.
func TestUnequalNetwork(t *testing.T) {
	mm := lang.LoadSource("g.loop", loopgen.Network(30, 9), lang.OSFS{})
	i := 0
	for _, c := range mm.Loops[0].Components {
		if c.Kind == lang.Evaporator {
			c.Heat.SI = 50 + 40*float64(i%4)
			i++
		}
	}
	for _, cs := range mm.Cases {
		cs.Heat = nil
	}
	r := estimate(t, mm, Options{NoTilt: true})
	c := r.Loops[0].Cases[0]
	if !c.Circulates || c.Iterations > 20 {
		t.Fatalf("circulates %v after %d steps: %s", c.Circulates, c.Iterations, c.Reason)
	}
	if c.Totals.EnergyGap > 1e-9 || c.Totals.MassGap > 1e-9 {
		t.Errorf("energy gap %g, mass gap %g", c.Totals.EnergyGap, c.Totals.MassGap)
	}
	// The flow-weighted pressure changes close around the loop.
	tot := c.Totals
	if net := tot.Friction + tot.Local + tot.Accel - tot.Gravity; math.Abs(net) > 1e-6*tot.Gravity {
		t.Errorf("flow-weighted pressure changes do not close: %g Pa", net)
	}
	// More heat, less flow in a branch: the branches differ.
	var lo, hi float64 = math.Inf(1), 0
	for _, cs := range c.Components {
		if cs.Kind == "evaporator" {
			lo, hi = math.Min(lo, cs.MassFlow), math.Max(hi, cs.MassFlow)
		}
	}
	if hi-lo < 1e-6 {
		t.Errorf("unequal loads give equal branch flows %g", hi)
	}
}

// Mutated inputs never panic and never give non-finite numbers.
func TestNoPanic(t *testing.T) {
	base := strings.ReplaceAll(ring, "HEAT", "800 W")
	muts := []struct{ from, to string }{
		{"bore 10 mm; heat", "bore 0 mm; heat"},
		{"bore 12 mm", "bore 1e-9 m"},
		{"loss 1 }", "loss 1e12 }"},
		{"heat evap 800 W }", "heat evap 1e9 W }"},
		{"heat evap 800 W }", "heat evap 800 W; accel (0, 0, -1) gn }"},
		{"heat evap 800 W }", "heat evap 800 W; accel (0, 0, -1e6) gn }"},
		{"heat evap 800 W }", "heat evap 800 W; pitch 180 deg }"},
		{"heat evap 800 W }", "heat evap 800 W; saturation -100 degC }"},
		{"conductance 150 W/K", "conductance 1e-9 W/K"},
		{"conductance 150 W/K; sink 25 degC", "subcool 500 K"},
		{"fluid R134a", "fluid nosuchfluid"},
		{"length 0.3 m; bore 10 mm; heat", "length 1e-9 m; bore 10 mm; heat"},
		{"length 1.5 m", "length 1e6 m"},
	}
	for _, mu := range muts {
		src := strings.Replace(base, mu.from, mu.to, 1)
		m := lang.LoadSource("../../testdata/flow/test.loop", []byte(src), lang.OSFS{})
		estimate(t, m, Options{}) // encodes as JSON: no NaN or Inf
	}
}

// A sweep evaluates every grid point and reports the worst case per margin.
func TestSweepWorst(t *testing.T) {
	m := ringModel(t, "800 W")
	sw := &Sweep{Pitch: []float64{0, 0.2, 0.4}, Roll: []float64{-0.3, 0.3}}
	r := estimate(t, m, Options{NoTilt: true, Sweep: sw})
	l := r.Loops[0]
	if len(l.Cases) != 1+6 {
		t.Fatalf("%d points, want 7", len(l.Cases))
	}
	for _, w := range l.Worst {
		for _, c := range l.Cases {
			for _, mg := range c.Margins {
				if mg.Margin == w.Margin && mg.Use > w.Use {
					t.Errorf("worst %s %g, but case %+v uses %g", w.Margin, w.Use, c.Pitch, mg.Use)
				}
			}
		}
	}
}

// Three balances, as an excess head falling, rising and falling again
// with flow (a Ledinegg S-curve): all are found, the middle one is
// unstable (dE/dṁ > 0), and Brent's method finds each to 1e-12.
func TestFindRoots(t *testing.T) {
	a, b, c := 0.003, 0.01, 0.04
	E := func(m float64) float64 { return -(m - a) * (m - b) * (m - c) * 1e8 }
	roots, _ := findRoots(E, grid)
	if len(roots) != 3 {
		t.Fatalf("roots %+v, want 3", roots)
	}
	for i, want := range []float64{a, b, c} {
		if math.Abs(roots[i].m-want) > 1e-12 {
			t.Errorf("root %d at %g, want %g", i, roots[i].m, want)
		}
	}
	if !(roots[0].slope < 0 && roots[1].slope > 0 && roots[2].slope < 0) {
		t.Errorf("slopes %+v: want stable, unstable, stable", roots)
	}
}

// Randomly damaged loop texts (lines dropped, units and signs changed,
// components reconnected) never panic and always encode as JSON.
func TestMutations(t *testing.T) {
	rng := rand.New(rand.NewSource(1))
	srcs := []string{string(loopgen.Network(12, 3)), string(loopgen.Network(20, 1)), strings.ReplaceAll(ring, "HEAT", "800 W")}
	for it := 0; it < 200; it++ {
		lines := strings.Split(srcs[it%len(srcs)], "\n")
		for k := 0; k < 1+rng.Intn(3); k++ {
			i := rng.Intn(len(lines))
			switch rng.Intn(4) {
			case 0:
				lines = append(lines[:i], lines[i+1:]...)
			case 1:
				lines[i] = strings.Replace(lines[i], "mm", "m", 1)
			case 2:
				lines[i] = strings.Replace(lines[i], "0", "-", 1)
			case 3:
				lines[i] = strings.Replace(lines[i], "to ", "to split", 1)
			}
		}
		src := strings.Join(lines, "\n")
		m := lang.LoadSource("f.loop", []byte(src), lang.OSFS{})
		func() {
			defer func() {
				if p := recover(); p != nil {
					t.Fatalf("panic %v on\n%s", p, src)
				}
			}()
			r, err := Estimate(m, Options{NoTilt: it%10 != 0})
			if err != nil {
				return
			}
			if _, err := json.Marshal(r); err != nil {
				t.Fatalf("%v on\n%s", err, src)
			}
		}()
	}
}
