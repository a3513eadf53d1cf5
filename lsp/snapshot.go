package lsp

import (
	"context"
	"os"
	"path/filepath"
	"runtime/debug"
	"sort"
	"strings"
	"sync"
	"sync/atomic"
	"time"

	"go.lsp.dev/uri"

	"circa/lang"
	"circa/textfile"
)

// document is one version of an open editor buffer. It is never changed:
// an edit makes a new document.
type document struct {
	uri     uri.URI
	path    string
	version int32
	text    []byte
	mapper  *lang.Mapper
	// outOfSync is set when an edit could not be applied: text is then the
	// last text known to match the client's, version its version, and
	// clientVersion the version the client has reached since.
	outOfSync     bool
	clientVersion int32

	// base is the version this one was edited from, whose tree the parse
	// reuses; it is dropped once this one is parsed.
	base      atomic.Pointer[document]
	parseOnce sync.Once
	tree      *lang.File
	parsed    atomic.Bool // tree is set
}

func newDocument(u uri.URI, path string, version int32, text []byte) *document {
	return &document{uri: u, path: path, version: version, text: text, mapper: lang.NewMapper(text)}
}

// editedFrom records that d's text is an edit of old's: d is parsed from
// the nearest version already parsed.
func (d *document) editedFrom(old *document) {
	if old.parsed.Load() {
		d.base.Store(old)
	} else if b := old.base.Load(); b != nil {
		d.base.Store(b)
	}
}

// syntaxErrors returns the syntax errors of the document's text: from its
// tree once parsed, else from its base's tree and the edited lines alone
// (no tree is built, which for an edit near the top of a large file is
// most of the work), else from parsing it now. ok is false when parsing
// panicked.
func (d *document) syntaxErrors() (errs []lang.Diagnostic, ok bool) {
	if d.parsed.Load() {
		return d.tree.Errors, true
	}
	if b := d.base.Load(); b != nil && b.parsed.Load() {
		if errs, ok := reparseErrors(d.path, b.tree, d.text); ok {
			return errs, true
		}
	}
	if f := d.File(); f != nil {
		return f.Errors, true
	}
	return nil, false
}

// reparseErrors is lang.ReparseErrors, a panic in it reported as not done.
func reparseErrors(path string, old *lang.File, text []byte) (errs []lang.Diagnostic, ok bool) {
	defer func() {
		if recover() != nil {
			errs, ok = nil, false
		}
	}()
	return lang.ReparseErrors(path, old, text)
}

// File returns the document's syntax tree, parsed on first use from its
// base's where that one is parsed (only the edited lines are parsed
// again), else from scratch. It is nil when parsing panicked.
func (d *document) File() *lang.File {
	d.parseOnce.Do(func() {
		defer func() {
			if r := recover(); r != nil {
				d.tree = nil
			}
			d.base.Store(nil)
			d.parsed.Store(d.tree != nil)
		}()
		var old *lang.File
		if b := d.base.Load(); b != nil && b.parsed.Load() {
			old = b.tree
		}
		d.tree = lang.Reparse(d.path, old, d.text, d.mapper)
	})
	return d.tree
}

// snapshot is the state of the workspace after one change: the open
// documents, the settings and one analysis per open document. Requests read
// a snapshot without locking; a newer change cancels ctx.
type snapshot struct {
	id       uint64
	at       time.Time // when the change that made it arrived
	ctx      context.Context
	cancel   context.CancelFunc
	docs     map[string]*document
	enc      lang.Encoding
	settings Settings
	roots    map[string]*analysis
	disk     *diskCache
	srv      *Server
}

// analysis is what one root file and its includes resolve to. The model is
// computed once, by whoever needs it first; the checks run in the worker.
type analysis struct {
	root     string
	fs       overlay
	settings Settings
	srv      *Server // logs a stage that fails; nil in tests that build analyses alone

	once  sync.Once
	model *lang.Model
	ready atomic.Bool // the model is computed

	// carry is what the analysis this one replaces found in the root
	// file, and carryText the text it was found in: the syntax stage shows
	// those findings, moved with the edit, outside the edited lines.
	carry      []lang.Diagnostic
	carryParse []lang.Diagnostic // the syntax errors among them, which the new parse replaces
	carryText  []byte

	symbols symbolCache // the last document symbols encoded

	checkMu    sync.Mutex
	checked    bool              // the checks and the estimate are done
	checkDiag  []lang.Diagnostic // their findings
	est        *estimates
	full       bool // they include the tilt-limit search (or the margins are off)
	skipLogged atomic.Bool
}

