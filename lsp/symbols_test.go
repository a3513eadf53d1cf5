package lsp

import (
	"encoding/json"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"circa/lang"
)

// TestDocumentSymbolsOutline checks the outline of the ferry example: its
// loop with nodes, junctions and components as children, its cases with the
// nominal one marked, its parameter, and nothing from the included parts
// file.
func TestDocumentSymbolsOutline(t *testing.T) {
	path, err := filepath.Abs("../testdata/examples/ferry-cabinet.loop")
	if err != nil {
		t.Fatal(err)
	}
	text, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	c := newTestClient(t, Options{Debounce: -1})
	c.initialize(nil)
	uri := "file://" + path
	c.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": uri, "languageId": "loop", "version": 1, "text": string(text)}})
	type pos struct{ Line, Character int }
	type rng struct{ Start, End pos }
	type sym struct {
		Name           string
		Detail         *string
		Kind           int
		Range          rng
		SelectionRange rng
		Children       []sym
	}
	var got []sym
	if err := json.Unmarshal(c.mustCall("textDocument/documentSymbol", map[string]any{"textDocument": map[string]any{"uri": uri}}), &got); err != nil {
		t.Fatal(err)
	}
	detail := func(s sym) string {
		if s.Detail == nil {
			return "<none>"
		}
		return *s.Detail
	}
	byName := map[string]sym{}
	for _, s := range got {
		byName[s.Name] = s
	}
	// Kinds are the protocol's SymbolKind numbers: Namespace 3, Object 19,
	// Constant 14, Event 24.
	for _, w := range []struct {
		name, detail string
		kind         int
	}{{"cabinet", "loop", 3}, {"harbour", "nominal case", 24}, {"beam_sea", "case", 24}, {"stack_height", "0.4 m", 14}} {
		s, ok := byName[w.name]
		if !ok {
			t.Fatalf("no symbol %q in %v", w.name, got)
		}
		if detail(s) != w.detail || s.Kind != w.kind {
			t.Errorf("%s: detail %q kind %d, want %q %d", w.name, detail(s), s.Kind, w.detail, w.kind)
		}
	}
	if len(got) != 7 {
		t.Errorf("%d top-level symbols, want the loop, four cases and the two params (the parts live in another file)", len(got))
	}
	p := byName["stack_height"]
	if p.Range != (rng{pos{4, 0}, pos{4, 26}}) || p.SelectionRange != (rng{pos{4, 6}, pos{4, 18}}) {
		t.Errorf("stack_height ranges %v %v, want line 4 cols 0–26 and 6–18", p.Range, p.SelectionRange)
	}
	kids := map[string]sym{}
	for _, s := range byName["cabinet"].Children {
		kids[s.Name] = s
	}
	if s := kids["split"]; detail(s) != "junction" || s.Kind != 14 || s.SelectionRange.Start != (pos{11, 11}) {
		t.Errorf("split: %+v, want a junction constant named at line 11 col 11", s)
	}
	if s := kids["feed_a"]; detail(s) != "pipe split → a_in" || s.Kind != 19 {
		t.Errorf("feed_a: %+v, want a pipe object from split to a_in", s)
	}
	if s := kids["a_in"]; detail(s) != "node" || s.Kind != 14 {
		t.Errorf("a_in: %+v, want a node constant", s)
	}
	l := byName["cabinet"]
	if l.Range.Start != (pos{6, 0}) || l.Range.End.Line != 74 {
		t.Errorf("cabinet range %v, want lines 6–74", l.Range)
	}
	components := 0
	for _, s := range l.Children {
		if s.Kind == 19 {
			components++
			if detail(s) == "" || detail(s) == "<none>" {
				t.Errorf("component %s has no kind as detail", s.Name)
			}
		}
	}
	if components == 0 {
		t.Error("the loop lists no components")
	}
}

