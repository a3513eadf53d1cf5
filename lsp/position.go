package lsp

import (
	"go.lsp.dev/protocol"

	"circa/check/output"
	"circa/lang"
)

// mapperFor returns the mapper of a file's text in the snapshot: the open
// buffer's, else the one the loader made when it read the file.
func (sn *snapshot) mapperFor(path string) *lang.Mapper {
	if d, ok := sn.docs[path]; ok {
		return d.mapper
	}
	if a := sn.analysisFor(path); a != nil {
		return a.Model().Mapper(path)
	}
	return nil
}

// rangeIn converts a span in path to a protocol range. With clip, a span
// that runs past its first line ends at that line's end, so editors do not
// underline the wrong text.
func (sn *snapshot) rangeIn(path string, sp lang.Span, clip bool) protocol.Range {
	m := sn.mapperFor(path)
	if m == nil {
		return protocol.Range{}
	}
	return toRange(m, sp, sn.enc, clip)
}

func toRange(m *lang.Mapper, sp lang.Span, enc lang.Encoding, clip bool) protocol.Range {
	a, b := output.Range(m, sp, enc, clip)
	return protocol.Range{Start: fromPos(a), End: fromPos(b)}
}

func fromPos(p lang.Position) protocol.Position {
	if p.Line < 0 {
		p.Line = 0
	}
	if p.Col < 0 {
		p.Col = 0
	}
	return protocol.Position{Line: uint32(p.Line), Character: uint32(p.Col)}
}

// offsetIn converts a protocol position in an open document to a byte
// offset (clamped to the text).
func (sn *snapshot) offsetIn(path string, p protocol.Position) (int, bool) {
	m := sn.mapperFor(path)
	if m == nil {
		return 0, false
	}
	return m.PositionOffset(toPos(p), sn.enc), true
}

func contains(sp lang.Span, off int) bool { return sp.Start <= off && off <= sp.End }
