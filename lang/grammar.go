package lang

import (
	"fmt"

	"github.com/alecthomas/participle/v2"
	"github.com/alecthomas/participle/v2/lexer"
)

// The participle grammar of one statement. It parses into these mirror
// types, which carry participle's full positions, and the result is
// converted to the compact tree. Well-formed statements take the
// hand-written fast path; the grammar decides and explains every error.

var stmtParser = participle.MustBuild[gStmt](
	participle.Lexer(lexDef{}),
	participle.Elide("Space", "Comment"),
	participle.UseLookahead(2),
)

// argParser parses one part of a statement; it is used only to explain why
// the statement parser stopped before the end of a line.
var argParser = participle.MustBuild[gArg](
	participle.Lexer(lexDef{}),
	participle.Elide("Space", "Comment"),
	participle.UseLookahead(2),
)

type gStmt struct {
	Pos    lexer.Position
	EndPos lexer.Position
	Word   *gIdent `parser:"@@"`
	Args   []*gArg `parser:"@@*"`
}

type gIdent struct {
	Pos    lexer.Position
	EndPos lexer.Position
	Name   string `parser:"@Ident"`
}

type gArg struct {
	Pos    lexer.Position
	EndPos lexer.Position
	Key    string `parser:"  @(\"from\" | \"to\" | \"at\" | \"=\")"`
	Expr   *gExpr `parser:"| @@"`
}

type gExpr struct {
	Pos    lexer.Position
	EndPos lexer.Position
	Left   *gTerm     `parser:"@@"`
	Ops    []*gExprOp `parser:"@@*"`
}

type gExprOp struct {
	Op   string `parser:"@(\"+\" | \"-\")"`
	Term *gTerm `parser:"@@"`
}

type gTerm struct {
	Pos    lexer.Position
	EndPos lexer.Position
	Left   *gFactor   `parser:"@@"`
	Ops    []*gTermOp `parser:"@@*"`
}

type gTermOp struct {
	Op     string   `parser:"@(\"*\" | \"/\")"`
	Factor *gFactor `parser:"@@"`
}

type gFactor struct {
	Pos    lexer.Position
	EndPos lexer.Position
	Sign   string  `parser:"@(\"-\" | \"+\")?"`
	Atom   *gAtom  `parser:"@@"`
	Power  *gPower `parser:"( \"^\" @@ )?"`
}

type gPower struct {
	Pos    lexer.Position
	EndPos lexer.Position
	Sign   string `parser:"@(\"-\" | \"+\")?"`
	Digits string `parser:"@Number"`
}

type gAtom struct {
	Pos    lexer.Position
	EndPos lexer.Position
	Number string    `parser:"(  @Number"`
	Ref    *gIdent   `parser:" | (?! \"from\" | \"to\" | \"at\") @@"`
	Str    *gStr     `parser:" | @@"`
	Group  []*gExpr  `parser:" | \"(\" @@ ( \",\" @@ )* \")\" )"`
	Unit   *gUnitTok `parser:"@@?"`
}

type gStr struct {
	Pos    lexer.Position
	EndPos lexer.Position
	Quoted string `parser:"@String"`
}

type gUnitTok struct {
	Pos    lexer.Position
	EndPos lexer.Position
	Text   string `parser:"@Unit"`
}

func at(p lexer.Position) Pos { return Pos{Offset: p.Offset} }

func (g *gStmt) tree() *Stmt {
	s := &Stmt{Pos: at(g.Pos), EndPos: at(g.EndPos), Word: g.Word.tree()}
	for _, a := range g.Args {
		s.Args = append(s.Args, a.tree())
	}
	return s
}

func (g *gIdent) tree() *Ident {
	if g == nil {
		return nil
	}
	return &Ident{Pos: at(g.Pos), EndPos: at(g.EndPos), Name: g.Name}
}

func (g *gArg) tree() *Arg {
	if g == nil {
		return nil
	}
	return &Arg{Pos: at(g.Pos), EndPos: at(g.EndPos), Key: g.Key, Expr: g.Expr.tree()}
}

func (g *gExpr) tree() *Expr {
	if g == nil {
		return nil
	}
	e := &Expr{Pos: at(g.Pos), EndPos: at(g.EndPos), Left: g.Left.tree()}
	for _, op := range g.Ops {
		e.Ops = append(e.Ops, &ExprOp{Op: op.Op, Term: op.Term.tree()})
	}
	return e
}

func (g *gTerm) tree() *Term {
	if g == nil {
		return nil
	}
	t := &Term{Pos: at(g.Pos), EndPos: at(g.EndPos), Left: g.Left.tree()}
	for _, op := range g.Ops {
		t.Ops = append(t.Ops, &TermOp{Op: op.Op, Factor: op.Factor.tree()})
	}
	return t
}

func (g *gFactor) tree() *Factor {
	if g == nil {
		return nil
	}
	f := &Factor{Pos: at(g.Pos), EndPos: at(g.EndPos), Sign: g.Sign, Atom: g.Atom.tree()}
	if g.Power != nil {
		f.Power = &Power{Pos: at(g.Power.Pos), EndPos: at(g.Power.EndPos), Sign: g.Power.Sign, Digits: g.Power.Digits}
	}
	return f
}

func (g *gAtom) tree() *Atom {
	if g == nil {
		return nil
	}
	a := &Atom{Pos: at(g.Pos), EndPos: at(g.EndPos), Number: g.Number, Ref: g.Ref.tree()}
	if g.Str != nil {
		a.Str = &Str{Pos: at(g.Str.Pos), EndPos: at(g.Str.EndPos), Quoted: g.Str.Quoted}
	}
	for _, e := range g.Group {
		a.Group = append(a.Group, e.tree())
	}
	if g.Unit != nil {
		a.Unit = &UnitTok{Pos: at(g.Unit.Pos), EndPos: at(g.Unit.EndPos), Text: g.Unit.Text}
	}
	return a
}

func parseArg(lex *lexer.PeekingLexer) (a *Arg, err error) {
	defer func() {
		if r := recover(); r != nil {
			a, err = nil, fmt.Errorf("cannot parse this part (%v)", r)
		}
	}()
	ga, err := argParser.ParseFromLexer(lex, participle.AllowTrailing(true))
	if err != nil {
		return nil, err
	}
	return ga.tree(), nil
}

// parseStmt runs the participle grammar for one statement, turning any
// panic inside the parser into an error.
func parseStmt(lex *lexer.PeekingLexer) (s *Stmt, err error) {
	defer func() {
		if r := recover(); r != nil {
			s, err = nil, fmt.Errorf("cannot parse this statement (%v)", r)
		}
	}()
	gs, err := stmtParser.ParseFromLexer(lex, participle.AllowTrailing(true))
	if err != nil {
		return nil, err
	}
	return gs.tree(), nil
}
