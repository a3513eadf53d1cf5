package editors

import (
	"bytes"
	"context"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"strings"
	"sync"
	"testing"
	"time"
)

// needTool returns the path of an editor or build tool. Without it the test
// is skipped, except under CI (CI set), where a missing tool is a failure:
// CI installs every tool these tests drive.
func needTool(t *testing.T, name string) string {
	t.Helper()
	p, err := exec.LookPath(name)
	if err != nil {
		if os.Getenv("CI") != "" {
			t.Fatalf("%s not found on PATH, but CI is set: CI must install it", name)
		}
		t.Skipf("%s not found on PATH", name)
	}
	return p
}

// run runs a command in dir with a deadline and fails the test with its
// output when it fails.
func run(t *testing.T, dir string, timeout time.Duration, env []string, name string, args ...string) string {
	t.Helper()
	out, err := runErr(dir, timeout, env, name, args...)
	if err != nil {
		t.Fatalf("%s %s: %v\n%s", name, strings.Join(args, " "), err, out)
	}
	return out
}

func runErr(dir string, timeout time.Duration, env []string, name string, args ...string) (string, error) {
	ctx, cancel := context.WithTimeout(context.Background(), timeout)
	defer cancel()
	cmd := exec.CommandContext(ctx, name, args...)
	cmd.Dir = dir
	cmd.Env = append(os.Environ(), env...)
	var buf bytes.Buffer
	cmd.Stdout, cmd.Stderr = &buf, &buf
	cmd.WaitDelay = 5 * time.Second
	err := cmd.Run()
	if ctx.Err() != nil {
		err = ctx.Err()
	}
	return buf.String(), err
}

// repoRoot is the module root, two levels above this file's folder.
func repoRoot(t *testing.T) string {
	t.Helper()
	_, file, _, ok := runtime.Caller(0)
	if !ok {
		t.Fatal("no caller information")
	}
	return filepath.Dir(filepath.Dir(file))
}

func examples(t *testing.T) []string {
	t.Helper()
	files, err := filepath.Glob(filepath.Join(repoRoot(t), "testdata", "examples", "*.loop"))
	if err != nil || len(files) == 0 {
		t.Fatalf("no example .loop files: %v", err)
	}
	return files
}

var (
	circaOnce sync.Once
	circaBin  string
	circaErr  error
	circaOut  string
)

// circa builds the circa binary once per test run and returns its path.
func circa(t *testing.T) string {
	t.Helper()
	circaOnce.Do(func() {
		dir, err := os.MkdirTemp("", "circa-editors-")
		if err != nil {
			circaErr = err
			return
		}
		circaBin = filepath.Join(dir, "circa")
		circaOut, circaErr = runErr(repoRoot(t), 5*time.Minute, nil, "go", "build", "-o", circaBin, "./cmd/circa")
	})
	if circaErr != nil {
		t.Fatalf("building circa: %v\n%s", circaErr, circaOut)
	}
	return circaBin
}

// serveReady reports whether the built binary has the serve command.
func serveReady(t *testing.T) bool {
	t.Helper()
	out, _ := runErr(t.TempDir(), time.Minute, nil, circa(t), "help")
	return strings.Contains(out, "\n  serve ")
}

func readFile(t *testing.T, path string) string {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}

func TestMain(m *testing.M) {
	code := m.Run()
	if circaBin != "" {
		os.RemoveAll(filepath.Dir(circaBin))
	}
	os.Exit(code)
}
