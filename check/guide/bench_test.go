package guide

import (
	"context"
	"path/filepath"
	"strings"
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
		})
	}
}
