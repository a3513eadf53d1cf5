package lsp

import (
	"errors"
	"os"
	"path/filepath"
	"syscall"
	"testing"

	"circa/textfile"
)

// The server reads included files from disk through the shared reader: a
// device or a FIFO named by an include is refused at once (a FIFO read
// would block the server), and a leading
// byte-order mark is dropped as editors hide it.
func TestDiskCacheReadsOnlyRegularFiles(t *testing.T) {
	var c diskCache
	if _, err := c.read("/dev/zero"); !errors.Is(err, textfile.ErrNotRegular) {
		t.Errorf("/dev/zero: %v", err)
	}
	dir := t.TempDir()
	fifo := filepath.Join(dir, "pipe.loop")
	if err := syscall.Mkfifo(fifo, 0o644); err == nil {
		if _, err := c.read(fifo); !errors.Is(err, textfile.ErrNotRegular) {
			t.Errorf("FIFO: %v", err)
		}
	}
	p := filepath.Join(dir, "bom.loop")
	os.WriteFile(p, []byte("\ufeffparam a = 1 m\n"), 0o644)
	if b, err := c.read(p); err != nil || string(b) != "param a = 1 m\n" {
		t.Errorf("BOM file: %q, %v", b, err)
	}
}
