package lsp

import (
	"bytes"
	"context"
	"sort"

	"go.lsp.dev/protocol"

	"circa/lang"
)

// Token types and modifiers, all from the protocol's standard set.
var (
	tokenTypes     = []string{"keyword", "property", "variable", "namespace", "class", "event", "struct", "enumMember", "number", "type", "string", "comment", "operator"}
	tokenModifiers = []string{"declaration", "readonly"}
)

const (
	tkKeyword = iota
	tkProperty
	tkVariable
	tkNamespace
	tkClass
	tkEvent
	tkStruct
	tkEnumMember
	tkNumber
	tkType
	tkString
	tkComment
	tkOperator
)

const (
	modDeclaration = 1 << iota
	modReadonly
)

type token struct {
	sp   lang.Span
	typ  int
	mods int
}

var refTokenType = map[lang.RefKind]int{
	lang.RefParam: tkVariable, lang.RefNode: tkProperty, lang.RefComponent: tkClass,
	lang.RefCase: tkEvent, lang.RefPart: tkStruct, lang.RefFluid: tkEnumMember,
}

// structural words are statements that declare things; the rest are fields.
var structural = map[string]bool{
	"include": true, "param": true, "part": true, "loop": true, "case": true, "limits": true, "methods": true,
	"node": true, "junction": true, "pipe": true, "evaporator": true, "condenser": true, "bend": true,
	"fitting": true, "reservoir": true, "use": true, "nominal": true, "table": true,
}

func semanticTokensRequest(ctx context.Context, s *Server, sn *snapshot, params []byte) (any, error) {
	p, err := decode[protocol.SemanticTokensParams](params)
	if err != nil {
		return nil, err
	}
	path := pathOf(p.TextDocument.URI)
	a := sn.analysisFor(path)
	if a == nil {
		return &protocol.SemanticTokens{Data: []uint32{}}, nil
	}
	m := a.Model()
	f := m.Files[path]
	if f == nil {
		return &protocol.SemanticTokens{Data: []uint32{}}, nil
	}
	return &protocol.SemanticTokens{Data: encodeTokens(sn.mapperFor(path), sn.enc, fileTokens(m, f))}, nil
}

// fileTokens classifies a file's words, names, numbers, units, strings,
// comments and operators.
func fileTokens(m *lang.Model, f *lang.File) []token {
	var toks []token
	names := map[lang.Span]token{}
	for r := range m.Refs() {
		if r.File() != f.Path {
			continue
		}
		t := token{sp: r.Span(), typ: refTokenType[r.Kind]}
		if r.IsDecl {
			t.mods |= modDeclaration
		}
		if r.Kind == lang.RefParam {
			t.mods |= modReadonly
		}
		names[r.Span()] = t
	}
	for _, l := range m.Loops {
		if l.File() == f.Path {
			names[l.NameSpan()] = token{sp: l.NameSpan(), typ: tkNamespace, mods: modDeclaration}
		}
	}
	for _, c := range f.Comments {
		toks = append(toks, token{sp: c.Span, typ: tkComment})
	}
	walkStmts(f.Stmts, 0, func(st *lang.Stmt, _ int) {
		if st.Word != nil {
			typ := tkProperty
			if structural[st.Word.Name] {
				typ = tkKeyword
			}
			toks = append(toks, token{sp: st.Word.Span(), typ: typ})
		}
		for _, arg := range st.Args {
			if arg.Key != "" {
				typ := tkKeyword
				if arg.Key == "=" {
					typ = tkOperator
				}
				toks = append(toks, token{sp: arg.Span(), typ: typ})
				continue
			}
			toks = append(toks, exprTokens(f.Src, arg.Expr, names)...)
		}
	})
	sort.SliceStable(toks, func(i, j int) bool { return toks[i].sp.Start < toks[j].sp.Start })
	out := toks[:0]
	end := -1
	for _, t := range toks {
		if t.sp.Start < end || t.sp.End <= t.sp.Start {
			continue
		}
		out = append(out, t)
		end = t.sp.End
	}
	return out
}

