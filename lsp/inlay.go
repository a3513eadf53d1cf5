package lsp

import (
	"context"

	"go.lsp.dev/protocol"

	"circa/lang"
	"circa/units"
)

// inlayHintRequest shows, when the setting allows, the estimated mass flow
// and exit quality after each component's line and the rise closure after
// each loop.
func inlayHintRequest(ctx context.Context, s *Server, sn *snapshot, params []byte) (any, error) {
	p, err := decode[protocol.InlayHintParams](params)
	if err != nil {
		return nil, err
	}
	out := []protocol.InlayHint{}
	if !sn.settings.InlayHints {
		return out, nil
	}
	path := pathOf(p.TextDocument.URI)
	a := sn.analysisFor(path)
	mp := sn.mapperFor(path)
	if a == nil || mp == nil {
		return out, nil
	}
	m := a.Model()
	want := mp.RangeOffsets(toPos(p.Range.Start), toPos(p.Range.End), sn.enc)
	yes := true
	hint := func(off int, label string) {
		if off < want.Start || off > want.End {
			return
		}
		out = append(out, protocol.InlayHint{
			Position: fromPos(mp.OffsetPosition(off, sn.enc)), Label: protocol.String(label), PaddingLeft: &yes,
		})
	}
	est := s.estimatesFor(sn, a)
	cur := &cursor{snap: sn, path: path, a: a, m: m}
	for _, l := range m.Loops {
		if l.File() != path {
			continue
		}
		for _, c := range l.Components {
			if c.File() != path {
				continue
			}
			if label := componentHint(cur, est, c); label != "" {
				hint(mp.LineEnd(mp.OffsetLine(c.Span().Start)), label)
			}
			for _, h := range fieldHints(cur, est, c) {
				if h.file == path {
					hint(mp.LineEnd(mp.OffsetLine(h.off)), h.label)
				}
			}
		}
		if l.BlockClose() >= 0 {
			if rise, ok := riseClosure(l); ok {
				hint(l.BlockClose()+1, "rise closure "+units.Format(rise, units.MustParse("mm")))
			}
		}
	}
	if sn.settings.RangeHints {
		g := s.guides.get(a)
		for _, p := range m.Params {
			if label := rangeHint(g.param(p.Name)); label != "" && p.File() == path {
				hint(mp.LineEnd(mp.OffsetLine(p.Span().Start)), label)
			}
		}
	}
	for _, cs := range m.Cases {
		if cs.File() != path {
			continue
		}
		for _, h := range caseHints(est, cs) {
			hint(mp.LineEnd(mp.OffsetLine(h.off)), h.label)
		}
	}
	return out, nil
}

// riseClosure sums the signed rises around a loop without junctions; a
// closed loop sums to zero.
func riseClosure(l *lang.Loop) (float64, bool) {
	for _, n := range l.Nodes {
		if n.Junction {
			return 0, false
		}
	}
	sum, n := 0.0, 0
	for _, c := range l.Components {
		if c.Kind == lang.Reservoir {
			continue
		}
		switch {
		case c.Rise.Set:
			sum += c.Rise.SI
		case c.Run.Set:
			sum += c.Run.Z
		case c.From != nil && c.To != nil && c.From.At.Set && c.To.At.Set:
			sum += c.To.At.Z - c.From.At.Z
		default:
			return 0, false
		}
		n++
	}
	if n == 0 {
		return 0, false
	}
	return sum, true
}
