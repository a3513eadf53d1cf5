package picture

import (
	"io"
	"testing"

	"circa/lang"
)

// BenchmarkCirculation is the 30-load sweep behind the circulation curve of
// the rack-door example.
func BenchmarkCirculation(b *testing.B) {
	m := lang.Load(examplePath("rack-door"), nil)
	b.ReportAllocs()
	for b.Loop() {
		if _, err := CirculationOf(m, m.Loops[0], Options{}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkTilt is the two 73-point attitude sweeps of the tilt envelope.
func BenchmarkTilt(b *testing.B) {
	m := lang.Load(examplePath("rack-door"), nil)
	b.ReportAllocs()
	for b.Loop() {
		if _, err := TiltOf(m, m.Loops[0], "", 0); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkRenderSVG draws every figure of the ferry example (a network of
// two parallel evaporators) to SVG.
func BenchmarkRenderSVG(b *testing.B) {
	m := lang.Load(examplePath("ferry-cabinet"), nil)
	figs, errs := Figures(m, Options{})
	if len(errs) > 0 {
		b.Fatal(errs)
	}
	b.ReportAllocs()
	for b.Loop() {
		for _, f := range figs {
			if err := f.Render(io.Discard, "svg"); err != nil {
				b.Fatal(err)
			}
		}
	}
}
