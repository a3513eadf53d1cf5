package lsp

import (
	"strings"
	"testing"
	"unicode/utf8"

	"circa/lang"
)

// A hover for a plain-text client keeps its first line as the answer, drops
// the Markdown marks and the table scaffolding, and no line is longer than
// 80 characters; a Markdown client keeps its tables.
func TestShapeHover(t *testing.T) {
	md := "**80 °C** — a temperature\n\n| unit | value |\n|---|---|\n| K (SI) | 353.15 K |\n| °F | 176 °F |\n\n" +
		"_Estimate (from version 3; version 4 is being checked)_\n" +
		strings.Repeat("a long explanation that goes on ", 5) + "`code`\n"
	plain := shapeHover(md, true)
	lines := strings.Split(plain, "\n")
	if lines[0] != "80 °C — a temperature" {
		t.Errorf("first line %q", lines[0])
	}
	for _, l := range lines {
		if n := utf8.RuneCountInString(l); n > hoverWidth {
			t.Errorf("line of %d characters: %q", n, l)
		}
		if strings.ContainsAny(l, "`*|") || strings.HasPrefix(l, "---") {
			t.Errorf("Markdown left in %q", l)
		}
	}
	for _, want := range []string{"K (SI): 353.15 K", "°F: 176 °F", "Estimate (from version 3; version 4 is being checked)"} {
		if !strings.Contains(plain, want) {
			t.Errorf("plain hover lacks %q:\n%s", want, plain)
		}
	}
	if got := shapeHover(md, false); !strings.Contains(got, "| K (SI) | 353.15 K |") {
		t.Errorf("Markdown hover lost its table:\n%s", got)
	}
}

// Every statement word completion offers, in every scope, has a one-line
// description.
func TestWordDocs(t *testing.T) {
	for _, sc := range []scope{{kind: ""}, {kind: "loop"}, {kind: "part"}, {kind: "case"}, {kind: "limits"}, {kind: "methods"}, {kind: "profile"}, {kind: "envelope"}} {
		for _, w := range statementWords(sc) {
			if d := wordDoc(sc.kind, w); d == "" || strings.Contains(d, "\n") {
				t.Errorf("%s %q: description %q", sc.kind, w, d)
			}
		}
	}
	for k := lang.Pipe; k <= lang.Reservoir; k++ {
		for _, w := range lang.ComponentFields[k] {
			if wordDoc("component", w) == "" {
				t.Errorf("component field %q has no description", w)
			}
		}
	}
}
