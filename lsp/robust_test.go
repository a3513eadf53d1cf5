package lsp

import (
	"context"
	"encoding/json"
	"fmt"
	"strings"
	"sync"
	"testing"
	"time"
)

const smallLoop = "param d = 12 mm\nloop l {\n  fluid R1233zd(E)\n  node a\n  node b\n  pipe p from a to b { length 1 m; bore d }\n}\n"

func TestMalformedJSON(t *testing.T) {
	c := newTestClient(t, Options{Debounce: -1})
	c.initialize(nil)
	c.write([]byte(`{"jsonrpc":"2.0","id":1,"method":"textDocument/hover","params":{`))
	c.write([]byte(`not json at all`))
	c.write([]byte(`[1,2`))
	// JSON, but not a request: -32600.
	c.write([]byte(`{"foo":1}`))
	// The server survives and answers the next request.
	c.mustCall("workspace/symbol", map[string]any{"query": ""})
	c.mu.Lock()
	defer c.mu.Unlock()
	codes := map[int]int{}
	for _, n := range c.notes {
		if n.Error != nil && string(n.ID) == "null" {
			codes[n.Error.Code]++
		}
	}
	// JSON-RPC 2.0 §5.1: -32700 parse error, -32600 invalid request, id null.
	if codes[-32700] != 3 || codes[-32600] != 1 {
		t.Errorf("error replies by code: %v, want 3 × -32700 and 1 × -32600", codes)
	}
}

func TestErrorCodes(t *testing.T) {
	c := newTestClient(t, Options{Debounce: -1})
	// LSP 3.17 §ServerNotInitialized: -32002 for requests before initialize.
	if _, err := c.call("textDocument/hover", map[string]any{}); err == nil || err.Code != -32002 {
		t.Errorf("hover before initialize: %v, want -32002", err)
	}
	c.initialize(nil)
	// JSON-RPC 2.0 §5.1: -32601 method not found, -32602 invalid params.
	if _, err := c.call("textDocument/nonsense", map[string]any{}); err == nil || err.Code != -32601 {
		t.Errorf("unknown method: %v, want -32601", err)
	}
	if _, err := c.call("textDocument/hover", map[string]any{"textDocument": 5, "position": "here"}); err == nil || err.Code != -32602 {
		t.Errorf("wrong param types: %v, want -32602", err)
	}
	if _, err := c.call("textDocument/hover", []int{1, 2}); err == nil || err.Code != -32602 {
		t.Errorf("params of the wrong shape: %v, want -32602", err)
	}
	// A notification with wrong params is dropped; the session lives.
	c.notify("textDocument/didOpen", map[string]any{"textDocument": "x"})
	c.notify("$/unknownNotification", map[string]any{})
	c.mustCall("workspace/symbol", map[string]any{"query": ""})
	if _, err := c.call("initialize", map[string]any{"capabilities": map[string]any{}}); err == nil {
		t.Error("a second initialize was accepted")
	}
}

func TestNeverOpenedAndPastTheEnd(t *testing.T) {
	c := newTestClient(t, Options{Debounce: -1})
	c.initialize(nil)
	ghost := map[string]any{"textDocument": map[string]any{"uri": "file:///nowhere/ghost.loop"}, "position": map[string]any{"line": 3, "character": 4}}
	for _, m := range []string{"textDocument/hover", "textDocument/definition", "textDocument/completion", "textDocument/references", "textDocument/prepareRename"} {
		if _, err := c.call(m, ghost); err != nil {
			t.Errorf("%s on a document never opened: %v", m, err)
		}
	}
	for _, m := range []string{"textDocument/documentSymbol", "textDocument/formatting", "textDocument/semanticTokens/full", "textDocument/foldingRange"} {
		if _, err := c.call(m, map[string]any{"textDocument": map[string]any{"uri": "file:///nowhere/ghost.loop"}, "options": map[string]any{"tabSize": 2, "insertSpaces": true}}); err != nil {
			t.Errorf("%s on a document never opened: %v", m, err)
		}
	}
	uri := "file:///tmp/past.loop"
	c.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": uri, "languageId": "loop", "version": 1, "text": smallLoop}})
	for _, pos := range []map[string]any{{"line": 500, "character": 0}, {"line": 1, "character": 900}, {"line": 0, "character": 4294967295}} {
		for _, m := range []string{"textDocument/hover", "textDocument/completion", "textDocument/definition"} {
			if _, err := c.call(m, map[string]any{"textDocument": map[string]any{"uri": uri}, "position": pos}); err != nil {
				t.Errorf("%s at %v: %v", m, pos, err)
			}
		}
	}
	// An edit whose range runs past the end is clamped to the text.
	c.notify("textDocument/didChange", map[string]any{"textDocument": map[string]any{"uri": uri, "version": 2},
		"contentChanges": []any{map[string]any{"range": map[string]any{"start": map[string]any{"line": 99, "character": 0}, "end": map[string]any{"line": 120, "character": 5}}, "text": "# tail\n"}}})
	c.settle()
	if d := c.srv.currentDoc(t, uri); !strings.HasSuffix(d, "}\n# tail\n") {
		t.Errorf("text after an edit past the end:\n%s", d)
	}
}

