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

// lineDiff compares two line lists with Myers' O(ND) algorithm and returns
// the replaced ranges. Past a bound on the edit distance it returns one hunk
// for the differing middle.
func lineDiff(a, b []string) []hunk {
	pre, suf := lang.CommonEnds(a, b)
	am, bm := a[pre:len(a)-suf], b[pre:len(b)-suf]
	if len(am) == 0 && len(bm) == 0 {
		return nil
	}
	whole := []hunk{{pre, pre + len(am), join(bm)}}
	const maxD = 2000
	n, m := len(am), len(bm)
	max := n + m
	if max > maxD {
		max = maxD
	}
	off := max + 1
	v := make([]int, 2*max+3)
	var trace [][]int
	found := false
	for d := 0; d <= max && !found; d++ {
		snap := append([]int(nil), v...)
		trace = append(trace, snap)
		for k := -d; k <= d; k += 2 {
			var x int
			if k == -d || (k != d && v[off+k-1] < v[off+k+1]) {
				x = v[off+k+1]
			} else {
				x = v[off+k-1] + 1
			}
			y := x - k
			for x < n && y < m && am[x] == bm[y] {
				x++
				y++
			}
			v[off+k] = x
			if x >= n && y >= m {
				found = true
				break
			}
		}
	}
	if !found {
		return whole
	}
	// Walk back through the trace to list the kept line pairs.
	type pair struct{ x, y int }
	var keep []pair
	x, y := n, m
	for d := len(trace) - 1; d > 0; d-- {
		vv := trace[d]
		k := x - y
		var pk int
		if k == -d || (k != d && vv[off+k-1] < vv[off+k+1]) {
			pk = k + 1
		} else {
			pk = k - 1
		}
		px := vv[off+pk]
		py := px - pk
		for x > px && y > py {
			x--
			y--
			keep = append(keep, pair{x, y})
		}
		x, y = px, py
	}
	for x > 0 && y > 0 {
		x--
		y--
		keep = append(keep, pair{x, y})
	}
	// keep is in reverse order; emit the gaps between kept pairs as hunks.
	var out []hunk
	ax, by := 0, 0
	flush := func(toX, toY int) {
		switch {
		case toX-ax == toY-by:
			// As many lines out as in: one hunk per line, so a range
			// formatting keeps only the lines it touches.
			for i := 0; i < toX-ax; i++ {
				out = append(out, hunk{pre + ax + i, pre + ax + i + 1, bm[by+i]})
			}
		case toX > ax || toY > by:
			out = append(out, hunk{pre + ax, pre + toX, join(bm[by:toY])})
		}
	}
	for i := len(keep) - 1; i >= 0; i-- {
		p := keep[i]
		flush(p.x, p.y)
		ax, by = p.x+1, p.y+1
	}
	flush(n, m)
	return out
}

func join(lines []string) string {
	var b bytes.Buffer
	for _, l := range lines {
		b.WriteString(l)
	}
	return b.String()
}
