package lsp

import (
	"context"
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"sync"
	"testing"
	"time"

	"circa/check/flow"
	"circa/check/guide"
	"circa/check/output"
	"circa/lang"
	"circa/lang/loopgen"
)

// guidedClient is a test client that can wait for the design guidance.
type guidedClient struct {
	*testClient
	guided map[uint64]bool // under testClient.mu
}

func newGuidedClient(t *testing.T, opts Options) *guidedClient {
	if opts.guideBudget == 0 {
		// The guidance's content is under test, not its budget, which
		// a race build's slow estimates would exceed.
		opts.guideBudget = time.Hour
	}
	g := &guidedClient{testClient: newTestClient(t, opts), guided: map[uint64]bool{}}
	// Guidance runs many estimates; under the race detector on a loaded
	// two-core machine one file's can take longer than the usual 20 s.
	// The patience only guards against a hang.
	g.patience = 3 * time.Minute
	g.srv.guides.mu.Lock()
	g.srv.guides.onGuided = func(id uint64) {
		g.testClient.mu.Lock()
		g.guided[id] = true
		g.testClient.mu.Unlock()
	}
	g.srv.guides.mu.Unlock()
	return g
}

// waitGuided settles the current snapshot and waits for its guidance.
func (g *guidedClient) waitGuided() {
	g.settle()
	g.srv.mu.Lock()
	id := g.srv.snap.id
	g.srv.mu.Unlock()
	deadline := time.Now().Add(g.timeout())
	for {
		g.testClient.mu.Lock()
		done := g.guided[id]
		g.testClient.mu.Unlock()
		if done {
			return
		}
		if time.Now().After(deadline) {
			g.t.Fatalf("snapshot %d never got its guidance", id)
		}
		time.Sleep(5 * time.Millisecond)
	}
}

type lspPos struct {
	Line      int `json:"line"`
	Character int `json:"character"`
}

type lspRange struct {
	Start lspPos `json:"start"`
	End   lspPos `json:"end"`
}

type lspDiag struct {
	Range    lspRange `json:"range"`
	Severity int      `json:"severity"`
	Code     string   `json:"code"`
	Message  string   `json:"message"`
}

func (g *guidedClient) diagnostics(uri string) []lspDiag {
	g.t.Helper()
	pd, ok := g.published(uri)
	if !ok {
		g.t.Fatalf("nothing published for %s", uri)
	}
	var out []lspDiag
	for _, raw := range pd.Diagnostics {
		var d lspDiag
		if err := json.Unmarshal(raw, &d); err != nil {
			g.t.Fatal(err)
		}
		out = append(out, d)
	}
	return out
}

func openFile(t *testing.T, c *guidedClient, rel string) (uri, text string) {
	t.Helper()
	path, err := filepath.Abs(rel)
	if err != nil {
		t.Fatal(err)
	}
	src, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	uri = "file://" + path
	c.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": uri, "languageId": "loop", "version": 1, "text": string(src)}})
	return uri, string(src)
}

type lspEdit struct {
	Range   lspRange `json:"range"`
	NewText string   `json:"newText"`
}

type lspAction struct {
	Title       string    `json:"title"`
	Kind        string    `json:"kind"`
	Diagnostics []lspDiag `json:"diagnostics"`
	Edit        struct {
		Changes map[string][]lspEdit `json:"changes"`
	} `json:"edit"`
}

// applyEdits writes edits, in UTF-16 positions (the protocol's default),
// into text.
func applyEdits(text string, edits []lspEdit) string {
	mp := lang.NewMapper([]byte(text))
	type span struct {
		start, end int
		text       string
	}
	var spans []span
	for _, e := range edits {
		a := mp.PositionOffset(lang.Position{Line: e.Range.Start.Line, Col: e.Range.Start.Character}, lang.UTF16)
		b := mp.PositionOffset(lang.Position{Line: e.Range.End.Line, Col: e.Range.End.Character}, lang.UTF16)
		spans = append(spans, span{a, b, e.NewText})
	}
	sort.Slice(spans, func(i, j int) bool { return spans[i].start > spans[j].start })
	for _, s := range spans {
		text = text[:s.start] + s.text + text[s.end:]
	}
	return text
}

