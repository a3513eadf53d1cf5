package check

import (
	"syscall"
	"testing"
	"time"

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

// BenchmarkCheckExample runs every rule, margins and tilt limits included,
// on each shipped example, as `circa check FILE` does.
func BenchmarkCheckExample(b *testing.B) {
	for _, name := range []string{"rack-door", "forestry-inverter", "ferry-cabinet"} {
		b.Run(name, func(b *testing.B) {
			path := "../testdata/examples/" + name + ".loop"
			m := lang.Load(path, lang.OSFS{})
			for _, d := range m.Diags {
				if d.Severity == lang.Error {
					b.Fatal(d.Message())
				}
			}
			b.ReportAllocs()
			u0 := cpuTime()
			for b.Loop() {
				Run(m, Options{})
			}
			cpuPerOp(b, u0)
		})
	}
}

// BenchmarkCheckNetwork5000 runs every rule, margins and tilt limits
// included, on one loop of 5,000 components with 8 parallel evaporator
// branches, as the language server's complete check does (target: under
// 150 ms).
func BenchmarkCheckNetwork5000(b *testing.B) {
	m := lang.LoadSource("net.loop", loopgen.Network(5000, 8), nil)
	b.ReportAllocs()
	u0 := cpuTime()
	for b.Loop() {
		Run(m, Options{})
	}
	cpuPerOp(b, u0)
}

// cpuTime is the process's CPU time so far: with cpuPerOp it gives the CPU
// an operation costs, which a loaded machine inflates far less than the
// elapsed time.
func cpuTime() time.Duration {
	var ru syscall.Rusage
	syscall.Getrusage(syscall.RUSAGE_SELF, &ru)
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}

// cpuPerOp reports the CPU per operation since u0, in milliseconds.
func cpuPerOp(b *testing.B, u0 time.Duration) {
	b.ReportMetric(float64((cpuTime()-u0).Microseconds())/1000/float64(b.N), "cpu-ms/op")
}
