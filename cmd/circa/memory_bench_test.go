package main

import (
	"flag"
	"fmt"
	"io"
	"math/rand"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"runtime/metrics"
	"strconv"
	"strings"
	"sync/atomic"
	"testing"
	"time"

	"circa/textfile"
)

var memSize = flag.Int("memsize", 4<<20, "total size in bytes of the inputs of BenchmarkMemory; past the read cap the input is split into included files")

// memPart writes about n bytes of one kind of text to path: "params", a
// valid file of parameters with comments; "loop", one loop of many pipes
// whose last pipe names an undeclared node, so only the rules that run on
// a loop that does not load see it; "ring", one valid closed loop of many
// pipes that checks and estimates (see memRing); "errors", a syntax error
// on every line; "binary", random bytes. Names
// carry the part's number, so the parts of one input do not clash.
func memPart(b *testing.B, path, kind string, part, n int) {
	var sb strings.Builder
	sb.Grow(n + 128)
	switch kind {
	case "params":
		for i := 0; sb.Len() < n; i++ {
			fmt.Fprintf(&sb, "param p%d_%d = %d mm  # bore %d\n", part, i, i%97+1, i)
		}
	case "loop":
		fmt.Fprintf(&sb, "loop l%d {\n  fluid water\n", part)
		for i := 0; sb.Len() < n; i++ {
			fmt.Fprintf(&sb, "  node n%d at (0, 0, %d) mm\n  pipe q%d_%d from n%d to n%d { length 1 m; bore 8 mm }\n", i, i%50, part, i, i, i+1)
		}
		sb.WriteString("}\n")
	case "ring":
		memRing(&sb, part, n)
	case "errors":
		for i := 0; sb.Len() < n; i++ {
			fmt.Fprintf(&sb, "param x%d_%d = 3 $ (\n", part, i)
		}
	case "binary":
		rng := rand.New(rand.NewSource(int64(part + 1)))
		buf := make([]byte, n)
		rng.Read(buf)
		sb.Write(buf)
	}
	if err := os.WriteFile(path, []byte(sb.String()), 0o644); err != nil {
		b.Fatal(err)
	}
}

// memRing writes about n bytes of one closed loop with a case: an
// evaporator at the bottom, a riser, a run of short level pipes at the top,
// a condenser, a downcomer and a run of short level pipes back to the
// evaporator's inlet. Every node's height agrees with the rises, and the
// level runs are short and wide enough that the evaporator does not dry
// out at 16 MB, so the loop checks without errors and its estimate runs.
func memRing(sb *strings.Builder, part, n int) {
	fmt.Fprintf(sb, "loop r%d {\n  fluid R1233zd(E)\n  design_pressure 4 bar(g)\n", part)
	fmt.Fprintf(sb, "  node b%d_0 at (0, 0, 0) mm\n  node e%d at (0, 0, 300) mm\n  node t%d_0 at (0, 0, 1500) mm\n", part, part, part)
	fmt.Fprintf(sb, "  evaporator ev%d from b%d_0 to e%d { length 300 mm; rise 300 mm; bore 14 mm; heated_length 300 mm; wetted_area 0.018 m²; heat 1.2 kW }\n", part, part, part)
	fmt.Fprintf(sb, "  pipe up%d from e%d to t%d_0 { length 1200 mm; rise 1200 mm; bore 14 mm }\n", part, part, part)
	k := 0
	for sb.Len() < n/2 {
		k++
		fmt.Fprintf(sb, "  node t%d_%d at (%d, 0, 1500) mm\n  pipe a%d_%d from t%d_%d to t%d_%d { length 2 mm; bore 40 mm }\n", part, k, k*2, part, k, part, k-1, part, k)
	}
	fmt.Fprintf(sb, "  node c%d at (%d, 0, 1200) mm\n  node b%d_%d at (%d, 0, 0) mm\n", part, k*2, part, k, k*2)
	fmt.Fprintf(sb, "  condenser co%d from t%d_%d to c%d { length 300 mm; rise -300 mm; bore 14 mm; conductance 95 W/K }\n", part, part, k, part)
	fmt.Fprintf(sb, "  pipe down%d from c%d to b%d_%d { length 1200 mm; rise -1200 mm; bore 14 mm }\n", part, part, part, k)
	for i := k - 1; i >= 0; i-- {
		if i > 0 {
			fmt.Fprintf(sb, "  node b%d_%d at (%d, 0, 0) mm\n", part, i, i*2)
		}
		fmt.Fprintf(sb, "  pipe z%d_%d from b%d_%d to b%d_%d { length 2 mm; bore 40 mm }\n", part, i, part, i+1, part, i)
	}
	fmt.Fprintf(sb, "}\n\ncase hot%d {\n  heat ev%d 1.2 kW\n  sink 32 °C\n}\n", part, part)
}

