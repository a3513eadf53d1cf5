package lsp

import (
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"
	"unicode/utf16"

	"circa/lang"
)

// hostileTexts are documents a careless or hostile user may open: lines of
// a megabyte of one bad token, and the bytes of a binary file (every byte
// value, read as Latin-1 so that the text is valid UTF-8 on the wire).
func hostileTexts() []struct{ name, text string } {
	const n = 1 << 20
	var bin []rune
	for len(bin) < n {
		for b := range 256 {
			bin = append(bin, rune(b))
		}
	}
	return []struct{ name, text string }{
		{"braces", strings.Repeat("{", n) + "\n"},
		{"closes", strings.Repeat(")", n) + "\n"},
		{"quotes", strings.Repeat(`"`, n) + "\n"},
		{"names", "param x = " + strings.Repeat("a ", n/2) + "\n"},
		{"binary", string(bin)},
	}
}

// applyEdit replaces the UTF-16 columns [from, to) of line 0 of text.
func applyEdit(text string, from, to int, ins string) string {
	line, rest, _ := strings.Cut(text, "\n")
	u := utf16.Encode([]rune(line))
	nl := ""
	if strings.Contains(text, "\n") {
		nl = "\n"
	}
	return string(utf16.Decode(u[:from])) + ins + string(utf16.Decode(u[to:])) + nl + rest
}

// TestHostileDocuments opens each hostile text, sends a burst of edits and
// every kind of request: each request is answered, the diagnostics
// published are bounded, and the server's text is the client's. The
// harness's patience bounds each answer; the speed is the benchmarks'.
func TestHostileDocuments(t *testing.T) {
	if testing.Short() {
		t.Skip("megabyte documents")
	}
	for _, h := range hostileTexts() {
		t.Run(h.name, func(t *testing.T) {
			c := newTestClient(t, Options{Debounce: time.Millisecond})
			c.patience = 2 * time.Minute
			c.initialize(nil)
			uri := "file:///tmp/hostile-" + h.name + ".loop"
			doc := map[string]any{"uri": uri}
			c.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": uri, "languageId": "loop", "version": 1, "text": h.text}})
			text := h.text
			cols := len(utf16.Encode([]rune(strings.SplitN(text, "\n", 2)[0])))
			const edits = 20
			for i := range edits {
				// Type in the middle, at the start and at the end of the
				// long line, and take some of it out again.
				at := []int{cols / 2, 0, cols}[i%3]
				from, to, ins := at, at, fmt.Sprintf("x%d ", i)
				if i%4 == 3 {
					from, to, ins = max(0, at-3), at, ""
				}
				text = applyEdit(text, from, to, ins)
				cols += len(ins) - (to - from)
				c.notify("textDocument/didChange", map[string]any{"textDocument": map[string]any{"uri": uri, "version": i + 2},
					"contentChanges": []any{map[string]any{"range": map[string]any{
						"start": map[string]any{"line": 0, "character": from}, "end": map[string]any{"line": 0, "character": to}}, "text": ins}}})
			}
			pos := func(ch int) map[string]any {
				return map[string]any{"textDocument": doc, "position": map[string]any{"line": 0, "character": ch}}
			}
			whole := map[string]any{"start": map[string]any{"line": 0, "character": 0}, "end": map[string]any{"line": 1, "character": 0}}
			for _, r := range []struct {
				method string
				params any
			}{
				{"textDocument/hover", pos(cols / 2)},
				{"textDocument/hover", pos(1)},
				{"textDocument/completion", pos(cols / 2)},
				{"textDocument/completion", pos(cols)},
				{"textDocument/definition", pos(cols / 2)},
				{"textDocument/references", map[string]any{"textDocument": doc, "position": map[string]any{"line": 0, "character": 2}, "context": map[string]any{"includeDeclaration": true}}},
				{"textDocument/documentSymbol", map[string]any{"textDocument": doc}},
				{"workspace/symbol", map[string]any{"query": "x"}},
				{"textDocument/formatting", map[string]any{"textDocument": doc, "options": map[string]any{"tabSize": 2, "insertSpaces": true}}},
				{"textDocument/rangeFormatting", map[string]any{"textDocument": doc, "range": whole, "options": map[string]any{"tabSize": 2, "insertSpaces": true}}},
				{"textDocument/semanticTokens/full", map[string]any{"textDocument": doc}},
				{"textDocument/foldingRange", map[string]any{"textDocument": doc}},
				{"textDocument/inlayHint", map[string]any{"textDocument": doc, "range": whole}},
				{"textDocument/codeAction", map[string]any{"textDocument": doc, "range": whole, "context": map[string]any{"diagnostics": []any{}}}},
			} {
				start := time.Now()
				res, err := c.call(r.method, r.params)
				t.Logf("%s: %d bytes in %v", r.method, len(res), time.Since(start))
				formatting := r.method == "textDocument/formatting" || r.method == "textDocument/rangeFormatting"
				switch {
				case err != nil && formatting && err.Code == int(codeRequestFailed):
					// A text with syntax errors is not formatted.
				case err != nil:
					t.Errorf("%s: %v", r.method, err)
				case formatting:
					// Formatting changes blanks only.
					var edits []struct {
						NewText string `json:"newText"`
					}
					if json.Unmarshal(res, &edits) != nil || len(edits) > 1 {
						t.Errorf("%s: %.200s", r.method, res)
					} else if len(edits) == 1 && strings.Join(strings.Fields(edits[0].NewText), "") != strings.Join(strings.Fields(text), "") {
						t.Errorf("%s changes more than blanks", r.method)
					}
				}
			}
			c.settle()
			p, ok := c.published(uri)
			if !ok || p.Version == nil || *p.Version != edits+1 {
				t.Fatalf("last publication %+v, want version %d", p, edits+1)
			}
			if len(p.Diagnostics) == 0 || len(p.Diagnostics) > 250 {
				t.Errorf("%d diagnostics published", len(p.Diagnostics))
			}
			size := 0
			for _, d := range p.Diagnostics {
				size += len(d)
			}
			if size > 200_000 {
				t.Errorf("diagnostics of %d bytes published", size)
			}
			t.Logf("%d diagnostics, %d bytes", len(p.Diagnostics), size)
			if got := c.srv.currentDoc(t, uri); got != text {
				t.Errorf("the server's text (%d bytes) is not the client's (%d bytes)", len(got), len(text))
			}
		})
	}
}