func isMarginWarning(d lspDiag) bool {
	return strings.HasPrefix(d.Code, "margin-") && d.Severity <= 2
}

// The examples that warn get, once the guidance is computed, a quick fix
// on their margin warnings that, applied in the editor, makes the warning
// go away when the file is checked again.
//
// tilt.loop, a copy of testdata/flow/tilt-cart.loop, is pitched inside
// its tilt margin; its tilt-margin warning gets a fix checked with the tilt
// search.
func TestGuidedQuickFixClearsWarning(t *testing.T) {
	tilt := filepath.Join(t.TempDir(), "tilt.loop")
	src, err := os.ReadFile("../testdata/flow/tilt-cart.loop")
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(tilt, src, 0o644); err != nil {
		t.Fatal(err)
	}
	for _, path := range []string{"../testdata/examples/forestry-inverter.loop", "../testdata/examples/ferry-cabinet.loop", tilt} {
		t.Run(strings.TrimSuffix(filepath.Base(path), ".loop"), func(t *testing.T) {
			c := newGuidedClient(t, Options{Debounce: -1})
			c.initialize(nil)
			uri, text := openFile(t, c, path)
			c.waitGuided()
			var warned []lspDiag
			for _, d := range c.diagnostics(uri) {
				if isMarginWarning(d) {
					warned = append(warned, d)
				}
			}
			if len(warned) == 0 {
				t.Fatal("the example has no margin warning")
			}
			end := strings.Count(text, "\n") + 1
			var actions []lspAction
			raw := c.mustCall("textDocument/codeAction", map[string]any{"textDocument": map[string]any{"uri": uri},
				"range":   map[string]any{"start": map[string]int{"line": 0, "character": 0}, "end": map[string]int{"line": end, "character": 0}},
				"context": map[string]any{"diagnostics": []any{}}})
			if err := json.Unmarshal(raw, &actions); err != nil {
				t.Fatal(err)
			}
			fixed, fixedTilt := 0, false
			for _, w := range warned {
				var fix *lspAction
				for i, a := range actions {
					if strings.HasPrefix(a.Title, "Set ") && len(a.Diagnostics) == 1 && a.Diagnostics[0].Code == w.Code && a.Diagnostics[0].Range == w.Range {
						fix = &actions[i]
						break
					}
				}
				if fix == nil {
					continue
				}
				if len(fix.Edit.Changes) != 1 || len(fix.Edit.Changes[uri]) == 0 || fix.Kind != "quickfix" {
					t.Fatalf("fix %q edits %+v", fix.Title, fix.Edit.Changes)
				}
				fixed++
				fixedTilt = fixedTilt || w.Code == "margin-tilt"
				t.Logf("%s: %s", w.Code, fix.Title)
				// Apply it, check again, and put the file back.
				c.notify("textDocument/didChange", map[string]any{"textDocument": map[string]any{"uri": uri, "version": 2 * fixed},
					"contentChanges": []any{map[string]any{"text": applyEdits(text, fix.Edit.Changes[uri])}}})
				c.settle()
				for _, d := range c.diagnostics(uri) {
					if d.Code == w.Code && d.Range == w.Range && d.Severity <= 2 {
						t.Errorf("fix %q leaves %s", fix.Title, d.Message)
					}
					if d.Severity == 1 {
						t.Errorf("fix %q adds an error: %s", fix.Title, d.Message)
					}
				}
				c.notify("textDocument/didChange", map[string]any{"textDocument": map[string]any{"uri": uri, "version": 2*fixed + 1},
					"contentChanges": []any{map[string]any{"text": text}}})
				c.settle()
			}
			if fixed == 0 {
				t.Errorf("no margin warning got a fix; actions: %+v", actions)
			}
			if path == tilt && !fixedTilt {
				t.Errorf("the tilt-margin warning got no fix; warnings %+v, actions: %+v", warned, actions)
			}
		})
	}
}

