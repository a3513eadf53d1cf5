package main

import (
	"bytes"
	"circa/lang"
	"fmt"
	"math/rand"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"syscall"
	"testing"
	"time"
)

const messy = "loop a { fluid water; node x }\nparam   d=12mm   # bore\n"
const tidy = "loop a {\n  fluid water\n  node x\n}\nparam d = 12 mm  # bore\n"

func runCmd(t *testing.T, stdin string, args ...string) (int, string, string) {
	t.Helper()
	var out, errb bytes.Buffer
	code := run(append([]string{"fmt"}, args...), strings.NewReader(stdin), &out, &errb)
	return code, out.String(), errb.String()
}

func TestFmtStdin(t *testing.T) {
	for _, args := range [][]string{nil, {"-"}} {
		code, out, errs := runCmd(t, messy, args...)
		if code != exitOK || out != tidy || errs != "" {
			t.Errorf("fmt %v = %d, %q, %q; want 0, %q", args, code, out, errs, tidy)
		}
	}
	if code, _, _ := runCmd(t, messy, "-w", "-"); code != exitUsage {
		t.Errorf("fmt -w - = %d, want %d", code, exitUsage)
	}
}

func TestFmtSyntaxError(t *testing.T) {
	dir := t.TempDir()
	p := filepath.Join(dir, "bad.loop")
	src := "loop a {\n  length 1 m +\n}\n"
	if err := os.WriteFile(p, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	code, out, errs := runCmd(t, "", "-w", p)
	if code != exitFindings || out != "" {
		t.Fatalf("code %d out %q, want 1 and nothing", code, out)
	}
	// The dangling "+" of "  length 1 m +" is at column 14 of line 2.
	want := p + ":2:14: error: "
	if !strings.HasPrefix(errs, want) || !strings.HasSuffix(errs, "[syntax]\n") {
		t.Errorf("stderr %q, want %q… [syntax]", errs, want)
	}
	if b, _ := os.ReadFile(p); string(b) != src {
		t.Errorf("file changed to %q", b)
	}
}

func TestFmtWriteListDiff(t *testing.T) {
	dir := t.TempDir()
	sub := filepath.Join(dir, "sub", "deeper")
	if err := os.MkdirAll(sub, 0o755); err != nil {
		t.Fatal(err)
	}
	messyPath := filepath.Join(sub, "messy.loop")
	tidyPath := filepath.Join(dir, "tidy.loop")
	other := filepath.Join(dir, "notes.txt")
	os.WriteFile(messyPath, []byte(messy), 0o640)
	os.WriteFile(tidyPath, []byte(tidy), 0o600)
	os.WriteFile(other, []byte(messy), 0o644)
	old := time.Now().Add(-time.Hour).Truncate(time.Second)
	os.Chtimes(tidyPath, old, old)

	code, out, errs := runCmd(t, "", "-l", dir)
	if code != exitOK || out != messyPath+"\n" || errs != "" {
		t.Fatalf("-l: %d %q %q; want only %s", code, out, errs, messyPath)
	}
	code, out, _ = runCmd(t, "", "-d", messyPath)
	if code != exitOK || !strings.HasPrefix(out, "--- "+messyPath+"\n+++ "+messyPath+"\n@@ -1,2 +1,5 @@\n") {
		t.Fatalf("-d: %d %q", code, out)
	}
	if got := applyUnified(t, messy, out); got != tidy {
		t.Fatalf("the diff applied gives %q, want %q", got, tidy)
	}
	code, out, errs = runCmd(t, "", "-w", dir)
	if code != exitOK || out != "" || errs != "" {
		t.Fatalf("-w: %d %q %q", code, out, errs)
	}
	if b, _ := os.ReadFile(messyPath); string(b) != tidy {
		t.Errorf("messy.loop after -w: %q", b)
	}
	if fi, _ := os.Stat(messyPath); fi.Mode().Perm() != 0o640 {
		t.Errorf("mode after -w: %v, want 0640", fi.Mode().Perm())
	}
	if fi, _ := os.Stat(tidyPath); !fi.ModTime().Equal(old) {
		t.Errorf("an already formatted file was rewritten (mtime %v, want %v)", fi.ModTime(), old)
	}
	if b, _ := os.ReadFile(other); string(b) != messy {
		t.Errorf("a non-.loop file in the directory was touched")
	}
	// A named file is formatted whatever its extension.
	if code, out, _ := runCmd(t, "", other); code != exitOK || out != tidy {
		t.Errorf("named non-.loop file: %d %q", code, out)
	}
	if entries, _ := os.ReadDir(sub); len(entries) != 1 {
		t.Errorf("temporary files left behind: %v", entries)
	}
}

func TestFmtUsageErrors(t *testing.T) {
	if code, _, errs := runCmd(t, "", filepath.Join(t.TempDir(), "missing.loop")); code != exitUsage || errs == "" {
		t.Errorf("missing file: %d %q", code, errs)
	}
	if code, _, _ := runCmd(t, "", "-x"); code != exitUsage {
		t.Errorf("unknown flag: %d", code)
	}
	if code, out, _ := runCmd(t, "", "--help"); code != exitOK || !strings.Contains(out, "Usage: circa fmt") {
		t.Errorf("--help: %d %q", code, out)
	}
}

func TestFmtExamplesAreFormatted(t *testing.T) {
	code, out, errs := runCmd(t, "", "-l", filepath.Join("..", "..", "testdata", "examples"))
	if code != exitOK || errs != "" {
		t.Fatalf("%d %q", code, errs)
	}
	t.Logf("examples not in canonical layout:\n%s", out)
}

// applyUnified applies a unified diff to a, checking every context and
// removed line, so a wrong diff cannot pass.
func applyUnified(t *testing.T, a, diff string) string {
	t.Helper()
	src := lang.SplitLines([]byte(a))
	lines := strings.SplitAfter(diff, "\n")
	var out []string
	pos := 0 // next unread line of src
	for i := 0; i < len(lines); i++ {
		l := lines[i]
		if !strings.HasPrefix(l, "@@ ") {
			continue
		}
		var sa, la, sb, lb int
		if _, err := fmt.Sscanf(l, "@@ -%d,%d +%d,%d @@", &sa, &la, &sb, &lb); err != nil {
			t.Fatalf("bad hunk header %q", l)
		}
		start := sa - 1
		if la == 0 {
			start = sa
		}
		out = append(out, src[pos:start]...)
		pos = start
		gotA, gotB := 0, 0
		for i+1 < len(lines) && lines[i+1] != "" && !strings.HasPrefix(lines[i+1], "@@ ") {
			i++
			body := lines[i]
			text := body[1:]
			if i+1 < len(lines) && strings.HasPrefix(lines[i+1], `\ No newline`) {
				text = strings.TrimSuffix(text, "\n")
				i++
			}
			switch body[0] {
			case ' ', '-':
				if pos >= len(src) || src[pos] != text {
					t.Fatalf("diff line %q does not match the text at line %d", body, pos+1)
				}
				pos++
				gotA++
				if body[0] == ' ' {
					out = append(out, text)
					gotB++
				}
			case '+':
				out = append(out, text)
				gotB++
			default:
				t.Fatalf("bad diff line %q", body)
			}
		}
		if gotA != la || gotB != lb {
			t.Fatalf("hunk %q holds %d/%d lines", l, gotA, gotB)
		}
	}
	out = append(out, src[pos:]...)
	return strings.Join(out, "")
}

func TestUnifiedDiffRandom(t *testing.T) {
	rng := rand.New(rand.NewSource(1))
	gen := func() string {
		var b strings.Builder
		n := rng.Intn(30)
		for i := 0; i < n; i++ {
			b.WriteString(strconv.Itoa(rng.Intn(6)))
			if i < n-1 || rng.Intn(4) > 0 {
				b.WriteByte('\n')
			}
		}
		return b.String()
	}
	for k := 0; k < 2000; k++ {
		a, b := gen(), gen()
		d := unifiedDiff("a", "b", []byte(a), []byte(b))
		if a == b {
			if d != "" {
				t.Fatalf("equal texts gave a diff %q", d)
			}
			continue
		}
		if got := applyUnified(t, a, d); got != b {
			t.Fatalf("diff of %q → %q applied gives %q\n%s", a, b, got, d)
		}
	}
}

// TestUnifiedDiffMatchesDiffU checks the hunks against the system's
// "diff -u" (GNU diffutils or BSD diff) on a change with only one minimal
// edit script, and that "patch" accepts our output.
func TestUnifiedDiffMatchesDiffU(t *testing.T) {
	diffTool, err := exec.LookPath("diff")
	if err != nil {
		t.Skip("no diff on this system")
	}
	var a, b strings.Builder
	for i := 1; i <= 20; i++ {
		fmt.Fprintf(&a, "line %d\n", i)
		switch i {
		case 5:
			b.WriteString("changed 5\n")
		case 14:
		default:
			fmt.Fprintf(&b, "line %d\n", i)
		}
		if i == 18 {
			b.WriteString("added after 18\n")
		}
	}
	b.WriteString("no newline")
	dir := t.TempDir()
	pa, pb := filepath.Join(dir, "a"), filepath.Join(dir, "b")
	os.WriteFile(pa, []byte(a.String()), 0o644)
	os.WriteFile(pb, []byte(b.String()), 0o644)
	want, _ := exec.Command(diffTool, "-u", pa, pb).Output()
	got := unifiedDiff(pa, pb, []byte(a.String()), []byte(b.String()))
	hunks := func(s string) string { // drop the two header lines (dates differ)
		parts := strings.SplitN(s, "\n", 3)
		if len(parts) < 3 {
			return ""
		}
		return parts[2]
	}
	if hunks(got) != hunks(string(want)) {
		t.Errorf("hunks differ from diff -u\ngot:\n%s\nwant:\n%s", got, want)
	}
	if patchTool, err := exec.LookPath("patch"); err == nil {
		cmd := exec.Command(patchTool, "-s", "-o", filepath.Join(dir, "out"), pa)
		cmd.Stdin = strings.NewReader(got)
		if msg, err := cmd.CombinedOutput(); err != nil {
			t.Fatalf("patch rejects the diff: %v %s", err, msg)
		}
		if out, _ := os.ReadFile(filepath.Join(dir, "out")); string(out) != b.String() {
			t.Errorf("patch result %q", out)
		}
	}
}

// fmt -w rewrites what the user meant and nothing else: a symbolic link's
// target (the link stays), every name of a hard-linked file, the mode; it
// refuses a read-only file and leaves no temporary file.
func TestFmtWriteKeepsTheFile(t *testing.T) {
	dir := t.TempDir()
	noTemps := func() {
		t.Helper()
		ents, _ := os.ReadDir(dir)
		for _, e := range ents {
			if strings.HasPrefix(e.Name(), ".") {
				t.Errorf("temporary file %s left", e.Name())
			}
		}
	}
	write := func(name, text string, mode os.FileMode) string {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, []byte(text), mode); err != nil {
			t.Fatal(err)
		}
		os.Chmod(p, mode)
		return p
	}
	read := func(p string) string {
		b, _ := os.ReadFile(p)
		return string(b)
	}

	target := write("target.loop", messy, 0o640)
	link := filepath.Join(dir, "link.loop")
	if err := os.Symlink("target.loop", link); err != nil {
		t.Fatal(err)
	}
	if code, _, errs := runCmd(t, "", "-w", link); code != exitOK {
		t.Fatalf("-w link: %d %q", code, errs)
	}
	if st, err := os.Lstat(link); err != nil || st.Mode()&os.ModeSymlink == 0 {
		t.Error("the symbolic link was replaced by a file")
	}
	if read(target) != tidy {
		t.Errorf("target not formatted: %q", read(target))
	}
	if st, _ := os.Stat(target); st.Mode().Perm() != 0o640 {
		t.Errorf("mode %v", st.Mode().Perm())
	}

	ro := write("ro.loop", messy, 0o444)
	code, _, errs := runCmd(t, "", "-w", ro)
	if code != exitUsage || !strings.Contains(errs, "circa fmt: cannot write "+ro+": it is read-only") {
		t.Errorf("-w read-only: %d %q", code, errs)
	}
	if read(ro) != messy {
		t.Error("read-only file rewritten")
	}

	a := write("a.loop", messy, 0o644)
	b := filepath.Join(dir, "b.loop")
	if err := os.Link(a, b); err != nil {
		t.Fatal(err)
	}
	if code, _, errs := runCmd(t, "", "-w", a); code != exitOK {
		t.Fatalf("-w hard link: %d %q", code, errs)
	}
	sa, _ := os.Stat(a)
	sb, _ := os.Stat(b)
	if !os.SameFile(sa, sb) || read(b) != tidy {
		t.Errorf("hard link broken or not formatted: %q", read(b))
	}

	if os.Geteuid() == 0 {
		owned := write("owned.loop", messy, 0o644)
		os.Chown(owned, 1234, 5678)
		if code, _, errs := runCmd(t, "", "-w", owned); code != exitOK {
			t.Fatalf("-w owned: %d %q", code, errs)
		}
		st, _ := os.Stat(owned)
		if s := st.Sys().(*syscall.Stat_t); s.Uid != 1234 || s.Gid != 5678 {
			t.Errorf("owner changed to %d:%d", s.Uid, s.Gid)
		}
	}
	noTemps()
}

