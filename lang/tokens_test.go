package lang

import (
	"bytes"
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"golang.org/x/tools/txtar"
)

// meaningTokens is the token sequence of src as it bears on meaning: every
// token but blanks, with newlines and ';' (both end a statement) written as
// one separator, runs of them collapsed, none at the start or end or next to
// a brace (where the layout adds or removes them; a '}' ends a statement
// by itself). Comments are a sequence
// of their own: a trailing comment may move to the first statement of its
// line, but never past another comment.
func meaningTokens(src []byte) (toks, comments []string) {
	all, cs := scan(src)
	sep := false
	for _, t := range all {
		switch {
		case t.Type == TokSpace || t.Type == TokComment || t.Type == TokEOF:
			continue
		case t.Type == TokNewline || (t.Type == TokPunct && t.Value == ";"):
			sep = true
			continue
		}
		brace := t.Type == TokPunct && (t.Value == "{" || t.Value == "}")
		if sep && len(toks) > 0 && !brace && toks[len(toks)-1] != "P{" && toks[len(toks)-1] != "P}" {
			toks = append(toks, "SEP")
		}
		sep = false
		toks = append(toks, fmt.Sprintf("%c%s", tokLetter(t.Type), t.Value))
	}
	for _, c := range cs {
		comments = append(comments, strings.TrimRight(c.Text, "\r"))
	}
	return toks, comments
}

func tokLetter(tt any) rune {
	switch tt {
	case TokIdent:
		return 'I'
	case TokNumber:
		return 'N'
	case TokUnit:
		return 'U'
	case TokString:
		return 'S'
	case TokPunct:
		return 'P'
	case TokBad:
		return 'B'
	}
	return '?'
}

// checkSameTokens fails unless out lexes to the same meaning tokens and
// comments as src.
func checkSameTokens(t testing.TB, name string, src, out []byte) {
	t.Helper()
	a, ac := meaningTokens(src)
	b, bc := meaningTokens(out)
	if !slices.Equal(a, b) {
		i := 0
		for i < len(a) && i < len(b) && a[i] == b[i] {
			i++
		}
		t.Fatalf("%s: formatting changed the tokens at token %d: %q became %q\ninput:\n%s\noutput:\n%s",
			name, i, a[i:min(i+5, len(a))], b[i:min(i+5, len(b))], src, out)
	}
	if !slices.Equal(ac, bc) {
		t.Fatalf("%s: formatting changed the comments: %q became %q", name, ac, bc)
	}
}