// Hover on a parameter shows its feasible range as circa estimate prints
// it and its biggest levers; with rangeHints on, an inlay hint after the
// parameter's line gives the range in short.
func TestGuidedHoverAndHint(t *testing.T) {
	c := newGuidedClient(t, Options{Debounce: -1})
	c.initialize(map[string]any{"processId": nil, "rootUri": nil,
		"capabilities":          map[string]any{"workspace": map[string]any{"inlayHint": map[string]any{"refreshSupport": true}}},
		"initializationOptions": map[string]any{"rangeHints": true}})
	uri, text := openFile(t, c, "../testdata/examples/rack-door.loop")
	c.waitGuided()
	// The client is asked for its hints again once the ranges are there.
	for deadline := time.Now().Add(c.timeout()); len(c.serverCalls("workspace/inlayHint/refresh")) == 0; {
		if time.Now().After(deadline) {
			t.Fatal("no workspace/inlayHint/refresh after the guidance")
		}
		time.Sleep(5 * time.Millisecond)
	}
	m := lang.Load(strings.TrimPrefix(uri, "file://"), nil)
	g, err := guide.Compute(context.Background(), m, guide.Options{Flow: flow.Options{NoTilt: true}})
	if err != nil {
		t.Fatal(err)
	}
	var lift *guide.Param
	for i := range g.Params {
		if g.Params[i].Param == "lift" {
			lift = &g.Params[i]
		}
	}
	if lift == nil || !lift.Influences || lift.Range == nil || len(lift.Sensitivities) == 0 {
		t.Fatalf("guidance of lift: %+v", lift)
	}
	line := strings.Count(text[:strings.Index(text, "param lift")], "\n")
	var hover struct {
		Contents struct {
			Value string `json:"value"`
		} `json:"contents"`
	}
	if err := json.Unmarshal(c.mustCall("textDocument/hover", map[string]any{"textDocument": map[string]any{"uri": uri},
		"position": map[string]int{"line": line, "character": 7}}), &hover); err != nil {
		t.Fatal(err)
	}
	h := strings.Join(strings.Fields(hover.Contents.Value), " ")
	if !strings.Contains(h, "feasible range: "+output.RangeText(lift.Range, lift.Unit)) || !strings.Contains(h, "biggest levers") ||
		!strings.Contains(h, lift.Sensitivities[0].Where.Describe()) {
		t.Errorf("hover on lift:\n%s\nwant the range %q and the lever %q", h, output.RangeText(lift.Range, lift.Unit), lift.Sensitivities[0].Where.Describe())
	}
	var hints []struct {
		Position lspPos `json:"position"`
		Label    string `json:"label"`
	}
	end := strings.Count(text, "\n") + 1
	if err := json.Unmarshal(c.mustCall("textDocument/inlayHint", map[string]any{"textDocument": map[string]any{"uri": uri},
		"range": map[string]any{"start": map[string]int{"line": 0, "character": 0}, "end": map[string]int{"line": end, "character": 0}}}), &hints); err != nil {
		t.Fatal(err)
	}
	found := false
	for _, hn := range hints {
		if hn.Position.Line == line {
			found = true
			if hn.Label != rangeHint(lift) || !strings.HasPrefix(hn.Label, "keeps every margin") && !strings.HasPrefix(hn.Label, "no value") {
				t.Errorf("hint after lift %q, want %q", hn.Label, rangeHint(lift))
			}
		}
	}
	if !found {
		t.Errorf("no hint on line %d: %+v", line+1, hints)
	}
}

