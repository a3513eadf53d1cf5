package vary

import (
	"context"
	"testing"

	"circa/lang"
)

// BenchmarkSweep sweeps the rack-door example's lift over eight values.
func BenchmarkSweep(b *testing.B) {
	m := lang.Load(rackDoor, nil)
	a, err := Parse("lift=0.6m..1.6m:8")
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Run(context.Background(), m, []Axis{a}, Options{}); err != nil {
			b.Fatal(err)
		}
	}
}
