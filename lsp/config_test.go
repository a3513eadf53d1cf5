package lsp

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"testing"
	"time"

	"go.lsp.dev/uri"
	"golang.org/x/tools/txtar"
)

// syncBuffer is a log that tests read while the server writes it.
type syncBuffer struct {
	mu sync.Mutex
	b  bytes.Buffer
}

func (b *syncBuffer) Write(p []byte) (int, error) {
	b.mu.Lock()
	defer b.mu.Unlock()
	return b.b.Write(p)
}

func (b *syncBuffer) String() string {
	b.mu.Lock()
	defer b.mu.Unlock()
	return b.b.String()
}

// eventually waits up to 10 s for cond.
func eventually(t *testing.T, what string, cond func() bool) {
	t.Helper()
	deadline := time.Now().Add(10 * time.Second)
	for !cond() {
		if time.Now().After(deadline) {
			t.Fatalf("timed out waiting for %s", what)
		}
		time.Sleep(2 * time.Millisecond)
	}
}

// openSettingsLoop opens a.loop of the settings scenario and returns its
// URI and text.
func openSettingsLoop(t *testing.T, c *testClient) (uri.URI, string) {
	ar, err := txtar.ParseFile("testdata/settings.txtar")
	if err != nil {
		t.Fatal(err)
	}
	var text string
	for _, f := range ar.Files {
		if f.Name == "a.loop" {
			text = string(f.Data)
		}
	}
	path := filepath.Join(t.TempDir(), "a.loop")
	if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	u := uri.File(path)
	c.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": u, "languageId": "loop", "version": 1, "text": text}})
	return u, text
}

// hoverOn returns the hover text at needle's first occurrence in text
// (counted in bytes, so the line must be ASCII up to it).
func hoverOn(t *testing.T, c *testClient, u uri.URI, text, needle string) string {
	i := strings.Index(text, needle)
	if i < 0 {
		t.Fatalf("%q not in the file", needle)
	}
	line := strings.Count(text[:i], "\n")
	col := i - (strings.LastIndex(text[:i], "\n") + 1)
	r := c.mustCall("textDocument/hover", map[string]any{"textDocument": map[string]any{"uri": u}, "position": map[string]any{"line": line, "character": col}})
	var h struct {
		Contents struct{ Value string } `json:"contents"`
	}
	json.Unmarshal(r, &h)
	return h.Contents.Value
}

func (c *testClient) settingsNow() Settings {
	c.srv.mu.Lock()
	defer c.srv.mu.Unlock()
	return c.srv.settings
}

// A client that answers workspace/configuration is asked for the "circa"
// section after initialized and whenever it sends a configuration change
// without settings; each answer is merged over the settings in force, and
// an invalid one is refused with the earlier settings kept.
func TestPullSettings(t *testing.T) {
	var log syncBuffer
	c := newTestClient(t, Options{Debounce: -1, Log: &log})
	c.answer("workspace/configuration", `[{"voidFraction": "homogeneous"}]`)
	c.initialize(map[string]any{"workspace": map[string]any{"configuration": true}})
	eventually(t, "the pulled settings", func() bool { return c.settingsNow().VoidFraction == "homogeneous" })
	calls := c.serverCalls("workspace/configuration")
	if len(calls) != 1 {
		t.Fatalf("%d workspace/configuration requests after initialized, want 1", len(calls))
	}
	var p struct {
		Items []struct {
			Section string `json:"section"`
		} `json:"items"`
	}
	if err := json.Unmarshal(calls[0].Params, &p); err != nil || len(p.Items) != 1 || p.Items[0].Section != "circa" {
		t.Fatalf("workspace/configuration params %s, want one item for section circa", calls[0].Params)
	}

	u, text := openSettingsLoop(t, c)
	c.settle()
	if h := hoverOn(t, c, u, text, "plate from"); !strings.Contains(h, "void fraction homogeneous, friction ") {
		t.Fatalf("hover after the pulled settings:\n%s", h)
	}

	// A change without settings: pull again and merge over what is in force.
	c.answer("workspace/configuration", `[{"friction": "friedel"}]`)
	c.notify("workspace/didChangeConfiguration", map[string]any{"settings": nil})
	eventually(t, "the second pull", func() bool { return c.settingsNow().Friction == "friedel" })
	c.settle()
	if h := hoverOn(t, c, u, text, "plate from"); !strings.Contains(h, "void fraction homogeneous, friction friedel") {
		t.Fatalf("hover after the second pull:\n%s", h)
	}

	// An empty object counts as no settings; an invalid answer is refused.
	c.answer("workspace/configuration", `[{"voidFraction": "slip"}]`)
	c.notify("workspace/didChangeConfiguration", map[string]any{"settings": map[string]any{}})
	eventually(t, "the refusal", func() bool { return strings.Contains(log.String(), `voidFraction "slip"`) })
	if st := c.settingsNow(); st.VoidFraction != "homogeneous" || st.Friction != "friedel" {
		t.Fatalf("settings after an invalid answer: %+v", st)
	}
	if n := len(c.serverCalls("workspace/configuration")); n != 3 {
		t.Fatalf("%d workspace/configuration requests, want 3", n)
	}
}

// A client that does not advertise workspace/configuration is never asked.
func TestNoPullWithoutCapability(t *testing.T) {
	c := newTestClient(t, Options{Debounce: -1})
	c.answer("workspace/configuration", `[{"voidFraction": "homogeneous"}]`)
	c.initialize(nil)
	c.notify("workspace/didChangeConfiguration", map[string]any{"settings": nil})
	openSettingsLoop(t, c)
	c.settle()
	if n := len(c.serverCalls("workspace/configuration")); n != 0 {
		t.Fatalf("%d workspace/configuration requests to a client that cannot answer them", n)
	}
	if st := c.settingsNow(); st.VoidFraction != "" {
		t.Fatalf("settings changed without a pull: %+v", st)
	}
}
