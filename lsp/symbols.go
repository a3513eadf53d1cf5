package lsp

import (
	"context"
	"strings"
	"sync"

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
	out := sn.outline(a.Model(), path)
	// A large file has tens of thousands of symbols: encode them into one
	// buffer of about the right size rather than growing it many times.
	b, err := protocol.AppendMarshal(make([]byte, 0, symbolBytes(out)), out)
	if err != nil {
		return nil, err
	}
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

// symbolBytes is about the encoded size of symbols: 240 bytes for one
// symbol's fixed text and ranges, plus its name and children.
func symbolBytes(symbols []protocol.DocumentSymbol) int {
	n := 2
	for i := range symbols {
		n += 240 + len(symbols[i].Name)
		if len(symbols[i].Children) > 0 {
			n += 12 + symbolBytes(symbols[i].Children)
		}
	}
	return n
}

// The details an outline shows, shared by every symbol of their kind.
var (
	detailLoop, detailNode, detailJunction = "loop", "node", "junction"
	detailPart, detailCase, detailNominal  = "part", "case", "nominal case"
	detailParam                            = "param"
)

// outliner makes the symbols of one file, whose mapper it looks up once.
type outliner struct {
	m   *lang.Mapper
	enc lang.Encoding
}

func (o outliner) rangeOf(sp lang.Span, clip bool) protocol.Range {
	if o.m == nil {
		return protocol.Range{}
	}
	return toRange(o.m, sp, o.enc, clip)
}

// declRange is a declaration's whole extent: head through closing brace.
func (o outliner) declRange(d lang.Decl) protocol.Range {
	end := d.Span.End
	if d.BlockClose >= 0 {
		end = d.BlockClose + 1
	}
	return o.rangeOf(lang.Span{Start: d.Span.Start, End: end}, false)
}

func (o outliner) symbol(d lang.Decl, kind protocol.SymbolKind, detail *string) protocol.DocumentSymbol {
	return protocol.DocumentSymbol{
		Name:           d.Name,
		Detail:         detail,
		Kind:           kind,
		Range:          o.declRange(d),
		SelectionRange: o.rangeOf(d.NameSpan, true),
	}
}

// outline lists a file's loops (with their nodes and components), parts,
// cases and parameters.
func (sn *snapshot) outline(m *lang.Model, path string) protocol.DocumentSymbolSlice {
	o := outliner{m: sn.mapperFor(path), enc: sn.enc}
	n := inFile(m.Loops, path) + inFile(m.Parts, path) + inFile(m.Cases, path) + inFile(m.Params, path)
	out := make(protocol.DocumentSymbolSlice, 0, n)
	for _, l := range m.Loops {
		if l.File != path {
			continue
		}
		ls := o.symbol(l.Decl, protocol.SymbolKindNamespace, &detailLoop)
		k := inFile(l.Nodes, path) + inFile(l.Components, path)
		if k > 0 {
			ls.Children = make([]protocol.DocumentSymbol, 0, k)
		}
		for _, n := range l.Nodes {
			if n.File == path {
				kind := &detailNode
				if n.Junction {
					kind = &detailJunction
				}
				ls.Children = append(ls.Children, o.symbol(n.Decl, protocol.SymbolKindConstant, kind))
			}
		}
		for _, c := range l.Components {
			if c.File == path {
				kind := c.Kind.String()
				ls.Children = append(ls.Children, o.symbol(c.Decl, protocol.SymbolKindObject, &kind))
			}
		}
		out = append(out, ls)
	}
	for _, p := range m.Parts {
		if p.File == path {
			out = append(out, o.symbol(p.Decl, protocol.SymbolKindStruct, &detailPart))
		}
	}
	for _, c := range m.Cases {
		if c.File == path {
			d := &detailCase
			if c == m.Nominal {
				d = &detailNominal
			}
			out = append(out, o.symbol(c.Decl, protocol.SymbolKindEvent, d))
		}
	}
	for _, p := range m.Params {
		if p.File == path {
			out = append(out, o.symbol(p.Decl, protocol.SymbolKindConstant, &detailParam))
		}
	}
	return out
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
		k := d.File + "|" + d.Name + "|" + container
		if seen[k] {
			return
		}
		seen[k] = true
		si := protocol.SymbolInformation{Location: protocol.Location{URI: uriOf(d.File), Range: sn.rangeIn(d.File, d.NameSpan, true)}}
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
