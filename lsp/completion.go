package lsp

import (
	"context"
	"sort"
	"strings"

	"go.lsp.dev/protocol"

	"circa/check/fluid"
	"circa/lang"
	"circa/units"
)

// scope is where the cursor stands: the block kind and, inside a loop or a
// component, which one.
type scope struct {
	kind string // "top", "loop", "component", "part", "case", "limits", "methods"
	loop *lang.Loop
	comp lang.Kind
}

var topWords = []string{"include", "param", "part", "loop", "case", "limits", "methods"}
var loopWords = append(append([]string{"node", "junction"}, lang.Kinds()...), lang.LoopFields...)

func completionRequest(ctx context.Context, s *Server, sn *snapshot, params []byte) (any, error) {
	p, err := decode[protocol.CompletionParams](params)
	if err != nil {
		return nil, err
	}
	c, ok := sn.cursorAt(p.TextDocumentPositionParams)
	if !ok {
		return &protocol.CompletionList{Items: []protocol.CompletionItem{}}, nil
	}
	return &protocol.CompletionList{Items: complete(c)}, nil
}

// scopeAt finds the innermost block holding the cursor.
func scopeAt(c *cursor) scope {
	sc := scope{kind: "top"}
	var inLoop *lang.Stmt
	for _, st := range stmtPath(c.f, c.off) {
		b := st.Block
		if b == nil || c.off <= b.Open || (b.Close >= 0 && c.off > b.Close) {
			continue
		}
		switch kw := st.Keyword(); kw {
		case "loop":
			sc = scope{kind: "loop"}
			inLoop = st
		case "part":
			sc = scope{kind: "part"}
		case "case", "limits", "methods":
			sc = scope{kind: kw}
		case "profile", "envelope":
			if sc.kind == "case" {
				sc = scope{kind: kw}
			}
		default:
			for i, k := range lang.Kinds() {
				if k == kw {
					sc = scope{kind: "component", comp: lang.Kind(i), loop: sc.loop}
				}
			}
		}
	}
	if inLoop != nil {
		for _, l := range c.m.Loops {
			if l.File() == c.path && l.Span().Start == inLoop.Span().Start {
				sc.loop = l
			}
		}
	}
	return sc
}

// complete lists what may be written at the cursor.
func complete(c *cursor) []protocol.CompletionItem {
	mp := c.snap.mapperFor(c.path)
	line := mp.OffsetLine(c.off)
	before := string(mp.Text()[mp.LineStart(line):c.off])
	if i := strings.IndexByte(before, '#'); i >= 0 {
		return []protocol.CompletionItem{}
	}
	if i := strings.LastIndexAny(before, ";{"); i >= 0 {
		before = before[i+1:]
	}
	words := strings.Fields(before)
	partial := ""
	if len(words) > 0 && !strings.HasSuffix(before, " ") && !strings.HasSuffix(before, "\t") {
		partial = words[len(words)-1]
		words = words[:len(words)-1]
	}
	repl := lang.Span{Start: c.off - len(partial), End: c.off}
	sc := scopeAt(c)
	b := &itemList{rng: c.snap.rangeIn(c.path, repl, true)}
	if len(words) == 0 {
		for _, w := range statementWords(sc) {
			b.add(w, protocol.CompletionItemKindKeyword, wordDoc(sc.kind, w))
		}
		return b.items
	}
	kw := words[0]
	prev := words[len(words)-1]
	switch {
	case kw == "fluid" && sc.kind == "loop":
		if len(words) == 1 {
			b.words(fluid.Names(), protocol.CompletionItemKindEnumMember)
			b.words([]string{"table"}, protocol.CompletionItemKindKeyword)
		}
	case kw == "use":
		b.words(names(c.m, lang.RefPart), protocol.CompletionItemKindStruct)
	case sc.kind == "loop" && isKind(kw) || sc.kind == "loop" && (kw == "node" || kw == "junction"):
		b.connection(c, sc, kw, words)
	case sc.kind == "methods":
		if len(words) == 1 {
			b.words(lang.MethodChoices[kw], protocol.CompletionItemKindEnumMember)
		}
	case sc.kind == "case" && (kw == "heat" || kw == "sink") && len(words) == 1:
		want := lang.Evaporator
		if kw == "sink" {
			want = lang.Condenser
			b.value(c, kw, prev)
		}
		for _, l := range c.m.Loops {
			for _, comp := range l.Components {
				if comp.Kind == want {
					b.add(comp.Name, protocol.CompletionItemKindClass, comp.Kind.String()+" in "+l.Name)
				}
			}
		}
	case sc.kind == "profile" && kw == "columns":
		b.words(lang.ProfileColumns, protocol.CompletionItemKindField)
	case kw == "case" && len(words) == 2:
		b.words([]string{"nominal"}, protocol.CompletionItemKindKeyword)
	case kw == "param" && len(words) >= 3 || kw != "param":
		b.value(c, kw, prev)
	}
	return b.items
}