// memInput writes an input of about n bytes of one kind and returns the
// file to check and the files to format. An input larger than the read cap
// is split into parts of at most 15 MB that the root file includes.
func memInput(b *testing.B, kind string, n int) (root string, parts []string, size int64) {
	dir := b.TempDir()
	const maxPart = 15_000_000
	if n <= min(maxPart, textfile.MaxSize) {
		root = filepath.Join(dir, kind+".loop")
		memPart(b, root, kind, 0, n)
		st, _ := os.Stat(root)
		return root, []string{root}, st.Size()
	}
	k := (n + maxPart - 1) / maxPart
	var inc strings.Builder
	for i := range k {
		p := filepath.Join(dir, fmt.Sprintf("%s%d.loop", kind, i))
		memPart(b, p, kind, i, n/k)
		fmt.Fprintf(&inc, "include %q\n", filepath.Base(p))
		parts = append(parts, p)
		st, _ := os.Stat(p)
		size += st.Size()
	}
	root = filepath.Join(dir, kind+".loop")
	if err := os.WriteFile(root, []byte(inc.String()), 0o644); err != nil {
		b.Fatal(err)
	}
	return root, parts, size + int64(inc.Len())
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

// memChildEnv makes the test binary run one circa command and exit, so
// BenchmarkMemory can read a command's peak resident size on its own.
const memChildEnv = "CIRCA_MEMORY_BENCH_CHILD"

func TestMain(m *testing.M) {
	if os.Getenv(memChildEnv) == "1" {
		rc := run(os.Args[1:], strings.NewReader(""), io.Discard, io.Discard)
		// The peak resident size of this process since it started, which
		// the kernel keeps as VmHWM.
		if st, err := os.ReadFile("/proc/self/status"); err == nil {
			for _, l := range strings.Split(string(st), "\n") {
				if rest, ok := strings.CutPrefix(l, "VmHWM:"); ok {
					fmt.Print(strings.TrimSpace(strings.TrimSuffix(strings.TrimSpace(rest), "kB")))
				}
			}
		}
		os.Exit(rc)
	}
	os.Exit(m.Run())
}

// peakRSS runs the command in a child process and returns its peak
// resident size in bytes (0 where the system does not tell). The child's
// own count is read: the wait status's maximum would include the parent's
// size at the fork.
func peakRSS(b *testing.B, args []string) uint64 {
	cmd := exec.Command(os.Args[0], args...)
	cmd.Env = append(os.Environ(), memChildEnv+"=1")
	out, err := cmd.Output()
	if err != nil {
		if _, ok := err.(*exec.ExitError); !ok {
			b.Fatal(err)
		}
	}
	kb, err := strconv.ParseUint(string(out), 10, 64)
	if err != nil {
		return 0
	}
	return kb * 1024
}

// BenchmarkMemory runs check, estimate and fmt -d on large inputs of each
// kind and reports the bytes allocated per run, the peak heap and the
// command's peak resident size when run on its own, the last two also as
// multiples of the input's size (target: at most 10). Run with
// -benchtime 1x; -memsize sets the input size.
func BenchmarkMemory(b *testing.B) {
	for _, kind := range []string{"params", "loop", "ring", "errors", "binary"} {
		root, parts, size := memInput(b, kind, *memSize)
		// estimate runs without the design guidance, whose search over each
		// parameter is another matter than the memory of reading the file.
		for _, args := range [][]string{{"check", "--no-estimates"}, {"check"}, {"estimate", "--no-guidance"}, {"fmt", "-d"}} {
			name := kind + "/" + strings.Join(args, "_")
			files := []string{root}
			if args[0] == "fmt" {
				files = parts
			}
			argv := append(append([]string(nil), args...), files...)
			b.Run(name, func(b *testing.B) {
				b.ReportAllocs()
				b.SetBytes(size)
				var peak uint64
				for b.Loop() {
					peak = max(peak, peakHeap(func() {
						run(argv, strings.NewReader(""), io.Discard, io.Discard)
					}))
				}
				b.StopTimer()
				rss := peakRSS(b, argv)
				b.ReportMetric(float64(peak), "peak-heap-B")
				b.ReportMetric(float64(peak)/float64(size), "peak/input")
				b.ReportMetric(float64(rss), "peak-rss-B")
				b.ReportMetric(float64(rss)/float64(size), "rss/input")
			})
		}
	}
}

// TestMemRingChecks keeps the "ring" input of BenchmarkMemory a loop that
// checks without errors and whose estimate runs, so its figures stay those
// of a whole check.
func TestMemRingChecks(t *testing.T) {
	var sb strings.Builder
	memRing(&sb, 0, 20_000)
	if n := strings.Count(sb.String(), "\n  pipe "); n < 200 {
		t.Fatalf("ring has %d pipes, want at least 200", n)
	}
	path := filepath.Join(t.TempDir(), "ring.loop")
	if err := os.WriteFile(path, []byte(sb.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	var out, errb strings.Builder
	rc := run([]string{"check", path}, strings.NewReader(""), &out, &errb)
	all := out.String() + errb.String()
	if rc != 0 || !strings.Contains(all, " 0 errors") {
		t.Fatalf("check exited %d, want 0 with no errors:\n%s", rc, all)
	}
	// The summary names the worst margin only once the estimate has run.
	if !strings.Contains(all, "worst margin") {
		t.Errorf("check reported no margin, so the estimate did not run:\n%s", all)
	}
}
