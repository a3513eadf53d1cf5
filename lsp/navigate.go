package lsp

import (
	"context"
	"path/filepath"
	"sort"

	"go.lsp.dev/jsonrpc2"
	"go.lsp.dev/protocol"
	"go.lsp.dev/uri"

	"circa/lang"
)

// sameSymbol reports whether two references name one declaration: same kind
// and name, and for nodes the same loop (by name, since each analysis has
// its own model).
func sameSymbol(a, b lang.Ref) bool {
	if a.Kind != b.Kind || a.Name != b.Name {
		return false
	}
	if a.Kind == lang.RefNode {
		return loopName(a.Loop) == loopName(b.Loop)
	}
	return true
}

func loopName(l *lang.Loop) string {
	if l == nil {
		return ""
	}
	return l.Name
}

// occurrences lists every reference to the symbol across the snapshot's
// analyses (an included file is seen from each file that includes it),
// without duplicates, in file and offset order.
func (sn *snapshot) occurrences(sym lang.Ref) []lang.Ref {
	type key struct {
		file string
		sp   lang.Span
	}
	seen := map[key]bool{}
	var out []lang.Ref
	for _, a := range sn.sortedRoots() {
		m := a.Model()
		if _, ok := m.Files[sym.File()]; !ok {
			continue
		}
		for r := range m.Refs() {
			if !sameSymbol(r, sym) {
				continue
			}
			k := key{r.File(), r.Span()}
			if seen[k] {
				continue
			}
			seen[k] = true
			out = append(out, r)
		}
	}
	sort.Slice(out, func(i, j int) bool {
		if out[i].File() != out[j].File() {
			return out[i].File() < out[j].File()
		}
		return out[i].Span().Start < out[j].Span().Start
	})
	return out
}

func (sn *snapshot) location(r lang.Ref) protocol.Location {
	return protocol.Location{URI: uriOf(r.File()), Range: sn.rangeIn(r.File(), r.Span(), true)}
}

func definitionRequest(ctx context.Context, s *Server, sn *snapshot, params []byte) (any, error) {
	p, err := decode[protocol.DefinitionParams](params)
	if err != nil {
		return nil, err
	}
	c, ok := sn.cursorAt(p.TextDocumentPositionParams)
	if !ok {
		return nil, nil
	}
	if inc, ok := includeAt(c); ok {
		return &protocol.Location{URI: uriOf(inc)}, nil
	}
	r, ok := c.refAt()
	if !ok {
		return nil, nil
	}
	var locs protocol.LocationSlice
	for _, o := range sn.occurrences(r) {
		if o.IsDecl {
			locs = append(locs, sn.location(o))
		}
	}
	if len(locs) == 0 {
		return nil, nil
	}
	return locs, nil
}

// includeAt returns the file named by an include string under the cursor.
func includeAt(c *cursor) (string, bool) {
	for _, st := range c.f.Stmts {
		if st.Keyword() != "include" || len(st.Args) == 0 || st.Args[0].Expr == nil {
			continue
		}
		var target string
		exprVisit(st.Args[0].Expr, func(_ *lang.Factor, at *lang.Atom) {
			if at.Str != nil && contains(at.Str.Span(), c.off) {
				target = at.Str.Value()
			}
		})
		if target == "" {
			continue
		}
		if !filepath.IsAbs(target) {
			target = filepath.Join(filepath.Dir(c.path), filepath.FromSlash(target))
		}
		return target, true
	}
	return "", false
}

func referencesRequest(ctx context.Context, s *Server, sn *snapshot, params []byte) (any, error) {
	p, err := decode[protocol.ReferenceParams](params)
	if err != nil {
		return nil, err
	}
	c, ok := sn.cursorAt(p.TextDocumentPositionParams)
	if !ok {
		return []protocol.Location{}, nil
	}
	r, ok := c.refAt()
	if !ok {
		return []protocol.Location{}, nil
	}
	locs := []protocol.Location{}
	for _, o := range sn.occurrences(r) {
		if o.IsDecl && !p.Context.IncludeDeclaration {
			continue
		}
		locs = append(locs, sn.location(o))
	}
	return locs, nil
}

// renamable reports whether a reference can be renamed: fluids name
// built-in data and cannot.
func renamable(r lang.Ref) bool { return r.Kind != lang.RefFluid }

func prepareRenameRequest(ctx context.Context, s *Server, sn *snapshot, params []byte) (any, error) {
	p, err := decode[protocol.PrepareRenameParams](params)
	if err != nil {
		return nil, err
	}
	c, ok := sn.cursorAt(p.TextDocumentPositionParams)
	if !ok {
		return nil, nil
	}
	r, ok := c.refAt()
	if !ok || !renamable(r) {
		return nil, nil
	}
	return &protocol.PrepareRenamePlaceholder{Range: sn.rangeIn(r.File(), r.Span(), true), Placeholder: r.Name}, nil
}

func renameRequest(ctx context.Context, s *Server, sn *snapshot, params []byte) (any, error) {
	p, err := decode[protocol.RenameParams](params)
	if err != nil {
		return nil, err
	}
	if !lang.IsIdent(p.NewName) {
		return nil, jsonrpc2.Errorf(jsonrpc2.InvalidParams, "%q is not a name: a letter (of any script) or _, then letters, digits or _; from, to and at are words of the language", p.NewName)
	}
	c, ok := sn.cursorAt(p.TextDocumentPositionParams)
	if !ok {
		return nil, nil
	}
	r, ok := c.refAt()
	if !ok {
		return nil, nil
	}
	if !renamable(r) {
		return nil, jsonrpc2.NewError(jsonrpc2.InvalidParams, "a fluid name cannot be renamed")
	}
	changes := map[uri.URI][]protocol.TextEdit{}
	for _, o := range sn.occurrences(r) {
		u := uriOf(o.File())
		changes[u] = append(changes[u], protocol.TextEdit{Range: sn.rangeIn(o.File(), o.Span(), true), NewText: p.NewName})
	}
	return &protocol.WorkspaceEdit{Changes: changes}, nil
}