// TestHostileIncludes opens the first file of a chain of 100 files, each
// including the next, and a file that includes itself 10,000 times: the
// include one level too deep is reported in its own file, and the
// findings published for the self-including one are bounded, the last
// saying how many more there are.
func TestHostileIncludes(t *testing.T) {
	dir := t.TempDir()
	for i := range 100 {
		if err := os.WriteFile(filepath.Join(dir, fmt.Sprintf("f%d.loop", i)), fmt.Appendf(nil, "include \"f%d.loop\"\n", i+1), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	self := strings.Repeat("include \"self.loop\"\n", 10_000)
	if err := os.WriteFile(filepath.Join(dir, "self.loop"), []byte(self), 0o644); err != nil {
		t.Fatal(err)
	}
	c := newTestClient(t, Options{Debounce: -1})
	c.patience = 2 * time.Minute
	c.initialize(nil)
	root := "file://" + filepath.Join(dir, "f0.loop")
	c.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": root, "languageId": "loop", "version": 1, "text": "include \"f1.loop\"\n"}})
	c.settle()
	deep := "file://" + filepath.Join(dir, fmt.Sprintf("f%d.loop", lang.MaxIncludeDepth))
	p, _ := c.published(deep)
	if len(p.Diagnostics) != 1 || !strings.Contains(string(p.Diagnostics[0]), fmt.Sprintf("more than %d levels", lang.MaxIncludeDepth)) {
		t.Errorf("%s: %s", deep, p.Diagnostics)
	}
	uri := "file://" + filepath.Join(dir, "self.loop")
	c.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": uri, "languageId": "loop", "version": 1, "text": self}})
	c.settle()
	p, _ = c.published(uri)
	if len(p.Diagnostics) != MaxPublished {
		t.Fatalf("%d findings published, want %d", len(p.Diagnostics), MaxPublished)
	}
	if last := string(p.Diagnostics[MaxPublished-1]); !strings.Contains(last, fmt.Sprintf("%d more findings", 10_000-MaxPublished+1)) {
		t.Errorf("last finding published: %s", last)
	}
	c.mustCall("textDocument/documentSymbol", map[string]any{"textDocument": map[string]any{"uri": uri}})
}
