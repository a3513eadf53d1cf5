package main

import (
	"bufio"
	"encoding/json"
	"fmt"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"sort"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"

	"circa/lang/loopgen"
)

// BenchmarkProtocol300 drives the real `circa serve` binary over its
// standard input and output as an editor does: it opens a generated
// 300-line file and changes one digit per iteration, waiting each time for
// that version's first diagnostics (a publish carrying the version) and its
// complete ones (the server's -log-timing line for the version, after which
// every publish of it has been queued). It reports the medians from the
// didChange to each. Run it with -benchtime 40x for 40 edits.
//
// When a Go language server (gopls) is on the PATH, the peer sub-benchmark
// measures the same edit → diagnostics on a generated 300-line Go file, for
// comparison on the same machine; without one it is skipped.
func BenchmarkProtocol300(b *testing.B) {
	b.Run("circa", func(b *testing.B) {
		bin := filepath.Join(b.TempDir(), "circa")
		if out, err := exec.Command("go", "build", "-o", bin, ".").CombinedOutput(); err != nil {
			b.Fatalf("building circa: %v\n%s", err, out)
		}
		text := string(loopgen.Lines(300))
		line, col := paramDigit(b, text)
		benchProtocol(b, []string{bin, "serve", "-log-timing"}, "file:///bench/gen.loop", "loop", text, line, col, true)
	})
	b.Run("peer", func(b *testing.B) {
		gopls, err := exec.LookPath("gopls")
		if err != nil {
			b.Skip("no second language server (gopls) installed")
		}
		dir := b.TempDir()
		if err := os.WriteFile(filepath.Join(dir, "go.mod"), []byte("module bench\n\ngo 1.22\n"), 0o644); err != nil {
			b.Fatal(err)
		}
		text, line, col := goFile300()
		path := filepath.Join(dir, "gen.go")
		if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
			b.Fatal(err)
		}
		benchProtocol(b, []string{gopls, "serve"}, "file://"+path, "go", text, line, col, false)
	})
}

// paramDigit finds the first digit of the first parameter's value.
func paramDigit(b *testing.B, text string) (int, int) {
	for i, l := range strings.Split(text, "\n") {
		if strings.HasPrefix(l, "param ") {
			if j := strings.Index(l, "= "); j >= 0 {
				return i, j + 2
			}
		}
	}
	b.Fatal("no param line to edit")
	return 0, 0
}

// goFile300 is a 300-line Go file with a digit to edit.
func goFile300() (string, int, int) {
	var sb strings.Builder
	sb.WriteString("package bench\n\nconst k = 1\n\n")
	for i := 0; sb.Len() == 0 || strings.Count(sb.String(), "\n") < 296; i++ {
		fmt.Fprintf(&sb, "func f%d(x int) int {\n\ty := x * k\n\treturn y + %d\n}\n\n", i, i)
	}
	return sb.String(), 2, 10
}

// lspProc is a language server process and what the benchmark has seen of
// it: the time each document version's first publish and complete log line
// arrived.
type lspProc struct {
	cmd   *exec.Cmd
	in    io.WriteCloser
	mu    sync.Mutex
	cond  *sync.Cond
	first map[int]time.Time
	done  map[int]time.Time
	reply map[int]bool
	err   error
}

var timingLine = regexp.MustCompile(`timing: .* version (\d+): .*complete`)

func startLSP(b *testing.B, argv []string) *lspProc {
	cmd := exec.Command(argv[0], argv[1:]...)
	in, err := cmd.StdinPipe()
	if err != nil {
		b.Fatal(err)
	}
	out, err := cmd.StdoutPipe()
	if err != nil {
		b.Fatal(err)
	}
	errp, err := cmd.StderrPipe()
	if err != nil {
		b.Fatal(err)
	}
	if err := cmd.Start(); err != nil {
		b.Fatal(err)
	}
	p := &lspProc{cmd: cmd, in: in, first: map[int]time.Time{}, done: map[int]time.Time{}, reply: map[int]bool{}}
	p.cond = sync.NewCond(&p.mu)
	go p.readMessages(bufio.NewReader(out))
	go func() {
		sc := bufio.NewScanner(errp)
		for sc.Scan() {
			if m := timingLine.FindStringSubmatch(sc.Text()); m != nil {
				v, _ := strconv.Atoi(m[1])
				p.mu.Lock()
				if _, ok := p.done[v]; !ok {
					p.done[v] = time.Now()
				}
				p.cond.Broadcast()
				p.mu.Unlock()
			}
		}
	}()
	b.Cleanup(func() {
		in.Close()
		ch := make(chan struct{})
		go func() { cmd.Wait(); close(ch) }()
		select {
		case <-ch:
		case <-time.After(5 * time.Second):
			cmd.Process.Kill()
			<-ch
		}
	})
	return p
}

