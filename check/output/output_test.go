package output

import (
	"strings"
	"testing"

	"circa/check"
	"circa/lang"
)

// bad has an error after a two-byte character on its line ("²" is two
// bytes in UTF-8, one UTF-16 code unit) and a warning (a copied pipe).
const bad = "loop l {\n" +
	"  fluid water\n" +
	"  node a\n  node b\n  node c\n  node d\n" +
	"  evaporator e from a to b { wetted_area 1 cm²; length 0.2 m; rise 0.5 m; bore 8 mm }\n" +
	"  pipe up from b to c { length 1 m; rise 0.7 m; bore 8 mm }\n" +
	"  condenser k from c to d { length 0.3 m; rise -0.2 m; bore 8 mm }\n" +
	"  pipe down from d to a { length 1.1 m; rise -1 m; bore 8 mm }\n" +
	"\tpipe down2 from d to a { length 1.1 m; rise -1 m; bore 8 mm }\n" +
	"}\n"

func files(t *testing.T, src string) []File {
	t.Helper()
	m := lang.LoadSource("c.loop", []byte(src), nil)
	return []File{{"c.loop", m, check.RunReport(m, check.Options{SkipEstimates: true})}}
}

func TestTextColour(t *testing.T) {
	var b strings.Builder
	if err := Text(&b, nil, nil, true); err != nil || !strings.HasPrefix(b.String(), "0 files checked") {
		t.Errorf("%q %v", b.String(), err)
	}
	fs := files(t, bad)
	b.Reset()
	_ = Text(&b, fs, Collect(fs), true)
	if !strings.Contains(b.String(), "\x1b[1;31merror\x1b[0m: evaporator e rises") {
		t.Errorf("no colour:\n%q", b.String())
	}
	b.Reset()
	_ = Text(&b, fs, Collect(fs), false)
	if strings.Contains(b.String(), "\x1b[") {
		t.Errorf("colour without asking:\n%q", b.String())
	}
}

// A file given twice (as an included file is, on its own and through its
// includer) reports each finding once.
func TestCollectDropsRepeats(t *testing.T) {
	fs := files(t, bad)
	once := len(Collect(fs))
	if once == 0 {
		t.Fatal("no findings")
	}
	if twice := len(Collect(append(fs, fs...))); twice != once {
		t.Errorf("%d findings from the same file twice, want %d", twice, once)
	}
}

func TestWriteUnknownFormat(t *testing.T) {
	var b strings.Builder
	if err := Write(&b, "xml", nil, nil, false); err == nil {
		t.Error("no error for an unknown format")
	}
	for _, f := range Formats {
		b.Reset()
		if err := Write(&b, f, nil, nil, false); err != nil {
			t.Errorf("%s: %v", f, err)
		}
	}
}

// Workflow-command escaping (GitHub Actions "workflow commands" docs): data
// escapes %, CR and LF; properties also : and ,.
func TestGitHubEscaping(t *testing.T) {
	if got := ghData("50% a\r\nb"); got != "50%25 a%0D%0Ab" {
		t.Errorf("ghData = %q", got)
	}
	if got := ghProp("a:b,c%"); got != "a%3Ab%2Cc%25" {
		t.Errorf("ghProp = %q", got)
	}
}

// Columns in bytes, characters and UTF-16 units: "é" is two UTF-8 bytes and
// one UTF-16 unit, "😀" (U+1F600) four bytes and two UTF-16 units (Unicode
// 15, §3.9 and §3.8 surrogate pairs).
func TestPositionColumns(t *testing.T) {
	src := "é😀x\nab"
	m := lang.LoadSource("p.loop", []byte(src), nil)
	p, ok := Position(m, "p.loop", strings.Index(src, "x"))
	if !ok || p != (Pos{Line: 1, Byte: 7, Char: 3, UTF16: 4}) {
		t.Errorf("Position = %+v %v", p, ok)
	}
	if _, ok := Position(m, "other.loop", 0); ok {
		t.Error("a file the model does not hold is located")
	}
	if got := Where(m, lang.Location{File: "p.loop", Span: lang.Span{Start: strings.Index(src, "b")}}); got != "p.loop:2:2" {
		t.Errorf("Where = %q", got)
	}
	// A reversed span ends where it starts.
	s, e, _ := Span(m, lang.Location{File: "p.loop", Span: lang.Span{Start: 5, End: 1}})
	if e != s {
		t.Errorf("reversed span %+v %+v", s, e)
	}
}

// Range clips an underline to its first line and keeps an edit whole.
func TestRangeClip(t *testing.T) {
	mp := lang.NewMapper([]byte("abc\ndefg\n"))
	sp := lang.Span{Start: 1, End: 6}
	a, b := Range(mp, sp, lang.UTF16, true)
	if a != (lang.Position{Line: 0, Col: 1}) || b != (lang.Position{Line: 0, Col: 3}) {
		t.Errorf("clipped %v %v", a, b)
	}
	_, b = Range(mp, sp, lang.UTF16, false)
	if b != (lang.Position{Line: 1, Col: 2}) {
		t.Errorf("whole %v", b)
	}
}

// JSON positions carry the character column the text format prints beside
// the byte column: after "é😀" (2 + 4 bytes, 2 characters, 3 UTF-16 units)
// the x is byte column 7, character 3, UTF-16 unit 4.
func TestJSONCharColumn(t *testing.T) {
	src := "é😀x\nab"
	m := lang.LoadSource("p.loop", []byte(src), nil)
	loc := jloc(m, lang.Location{File: "p.loop", Span: lang.Span{Start: strings.Index(src, "x"), End: strings.Index(src, "x") + 1}})
	if loc.Start.Column != 7 || loc.Start.Char != 3 || loc.Start.UTF16 != 4 || loc.End.Char != 4 {
		t.Errorf("start %+v end %+v", loc.Start, loc.End)
	}
	var b strings.Builder
	fs := files(t, bad)
	if err := JSON(&b, fs, Collect(fs)); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(b.String(), `"char":`) {
		t.Error("no char column in the JSON")
	}
}
