package lsp

import (
	"context"
	"fmt"
	"hash/fnv"
	"sort"
	"sync"
	"time"

	"go.lsp.dev/protocol"

	"circa/lang"
)

// worker analyses the latest snapshot: lang findings are published at once,
// the checks and estimates after the debounce. A newer snapshot cancels the
// older one's wait and work, and its results are dropped.
func (s *Server) worker(ctx context.Context) {
	for {
		select {
		case <-ctx.Done():
			return
		case <-s.work:
		}
		s.mu.Lock()
		snap := s.pending
		s.pending = nil
		s.mu.Unlock()
		if snap == nil || snap.ctx.Err() != nil {
			continue
		}
		s.analyse(snap)
	}
}

func (s *Server) analyse(snap *snapshot) {
	roots := snap.sortedRoots()
	var first time.Duration
	if s.publishSyntax(snap, roots) {
		first = time.Since(snap.at)
	}
	for _, a := range roots {
		if snap.ctx.Err() != nil {
			return
		}
		a.Model()
	}
	s.publish(snap, false)
	if first == 0 {
		first = time.Since(snap.at)
	}
	wait := s.debounceFor(roots)
	if wait > 0 {
		t := time.NewTimer(wait)
		select {
		case <-snap.ctx.Done():
			t.Stop()
			return
		case <-t.C:
		}
	}
	for _, a := range roots {
		if snap.ctx.Err() != nil {
			return
		}
		s.runChecks(snap, a)
	}
	if snap.ctx.Err() != nil {
		return
	}
	s.publish(snap, true)
	if s.opts.LogTiming && snap.ctx.Err() == nil {
		s.logTiming(snap, roots, first, wait)
	}
	complete := true
	for _, a := range roots {
		if _, est, ok := a.checks(); ok {
			if d := est.detached(); d != nil {
				s.mu.Lock()
				s.lastEst[a.root] = d
				s.mu.Unlock()
			}
		}
		complete = complete && a.fullyChecked()
	}
	if s.onAnalysed != nil {
		s.onAnalysed(snap.id)
	}
	if complete {
		// The guidance follows the complete diagnostics, never runs
		// beside them.
		s.queueGuidance(snap)
		if s.onComplete != nil {
			s.onComplete(snap.id)
		}
		return
	}
	s.mu.Lock()
	s.slowPending = snap
	s.mu.Unlock()
	select {
	case s.slowWork <- struct{}{}:
	default:
	}
}

// slowWorker runs the complete checks (the margins with the tilt-limit
// search, where "auto" judged it too slow to run with every check) for the
// latest analysed snapshot, one run at a time, so a burst of edits costs at
// most one such run beyond the last edit. A run cannot be interrupted; its
// results are published only if no edit came since.
func (s *Server) slowWorker(ctx context.Context) {
	for {
		select {
		case <-ctx.Done():
			return
		case <-s.slowWork:
		}
		s.mu.Lock()
		snap := s.slowPending
		s.slowPending = nil
		s.mu.Unlock()
		if snap == nil || snap.ctx.Err() != nil {
			continue
		}
		done := true
		for _, a := range snap.sortedRoots() {
			if snap.ctx.Err() != nil {
				done = false
				break
			}
			s.runFullChecks(snap, a)
		}
		if !done || snap.ctx.Err() != nil {
			continue
		}
		s.publish(snap, true)
		if s.opts.LogTiming && snap.ctx.Err() == nil {
			s.logTiming(snap, snap.sortedRoots(), -1, -1)
		}
		for _, a := range snap.sortedRoots() {
			if _, est, ok := a.checks(); ok {
				if d := est.detached(); d != nil {
					s.mu.Lock()
					s.lastEst[a.root] = d
					s.mu.Unlock()
				}
			}
		}
		s.queueGuidance(snap)
		if s.onComplete != nil {
			s.onComplete(snap.id)
		}
	}
}

