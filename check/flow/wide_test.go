package flow

import (
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"circa/lang"
	"circa/lang/loopgen"
)

// ladder is a network of n evaporators between a liquid header and a vapour
// header, each header a chain of junctions 100 mm apart, fed by one
// downcomer and drained by one riser: n cycles and 2n−2 junctions. Loads
// are drawn from r.
func ladder(r *rand.Rand, n int) []byte {
	var b strings.Builder
	b.WriteString("part tube {\n  bore 10 mm\n  roughness 1.5 um\n}\n\nloop net {\n  fluid R1233zd(E)\n  charge 2 kg\n  design_pressure 6 bar(g)\n\n")
	top := 100 * (n - 1)
	kw := func(i int) string {
		if i > 0 {
			return "junction"
		}
		return "node"
	}
	for i := 0; i < n; i++ {
		fmt.Fprintf(&b, "  %s l%d at (0, 0, %d) mm\n  %s r%d at (0, 0, %d) mm\n", kw(i), i, 100*i, kw(i), i, 100*i+300)
	}
	fmt.Fprintf(&b, "  node cond_in at (0, 0, %d) mm\n  node cond_out at (0, 0, %d) mm\n\n", top+1500, top+1200)
	pipe := func(kind, name, from, to string, rise int, extra string) {
		fmt.Fprintf(&b, "  %s %s from %s to %s {\n    use tube\n    length %d mm\n    rise %d mm\n%s  }\n", kind, name, from, to, abs(rise)+200, rise, extra)
	}
	var heat strings.Builder
	for i := 0; i < n; i++ {
		w := 5 + 10*r.Float64()
		pipe("evaporator", fmt.Sprintf("evap%d", i), fmt.Sprintf("l%d", i), fmt.Sprintf("r%d", i), 300,
			fmt.Sprintf("    heated_length 0.2 m\n    wetted_area 0.01 m²\n    wall_limit 85 °C\n    heat %.3f W\n", w))
		fmt.Fprintf(&heat, "  heat evap%d %.3f W\n", i, w)
		if i > 0 {
			pipe("pipe", fmt.Sprintf("lh%d", i), fmt.Sprintf("l%d", i), fmt.Sprintf("l%d", i-1), -100, "")
			pipe("pipe", fmt.Sprintf("rh%d", i), fmt.Sprintf("r%d", i-1), fmt.Sprintf("r%d", i), 100, "")
		}
	}
	pipe("pipe", "riser", fmt.Sprintf("r%d", n-1), "cond_in", 1200, "")
	pipe("condenser", "cond", "cond_in", "cond_out", -300, "    conductance 20 W/K\n")
	pipe("pipe", "down", "cond_out", fmt.Sprintf("l%d", n-1), -1200, "")
	fmt.Fprintf(&b, "}\n\ncase nominal nominal {\n%s  sink cond 30 °C\n}\n", heat.String())
	return []byte(b.String())
}

func abs(x int) int {
	if x < 0 {
		return -x
	}
	return x
}

// bothPaths estimates m with the Newton steps over cycle flows (dense) and
// over branches and junctions (sparse).
func bothPaths(t *testing.T, m *lang.Model, opts Options) (dense, wide *CaseResult) {
	t.Helper()
	saved := sparseMinCycles
	defer func() { sparseMinCycles = saved }()
	run := func(min int) *CaseResult {
		sparseMinCycles = min
		r, err := Estimate(m, opts)
		if err != nil {
			t.Fatal(err)
		}
		return &r.Loops[0].Cases[0]
	}
	return run(math.MaxInt), run(1)
}