func isKind(w string) bool {
	for _, k := range lang.Kinds() {
		if k == w {
			return true
		}
	}
	return false
}

// statementWords lists the words a statement may start with in a scope.
func statementWords(sc scope) []string {
	switch sc.kind {
	case "loop":
		return loopWords
	case "component":
		return lang.ComponentFields[sc.comp]
	case "part":
		seen := map[string]bool{}
		var out []string
		for _, k := range []lang.Kind{lang.Pipe, lang.Evaporator, lang.Condenser, lang.Reservoir} {
			for _, f := range lang.ComponentFields[k] {
				if !seen[f] && f != "use" {
					seen[f] = true
					out = append(out, f)
				}
			}
		}
		return out
	case "case":
		return lang.CaseFields
	case "limits":
		return lang.LimitFields
	case "methods":
		return lang.MethodFields
	case "profile":
		return lang.ProfileFields
	case "envelope":
		return lang.EnvelopeFields
	}
	return topWords
}

// connection completes "KIND NAME from A to B" and "node NAME at".
func (b *itemList) connection(c *cursor, sc scope, kw string, words []string) {
	prev := words[len(words)-1]
	switch {
	case kw == "node" || kw == "junction":
		if len(words) == 2 {
			b.words([]string{"at"}, protocol.CompletionItemKindKeyword)
		}
	case prev == "from" || prev == "to" || prev == "at":
		if sc.loop != nil {
			for _, n := range sc.loop.Nodes {
				b.add(n.Name, protocol.CompletionItemKindConstant, "node")
			}
		}
	case len(words) == 2 && kw == "reservoir":
		b.words([]string{"at"}, protocol.CompletionItemKindKeyword)
	case len(words) == 2:
		b.words([]string{"from"}, protocol.CompletionItemKindKeyword)
	case len(words) == 4:
		b.words([]string{"to"}, protocol.CompletionItemKindKeyword)
	}
}

// value completes a field's value: after a number, the units of the
// dimension the field needs; before one, the parameters.
func (b *itemList) value(c *cursor, field, prev string) {
	if endsInNumber(prev) {
		need, ok := lang.FieldNeeds[field]
		if !ok {
			return
		}
		for _, u := range units.Common(need.Dim) {
			if u.Text == "" {
				continue
			}
			if need.Dim == units.Temperature {
				if need.Difference && u.Affine || !need.Difference && u.IsDifference() {
					continue
				}
			}
			// The symbol people write (°C, µm, m²) first, then the ASCII
			// spelling: "35 °" completes to °C.
			if p := units.Pretty(u.Text); p != u.Text {
				b.add(p, protocol.CompletionItemKindUnit, units.Name(u.Dim)+" ("+u.Text+")")
			}
			b.add(u.Text, protocol.CompletionItemKindUnit, units.Name(u.Dim))
		}
		return
	}
	for _, p := range c.m.Params {
		b.add(p.Name, protocol.CompletionItemKindVariable, "param")
	}
}

func endsInNumber(w string) bool {
	return w != "" && (w[len(w)-1] >= '0' && w[len(w)-1] <= '9' || w[len(w)-1] == '.')
}

func names(m *lang.Model, kind lang.RefKind) []string {
	seen := map[string]bool{}
	var out []string
	for r := range m.Refs() {
		if r.Kind == kind && r.IsDecl && !seen[r.Name] {
			seen[r.Name] = true
			out = append(out, r.Name)
		}
	}
	sort.Strings(out)
	return out
}

// itemList builds completion items that replace the partial word.
type itemList struct {
	rng   protocol.Range
	items []protocol.CompletionItem
	seen  map[string]bool
}

func (b *itemList) add(label string, kind protocol.CompletionItemKind, detail string) {
	if b.seen == nil {
		b.seen = map[string]bool{}
	}
	if b.seen[label] {
		return
	}
	b.seen[label] = true
	it := protocol.CompletionItem{Label: label, Kind: kind, TextEdit: &protocol.TextEdit{Range: b.rng, NewText: label}}
	if detail != "" {
		it.Detail = protocol.NewOptional(detail)
	}
	b.items = append(b.items, it)
}

func (b *itemList) words(ws []string, kind protocol.CompletionItemKind) {
	for _, w := range ws {
		b.add(w, kind, "")
	}
}
