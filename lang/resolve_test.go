package lang

import (
	"errors"
	"fmt"
	"io/fs"
	"path/filepath"
	"regexp"
	"slices"
	"sort"
	"strconv"
	"strings"
	"testing"

	"golang.org/x/tools/txtar"
)

// A marker "#@diag(RULE, "TEXT")" in a comment expects one finding of
// RULE on the marker's line whose message contains TEXT.
var markerRE = regexp.MustCompile(`@diag\(([a-z-]+), ("(?:[^"\\]|\\.)*")\)`)

type expectation struct {
	file string
	line int // zero-based
	rule string
	text string
}

func (e expectation) String() string {
	return fmt.Sprintf("%s:%d: %s %q", e.file, e.line+1, e.rule, e.text)
}

// archiveFS serves the files of a txtar archive.
func archiveFS(ar *txtar.Archive) memFS {
	m := memFS{}
	for _, f := range ar.Files {
		m[filepath.FromSlash(f.Name)] = f.Data
	}
	return m
}

func markers(t *testing.T, fsys memFS) []expectation {
	t.Helper()
	var out []expectation
	for name, data := range fsys {
		f := Parse(name, data)
		for _, c := range f.Comments {
			for _, m := range markerRE.FindAllStringSubmatch(c.Text, -1) {
				text, err := strconv.Unquote(m[2])
				if err != nil {
					t.Fatalf("%s: bad marker %s", name, m[0])
				}
				out = append(out, expectation{name, f.Mapper.OffsetLine(c.Span.Start), m[1], text})
			}
		}
	}
	return out
}

// match pairs findings with expectations one to one; it returns the
// findings nobody expected and the expectations nothing met.
func match(m *Model, want []expectation) (extra []string, missing []expectation) {
	used := make([]bool, len(want))
	for _, d := range m.Diags {
		f := m.Files[d.Loc.File]
		line := -1
		if f != nil {
			line = f.Mapper.OffsetLine(d.Loc.Span.Start)
		}
		hit := false
		for i, w := range want {
			if !used[i] && w.file == d.Loc.File && w.line == line && w.rule == d.Rule && strings.Contains(d.Message(), w.text) {
				used[i], hit = true, true
				break
			}
		}
		if !hit {
			extra = append(extra, fmt.Sprintf("%s:%d: %s %q", d.Loc.File, line+1, d.Rule, d.Message()))
		}
	}
	for i, w := range want {
		if !used[i] {
			missing = append(missing, w)
		}
	}
	return extra, missing
}

// TestResolveArchives loads main.loop of each testdata/resolve/*.txtar
// (other files of the archive are what it includes) and matches the
// findings with the markers one to one.
func TestResolveArchives(t *testing.T) {
	files, err := filepath.Glob(filepath.Join("testdata", "resolve", "*.txtar"))
	if err != nil || len(files) == 0 {
		t.Fatalf("no archives: %v", err)
	}
	for _, file := range files {
		t.Run(filepath.Base(file), func(t *testing.T) {
			ar, err := txtar.ParseFile(file)
			if err != nil {
				t.Fatal(err)
			}
			fsys := archiveFS(ar)
			m := Load("main.loop", fsys)
			extra, missing := match(m, markers(t, fsys))
			for _, e := range extra {
				t.Errorf("unexpected finding %s", e)
			}
			for _, w := range missing {
				t.Errorf("missing finding %s", w)
			}
			checkFixes(t, fsys, m)
		})
	}
}

