package lang

import "testing"

// TestFormatLoneCR checks that a lone CR ends a line in the layout as it
// does for positions: what follows it is a statement of its own, and a
// comment ends at it.
func TestFormatLoneCR(t *testing.T) {
	src := "param a = 1 m # x\rparam y = 2 m\nparam b = 2 m\n# c\rparam d = 1 m\r\nparam   c = 3 m\n"
	want := "param a = 1 m  # x\nparam y = 2 m\nparam b = 2 m\n# c\nparam d = 1 m\nparam c = 3 m\n"
	out, err := Format(Parse("cr.loop", []byte(src)))
	if err != nil {
		t.Fatal(err)
	}
	if string(out) != want {
		t.Errorf("Format(%q) = %q, want %q", src, out, want)
	}
}

// TestLoneCREndsLine checks that the lexer and the Mapper split a text into
// the same lines: "\n", "\r\n" and a lone "\r" all end one (the editor
// protocol's line ends), so a statement after a lone "\r" is not read as
// part of the line before it.
func TestLoneCREndsLine(t *testing.T) {
	for _, src := range []string{
		"param a = 1 m\rparam b = 2 m\r",
		"param a = 1 m\r\rparam b = 2 m",
		"param a = 1 m   \r  param b = 2 m\r\n",
		"param a = 1 m # note\rparam b = 2 m\n",
		"param a = 1\rmm\n", // "mm" is a statement of its own, not a's unit
	} {
		f := Parse("cr.loop", []byte(src))
		if src == "param a = 1\rmm\n" {
			if len(f.Stmts) != 2 || f.Stmts[1].Keyword() != "mm" {
				t.Errorf("%q: the word after a lone CR was read as the number's unit (%d statements)", src, len(f.Stmts))
			}
			continue
		}
		if len(f.Errors) > 0 {
			t.Errorf("%q: %v", src, f.Errors[0].Message())
		}
		if len(f.Stmts) != 2 {
			t.Errorf("%q: %d statements, want 2", src, len(f.Stmts))
			continue
		}
		m := f.Mapper
		if l0, l1 := m.OffsetLine(f.Stmts[0].Pos.Offset), m.OffsetLine(f.Stmts[1].Pos.Offset); l1 == l0 {
			t.Errorf("%q: both statements on line %d", src, l0)
		}
		toks, comments := scan([]byte(src))
		for _, tk := range toks {
			if got, want := tk.Pos.Line-1, m.OffsetLine(tk.Pos.Offset); got != want {
				t.Errorf("%q: token %q at %d is on line %d for the lexer, %d for the Mapper", src, tk.Value, tk.Pos.Offset, got, want)
			}
		}
		for _, c := range comments {
			if m.OffsetLine(c.Span.End) != m.OffsetLine(c.Span.Start) || c.Text[len(c.Text)-1] == '\r' {
				t.Errorf("%q: comment %q runs past its line's end", src, c.Text)
			}
		}
	}
}
