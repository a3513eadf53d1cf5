package output

import (
	"strings"
	"testing"

	"circa/lang"
)

func TestPrintable(t *testing.T) {
	for in, want := range map[string]string{
		"plain °C µm ²":        "plain °C µm ²",
		"a\x1b[2Jb":            `a\x1b[2Jb`,
		"nul\x00":              `nul\x00`,
		"del\x7f":              `del\x7f`,
		"tab\tkept":            "tab\tkept",
		"bad\xffbyte":          `bad\xffbyte`,
		"c1\u009bx":            `c1\u009bx`,
		"rtl\u202eevil":        `rtl\u202eevil`,
		"cr\r":                 `cr\x0d`,
		"isolate\u2066x\u2069": `isolate\u2066x\u2069`,
	} {
		if got := Printable(in); got != want {
			t.Errorf("Printable(%q) = %q, want %q", in, got, want)
		}
	}
}

// A source excerpt never carries a control byte of the file to the
// terminal, and its caret still stands under the span.
func TestTextEscapesExcerpts(t *testing.T) {
	src := "param a = 2 m  # \x1b[2J clear\nparam b = 1 m \x00 x\n"
	m := lang.LoadSource("ctl.loop", []byte(src), nil)
	var fs []Finding
	for _, d := range m.Diags {
		fs = append(fs, Finding{Diagnostic: d, Model: m})
	}
	if len(fs) == 0 {
		t.Fatal("no finding")
	}
	var b strings.Builder
	if err := Text(&b, nil, fs, false); err != nil {
		t.Fatal(err)
	}
	out := b.String()
	for _, c := range out {
		if c < 0x20 && c != '\n' && c != '\t' {
			t.Fatalf("raw control character %q in output:\n%s", c, out)
		}
	}
	want := "  param b = 1 m \\x00 x\n                ^~~~\n"
	if !strings.Contains(out, want) {
		t.Errorf("excerpt:\n%s\nwant:\n%s", out, want)
	}
	// GitHub annotations too.
	b.Reset()
	GitHub(&b, fs)
	if strings.ContainsAny(b.String(), "\x00\x1b") {
		t.Errorf("annotation carries control bytes: %q", b.String())
	}
}

// A finding on a very long line shows only the part of the line about its
// span, so a line of a megabyte with a hundred errors does not print a
// hundred megabytes; the caret still stands under the span.
func TestTextClipsLongLines(t *testing.T) {
	// Blanks make it long: a statement has at most lang.MaxStmtTokens
	// tokens.
	src := "param a = 1 m " + strings.Repeat(" ", 600_000) + strings.Repeat("+ 1 m ", 1000) + "$ 2\n"
	m := lang.LoadSource("long.loop", []byte(src), nil)
	var fs []Finding
	for _, d := range m.Diags {
		fs = append(fs, Finding{Diagnostic: d, Model: m})
	}
	if len(fs) == 0 {
		t.Fatal("no finding")
	}
	var b strings.Builder
	if err := Text(&b, nil, fs, false); err != nil {
		t.Fatal(err)
	}
	out := b.String()
	if len(out) > 1000 {
		t.Fatalf("%d bytes of output for %d findings", len(out), len(fs))
	}
	want := "  …" + "+" + strings.Repeat(" 1 m +", 9) + " 1 m $ 2\n" + strings.Repeat(" ", 2+1+60) + "^\n"
	if !strings.Contains(out, want) {
		t.Errorf("excerpt:\n%s\nwant:\n%s", out, want)
	}
}
