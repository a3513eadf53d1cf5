package lsp

import (
	"encoding/json"
	"strings"
	"sync/atomic"
	"testing"
)

// TestAnalysisPanicBecomesFinding makes loading a file, and then checking
// it, panic once each, and checks that the server survives: the failure is
// logged to the client, the file gets one internal-error finding for the
// version that failed instead of stale or missing findings, requests still
// answer, and the next edit is analysed normally.
func TestAnalysisPanicBecomesFinding(t *testing.T) {
	for _, stage := range []string{"load", "check"} {
		t.Run(stage, func(t *testing.T) {
			c := newTestClient(t, Options{Debounce: -1})
			var armed atomic.Bool
			hook := func(string) {
				if armed.CompareAndSwap(true, false) {
					panic("injected failure")
				}
			}
			if stage == "load" {
				c.srv.beforeLoad = hook
			} else {
				c.srv.beforeCheck = hook
			}
			c.initialize(nil)
			uri := "file:///tmp/internal/a.loop"
			doc := map[string]any{"uri": uri}
			codes := func(version int) []string {
				t.Helper()
				c.settle()
				p, _ := c.published(uri)
				if p.Version == nil || int(*p.Version) != version {
					t.Errorf("diagnostics for version %s, want %d", versionString(p.Version), version)
				}
				var out []string
				for _, raw := range p.Diagnostics {
					var d struct{ Code string }
					json.Unmarshal(raw, &d)
					out = append(out, d.Code)
				}
				return out
			}

			armed.Store(true)
			c.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": uri, "languageId": "loop", "version": 1, "text": smallLoop}})
			if got := codes(1); len(got) != 1 || got[0] != ruleInternal {
				t.Errorf("after the failure: published %v, want one %s", got, ruleInternal)
			}
			c.waitNote(t, func(m rpcMessage) bool {
				var p struct {
					Type    int    `json:"type"`
					Message string `json:"message"`
				}
				json.Unmarshal(m.Params, &p)
				// LSP 3.17 MessageType: 1 is Error.
				return m.Method == "window/logMessage" && p.Type == 1 && strings.Contains(p.Message, "injected failure")
			})
			for _, method := range []string{"textDocument/hover", "textDocument/inlayHint", "textDocument/documentSymbol"} {
				params := map[string]any{"textDocument": doc, "position": map[string]any{"line": 0, "character": 2},
					"range": map[string]any{"start": map[string]any{"line": 0, "character": 0}, "end": map[string]any{"line": 3, "character": 0}}}
				if _, err := c.call(method, params); err != nil && err.Code != -32603 {
					t.Errorf("%s after the failure: %v", method, err)
				}
			}

			edited := smallLoop + "param extra = 1 m\n"
			c.notify("textDocument/didChange", map[string]any{"textDocument": map[string]any{"uri": uri, "version": 2}, "contentChanges": []any{map[string]any{"text": edited}}})
			for _, code := range codes(2) {
				if code == ruleInternal {
					t.Errorf("the next edit still reports %s", ruleInternal)
				}
			}
		})
	}
}
