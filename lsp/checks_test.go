package lsp

import (
	"encoding/json"
	"strings"
	"sync"
	"testing"
	"time"
)

// tiltLoop circulates but its case is pitched within the tilt margin of
// the angle where circulation stops, and its exit quality is over the
// limit: both margins need the estimate, the first its tilt-limit search.
const tiltLoop = `loop r {
  fluid R134a
  node a at (0, 0, 0) m
  node b at (0, 0, 0.3) m
  node c at (-1, 0, 0.5) m
  node d at (-1.2, 0, 0.4) m
  evaporator plate from a to b { length 0.3 m; bore 10 mm; wetted_area 0.01 m2 }
  pipe riser from b to c { length 1.2 m; bore 12 mm }
  condenser coil from c to d { length 0.3 m; bore 10 mm; conductance 150 W/K; sink 25 degC }
  pipe down from d to a { length 1.5 m; bore 10 mm }
}
limits { exit_quality 0.01; tilt_margin 30 deg }
case climb nominal { heat plate 500 W; pitch -10 deg }
`

func publishedCodes(t *testing.T, c *testClient, uri string) map[string]bool {
	t.Helper()
	p, ok := c.published(uri)
	if !ok {
		t.Fatalf("nothing published for %s", uri)
	}
	out := map[string]bool{}
	for _, raw := range p.Diagnostics {
		var d struct{ Code string }
		if err := json.Unmarshal(raw, &d); err != nil {
			t.Fatal(err)
		}
		out[d.Code] = true
	}
	return out
}

// The checker, hover and inlay hints share one estimate per version: the
// margins (the tilt margin included) come from the same run that hover
// shows, and neither hover nor the inlay hints run it again.
func TestEstimateOncePerVersion(t *testing.T) {
	c := newTestClient(t, Options{Debounce: -1})
	var mu sync.Mutex
	runs := 0
	c.srv.onEstimate = func(root string, tilt bool) {
		mu.Lock()
		defer mu.Unlock()
		runs++
		if !tilt {
			t.Errorf("estimate of %s without the tilt search on a quick file", root)
		}
	}
	count := func() int {
		mu.Lock()
		defer mu.Unlock()
		return runs
	}
	// "always": under load the first run may be slow enough for "auto" to
	// defer the tilt search of the next (TestSlowEstimateDefersTilt).
	c.initialize(map[string]any{"processId": nil, "rootUri": nil, "capabilities": map[string]any{},
		"initializationOptions": map[string]any{"marginChecks": "always"}})
	uri := "file:///tmp/tilt.loop"
	c.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": uri, "languageId": "loop", "version": 1, "text": tiltLoop}})
	c.settle()
	codes := publishedCodes(t, c, uri)
	for _, want := range []string{"margin-tilt", "margin-exit-quality", "tilt-limits"} {
		if !codes[want] {
			t.Errorf("no %s finding published; got %v", want, codes)
		}
	}
	if n := count(); n != 1 {
		t.Fatalf("%d estimates for one version, want 1", n)
	}
	line := strings.Count(tiltLoop[:strings.Index(tiltLoop, "evaporator plate")], "\n")
	hover := string(c.mustCall("textDocument/hover", map[string]any{"textDocument": map[string]any{"uri": uri}, "position": map[string]int{"line": line, "character": 13}}))
	if !strings.Contains(hover, "mass flow") {
		t.Errorf("hover on the evaporator shows no estimate: %s", hover)
	}
	c.mustCall("textDocument/inlayHint", map[string]any{"textDocument": map[string]any{"uri": uri},
		"range": map[string]any{"start": map[string]int{"line": 0, "character": 0}, "end": map[string]int{"line": 20, "character": 0}}})
	if n := count(); n != 1 {
		t.Errorf("%d estimates after hover and inlay hints, want 1", n)
	}
	c.notify("textDocument/didChange", map[string]any{"textDocument": map[string]any{"uri": uri, "version": 2},
		"contentChanges": []any{map[string]any{"text": tiltLoop + "# two\n"}}})
	c.settle()
	if n := count(); n != 2 {
		t.Errorf("%d estimates after a second version, want 2", n)
	}
}

// "auto" runs the tilt-limit search with the checks unless the previous
// estimate of the same file says it is slow.
func TestWantMarginChecks(t *testing.T) {
	auto := DefaultSettings()
	for _, tc := range []struct {
		name string
		prev *estimates
		want marginMode
	}{
		{"first check", nil, marginsFull},
		{"quick with the search", &estimates{tilt: true, took: 20 * time.Millisecond}, marginsFull},
		{"slow with the search", &estimates{tilt: true, took: 2 * time.Second}, marginsNoTilt},
		{"quick without the search", &estimates{took: 2 * time.Millisecond}, marginsFull},
		{"slow without the search", &estimates{took: 50 * time.Millisecond}, marginsNoTilt},
	} {
		if got := wantMarginChecks(auto, tc.prev); got != tc.want {
			t.Errorf("%s: mode %d, want %d", tc.name, got, tc.want)
		}
	}
	st := auto
	st.MarginChecks = "never"
	if got := wantMarginChecks(st, nil); got != marginsOff {
		t.Errorf("never: mode %d", got)
	}
	st.MarginChecks = "always"
	if got := wantMarginChecks(st, &estimates{tilt: true, took: time.Hour}); got != marginsFull {
		t.Errorf("always: mode %d", got)
	}
}