// checkFixes applies each suggested fix and loads again. The first (best)
// fix must clear every finding of its rule from the line; any other fix,
// an alternative, must at least make the finding's message go away.
func checkFixes(t *testing.T, fsys memFS, m *Model) {
	t.Helper()
	for _, d := range m.Diags {
		for k, fix := range d.Fixes {
			patched := memFS{}
			for k, v := range fsys {
				patched[k] = v
			}
			edits := append([]Edit(nil), fix.Edits...)
			sort.Slice(edits, func(i, j int) bool { return edits[i].Loc.Span.Start > edits[j].Loc.Span.Start })
			for _, e := range edits {
				src := patched[e.Loc.File]
				sp := e.Loc.Span
				if sp.Start < 0 || sp.End > len(src) || sp.Start > sp.End {
					t.Fatalf("fix %q: edit %v outside %s", fix.Title, sp, e.Loc.File)
				}
				patched[e.Loc.File] = []byte(string(src[:sp.Start]) + e.NewText + string(src[sp.End:]))
			}
			line := m.Files[d.Loc.File].Mapper.OffsetLine(d.Loc.Span.Start)
			again := Load("main.loop", patched)
			for _, d2 := range again.Diags {
				if d2.Rule == d.Rule && d2.Loc.File == d.Loc.File && again.Files[d2.Loc.File].Mapper.OffsetLine(d2.Loc.Span.Start) == line &&
					(k == 0 || d2.Message() == d.Message()) {
					t.Errorf("fix %q of %q leaves %q", fix.Title, d.Message(), d2.Message())
				}
			}
		}
	}
}

func TestResolveFixesOffered(t *testing.T) {
	ar, err := txtar.ParseFile(filepath.Join("testdata", "resolve", "names.txtar"))
	if err != nil {
		t.Fatal(err)
	}
	m := Load("main.loop", archiveFS(ar))
	n := 0
	for _, d := range m.Diags {
		n += len(d.Fixes)
	}
	// lfit, bse, evv: three "did you mean" fixes.
	if n < 3 {
		t.Errorf("%d fixes offered, want at least 3", n)
	}
}

func TestLoadUnreadableRoot(t *testing.T) {
	m := Load("nowhere.loop", memFS{})
	if len(m.Diags) != 1 || m.Diags[0].Rule != "file-unreadable" || !strings.Contains(m.Diags[0].Message(), "nowhere.loop") {
		t.Fatalf("diags %v", m.Diags)
	}
	m = Load("nowhere.loop", errFS{})
	if len(m.Diags) != 1 || !strings.Contains(m.Diags[0].Message(), "file does not exist") {
		t.Fatalf("diags %v", m.Diags)
	}
}

// errFS fails like the operating system does, with a wrapped error.
type errFS struct{}

func (errFS) ReadFile(p string) ([]byte, error) {
	return nil, &fs.PathError{Op: "open", Path: p, Err: errors.New("file does not exist")}
}

func TestLoadSourceSyntaxAndModel(t *testing.T) {
	src := []byte("param d = 12 mm\nloop r {\n  fluid water\n  node a\n  node b\n  pipe p from a to b {\n    bore d\n    length 2 ft\n  }\n}\n")
	m := LoadSource("m.loop", src, memFS{})
	if len(m.Diags) != 0 {
		t.Fatalf("diags %v", m.Diags)
	}
	c := m.Component("p")
	// 1 ft = 0.3048 m exactly (international foot, 1959 agreement).
	if c == nil || c.Bore.SI != 0.012 || c.Length.SI != 2*0.3048 {
		t.Fatalf("component %+v", c)
	}
}

// TestClosestSkipsFarLengths checks that the suggestion among many names is
// the one an exhaustive search gives: the nearest within the limit, ties
// to the first in order, none past the limit.
func TestClosestSkipsFarLengths(t *testing.T) {
	cands := []string{"riser_long_name", "riser", "Riser2", "ri", "downcomer", "rsier"}
	for _, tc := range []struct{ s, want string }{
		{"riser", "riser"},
		{"risr", "riser"},    // one deletion
		{"rsier", "rsier"},   // exact beats the swap
		{"RISER2", "Riser2"}, // case is ignored
		{"downcomr", "downcomer"},
		{"xyz", ""}, // nothing within the limit
		{"r", "ri"}, // one insertion, within len/3+1 = 1
	} {
		if got := Closest(tc.s, cands); got != tc.want {
			t.Errorf("Closest(%q) = %q, want %q", tc.s, got, tc.want)
		}
	}
}

