package lsp

import (
	"context"

	"go.lsp.dev/protocol"

	"circa/lang"
)

// foldingRangeRequest folds blocks and runs of whole-line comments.
func foldingRangeRequest(ctx context.Context, s *Server, sn *snapshot, params []byte) (any, error) {
	p, err := decode[protocol.FoldingRangeParams](params)
	if err != nil {
		return nil, err
	}
	path := pathOf(p.TextDocument.URI)
	d, ok := sn.docs[path]
	if !ok {
		return []protocol.FoldingRange{}, nil
	}
	a := sn.analysisFor(path)
	f := a.file(path)
	if f == nil {
		return []protocol.FoldingRange{}, nil
	}
	return foldingRanges(f, d.mapper), nil
}

func foldingRanges(f *lang.File, m *lang.Mapper) []protocol.FoldingRange {
	out := []protocol.FoldingRange{}
	walkStmts(f.Stmts, 0, func(st *lang.Stmt, _ int) {
		b := st.Block
		if b == nil || b.OneLine {
			return
		}
		start := m.OffsetLine(st.Span().Start)
		end := m.OffsetLine(len(f.Src))
		if b.Close >= 0 {
			end = m.OffsetLine(b.Close)
		}
		// Keep the closing brace visible.
		if end-1 > start {
			out = append(out, protocol.FoldingRange{StartLine: uint32(start), EndLine: uint32(end - 1)})
		}
	})
	// Comment runs: consecutive lines whose only content is a comment.
	runStart, runEnd := -1, -1
	flush := func() {
		if runStart >= 0 && runEnd > runStart {
			out = append(out, protocol.FoldingRange{StartLine: uint32(runStart), EndLine: uint32(runEnd), Kind: protocol.FoldingRangeKindComment})
		}
		runStart, runEnd = -1, -1
	}
	for _, c := range f.Comments {
		line := m.OffsetLine(c.Span.Start)
		if !wholeLine(m, line, c.Span.Start) {
			flush()
			continue
		}
		if runEnd >= 0 && line == runEnd+1 {
			runEnd = line
			continue
		}
		flush()
		runStart, runEnd = line, line
	}
	flush()
	return out
}

// wholeLine reports whether only blanks precede off on its line.
func wholeLine(m *lang.Mapper, line, off int) bool {
	for _, c := range m.Text()[m.LineStart(line):off] {
		if c != ' ' && c != '\t' {
			return false
		}
	}
	return true
}
