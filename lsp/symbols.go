package lsp

import (
	"bytes"
	"context"
	"strconv"
	"strings"
	"sync"
	"unicode/utf8"

	"go.lsp.dev/jsonrpc2"
	"go.lsp.dev/protocol"

	"circa/lang"
)

func documentSymbolRequest(ctx context.Context, s *Server, sn *snapshot, params []byte) (any, error) {
	p, err := decode[protocol.DocumentSymbolParams](params)
	if err != nil {
		return nil, err
	}
	path := pathOf(p.TextDocument.URI)
	a := sn.analysisFor(path)
	if a == nil {
		return protocol.DocumentSymbolSlice{}, nil
	}
	if b := a.symbols.get(path, sn.enc); b != nil {
		return jsonrpc2.RawMessage(b), nil
	}
	b := sn.outline(a.Model(), path)
	a.symbols.put(path, sn.enc, b)
	return jsonrpc2.RawMessage(b), nil
}

// symbolCache holds an analysis's last encoded outline: editors ask for
// the symbols of one version several times (outline, breadcrumbs, sticky
// headers), and an analysis's model, texts and encoding never change.
type symbolCache struct {
	mu    sync.Mutex
	path  string
	enc   lang.Encoding
	reply []byte
}

func (c *symbolCache) get(path string, enc lang.Encoding) []byte {
	c.mu.Lock()
	defer c.mu.Unlock()
	if c.reply != nil && c.path == path && c.enc == enc {
		return c.reply
	}
	return nil
}

func (c *symbolCache) put(path string, enc lang.Encoding, reply []byte) {
	c.mu.Lock()
	c.path, c.enc, c.reply = path, enc, reply
	c.mu.Unlock()
}

// outliner writes the symbols of one file as the protocol's
// DocumentSymbol[] JSON. A large file has tens of thousands of symbols, so
// it appends them to one buffer rather than building and then encoding a
// tree of values.
type outliner struct {
	m   *lang.Mapper
	enc lang.Encoding
	b   []byte
	// The line of the last offset mapped, where the next one mostly is:
	// its number, start, end before the line ending, the start of the next
	// line (past the text for the last), and how far from its start the line
	// is known to be ASCII, where columns are byte counts in every encoding.
	line, start, end, next, ascii int
	tmp                           []byte // a detail being made
}

// position is the mapper's position of a byte offset, found without a
// search when the offset is on the line of the one before.
func (o *outliner) position(off int) lang.Position {
	text := o.m.Text()
	off = min(max(off, 0), len(text))
	if off < o.start || off >= o.next {
		o.line = o.lineOf(off)
		o.start, o.end = o.m.LineStart(o.line), o.m.LineEnd(o.line)
		o.next = len(text) + 1
		if o.line+1 < o.m.Lines() {
			o.next = o.m.LineStart(o.line + 1)
		}
		o.ascii = o.start
	}
	off = min(off, o.end)
	for o.ascii < off && text[o.ascii] < utf8.RuneSelf {
		o.ascii++
	}
	if off > o.ascii {
		return o.m.OffsetPosition(off, o.enc)
	}
	return lang.Position{Line: o.line, Col: off - o.start}
}

// lineOf is the mapper's OffsetLine, looking a few lines past the last
// one first: declarations come in order.
func (o *outliner) lineOf(off int) int {
	if o.next > 0 && off >= o.next {
		n := o.m.Lines()
		for l := o.line + 1; l < n && l <= o.line+4; l++ {
			if l+1 == n || off < o.m.LineStart(l+1) {
				return l
			}
		}
	}
	return o.m.OffsetLine(off)
}

// rangeOf appends a range object for a span, converted as toRange does.
func (o *outliner) rangeOf(sp lang.Span, clip bool) {
	var a, b lang.Position
	if o.m != nil {
		a, b = o.position(sp.Start), o.position(sp.End)
		if b.Line < a.Line || (b.Line == a.Line && b.Col < a.Col) {
			b = a
		}
		if clip && b.Line > a.Line {
			b = o.position(o.m.LineEnd(a.Line))
		}
	}
	o.b = append(o.b, `{"start":`...)
	o.pos(a)
	o.b = append(o.b, `,"end":`...)
	o.pos(b)
	o.b = append(o.b, '}')
}

func (o *outliner) pos(p lang.Position) {
	o.b = append(o.b, `{"line":`...)
	o.b = strconv.AppendUint(o.b, uint64(max(p.Line, 0)), 10)
	o.b = append(o.b, `,"character":`...)
	o.b = strconv.AppendUint(o.b, uint64(max(p.Col, 0)), 10)
	o.b = append(o.b, '}')
}

