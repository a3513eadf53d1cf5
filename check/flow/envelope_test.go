package flow

import (
	"math"
	"strings"
	"testing"
)

// envelopeRing is the ring tipped and accelerated within a box of pitch,
// roll and lateral acceleration.
const envelopeBox = `
case box {
  heat evap 300 W
  envelope {
    pitch -20 deg 30 deg
    roll 25 deg
    accel_y -0.3 gn 0.2 gn
  }
}
`

// boxGrid is the brute-force check of the search: every combination of
// n values per axis across the box.
func boxGrid(n int) *Sweep {
	sw := &Sweep{}
	for i := 0; i < n; i++ {
		f := float64(i) / float64(n-1)
		sw.Pitch = append(sw.Pitch, (-20+50*f)*math.Pi/180)
		sw.Roll = append(sw.Roll, (-25+50*f)*math.Pi/180)
		sw.Accel = append(sw.Accel, [3]float64{0, (-0.3 + 0.5*f) * gn, 0})
	}
	return sw
}

// The envelope search finds, for every margin, a combination at least as
// bad as the worst of a full 9 × 9 × 9 grid over the same box (within 1 %
// of the limit's use), with fewer solves.
func TestEnvelopeAgainstGrid(t *testing.T) {
	m := load(t, strings.ReplaceAll(ring, "HEAT", "300 W")+envelopeBox)
	r := estimate(t, m, Options{Case: "box", NoTilt: true})
	box := caseNamed(t, r, "box")
	env := box.Envelope
	if env == nil || len(env.Worst) == 0 {
		t.Fatalf("no envelope result: %+v", box)
	}
	const n = 9
	g := estimate(t, m, Options{Case: "box", NoTilt: true, Sweep: boxGrid(n)})
	gridWorst := map[string]float64{}
	points := 0
	for _, c := range g.Loops[0].Cases {
		if !c.Grid {
			continue
		}
		points++
		for _, mg := range c.Margins {
			k := mg.Margin + "/" + mg.Component
			if u, ok := gridWorst[k]; !ok || mg.Use > u {
				gridWorst[k] = mg.Use
			}
		}
	}
	if points != n*n*n {
		t.Fatalf("%d grid points, want %d", points, n*n*n)
	}
	found := map[string]EnvelopeWorst{}
	for _, w := range env.Worst {
		found[w.Margin.Margin+"/"+w.Component] = w
	}
	for k, gu := range gridWorst {
		w, ok := found[k]
		if !ok {
			t.Errorf("%s: the grid has it (use %.4g), the search does not", k, gu)
			continue
		}
		if w.Use < gu-0.01*math.Max(1, math.Abs(gu)) {
			t.Errorf("%s: search's worst use %.5g at %+v, below the grid's %.5g", k, w.Use, w.At, gu)
		}
		// The reported worst lies inside the box.
		if w.At.Pitch < -20*math.Pi/180-1e-12 || w.At.Pitch > 30*math.Pi/180+1e-12 ||
			math.Abs(w.At.Roll) > 25*math.Pi/180+1e-12 || w.At.Accel[1] < -0.3*gn-1e-9 || w.At.Accel[1] > 0.2*gn+1e-9 {
			t.Errorf("%s: worst at %+v, outside the box", k, w.At)
		}
	}
	if env.Estimates >= n*n*n {
		t.Errorf("the search took %d solves, no fewer than the %d-point grid", env.Estimates, n*n*n)
	}
	t.Logf("search: %d solves; grid: %d", env.Estimates, n*n*n)
}

// A box reaching past the attitude where circulation stops says so.
func TestEnvelopeStops(t *testing.T) {
	src := strings.ReplaceAll(ring, "HEAT", "300 W") + `
case steep { heat evap 300 W; envelope { pitch -5 deg 89 deg } }
`
	r := estimate(t, load(t, src), Options{Case: "steep"})
	c := caseNamed(t, r, "steep")
	if c.Envelope == nil || c.Envelope.Stops == nil {
		t.Fatalf("no stop found in a box reaching 89° of pitch: %+v", c.Envelope)
	}
	if !hasFinding(c.Findings, RuleNoCirculation, "") {
		t.Errorf("no no-circulation finding: %+v", c.Findings)
	}
}

func BenchmarkEnvelopeSearch(b *testing.B) {
	m := load(b, strings.ReplaceAll(ring, "HEAT", "300 W")+envelopeBox)
	b.ReportAllocs()
	for i := 0; i < b.N; i++ {
		if _, err := Estimate(m, Options{Case: "box", NoTilt: true}); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkEnvelopeGrid(b *testing.B) {
	m := load(b, strings.ReplaceAll(ring, "HEAT", "300 W")+"\ncase plain { heat evap 300 W }\n")
	sw := boxGrid(9)
	b.ReportAllocs()
	for i := 0; i < b.N; i++ {
		if _, err := Estimate(m, Options{Case: "plain", NoTilt: true, Sweep: sw}); err != nil {
			b.Fatal(err)
		}
	}
}

// The pool-boiling critical heat flux grows as the body force to the power
// 1/4 (Lienhard & Dhir 1973, as Zuber 1959), so its ratio is worst where
// the body force is weakest: pitched 10°, at the forward acceleration that
// cancels gravity's forward component, g_n·sin 10° = 0.1736 g_n, an
// interior point the bracketing must close on (to 1 % of the 1 g_n range).
func TestEnvelopeInteriorWorst(t *testing.T) {
	src := strings.ReplaceAll(ring, "HEAT", "300 W") + `
case pitched { heat evap 300 W; envelope { pitch 10 deg 10 deg; accel_x 0.5 gn } }
`
	r := estimate(t, load(t, src), Options{Case: "pitched", NoTilt: true})
	c := caseNamed(t, r, "pitched")
	if c.Envelope == nil {
		t.Fatal("no envelope")
	}
	for _, w := range c.Envelope.Worst {
		if w.Margin.Margin != MarginCHF {
			continue
		}
		want := math.Sin(10 * math.Pi / 180)
		if got := math.Abs(w.At.Accel[0]) / gn; math.Abs(got-want) > 0.01 {
			t.Errorf("worst CHF ratio at accel_x %.4f g_n, want ±%.4f g_n", w.At.Accel[0]/gn, want)
		}
		return
	}
	t.Fatalf("no CHF margin in %+v", c.Envelope.Worst)
}