// Model returns the resolved model, computing it on first use.
func (a *analysis) Model() *lang.Model {
	a.once.Do(func() {
		defer func() {
			if r := recover(); r != nil {
				a.model = failedModel(a.root, a.srv.recovered(a.root, "reading the file", r))
				a.ready.Store(true)
			}
		}()
		if a.srv != nil && a.srv.beforeLoad != nil {
			a.srv.beforeLoad(a.root)
		}
		t0 := time.Now()
		var m *lang.Model
		if d, ok := a.fs.docs[a.root]; ok {
			if f := d.File(); f != nil {
				m = lang.LoadParsed(f, a.fs)
			} else {
				m = lang.LoadSource(a.root, d.text, a.fs)
			}
		} else {
			m = lang.Load(a.root, a.fs)
		}
		a.settings.apply(m)
		a.model = m
		a.ready.Store(true)
		if a.srv != nil {
			a.srv.noteModelCost(a.root, time.Since(t0))
		}
	})
	return a.model
}

// checks returns the checker's findings and the estimates, if the worker has
// finished them for this analysis.
func (a *analysis) checks() ([]lang.Diagnostic, *estimates, bool) {
	a.checkMu.Lock()
	defer a.checkMu.Unlock()
	return a.checkDiag, a.est, a.checked
}

func (a *analysis) fullyChecked() bool {
	a.checkMu.Lock()
	defer a.checkMu.Unlock()
	return a.full
}

// dependsOn reports whether the analysis read path. An analysis whose model
// is not computed yet counts as depending on everything.
func (a *analysis) dependsOn(path string) bool {
	if !a.ready.Load() {
		return true
	}
	_, ok := a.model.Files[path]
	return ok || path == a.root || a.model.ReadsTable(path)
}

// overlay reads open documents from the snapshot and the rest from disk.
type overlay struct {
	docs map[string]*document
	disk *diskCache
}

func (o overlay) ReadFile(path string) ([]byte, error) {
	if d, ok := o.docs[path]; ok {
		return d.text, nil
	}
	return o.disk.read(path)
}

// diskCache holds files read from disk until a watched-file event, a close
// of their buffer, or a change of their modification time or size says they
// changed. The last lets a client that does not watch files still see an
// included file edited by another program.
type diskCache struct {
	mu    sync.Mutex
	files map[string]diskFile
}

type diskFile struct {
	data []byte
	err  error
	stat fileStat // when it was read
}

// fileStat is what tells a file changed without reading it.
type fileStat struct {
	exists bool
	mod    time.Time
	size   int64
}

func statOf(path string) fileStat {
	st, err := os.Stat(path)
	if err != nil {
		return fileStat{}
	}
	return fileStat{exists: true, mod: st.ModTime(), size: st.Size()}
}

func (c *diskCache) read(path string) ([]byte, error) {
	c.mu.Lock()
	f, ok := c.files[path]
	c.mu.Unlock()
	if ok {
		return f.data, f.err
	}
	data, st, err := readLimited(path)
	c.mu.Lock()
	if c.files == nil {
		c.files = map[string]diskFile{}
	}
	c.files[path] = diskFile{data, err, st}
	c.mu.Unlock()
	return data, err
}

func (c *diskCache) forget(path string) {
	c.mu.Lock()
	delete(c.files, path)
	c.mu.Unlock()
}

// stale stats every cached file that is not open (one stat each), forgets
// those whose modification time, size or existence changed since they were
// read, and returns their paths in order.
func (c *diskCache) stale(open map[string]*document) []string {
	c.mu.Lock()
	seen := make(map[string]fileStat, len(c.files))
	for path, f := range c.files {
		if _, ok := open[path]; !ok {
			seen[path] = f.stat
		}
	}
	c.mu.Unlock()
	var changed []string
	for path, was := range seen {
		if now := statOf(path); now.exists != was.exists || now.size != was.size || !now.mod.Equal(was.mod) {
			changed = append(changed, path)
		}
	}
	if len(changed) == 0 {
		return nil
	}
	sort.Strings(changed)
	c.mu.Lock()
	for _, path := range changed {
		// Leave an entry read again meanwhile alone.
		if f, ok := c.files[path]; ok && f.stat == seen[path] {
			delete(c.files, path)
		}
	}
	c.mu.Unlock()
	return changed
}

func readLimited(path string) ([]byte, fileStat, error) {
	st, err := os.Stat(path)
	if err != nil {
		return nil, fileStat{}, err
	}
	fs := fileStat{exists: true, mod: st.ModTime(), size: st.Size()}
	data, err := textfile.Read(path)
	// An editor hides the mark; positions count from after it.
	data, _ = textfile.CutBOM(data)
	return data, fs, err
}

