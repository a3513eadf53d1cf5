package textfile

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
)

func TestReadRegular(t *testing.T) {
	p := filepath.Join(t.TempDir(), "a.loop")
	want := "loop a {\n}\n"
	if err := os.WriteFile(p, []byte(want), 0o644); err != nil {
		t.Fatal(err)
	}
	got, err := Read(p)
	if err != nil || string(got) != want {
		t.Fatalf("Read = %q, %v; want %q", got, err, want)
	}
	// Through a symlink too.
	l := filepath.Join(t.TempDir(), "link.loop")
	if err := os.Symlink(p, l); err != nil {
		t.Fatal(err)
	}
	if got, err := Read(l); err != nil || string(got) != want {
		t.Fatalf("Read(symlink) = %q, %v", got, err)
	}
}

func TestReadEmpty(t *testing.T) {
	p := filepath.Join(t.TempDir(), "empty.loop")
	if err := os.WriteFile(p, nil, 0o644); err != nil {
		t.Fatal(err)
	}
	if got, err := Read(p); err != nil || len(got) != 0 {
		t.Fatalf("Read = %q, %v", got, err)
	}
}

// refused checks that err is an *Error whose reason contains want.
func refused(t *testing.T, err error, want string) {
	t.Helper()
	var e *Error
	if !errors.As(err, &e) {
		t.Fatalf("error %v (%T) is not a refusal", err, err)
	}
	if !strings.Contains(e.Error(), want) {
		t.Fatalf("reason %q does not say %q", e.Error(), want)
	}
}

func TestReadRefusesDevicesAndDirectories(t *testing.T) {
	_, err := Read("/dev/zero")
	refused(t, err, "character device")
	_, err = Read(t.TempDir())
	refused(t, err, "directory")
}

func TestReadRefusesFIFOWithoutBlocking(t *testing.T) {
	p := filepath.Join(t.TempDir(), "pipe.loop")
	if err := syscall.Mkfifo(p, 0o644); err != nil {
		t.Skip("no FIFOs here:", err)
	}
	// No writer ever opens the pipe: a read that blocked would hang the test.
	_, err := Read(p)
	refused(t, err, "named pipe")
}

func TestOpenNonBlockingOnFIFO(t *testing.T) {
	// The second check, on the open file, must not block either when the
	// path turned into a FIFO after the first.
	p := filepath.Join(t.TempDir(), "pipe")
	if err := syscall.Mkfifo(p, 0o644); err != nil {
		t.Skip("no FIFOs here:", err)
	}
	f, err := openNonBlocking(p)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	st, err := f.Stat()
	if err != nil {
		t.Fatal(err)
	}
	refused(t, regular(p, st), "named pipe")
}

func TestReadRefusesLargeFile(t *testing.T) {
	p := filepath.Join(t.TempDir(), "big.loop")
	f, err := os.Create(p)
	if err != nil {
		t.Fatal(err)
	}
	// Sparse: costs no disk.
	if err := f.Truncate(MaxSize + 1); err != nil {
		t.Fatal(err)
	}
	f.Close()
	_, err = Read(p)
	refused(t, err, "larger than 16 MiB")
	if !errors.Is(err, ErrTooLarge) {
		t.Fatalf("%v does not wrap ErrTooLarge", err)
	}
	if err := os.Truncate(p, MaxSize); err != nil {
		t.Fatal(err)
	}
	if b, err := Read(p); err != nil || len(b) != MaxSize {
		t.Fatalf("a file of exactly MaxSize: %d bytes, %v", len(b), err)
	}
}

func TestReadAllCaps(t *testing.T) {
	b, err := ReadAll("<stdin>", strings.NewReader("abc"))
	if err != nil || string(b) != "abc" {
		t.Fatalf("ReadAll = %q, %v", b, err)
	}
	_, err = ReadAll("<stdin>", &zeros{})
	refused(t, err, "larger than")
}

// zeros is an endless reader, like /dev/zero behind a pipe.
type zeros struct{}

func (*zeros) Read(p []byte) (int, error) {
	clear(p)
	return len(p), nil
}

func TestReadMissing(t *testing.T) {
	_, err := Read(filepath.Join(t.TempDir(), "nope.loop"))
	if !errors.Is(err, os.ErrNotExist) {
		t.Fatalf("err = %v, want not-exist", err)
	}
}
