package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestLanguageDocExampleChecks: the complete example at the top of
// docs/language.md, with the shipped parts file it includes, checks
// without an error: a reader who copies it starts from a loop that works.
func TestLanguageDocExampleChecks(t *testing.T) {
	doc, err := os.ReadFile("../../docs/language.md")
	if err != nil {
		t.Fatal(err)
	}
	_, rest, ok := strings.Cut(string(doc), "## A complete example\n\n```\n")
	example, _, ok2 := strings.Cut(rest, "```\n")
	if !ok || !ok2 || !strings.Contains(example, `include "parts/tubes.loop"`) {
		t.Fatalf("docs/language.md has no complete example including parts/tubes.loop")
	}
	dir := t.TempDir()
	parts, err := os.ReadFile("../../testdata/examples/parts/tubes.loop")
	if err != nil {
		t.Fatal(err)
	}
	if err := os.MkdirAll(filepath.Join(dir, "parts"), 0o755); err != nil {
		t.Fatal(err)
	}
	file := filepath.Join(dir, "example.loop")
	if os.WriteFile(filepath.Join(dir, "parts", "tubes.loop"), parts, 0o644) != nil || os.WriteFile(file, []byte(example), 0o644) != nil {
		t.Fatal("cannot write the example")
	}
	var out, errb bytes.Buffer
	if code := run([]string{"check", file}, strings.NewReader(""), &out, &errb); code != exitOK || strings.Contains(out.String(), ": error:") {
		t.Errorf("the complete example of docs/language.md: exit %d\n%s%s", code, out.String(), errb.String())
	}
}