// Adaptive debounce: a file whose checks took less than instantChecks is
// checked at once after every edit, so its complete diagnostics follow the
// edit as closely as its syntax errors; a slower one waits as long as its
// last checks took (at most maxDebounce) for typing to pause, so a burst of
// keystrokes costs one check rather than one per keystroke.
const (
	instantChecks = 25 * time.Millisecond
	maxDebounce   = 400 * time.Millisecond
)

// adaptiveDebounce is the wait before checks expected to take cost.
func adaptiveDebounce(cost time.Duration) time.Duration {
	if cost < instantChecks {
		return 0
	}
	return min(cost, maxDebounce)
}

// debounceFor is the wait before checking roots: the fixed debounce when
// one is set, else adaptiveDebounce of what their last checks took (roots
// already checked, or never checked, cost nothing).
func (s *Server) debounceFor(roots []*analysis) time.Duration {
	if d := s.opts.Debounce; d != 0 {
		return max(d, 0)
	}
	var cost time.Duration
	s.mu.Lock()
	for _, a := range roots {
		if _, _, ok := a.checks(); !ok {
			cost += s.checkCost[a.root]
		}
	}
	s.mu.Unlock()
	return adaptiveDebounce(cost)
}

// logTiming logs, for each open root of a published snapshot, how long
// after the change its first and its complete diagnostics went out
// (first < 0: the complete checks that followed in the background).
func (s *Server) logTiming(snap *snapshot, roots []*analysis, first, wait time.Duration) {
	done := time.Since(snap.at)
	for _, a := range roots {
		v := rootVersion(snap, a)
		if v < 0 {
			continue
		}
		state := "partial (tilt margin follows)"
		if a.fullyChecked() {
			state = "complete"
		}
		if first < 0 {
			s.logf("timing: %s version %d: %s %.2f ms after the change", a.root, v, state, ms(done))
			continue
		}
		s.logf("timing: %s version %d: first %.2f ms, %s %.2f ms after the change (debounce %.0f ms)", a.root, v, ms(first), state, ms(done), ms(wait))
	}
}

func ms(d time.Duration) float64 { return float64(d) / float64(time.Millisecond) }

// runFullChecks runs the checks with the tilt-limit search for an analysis
// whose checks ran without it, and replaces their findings and estimate.
func (s *Server) runFullChecks(snap *snapshot, a *analysis) {
	if a.fullyChecked() {
		return
	}
	if s.onEstimate != nil {
		s.onEstimate(a.root, true)
	}
	diags, est := s.checkModel(snap.ctx, a.Model(), marginsFull)
	if snap.ctx.Err() != nil || est == nil {
		return
	}
	est.version = rootVersion(snap, a)
	a.checkMu.Lock()
	a.checkDiag, a.est, a.checked, a.full = diags, est, true, true
	a.checkMu.Unlock()
}

// runChecks runs the checker and the estimate once for one analysis, unless
// a finished result is already there (an analysis kept from an older
// snapshot). The margin mode follows the settings and the cost of the
// root's previous estimate. A cancelled run leaves nothing behind.
func (s *Server) runChecks(snap *snapshot, a *analysis) {
	if _, _, ok := a.checks(); ok {
		return
	}
	s.mu.Lock()
	prev := s.lastEst[a.root]
	s.mu.Unlock()
	mode := wantMarginChecks(a.settings, prev)
	if mode == marginsNoTilt && !a.skipLogged.Swap(true) {
		s.logf("%s: tilt margin after the other checks (the last estimate took %v; setting marginChecks %q)", a.root, prev.tookOrZero(), a.settings.MarginChecks)
	}
	if s.onEstimate != nil {
		s.onEstimate(a.root, mode == marginsFull)
	}
	t0 := time.Now()
	diags, est := s.checkModel(snap.ctx, a.Model(), mode)
	if snap.ctx.Err() != nil || est == nil {
		return
	}
	s.mu.Lock()
	s.checkCost[a.root] = time.Since(t0)
	s.mu.Unlock()
	est.version = rootVersion(snap, a)
	a.checkMu.Lock()
	a.checkDiag, a.est, a.checked = diags, est, true
	a.full = mode != marginsNoTilt
	a.checkMu.Unlock()
}

