package lsp

import (
	"encoding/json"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"unicode"
	"unicode/utf16"
	"unicode/utf8"
)

// plainCaps is a client that reads plain text only, in hovers, completion
// documentation and signature help.
var plainCaps = map[string]any{"textDocument": map[string]any{
	"hover":         map[string]any{"contentFormat": []string{"plaintext"}},
	"completion":    map[string]any{"completionItem": map[string]any{"documentationFormat": []string{"plaintext"}}},
	"signatureHelp": map[string]any{"signatureInformation": map[string]any{"documentationFormat": []string{"plaintext"}}},
}}

var markdownCaps = map[string]any{"textDocument": map[string]any{
	"hover": map[string]any{"contentFormat": []string{"markdown", "plaintext"}},
}}

// italic is Markdown emphasis by underscores around words (not the
// underscore inside a name such as level_work).
var italic = regexp.MustCompile(`(^|[\s(])_[^_\s][^_]*[^_\s]_($|[\s).,;:])`)

// markdownIn returns the Markdown syntax found in plain-text text, or "".
func markdownIn(text string) string {
	for _, mark := range []string{"`", "**"} {
		if strings.Contains(text, mark) {
			return mark
		}
	}
	for _, line := range strings.Split(text, "\n") {
		t := strings.TrimSpace(line)
		switch {
		case strings.HasPrefix(t, "|") || strings.Contains(t, " | "):
			return "table row " + t
		case t != "" && strings.Trim(t, "-|: ") == "" && strings.Contains(t, "-"):
			return "table rule " + t
		case strings.HasPrefix(t, "#"):
			return "heading " + t
		case italic.MatchString(t):
			return "emphasis " + t
		}
	}
	return ""
}

// hoverWords are the words of a hover with its Markdown marks, table bars
// and surrounding punctuation taken off, so that a hover in plain text can
// be held against the same hover in Markdown.
func hoverWords(text string) map[string]bool {
	text = strings.NewReplacer("**", "", "`", "", "|", " ").Replace(text)
	words := map[string]bool{}
	for _, w := range strings.Fields(text) {
		w = strings.TrimFunc(w, func(r rune) bool { return strings.ContainsRune(".,;:()_", r) })
		if w == "" || strings.Trim(w, "-:") == "" {
			continue
		}
		words[w] = true
	}
	return words
}

// wordStarts returns the offsets of every word of text: where a letter or
// digit follows something else.
func wordStarts(text string) []int {
	var offs []int
	prev := ' '
	for i, r := range text {
		isWord := unicode.IsLetter(r) || unicode.IsDigit(r)
		prevWord := unicode.IsLetter(prev) || unicode.IsDigit(prev) || prev == '_' || prev == '.'
		if isWord && !prevWord {
			offs = append(offs, i)
		}
		prev = r
	}
	return offs
}

// utf16Pos is the protocol position (UTF-16, the default) of a byte offset.
func utf16Pos(text string, off int) map[string]int {
	line := strings.Count(text[:off], "\n")
	start := strings.LastIndex(text[:off], "\n") + 1
	col := 0
	for _, r := range text[start:off] {
		col += len(utf16.Encode([]rune{r}))
	}
	return map[string]int{"line": line, "character": col}
}

type hoverReply struct {
	Contents struct {
		Kind  string `json:"kind"`
		Value string `json:"value"`
	} `json:"contents"`
}

