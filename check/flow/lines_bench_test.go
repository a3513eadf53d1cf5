package flow

import (
	"testing"

	"circa/lang"
	"circa/lang/loopgen"
)

// BenchmarkLines300 is the whole estimate, tilt limits included, of the
// generated 300-line file the language server benchmarks edit.
func BenchmarkLines300(b *testing.B) {
	m := lang.LoadSource("bench.loop", loopgen.Lines(300), lang.OSFS{})
	u0 := cpuTime()
	for b.Loop() {
		if _, err := Estimate(m, Options{Workers: 1}); err != nil {
			b.Fatal(err)
		}
	}
	cpuPerOp(b, u0)
}