func (p *lspProc) readMessages(r *bufio.Reader) {
	for {
		n := -1
		for {
			line, err := r.ReadString('\n')
			if err != nil {
				p.fail(err)
				return
			}
			line = strings.TrimSpace(line)
			if line == "" {
				break
			}
			if v, ok := strings.CutPrefix(line, "Content-Length:"); ok {
				n, _ = strconv.Atoi(strings.TrimSpace(v))
			}
		}
		body := make([]byte, n)
		if _, err := io.ReadFull(r, body); err != nil {
			p.fail(err)
			return
		}
		var msg struct {
			ID     *json.RawMessage `json:"id"`
			Method string           `json:"method"`
			Params struct {
				Version *int `json:"version"`
			} `json:"params"`
		}
		if json.Unmarshal(body, &msg) != nil {
			continue
		}
		now := time.Now()
		p.mu.Lock()
		switch {
		case msg.Method == "textDocument/publishDiagnostics" && msg.Params.Version != nil:
			if _, ok := p.first[*msg.Params.Version]; !ok {
				p.first[*msg.Params.Version] = now
			}
		case msg.Method != "" && msg.ID != nil:
			// A request from the server (configuration, registration):
			// answer it with null so it does not wait.
			p.mu.Unlock()
			p.send(map[string]any{"jsonrpc": "2.0", "id": msg.ID, "result": nil})
			p.mu.Lock()
		case msg.Method == "" && msg.ID != nil:
			if id, err := strconv.Atoi(string(*msg.ID)); err == nil {
				p.reply[id] = true
			}
		}
		p.cond.Broadcast()
		p.mu.Unlock()
	}
}

func (p *lspProc) fail(err error) {
	p.mu.Lock()
	if p.err == nil {
		p.err = err
	}
	p.cond.Broadcast()
	p.mu.Unlock()
}

func (p *lspProc) send(msg map[string]any) {
	body, _ := json.Marshal(msg)
	fmt.Fprintf(p.in, "Content-Length: %d\r\n\r\n%s", len(body), body)
}

// wait blocks until ok holds (under p.mu) or 20 s pass.
func (p *lspProc) wait(b *testing.B, what string, ok func() bool) {
	deadline := time.Now().Add(20 * time.Second)
	p.mu.Lock()
	defer p.mu.Unlock()
	for !ok() {
		if p.err != nil {
			b.Fatalf("waiting for %s: %v", what, p.err)
		}
		if time.Now().After(deadline) {
			b.Fatalf("no %s within 20 s", what)
		}
		go func() { time.Sleep(5 * time.Millisecond); p.cond.Broadcast() }()
		p.cond.Wait()
	}
}

func benchProtocol(b *testing.B, argv []string, uri, lang, text string, line, col int, complete bool) {
	p := startLSP(b, argv)
	root := "file://" + filepath.Dir(strings.TrimPrefix(uri, "file://"))
	p.send(map[string]any{"jsonrpc": "2.0", "id": 1, "method": "initialize", "params": map[string]any{
		"processId": os.Getpid(), "rootUri": root, "capabilities": map[string]any{
			"textDocument": map[string]any{"publishDiagnostics": map[string]any{"versionSupport": true}}},
		"workspaceFolders": []any{map[string]any{"uri": root, "name": "bench"}}}})
	p.wait(b, "initialize reply", func() bool { return p.reply[1] })
	p.send(map[string]any{"jsonrpc": "2.0", "method": "initialized", "params": map[string]any{}})
	p.send(map[string]any{"jsonrpc": "2.0", "method": "textDocument/didOpen", "params": map[string]any{
		"textDocument": map[string]any{"uri": uri, "languageId": lang, "version": 1, "text": text}}})
	settled := func(v int) func() bool {
		return func() bool {
			_, f := p.first[v]
			_, d := p.done[v]
			return f && (d || !complete)
		}
	}
	p.wait(b, "diagnostics of the opened file", settled(1))
	var first, full []time.Duration
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		v := i + 2
		t0 := time.Now()
		p.send(map[string]any{"jsonrpc": "2.0", "method": "textDocument/didChange", "params": map[string]any{
			"textDocument": map[string]any{"uri": uri, "version": v},
			"contentChanges": []any{map[string]any{"range": map[string]any{
				"start": map[string]int{"line": line, "character": col}, "end": map[string]int{"line": line, "character": col + 1}},
				"text": strconv.Itoa(1 + v%8)}}}})
		p.wait(b, fmt.Sprintf("diagnostics of version %d", v), settled(v))
		p.mu.Lock()
		first = append(first, p.first[v].Sub(t0))
		if complete {
			d := p.done[v]
			if p.first[v].After(d) {
				d = p.first[v]
			}
			full = append(full, d.Sub(t0))
		}
		p.mu.Unlock()
		// A pause as between keystrokes, so each edit is measured alone.
		b.StopTimer()
		time.Sleep(20 * time.Millisecond)
		b.StartTimer()
	}
	b.StopTimer()
	b.ReportMetric(medianMS(first), "ms-first")
	if complete {
		b.ReportMetric(medianMS(full), "ms-complete")
	}
	p.send(map[string]any{"jsonrpc": "2.0", "id": 2, "method": "shutdown"})
	p.wait(b, "shutdown reply", func() bool { return p.reply[2] })
	p.send(map[string]any{"jsonrpc": "2.0", "method": "exit"})
}

func medianMS(ds []time.Duration) float64 {
	if len(ds) == 0 {
		return 0
	}
	s := append([]time.Duration(nil), ds...)
	sort.Slice(s, func(i, j int) bool { return s[i] < s[j] })
	return float64(s[len(s)/2]) / float64(time.Millisecond)
}
