package lang

import (
	"fmt"
	"math/rand/v2"
	"reflect"
	"strings"
	"testing"

	"circa/lang/loopgen"
)

// checkReparse reparses next from the tree of prev and checks that the
// result is the tree, comments and errors that parsing next from scratch
// gives, and that prev's tree is left as it was.
func checkReparse(t *testing.T, prev *File, next []byte) *File {
	t.Helper()
	before := Parse(prev.Path, prev.Src)
	got := Reparse(prev.Path, prev, next, nil)
	want := Parse(prev.Path, next)
	if !reflect.DeepEqual(got.Stmts, want.Stmts) {
		t.Fatalf("reparsed tree differs from a full parse of\n%q\nafter\n%q\nreparsed:\n%s\nfull:\n%s", next, prev.Src, dumpSpans(got), dumpSpans(want))
	}
	if !reflect.DeepEqual(got.Errors, want.Errors) {
		t.Fatalf("reparsed errors differ for\n%q\nafter\n%q\nreparsed: %v\nfull:     %v", next, prev.Src, got.Errors, want.Errors)
	}
	if errs, ok := ReparseErrors(prev.Path, prev, next); ok && !reflect.DeepEqual(errs, want.Errors) {
		t.Fatalf("errors of the edited lines differ for\n%q\nafter\n%q\nalone: %v\nfull:  %v", next, prev.Src, errs, want.Errors)
	}
	if !reflect.DeepEqual(got.Comments, want.Comments) {
		t.Fatalf("reparsed comments differ for\n%q\nreparsed: %v\nfull:     %v", next, got.Comments, want.Comments)
	}
	if string(got.Src) != string(next) || got.Path != prev.Path || got.Mapper == nil {
		t.Fatalf("reparsed file has the wrong text, path or mapper")
	}
	if !reflect.DeepEqual(prev.Stmts, before.Stmts) || !reflect.DeepEqual(prev.Errors, before.Errors) || !reflect.DeepEqual(prev.Comments, before.Comments) {
		t.Fatalf("reparsing changed the old tree of\n%q", prev.Src)
	}
	return got
}

// dumpSpans renders a tree with every statement's and block's offsets.
func dumpSpans(f *File) string {
	out := ""
	var walk func([]*Stmt, string)
	walk = func(list []*Stmt, ind string) {
		for _, s := range list {
			out += fmt.Sprintf("%s%q %d-%d bad=%v", ind, s.Keyword(), s.Pos.Offset, s.EndPos.Offset, s.Bad)
			if s.Block != nil {
				out += fmt.Sprintf(" {%d..%d one=%v\n", s.Block.Open, s.Block.Close, s.Block.OneLine)
				walk(s.Block.Stmts, ind+"  ")
				out += ind + "}"
			}
			out += "\n"
		}
	}
	walk(f.Stmts, "")
	return out
}

// editPieces are what random edits insert: the characters that change how
// lines and blocks parse, and pieces of real statements.
var editPieces = []string{
	"\n", "\n\n", "{", "}", "{\n", "\n}", "}\n", ";", "#", "# note\n", "\"", "\"str\"", "(", ")", "=", "-", "+", "*", "^2",
	"1", "42", "1.5e-3", " mm", " kg", "m", "x", " ", "\t", "µ", "𝜃", "\r", "\r\n", "\ufeff",
	"param q = 3 mm\n", "pipe p1 from a to b {\n  length 2 m\n}\n", "  bend b2 from c to d { angle 90 deg }\n",
	"loop l {\n  node a at (0, 0, 1 m)\n}\n", "part tube { bore 8 mm }", "include \"x.loop\"\n", "((((", "))))",
}

// randomEdit replaces a random range of src (often empty, often within a
// line) by a random piece, or deletes it.
func randomEdit(r *rand.Rand, src []byte) []byte {
	if len(src) == 0 {
		return []byte(editPieces[r.IntN(len(editPieces))])
	}
	i := r.IntN(len(src) + 1)
	j := i
	switch r.IntN(4) {
	case 0:
		j = min(len(src), i+1+r.IntN(3))
	case 1:
		j = min(len(src), i+r.IntN(40))
	case 2:
		if r.IntN(8) == 0 {
			j = min(len(src), i+r.IntN(400))
		}
	}
	piece := ""
	if r.IntN(5) != 0 {
		piece = editPieces[r.IntN(len(editPieces))]
	}
	out := make([]byte, 0, len(src)-(j-i)+len(piece))
	out = append(out, src[:i]...)
	out = append(out, piece...)
	return append(out, src[j:]...)
}

// TestReparseMatchesParse applies random edit sequences to the examples
// and generated files, reparsing after each edit from the tree the last
// reparse built, and compares each result with a full parse.
func TestReparseMatchesParse(t *testing.T) {
	seeds := map[string][]byte{
		"lines":   loopgen.Lines(60),
		"network": loopgen.Network(30, 3),
		"empty":   nil,
		"nested":  []byte("loop a {\n  pipe p from x to y {\n    length 1 m\n    part t\n  }\n  node x\n}\n# end\n"),
		"oneline": []byte("part t { bore 8 mm; roughness 1 um }\nloop l { node a; node b }\n"),
	}
	for p, b := range exampleFiles(t) {
		seeds[p] = b
	}
	steps := 60
	if testing.Short() {
		steps = 20
	}
	for name, src := range seeds {
		t.Run(name, func(t *testing.T) {
			r := rand.New(rand.NewPCG(uint64(len(src)), 7))
			f := Parse("edit.loop", src)
			for range steps {
				f = checkReparse(t, f, randomEdit(r, f.Src))
			}
		})
	}
}