func (s *Server) currentDoc(t *testing.T, uri string) string {
	s.mu.Lock()
	defer s.mu.Unlock()
	for _, d := range s.snap.docs {
		if string(d.uri) == uri {
			return string(d.text)
		}
	}
	t.Fatalf("%s is not open", uri)
	return ""
}

func TestCancelRequest(t *testing.T) {
	for _, id := range []string{`7`, `"hover-seven"`} {
		t.Run(id, func(t *testing.T) {
			c := newTestClient(t, Options{Debounce: -1})
			entered := make(chan struct{})
			c.srv.beforeReply = func(ctx context.Context, method string) {
				if method == "textDocument/hover" {
					close(entered)
					<-ctx.Done() // hold the request until it is cancelled
				}
			}
			c.initialize(nil)
			c.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": "file:///tmp/c.loop", "languageId": "loop", "version": 1, "text": smallLoop}})
			ch := c.send(id, "textDocument/hover", map[string]any{"textDocument": map[string]any{"uri": "file:///tmp/c.loop"}, "position": map[string]any{"line": 0, "character": 11}})
			<-entered
			c.notify("$/cancelRequest", map[string]any{"id": json.RawMessage(id)})
			select {
			case r := <-ch:
				// LSP 3.17: RequestCancelled is -32800.
				if r.err == nil || r.err.Code != -32800 {
					t.Errorf("cancelled request answered %s %v, want -32800", r.result, r.err)
				}
			case <-time.After(5 * time.Second):
				t.Fatal("a cancelled request got no reply")
			}
			c.mustCall("workspace/symbol", map[string]any{"query": ""})
		})
	}
}

func TestShutdownExit(t *testing.T) {
	c := newTestClient(t, Options{Debounce: -1})
	c.initialize(nil)
	start := time.Now()
	// LSP 3.17 exit: code 0 after shutdown, 1 otherwise.
	if code := c.shutdownExit(); code != 0 {
		t.Errorf("exit after shutdown: %d, want 0", code)
	}
	if d := time.Since(start); d > 2*time.Second {
		t.Errorf("exit took %v", d)
	}

	c = newTestClient(t, Options{Debounce: -1})
	c.initialize(nil)
	c.notify("exit", nil)
	select {
	case code := <-c.exitCh:
		if code != 1 {
			t.Errorf("exit without shutdown: %d, want 1", code)
		}
	case <-time.After(5 * time.Second):
		t.Fatal("no exit")
	}

	c = newTestClient(t, Options{Debounce: -1})
	c.initialize(nil)
	c.mustCall("shutdown", nil)
	// After shutdown requests are refused with InvalidRequest.
	if _, err := c.call("textDocument/hover", map[string]any{}); err == nil || err.Code != -32600 {
		t.Errorf("request after shutdown: %v, want -32600", err)
	}
}

// TestEditFlood sends many edits without waiting; the last published
// diagnostics must be those of the final text, for its version.
func TestEditFlood(t *testing.T) {
	c := newTestClient(t, Options{Debounce: 5 * time.Millisecond})
	c.initialize(nil)
	uri := "file:///tmp/flood.loop"
	c.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": uri, "languageId": "loop", "version": 1, "text": smallLoop}})
	const n = 300
	for i := 0; i < n; i++ {
		// Alternate a unit error in and out; the last one (i = n-1, odd) leaves it in.
		text := "12 mm"
		if i%2 == 1 {
			text = "12 kg"
		}
		c.notify("textDocument/didChange", map[string]any{"textDocument": map[string]any{"uri": uri, "version": i + 2},
			"contentChanges": []any{map[string]any{"range": map[string]any{"start": map[string]any{"line": 0, "character": 10}, "end": map[string]any{"line": 0, "character": 15}}, "text": text}}})
	}
	c.settle()
	p, ok := c.published(uri)
	if !ok || p.Version == nil || *p.Version != n+1 {
		t.Fatalf("last publication: %+v, want version %d", p, n+1)
	}
	found := false
	for _, d := range p.Diagnostics {
		found = found || strings.Contains(string(d), "expected a length")
	}
	if !found {
		t.Errorf("final diagnostics miss the unit error of the final text: %s", p.Diagnostics)
	}
	if p.count >= n {
		t.Logf("published %d times for %d edits", p.count, n)
	}
}

