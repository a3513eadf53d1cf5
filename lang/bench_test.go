package lang_test

import (
	"bytes"
	"fmt"
	"runtime"
	"strings"
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

// BenchmarkReparse5000 reparses the 5,000-component file after a one-digit
// edit of its first parameter: "same-length" replaces the digit, "insert"
// adds one, which moves every statement after it.
func BenchmarkReparse5000(b *testing.B) {
	src := loopgen.Network(5000, 50)
	old := lang.Parse("bench.loop", src)
	at := bytes.Index(src, []byte("= 10 mm")) + 2
	for _, tc := range []struct {
		name string
		ins  string
		cut  int
	}{{"same-length", "2", 1}, {"insert", "2", 0}} {
		next := append(append(append([]byte(nil), src[:at]...), tc.ins...), src[at+tc.cut:]...)
		m := lang.NewMapper(next)
		b.Run(tc.name, func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				lang.Reparse("bench.loop", old, next, m)
			}
		})
	}
}

// The vapour-line walk on a loop whose riser is 20,000 pipes in series: it
// must grow with the size of the loop, not with its square.
func BenchmarkVapourNodesLongRiser(b *testing.B) {
	const n = 20000
	var src bytes.Buffer
	src.WriteString("loop l {\n  fluid water\n")
	for i := 0; i <= n+1; i++ {
		fmt.Fprintf(&src, "  node n%d\n", i)
	}
	src.WriteString("  evaporator e from n0 to n1 { length 0.1 m; rise 0.1 m; bore 8 mm }\n")
	for i := 1; i <= n; i++ {
		fmt.Fprintf(&src, "  pipe p%d from n%d to n%d { length 0.1 m; rise 0.1 m; bore 8 mm }\n", i, i, i+1)
	}
	fmt.Fprintf(&src, "  condenser k from n%d to n0 { length 0.1 m; bore 8 mm }\n}\n", n+1)
	m := lang.LoadSource("bench.loop", src.Bytes(), nil)
	if len(m.Loops) != 1 {
		b.Fatalf("%d loops", len(m.Loops))
	}
	l := m.Loops[0]
	if v := l.VapourNodes(); !v[n/2] {
		b.Fatalf("node n%d of the riser is not on the vapour line", n/2)
	}
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		l.VapourNodes()
	}
}

// BenchmarkParseLineOfBraces parses one line of 20,000 '{': each is a bad
// statement opening a block, and its explanation must not lex the rest of
// the line again (that made such a line quadratic).
func BenchmarkParseLineOfBraces(b *testing.B) {
	src := []byte(strings.Repeat("{", 20000))
	b.SetBytes(int64(len(src)))
	for b.Loop() {
		if f := lang.Parse("braces.loop", src); len(f.Errors) == 0 {
			b.Fatal("no error")
		}
	}
}

// hostileLines are 1 MB texts that a careless or hostile user may feed the
// checker: each must parse in time and memory linear in its size.
var hostileLines = []struct{ name, src string }{
	{"braces", strings.Repeat("{", 1<<20) + "\n"},
	{"closes", strings.Repeat("}", 1<<20) + "\n"},
	{"opens", strings.Repeat("(", 1<<20) + "\n"},
	{"shuts", strings.Repeat(")", 1<<20) + "\n"},
	{"semicolons", strings.Repeat(";", 1<<20) + "\n"},
	{"quotes", strings.Repeat(`"`, 1<<20) + "\n"},
	{"carets", strings.Repeat("^", 1<<20) + "\n"},
	{"equals", strings.Repeat("=", 1<<20) + "\n"},
	{"ones", strings.Repeat("1 ", 1<<19) + "\n"},
	{"nested", "param x = " + strings.Repeat("(", 1<<19) + "1" + strings.Repeat(")", 1<<19) + "\n"},
	{"factors", "param x = 1 m" + strings.Repeat("*m", 1<<19) + "\n"},
	{"blocks", strings.Repeat("a {\n", 1<<18)},
	{"strays", "a" + strings.Repeat(" )", 1<<19) + "\n"},
	// Statements of a million parts, cut at lang.MaxStmtTokens.
	{"words", strings.Repeat("a ", 1<<19) + "\n"},
	{"keys", "param x = 1" + strings.Repeat(" =", 1<<19) + "\n"},
	{"sum", "param a = 1 m" + strings.Repeat(" + 1 m", 1<<17) + " $\n"},
}

// TestHostileLinesMemory checks that parsing each hostile text allocates
// no more than ten times its size: a line of a million bad tokens once
// held a 64-byte token for each of them, 330 MB in all, and a
// line of '{' a million blocks in the tree. Its time is
// BenchmarkHostileLines'.
func TestHostileLinesMemory(t *testing.T) {
	for _, h := range hostileLines {
		src := []byte(h.src)
		var before, after runtime.MemStats
		runtime.GC()
		runtime.ReadMemStats(&before)
		f := lang.Parse("hostile.loop", src)
		runtime.ReadMemStats(&after)
		runtime.KeepAlive(f)
		if got := after.TotalAlloc - before.TotalAlloc; got > 10*uint64(len(src)) {
			t.Errorf("%s: parsing %d bytes allocated %d", h.name, len(src), got)
		}
	}
}

// BenchmarkHostileLines parses each hostile text (see hostileLines).
func BenchmarkHostileLines(b *testing.B) {
	for _, h := range hostileLines {
		src := []byte(h.src)
		b.Run(h.name, func(b *testing.B) {
			b.SetBytes(int64(len(src)))
			b.ReportAllocs()
			for b.Loop() {
				lang.Parse("hostile.loop", src)
			}
		})
	}
}