// shippedSources returns every .loop file and every section of every
// .txtar archive in the repository's testdata and examples.
func shippedSources(t *testing.T) map[string][]byte {
	out := map[string][]byte{}
	err := filepath.Walk("..", func(p string, info os.FileInfo, err error) error {
		if err != nil {
			return err
		}
		if info.IsDir() && (strings.HasPrefix(info.Name(), ".") && p != ".." || info.Name() == "node_modules") {
			return filepath.SkipDir
		}
		switch {
		case strings.HasSuffix(p, ".loop"):
			b, err := os.ReadFile(p)
			if err != nil {
				return err
			}
			out[p] = b
		case strings.HasSuffix(p, ".txtar"):
			ar, err := txtar.ParseFile(p)
			if err != nil {
				return err
			}
			for _, f := range ar.Files {
				out[p+":"+f.Name] = f.Data
			}
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	return out
}

// The formatter changes layout only: over the fuzz corpus and every shipped
// source, the formatted text lexes to the same tokens and comments.
func TestFormatKeepsTokens(t *testing.T) {
	n := 0
	try := func(name string, src []byte) {
		f := Parse(name, src)
		if len(f.Errors) > 0 {
			return
		}
		out, err := Format(f)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		checkSameTokens(t, name, src, out)
		n++
	}
	for _, target := range []string{"FuzzFormat", "FuzzParse", "FuzzLoadSource"} {
		for i, seed := range fuzzSeeds(t, target) {
			try(fmt.Sprintf("%s#%d", target, i), seed)
		}
	}
	for name, src := range shippedSources(t) {
		try(name, src)
	}
	if n < 30 {
		t.Fatalf("only %d sources formatted: the corpus was not found", n)
	}
}

// Texts whose layout differs from the canonical one in ways that lexing
// is sensitive to.
func TestFormatKeepsTokensTricky(t *testing.T) {
	for _, src := range []string{
		"param a = 12mm\n",
		"param a = 2 m*h\n",
		"param a = (1, 2, 3)m\n",
		"param a = 1 m -2 m\n",
		"param a = b -2\n",
		"param a = 4 W/(m² K)\n",
		"loop l { fluid R1234ze(E); node a }  # c\n",
		"param a = 1e3kW\n",
		"param a = 2 m^2\n",
		"param a = x^-2\n",
		"case c { heat e 2 kW; sink 3 degC }\n",
	} {
		f := Parse("t.loop", []byte(src))
		if len(f.Errors) > 0 {
			t.Errorf("%q: %s", src, f.Errors[0].Message())
			continue
		}
		out, err := Format(f)
		if err != nil {
			t.Fatal(err)
		}
		checkSameTokens(t, src, []byte(src), out)
	}
}

// Hexadecimal numbers are refused, not read as zero with a unit: "0x10 m"
// was formatted as "0 x10 m".
func TestHexNumberRefused(t *testing.T) {
	for _, c := range []struct{ src, want string }{
		{"param a = 0x10 m\n", "1:11 0x10 is not a number here: numbers are decimal"},
		{"param a = -0X1f\n", "1:11 -0X1f is not a number here: numbers are decimal"},
		{"loop l {\n  length 0x2 m\n}\n", "2:10 0x2 is not a number here: numbers are decimal"},
	} {
		f := Parse("hex.loop", []byte(c.src))
		checkErrs(t, f, []string{c.want})
		if out, err := Format(f); err == nil || out != nil {
			t.Errorf("%q formatted as %q", c.src, out)
		}
	}
	// Still units: a number followed tight by a unit word starting with x
	// but no hex digit after it.
	if f := Parse("x.loop", []byte("param a = 0xyz\n")); len(f.Errors) > 0 {
		t.Errorf("0xyz: %s", f.Errors[0].Message())
	}
}

// NaN and Inf are not numbers of the language; the message says numbers
// are decimal, not how to write a negative value.
func TestNaNInfMessage(t *testing.T) {
	for _, c := range []struct{ src, at, name string }{
		{"param a = NaN m\n", "1:11", "NaN"},
		{"param a = Inf\n", "1:11", "Inf"},
		{"param a = -inf kW\n", "1:12", "inf"},
		{"loop l {\n  pipe p from a to b { length NaN m }\n}\n", "2:31", "NaN"},
		{"loop l {\n  node a at (Infinity, 0, 0) m\n}\n", "2:14", "Infinity"},
		{"case c {\n  heat e NaN kW\n}\n", "2:10", "NaN"},
	} {
		m := LoadSource("n.loop", []byte(c.src), memFS{})
		found := false
		for _, d := range m.Diags {
			msg := d.Message()
			if strings.Contains(msg, "negative") {
				t.Errorf("%q: hint about negative values: %s", c.src, msg)
			}
			if msg == c.name+" is not a number here: numbers are decimal, like 12, 0.5 or 1.5e-3" {
				f := m.Files["n.loop"]
				p := f.Mapper.OffsetPosition(d.Loc.Span.Start, UTF8)
				if got := fmt.Sprintf("%d:%d", p.Line+1, p.Col+1); got != c.at {
					t.Errorf("%q: at %s, want %s", c.src, got, c.at)
				}
				found = true
			}
		}
		if !found {
			t.Errorf("%q: no decimal-number finding in %v", c.src, messages(m.Diags))
		}
	}
}

func messages(ds []Diagnostic) []string {
	var out []string
	for _, d := range ds {
		out = append(out, d.Message())
	}
	return out
}

// A byte-order mark at the start is accepted; positions after it stay
// right, and the formatter drops it.
func TestByteOrderMark(t *testing.T) {
	src := []byte("\ufeffparam a = 2 m  # c\nparam b = a $\n")
	f := Parse("bom.loop", src)
	// The error is on line 2, where the mark is no part of the line.
	checkErrs(t, f, []string{"2:13 unexpected character"})
	ok := Parse("bom.loop", []byte("\ufeff# note\nparam a = 2 m\n"))
	if len(ok.Errors) > 0 {
		t.Fatalf("mark refused: %s", ok.Errors[0].Message())
	}
	out, err := Format(ok)
	if err != nil {
		t.Fatal(err)
	}
	if want := "# note\nparam a = 2 m\n"; string(out) != want {
		t.Errorf("formatted %q, want %q", out, want)
	}
	if bytes.Contains(out, []byte("\ufeff")) {
		t.Error("the mark was kept")
	}
	// Only at the start: elsewhere U+FEFF is a character like any other.
	mid := Parse("mid.loop", []byte("param a = 2 m\n\ufeffparam b = 1\n"))
	if len(mid.Errors) != 1 {
		t.Errorf("U+FEFF inside the text: %d errors, want 1", len(mid.Errors))
	}
}

// Past MaxErrors syntax errors a file is taken for something else than a
// .loop file: one note says so and nothing more is reported.
func TestTooManyErrors(t *testing.T) {
	var b strings.Builder
	for i := 0; i < 500; i++ {
		fmt.Fprintf(&b, "param x%d = 3 $\n", i)
	}
	b.WriteString("param ok = 2 m\n")
	f := Parse("many.loop", []byte(b.String()))
	if len(f.Errors) != MaxErrors+1 {
		t.Fatalf("%d errors, want %d", len(f.Errors), MaxErrors+1)
	}
	last := f.Errors[MaxErrors].Message()
	if !strings.Contains(last, "more than 100 syntax errors") || !strings.Contains(last, "does not look like a .loop file") {
		t.Errorf("last error %q", last)
	}
	// The statements after the cut are still parsed.
	if s := f.Stmts[len(f.Stmts)-1]; s.Bad || s.Keyword() != "param" {
		t.Errorf("last statement %+v", s)
	}
	// Binary input: the same cap.
	bin := make([]byte, 1<<16)
	for i := range bin {
		bin[i] = byte(i*7919 + i/13)
	}
	if g := Parse("bin.loop", bin); len(g.Errors) > MaxErrors+1 {
		t.Errorf("binary input: %d errors", len(g.Errors))
	}
}