// The sparse Newton steps reach the balance the dense ones reach, to 10⁻⁹
// of the largest flow, on random networks of both shapes: parallel branches
// between two headers, and ladders of many junctions.
func TestWideMatchesDense(t *testing.T) {
	r := rand.New(rand.NewPCG(7, 11))
	for trial := 0; trial < 12; trial++ {
		var src []byte
		cycles := 2 + r.IntN(40)
		if trial%2 == 0 {
			src = loopgen.Network(cycles*(3+r.IntN(4)), cycles)
		} else {
			src = ladder(r, cycles)
		}
		m := lang.LoadSource("net.loop", src, lang.OSFS{})
		for _, d := range m.Diags {
			if d.Severity == lang.Error {
				t.Fatalf("trial %d: %s", trial, d.Message())
			}
		}
		if trial%2 == 0 {
			unequalB(m)
		}
		opts := Options{Case: m.Cases[0].Name, NoTilt: true, Workers: 1}
		d, w := bothPaths(t, m, opts)
		if d.Circulates && !w.Circulates {
			t.Fatalf("trial %d (%d cycles): circulates %v dense, %v sparse (%s / %s)", trial, cycles, d.Circulates, w.Circulates, d.Reason, w.Reason)
		}
		if !d.Circulates {
			t.Logf("trial %d (%d cycles): no circulation (%s; sparse: %v %s)", trial, cycles, d.Reason, w.Circulates, w.Reason)
			continue
		}
		scale := 0.0
		for _, c := range d.Components {
			scale = math.Max(scale, math.Abs(c.MassFlow))
		}
		if rel := math.Abs(d.MassFlow-w.MassFlow) / d.MassFlow; rel > 1e-9 {
			t.Errorf("trial %d (%d cycles): loop flow %.12g dense, %.12g sparse", trial, cycles, d.MassFlow, w.MassFlow)
		}
		for i, c := range d.Components {
			if diff := math.Abs(c.MassFlow - w.Components[i].MassFlow); diff > 1e-9*scale {
				t.Errorf("trial %d (%d cycles): %s flow %.12g dense, %.12g sparse", trial, cycles, c.Component, c.MassFlow, w.Components[i].MassFlow)
			}
		}
	}
}

// The sparse network of slopes gives the dense one's external slope on
// random networks of many junctions (a ring of junctions with chords),
// bridges included.
func TestExternalSlopeSparse(t *testing.T) {
	r := rand.New(rand.NewPCG(5, 9))
	for trial := 0; trial < 6; trial++ {
		nj := sparseMinJunctions + r.IntN(40)
		var from, to []int
		var slopes []float64
		add := func(u, v int) {
			from, to = append(from, u), append(to, v)
			s := math.Pow(10, 6*r.Float64())
			if r.IntN(8) == 0 {
				s = -s // a falling branch curve
			}
			slopes = append(slopes, s)
		}
		for j := 0; j+1 < nj; j++ {
			add(j, j+1) // a chain: every branch a bridge until chords close it
		}
		for k := r.IntN(nj); k > 0; k-- {
			add(r.IntN(nj), r.IntN(nj))
		}
		for skip := range slopes {
			a, b := from[skip], to[skip]
			want := externalSlopeDense(nj, from, to, slopes, skip, a, b)
			got := externalSlopeWith(nj, from, to, slopes, skip, a, b, true)
			if math.IsInf(want, 1) != math.IsInf(got, 1) || !math.IsInf(want, 1) && math.Abs(got-want) > 1e-8*math.Abs(want) {
				t.Fatalf("trial %d, branch %d (%d→%d of %d): %g sparse, %g dense", trial, skip, a, b, nj, got, want)
			}
		}
	}
}

// externalSlopeDense is externalSlope with the dense solve at any size.
func externalSlopeDense(nj int, from, to []int, slopes []float64, skip, a, b int) float64 {
	return externalSlopeWith(nj, from, to, slopes, skip, a, b, false)
}

// The note on a starved evaporator lists the flows of up to
// maxSplitListed parallel branches and gives the range of more: listing
// every branch in every evaporator's finding grew as the square of them.
func TestStarvedNoteSummarisesManyBranches(t *testing.T) {
	for _, cycles := range []int{maxSplitListed, 3 * maxSplitListed} {
		m := lang.LoadSource("net.loop", loopgen.Network(3*cycles+10, cycles), lang.OSFS{})
		r, err := Estimate(m, Options{Case: m.Cases[0].Name, NoTilt: true, Workers: 1})
		if err != nil {
			t.Fatal(err)
		}
		listed, ranged := 0, 0
		for _, f := range r.Loops[0].Cases[0].Findings {
			if strings.Contains(f.Message, "; the parallel branches split the flow ") {
				listed++
			}
			if strings.Contains(f.Message, fmt.Sprintf("; %d parallel branches split the flow, ", cycles)) {
				ranged++
			}
			if len(f.Message) > 2000 {
				t.Errorf("%d branches: a finding of %d bytes", cycles, len(f.Message))
			}
		}
		if cycles <= maxSplitListed && (listed == 0 || ranged > 0) || cycles > maxSplitListed && (ranged == 0 || listed > 0) {
			t.Errorf("%d branches: %d findings list the split, %d give its range", cycles, listed, ranged)
		}
	}
}
