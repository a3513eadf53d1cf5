//go:build unix

package guide

import (
	"context"
	"path/filepath"
	"strings"
	"syscall"
	"testing"

	"circa/lang"
)

// BenchmarkExamples computes the feasible ranges and sensitivities of every
// parameter (and each loop's charge) of each shipped example, on every core
// (target < 0.5 s each on 2 cores).
func BenchmarkExamples(b *testing.B) {
	files, err := filepath.Glob("../../testdata/examples/*.loop")
	if err != nil || len(files) == 0 {
		b.Fatal("no examples", err)
	}
	for _, f := range files {
		m := lang.Load(f, nil)
		for _, d := range m.Diags {
			if d.Severity == lang.Error {
				b.Fatalf("%s: %s", f, d.Message())
			}
		}
		b.Run(strings.TrimSuffix(filepath.Base(f), ".loop"), func(b *testing.B) {
			cpu0 := cpuTime()
			for i := 0; i < b.N; i++ {
				g, err := Compute(context.Background(), m, Options{})
				if err != nil {
					b.Fatal(err)
				}
				for _, p := range g.Params {
					if p.Influences && p.Range == nil {
						b.Fatalf("%s: no range", p.Param)
					}
				}
			}
			b.ReportMetric(float64(cpuTime()-cpu0)/float64(b.N), "cpu-ns/op")
		})
	}
}

// cpuTime is the CPU time the process has used, user and system, ns.
func cpuTime() int64 {
	var ru syscall.Rusage
	if syscall.Getrusage(syscall.RUSAGE_SELF, &ru) != nil {
		return 0
	}
	return ru.Utime.Nano() + ru.Stime.Nano()
}

// BenchmarkGuidanceManyParams computes the guidance of a file of 20,000
// parameters, three of which reach the estimate: the others are found
// inert from the references, in time proportional to the file.
func BenchmarkGuidanceManyParams(b *testing.B) {
	m := manyParams(b, 20000)
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if _, err := Compute(context.Background(), m, Options{}); err != nil {
			b.Fatal(err)
		}
	}
}
