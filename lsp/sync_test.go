package lsp

import (
	"encoding/json"
	"fmt"
	"os"
	"strings"
	"sync/atomic"
	"testing"
	"time"
)

func utf8Caps() map[string]any {
	return map[string]any{"general": map[string]any{"positionEncodings": []string{"utf-8"}}}
}

func lastPos(text string) (line, col int) {
	i := strings.LastIndexByte(text, '\n')
	return strings.Count(text, "\n"), len(text) - (i + 1)
}

// TestTypingAtEndUTF8 types 100 characters one by one at the end of a
// shipped example, under UTF-8 positions, where the last line has no
// newline after the first keystroke. Every edit must reach the server's
// copy, and requests with a range ending at the end of the file must be
// answered.
func TestTypingAtEndUTF8(t *testing.T) {
	src, err := os.ReadFile("../testdata/examples/rack-door.loop")
	if err != nil {
		t.Fatal(err)
	}
	c := newTestClient(t, Options{Debounce: -1})
	c.initialize(utf8Caps())
	uri := "file:///tmp/typing/rack-door.loop"
	want := string(src)
	c.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": uri, "languageId": "loop", "version": 1, "text": want}})
	typed := string([]rune(strings.Repeat("# µ°² note ", 10))[:100])
	for i, r := range []rune(typed) {
		line, col := lastPos(want)
		pos := map[string]any{"line": line, "character": col}
		c.notify("textDocument/didChange", map[string]any{"textDocument": map[string]any{"uri": uri, "version": 2 + i},
			"contentChanges": []any{map[string]any{"range": map[string]any{"start": pos, "end": pos}, "text": string(r)}}})
		want += string(r)
	}
	c.settle()
	if got := c.srv.currentDoc(t, uri); got != want {
		t.Errorf("server's text drifted from the editor's; its tail:\n%q\nwant:\n%q", tail(got), tail(want))
	}
	p, _ := c.published(uri)
	if p.Version == nil || int(*p.Version) != 1+len([]rune(typed)) {
		t.Errorf("last diagnostics are for version %s, want %d", versionString(p.Version), 1+len([]rune(typed)))
	}
	line, col := lastPos(want)
	end := map[string]any{"line": line, "character": col}
	whole := map[string]any{"start": map[string]any{"line": 0, "character": 0}, "end": end}
	doc := map[string]any{"uri": uri}
	for _, tc := range []struct {
		method string
		params map[string]any
	}{
		{"textDocument/hover", map[string]any{"textDocument": doc, "position": end}},
		{"textDocument/completion", map[string]any{"textDocument": doc, "position": end}},
		{"textDocument/inlayHint", map[string]any{"textDocument": doc, "range": whole}},
		{"textDocument/codeAction", map[string]any{"textDocument": doc, "range": whole, "context": map[string]any{"diagnostics": []any{}}}},
		{"textDocument/rangeFormatting", map[string]any{"textDocument": doc, "range": whole, "options": map[string]any{"tabSize": 2, "insertSpaces": true}}},
	} {
		if _, err := c.call(tc.method, tc.params); err != nil {
			t.Errorf("%s with a position at the end of the file: %v", tc.method, err)
		}
	}
}

func tail(s string) string {
	if len(s) > 120 {
		return s[len(s)-120:]
	}
	return s
}