// When the previous estimate was slow, the checks run without the tilt
// search first and the complete checks, with it, follow in the background.
func TestSlowEstimateDefersTilt(t *testing.T) {
	c := newTestClient(t, Options{Debounce: -1})
	var mu sync.Mutex
	var tilts []bool
	c.srv.onEstimate = func(root string, tilt bool) {
		mu.Lock()
		defer mu.Unlock()
		tilts = append(tilts, tilt)
	}
	c.initialize(nil)
	uri := "file:///tmp/slow.loop"
	c.srv.mu.Lock()
	c.srv.lastEst["/tmp/slow.loop"] = &estimates{tilt: true, took: time.Hour}
	c.srv.mu.Unlock()
	c.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": uri, "languageId": "loop", "version": 1, "text": tiltLoop}})
	c.settle()
	if codes := publishedCodes(t, c, uri); !codes["margin-tilt"] || !codes["margin-exit-quality"] {
		t.Errorf("complete checks lack a margin: %v", codes)
	}
	mu.Lock()
	defer mu.Unlock()
	if len(tilts) != 2 || tilts[0] || !tilts[1] {
		t.Errorf("estimates run with tilt search %v, want [false true]", tilts)
	}
}

// While a new version waits for its checks, hover shows the last estimate
// and says which version it comes from.
func TestHoverMarksPreviousEstimate(t *testing.T) {
	c := newTestClient(t, Options{Debounce: time.Hour})
	c.initialize(nil)
	uri := "file:///tmp/prev.loop"
	c.srv.opts.Debounce = -1
	c.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": uri, "languageId": "loop", "version": 1, "text": tiltLoop}})
	c.settle()
	c.srv.mu.Lock()
	c.srv.opts.Debounce = time.Hour
	c.srv.mu.Unlock()
	c.notify("textDocument/didChange", map[string]any{"textDocument": map[string]any{"uri": uri, "version": 2},
		"contentChanges": []any{map[string]any{"text": tiltLoop + "# two\n"}}})
	line := strings.Count(tiltLoop[:strings.Index(tiltLoop, "evaporator plate")], "\n")
	hover := string(c.mustCall("textDocument/hover", map[string]any{"textDocument": map[string]any{"uri": uri}, "position": map[string]int{"line": line, "character": 13}}))
	if !strings.Contains(hover, "from version 1; version 2 is being checked") || !strings.Contains(hover, "mass flow") {
		t.Errorf("hover during the debounce: %s", hover)
	}
}

// A cheap file is checked at once; a costly one waits as long as its last
// checks took, up to a bound.
func TestAdaptiveDebounce(t *testing.T) {
	for _, tc := range []struct{ cost, want time.Duration }{
		{0, 0},
		{8 * time.Millisecond, 0},
		{100 * time.Millisecond, 100 * time.Millisecond},
		{5 * time.Second, maxDebounce},
	} {
		if got := adaptiveDebounce(tc.cost); got != tc.want {
			t.Errorf("checks of %v: wait %v, want %v", tc.cost, got, tc.want)
		}
	}
}

// With the adaptive debounce, an edit that arrives while a costly file
// waits cancels the older version's checks: only the newer version's
// complete results go out, and the log says when they did.
func TestAdaptiveDebounceCancelsStale(t *testing.T) {
	var log strings.Builder
	var logMu sync.Mutex
	c := newTestClient(t, Options{Log: writerFunc(func(p []byte) (int, error) {
		logMu.Lock()
		defer logMu.Unlock()
		return log.Write(p)
	}), LogTiming: true})
	var mu sync.Mutex
	full := map[int32]bool{}
	c.srv.onPublish = func(path string, version int32, isFull bool, n int) {
		mu.Lock()
		defer mu.Unlock()
		if isFull {
			full[version] = true
		}
	}
	c.initialize(nil)
	uri := "file:///tmp/costly.loop"
	c.srv.mu.Lock()
	c.srv.checkCost["/tmp/costly.loop"] = 300 * time.Millisecond
	c.srv.mu.Unlock()
	c.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": uri, "languageId": "loop", "version": 1, "text": smallLoop}})
	c.notify("textDocument/didChange", map[string]any{"textDocument": map[string]any{"uri": uri, "version": 2},
		"contentChanges": []any{map[string]any{"text": smallLoop + "# two\n"}}})
	c.settle()
	mu.Lock()
	if full[1] || !full[2] {
		t.Errorf("complete results published for versions %v, want 2 only", full)
	}
	mu.Unlock()
	// The small file's checks were cheap: the next edit is checked at once.
	c.srv.mu.Lock()
	sn := c.srv.snap
	c.srv.mu.Unlock()
	if d := c.srv.debounceFor(sn.sortedRoots()); d != 0 {
		t.Errorf("after cheap checks the next wait is %v", d)
	}
	logMu.Lock()
	defer logMu.Unlock()
	if !strings.Contains(log.String(), "timing: /tmp/costly.loop version 2: first ") || strings.Contains(log.String(), "version 1:") {
		t.Errorf("timing log:\n%s", log.String())
	}
}

type writerFunc func([]byte) (int, error)

func (f writerFunc) Write(p []byte) (int, error) { return f(p) }

// The soft heap limit grows with the open documents, so a large file is
// not analysed under a limit its live heap exceeds.
func TestMemoryLimitFor(t *testing.T) {
	if got := memoryLimitFor(MemoryLimit, 300<<10); got != MemoryLimit {
		t.Errorf("limit for 300 kB of text: %d, want the least %d", got, MemoryLimit)
	}
	if got := memoryLimitFor(MemoryLimit, 5<<20); got < 2*93<<20 {
		t.Errorf("limit for 5 MB of text: %d MB, below twice its live heap of 93 MB", got>>20)
	}
}