// -check fails CI when a file is not formatted, listing it; a formatted
// file passes.
func TestFmtCheck(t *testing.T) {
	dir := t.TempDir()
	m := filepath.Join(dir, "messy.loop")
	ok := filepath.Join(dir, "tidy.loop")
	os.WriteFile(m, []byte(messy), 0o644)
	os.WriteFile(ok, []byte(tidy), 0o644)
	if code, out, errs := runCmd(t, "", "-check", dir); code != exitFindings || out != m+"\n" || errs != "" {
		t.Errorf("-check dir: %d %q %q", code, out, errs)
	}
	if code, out, _ := runCmd(t, "", "-check", ok); code != exitOK || out != "" {
		t.Errorf("-check tidy: %d %q", code, out)
	}
	if code, out, _ := runCmd(t, "", "-check", "-d", m); code != exitFindings || !strings.HasPrefix(out, "--- "+m) {
		t.Errorf("-check -d: %d %q", code, out)
	}
	if code, out, _ := runCmd(t, messy, "-check"); code != exitFindings || out != "<standard input>\n" {
		t.Errorf("-check stdin: %d %q", code, out)
	}
	// Without -check, -l and -d report without failing.
	if code, _, _ := runCmd(t, "", "-l", m); code != exitOK {
		t.Errorf("-l: %d", code)
	}
}
