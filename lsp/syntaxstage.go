package lsp

import (
	"sort"
	"time"

	"circa/lang"
)

// A root whose model took syntaxStageCost or longer to resolve last time
// (or, before its first model, whose text is syntaxStageSize or larger)
// gets its syntax errors published as soon as its text is parsed, before
// the model. Below that the model follows so soon that a separate
// publication would only cost the editor a redraw.
const (
	syntaxStageCost = 10 * time.Millisecond
	syntaxStageSize = 256 << 10
)

func (s *Server) noteModelCost(root string, d time.Duration) {
	s.mu.Lock()
	s.modelCost[root] = d
	s.mu.Unlock()
}

// wantsSyntaxStage reports whether a's root gets a syntax stage in snap:
// it is open, its model is not computed yet and is expected to be slow,
// and no other open file's model includes it (its findings would then be
// that file's to publish).
func (s *Server) wantsSyntaxStage(snap *snapshot, roots []*analysis, a *analysis) bool {
	d, ok := snap.docs[a.root]
	if !ok || d.outOfSync || a.ready.Load() {
		return false
	}
	s.mu.Lock()
	cost, known := s.modelCost[a.root]
	s.mu.Unlock()
	if !s.syntaxFirst && (known && cost < syntaxStageCost || !known && len(d.text) < syntaxStageSize) {
		return false
	}
	for _, b := range roots {
		if b == a {
			continue
		}
		if !b.ready.Load() {
			return false
		}
		if _, ok := b.model.Files[a.root]; ok {
			return false
		}
	}
	return true
}

// publishSyntax publishes, for each root that wants a syntax stage, the
// syntax errors of its text together with the findings of the analysis it
// replaces outside the edited lines, moved with the text (as the editor
// itself shows them until new ones arrive), so that a slow model makes
// the editor wait neither for syntax errors nor with a blank list.
// It reports whether it published.
func (s *Server) publishSyntax(snap *snapshot, roots []*analysis) bool {
	perFile := map[string][]lang.Diagnostic{}
	for _, a := range roots {
		if snap.ctx.Err() != nil {
			return false
		}
		if !s.wantsSyntaxStage(snap, roots, a) {
			continue
		}
		d := snap.docs[a.root]
		errs, ok := d.syntaxErrors()
		if !ok {
			continue // parsing panicked; the model reports it
		}
		ds := append([]lang.Diagnostic(nil), errs...)
		ds = append(ds, movedFindings(a.carry, a.carryParse, a.root, a.carryText, d.text)...)
		sort.SliceStable(ds, func(i, j int) bool { return ds[i].Loc.Span.Start < ds[j].Loc.Span.Start })
		perFile[a.root] = ds
	}
	if len(perFile) == 0 {
		return false
	}
	s.publishFiles(snap, perFile, false, false)
	return true
}

// movedFindings returns the findings of ds in root but the syntax errors
// of its parse (parse), found in the text from, as they sit in the text
// to: those before the lines the edit touched as they are, those after
// moved by the change of length, those on the touched lines (or pointing
// at them) left out.
func movedFindings(ds, parse []lang.Diagnostic, root string, from, to []byte) []lang.Diagnostic {
	if len(ds) == 0 {
		return nil
	}
	type key struct {
		span   lang.Span
		format string
	}
	fromParse := make(map[key]bool, len(parse))
	for _, d := range parse {
		fromParse[key{d.Loc.Span, d.Format}] = true
	}
	start, oldEnd, newEnd := lang.Changed(from, to)
	lo, hi := start, oldEnd
	for lo > 0 && from[lo-1] != '\n' {
		lo--
	}
	for hi < len(from) && from[hi] != '\n' {
		hi++
	}
	delta := newEnd - oldEnd
	move := func(sp lang.Span) (lang.Span, bool) {
		switch {
		case sp.End < lo || (sp.End == lo && sp.Start < lo):
			return sp, true
		case sp.Start > hi:
			return lang.Span{Start: sp.Start + delta, End: sp.End + delta}, true
		}
		return sp, false
	}
	var out []lang.Diagnostic
next:
	for _, d := range ds {
		if file := d.Loc.File; (file != "" && file != root) || fromParse[key{d.Loc.Span, d.Format}] {
			continue
		}
		sp, ok := move(d.Loc.Span)
		if !ok {
			continue
		}
		d.Loc.Span = sp
		if len(d.Related) > 0 {
			rel := append([]lang.Related(nil), d.Related...)
			for i, r := range rel {
				if r.Loc.File == "" || r.Loc.File == root {
					if rel[i].Loc.Span, ok = move(r.Loc.Span); !ok {
						continue next
					}
				}
			}
			d.Related = rel
		}
		out = append(out, d)
	}
	return out
}
