package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"testing"
	"time"
)

func TestReportCommand(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "rack.html")
	code, stdout, errs := circa(t, "", "report", "../../testdata/examples/rack-door.loop", "-o", out)
	if code != exitOK || strings.TrimSpace(stdout) != out {
		t.Fatalf("exit %d %q %q", code, stdout, errs)
	}
	page, err := os.ReadFile(out)
	if err != nil || !bytes.HasPrefix(page, []byte("<!DOCTYPE html>")) || !bytes.Contains(page, []byte("Loop rack")) {
		t.Fatalf("report %v: %.200s", err, page)
	}
	// Replacing an existing report keeps its mode.
	os.Chmod(out, 0o640)
	if code, _, errs := circa(t, "", "report", "-o", out, "../../testdata/examples/rack-door.loop"); code != exitOK {
		t.Fatalf("rewrite: %d %s", code, errs)
	}
	if st, _ := os.Stat(out); st.Mode().Perm() != 0o640 {
		t.Errorf("mode %v after rewrite", st.Mode().Perm())
	}
	// Several files into a directory; to standard output with one.
	code, stdout, errs = circa(t, "", "report", "--out-dir", filepath.Join(dir, "all"), "../../testdata/examples/rack-door.loop", "../../testdata/examples/forestry-inverter.loop")
	if code != exitOK || strings.Count(stdout, ".html\n") != 2 {
		t.Errorf("--out-dir: %d %q %s", code, stdout, errs)
	}
	if _, err := os.Stat(filepath.Join(dir, "all", "forestry-inverter.html")); err != nil {
		t.Error(err)
	}
	code, stdout, _ = circa(t, "", "report", "../../testdata/examples/rack-door.loop")
	if code != exitOK || !strings.HasPrefix(stdout, "<!DOCTYPE html>") {
		t.Errorf("to stdout: %d %.100q", code, stdout)
	}
}

func TestReportUsage(t *testing.T) {
	bad := filepath.Join(t.TempDir(), "bad.loop")
	os.WriteFile(bad, []byte("loop l {\n  pipe p from a to { length 1 m }\n}\n"), 0o644)
	for _, tc := range []struct {
		args []string
		want int
	}{
		{[]string{"report"}, exitUsage},
		{[]string{"report", "a.loop", "b.loop"}, exitUsage},
		{[]string{"report", "-o", "x.html", "--out-dir", "d", "a.loop"}, exitUsage},
		{[]string{"report", filepath.Join(t.TempDir(), "missing.loop")}, exitUsage},
		{[]string{"report", bad}, exitFindings}, // written, with the errors in it
		{[]string{"report", "--help"}, exitOK},
	} {
		if code, _, errs := circa(t, "", tc.args...); code != tc.want {
			t.Errorf("%v: exit %d, want %d: %s", tc.args, code, tc.want, errs)
		}
	}
}

// A long command says what it is doing on stderr; a quick one says nothing.
func TestProgress(t *testing.T) {
	var b bytes.Buffer
	p := startProgress(&b, "report", "quick")
	p.Stop()
	if b.Len() != 0 {
		t.Errorf("a quick run spoke: %q", b.String())
	}
	old := progressDelay
	progressDelay = time.Millisecond
	defer func() { progressDelay = old }()
	w := &lockedBuffer{}
	p = startProgress(w, "report", "estimating")
	for i := 0; i < 200 && !strings.Contains(w.String(), "estimating"); i++ {
		time.Sleep(5 * time.Millisecond)
	}
	p.Set("drawing")
	p.Stop()
	got := w.String()
	if !strings.HasPrefix(got, "circa report: estimating… (") || !strings.Contains(got, "circa report: done in ") {
		t.Errorf("progress %q", got)
	}
}

// lockedBuffer is a buffer safe for a writer goroutine and a reader.
type lockedBuffer struct {
	mu sync.Mutex
	b  bytes.Buffer
}

func (l *lockedBuffer) Write(p []byte) (int, error) {
	l.mu.Lock()
	defer l.mu.Unlock()
	return l.b.Write(p)
}

func (l *lockedBuffer) String() string {
	l.mu.Lock()
	defer l.mu.Unlock()
	return l.b.String()
}
