package lsp

import (
	"bytes"
	"context"
	"sort"

	"go.lsp.dev/jsonrpc2"
	"go.lsp.dev/protocol"
	"go.lsp.dev/uri"

	"circa/lang"
)

func formattingRequest(ctx context.Context, s *Server, sn *snapshot, params []byte) (any, error) {
	p, err := decode[protocol.DocumentFormattingParams](params)
	if err != nil {
		return nil, err
	}
	return formatEdits(sn, p.TextDocument.URI, nil)
}

func rangeFormattingRequest(ctx context.Context, s *Server, sn *snapshot, params []byte) (any, error) {
	p, err := decode[protocol.DocumentRangeFormattingParams](params)
	if err != nil {
		return nil, err
	}
	return formatEdits(sn, p.TextDocument.URI, &p.Range)
}

// formatEdits returns the edits that give a document its canonical layout;
// with a range, only those touching the range's lines.
func formatEdits(sn *snapshot, u uri.URI, rg *protocol.Range) (any, error) {
	d, ok := sn.docs[pathOf(u)]
	if !ok || isTable(d.path) {
		return nil, nil
	}
	hunks, err := formatHunks(d)
	if err != nil {
		return nil, err
	}
	first, last := -1, -1
	if rg != nil {
		sp := d.mapper.RangeOffsets(toPos(rg.Start), toPos(rg.End), sn.enc)
		starts := diffLineStarts(d.text)
		first, last = diffLine(starts, sp.Start), diffLine(starts, sp.End)
	}
	return hunkEdits(d, sn.enc, hunks, first, last), nil
}

// diffLineStarts returns the byte offset of each line of lang.SplitLines,
// the lines the formatting diff counts, which end at "\n" only (the mapper
// also ends a line at a lone "\r").
func diffLineStarts(text []byte) []int {
	starts := []int{0}
	for i, c := range text {
		if c == '\n' {
			starts = append(starts, i+1)
		}
	}
	return starts
}

// diffLine is the diff line holding a byte offset.
func diffLine(starts []int, off int) int {
	return sort.Search(len(starts), func(i int) bool { return starts[i] > off }) - 1
}

// formatHunks formats a document and returns the changed line ranges.
func formatHunks(d *document) ([]hunk, error) {
	f := lang.Parse(d.path, d.text)
	out, err := lang.Format(f)
	if err != nil {
		// A file the parser cannot read is left alone; say why.
		return nil, jsonrpc2.Errorf(jsonrpc2.Code(-32803), "not formatted: %v", err)
	}
	if bytes.Equal(out, d.text) {
		return nil, nil
	}
	return lineDiff(lang.SplitLines(d.text), lang.SplitLines(out)), nil
}

// hunkEdits turns hunks into text edits; with first >= 0 only hunks that
// touch lines first..last are kept.
func hunkEdits(d *document, enc lang.Encoding, hunks []hunk, first, last int) []protocol.TextEdit {
	edits := []protocol.TextEdit{}
	starts := diffLineStarts(d.text)
	for _, h := range hunks {
		if first >= 0 {
			hl := h.oldEnd - 1
			if hl < h.oldStart {
				hl = h.oldStart
			}
			if hl < first || h.oldStart > last {
				continue
			}
		}
		start, end := len(d.text), len(d.text)
		if h.oldStart < len(starts) {
			start = starts[h.oldStart]
		}
		if h.oldEnd < len(starts) {
			end = starts[h.oldEnd]
		}
		a, b := d.mapper.SpanRange(lang.Span{Start: start, End: end}, enc)
		edits = append(edits, protocol.TextEdit{Range: protocol.Range{Start: fromPos(a), End: fromPos(b)}, NewText: h.text})
	}
	return edits
}

// hunk replaces old lines [oldStart, oldEnd) with text.
type hunk struct {
	oldStart, oldEnd int
	text             string
}

// lineDiff compares two line lists and returns the replaced ranges, in
// order: a change of as many lines as it replaces is one hunk a line, so
// that a range formatting keeps only the lines it touches.
func lineDiff(a, b []string) []hunk {
	ops := lang.LineEdits(a, b)
	var out []hunk
	x, y := 0, 0 // the lines of a and of b at ops[k]
	for k := 0; k < len(ops); {
		if ops[k].Kind == ' ' {
			x, y, k = x+1, y+1, k+1
			continue
		}
		// A change: a[x:x+del] give way to b[y:y+add].
		del, add := 0, 0
		for ; k < len(ops) && ops[k].Kind != ' '; k++ {
			if ops[k].Kind == '-' {
				del++
			} else {
				add++
			}
		}
		if del == add {
			for i := 0; i < del; i++ {
				out = append(out, hunk{x + i, x + i + 1, b[y+i]})
			}
		} else {
			out = append(out, hunk{x, x + del, join(b[y : y+add])})
		}
		x, y = x+del, y+add
	}
	return out
}

func join(lines []string) string {
	var b bytes.Buffer
	for _, l := range lines {
		b.WriteString(l)
	}
	return b.String()
}