// TestReparseTyping changes each digit of the examples in turn, as typing
// over a value does: every such edit parses on its own.
func TestReparseTyping(t *testing.T) {
	for p, src := range exampleFiles(t) {
		old := Parse(p, src)
		for i, c := range src {
			if c < '0' || c > '9' {
				continue
			}
			next := append([]byte(nil), src...)
			next[i] = '0' + (c-'0'+1)%10
			if reparse(old, next, NewMapper(next), false) == nil {
				t.Errorf("%s: changing the digit at %d parsed the whole file", p, i)
				break
			}
			checkReparse(t, old, next)
		}
	}
}

// TestReparseReusesStatements edits one line deep inside a large loop:
// the statements before it are the old ones, the loop is a new statement
// and only the edited line is parsed again.
func TestReparseReusesStatements(t *testing.T) {
	src := loopgen.Network(400, 4)
	old := Parse("net.loop", src)
	var loop *Stmt
	for _, s := range old.Stmts {
		if s.Keyword() == "loop" {
			loop = s
		}
	}
	mid := loop.Block.Stmts[len(loop.Block.Stmts)/2]
	for _, ins := range []string{" ", "  x", ""} {
		// Insert after the statement's word, or delete the blank after it.
		at := mid.Pos.Offset + len(mid.Keyword())
		cut := at
		if ins == "" {
			cut++
		}
		next := append(append(append([]byte(nil), src[:at]...), ins...), src[cut:]...)
		f := reparse(old, next, NewMapper(next), false)
		if f == nil {
			t.Fatalf("an edit inside one statement of the loop was not parsed on its own")
		}
		checkReparse(t, old, next)
		var nl *Stmt
		for i, s := range f.Stmts {
			if s.Keyword() == "loop" {
				nl = s
			} else if s != old.Stmts[i] && s.Pos.Offset < mid.Pos.Offset {
				t.Errorf("statement %d before the edit was not reused", i)
			}
		}
		if nl == loop || nl.Block.Stmts[0] != loop.Block.Stmts[0] {
			t.Errorf("want a new loop statement holding the old first component")
		}
	}
}

// TestReparseSpecialCases covers edits that must not be parsed alone: a
// brace that closes or opens the surrounding block, lines joined across a
// statement boundary, a mark at the start of a line, and the error limit.
func TestReparseSpecialCases(t *testing.T) {
	cases := []struct{ old, new string }{
		{"loop a {\n  node x\n  node y\n}\n", "loop a {\n  node x\n}\n  node y\n}\n"},
		{"loop a {\n  node x\n  node y\n}\n", "loop a {\n  node x {\n  node y\n}\n"},
		{"loop a {\n  node x\n  node y\n}\n", "loop a {\n  node x  node y\n}\n"},
		{"loop a {\n  node x\n}\nnode y\n", "loop a {\n  node x\n}node y\n"},
		{"loop a {\n  node x\n}\n", "loop a {\n\ufeffnode x\n}\n"},
		{"param a = 1 mm\nparam b = 2 mm\n", "param a = 1 mm\nparam b = 2 mm\n"},
		{"param a = 1 mm\n", ""},
		{"", "param a = 1 mm"},
		{"loop a {\n  node x\n", "loop a {\n  node y\n"},
		{"}\nparam a = 1 mm\n", "}\nparam a = 2 mm\n}\n"},
		{"loop a { node x\n  node y\n}\n", "loop a { node x\n  node z\n}\n"},
		{"loop a {\n  node x\n} ; node y\n", "loop a {\n  node w\n} ; node y\n"},
	}
	var bad []byte
	for i := range MaxErrors + 3 {
		bad = fmt.Appendf(bad, "param p%d = = 1\n", i)
	}
	cases = append(cases, struct{ old, new string }{string(bad), string(bad) + "param x = = 2\n"})
	cases = append(cases, struct{ old, new string }{string(bad[:len(bad)/2]), "param x = = 2\n" + string(bad[:len(bad)/2])})
	deep := "loop a {\n"
	for range MaxNesting {
		deep += "n {\n"
	}
	cases = append(cases, struct{ old, new string }{deep, deep + "x {\n"})
	// Deeper than the tree keeps: edits inside, at and after the block too
	// deep.
	deeper := deep + "m {\n" + strings.Repeat("k {\n", 20) + "j\n" + strings.Repeat("}\n", MaxNesting+22) + "param q = 1 mm\n"
	for _, edit := range [][2]string{{"j\n", "i\n"}, {"m {", "m2 {"}, {"param q = 1", "param q = 2"}, {"k {\nj", "k {\n}\nj"}} {
		cases = append(cases, struct{ old, new string }{deeper, strings.Replace(deeper, edit[0], edit[1], 1)})
	}
	for _, c := range cases {
		checkReparse(t, Parse("c.loop", []byte(c.old)), []byte(c.new))
	}
}

// FuzzReparse edits a text at a fuzzed place and checks the reparsed tree
// against a full parse.
func FuzzReparse(f *testing.F) {
	for _, src := range exampleFiles(f) {
		f.Add(src, uint16(100), uint8(3), "}\n")
		f.Add(src, uint16(40), uint8(0), "{")
	}
	f.Add([]byte("loop a {\n  node x\n}\n"), uint16(12), uint8(1), "y\n} {")
	f.Fuzz(func(t *testing.T, src []byte, at uint16, cut uint8, ins string) {
		i := min(int(at), len(src))
		j := min(len(src), i+int(cut))
		next := append(append(append([]byte(nil), src[:i]...), ins...), src[j:]...)
		checkReparse(t, Parse("fuzz.loop", src), next)
	})
}