// open starts a declaration's symbol: its name, detail (left out when
// empty), kind, whole extent (head through closing brace) and name. The
// caller may write children, then ends it with close.
func (o *outliner) open(d lang.Decl, kind protocol.SymbolKind, detail []byte) {
	o.b = append(o.b, `{"name":`...)
	o.b = appendJSONString(o.b, d.Name)
	if len(detail) > 0 {
		o.b = append(o.b, `,"detail":`...)
		o.b = appendJSONString(o.b, detail)
	}
	o.b = append(o.b, `,"kind":`...)
	o.b = strconv.AppendUint(o.b, uint64(kind), 10)
	o.b = append(o.b, `,"range":`...)
	end := d.Span().End
	if d.BlockClose() >= 0 {
		end = d.BlockClose() + 1
	}
	o.rangeOf(lang.Span{Start: d.Span().Start, End: end}, false)
	o.b = append(o.b, `,"selectionRange":`...)
	o.rangeOf(d.NameSpan(), true)
}

func (o *outliner) close() { o.b = append(o.b, '}', ',') }

// symbol writes a declaration's symbol without children.
func (o *outliner) symbol(d lang.Decl, kind protocol.SymbolKind, detail []byte) {
	o.open(d, kind, detail)
	o.close()
}

// list starts a JSON array; endList ends it, dropping a trailing comma.
func (o *outliner) list() { o.b = append(o.b, '[') }

func (o *outliner) endList() {
	if o.b[len(o.b)-1] == ',' {
		o.b = o.b[:len(o.b)-1]
	}
	o.b = append(o.b, ']')
}

// appendJSONString appends s as a JSON string: quotes, backslashes and
// control characters escaped, invalid UTF-8 replaced by U+FFFD.
func appendJSONString[S string | []byte](b []byte, s S) []byte {
	const hex = "0123456789abcdef"
	b = append(b, '"')
	last := 0
	for i := 0; i < len(s); {
		c := s[i]
		if c >= 0x20 && c != '"' && c != '\\' && c < utf8.RuneSelf {
			i++
			continue
		}
		if c >= utf8.RuneSelf {
			r, n := utf8.DecodeRuneInString(string(s[i:min(i+utf8.UTFMax, len(s))]))
			if r != utf8.RuneError || n != 1 {
				i += n
				continue
			}
			b = append(b, s[last:i]...)
			b = append(b, `\ufffd`...)
			i++
			last = i
			continue
		}
		b = append(b, s[last:i]...)
		switch c {
		case '"', '\\':
			b = append(b, '\\', c)
		case '\n':
			b = append(b, '\\', 'n')
		case '\t':
			b = append(b, '\\', 't')
		case '\r':
			b = append(b, '\\', 'r')
		default:
			b = append(b, '\\', 'u', '0', '0', hex[c>>4], hex[c&0xf])
		}
		i++
		last = i
	}
	b = append(b, s[last:]...)
	return append(b, '"')
}

// The details of declarations other than parameters: their keywords.
var (
	detailLoop, detailNode, detailJunction = []byte("loop"), []byte("node"), []byte("junction")
	detailPart, detailCase, detailNominal  = []byte("part"), []byte("case"), []byte("nominal case")
)

// symbolBytes is about the encoded size of one symbol of a large file:
// its fixed text, name, detail and two ranges.
const symbolBytes = 224

// outline lists a file's loops (with their nodes and components), parts,
// cases and parameters, as JSON.
func (sn *snapshot) outline(m *lang.Model, path string) []byte {
	o := &outliner{m: sn.mapperFor(path), enc: sn.enc}
	n := inFile(m.Parts, path) + inFile(m.Cases, path) + inFile(m.Params, path)
	for _, l := range m.Loops {
		if l.File() == path {
			n += 1 + inFile(l.Nodes, path) + inFile(l.Components, path)
		}
	}
	o.b = make([]byte, 0, 64+n*symbolBytes)
	o.list()
	for _, l := range m.Loops {
		if l.File() != path {
			continue
		}
		o.open(l.Decl, protocol.SymbolKindNamespace, detailLoop)
		if inFile(l.Nodes, path)+inFile(l.Components, path) > 0 {
			o.b = append(o.b, `,"children":`...)
			o.list()
			for _, n := range l.Nodes {
				if n.File() == path {
					kind := detailNode
					if n.Junction {
						kind = detailJunction
					}
					o.symbol(n.Decl, protocol.SymbolKindConstant, kind)
				}
			}
			for _, c := range l.Components {
				if c.File() == path {
					o.symbol(c.Decl, protocol.SymbolKindObject, o.componentDetail(c))
				}
			}
			o.endList()
		}
		o.close()
	}
	for _, p := range m.Parts {
		if p.File() == path {
			o.symbol(p.Decl, protocol.SymbolKindStruct, detailPart)
		}
	}
	for _, c := range m.Cases {
		if c.File() == path {
			d := detailCase
			if c == m.Nominal {
				d = detailNominal
			}
			o.symbol(c.Decl, protocol.SymbolKindEvent, d)
		}
	}
	for _, p := range m.Params {
		if p.File() == path {
			o.symbol(p.Decl, protocol.SymbolKindConstant, o.valueText(p.Value, path))
		}
	}
	o.endList()
	return o.b
}

