package lang

import (
	"strings"

	"github.com/alecthomas/participle/v2/lexer"
)

// File is the syntax tree of one .loop text: its statements in blocks, its
// comments, and the syntax errors found. A file with errors still holds every
// statement that parsed.
type File struct {
	Path     string
	Src      []byte
	Stmts    []*Stmt
	Comments []Comment
	Errors   []Diagnostic
	Mapper   *Mapper
}

// Stmt is one statement: a word followed by its parts, and an optional
// block. Bad statements (syntax errors) keep their span and word, if any.
type Stmt struct {
	Pos    lexer.Position
	EndPos lexer.Position
	Word   *Ident `parser:"@@"`
	Args   []*Arg `parser:"@@*"`

	Block *Block // nil when the statement has no block
	Bad   bool   // the statement did not parse; Word may still be set
}

// Span returns the statement's head span (without its block).
func (s *Stmt) Span() Span { return Span{s.Pos.Offset, s.EndPos.Offset} }

// Name returns the statement's word.
func (s *Stmt) Keyword() string {
	if s.Word == nil {
		return ""
	}
	return s.Word.Name
}

// Block is a brace-delimited list of statements.
type Block struct {
	Open    int // offset of '{'
	Close   int // offset of '}', or -1 when the block was never closed
	Stmts   []*Stmt
	OneLine bool // written on the line of its head
}

// Ident is a name with its span.
type Ident struct {
	Pos    lexer.Position
	EndPos lexer.Position
	Name   string `parser:"@Ident"`
}

// Span returns the name's span.
func (i *Ident) Span() Span { return Span{i.Pos.Offset, i.EndPos.Offset} }

// Arg is one piece of a statement after its word: a connective keyword
// (from, to, at, =) or an expression.
type Arg struct {
	Pos    lexer.Position
	EndPos lexer.Position
	Key    string `parser:"  @(\"from\" | \"to\" | \"at\" | \"=\")"`
	Expr   *Expr  `parser:"| @@"`
}

// Span returns the part's span.
func (p *Arg) Span() Span { return Span{p.Pos.Offset, p.EndPos.Offset} }

// Expr is a sum of terms.
type Expr struct {
	Pos    lexer.Position
	EndPos lexer.Position
	Left   *Term     `parser:"@@"`
	Ops    []*ExprOp `parser:"@@*"`
}

// Span returns the expression's span.
func (e *Expr) Span() Span { return Span{e.Pos.Offset, e.EndPos.Offset} }

// ExprOp is "+ term" or "- term".
type ExprOp struct {
	Op   string `parser:"@(\"+\" | \"-\")"`
	Term *Term  `parser:"@@"`
}

// Term is a product of factors.
type Term struct {
	Pos    lexer.Position
	EndPos lexer.Position
	Left   *Factor   `parser:"@@"`
	Ops    []*TermOp `parser:"@@*"`
}

// TermOp is "* factor" or "/ factor".
type TermOp struct {
	Op     string  `parser:"@(\"*\" | \"/\")"`
	Factor *Factor `parser:"@@"`
}

// Factor is an optionally signed atom with an optional integer power.
type Factor struct {
	Pos    lexer.Position
	EndPos lexer.Position
	Sign   string `parser:"@(\"-\" | \"+\")?"`
	Atom   *Atom  `parser:"@@"`
	Power  *Power `parser:"( \"^\" @@ )?"`
}

// Power is the exponent after '^'.
type Power struct {
	Pos    lexer.Position
	EndPos lexer.Position
	Sign   string `parser:"@(\"-\" | \"+\")?"`
	Digits string `parser:"@Number"`
}

// Atom is a number with an optional unit, a name, a string, or a
// parenthesised expression or vector with an optional unit.
type Atom struct {
	Pos    lexer.Position
	EndPos lexer.Position
	Number string   `parser:"(  @Number"`
	Ref    *Ident   `parser:" | (?! \"from\" | \"to\" | \"at\") @@"`
	Str    *Str     `parser:" | @@"`
	Group  []*Expr  `parser:" | \"(\" @@ ( \",\" @@ )* \")\" )"`
	Unit   *UnitTok `parser:"@@?"`
}

// Span returns the atom's span.
func (a *Atom) Span() Span { return Span{a.Pos.Offset, a.EndPos.Offset} }

// Str is a string literal with its quotes.
type Str struct {
	Pos    lexer.Position
	EndPos lexer.Position
	Quoted string `parser:"@String"`
}

// Value returns the string without quotes and escapes.
func (s *Str) Value() string { return unquote(s.Quoted) }

// Span returns the literal's span.
func (s *Str) Span() Span { return Span{s.Pos.Offset, s.EndPos.Offset} }

// UnitTok is the unit word after a number or a closing parenthesis.
type UnitTok struct {
	Pos    lexer.Position
	EndPos lexer.Position
	Text   string `parser:"@Unit"`
}

// Span returns the unit's span.
func (u *UnitTok) Span() Span { return Span{u.Pos.Offset, u.EndPos.Offset} }

func unquote(q string) string {
	if len(q) >= 2 && q[0] == '"' && q[len(q)-1] == '"' {
		q = q[1 : len(q)-1]
	}
	if !strings.Contains(q, `\`) {
		return q
	}
	var b strings.Builder
	for i := 0; i < len(q); i++ {
		if q[i] == '\\' && i+1 < len(q) {
			i++
			switch q[i] {
			case 'n':
				b.WriteByte('\n')
			case 't':
				b.WriteByte('\t')
			default:
				b.WriteByte(q[i])
			}
			continue
		}
		b.WriteByte(q[i])
	}
	return b.String()
}

// Quote writes s as a string literal.
func Quote(s string) string {
	var b strings.Builder
	b.WriteByte('"')
	for _, r := range s {
		switch r {
		case '"', '\\':
			b.WriteByte('\\')
			b.WriteRune(r)
		case '\n':
			b.WriteString(`\n`)
		case '\t':
			b.WriteString(`\t`)
		default:
			b.WriteRune(r)
		}
	}
	b.WriteByte('"')
	return b.String()
}