// The guidance follows the diagnostics: a snapshot's guidance is stored
// only once its diagnostics are published, and an edit made meanwhile
// cancels the older snapshot's guidance, whose analyses are dropped.
func TestGuidanceFollowsDiagnostics(t *testing.T) {
	c := newGuidedClient(t, Options{Debounce: -1})
	var mu sync.Mutex
	published := map[int32]bool{}
	var order []string
	c.srv.onPublish = func(path string, version int32, full bool, n int) {
		mu.Lock()
		if full {
			published[version] = true
		}
		mu.Unlock()
	}
	c.srv.guides.mu.Lock()
	c.srv.guides.onGuided = func(id uint64) {
		c.srv.mu.Lock()
		sn := c.srv.snap
		c.srv.mu.Unlock()
		mu.Lock()
		for _, d := range sn.docs {
			if !published[d.version] {
				order = append(order, fmt.Sprintf("guidance of snapshot %d before the diagnostics of version %d", id, d.version))
			}
		}
		mu.Unlock()
		c.mu.Lock()
		c.guided[id] = true
		c.mu.Unlock()
	}
	c.srv.guides.mu.Unlock()
	c.initialize(nil)
	uri, text := openFile(t, c, "../testdata/examples/forestry-inverter.loop")
	for v := 2; v <= 4; v++ {
		c.notify("textDocument/didChange", map[string]any{"textDocument": map[string]any{"uri": uri, "version": v},
			"contentChanges": []any{map[string]any{"text": text + strings.Repeat("#\n", v)}}})
	}
	c.waitGuided()
	mu.Lock()
	defer mu.Unlock()
	for _, o := range order {
		t.Error(o)
	}
	c.srv.guides.mu.Lock()
	defer c.srv.guides.mu.Unlock()
	c.srv.mu.Lock()
	defer c.srv.mu.Unlock()
	for a := range c.srv.guides.by {
		if c.srv.snap.roots[a.root] != a {
			t.Errorf("guidance kept for an analysis of an older snapshot (%s)", a.root)
		}
	}
	if len(c.srv.guides.by) != 1 {
		t.Errorf("%d analyses guided, want 1", len(c.srv.guides.by))
	}
}

// A file with errors gets no guidance, and the hover on a parameter says
// why.
func TestGuidanceNoneWithErrors(t *testing.T) {
	c := newGuidedClient(t, Options{Debounce: -1})
	c.initialize(nil)
	uri := "file:///tmp/guide-errors.loop"
	text := "param h = 1 m\nloop l {\n  fluid water\n  node a at (0, 0, h)\n  pipe p from a to nowhere { length 1 m }\n}\n"
	c.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": uri, "languageId": "loop", "version": 1, "text": text}})
	c.waitGuided()
	var hover struct {
		Contents struct {
			Value string `json:"value"`
		} `json:"contents"`
	}
	if err := json.Unmarshal(c.mustCall("textDocument/hover", map[string]any{"textDocument": map[string]any{"uri": uri},
		"position": map[string]int{"line": 0, "character": 6}}), &hover); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(hover.Contents.Value, "Design guidance**: none until the file's errors are fixed") {
		t.Errorf("hover on h:\n%s", hover.Contents.Value)
	}
}

// The guidance's cost guess grows with the parameters and loops it ranges,
// and with the time the model takes to resolve again for each value of a
// parameter.
func TestGuidanceCost(t *testing.T) {
	m := lang.LoadSource("/x.loop", []byte("param a = 1 m\nparam b = 2 m\nloop l {\n  fluid water\n}\n"), nil)
	if got := guidanceCost(m, 10*time.Millisecond, 0); got != 1200*time.Millisecond {
		t.Errorf("cost %v, want 40 estimates for each of 2 parameters and 1 charge, 1.2 s", got)
	}
	if got := guidanceCost(m, 10*time.Millisecond, 5*time.Millisecond); got != 1600*time.Millisecond {
		t.Errorf("cost %v, want 1.2 s of estimates and 80 models resolved in 5 ms each, 1.6 s", got)
	}
	if guidanceCost(m, time.Second, 0) <= guideBudget {
		t.Error("a file whose estimate takes a second is guided in the background")
	}
}

