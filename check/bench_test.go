package check

import (
	"testing"

	"circa/lang"
	"circa/lang/loopgen"
)

// The generated network closes exactly and is well formed, so the
// structural rules find nothing worse than notes in it.
func TestGeneratedNetworkIsClean(t *testing.T) {
	m := lang.LoadSource("net.loop", loopgen.Network(5000, 200), nil)
	if len(m.Loops) != 1 || len(m.Loops[0].Components) != 5000 {
		t.Fatalf("generated %d loops", len(m.Loops))
	}
	g := NewGraph(m.Loops[0])
	if len(g.Chords) != 200 {
		t.Errorf("%d independent cycles, want 200", len(g.Chords))
	}
	for _, d := range Run(m, Options{SkipEstimates: true}) {
		if d.Severity <= lang.Warning {
			t.Errorf("%s: %s", d.Rule, d.Message())
		}
	}
}

// BenchmarkStructural runs every structural rule on a 5,000-component
// network with 200 independent cycles (target: under 50 ms).
func BenchmarkStructural(b *testing.B) {
	m := lang.LoadSource("net.loop", loopgen.Network(5000, 200), nil)
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		Run(m, Options{SkipEstimates: true})
	}
}
