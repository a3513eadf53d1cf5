package lsp

import (
	"encoding/json"
	"testing"
)

// TestPositionEncodings checks columns on a line holding characters of 2
// and 4 bytes in UTF-8 (1 and 2 units in UTF-16) before the findings.
// Widths from the Unicode Standard (ch. 3.9): U+00B5 µ, U+00B0 °, U+00B2 ²
// are 2 UTF-8 bytes and 1 UTF-16 unit; U+1D703 𝜃 is 4 bytes and a
// surrogate pair (2 units). In UTF-32 every one of them is one unit.
func TestPositionEncodings(t *testing.T) {
	const line = `include "𝜃µ°².loop"; param bad = 1 m + 1 s`
	cases := []struct {
		name      string
		encodings []string
		wantEnc   string
		strEnd    int // end of the include string
		exprStart int // start of "1 m + 1 s"
		exprEnd   int
		hoverCol  int // on the "1 m"
	}{
		// UTF-16: `include ` 8, `"` 1, 𝜃 2, µ°² 3, `.loop"` 6 → 20; `; param bad = ` 14 → 34; expression 9 → 43.
		{"utf-16 by default", nil, "utf-16", 20, 34, 43, 34},
		// UTF-8: 8 + 1 + 4 + 6 + 6 = 25; + 14 = 39; + 9 = 48.
		{"utf-8 negotiated", []string{"utf-8", "utf-16"}, "utf-8", 25, 39, 48, 39},
		// UTF-32 counts code points: 8 + 1 + 1 + 3 + 6 = 19; + 14 = 33; + 9 = 42.
		{"utf-32 negotiated", []string{"utf-32", "utf-16"}, "utf-32", 19, 33, 42, 33},
		{"utf-8 preferred to utf-32", []string{"utf-32", "utf-8"}, "utf-8", 25, 39, 48, 39},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			c := newTestClient(t, Options{Debounce: -1})
			caps := map[string]any{}
			if tc.encodings != nil {
				caps["general"] = map[string]any{"positionEncodings": tc.encodings}
			}
			var init struct {
				Capabilities struct {
					PositionEncoding string `json:"positionEncoding"`
				} `json:"capabilities"`
			}
			json.Unmarshal(c.initialize(caps), &init)
			if init.Capabilities.PositionEncoding != tc.wantEnc {
				t.Fatalf("negotiated %q, want %q", init.Capabilities.PositionEncoding, tc.wantEnc)
			}
			uri := "file:///tmp/enc/a.loop"
			c.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": uri, "languageId": "loop", "version": 1, "text": "# header\n" + line + "\n"}})
			c.settle()
			p, _ := c.published(uri)
			got := map[string][4]int{}
			for _, raw := range p.Diagnostics {
				var d struct {
					Range wireRange `json:"range"`
					Code  string    `json:"code"`
				}
				json.Unmarshal(raw, &d)
				got[d.Code] = [4]int{d.Range.Start.Line, d.Range.Start.Character, d.Range.End.Line, d.Range.End.Character}
			}
			if g := got["include-unreadable"]; g != [4]int{1, 8, 1, tc.strEnd} {
				t.Errorf("include-unreadable at %v, want line 1 col 8..%d (all: %v)", g, tc.strEnd, got)
			}
			if g := got["unit"]; g != [4]int{1, tc.exprStart, 1, tc.exprEnd} {
				t.Errorf("unit at %v, want line 1 col %d..%d (all: %v)", g, tc.exprStart, tc.exprEnd, got)
			}
			r := c.mustCall("textDocument/hover", map[string]any{"textDocument": map[string]any{"uri": uri}, "position": map[string]any{"line": 1, "character": tc.hoverCol + 1}})
			var h struct {
				Contents struct{ Value string } `json:"contents"`
				Range    wireRange              `json:"range"`
			}
			json.Unmarshal(r, &h)
			if h.Range.Start.Character != tc.hoverCol || h.Range.End.Character != tc.hoverCol+3 {
				t.Errorf("hover range %+v, want %d..%d; %s", h.Range, tc.hoverCol, tc.hoverCol+3, r)
			}
			// An edit after the wide characters lands where the client meant:
			// replace "1 s" by "1 m".
			c.notify("textDocument/didChange", map[string]any{"textDocument": map[string]any{"uri": uri, "version": 2},
				"contentChanges": []any{map[string]any{"range": map[string]any{"start": map[string]any{"line": 1, "character": tc.exprEnd - 3}, "end": map[string]any{"line": 1, "character": tc.exprEnd}}, "text": "1 m"}}})
			c.settle()
			if d := c.srv.currentDoc(t, uri); d != "# header\n"+`include "𝜃µ°².loop"; param bad = 1 m + 1 m`+"\n" {
				t.Errorf("text after the edit:\n%s", d)
			}
			p, _ = c.published(uri)
			for _, raw := range p.Diagnostics {
				var d struct{ Code string }
				json.Unmarshal(raw, &d)
				if d.Code == "unit" {
					t.Errorf("the unit error is still published after the fix")
				}
			}
		})
	}
}
