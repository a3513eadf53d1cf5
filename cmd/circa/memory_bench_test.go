package main

import (
	"flag"
	"fmt"
	"io"
	"math/rand"
	"os"
	"path/filepath"
	"runtime"
	"runtime/metrics"
	"strings"
	"sync/atomic"
	"testing"
	"time"
)

var memSize = flag.Int("memsize", 4<<20, "size in bytes of the inputs of BenchmarkMemory (at most the 16 MiB read cap)")

// memInput writes a file of about n bytes of one kind: "params", a valid
// file of parameters with comments; "loop", one loop of many pipes;
// "errors", a syntax error on every line; "binary", random bytes.
func memInput(b *testing.B, kind string, n int) string {
	var sb strings.Builder
	switch kind {
	case "params":
		for i := 0; sb.Len() < n; i++ {
			fmt.Fprintf(&sb, "param p%d = %d mm  # bore %d\n", i, i%97+1, i)
		}
	case "loop":
		sb.WriteString("loop l {\n  fluid water\n")
		for i := 0; sb.Len() < n; i++ {
			fmt.Fprintf(&sb, "  node n%d at (0, 0, %d) mm\n  pipe q%d from n%d to n%d { length 1 m; bore 8 mm }\n", i, i%50, i, i, i+1)
		}
		sb.WriteString("}\n")
	case "errors":
		for i := 0; sb.Len() < n; i++ {
			fmt.Fprintf(&sb, "param x%d = 3 $ (\n", i)
		}
	case "binary":
		rng := rand.New(rand.NewSource(1))
		buf := make([]byte, n)
		rng.Read(buf)
		sb.Write(buf)
	}
	p := filepath.Join(b.TempDir(), kind+".loop")
	if err := os.WriteFile(p, []byte(sb.String()), 0o644); err != nil {
		b.Fatal(err)
	}
	return p
}

// peakHeap samples the bytes of live and not yet swept heap objects while
// f runs and returns the largest value seen: what the process needs at
// its worst, short of the garbage collector's headroom.
func peakHeap(f func()) uint64 {
	runtime.GC()
	s := []metrics.Sample{{Name: "/memory/classes/heap/objects:bytes"}}
	var peak atomic.Uint64
	done := make(chan struct{})
	stopped := make(chan struct{})
	go func() {
		defer close(stopped)
		t := time.NewTicker(time.Millisecond)
		defer t.Stop()
		for {
			metrics.Read(s)
			if v := s[0].Value.Uint64(); v > peak.Load() {
				peak.Store(v)
			}
			select {
			case <-done:
				return
			case <-t.C:
			}
		}
	}()
	f()
	close(done)
	<-stopped
	return peak.Load()
}

// BenchmarkMemory runs check, estimate and fmt -d on large inputs of each
// kind and reports the bytes allocated per run and the peak heap, also as
// a multiple of the input's size (target: at most 10). Run with
// -benchtime 1x; -memsize sets the input size.
func BenchmarkMemory(b *testing.B) {
	for _, kind := range []string{"params", "loop", "errors", "binary"} {
		path := memInput(b, kind, *memSize)
		st, _ := os.Stat(path)
		for _, args := range [][]string{{"check", "--no-estimates"}, {"check"}, {"fmt", "-d"}} {
			name := kind + "/" + strings.Join(args, "_")
			b.Run(name, func(b *testing.B) {
				b.ReportAllocs()
				b.SetBytes(st.Size())
				var peak uint64
				for b.Loop() {
					peak = max(peak, peakHeap(func() {
						run(append(append([]string(nil), args...), path), strings.NewReader(""), io.Discard, io.Discard)
					}))
				}
				b.ReportMetric(float64(peak), "peak-heap-B")
				b.ReportMetric(float64(peak)/float64(st.Size()), "peak/input")
			})
		}
	}
}
