package suggest

import (
	"context"
	"testing"

	"circa/check"
	"circa/check/guide"
	"circa/lang"
)

// BenchmarkFixes finds the quick fixes of every margin warning of the
// ferry example, as the editor does in the background after its
// diagnostics (the guidance for every margin computed once, outside the
// loop).
func BenchmarkFixes(b *testing.B) {
	m := lang.Load("../../testdata/examples/ferry-cabinet.loop", nil)
	var warned []lang.Diagnostic
	for _, d := range check.Run(m, check.Options{NoTilt: true}) {
		if IsMargin(d) {
			warned = append(warned, d)
		}
	}
	every, err := guide.Compute(context.Background(), m, guide.Options{})
	if err != nil || len(warned) == 0 {
		b.Fatalf("%v, %d warnings", err, len(warned))
	}
	b.ReportAllocs()
	for b.Loop() {
		for _, d := range warned {
			if _, err := Fixes(context.Background(), m, d, every, Options{}); err != nil {
				b.Fatal(err)
			}
		}
	}
}
