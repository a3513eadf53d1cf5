package lsp

import (
	"encoding/json"
	"fmt"
	"math/rand/v2"
	"reflect"
	"strings"
	"sync/atomic"
	"testing"
	"time"
)

// publishes returns every publication for uri at version, in order.
func (c *testClient) publishes(uri string, version int32) [][]json.RawMessage {
	c.mu.Lock()
	defer c.mu.Unlock()
	var out [][]json.RawMessage
	for _, m := range c.notes {
		if m.Method != "textDocument/publishDiagnostics" {
			continue
		}
		var p struct {
			URI string `json:"uri"`
			publishedDiags
		}
		json.Unmarshal(m.Params, &p)
		if p.URI == uri && p.Version != nil && *p.Version == version {
			out = append(out, p.Diagnostics)
		}
	}
	return out
}

// TestSyntaxStage edits the first line of a file whose last line has an
// unknown name: the first publication of the new version has the new
// syntax error and the unknown name where it now is, the last one is what
// a server that never saw the old text publishes.
func TestSyntaxStage(t *testing.T) {
	c := newTestClient(t, Options{Debounce: -1})
	c.srv.syntaxFirst = true
	c.initialize(nil)
	uri := "file:///tmp/stage.loop"
	text := smallLoop + "param e = dd * 2\n"
	c.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": uri, "languageId": "loop", "version": 1, "text": text}})
	c.settle()
	// The model of version 2 waits for its syntax stage, so that a request
	// computing it first cannot make the stage moot.
	var armed atomic.Bool
	armed.Store(true)
	c.srv.beforeLoad = func(string) {
		for deadline := time.Now().Add(10 * time.Second); armed.Load() && len(c.publishes(uri, 2)) == 0 && time.Now().Before(deadline); {
			time.Sleep(time.Millisecond)
		}
	}
	c.notify("textDocument/didChange", map[string]any{"textDocument": map[string]any{"uri": uri, "version": 2},
		"contentChanges": []any{map[string]any{"range": map[string]any{"start": map[string]any{"line": 0, "character": 0}, "end": map[string]any{"line": 0, "character": 0}}, "text": "param x = 1 +\n"}}})
	c.settle()
	pubs := c.publishes(uri, 2)
	if len(pubs) < 2 {
		t.Fatalf("want a syntax stage and the model's findings for version 2, got %d publications", len(pubs))
	}
	fresh := newTestClient(t, Options{Debounce: -1})
	fresh.initialize(nil)
	fresh.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": uri, "languageId": "loop", "version": 2, "text": "param x = 1 +\n" + text}})
	fresh.settle()
	want, _ := fresh.published(uri)
	if got := pubs[len(pubs)-1]; !reflect.DeepEqual(got, want.Diagnostics) {
		t.Errorf("last publication\n%s\nwant\n%s", got, want.Diagnostics)
	}
	first := fmt.Sprintf("%s", pubs[0])
	if !strings.Contains(first, `"syntax"`) || !strings.Contains(first, `"line":8`) {
		t.Errorf("the syntax stage should hold the new syntax error and the unknown name moved to line 8: %s", first)
	}
	for _, d := range pubs[0] {
		if strings.Contains(string(d), `"line":8`) && !containsRaw(want.Diagnostics, d) {
			t.Errorf("a finding carried into the syntax stage is not where the model puts it: %s", d)
		}
	}
}

func containsRaw(list []json.RawMessage, x json.RawMessage) bool {
	for _, y := range list {
		if string(y) == string(x) {
			return true
		}
	}
	return false
}

// TestSyntaxStageFlood sends random edits with a syntax stage for every
// version, mostly without waiting: after each pause the last publication
// is what a fresh server publishes for the same text.
func TestSyntaxStageFlood(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 5))
	c := newTestClient(t, Options{Debounce: -1})
	c.srv.syntaxFirst = true
	c.initialize(nil)
	uri := "file:///tmp/flood.loop"
	client := newClientText(smallLoop)
	c.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": uri, "languageId": "loop", "version": 1, "text": smallLoop}})
	pieces := []string{"", "x", "1", " mm", "\n", "{", "}", "#", "= ", "node q\n", "dd", "\"", ";"}
	version := 1
	rounds := 8
	if testing.Short() {
		rounds = 3
	}
	for round := range rounds {
		for range 1 + r.IntN(10) {
			rg := randomRange(r, client.positions(0))
			piece := pieces[r.IntN(len(pieces))]
			client.apply(rg, piece, 0)
			version++
			c.notify("textDocument/didChange", map[string]any{"textDocument": map[string]any{"uri": uri, "version": version},
				"contentChanges": []any{map[string]any{"range": rg, "text": piece}}})
		}
		c.settle()
		got, _ := c.published(uri)
		fresh := newTestClient(t, Options{Debounce: -1})
		fresh.initialize(nil)
		fresh.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": uri, "languageId": "loop", "version": version, "text": client.String()}})
		fresh.settle()
		want, _ := fresh.published(uri)
		if got.Version == nil || *got.Version != int32(version) || !reflect.DeepEqual(got.Diagnostics, want.Diagnostics) {
			t.Fatalf("round %d: after the edits to\n%q\nthe server published\n%s\nwant\n%s", round, client.String(), got.Diagnostics, want.Diagnostics)
		}
	}
}
