package lang

import (
	"bytes"
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"golang.org/x/tools/txtar"
)

var update = flag.Bool("update", false, "rewrite the expected output of golden files")

// diagTexts renders diagnostics as "start-end: message" for comparison.
func diagTexts(ds []Diagnostic) []string {
	var out []string
	for _, d := range ds {
		out = append(out, fmt.Sprintf("%d-%d: %s", d.Loc.Span.Start, d.Loc.Span.End, d.Message()))
	}
	return out
}

// checkFormat formats src and checks the formatter's promises: it succeeds
// on text without syntax errors, it is idempotent, the result parses to the
// same tree, keeps every comment and ends in one newline.
func checkFormat(t testing.TB, name string, src []byte) []byte {
	t.Helper()
	f := Parse(name, src)
	streamed, sf := FormatSource(name, src)
	if a, b := diagTexts(f.Errors), diagTexts(sf.Errors); !slices.Equal(a, b) {
		t.Fatalf("%s: FormatSource found the syntax errors %q, Parse %q", name, b, a)
	}
	if len(f.Errors) > 0 {
		out, err := Format(f)
		if err == nil || out != nil {
			t.Fatalf("%s: Format of a file with syntax errors gave %q, %v; want no text and an error", name, out, err)
		}
		if streamed != nil {
			t.Fatalf("%s: FormatSource of a file with syntax errors gave %q; want no text", name, streamed)
		}
		return nil
	}
	out, err := Format(f)
	if err != nil {
		t.Fatalf("%s: Format: %v", name, err)
	}
	if !bytes.Equal(streamed, out) {
		t.Fatalf("%s: FormatSource differs from Format of the tree\nstreamed:\n%s\ntree:\n%s", name, streamed, out)
	}
	checkSameTokens(t, name, src, out)
	g := Parse(name, out)
	if len(g.Errors) > 0 {
		t.Fatalf("%s: formatted text has syntax errors: %s\n%s", name, g.Errors[0].Message(), out)
	}
	if a, b := dumpTree(f), dumpTree(g); a != b {
		t.Fatalf("%s: formatting changed the tree\nbefore:\n%s\nafter:\n%s\ntext:\n%s", name, a, b, out)
	}
	if a, b := commentTexts(f), commentTexts(g); !slices.Equal(a, b) {
		t.Fatalf("%s: formatting changed the comments\nbefore: %q\nafter:  %q", name, a, b)
	}
	again, err := Format(g)
	if err != nil {
		t.Fatalf("%s: second Format: %v", name, err)
	}
	if !bytes.Equal(out, again) {
		t.Fatalf("%s: Format is not idempotent\nfirst:\n%s\nsecond:\n%s", name, out, again)
	}
	if len(out) > 0 && (out[len(out)-1] != '\n' || bytes.HasSuffix(out, []byte("\n\n"))) {
		t.Fatalf("%s: output does not end in exactly one newline: %q", name, out)
	}
	if bytes.ContainsRune(out, '\r') && !bytes.Contains(src, []byte("\r#")) {
		// A '\r' can survive only inside a comment's text.
		for _, line := range strings.Split(string(out), "\n") {
			if i := strings.IndexByte(line, '\r'); i >= 0 && !strings.Contains(line[:i], "#") {
				t.Fatalf("%s: '\\r' outside a comment in %q", name, line)
			}
		}
	}
	return out
}

func TestFormatExamples(t *testing.T) {
	for p, src := range exampleFiles(t) {
		checkFormat(t, p, src)
	}
}

func TestFormatFuzzSeeds(t *testing.T) {
	for _, target := range []string{"FuzzFormat", "FuzzParse", "FuzzLoadSource"} {
		for _, seed := range fuzzSeeds(t, target) {
			checkFormat(t, "seed.loop", seed)
		}
	}
}

// TestFormatGolden compares Format's output with the "output" section of
// each testdata/format/*.txtar archive ("input" holds the text to format).
// Run with -update to rewrite the expected output.
func TestFormatGolden(t *testing.T) {
	files, err := filepath.Glob(filepath.Join("testdata", "format", "*.txtar"))
	if err != nil || len(files) == 0 {
		t.Fatalf("no golden files: %v", err)
	}
	for _, file := range files {
		t.Run(filepath.Base(file), func(t *testing.T) {
			ar, err := txtar.ParseFile(file)
			if err != nil {
				t.Fatal(err)
			}
			var in, want []byte
			outIdx := -1
			for i, f := range ar.Files {
				switch f.Name {
				case "input":
					in = f.Data
				case "output":
					want, outIdx = f.Data, i
				}
			}
			if in == nil {
				t.Fatal("no input section")
			}
			// Sections can hold no '\r' or missing final newline literally:
			// the input spells them \r and \z (end of text without newline).
			in = []byte(strings.ReplaceAll(string(in), `\r`, "\r"))
			if i := bytes.Index(in, []byte(`\z`)); i >= 0 {
				in = in[:i]
			}
			got := checkFormat(t, file, in)
			if *update {
				if outIdx < 0 {
					ar.Files = append(ar.Files, txtar.File{Name: "output"})
					outIdx = len(ar.Files) - 1
				}
				ar.Files[outIdx].Data = got
				if err := os.WriteFile(file, txtar.Format(ar), 0o644); err != nil {
					t.Fatal(err)
				}
				return
			}
			if outIdx < 0 {
				t.Fatal("no output section (run with -update)")
			}
			if !bytes.Equal(got, want) {
				t.Errorf("output differs\ngot:\n%s\nwant:\n%s", got, want)
			}
		})
	}
}

func TestFormatRefusesSyntaxErrors(t *testing.T) {
	for _, src := range []string{
		"loop a {\n  pipe p from x to y\n",
		"}\n",
		"length 1 m +\n",
		"include \"x.loop\n",
		"param a = 3 $\n",
	} {
		f := Parse("bad.loop", []byte(src))
		out, err := Format(f)
		if err == nil || out != nil {
			t.Errorf("Format(%q) = %q, %v; want an error and no text", src, out, err)
			continue
		}
		if !strings.HasPrefix(err.Error(), "bad.loop:") {
			t.Errorf("Format(%q) error %q is not located", src, err)
		}
	}
	if _, err := Format(nil); err == nil {
		t.Error("Format(nil) gave no error")
	}
}

// fuzzSeeds reads the committed seed corpus of a fuzz target (Go's corpus
// file format, one []byte value per file).
func fuzzSeeds(t testing.TB, target string) [][]byte {
	t.Helper()
	files, err := filepath.Glob(filepath.Join("testdata", "fuzz", target, "*"))
	if err != nil {
		t.Fatal(err)
	}
	var out [][]byte
	for _, file := range files {
		b, err := os.ReadFile(file)
		if err != nil {
			t.Fatal(err)
		}
		v, err := parseCorpusBytes(b)
		if err != nil {
			t.Fatalf("%s: %v", file, err)
		}
		out = append(out, v)
	}
	if len(out) == 0 {
		t.Fatalf("no seeds for %s", target)
	}
	return out
}
