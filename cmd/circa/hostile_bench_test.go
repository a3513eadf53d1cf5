package main

import (
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// BenchmarkCheckLineOfBraces checks a file of one line of a million '{':
// a hundred syntax errors on a line of a megabyte, each printed with an
// excerpt of its line.
func BenchmarkCheckLineOfBraces(b *testing.B) {
	path := filepath.Join(b.TempDir(), "braces.loop")
	if err := os.WriteFile(path, []byte(strings.Repeat("{", 1_000_000)+"\n"), 0o644); err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	for b.Loop() {
		if rc := run([]string{"check", path}, strings.NewReader(""), io.Discard, io.Discard); rc != 1 {
			b.Fatalf("exit status %d, want 1", rc)
		}
	}
}
