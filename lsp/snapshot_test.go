package lsp

import (
	"errors"
	"os"
	"path/filepath"
	"runtime"
	"syscall"
	"testing"
	"weak"

	"circa/lang/loopgen"
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

// TestReplacedVersionReleased checks that once an edit's first diagnostics
// are out, nothing keeps the version it replaced: not its model, its syntax
// tree or its analysis, guided in the background before the edit. A large
// file would otherwise hold two of each while the new version is checked.
func TestReplacedVersionReleased(t *testing.T) {
	c := newGuidedClient(t, Options{Debounce: -1})
	c.initialize(nil)
	uri := "file:///tmp/released.loop"
	c.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": uri, "languageId": "loop", "version": 1, "text": string(loopgen.Network(20, 4))}})
	c.waitGuided()
	c.srv.mu.Lock()
	sn := c.srv.snap
	c.srv.mu.Unlock()
	a := sn.roots["/tmp/released.loop"]
	if c.srv.guides.get(a) == nil {
		t.Fatal("the first version has no guidance")
	}
	wa, wm, wf := weak.Make(a), weak.Make(a.Model()), weak.Make(sn.docs["/tmp/released.loop"].File())
	sn, a = nil, nil
	c.notify("textDocument/didChange", map[string]any{"textDocument": map[string]any{"uri": uri, "version": 2},
		"contentChanges": []any{map[string]any{"range": map[string]any{"start": map[string]int{"line": 0, "character": 0}, "end": map[string]int{"line": 0, "character": 0}}, "text": "# edited\n"}}})
	c.settleQuick()
	runtime.GC()
	if wa.Value() != nil || wm.Value() != nil || wf.Value() != nil {
		t.Errorf("after the edit's diagnostics, still live: analysis %v, model %v, tree %v", wa.Value() != nil, wm.Value() != nil, wf.Value() != nil)
	}
}
