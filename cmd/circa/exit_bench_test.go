package main

import (
	"os/exec"
	"path/filepath"
	"testing"
	"time"
)

// BenchmarkServeExit measures how long the `circa serve` process takes to
// be gone after the exit notification that follows shutdown, with its
// standard input still open, as an editor leaves it. It reports the median
// in ms-exit; run it with -benchtime 20x.
func BenchmarkServeExit(b *testing.B) {
	bin := filepath.Join(b.TempDir(), "circa")
	if out, err := exec.Command("go", "build", "-o", bin, ".").CombinedOutput(); err != nil {
		b.Fatalf("building circa: %v\n%s", err, out)
	}
	var gone []time.Duration
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		p := startLSP(b, []string{bin, "serve"})
		p.send(map[string]any{"jsonrpc": "2.0", "id": 1, "method": "initialize", "params": map[string]any{"processId": nil, "rootUri": nil, "capabilities": map[string]any{}}})
		p.wait(b, "initialize reply", func() bool { return p.reply[1] })
		p.send(map[string]any{"jsonrpc": "2.0", "method": "initialized", "params": map[string]any{}})
		p.send(map[string]any{"jsonrpc": "2.0", "id": 2, "method": "shutdown"})
		p.wait(b, "shutdown reply", func() bool { return p.reply[2] })
		t0 := time.Now()
		p.send(map[string]any{"jsonrpc": "2.0", "method": "exit"})
		err := p.cmd.Wait()
		gone = append(gone, time.Since(t0))
		if err != nil {
			b.Fatalf("exit after shutdown: %v", err)
		}
	}
	b.StopTimer()
	b.ReportMetric(medianMS(gone), "ms-exit")
}
