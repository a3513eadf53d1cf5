package lang

import (
	"fmt"
	"os"
	"strings"
	"testing"
)

// chainFS is a chain of n files, each including the next: f0.loop
// includes f1.loop, and so on; the last, fn.loop, includes f0.loop again
// when cycle is set.
func chainFS(n int, cycle bool) memFS {
	fs := memFS{}
	for i := range n {
		fs[fmt.Sprintf("f%d.loop", i)] = fmt.Appendf(nil, "include \"f%d.loop\"\nparam p%d = 1 mm\n", i+1, i)
	}
	last := []byte("param last = 1 mm\n")
	if cycle {
		last = []byte("include \"f0.loop\"\n")
	}
	fs[fmt.Sprintf("f%d.loop", n)] = last
	return fs
}

// includeFindings are the include findings of m as "file:line rule".
func includeFindings(m *Model) []string {
	var out []string
	for _, d := range m.Diags {
		if strings.HasPrefix(d.Rule, "include-") {
			f := m.Files[d.Loc.File]
			out = append(out, fmt.Sprintf("%s:%d %s", d.Loc.File, f.Mapper.OffsetLine(d.Loc.Span.Start)+1, d.Rule))
		}
	}
	return out
}

// TestIncludeDepth reads chains of includes longer than MaxIncludeDepth:
// one finding at the include that goes one level too deep, the files up to
// it read, and a cycle longer than the limit reported the same way.
func TestIncludeDepth(t *testing.T) {
	for _, cycle := range []bool{false, true} {
		fs := chainFS(1000, cycle)
		m := LoadSource("f0.loop", fs["f0.loop"], fs)
		want := fmt.Sprintf("f%d.loop:1 include-unreadable", MaxIncludeDepth)
		if got := includeFindings(m); len(got) != 1 || got[0] != want {
			t.Errorf("cycle %v: findings %q, want [%s]", cycle, got, want)
		}
		if len(m.Order) != MaxIncludeDepth+1 {
			t.Errorf("cycle %v: %d files read, want %d", cycle, len(m.Order), MaxIncludeDepth+1)
		}
		for _, d := range m.Diags {
			if d.Rule == "include-unreadable" && !strings.Contains(d.Message(), fmt.Sprintf("more than %d levels", MaxIncludeDepth)) {
				t.Errorf("message %q does not give the limit", d.Message())
			}
		}
	}
	// Up to the limit every file is read and nothing is reported.
	fs := chainFS(MaxIncludeDepth, false)
	m := LoadSource("f0.loop", fs["f0.loop"], fs)
	if got := includeFindings(m); len(got) != 0 || len(m.Order) != MaxIncludeDepth+1 {
		t.Errorf("a chain of %d includes: findings %q, %d files read", MaxIncludeDepth, got, len(m.Order))
	}
	// A cycle within the limit is a cycle.
	fs = chainFS(5, true)
	m = LoadSource("f0.loop", fs["f0.loop"], fs)
	if got := includeFindings(m); len(got) != 1 || got[0] != "f5.loop:1 include-cycle" {
		t.Errorf("a cycle of 6 files: findings %q", got)
	}
}

// TestIncludeFanOut includes one file 10,000 times: it is read once, and a
// file that includes itself as often has each include reported where it is.
func TestIncludeFanOut(t *testing.T) {
	const n = 10_000
	fs := memFS{
		"root.loop": []byte(strings.Repeat("include \"leaf.loop\"\n", n)),
		"leaf.loop": []byte("param x = 1 mm\n"),
		"self.loop": []byte(strings.Repeat("include \"self.loop\"\n", n)),
	}
	m := LoadSource("root.loop", fs["root.loop"], fs)
	if got := includeFindings(m); len(got) != 0 || len(m.Order) != 2 {
		t.Errorf("fan-out: findings %q, %d files read", got, len(m.Order))
	}
	m = LoadSource("self.loop", fs["self.loop"], fs)
	got := includeFindings(m)
	if len(got) != n || got[0] != "self.loop:1 include-cycle" || got[n-1] != fmt.Sprintf("self.loop:%d include-cycle", n) {
		t.Errorf("self-include: %d findings, first %q", len(got), got[:min(1, len(got))])
	}
}

// TestIncludeDepthDocumented checks that the language reference gives the
// limit the loader applies.
func TestIncludeDepthDocumented(t *testing.T) {
	doc, err := os.ReadFile("../docs/language.md")
	if err != nil {
		t.Fatal(err)
	}
	if want := fmt.Sprintf("Includes nest at most %d levels deep", MaxIncludeDepth); !strings.Contains(string(doc), want) {
		t.Errorf("docs/language.md does not say %q", want)
	}
}
