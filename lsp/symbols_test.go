package lsp

import (
	"encoding/json"
	"os"
	"path/filepath"
	"testing"
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
	}{{"cabinet", "loop", 3}, {"harbour", "nominal case", 24}, {"beam_sea", "case", 24}, {"stack_height", "param", 14}} {
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
