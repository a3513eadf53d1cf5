package lsp

import (
	"bytes"
	"context"
	"fmt"
	"os"
	"path/filepath"
	"runtime"
	"runtime/debug"
	"sort"
	"strconv"
	"strings"
	"syscall"
	"testing"
	"time"

	"go.lsp.dev/protocol"

	"circa/lang"
	"circa/lang/loopgen"
)

// benchSession opens one generated document and returns the client, its URI
// and the line and column of a value to edit (the first param's number).
func benchSession(b testing.TB, text []byte, debounce time.Duration, complete bool) (*testClient, string, int, int) {
	c := newTestClient(b, Options{Debounce: debounce, MemoryLimit: MemoryLimit})
	c.srv.onPublish = func(path string, version int32, full bool, n int) {
		c.mu.Lock()
		if c.firstPub == nil {
			c.firstPub = map[int32]time.Time{}
		}
		if _, ok := c.firstPub[version]; !ok {
			c.firstPub[version] = time.Now()
		}
		c.mu.Unlock()
	}
	c.initialize(nil)
	uri := "file:///bench/gen.loop"
	c.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": uri, "languageId": "loop", "version": 1, "text": string(text)}})
	if complete {
		c.settle()
	} else {
		c.settleQuick()
	}
	for i, l := range strings.Split(string(text), "\n") {
		if strings.HasPrefix(l, "param ") {
			if j := strings.Index(l, "= "); j >= 0 {
				return c, uri, i, j + 2
			}
		}
	}
	b.Fatal("no param line to edit")
	return nil, "", 0, 0
}

// editAndWait changes one digit of a parameter and waits until the
// diagnostics of that version are published: with the estimate and every
// rule but the margins (quick), or with the margins too.
func editAndWait(b testing.TB, c *testClient, uri string, version, line, col int, complete bool) {
	digit := strconv.Itoa(1 + version%8)
	c.notify("textDocument/didChange", map[string]any{"textDocument": map[string]any{"uri": uri, "version": version},
		"contentChanges": []any{map[string]any{"range": map[string]any{"start": map[string]int{"line": line, "character": col}, "end": map[string]int{"line": line, "character": col + 1}}, "text": digit}}})
	if complete {
		c.settle()
	} else {
		c.settleQuick()
	}
}

func median(ds []time.Duration) time.Duration {
	sort.Slice(ds, func(i, j int) bool { return ds[i] < ds[j] })
	return ds[len(ds)/2]
}

func benchEdit(b *testing.B, text []byte, complete bool) {
	// As circa serve runs.
	defer debug.SetMemoryLimit(debug.SetMemoryLimit(MemoryLimit))
	c, uri, line, col := benchSession(b, text, -1, complete)
	var ds, first []time.Duration
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		t0 := time.Now()
		editAndWait(b, c, uri, i+2, line, col, complete)
		ds = append(ds, time.Since(t0))
		c.mu.Lock()
		first = append(first, c.firstPub[int32(i+2)].Sub(t0))
		c.mu.Unlock()
	}
	b.StopTimer()
	b.ReportMetric(float64(median(ds).Microseconds())/1000, "ms-median")
	b.ReportMetric(float64(median(first).Microseconds())/1000, "ms-first")
	reportMemory(b)
}

// BenchmarkEditDiagnostics300 is edit → published diagnostics (debounce
// off) on a generated 300-line file: "quick" with every rule but the
// margins and with the estimate hover shows, "complete" with the margins
// (and their tilt-limit search) too.
func BenchmarkEditDiagnostics300(b *testing.B) {
	b.Run("quick", func(b *testing.B) { benchEdit(b, loopgen.Lines(300), false) })
	b.Run("complete", func(b *testing.B) { benchEdit(b, loopgen.Lines(300), true) })
}

// BenchmarkEditDiagnosticsNetwork5000 is the quick edit → diagnostics on
// one loop of 5,000 components.
func BenchmarkEditDiagnosticsNetwork5000(b *testing.B) { benchEdit(b, loopgen.Network(5000, 8), false) }