// rootVersion is the version of the analysis's root document in the
// snapshot, −1 when it is not open.
func rootVersion(snap *snapshot, a *analysis) int32 {
	if d, ok := snap.docs[a.root]; ok {
		return d.version
	}
	return -1
}

// fileDiags gathers each file's findings from the snapshot's analyses. A
// file included by an open file, or a table it reads, takes its findings
// from the includer (where its names resolve); an open file that nothing
// includes takes its own.
func fileDiags(snap *snapshot, full bool) map[string][]lang.Diagnostic {
	roots := snap.sortedRoots()
	owner := map[string]*analysis{}
	for _, a := range roots {
		m := a.Model()
		for path := range m.Files {
			if path == a.root {
				continue
			}
			if _, ok := owner[path]; !ok {
				owner[path] = a
			}
		}
		for _, path := range m.Tables() {
			if _, ok := owner[path]; !ok {
				owner[path] = a
			}
		}
	}
	for _, a := range roots {
		if _, ok := owner[a.root]; !ok {
			owner[a.root] = a
		}
	}
	out := map[string][]lang.Diagnostic{}
	for path := range owner {
		out[path] = nil
	}
	seen := map[string]bool{}
	add := func(a *analysis, d lang.Diagnostic) {
		file := d.Loc.File
		if file == "" {
			file = a.root
		}
		if owner[file] != a {
			return
		}
		// One finding per rule and place: a part's field is resolved once
		// per component that uses it, and would be reported as often.
		k := fmt.Sprintf("%s|%s|%d|%d", file, d.Rule, d.Loc.Span.Start, d.Loc.Span.End)
		if seen[k] {
			return
		}
		seen[k] = true
		out[file] = append(out[file], d)
	}
	for _, a := range roots {
		for _, d := range a.Model().Diags {
			add(a, d)
		}
		if full {
			cd, _, _ := a.checks()
			for _, d := range cd {
				add(a, d)
			}
		}
	}
	for path, ds := range out {
		sort.SliceStable(ds, func(i, j int) bool { return ds[i].Loc.Span.Start < ds[j].Loc.Span.Start })
		if len(ds) > MaxPublished {
			rest := ds[MaxPublished-1]
			ds = append(ds[:MaxPublished-1], lang.Diagnostic{Severity: lang.Info,
				Loc:    lang.Location{File: rest.Loc.File, Span: rest.Loc.Span},
				Format: "%d more findings in this file from here on are not shown; `circa check` lists them all",
				Args:   []any{len(ds) - (MaxPublished - 1)}})
			out[path] = ds
		}
	}
	return out
}

// MaxPublished bounds the findings published for one file: a file that
// includes itself ten thousand times has as many findings, which an
// editor would be sent again, some megabytes, after each edit. The last
// one published says how many more there are.
const MaxPublished = 1000

// publish sends every file's findings whose content or version changed since
// the last publication. Files no longer reported get an empty list.
func (s *Server) publish(snap *snapshot, full bool) {
	s.publishFiles(snap, fileDiags(snap, full), full, true)
}

// publishFiles sends the findings of perFile's files whose content or
// version changed since the last publication; with others, files
// published before and missing from perFile get an empty list.
func (s *Server) publishFiles(snap *snapshot, perFile map[string][]lang.Diagnostic, full, others bool) {
	type item struct {
		path   string
		params *protocol.PublishDiagnosticsParams
		state  pubState
	}
	var items []item
	s.pubMu.Lock()
	defer s.pubMu.Unlock()
	if snap.ctx.Err() != nil {
		return
	}
	for path := range s.published {
		if _, ok := perFile[path]; !ok && others {
			perFile[path] = nil
		}
	}
	paths := make([]string, 0, len(perFile))
	for p := range perFile {
		paths = append(paths, p)
	}
	sort.Strings(paths)
	for _, path := range paths {
		diags := perFile[path]
		conv := s.toProtocolDiags(snap, path, diags)
		version := int32(-1)
		if d, ok := snap.docs[path]; ok {
			version = d.version
		}
		st := pubState{version: version, key: diagKey(conv)}
		prev, had := s.published[path]
		if had && prev == st {
			continue
		}
		if !had && len(conv) == 0 && version < 0 {
			continue
		}
		p := &protocol.PublishDiagnosticsParams{URI: uriOf(path), Diagnostics: conv}
		if version >= 0 {
			p.Version = protocol.NewOptional(version)
		}
		items = append(items, item{path, p, st})
	}
	for _, it := range items {
		// The outbox sends in order without holding this lock, so a client
		// that is busy writing to us cannot stall the next edit.
		s.out.push(it.params)
		if len(it.params.Diagnostics) == 0 && it.state.version < 0 {
			delete(s.published, it.path)
		} else {
			s.published[it.path] = it.state
		}
		if s.onPublish != nil {
			s.onPublish(it.path, it.state.version, full, len(it.params.Diagnostics))
		}
	}
}

