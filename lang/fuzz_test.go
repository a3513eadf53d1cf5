package lang

import (
	"errors"
	"fmt"
	"reflect"
	"strconv"
	"strings"
	"testing"
)

// parseCorpusBytes reads one file of Go's fuzz corpus format holding a
// single []byte value.
func parseCorpusBytes(b []byte) ([]byte, error) {
	s := strings.TrimSpace(string(b))
	head, body, ok := strings.Cut(s, "\n")
	if !ok || strings.TrimSpace(head) != "go test fuzz v1" {
		return nil, errors.New("not a fuzz corpus file")
	}
	body = strings.TrimSpace(body)
	if !strings.HasPrefix(body, "[]byte(") || !strings.HasSuffix(body, ")") {
		return nil, fmt.Errorf("want one []byte value, got %.40q", body)
	}
	v, err := strconv.Unquote(body[len("[]byte(") : len(body)-1])
	if err != nil {
		return nil, err
	}
	return []byte(v), nil
}

func addSeeds(f *testing.F) {
	for _, src := range exampleFiles(f) {
		f.Add(src)
	}
}

// FuzzParse checks that parsing never panics, that every error and every
// statement lies inside the text, and that statements come in order.
func FuzzParse(f *testing.F) {
	addSeeds(f)
	f.Fuzz(func(t *testing.T, src []byte) {
		file := Parse("fuzz.loop", src)
		checkSpans(t, file)
		checkSameAsGrammar(t, file)
	})
}

// checkSameAsGrammar parses the text again with the fast path off and
// checks that the tree, positions included, and the errors are the same.
func checkSameAsGrammar(t *testing.T, file *File) {
	t.Helper()
	slow := parse(file.Path, file.Src, true)
	if !reflect.DeepEqual(file.Stmts, slow.Stmts) {
		t.Fatalf("the fast path built another tree than the grammar\nfast:\n%s\ngrammar:\n%s", dumpTree(file), dumpTree(slow))
	}
	if !reflect.DeepEqual(file.Errors, slow.Errors) {
		t.Fatalf("the fast path gave other errors than the grammar\nfast: %v\ngrammar: %v", file.Errors, slow.Errors)
	}
}

func checkSpans(t *testing.T, file *File) {
	t.Helper()
	n := len(file.Src)
	in := func(s Span) bool { return 0 <= s.Start && s.Start <= s.End && s.End <= n }
	for _, d := range file.Errors {
		if !in(d.Loc.Span) {
			t.Fatalf("error %q span %v outside [0,%d]", d.Message(), d.Loc.Span, n)
		}
		if d.Message() == "" {
			t.Fatal("error without a message")
		}
	}
	var walk func([]*Stmt, int, int)
	walk = func(list []*Stmt, lo, hi int) {
		prev := lo
		for _, s := range list {
			sp := s.Span()
			if !in(sp) || sp.Start < prev || sp.End > hi {
				t.Fatalf("statement %q span %v outside [%d,%d] or before %d", s.Keyword(), sp, lo, hi, prev)
			}
			prev = sp.End
			if s.Block != nil {
				b := s.Block
				end := b.Close
				if end < 0 {
					end = n
				}
				if b.Open < sp.Start || end < b.Open || end > hi {
					t.Fatalf("block of %q [%d,%d] outside its statement or parent", s.Keyword(), b.Open, b.Close)
				}
				walk(b.Stmts, b.Open+1, end)
				prev = end
			}
		}
	}
	walk(file.Stmts, 0, n)
	for _, c := range file.Comments {
		if !in(c.Span) || string(file.Src[c.Span.Start:c.Span.End]) != c.Text {
			t.Fatalf("comment %q span %v does not match the text", c.Text, c.Span)
		}
	}
}

// memFS is an in-memory FS for tests.
type memFS map[string][]byte

func (m memFS) ReadFile(p string) ([]byte, error) {
	if b, ok := m[p]; ok {
		return b, nil
	}
	return nil, fmt.Errorf("open %s: file does not exist", p)
}

// FuzzLoadSource checks that resolving any text never panics and that
// every finding in the root file lies inside it.
func FuzzLoadSource(f *testing.F) {
	addSeeds(f)
	parts := exampleFiles(f)
	fs := memFS{}
	for p, b := range parts {
		if strings.HasSuffix(p, "tubes.loop") {
			fs["parts/tubes.loop"] = b
		}
	}
	f.Fuzz(func(t *testing.T, src []byte) {
		m := LoadSource("main.loop", src, fs)
		for _, d := range m.Diags {
			if d.Loc.File != "main.loop" {
				continue
			}
			if s := d.Loc.Span; s.Start < 0 || s.End < s.Start || s.End > len(src) {
				t.Fatalf("%s: %q span %v outside [0,%d]", d.Rule, d.Message(), s, len(src))
			}
		}
	})
}

// FuzzFormat checks the formatter on any text without syntax errors:
// it succeeds, is idempotent and keeps the tree and the comments.
func FuzzFormat(f *testing.F) {
	addSeeds(f)
	f.Fuzz(func(t *testing.T, src []byte) {
		checkFormat(t, "fuzz.loop", src)
	})
}
