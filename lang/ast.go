package lang

import "strings"

// Pos is a byte offset into a file's text. Tree nodes keep only offsets
// (lines and columns come from the file's Mapper), which keeps a large
// file's tree small.
type Pos struct{ Offset int }

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
	Pos    Pos
	EndPos Pos
	Word   *Ident
	Args   []*Arg

	Block *Block // nil when the statement has no block
	Bad   bool   // the statement did not parse; Word may still be set
	// head is set on a statement read without its parts (see
	// parseHeads): Args is nil and the parts are parsed again from the
	// text when they are needed.
	head bool
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
	// reread is set on the one-line block of a component read for its
	// model alone (see parseHeads): Stmts is nil and its n statements are
	// parsed again from the line when they are needed.
	reread bool
	n      int32
}

// Ident is a name with its span.
type Ident struct {
	Pos    Pos
	EndPos Pos
	Name   string
}

// Span returns the name's span.
func (i *Ident) Span() Span { return Span{i.Pos.Offset, i.EndPos.Offset} }

// Arg is one piece of a statement after its word: a connective keyword
// (from, to, at, =) or an expression.
type Arg struct {
	Pos    Pos
	EndPos Pos
	Key    string
	Expr   *Expr
}

// Span returns the part's span.
func (p *Arg) Span() Span { return Span{p.Pos.Offset, p.EndPos.Offset} }

// Expr is a sum of terms.
type Expr struct {
	Pos    Pos
	EndPos Pos
	Left   *Term
	Ops    []*ExprOp
}

// Span returns the expression's span.
func (e *Expr) Span() Span { return Span{e.Pos.Offset, e.EndPos.Offset} }

// ExprOp is "+ term" or "- term".
type ExprOp struct {
	Op   string
	Term *Term
}

// Term is a product of factors.
type Term struct {
	Pos    Pos
	EndPos Pos
	Left   *Factor
	Ops    []*TermOp
}

// TermOp is "* factor" or "/ factor".
type TermOp struct {
	Op     string
	Factor *Factor
}

// Factor is an optionally signed atom with an optional integer power.
type Factor struct {
	Pos    Pos
	EndPos Pos
	Sign   string
	Atom   *Atom
	Power  *Power
}

// Power is the exponent after '^'.
type Power struct {
	Pos    Pos
	EndPos Pos
	Sign   string
	Digits string
}

// Atom is a number with an optional unit, a name, a string, or a
// parenthesised expression or vector with an optional unit.
type Atom struct {
	Pos    Pos
	EndPos Pos
	Number string
	Ref    *Ident
	Str    *Str
	Group  []*Expr
	Unit   *UnitTok
}

// Span returns the atom's span.
func (a *Atom) Span() Span { return Span{a.Pos.Offset, a.EndPos.Offset} }

// Str is a string literal with its quotes.
type Str struct {
	Pos    Pos
	EndPos Pos
	Quoted string
}

// Value returns the string without quotes and escapes.
func (s *Str) Value() string { return unquote(s.Quoted) }

// Span returns the literal's span.
func (s *Str) Span() Span { return Span{s.Pos.Offset, s.EndPos.Offset} }

// UnitTok is the unit word after a number or a closing parenthesis.
type UnitTok struct {
	Pos    Pos
	EndPos Pos
	Text   string
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