func diagKey(ds []protocol.Diagnostic) string {
	h := fnv.New64a()
	for _, d := range ds {
		b, _ := protocol.Marshal(d)
		h.Write(b)
	}
	return fmt.Sprintf("%d:%x", len(ds), h.Sum64())
}

// toProtocolDiags converts findings in one file; their spans are read with
// that file's mapper (the open buffer's, else the loaded file's).
func (s *Server) toProtocolDiags(snap *snapshot, path string, ds []lang.Diagnostic) []protocol.Diagnostic {
	if d, ok := snap.docs[path]; ok && d.outOfSync {
		return []protocol.Diagnostic{outOfSyncDiag(d)}
	}
	out := make([]protocol.Diagnostic, 0, len(ds))
	for _, d := range ds {
		out = append(out, snap.toProtocolDiag(path, d))
	}
	return out
}

func (sn *snapshot) toProtocolDiag(path string, d lang.Diagnostic) protocol.Diagnostic {
	pd := protocol.Diagnostic{
		Range:    sn.rangeIn(path, d.Loc.Span, true),
		Severity: protocol.DiagnosticSeverity(d.Severity + 1),
		Source:   protocol.NewOptional("circa"),
		Message:  protocol.String(d.Message()),
	}
	if d.Rule != "" {
		pd.Code = protocol.String(d.Rule)
	}
	for _, r := range d.Related {
		rp := r.Loc.File
		if rp == "" {
			rp = path
		}
		pd.RelatedInformation = append(pd.RelatedInformation, protocol.DiagnosticRelatedInformation{
			Location: protocol.Location{URI: uriOf(rp), Range: sn.rangeIn(rp, r.Loc.Span, true)},
			Message:  r.Message,
		})
	}
	return pd
}

// outbox sends notifications in order from its own goroutine.
type outbox struct {
	mu    sync.Mutex
	cond  *sync.Cond
	queue []any
	busy  bool // a batch is being sent
	done  bool
}

// idle reports whether everything queued has been sent.
func (o *outbox) idle() bool {
	o.mu.Lock()
	defer o.mu.Unlock()
	return len(o.queue) == 0 && !o.busy
}

func (o *outbox) push(params any) {
	o.mu.Lock()
	o.queue = append(o.queue, params)
	o.mu.Unlock()
	o.cond.Signal()
}

func (o *outbox) close() {
	o.mu.Lock()
	o.done = true
	o.mu.Unlock()
	o.cond.Broadcast()
}

// run sends queued diagnostics until closed.
func (o *outbox) run(s *Server) {
	for {
		o.mu.Lock()
		for len(o.queue) == 0 && !o.done {
			o.cond.Wait()
		}
		if o.done {
			o.mu.Unlock()
			return
		}
		batch := o.queue
		o.queue = nil
		o.busy = true
		o.mu.Unlock()
		for _, p := range batch {
			if err := s.conn.Notify(context.Background(), "textDocument/publishDiagnostics", p); err != nil {
				s.logf("publishing diagnostics: %v", err)
			}
		}
		o.mu.Lock()
		o.busy = false
		o.mu.Unlock()
	}
}