// A file of many parameters (a large generated one) starts no background
// guidance, whose few dozen estimates per parameter would hold the
// processor for minutes; a hover on a parameter computes its range alone,
// the one circa estimate gives it.
func TestGuidanceOnDemandInLargeFile(t *testing.T) {
	c := newGuidedClient(t, Options{Debounce: -1, guideBudget: guideBudget})
	c.initialize(nil)
	path, err := filepath.Abs("../testdata/examples/rack-door.loop")
	if err != nil {
		t.Fatal(err)
	}
	src, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var b strings.Builder
	b.Write(src)
	for i := 0; i < 20000; i++ {
		fmt.Fprintf(&b, "param spare%d = %d mm\n", i, i+1)
	}
	text := b.String()
	// Beside the example, whose include it reads.
	large := filepath.Join(filepath.Dir(path), "large.loop")
	uri := "file://" + large
	c.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": uri, "languageId": "loop", "version": 1, "text": text}})
	c.waitGuided()
	c.srv.mu.Lock()
	sn := c.srv.snap
	c.srv.mu.Unlock()
	g := c.srv.guides.get(sn.analysisFor(large))
	if g == nil || !g.onDemand || g.g != nil {
		t.Fatalf("guidance of a file of 20,000 parameters: %+v, want none in the background", g)
	}
	m := lang.LoadSource(large, []byte(text), nil)
	want, err := guide.Compute(context.Background(), m, guide.Options{Flow: flow.Options{NoTilt: true}, Params: []string{"lift"}})
	if err != nil {
		t.Fatal(err)
	}
	if len(want.Params) != 1 || want.Params[0].Range == nil {
		t.Fatalf("guidance of lift: %+v", want.Params)
	}
	line := strings.Count(text[:strings.Index(text, "param lift")], "\n")
	var hover struct {
		Contents struct {
			Value string `json:"value"`
		} `json:"contents"`
	}
	if err := json.Unmarshal(c.mustCall("textDocument/hover", map[string]any{"textDocument": map[string]any{"uri": uri},
		"position": map[string]int{"line": line, "character": 7}}), &hover); err != nil {
		t.Fatal(err)
	}
	h := strings.Join(strings.Fields(hover.Contents.Value), " ")
	if !strings.Contains(h, "feasible range: "+output.RangeText(want.Params[0].Range, want.Params[0].Unit)) {
		t.Errorf("hover on lift:\n%s\nwant the range %q", h, output.RangeText(want.Params[0].Range, want.Params[0].Unit))
	}
}

// A tilt-margin finding's fixes run the tilt search again, so they count
// as much guidance again against the background budget: a file that fits
// the budget without one is guided on demand with one.
func TestGuidanceCostTiltFix(t *testing.T) {
	s := newServer(Options{guideBudget: 1500 * time.Millisecond})
	m := lang.LoadSource("/x.loop", []byte("param a = 1 m\nparam b = 2 m\nloop l {\n  fluid water\n}\n"), nil)
	a := &analysis{root: "/x.loop", srv: s}
	a.model = m
	a.ready.Store(true)
	a.once.Do(func() {})
	a.checked, a.est = true, &estimates{took: 10 * time.Millisecond}
	if why := s.backgroundGuidance(a); why != "" {
		t.Fatalf("without a tilt finding: %q, want the guidance in the background (1.2 s of 1.5 s)", why)
	}
	a.checkDiag = []lang.Diagnostic{{Rule: flow.RuleTilt, Severity: lang.Warning}}
	if why := s.backgroundGuidance(a); !strings.Contains(why, "on demand") {
		t.Errorf("with a tilt finding: %q, want it on demand (2.4 s of 1.5 s)", why)
	}
}

// A file past guideSize (here a network of 2,500 components) is guided on
// demand whatever the budget: every value tried would resolve a model of
// its size again beside its own.
func TestGuidanceOnDemandInLargeNetwork(t *testing.T) {
	c := newGuidedClient(t, Options{Debounce: -1})
	c.initialize(nil)
	text := loopgen.Network(2500, 8)
	if len(text) <= guideSize {
		t.Fatalf("the network has %d bytes, not past %d", len(text), guideSize)
	}
	uri := "file:///tmp/network.loop"
	c.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": uri, "languageId": "loop", "version": 1, "text": string(text)}})
	c.waitGuided()
	c.srv.mu.Lock()
	sn := c.srv.snap
	c.srv.mu.Unlock()
	g := c.srv.guides.get(sn.analysisFor("/tmp/network.loop"))
	if g == nil || !g.onDemand || g.g != nil || !strings.Contains(g.note, "on demand") {
		t.Fatalf("guidance of a network of 2,500 components: %+v, want it on demand", g)
	}
}
