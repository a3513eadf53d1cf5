package editors

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

// elpaDirs returns -L flags for the packages Debian's elpa-* packages
// install (eglot 1.9 and the newer project and xref it needs); emacs -Q does
// not put them on the load-path.
func elpaDirs() []string {
	var args []string
	dirs, _ := filepath.Glob("/usr/share/emacs/site-lisp/elpa/*")
	for _, d := range dirs {
		if fi, err := os.Stat(d); err == nil && fi.IsDir() {
			args = append(args, "-L", d)
		}
	}
	return args
}

// TestEmacsByteCompile byte-compiles loop-mode.el with warnings as errors.
func TestEmacsByteCompile(t *testing.T) {
	emacs := needTool(t, "emacs")
	dir := t.TempDir()
	el := filepath.Join(dir, "loop-mode.el")
	copyFile(t, filepath.Join(repoRoot(t), "editors", "emacs", "loop-mode.el"), el)
	out := run(t, dir, 2*time.Minute, nil, emacs, "--batch", "-Q",
		"--eval", "(setq byte-compile-error-on-warn t)", "-f", "batch-byte-compile", el)
	if _, err := os.Stat(el + "c"); err != nil {
		t.Fatalf("no .elc written: %v\n%s", err, out)
	}
	if strings.Contains(out, "Warning") {
		t.Errorf("byte-compile warnings:\n%s", out)
	}
}

// TestEmacsMode runs the ERT tests of loop-mode in batch mode: auto-mode,
// faces at chosen places of an example, the allow comment, indentation of a
// messy buffer and, when `circa serve` exists and eglot loads, that eglot
// connects and flymake shows the server's diagnostics.
func TestEmacsMode(t *testing.T) {
	emacs := needTool(t, "emacs")
	dir := filepath.Join(repoRoot(t), "editors", "emacs")
	env := []string{"LOOP_EXAMPLE=" + filepath.Join(repoRoot(t), "editors", "testdata", "highlight.loop"), "HOME=" + t.TempDir()}
	args := append([]string{"--batch", "-Q"}, elpaDirs()...)
	wantEglot := false
	if serveReady(t) {
		if _, err := runErr(dir, time.Minute, nil, emacs, append(args, "--eval", "(require 'eglot)")...); err == nil {
			wantEglot = true
			file := filepath.Join(t.TempDir(), "broken.loop")
			// An unknown field on line 4 gets a finding from the resolver.
			src := "loop l {\n  fluid water\n  node a at (0, 0, 0) m\n  lenght 1 m\n}\n"
			if err := os.WriteFile(file, []byte(src), 0o644); err != nil {
				t.Fatal(err)
			}
			env = append(env, "LOOP_EGLOT="+file, "PATH="+filepath.Dir(circa(t))+":"+os.Getenv("PATH"))
		} else if os.Getenv("CI") != "" {
			t.Error("eglot does not load (install elpa-eglot)")
		} else {
			t.Log("eglot does not load: skipping the eglot test")
		}
	}
	args = append(args, "-L", dir, "-l", filepath.Join(dir, "test", "loop-mode-test.el"), "-f", "ert-run-tests-batch-and-exit")
	out := run(t, dir, 3*time.Minute, env, emacs, args...)
	if !strings.Contains(out, "0 unexpected") {
		t.Errorf("ERT:\n%s", out)
	}
	if wantEglot && !strings.Contains(out, "passed") || wantEglot && strings.Contains(out, "SKIPPED  loop-mode-eglot") {
		t.Errorf("the eglot test did not run:\n%s", out)
	}
	t.Log(lastLine(out))
}

func lastLine(s string) string {
	lines := strings.Split(strings.TrimSpace(s), "\n")
	return lines[len(lines)-1]
}