// A client that declares only plain text gets every hover, completion and
// other answer without Markdown (no code marks, no bold, no tables), and
// each hover still holds every word of the Markdown one: the shipped
// examples are hovered at every word, with their design guidance computed.
func TestPlainTextClient(t *testing.T) {
	if testing.Short() {
		t.Skip("hovers every word of the examples")
	}
	for _, example := range []string{"tram-inverter.loop", "forestry-inverter.loop"} {
		t.Run(example, func(t *testing.T) {
			clients := map[string]*guidedClient{}
			var uri, text string
			for name, caps := range map[string]map[string]any{"plain": plainCaps, "markdown": markdownCaps} {
				c := newGuidedClient(t, Options{Debounce: -1})
				// "always": the guidance in parameter hovers, which "auto" skips on a loaded machine.
				c.initialize(map[string]any{"processId": nil, "rootUri": nil, "capabilities": caps,
					"initializationOptions": map[string]any{"marginChecks": "always"}})
				u, src := openFile(t, c, "../testdata/examples/"+example)
				// An allow comment, whose rule the hover explains with an example.
				text = src + "# allow: unused-node\n"
				uri = u
				c.notify("textDocument/didChange", map[string]any{"textDocument": map[string]any{"uri": uri, "version": 2},
					"contentChanges": []any{map[string]any{"text": text}}})
				c.waitGuided()
				clients[name] = c
			}
			plain, md := clients["plain"], clients["markdown"]
			at := func(off int) map[string]any {
				return map[string]any{"textDocument": map[string]any{"uri": uri}, "position": utf16Pos(text, off)}
			}
			hovers := 0
			for _, off := range wordStarts(text) {
				var p, m hoverReply
				pr := plain.mustCall("textDocument/hover", at(off))
				mr := md.mustCall("textDocument/hover", at(off))
				if string(pr) == "null" || string(mr) == "null" {
					if string(pr) != string(mr) {
						t.Errorf("%s: hover in one format only: plain %s, markdown %s", word(text, off), pr, mr)
					}
					continue
				}
				if err := json.Unmarshal(pr, &p); err != nil {
					t.Fatal(err)
				}
				if err := json.Unmarshal(mr, &m); err != nil {
					t.Fatal(err)
				}
				hovers++
				if p.Contents.Kind != "plaintext" || m.Contents.Kind != "markdown" {
					t.Errorf("%s: kinds %q and %q", word(text, off), p.Contents.Kind, m.Contents.Kind)
				}
				if mark := markdownIn(p.Contents.Value); mark != "" {
					t.Errorf("%s: plain hover holds Markdown (%s):\n%s", word(text, off), mark, p.Contents.Value)
				}
				pw := hoverWords(p.Contents.Value)
				for w := range hoverWords(m.Contents.Value) {
					if !pw[w] {
						t.Errorf("%s: plain hover lacks %q of the Markdown one:\n%s\n---\n%s", word(text, off), w, p.Contents.Value, m.Contents.Value)
						break
					}
				}
			}
			if hovers < 50 {
				t.Errorf("only %d hovers answered", hovers)
			}
			// Completion at the end of every line and after every statement word.
			var lineEnds []int
			for i, r := range text {
				if r == '\n' {
					lineEnds = append(lineEnds, i)
				}
			}
			items := 0
			for _, off := range append(lineEnds, wordStarts(text)...) {
				raw := plain.mustCall("textDocument/completion", at(off))
				var list struct {
					Items []struct {
						Label         string          `json:"label"`
						Detail        string          `json:"detail"`
						Documentation json.RawMessage `json:"documentation"`
					} `json:"items"`
				}
				if err := json.Unmarshal(raw, &list); err != nil {
					t.Fatalf("%s: %v", raw, err)
				}
				for _, it := range list.Items {
					items++
					doc := ""
					if len(it.Documentation) > 0 {
						var mc struct{ Kind, Value string }
						if json.Unmarshal(it.Documentation, &mc) == nil && mc.Kind != "" {
							if mc.Kind != "plaintext" {
								t.Errorf("completion %q: documentation in %s", it.Label, mc.Kind)
							}
							doc = mc.Value
						} else {
							json.Unmarshal(it.Documentation, &doc)
						}
					}
					if mark := markdownIn(it.Detail + "\n" + doc); mark != "" {
						t.Errorf("completion %q holds Markdown (%s): %q %q", it.Label, mark, it.Detail, doc)
					}
				}
			}
			if items == 0 {
				t.Error("no completion items")
			}
			// Inlay hints, quick fixes and diagnostics are plain text by the
			// protocol: none carries Markdown either.
			whole := map[string]any{"start": map[string]int{"line": 0, "character": 0}, "end": map[string]int{"line": 100000, "character": 0}}
			var hints []struct {
				Label   json.RawMessage `json:"label"`
				Tooltip json.RawMessage `json:"tooltip"`
			}
			json.Unmarshal(plain.mustCall("textDocument/inlayHint", map[string]any{"textDocument": map[string]any{"uri": uri}, "range": whole}), &hints)
			for _, h := range hints {
				if mark := markdownIn(string(h.Label) + string(h.Tooltip)); mark != "" {
					t.Errorf("inlay hint holds Markdown (%s): %s %s", mark, h.Label, h.Tooltip)
				}
			}
			for _, d := range plain.diagnostics(uri) {
				if mark := markdownIn(d.Message); mark != "" {
					t.Errorf("diagnostic holds Markdown (%s): %s", mark, d.Message)
				}
			}
			var actions []lspAction
			json.Unmarshal(plain.mustCall("textDocument/codeAction", map[string]any{"textDocument": map[string]any{"uri": uri}, "range": whole,
				"context": map[string]any{"diagnostics": []any{}}}), &actions)
			for _, a := range actions {
				if mark := markdownIn(a.Title); mark != "" {
					t.Errorf("code action holds Markdown (%s): %s", mark, a.Title)
				}
			}
		})
	}
}

// word is the word of text at off, for messages.
func word(text string, off int) string {
	end := off
	for end < len(text) {
		r, n := utf8.DecodeRuneInString(text[end:])
		if !(unicode.IsLetter(r) || unicode.IsDigit(r) || r == '_' || r == '.') {
			break
		}
		end += n
	}
	line := strings.Count(text[:off], "\n") + 1
	return strings.TrimSpace(text[off:end]) + " (line " + strconv.Itoa(line) + ")"
}