// TestDocumentSymbolsFollowEdits asks for the symbols twice per version:
// the second answer is the first, and an edit that renames a parameter and
// moves the next one down shows in the next answer.
func TestDocumentSymbolsFollowEdits(t *testing.T) {
	c := newTestClient(t, Options{Debounce: -1})
	c.initialize(nil)
	uri := "file:///tmp/syms.loop"
	c.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": uri, "languageId": "loop", "version": 1, "text": "param a = 1 mm\nparam b = 2 mm\n"}})
	params := map[string]any{"textDocument": map[string]any{"uri": uri}}
	first := string(c.mustCall("textDocument/documentSymbol", params))
	if again := string(c.mustCall("textDocument/documentSymbol", params)); again != first {
		t.Fatalf("two answers for one version differ:\n%s\n%s", first, again)
	}
	c.notify("textDocument/didChange", map[string]any{"textDocument": map[string]any{"uri": uri, "version": 2},
		"contentChanges": []any{map[string]any{"range": map[string]any{"start": map[string]int{"line": 0, "character": 6}, "end": map[string]int{"line": 1, "character": 0}}, "text": "z = 1 mm\n\n"}}})
	var syms []struct {
		Name  string
		Range struct{ Start struct{ Line int } }
	}
	if err := json.Unmarshal(c.mustCall("textDocument/documentSymbol", params), &syms); err != nil {
		t.Fatal(err)
	}
	if len(syms) != 2 || syms[0].Name != "z" || syms[1].Name != "b" || syms[1].Range.Start.Line != 2 {
		t.Errorf("after the edit: %+v, want z on line 0 and b on line 2", syms)
	}
}

// TestOutlinerPositions checks the outline's line-remembering conversion
// against the mapper at every offset of texts with every kind of line end,
// multi-byte and invalid characters, visited in order and at random.
func TestOutlinerPositions(t *testing.T) {
	pieces := []string{"param a = 1 mm", "\n", "\r\n", "\r", "µ", "𝜃", "\xff", "  ", "{", "x", "\t"}
	rng := rand.New(rand.NewPCG(1, 2))
	for trial := range 300 {
		var b strings.Builder
		for range rng.IntN(30) {
			b.WriteString(pieces[rng.IntN(len(pieces))])
		}
		text := []byte(b.String())
		m := lang.NewMapper(text)
		for _, enc := range []lang.Encoding{lang.UTF16, lang.UTF8, lang.UTF32} {
			offs := make([]int, 0, len(text)+3)
			for off := -1; off <= len(text)+1; off++ {
				offs = append(offs, off)
			}
			if trial%2 == 1 {
				rng.Shuffle(len(offs), func(i, j int) { offs[i], offs[j] = offs[j], offs[i] })
			}
			o := &outliner{m: m, enc: enc}
			for _, off := range offs {
				if got, want := o.position(off), m.OffsetPosition(off, enc); got != want {
					t.Fatalf("%q enc %d offset %d: %v, want %v", text, enc, off, got, want)
				}
			}
		}
	}
}

// TestOutlineStrings checks the outline's JSON strings decode to what
// encoding/json makes of the same text, control and invalid bytes included.
func TestOutlineStrings(t *testing.T) {
	for _, s := range []string{"", "p1", `a"b\c`, "tab\there\nnl\r\x00\x1f", "µ°²𝜃", "bad\xffbyte\xc3", "</script>&", "\u2028"} {
		var got, want string
		if err := json.Unmarshal(appendJSONString(nil, s), &got); err != nil {
			t.Fatalf("%q: %v in %s", s, err, appendJSONString(nil, s))
		}
		ref, _ := json.Marshal(s)
		json.Unmarshal(ref, &want)
		if got != want {
			t.Errorf("%q decodes to %q, want %q", s, got, want)
		}
	}
}

// TestDocumentSymbolsValueDetail checks a parameter's detail is its value
// as written, a long one cut at a character with an ellipsis, and that
// cutting it leaves the document's text as it was.
func TestDocumentSymbolsValueDetail(t *testing.T) {
	c := newTestClient(t, Options{Debounce: -1})
	c.initialize(nil)
	uri := "file:///tmp/detail.loop"
	long := "1 mm + 2 mm + 3 mm + 4 mm + 5 mm + 6 mm + 7 mm + 8 mm"
	text := "param short = 12 mm  # a comment\nparam long = " + long + "   \n"
	c.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": uri, "languageId": "loop", "version": 1, "text": text}})
	var syms []struct {
		Name   string
		Detail string
	}
	params := map[string]any{"textDocument": map[string]any{"uri": uri}}
	if err := json.Unmarshal(c.mustCall("textDocument/documentSymbol", params), &syms); err != nil {
		t.Fatal(err)
	}
	if len(syms) != 2 || syms[0].Detail != "12 mm" {
		t.Fatalf("symbols %+v, want short with detail 12 mm", syms)
	}
	if d := syms[1].Detail; !strings.HasSuffix(d, "…") || !strings.HasPrefix(long, strings.TrimSuffix(d, "…")) || len(d) > valueDetail+len("…") {
		t.Errorf("long value's detail %q, want at most %d bytes of %q and an ellipsis", d, valueDetail, long)
	}
	c.srv.mu.Lock()
	got := string(c.srv.snap.docs["/tmp/detail.loop"].text)
	c.srv.mu.Unlock()
	if got != text {
		t.Errorf("the document's text changed to %q", got)
	}
}
