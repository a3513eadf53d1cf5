package editors

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

// messyLoop is a badly indented file and wantIndented what brace
// indentation (two spaces per open brace) makes of it.
const messyLoop = `loop a {
      fluid water
node n1 at (0, 0, 0) m
   pipe p from n1 to n2 {
length 1 m   # a comment with a { brace
  label "a } in a string"
        }
 pipe q from n2 to n1 { length 1 m }
      }
case c {
heat e 1 kW
}`

const wantIndented = `loop a {
  fluid water
  node n1 at (0, 0, 0) m
  pipe p from n1 to n2 {
    length 1 m   # a comment with a { brace
    label "a } in a string"
  }
  pipe q from n2 to n1 { length 1 m }
}
case c {
  heat e 1 kW
}`

// highlightProbes are texts in testdata/highlight.loop (occurrence counted
// from 1) and the standard highlight group expected at their first
// character.
var highlightProbes = []struct {
	text  string
	n     int
	group string
}{
	{"# Rack-door", 1, "Comment"},
	{"include", 1, "Keyword"},
	{`"parts/tubes.loop"`, 1, "String"},
	{"param", 1, "Keyword"},
	{"lift", 1, "Function"}, // the declared parameter
	{"= 1.2", 1, "Operator"},
	{"0.35", 1, "Number"},
	{"loop rack", 1, "Keyword"},
	{"rack {", 1, "Function"},
	{"R1233zd(E)", 1, "Constant"},
	{"kg", 1, "Type"},
	{"bar(g)", 1, "Type"},
	{"evaporator", 1, "Type"},
	{"from base", 1, "Keyword"},
	{"use copper_10", 1, "Keyword"},
	{"copper_10", 1, "Identifier"},
	{"wall_limit", 1, "Identifier"},
	{"°C", 1, "Type"},
	{"W/K", 1, "Type"},
	{"+ 0.3", 1, "Operator"},
	{"# two long-radius", 1, "Comment"},
	{"hot_aisle", 1, "Function"},
	{"nominal", 1, "Keyword"},
}

type nvimProbe struct {
	Filetype      string      `json:"filetype"`
	Commentstring string      `json:"commentstring"`
	Groups        [][2]string `json:"groups"`
	Indented      string      `json:"indented"`
	Clients       []string    `json:"clients"`
	Diagnostics   []struct {
		Lnum    int    `json:"lnum"`
		Message string `json:"message"`
		Code    string `json:"code"`
	} `json:"diagnostics"`
	Started *struct {
		Name     string         `json:"name"`
		Cmd      []string       `json:"cmd"`
		Root     string         `json:"root"`
		Init     map[string]any `json:"init"`
		Settings map[string]any `json:"settings"`
		Bufnr    int            `json:"bufnr"`
	} `json:"started"`
	Errors []string `json:"errors"`
}

func runNvim(t *testing.T, file string, env []string) nvimProbe {
	t.Helper()
	nvim := needTool(t, "nvim")
	dir := filepath.Join(repoRoot(t), "editors", "nvim")
	outFile := filepath.Join(t.TempDir(), "probe.json")
	texts := make([][2]any, len(highlightProbes))
	for i, p := range highlightProbes {
		texts[i] = [2]any{p.text, p.n}
	}
	tj, _ := json.Marshal(texts)
	env = append(env, "CIRCA_PROBE_FILE="+file, "CIRCA_PROBE_OUT="+outFile, "CIRCA_PROBE_TEXTS="+string(tj), "CIRCA_PROBE_MESSY="+messyLoop)
	home := t.TempDir() // keep the user's shada, logs and state out of it
	env = append(env, "HOME="+home, "XDG_CONFIG_HOME="+home, "XDG_DATA_HOME="+home, "XDG_STATE_HOME="+home, "XDG_CACHE_HOME="+home)
	run(t, filepath.Dir(file), 2*time.Minute, env, nvim, "--headless", "-u", "NONE", "-i", "NONE",
		"--cmd", "set runtimepath^="+dir, "-c", "luafile "+filepath.Join(dir, "test", "probe.lua"))
	var p nvimProbe
	b, err := os.ReadFile(outFile)
	if err != nil {
		t.Fatalf("nvim wrote no result: %v", err)
	}
	if err := json.Unmarshal(b, &p); err != nil {
		t.Fatalf("nvim result %s: %v", b, err)
	}
	for _, e := range p.Errors {
		t.Errorf("nvim: %s", e)
	}
	return p
}