// pathOf turns a document URI into the path the loader uses.
func pathOf(u uri.URI) string {
	if u.Scheme() == "file" {
		return filepath.Clean(u.FsPath())
	}
	return string(u)
}

func uriOf(path string) uri.URI {
	if filepath.IsAbs(path) {
		return uri.File(path)
	}
	return uri.URI(path)
}

// change makes the next snapshot: docs replaced, the changed paths named so
// analyses that did not read them are kept. The caller holds s.mu.
func (s *Server) changeLocked(docs map[string]*document, changed []string, settingsChanged bool) *snapshot {
	old := s.snap
	// Included files edited by another program, which a client without
	// file watching would not report.
	changed = append(changed, s.disk.stale(docs)...)
	ctx, cancel := context.WithCancel(context.Background())
	s.nextID++
	n := &snapshot{
		id: s.nextID, at: time.Now(), ctx: ctx, cancel: cancel, docs: docs, enc: s.enc,
		settings: s.settings, roots: map[string]*analysis{}, disk: &s.disk, srv: s,
	}
	if s.opts.MemoryLimit > 0 {
		var size int64
		for _, d := range docs {
			size += int64(len(d.text))
		}
		debug.SetMemoryLimit(memoryLimitFor(s.opts.MemoryLimit, size))
	}
	fs := overlay{docs: docs, disk: &s.disk}
	for path := range docs {
		if isTable(path) {
			// A table is data that loop files read, not a loop file: its
			// findings come from the analyses that read it.
			continue
		}
		if a, ok := old.roots[path]; ok && !settingsChanged && !touches(a, changed) {
			n.roots[path] = a
			continue
		}
		na := &analysis{root: path, fs: fs, settings: s.settings, srv: s}
		if a, ok := old.roots[path]; ok && !settingsChanged {
			na.carry, na.carryParse, na.carryText = a.carried(old.docs[path])
		}
		n.roots[path] = na
	}
	// Publishing takes pubMu; switching under it means a cancelled snapshot
	// can never publish after this point.
	s.pubMu.Lock()
	if old.cancel != nil {
		old.cancel()
	}
	s.snap = n
	s.pubMu.Unlock()
	s.pending = n
	// Nothing waiting may keep a replaced snapshot (its models and trees)
	// alive: the workers would only drop it.
	if s.slowPending != nil && s.slowPending.ctx.Err() != nil {
		s.slowPending = nil
	}
	s.guides.keepOnly(n)
	select {
	case s.work <- struct{}{}:
	default:
	}
	return n
}

// carried returns the findings a later analysis of the same root may show
// before its own are ready, and the text they are about (doc's): this
// analysis's model's findings once it is resolved, else what it carried.
func (a *analysis) carried(doc *document) (diags, parse []lang.Diagnostic, text []byte) {
	if doc == nil || doc.outOfSync {
		return nil, nil, nil
	}
	if a.ready.Load() {
		if f := a.model.Files[a.root]; f != nil {
			parse = f.Errors
		}
		return a.model.Diags, parse, doc.text
	}
	return a.carry, a.carryParse, a.carryText
}

func touches(a *analysis, changed []string) bool {
	for _, p := range changed {
		if a.dependsOn(p) {
			return true
		}
	}
	return false
}

// sortedRoots lists a snapshot's roots in path order.
func (sn *snapshot) sortedRoots() []*analysis {
	out := make([]*analysis, 0, len(sn.roots))
	for _, a := range sn.roots {
		out = append(out, a)
	}
	sort.Slice(out, func(i, j int) bool { return out[i].root < out[j].root })
	return out
}

// analysisFor returns the analysis whose model holds path: its own when the
// file is open, else one of the open files that include it or read it as a
// table.
func (sn *snapshot) analysisFor(path string) *analysis {
	if a, ok := sn.roots[path]; ok {
		return a
	}
	for _, a := range sn.sortedRoots() {
		if m := a.Model(); m.Files[path] != nil || m.ReadsTable(path) {
			return a
		}
	}
	return nil
}

// isTable reports whether path names a table (a profile's or a fluid's
// CSV file) rather than a loop file.
func isTable(path string) bool {
	return strings.EqualFold(filepath.Ext(path), ".csv")
}

// file returns the parsed file and its mapper for path in the analysis.
func (a *analysis) file(path string) *lang.File {
	if a == nil {
		return nil
	}
	return a.Model().Files[path]
}