// TestLargeDocument opens a 10 MB document: the server answers, publishes
// and stays responsive.
func TestLargeDocument(t *testing.T) {
	if testing.Short() {
		t.Skip("large document")
	}
	c := newTestClient(t, Options{Debounce: -1})
	// Ten megabytes under the race detector on a busy machine take tens of
	// seconds; the test is about answering at all, not about speed (the
	// benchmarks measure that).
	c.patience = 3 * time.Minute
	c.initialize(nil)
	var b strings.Builder
	b.WriteString("param d = 12 mm\n")
	for i := 0; b.Len() < 10<<20; i++ {
		fmt.Fprintf(&b, "# filler line %d: µ ° ² 𝜃 keep the text honest\nparam p%d = %d mm\n", i, i, i)
	}
	text := b.String()
	uri := "file:///tmp/large.loop"
	start := time.Now()
	c.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": uri, "languageId": "loop", "version": 1, "text": text}})
	c.mustCall("textDocument/hover", map[string]any{"textDocument": map[string]any{"uri": uri}, "position": map[string]any{"line": 0, "character": 11}})
	c.settle()
	t.Logf("10 MB document: analysed and published in %v", time.Since(start))
	if _, ok := c.published(uri); !ok {
		t.Error("nothing published for the large document")
	}
	c.mustCall("textDocument/documentSymbol", map[string]any{"textDocument": map[string]any{"uri": uri}})
}

// TestWatcherRegistration: a client that can register capabilities
// dynamically is asked to watch .loop files.
func TestWatcherRegistration(t *testing.T) {
	c := newTestClient(t, Options{Debounce: -1})
	c.initialize(map[string]any{"workspace": map[string]any{"didChangeWatchedFiles": map[string]any{"dynamicRegistration": true}}})
	deadline := time.Now().Add(5 * time.Second)
	for time.Now().Before(deadline) {
		c.mu.Lock()
		for _, m := range c.calls {
			if m.Method == "client/registerCapability" && strings.Contains(string(m.Params), "workspace/didChangeWatchedFiles") && strings.Contains(string(m.Params), "**/*.loop") {
				c.mu.Unlock()
				return
			}
		}
		c.mu.Unlock()
		time.Sleep(10 * time.Millisecond)
	}
	t.Error("no watcher registration for **/*.loop")
}

// TestStaleNotPublished: an edit during the debounce cancels the older
// snapshot's checks; only the newer version's complete results go out.
func TestStaleNotPublished(t *testing.T) {
	c := newTestClient(t, Options{Debounce: 300 * time.Millisecond})
	var mu sync.Mutex
	full := map[int32]bool{}
	c.srv.onPublish = func(path string, version int32, isFull bool, n int) {
		mu.Lock()
		defer mu.Unlock()
		if isFull {
			full[version] = true
		}
	}
	c.initialize(nil)
	uri := "file:///tmp/stale.loop"
	c.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": uri, "languageId": "loop", "version": 1, "text": smallLoop}})
	c.notify("textDocument/didChange", map[string]any{"textDocument": map[string]any{"uri": uri, "version": 2},
		"contentChanges": []any{map[string]any{"text": smallLoop + "# two\n"}}})
	c.settle()
	mu.Lock()
	defer mu.Unlock()
	if full[1] {
		t.Error("the checks of version 1 were published after version 2 arrived")
	}
	if !full[2] {
		t.Error("the checks of version 2 were not published")
	}
}

// TestRelatedInformation: a duplicate declaration points at the first one.
func TestRelatedInformation(t *testing.T) {
	c := newTestClient(t, Options{Debounce: -1})
	c.initialize(nil)
	uri := "file:///tmp/dup.loop"
	c.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": uri, "languageId": "loop", "version": 1,
		"text": "param d = 1 m\nparam d = 2 m\n"}})
	c.settle()
	p, _ := c.published(uri)
	for _, raw := range p.Diagnostics {
		var d struct {
			Code     string
			Severity int
			Related  []struct {
				Location struct {
					URI   string    `json:"uri"`
					Range wireRange `json:"range"`
				} `json:"location"`
				Message string
			} `json:"relatedInformation"`
		}
		json.Unmarshal(raw, &d)
		if d.Code != "duplicate-name" {
			continue
		}
		if d.Severity != 1 {
			t.Errorf("severity %d, want 1 (error)", d.Severity)
		}
		if len(d.Related) != 1 || d.Related[0].Location.URI != uri || d.Related[0].Location.Range.Start.Line != 0 || d.Related[0].Location.Range.Start.Character != 6 {
			t.Errorf("related information %+v, want line 0 col 6 of the same file", d.Related)
		}
		return
	}
	t.Errorf("no duplicate-name finding in %s", p.Diagnostics)
}
