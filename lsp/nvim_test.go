package lsp

import (
	"context"
	"encoding/json"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"
)

// TestNeovim opens an example in headless Neovim with `circa serve` as its
// language server and reads back the diagnostics and a hover. It skips
// without nvim, except under CI, where a missing nvim is a failure.
func TestNeovim(t *testing.T) {
	nvim, err := exec.LookPath("nvim")
	if err != nil {
		if os.Getenv("CI") != "" {
			t.Fatal("nvim is not installed (needed under CI)")
		}
		t.Skip("nvim is not installed")
	}
	if testing.Short() {
		t.Skip("builds the binary")
	}
	dir := t.TempDir()
	bin := filepath.Join(dir, "circa")
	build := exec.Command("go", "build", "-o", bin, "circa/cmd/circa")
	if out, err := build.CombinedOutput(); err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	// The rack-door example with one unit error put in: a length given in kg.
	src, err := os.ReadFile("../testdata/examples/rack-door.loop")
	if err != nil {
		t.Fatal(err)
	}
	parts, err := os.ReadFile("../testdata/examples/parts/tubes.loop")
	if err != nil {
		t.Fatal(err)
	}
	text := strings.Replace(string(src), "heated_length 0.3 m", "heated_length 0.3 kg", 1)
	if text == string(src) {
		t.Fatal("the example changed: no heated_length 0.3 m")
	}
	work := filepath.Join(dir, "work")
	os.MkdirAll(filepath.Join(work, "parts"), 0o755)
	file := filepath.Join(work, "rack-door.loop")
	os.WriteFile(file, []byte(text), 0o644)
	os.WriteFile(filepath.Join(work, "parts", "tubes.loop"), parts, 0o644)

	lines := strings.Split(text, "\n")
	errLine, hoverLine, hoverCol := -1, -1, -1
	for i, l := range lines {
		if strings.Contains(l, "heated_length 0.3 kg") {
			errLine = i
		}
		if j := strings.Index(l, "length 1.45 m"); j >= 0 {
			hoverLine, hoverCol = i, j+len("length ")
		}
	}
	out := filepath.Join(dir, "probe.json")
	home := t.TempDir()
	ctx, cancel := context.WithTimeout(context.Background(), 2*time.Minute)
	defer cancel()
	cmd := exec.CommandContext(ctx, nvim, "--headless", "-u", "NONE", "-i", "NONE", "-c", "luafile "+filepath.Join("testdata", "nvim", "probe.lua"))
	cmd.Env = append(os.Environ(), "HOME="+home, "XDG_CONFIG_HOME="+home, "XDG_DATA_HOME="+home, "XDG_STATE_HOME="+home, "XDG_CACHE_HOME="+home,
		"CIRCA_BIN="+bin, "CIRCA_FILE="+file, "CIRCA_OUT="+out, "CIRCA_WANT_CODE=unit",
		"CIRCA_HOVER_LINE="+strconv.Itoa(hoverLine), "CIRCA_HOVER_COL="+strconv.Itoa(hoverCol))
	if b, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("nvim: %v\n%s", err, b)
	}
	b, err := os.ReadFile(out)
	if err != nil {
		t.Fatalf("nvim wrote no result: %v", err)
	}
	var res struct {
		Errors      []string `json:"errors"`
		Hover       string   `json:"hover"`
		Diagnostics []struct {
			Lnum    int    `json:"lnum"`
			Col     int    `json:"col"`
			Message string `json:"message"`
			Code    string `json:"code"`
		} `json:"diagnostics"`
	}
	if err := json.Unmarshal(b, &res); err != nil {
		t.Fatalf("%s: %v", b, err)
	}
	for _, e := range res.Errors {
		t.Errorf("nvim: %s", e)
	}
	found := false
	for _, d := range res.Diagnostics {
		if d.Code == "unit" && d.Lnum == errLine && strings.Contains(d.Message, "expected a length") {
			found = true
		}
	}
	if !found {
		t.Errorf("no unit finding on line %d; got %+v", errLine, res.Diagnostics)
	}
	// SI Brochure: 1.45 m = 145 cm = 1450 mm.
	for _, want := range []string{"1.45 m", "145 cm", "1450 mm"} {
		if !strings.Contains(res.Hover, want) {
			t.Errorf("hover lacks %q:\n%s", want, res.Hover)
		}
	}
}