// TestNeovimPlugin opens an example in headless Neovim with the plugin on
// the runtimepath: filetype detection, highlight groups and brace
// indentation.
func TestNeovimPlugin(t *testing.T) {
	file := filepath.Join(repoRoot(t), "editors", "testdata", "highlight.loop")
	p := runNvim(t, file, []string{"PATH=/nonexistent"}) // no circa on PATH: the plugin must only warn
	if p.Filetype != "loop" {
		t.Errorf("filetype = %q, want loop", p.Filetype)
	}
	if p.Commentstring != "# %s" {
		t.Errorf("commentstring = %q, want %q", p.Commentstring, "# %s")
	}
	if len(p.Groups) != len(highlightProbes) {
		t.Fatalf("got %d highlight groups for %d probes", len(p.Groups), len(highlightProbes))
	}
	for i, h := range highlightProbes {
		if p.Groups[i][1] != h.group {
			t.Errorf("%q: group %q, want %q", h.text, p.Groups[i][1], h.group)
		}
	}
	if p.Indented != wantIndented {
		t.Errorf("indentation:\n%s\nwant:\n%s", p.Indented, wantIndented)
	}
}

// TestNeovimLSP checks that the plugin starts `circa serve`, attaches it to
// a .loop buffer and shows the diagnostics it publishes.
func TestNeovimLSP(t *testing.T) {
	needTool(t, "nvim")
	bin := circa(t)
	if !serveReady(t) {
		t.Skip("circa has no serve command yet")
	}
	dir := t.TempDir()
	file := filepath.Join(dir, "broken.loop")
	// An unknown field gets a finding from the resolver.
	src := "loop l {\n  fluid water\n  node a at (0, 0, 0) m\n  lenght 1 m\n}\n"
	if err := os.WriteFile(file, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	p := runNvim(t, file, []string{"PATH=" + filepath.Dir(bin) + ":" + os.Getenv("PATH"), "CIRCA_PROBE_LSP=1"})
	if strings.Join(p.Clients, ",") != "circa" {
		t.Errorf("clients attached = %v, want [circa]", p.Clients)
	}
	found := false
	for _, d := range p.Diagnostics {
		found = found || d.Lnum == 3
	}
	if !found {
		t.Errorf("no diagnostic on line 4 (lenght): %+v", p.Diagnostics)
	}
}

// TestNeovimStart checks the plugin's Neovim 0.8+ path (vim.lsp.start, faked
// so it runs on 0.7 too): the server command and settings from vim.g.circa,
// and the root directory, the one holding .git above the file.
func TestNeovimStart(t *testing.T) {
	root := t.TempDir()
	if err := os.MkdirAll(filepath.Join(root, ".git"), 0o755); err != nil {
		t.Fatal(err)
	}
	sub := filepath.Join(root, "designs", "rack")
	if err := os.MkdirAll(sub, 0o755); err != nil {
		t.Fatal(err)
	}
	file := filepath.Join(sub, "a.loop")
	copyFile(t, filepath.Join(repoRoot(t), "editors", "testdata", "highlight.loop"), file)
	p := runNvim(t, file, []string{"CIRCA_PROBE_FAKESTART=1"})
	if p.Started == nil {
		t.Fatal("vim.lsp.start was not called")
	}
	s := p.Started
	if s.Name != "circa" || strings.Join(s.Cmd, " ") != "sh serve" || s.Bufnr <= 0 {
		t.Errorf("started %+v", s)
	}
	if got, _ := filepath.EvalSymlinks(s.Root); got != mustEval(t, root) {
		t.Errorf("root_dir = %q, want %q", s.Root, root)
	}
	if s.Init["voidFraction"] != "zivi" {
		t.Errorf("init_options = %v", s.Init)
	}
	if c, _ := s.Settings["circa"].(map[string]any); c["voidFraction"] != "zivi" {
		t.Errorf("settings = %v", s.Settings)
	}
	// Without .git above it, the file's own directory is the root.
	lone := filepath.Join(t.TempDir(), "b.loop")
	copyFile(t, file, lone)
	p = runNvim(t, lone, []string{"CIRCA_PROBE_FAKESTART=1"})
	if p.Started == nil || mustEval(t, p.Started.Root) != mustEval(t, filepath.Dir(lone)) {
		t.Errorf("root without .git: %+v", p.Started)
	}
}

func mustEval(t *testing.T, p string) string {
	t.Helper()
	q, err := filepath.EvalSymlinks(p)
	if err != nil {
		t.Fatal(err)
	}
	return q
}
