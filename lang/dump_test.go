package lang

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// dumpTree renders a syntax tree without positions: words, parts, keys,
// expression structure, numbers, units, strings and block nesting. Two
// texts that differ only in layout dump the same.
func dumpTree(f *File) string {
	var b strings.Builder
	var stmts func([]*Stmt, int)
	stmts = func(list []*Stmt, depth int) {
		for _, s := range list {
			b.WriteString(strings.Repeat(".", depth))
			if s.Bad {
				b.WriteString("BAD ")
			}
			b.WriteString(s.Keyword())
			for _, a := range s.Args {
				if a.Key != "" {
					fmt.Fprintf(&b, " key(%s)", a.Key)
				} else {
					b.WriteString(" ")
					dumpExpr(&b, a.Expr)
				}
			}
			b.WriteString("\n")
			if s.Block != nil {
				b.WriteString(strings.Repeat(".", depth) + "{\n")
				stmts(s.Block.Stmts, depth+1)
				b.WriteString(strings.Repeat(".", depth) + "}\n")
			}
		}
	}
	stmts(f.Stmts, 0)
	return b.String()
}

func dumpExpr(b *strings.Builder, e *Expr) {
	if e == nil {
		b.WriteString("<nil>")
		return
	}
	b.WriteString("E[")
	dumpTerm(b, e.Left)
	for _, op := range e.Ops {
		b.WriteString(" " + op.Op + " ")
		dumpTerm(b, op.Term)
	}
	b.WriteString("]")
}

func dumpTerm(b *strings.Builder, t *Term) {
	if t == nil {
		b.WriteString("<nil>")
		return
	}
	b.WriteString("T[")
	dumpFactor(b, t.Left)
	for _, op := range t.Ops {
		b.WriteString(" " + op.Op + " ")
		dumpFactor(b, op.Factor)
	}
	b.WriteString("]")
}

func dumpFactor(b *strings.Builder, f *Factor) {
	if f == nil {
		b.WriteString("<nil>")
		return
	}
	fmt.Fprintf(b, "F[%s", f.Sign)
	a := f.Atom
	switch {
	case a == nil:
		b.WriteString("<nil>")
	case a.Number != "":
		fmt.Fprintf(b, "num(%s)", a.Number)
	case a.Ref != nil:
		fmt.Fprintf(b, "ref(%s)", a.Ref.Name)
	case a.Str != nil:
		fmt.Fprintf(b, "str(%s)", a.Str.Quoted)
	default:
		b.WriteString("group(")
		for i, e := range a.Group {
			if i > 0 {
				b.WriteString(", ")
			}
			dumpExpr(b, e)
		}
		b.WriteString(")")
	}
	if a != nil && a.Unit != nil {
		fmt.Fprintf(b, " unit(%s)", a.Unit.Text)
	}
	if f.Power != nil {
		fmt.Fprintf(b, " ^(%s%s)", f.Power.Sign, f.Power.Digits)
	}
	b.WriteString("]")
}

// commentTexts lists the comments' text without a line-ending '\r'.
func commentTexts(f *File) []string {
	out := make([]string, len(f.Comments))
	for i, c := range f.Comments {
		out[i] = strings.TrimRight(c.Text, "\r")
	}
	return out
}

// exampleFiles returns every example .loop text of the repository.
func exampleFiles(t testing.TB) map[string][]byte {
	t.Helper()
	out := map[string][]byte{}
	root := filepath.Join("..", "testdata", "examples")
	err := filepath.Walk(root, func(p string, info os.FileInfo, err error) error {
		if err != nil {
			return err
		}
		if !info.IsDir() && strings.HasSuffix(p, ".loop") {
			b, err := os.ReadFile(p)
			if err != nil {
				return err
			}
			out[p] = b
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	if len(out) == 0 {
		t.Fatal("no examples found")
	}
	return out
}
