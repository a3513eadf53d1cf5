package lsp

import (
	"fmt"
	"os"
	"strings"
	"testing"
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
		got := "none"
		if p.Version != nil {
			got = fmt.Sprint(*p.Version)
		}
		t.Errorf("last diagnostics are for version %s, want %d", got, 1+len([]rune(typed)))
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