// BenchmarkInsertDiagnosticsNetwork5000 is BenchmarkEditDiagnosticsNetwork5000
// with edits that change the text's length (a digit typed, then deleted,
// in the file's first parameter), which moves every statement after it.
func BenchmarkInsertDiagnosticsNetwork5000(b *testing.B) {
	defer debug.SetMemoryLimit(debug.SetMemoryLimit(MemoryLimit))
	c, uri, line, col := benchSession(b, loopgen.Network(5000, 8), -1, false)
	var ds, first []time.Duration
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		v := i + 2
		end, text := col, "1"
		if i%2 == 1 {
			end, text = col+1, ""
		}
		t0 := time.Now()
		c.notify("textDocument/didChange", map[string]any{"textDocument": map[string]any{"uri": uri, "version": v},
			"contentChanges": []any{map[string]any{"range": map[string]any{"start": map[string]int{"line": line, "character": col}, "end": map[string]int{"line": line, "character": end}}, "text": text}}})
		c.settleQuick()
		ds = append(ds, time.Since(t0))
		c.mu.Lock()
		first = append(first, c.firstPub[int32(v)].Sub(t0))
		c.mu.Unlock()
	}
	b.StopTimer()
	b.ReportMetric(float64(median(ds).Microseconds())/1000, "ms-median")
	b.ReportMetric(float64(median(first).Microseconds())/1000, "ms-first")
}

// BenchmarkEditCompleteNetwork5000 is edit → complete diagnostics, margins
// and their tilt-limit search included, on the same loop (target: under
// 150 ms).
func BenchmarkEditCompleteNetwork5000(b *testing.B) { benchEdit(b, loopgen.Network(5000, 8), true) }

// BenchmarkHover300 hovers a quantity in a generated 300-line file.
func BenchmarkHover300(b *testing.B) {
	text := loopgen.Lines(300)
	c, uri, line, col := benchSession(b, text, -1, true)
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		c.mustCall("textDocument/hover", map[string]any{"textDocument": map[string]any{"uri": uri}, "position": map[string]int{"line": line, "character": col}})
	}
}

// BenchmarkCompletion300 completes the units after a number in a
// component of a generated 300-line file.
func BenchmarkCompletion300(b *testing.B) {
	text := loopgen.Lines(300)
	c, uri, _, _ := benchSession(b, text, -1, true)
	line, col := -1, 0
	for i, l := range strings.Split(string(text), "\n") {
		if j := strings.Index(l, "length "); j >= 0 && line < 0 {
			line, col = i, j+len("length 1 ")
		}
	}
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		c.mustCall("textDocument/completion", map[string]any{"textDocument": map[string]any{"uri": uri}, "position": map[string]int{"line": line, "character": col}})
	}
}

// BenchmarkTyping types one edit every 50 ms with the normal debounce and
// reports the CPU time the process spends per edit.
func BenchmarkTyping(b *testing.B) {
	for _, tc := range []struct {
		name string
		text []byte
	}{{"300lines", loopgen.Lines(300)}, {"network5000", loopgen.Network(5000, 8)}} {
		b.Run(tc.name, func(b *testing.B) {
			c, uri, line, col := benchSession(b, tc.text, 0, false)
			const edits = 20
			b.ResetTimer()
			var cpu time.Duration
			for i := 0; i < b.N; i++ {
				u0 := cpuTime()
				for k := 0; k < edits; k++ {
					v := i*edits + k + 2
					digit := strconv.Itoa(1 + v%8)
					c.notify("textDocument/didChange", map[string]any{"textDocument": map[string]any{"uri": uri, "version": v},
						"contentChanges": []any{map[string]any{"range": map[string]any{"start": map[string]int{"line": line, "character": col}, "end": map[string]int{"line": line, "character": col + 1}}, "text": digit}}})
					time.Sleep(50 * time.Millisecond)
				}
				c.settleQuick()
				cpu += cpuTime() - u0
			}
			b.ReportMetric(float64(cpu.Microseconds())/1000/float64(b.N*edits), "cpu-ms/edit")
		})
	}
}