// TestPanicInChangeMarksOutOfSync makes the change handler panic and
// checks that the server says so instead of going on with a stale copy:
// an error logged to the client, one out-of-sync finding for the version
// it holds, requests that would edit refused, and the text taken again
// from a save, a whole-text change or a new didOpen.
func TestPanicInChangeMarksOutOfSync(t *testing.T) {
	c := newTestClient(t, Options{Debounce: -1})
	var armed atomic.Value // the method whose next notification panics
	armed.Store("")
	c.srv.beforeNote = func(method string) {
		if armed.CompareAndSwap(method, "") {
			panic("injected failure")
		}
	}
	var init struct {
		Capabilities struct {
			TextDocumentSync struct {
				Save struct {
					IncludeText bool `json:"includeText"`
				} `json:"save"`
			} `json:"textDocumentSync"`
		} `json:"capabilities"`
	}
	json.Unmarshal(c.initialize(nil), &init)
	if !init.Capabilities.TextDocumentSync.Save.IncludeText {
		t.Error("the server does not ask for the text on save")
	}
	uri := "file:///tmp/sync/a.loop"
	doc := map[string]any{"uri": uri}
	open := func(version int, text string) {
		c.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": uri, "languageId": "loop", "version": version, "text": text}})
	}
	change := func(version int, changes ...any) {
		c.notify("textDocument/didChange", map[string]any{"textDocument": map[string]any{"uri": uri, "version": version}, "contentChanges": changes})
	}
	insertAtStart := func(text string) any {
		p := map[string]any{"line": 0, "character": 0}
		return map[string]any{"range": map[string]any{"start": p, "end": p}, "text": text}
	}
	expect := func(what string, version int, outOfSync bool, text string) {
		t.Helper()
		c.settle()
		if got := c.srv.currentDoc(t, uri); got != text {
			t.Errorf("%s: the server holds %q, want %q", what, got, text)
		}
		p, _ := c.published(uri)
		if p.Version == nil || int(*p.Version) != version {
			t.Errorf("%s: diagnostics for version %s, want %d", what, versionString(p.Version), version)
		}
		codes := []string{}
		for _, raw := range p.Diagnostics {
			var d struct{ Code string }
			json.Unmarshal(raw, &d)
			codes = append(codes, d.Code)
		}
		if got := len(codes) == 1 && codes[0] == "out-of-sync"; got != outOfSync {
			t.Errorf("%s: published %v; want out of sync: %v", what, codes, outOfSync)
		}
	}
	format := func() *rpcError {
		_, err := c.call("textDocument/formatting", map[string]any{"textDocument": doc, "options": map[string]any{"tabSize": 2, "insertSpaces": true}})
		return err
	}

	open(1, smallLoop)
	expect("opened", 1, false, smallLoop)

	armed.Store("textDocument/didChange")
	change(2, insertAtStart("# two\n"))
	expect("after the failed change", 1, true, smallLoop)
	c.waitNote(t, func(m rpcMessage) bool {
		var p struct {
			Type    int    `json:"type"`
			Message string `json:"message"`
		}
		json.Unmarshal(m.Params, &p)
		// LSP 3.17 MessageType: 1 is Error.
		return m.Method == "window/logMessage" && p.Type == 1 && strings.Contains(p.Message, "didChange") && strings.Contains(p.Message, "injected failure")
	})
	change(3, insertAtStart("# three\n"))
	expect("an incremental change while out of sync", 1, true, smallLoop)
	// LSP 3.17 ErrorCodes: RequestFailed is -32803.
	if err := format(); err == nil || err.Code != -32803 {
		t.Errorf("formatting an out-of-sync file: %v, want -32803", err)
	}
	if _, err := c.call("textDocument/hover", map[string]any{"textDocument": doc, "position": map[string]any{"line": 0, "character": 2}}); err != nil {
		t.Errorf("hover on an out-of-sync file: %v", err)
	}
	client := "# three\n# two\n" + smallLoop
	c.notify("textDocument/didSave", map[string]any{"textDocument": doc, "text": client})
	expect("after a save", 3, false, client)
	if err := format(); err != nil {
		t.Errorf("formatting after the save: %v", err)
	}

	armed.Store("textDocument/didChange")
	change(4, insertAtStart("# four\n"))
	expect("after a second failed change", 3, true, client)
	change(5, map[string]any{"text": smallLoop}, insertAtStart("# five\n"))
	expect("after a whole-text change", 5, false, "# five\n"+smallLoop)

	// A save that differs from a copy believed in sync is taken too.
	c.notify("textDocument/didSave", map[string]any{"textDocument": doc, "text": smallLoop})
	expect("after a save that differs", 5, false, smallLoop)

	// A failed open of a file already open keeps the copy it had.
	armed.Store("textDocument/didOpen")
	open(6, "# six\n"+smallLoop)
	expect("after a failed open", 5, true, smallLoop)
	// One of a file not open holds an empty text.
	c.notify("textDocument/didClose", map[string]any{"textDocument": doc})
	armed.Store("textDocument/didOpen")
	open(6, "# six\n"+smallLoop)
	expect("after a failed first open", 6, true, "")
	open(7, "# seven\n"+smallLoop)
	expect("after opening again", 7, false, "# seven\n"+smallLoop)
	if code := c.shutdownExit(); code != 0 {
		t.Errorf("exit status %d", code)
	}
}

// waitNote waits for a notification from the server that ok accepts.
func (c *testClient) waitNote(t *testing.T, ok func(rpcMessage) bool) {
	t.Helper()
	deadline := time.Now().Add(10 * time.Second)
	for time.Now().Before(deadline) {
		c.mu.Lock()
		for _, m := range c.notes {
			if ok(m) {
				c.mu.Unlock()
				return
			}
		}
		c.mu.Unlock()
		time.Sleep(5 * time.Millisecond)
	}
	t.Error("the expected notification never came")
}

func versionString(v *int32) string {
	if v == nil {
		return "none"
	}
	return fmt.Sprint(*v)
}
