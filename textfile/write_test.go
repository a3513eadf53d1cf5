package textfile

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"
)

func writeFile(t *testing.T, path, text string, mode os.FileMode) {
	t.Helper()
	if err := os.WriteFile(path, []byte(text), mode); err != nil {
		t.Fatal(err)
	}
	if err := os.Chmod(path, mode); err != nil { // past the umask
		t.Fatal(err)
	}
}

func content(t *testing.T, path string) string {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}

// noTemps fails if a temporary file of Write is left in dir.
func noTemps(t *testing.T, dir string) {
	t.Helper()
	ents, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	for _, e := range ents {
		if strings.Contains(e.Name(), tempMark) {
			t.Errorf("temporary file %s left behind", e.Name())
		}
	}
}

func TestWriteReplacesAndKeepsMode(t *testing.T) {
	dir := t.TempDir()
	p := filepath.Join(dir, "a.loop")
	writeFile(t, p, "old\n", 0o640)
	if err := Write(p, []byte("new\n")); err != nil {
		t.Fatal(err)
	}
	if got := content(t, p); got != "new\n" {
		t.Fatalf("content %q", got)
	}
	st, _ := os.Stat(p)
	if st.Mode().Perm() != 0o640 {
		t.Fatalf("mode %v, want 0640", st.Mode().Perm())
	}
	noTemps(t, dir)
}

func TestWriteRefusesReadOnly(t *testing.T) {
	// Refused even for the superuser (CI runs as root), who could write it.
	dir := t.TempDir()
	p := filepath.Join(dir, "a.loop")
	writeFile(t, p, "old\n", 0o444)
	err := Write(p, []byte("new\n"))
	if !errors.Is(err, ErrReadOnly) {
		t.Fatalf("err = %v, want a read-only refusal", err)
	}
	if !strings.Contains(err.Error(), "read-only") {
		t.Fatalf("message %q does not say read-only", err)
	}
	if got := content(t, p); got != "old\n" {
		t.Fatalf("read-only file rewritten: %q", got)
	}
	noTemps(t, dir)
}

func TestWriteThroughSymlink(t *testing.T) {
	dir := t.TempDir()
	real := filepath.Join(dir, "real.loop")
	writeFile(t, real, "old\n", 0o644)
	link := filepath.Join(dir, "link.loop")
	if err := os.Symlink("real.loop", link); err != nil {
		t.Fatal(err)
	}
	if err := Write(link, []byte("new\n")); err != nil {
		t.Fatal(err)
	}
	st, err := os.Lstat(link)
	if err != nil || st.Mode()&os.ModeSymlink == 0 {
		t.Fatalf("the link was replaced: %v, %v", st.Mode(), err)
	}
	if got := content(t, real); got != "new\n" {
		t.Fatalf("target content %q", got)
	}
	noTemps(t, dir)
}

func TestWriteKeepsHardLinks(t *testing.T) {
	dir := t.TempDir()
	a := filepath.Join(dir, "a.loop")
	b := filepath.Join(dir, "b.loop")
	writeFile(t, a, "a much longer old text\n", 0o644)
	if err := os.Link(a, b); err != nil {
		t.Skip("no hard links here:", err)
	}
	if err := Write(a, []byte("new\n")); err != nil {
		t.Fatal(err)
	}
	if got := content(t, b); got != "new\n" {
		t.Fatalf("the other link sees %q", got)
	}
	sa, _ := os.Stat(a)
	sb, _ := os.Stat(b)
	if !os.SameFile(sa, sb) {
		t.Fatal("the hard link was broken")
	}
	noTemps(t, dir)
}

func TestWriteKeepsOwner(t *testing.T) {
	if os.Geteuid() != 0 {
		t.Skip("only the superuser can make a file of another owner")
	}
	dir := t.TempDir()
	p := filepath.Join(dir, "a.loop")
	writeFile(t, p, "old\n", 0o664)
	const uid, gid = 4321, 8765
	if err := os.Chown(p, uid, gid); err != nil {
		t.Fatal(err)
	}
	if err := Write(p, []byte("new\n")); err != nil {
		t.Fatal(err)
	}
	st, _ := os.Stat(p)
	s := st.Sys().(*syscall.Stat_t)
	if s.Uid != uid || s.Gid != gid {
		t.Fatalf("owner %d:%d, want %d:%d", s.Uid, s.Gid, uid, gid)
	}
	if got := content(t, p); got != "new\n" {
		t.Fatalf("content %q", got)
	}
}

func TestWriteRefusesDirectoryAndDevice(t *testing.T) {
	if err := Write(t.TempDir(), []byte("x")); !errors.Is(err, ErrNotRegular) {
		t.Fatalf("directory: %v", err)
	}
	if err := Write("/dev/null", []byte("x")); !errors.Is(err, ErrNotRegular) {
		t.Fatalf("device: %v", err)
	}
}

func TestRemoveTempsOnSignal(t *testing.T) {
	// What a signal handler does while a Write is between creating its
	// temporary file and renaming it.
	defer func() { temps.Lock(); temps.closed = false; temps.Unlock() }()
	dir := t.TempDir()
	f, err := createTemp(dir, "a.loop")
	if err != nil {
		t.Fatal(err)
	}
	f.Write(make([]byte, 1<<20))
	f.Close()
	RemoveTemps()
	noTemps(t, dir)
	p := filepath.Join(dir, "a.loop")
	writeFile(t, p, "old\n", 0o644)
	if err := Write(p, []byte("new\n")); err == nil {
		t.Fatal("a Write after RemoveTemps went ahead")
	}
	if got := content(t, p); got != "old\n" {
		t.Fatalf("content %q", got)
	}
	noTemps(t, dir)
}

func TestWriteRemovesStaleTemps(t *testing.T) {
	// A process killed with SIGKILL leaves its temporary file: the next
	// Write to the same file removes it once it is old, and leaves a fresh
	// one (another process may be writing) alone.
	dir := t.TempDir()
	p := filepath.Join(dir, "a.loop")
	writeFile(t, p, "old\n", 0o644)
	stale := filepath.Join(dir, ".a.loop"+tempMark+"123")
	fresh := filepath.Join(dir, ".a.loop"+tempMark+"456")
	other := filepath.Join(dir, ".b.loop"+tempMark+"789")
	for _, n := range []string{stale, fresh, other} {
		writeFile(t, n, "partial", 0o600)
	}
	old := time.Now().Add(-2 * StaleAfter)
	for _, n := range []string{stale, other} {
		if err := os.Chtimes(n, old, old); err != nil {
			t.Fatal(err)
		}
	}
	if err := Write(p, []byte("new\n")); err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(stale); !os.IsNotExist(err) {
		t.Error("stale temporary file kept")
	}
	for _, n := range []string{fresh, other} {
		if _, err := os.Stat(n); err != nil {
			t.Errorf("%s removed: %v", n, err)
		}
	}
}