func cpuTime() time.Duration {
	var ru syscall.Rusage
	syscall.Getrusage(syscall.RUSAGE_SELF, &ru)
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}

// reportMemory reports the live heap after a collection and the resident
// set size of the process.
func reportMemory(b *testing.B) {
	runtime.GC()
	var ms runtime.MemStats
	runtime.ReadMemStats(&ms)
	b.ReportMetric(float64(ms.HeapAlloc)/(1<<20), "heap-MB")
	if rss, ok := vmRSS(); ok {
		b.ReportMetric(rss, "rss-MB")
	}
}

func vmRSS() (float64, bool) {
	data, err := os.ReadFile("/proc/self/status")
	if err != nil {
		return 0, false
	}
	for _, l := range bytes.Split(data, []byte("\n")) {
		if rest, ok := bytes.CutPrefix(l, []byte("VmRSS:")); ok {
			var kb float64
			fmt.Sscanf(string(rest), "%f", &kb)
			return kb / 1024, true
		}
	}
	return 0, false
}

// BenchmarkDiskStale is the cost an edit pays to notice included files
// changed on disk: one stat per cached file, here 50.
func BenchmarkDiskStale(b *testing.B) {
	dir := b.TempDir()
	var c diskCache
	for i := range 50 {
		p := filepath.Join(dir, fmt.Sprintf("part%02d.loop", i))
		if err := os.WriteFile(p, []byte("part p {\n  bore 8 mm\n}\n"), 0o644); err != nil {
			b.Fatal(err)
		}
		c.read(p)
	}
	b.ReportAllocs()
	for b.Loop() {
		if ch := c.stale(nil); len(ch) != 0 {
			b.Fatalf("nothing changed, stale reports %v", ch)
		}
	}
}

// largeText is a document of about n bytes: parameters between comment
// lines with non-ASCII text.
func largeText(n int) string {
	var b strings.Builder
	b.WriteString("param d = 12 mm\n")
	for i := 0; b.Len() < n; i++ {
		fmt.Fprintf(&b, "# filler line %d: µ ° ² 𝜃 keep the text honest\nparam p%d = %d mm\n", i, i, i)
	}
	return b.String()
}

// BenchmarkLargeDocument5MB is a 5 MB document: open → complete
// diagnostics, a one-character edit → complete diagnostics, and the
// document symbols.
func BenchmarkLargeDocument5MB(b *testing.B) {
	text := largeText(5 << 20)
	// As circa serve runs.
	defer debug.SetMemoryLimit(debug.SetMemoryLimit(MemoryLimit))
	var open, edit, symbols []time.Duration
	for i := 0; i < b.N; i++ {
		c := newTestClient(b, Options{Debounce: -1, MemoryLimit: MemoryLimit})
		c.initialize(nil)
		uri := fmt.Sprintf("file:///bench/large%d.loop", i)
		t0 := time.Now()
		c.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": uri, "languageId": "loop", "version": 1, "text": text}})
		c.settle()
		open = append(open, time.Since(t0))
		t0 = time.Now()
		c.notify("textDocument/didChange", map[string]any{"textDocument": map[string]any{"uri": uri, "version": 2},
			"contentChanges": []any{map[string]any{"range": map[string]any{"start": map[string]int{"line": 0, "character": 10}, "end": map[string]int{"line": 0, "character": 11}}, "text": "3"}}})
		c.settle()
		edit = append(edit, time.Since(t0))
		t0 = time.Now()
		c.mustCall("textDocument/documentSymbol", map[string]any{"textDocument": map[string]any{"uri": uri}})
		symbols = append(symbols, time.Since(t0))
		c.conn.Close()
	}
	b.ReportMetric(float64(median(open).Microseconds())/1000, "ms-open")
	b.ReportMetric(float64(median(edit).Microseconds())/1000, "ms-edit")
	b.ReportMetric(float64(median(symbols).Microseconds())/1000, "ms-symbols")
}