// componentDetail is a component's kind and the nodes it joins, "pipe
// split → a_in", as a signature says what a function takes. It reuses one
// buffer: the symbol's text is copied out before the next.
func (o *outliner) componentDetail(c *lang.Component) []byte {
	o.tmp = append(o.tmp[:0], c.Kind.String()...)
	if c.From != nil {
		o.tmp = append(append(o.tmp, ' '), c.From.Name...)
	}
	if c.To != nil {
		o.tmp = append(append(o.tmp, " → "...), c.To.Name...)
	}
	return o.tmp
}

// valueDetail is the longest value text an outline shows in full.
const valueDetail = 40

// valueText is a parameter's value as written, its detail in the outline
// as a signature is a function's: cut to its first line and about
// valueDetail bytes. It is empty (no detail) for a value the file did not
// write.
func (o *outliner) valueText(v lang.Value, path string) []byte {
	sp := v.Span()
	if o.m == nil || v.File() != path || sp.Start < 0 || sp.End > len(o.m.Text()) || sp.End <= sp.Start {
		return nil
	}
	t := o.m.Text()[sp.Start:sp.End]
	if i := bytes.IndexAny(t, "\r\n"); i >= 0 {
		t = t[:i]
	}
	if len(t) > valueDetail {
		cut := valueDetail
		for cut > 0 && !utf8.RuneStart(t[cut]) {
			cut--
		}
		t = bytes.TrimSpace(t[:cut])
		return append(append(make([]byte, 0, len(t)+len("…")), t...), "…"...)
	}
	return bytes.TrimSpace(t)
}

func workspaceSymbolRequest(ctx context.Context, s *Server, sn *snapshot, params []byte) (any, error) {
	p, err := decode[protocol.WorkspaceSymbolParams](params)
	if err != nil {
		return nil, err
	}
	q := strings.ToLower(p.Query)
	out := protocol.SymbolInformationSlice{}
	seen := map[string]bool{}
	add := func(d lang.Decl, kind protocol.SymbolKind, container string) {
		if q != "" && !strings.Contains(strings.ToLower(d.Name), q) {
			return
		}
		k := d.File() + "|" + d.Name + "|" + container
		if seen[k] {
			return
		}
		seen[k] = true
		si := protocol.SymbolInformation{Location: protocol.Location{URI: uriOf(d.File()), Range: sn.rangeIn(d.File(), d.NameSpan(), true)}}
		si.Name = d.Name
		si.Kind = kind
		if container != "" {
			si.ContainerName = &container
		}
		out = append(out, si)
	}
	for _, a := range sn.sortedRoots() {
		if ctx.Err() != nil {
			return nil, ctx.Err()
		}
		m := a.Model()
		for _, l := range m.Loops {
			add(l.Decl, protocol.SymbolKindNamespace, "")
			for _, n := range l.Nodes {
				add(n.Decl, protocol.SymbolKindConstant, l.Name)
			}
			for _, c := range l.Components {
				add(c.Decl, protocol.SymbolKindObject, l.Name)
			}
		}
		for _, p := range m.Parts {
			add(p.Decl, protocol.SymbolKindStruct, "")
		}
		for _, c := range m.Cases {
			add(c.Decl, protocol.SymbolKindEvent, "")
		}
		for _, p := range m.Params {
			add(p.Decl, protocol.SymbolKindConstant, "")
		}
	}
	return out, nil
}

// inFile counts the declarations among ds written in path.
func inFile[T interface{ Loc() lang.Location }](ds []T, path string) int {
	n := 0
	for _, d := range ds {
		if d.Loc().File == path {
			n++
		}
	}
	return n
}
