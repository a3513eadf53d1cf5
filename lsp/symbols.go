package lsp

import (
	"context"
	"strings"

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
	return sn.outline(a.Model(), path), nil
}

// declRange is a declaration's whole extent: head through closing brace.
func (sn *snapshot) declRange(d lang.Decl) protocol.Range {
	end := d.Span.End
	if d.BlockClose >= 0 {
		end = d.BlockClose + 1
	}
	return sn.rangeIn(d.File, lang.Span{Start: d.Span.Start, End: end}, false)
}

func (sn *snapshot) symbol(d lang.Decl, kind protocol.SymbolKind, detail string) protocol.DocumentSymbol {
	ds := protocol.DocumentSymbol{
		Name:           d.Name,
		Kind:           kind,
		Range:          sn.declRange(d),
		SelectionRange: sn.rangeIn(d.File, d.NameSpan, true),
	}
	if detail != "" {
		ds.Detail = &detail
	}
	return ds
}

// outline lists a file's loops (with their nodes and components), parts,
// cases and parameters.
func (sn *snapshot) outline(m *lang.Model, path string) protocol.DocumentSymbolSlice {
	out := protocol.DocumentSymbolSlice{}
	for _, l := range m.Loops {
		if l.File != path {
			continue
		}
		ls := sn.symbol(l.Decl, protocol.SymbolKindNamespace, "loop")
		for _, n := range l.Nodes {
			if n.File == path {
				kind := "node"
				if n.Junction {
					kind = "junction"
				}
				ls.Children = append(ls.Children, sn.symbol(n.Decl, protocol.SymbolKindConstant, kind))
			}
		}
		for _, c := range l.Components {
			if c.File == path {
				ls.Children = append(ls.Children, sn.symbol(c.Decl, protocol.SymbolKindObject, c.Kind.String()))
			}
		}
		out = append(out, ls)
	}
	for _, p := range m.Parts {
		if p.File == path {
			out = append(out, sn.symbol(p.Decl, protocol.SymbolKindStruct, "part"))
		}
	}
	for _, c := range m.Cases {
		if c.File == path {
			d := "case"
			if c == m.Nominal {
				d = "nominal case"
			}
			out = append(out, sn.symbol(c.Decl, protocol.SymbolKindEvent, d))
		}
	}
	for _, p := range m.Params {
		if p.File == path {
			out = append(out, sn.symbol(p.Decl, protocol.SymbolKindConstant, "param"))
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