// BenchmarkDocumentSymbols5MB is request → reply for the document symbols
// of an open 5 MB document (about 66,000 parameters), the reply decoded into
// the protocol's symbol types as an editor's client does, and counted.
// ms-reply is the wall time until the reply's frame has arrived and its
// envelope is parsed (what the server and the transport take); ms-decode is
// the client's own decoding of the 14 MB result into Go's protocol types
// after that, which an editor does with its own decoder.
func BenchmarkDocumentSymbols5MB(b *testing.B) {
	text := largeText(5 << 20)
	defer debug.SetMemoryLimit(debug.SetMemoryLimit(MemoryLimit))
	c := newTestClient(b, Options{Debounce: -1, MemoryLimit: MemoryLimit})
	c.initialize(nil)
	uri := "file:///bench/symbols.loop"
	c.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": uri, "languageId": "loop", "version": 1, "text": text}})
	c.settle()
	params := map[string]any{"textDocument": map[string]any{"uri": uri}}
	want := strings.Count(text, "\nparam ") + 1
	var size int
	b.ReportAllocs()
	b.ResetTimer()
	u0 := cpuTime()
	var replyT, decT time.Duration
	for i := 0; i < b.N; i++ {
		t0 := time.Now()
		raw := c.mustCall("textDocument/documentSymbol", params)
		t1 := time.Now()
		var res protocol.DocumentSymbolResult
		if err := protocol.Unmarshal(raw, &res); err != nil {
			b.Fatal(err)
		}
		replyT += t1.Sub(t0)
		decT += time.Since(t1)
		if syms, ok := res.(protocol.DocumentSymbolSlice); !ok || len(syms) != want {
			b.Fatalf("reply holds %T of %d symbols, want %d document symbols", res, len(syms), want)
		}
		size = len(raw)
	}
	b.StopTimer()
	b.ReportMetric(float64((cpuTime()-u0).Microseconds())/1000/float64(b.N), "cpu-ms/op")
	b.ReportMetric(float64(size)/(1<<20), "reply-MB")
	b.ReportMetric(float64(replyT.Microseconds())/1000/float64(b.N), "ms-reply")
	b.ReportMetric(float64(decT.Microseconds())/1000/float64(b.N), "ms-decode")
}

// BenchmarkDocumentSymbolsServer5MB is the server's part of the document
// symbols of the 5 MB document: the outline built from the model and
// encoded, without the transfer and the client's decoding (the cache of
// the last reply is emptied each time).
func BenchmarkDocumentSymbolsServer5MB(b *testing.B) {
	text := largeText(5 << 20)
	defer debug.SetMemoryLimit(debug.SetMemoryLimit(MemoryLimit))
	c := newTestClient(b, Options{Debounce: -1, MemoryLimit: MemoryLimit})
	c.initialize(nil)
	uri := "file:///bench/symbols.loop"
	c.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": uri, "languageId": "loop", "version": 1, "text": text}})
	c.settle()
	c.srv.mu.Lock()
	sn := c.srv.snap
	c.srv.mu.Unlock()
	params := []byte(`{"textDocument":{"uri":"` + uri + `"}}`)
	b.ReportAllocs()
	u0 := cpuTime()
	for b.Loop() {
		sn.roots["/bench/symbols.loop"].symbols.put("", 0, nil)
		if _, err := documentSymbolRequest(context.Background(), c.srv, sn, params); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64((cpuTime()-u0).Microseconds())/1000/float64(b.N), "cpu-ms/op")
}

// BenchmarkSemanticTokensLongLine classifies a line of half a million
// names (1 MB): each token's column was counted from the line's start, a
// time quadratic in the line's length that left the request unanswered.
func BenchmarkSemanticTokensLongLine(b *testing.B) {
	src := []byte("param x = " + strings.Repeat("a ", 1<<19) + "\n")
	m := lang.LoadSource("long.loop", src, nil)
	f := m.Files["long.loop"]
	toks := fileTokens(m, f)
	if len(toks) < 1<<19 {
		b.Fatalf("%d tokens", len(toks))
	}
	b.SetBytes(int64(len(src)))
	b.ReportAllocs()
	for b.Loop() {
		encodeTokens(f.Mapper, lang.UTF16, toks)
	}
}
