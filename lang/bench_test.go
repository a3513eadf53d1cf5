package lang_test

import (
	"testing"

	"circa/lang"
	"circa/lang/loopgen"
)

// benchLoad parses and resolves src once per iteration and fails on any
// finding, so the benchmark measures a clean file.
func benchLoad(b *testing.B, src []byte) {
	b.Helper()
	if m := lang.LoadSource("bench.loop", src, nil); len(m.Diags) > 0 {
		b.Fatalf("generated text has findings: %s", m.Diags[0].Message())
	}
	b.SetBytes(int64(len(src)))
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		lang.LoadSource("bench.loop", src, nil)
	}
}

// BenchmarkParseResolve300 loads a realistic 300-line file (target: under
// 2 ms, the budget for re-checking on every keystroke).
func BenchmarkParseResolve300(b *testing.B) { benchLoad(b, loopgen.Lines(300)) }

// BenchmarkParseResolve5000 loads one network of 5,000 components (target:
// under 100 ms).
func BenchmarkParseResolve5000(b *testing.B) { benchLoad(b, loopgen.Network(5000, 50)) }

// BenchmarkParse5000 and BenchmarkFormat5000 split the cost of the large file.
func BenchmarkParse5000(b *testing.B) {
	src := loopgen.Network(5000, 50)
	b.SetBytes(int64(len(src)))
	b.ReportAllocs()
	for b.Loop() {
		lang.Parse("bench.loop", src)
	}
}

func BenchmarkFormat5000(b *testing.B) {
	f := lang.Parse("bench.loop", loopgen.Network(5000, 50))
	b.ReportAllocs()
	for b.Loop() {
		if _, err := lang.Format(f); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkNewMapper indexes the line starts of the large file, which the
// server does on every edit.
func BenchmarkNewMapper(b *testing.B) {
	src := loopgen.Network(5000, 50)
	b.SetBytes(int64(len(src)))
	b.ReportAllocs()
	for b.Loop() {
		lang.NewMapper(src)
	}
}