// A value whose expression is 64 KiB or longer keeps its whole span: the
// span is the text of the expression, whichever way the file is loaded.
// Its terms are spaced out to stay within MaxStmtTokens.
func TestLongValueSpan(t *testing.T) {
	expr := "1 mm" + strings.Repeat(" +"+strings.Repeat(" ", 50)+"1 mm", 1300)
	if len(expr) < 1<<16 {
		t.Fatalf("expression of %d bytes", len(expr))
	}
	src := "param p = " + expr + "\nparam q = 2 mm\n"
	start := len("param p = ")
	for _, m := range []*Model{LoadSource("l.loop", []byte(src), nil), LoadSourceModel("l.loop", []byte(src), nil)} {
		if len(m.Diags) != 0 {
			t.Fatalf("diags %v", m.Diags)
		}
		p, q := m.Params[0].Value, m.Params[1].Value
		if got, want := p.Span(), (Span{start, start + len(expr)}); got != want || p.File() != "l.loop" || !p.Set {
			t.Errorf("long value at %v in %q (set %v), want %v in l.loop", got, p.File(), p.Set, want)
		}
		if got := src[q.Span().Start:q.Span().End]; got != "2 mm" || q.Unit() != "mm" {
			t.Errorf("short value %q with unit %q, want \"2 mm\" with mm", got, q.Unit())
		}
	}
	if v := (Value{}).At("f", Span{3, 3 + 70000}, "m"); v.Span() != (Span{3, 70003}) || v.File() != "f" || v.Unit() != "m" {
		t.Errorf("At kept %v in %q with %q", v.Span(), v.File(), v.Unit())
	}
}

// Refs yields each declaration and use of a name once, with its kind, its
// loop for nodes and components, and the span of the name as written;
// a duplicate's ends are uses too, though the model keeps no duplicate.
func TestRefs(t *testing.T) {
	src := `param d = 8 mm
part tube { bore d }
loop l {
  fluid water
  node a at (0, 0, 0) mm
  node b
  pipe p from a to b { use tube; length 1 m }
  pipe p from b to a { length 2 * d }
  evaporator e from b to zz { heat 10 W }
}
case c nominal { heat e 5 W }
`
	want := []string{
		"param d decl", "part tube decl",
		"node a decl l", "node b decl l",
		"node a use l", "node b use l", "component p decl l",
		"node b use l", "component e decl l",
		"case c decl",
		"param d use",                  // in the part, read for the pipe that uses it
		"node b use l", "node a use l", // the duplicate's ends
		"fluid water use l",
		"part tube use",
		"component e use l",
		// The duplicate's fields are not read: its "2 * d" uses nothing.
	}
	for _, load := range []func(string, []byte, FS) *Model{LoadSource, LoadSourceModel} {
		m := load("r.loop", []byte(src), nil)
		var got []string
		for r := range m.Refs() {
			if text := src[r.Span().Start:r.Span().End]; text != r.Name || r.File() != "r.loop" {
				t.Errorf("ref %s at %v in %q reads %q", r.Name, r.Span(), r.File(), text)
			}
			kind := [...]string{"param", "node", "component", "case", "part", "fluid"}[r.Kind]
			s := kind + " " + r.Name + map[bool]string{true: " decl", false: " use"}[r.IsDecl]
			if r.Loop != nil {
				s += " " + r.Loop.Name
			}
			got = append(got, s)
		}
		slices.Sort(got)
		w := slices.Clone(want)
		slices.Sort(w)
		if !slices.Equal(got, w) {
			t.Errorf("refs\n%s\nwant\n%s", strings.Join(got, "\n"), strings.Join(w, "\n"))
		}
	}
}