func exprTokens(src []byte, e *lang.Expr, names map[lang.Span]token) []token {
	var toks []token
	if e == nil {
		return nil
	}
	exprVisit(e, func(fac *lang.Factor, at *lang.Atom) {
		switch {
		case at.Number != "":
			start := at.Pos.Offset
			if fac.Sign != "" && fac.Pos.Offset < start {
				start = fac.Pos.Offset
			}
			toks = append(toks, token{sp: lang.Span{Start: start, End: at.Pos.Offset + len(at.Number)}, typ: tkNumber})
		case at.Ref != nil:
			if t, ok := names[at.Ref.Span()]; ok {
				toks = append(toks, t)
			} else if at.Ref.Name == "nominal" || at.Ref.Name == "table" {
				toks = append(toks, token{sp: at.Ref.Span(), typ: tkKeyword})
			} else {
				toks = append(toks, token{sp: at.Ref.Span(), typ: tkVariable})
			}
		case at.Str != nil:
			toks = append(toks, token{sp: at.Str.Span(), typ: tkString})
		}
		if at.Unit != nil {
			toks = append(toks, token{sp: at.Unit.Span(), typ: tkType})
		}
	})
	toks = append(toks, operatorTokens(src, e)...)
	return toks
}

// operatorTokens finds the + - * / ^ between the parts of an expression;
// the tree keeps the operator but not its offset, so it is found in the gap.
func operatorTokens(src []byte, e *lang.Expr) []token {
	var toks []token
	find := func(from, to int, op string) {
		if from < 0 || to > len(src) || from >= to {
			return
		}
		if i := bytes.Index(src[from:to], []byte(op)); i >= 0 {
			toks = append(toks, token{sp: lang.Span{Start: from + i, End: from + i + len(op)}, typ: tkOperator})
		}
	}
	var term func(t *lang.Term)
	var expr func(e *lang.Expr)
	factor := func(f *lang.Factor) {
		if f == nil || f.Atom == nil {
			return
		}
		for _, g := range f.Atom.Group {
			expr(g)
		}
		if f.Power != nil {
			find(f.Atom.EndPos.Offset, f.Power.Pos.Offset, "^")
		}
	}
	term = func(t *lang.Term) {
		if t == nil {
			return
		}
		factor(t.Left)
		prev := t.Left
		for _, op := range t.Ops {
			if prev != nil && op.Factor != nil {
				find(prev.EndPos.Offset, op.Factor.Pos.Offset, op.Op)
			}
			factor(op.Factor)
			prev = op.Factor
		}
	}
	expr = func(e *lang.Expr) {
		if e == nil {
			return
		}
		term(e.Left)
		prev := e.Left
		for _, op := range e.Ops {
			if prev != nil && op.Term != nil {
				find(prev.EndPos.Offset, op.Term.Pos.Offset, op.Op)
			}
			term(op.Term)
			prev = op.Term
		}
	}
	expr(e)
	return toks
}

// encodeTokens writes tokens in the protocol's relative form, each clipped
// to its line.
func encodeTokens(m *lang.Mapper, enc lang.Encoding, toks []token) []uint32 {
	data := make([]uint32, 0, 5*len(toks))
	prevLine, prevCol := 0, 0
	// The tokens are in order: each position is counted on from the last
	// token's start, so a line of a million tokens is read once, not once
	// for each.
	at, atPos := 0, lang.Position{}
	for _, t := range toks {
		a := m.OffsetPositionFrom(at, atPos, t.sp.Start, enc)
		b := m.OffsetPositionFrom(t.sp.Start, a, t.sp.End, enc)
		if b.Line < a.Line || (b.Line == a.Line && b.Col < a.Col) {
			b = a
		}
		at, atPos = t.sp.Start, a
		if b.Line > a.Line {
			b = m.OffsetPositionFrom(t.sp.Start, a, m.LineEnd(a.Line), enc)
		}
		length := b.Col - a.Col
		if length <= 0 {
			continue
		}
		dl := a.Line - prevLine
		dc := a.Col
		if dl == 0 {
			dc = a.Col - prevCol
		}
		data = append(data, uint32(dl), uint32(dc), uint32(length), uint32(t.typ), uint32(t.mods))
		prevLine, prevCol = a.Line, a.Col
	}
	return data
}
