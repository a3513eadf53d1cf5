package lsp

import (
	"context"

	"go.lsp.dev/protocol"
	"go.lsp.dev/uri"

	"circa/check/suggest"
	"circa/lang"
)

// codeActionRequest offers each finding's suggested fixes in the range as
// quick fixes, with the finding attached.
func codeActionRequest(ctx context.Context, s *Server, sn *snapshot, params []byte) (any, error) {
	p, err := decode[protocol.CodeActionParams](params)
	if err != nil {
		return nil, err
	}
	path := pathOf(p.TextDocument.URI)
	out := []protocol.CommandOrCodeAction{}
	m := sn.mapperFor(path)
	if m == nil {
		return out, nil
	}
	want := m.RangeOffsets(toPos(p.Range.Start), toPos(p.Range.End), sn.enc)
	diags := fileDiags(sn, true)[path]
	kind := protocol.CodeActionKindQuickFix
	for _, d := range diags {
		if len(d.Fixes) == 0 || d.Loc.Span.End < want.Start || d.Loc.Span.Start > want.End {
			continue
		}
		pd := sn.toProtocolDiag(path, d)
		for i, f := range d.Fixes {
			edit := sn.workspaceEdit(path, f.Edits)
			preferred := i == 0 && len(d.Fixes) == 1
			ca := &protocol.CodeAction{Title: f.Title, Kind: &kind, Diagnostics: []protocol.Diagnostic{pd}, Edit: edit}
			if preferred {
				ca.IsPreferred = &preferred
			}
			out = append(out, ca)
		}
	}
	out = append(out, s.guidedActions(ctx, sn, path, want, diags)...)
	return out, nil
}

// guidedActions offers the design guidance's fixes of the margin findings
// in the range, once the guidance is computed; a file whose guidance is
// left for on demand computes it when a margin finding is in the range.
func (s *Server) guidedActions(ctx context.Context, sn *snapshot, path string, want lang.Span, diags []lang.Diagnostic) []protocol.CommandOrCodeAction {
	a := sn.analysisFor(path)
	g := s.guides.get(a)
	if g == nil {
		return nil
	}
	if g.onDemand {
		for _, d := range diags {
			if suggest.IsMargin(d) && d.Loc.Span.End >= want.Start && d.Loc.Span.Start <= want.End {
				g = s.guidanceOnDemand(ctx, sn, a, nil)
				break
			}
		}
	}
	var out []protocol.CommandOrCodeAction
	kind := protocol.CodeActionKindQuickFix
	for _, d := range diags {
		fixes := g.fixes[fixKey{d.Rule, d.Loc}]
		if len(fixes) == 0 || d.Loc.Span.End < want.Start || d.Loc.Span.Start > want.End {
			continue
		}
		pd := sn.toProtocolDiag(path, d)
		for _, f := range fixes {
			out = append(out, &protocol.CodeAction{Title: f.Title, Kind: &kind, Diagnostics: []protocol.Diagnostic{pd}, Edit: sn.workspaceEdit(path, f.Edits)})
		}
	}
	return out
}

func (sn *snapshot) workspaceEdit(defaultPath string, edits []lang.Edit) *protocol.WorkspaceEdit {
	changes := map[uri.URI][]protocol.TextEdit{}
	for _, e := range edits {
		path := e.Loc.File
		if path == "" {
			path = defaultPath
		}
		u := uriOf(path)
		changes[u] = append(changes[u], protocol.TextEdit{Range: sn.rangeIn(path, e.Loc.Span, false), NewText: e.NewText})
	}
	return &protocol.WorkspaceEdit{Changes: changes}
}
