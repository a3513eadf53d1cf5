package editors

import (
	"encoding/json"
	"go/ast"
	"go/parser"
	"go/token"
	"os"
	"path/filepath"
	"reflect"
	"regexp"
	"sort"
	"strings"
	"testing"
	"time"

	"circa/lang"
)

func vscodeDir(t *testing.T) string { return filepath.Join(repoRoot(t), "editors", "vscode") }

type vscodeManifest struct {
	Main             string            `json:"main"`
	Engines          map[string]string `json:"engines"`
	ActivationEvents []string          `json:"activationEvents"`
	Dependencies     map[string]string `json:"dependencies"`
	Contributes      struct {
		Languages []struct {
			ID            string   `json:"id"`
			Extensions    []string `json:"extensions"`
			Configuration string   `json:"configuration"`
		} `json:"languages"`
		Grammars []struct {
			Language, ScopeName, Path string
		} `json:"grammars"`
		Snippets []struct {
			Language, Path string
		} `json:"snippets"`
		Configuration struct {
			Properties map[string]struct {
				Type       any            `json:"type"`
				Default    any            `json:"default"`
				Enum       []string       `json:"enum"`
				Properties map[string]any `json:"properties"`
			} `json:"properties"`
		} `json:"configuration"`
	} `json:"contributes"`
}

func loadJSON(t *testing.T, path string, v any) {
	t.Helper()
	if err := json.Unmarshal([]byte(readFile(t, path)), v); err != nil {
		t.Fatalf("%s: %v", path, err)
	}
}

// TestVSCodeManifest checks the extension's manifest against the files it
// names and against the settings the server reads.
func TestVSCodeManifest(t *testing.T) {
	dir := vscodeDir(t)
	var m vscodeManifest
	loadJSON(t, filepath.Join(dir, "package.json"), &m)
	if m.Engines["vscode"] == "" {
		t.Error("package.json: engines.vscode missing")
	}
	if !reflect.DeepEqual(m.ActivationEvents, []string{"onLanguage:loop"}) {
		t.Errorf("activationEvents = %v, want [onLanguage:loop]", m.ActivationEvents)
	}
	if _, ok := m.Dependencies["vscode-languageclient"]; !ok {
		t.Error("vscode-languageclient is not a dependency")
	}
	if len(m.Contributes.Languages) != 1 || m.Contributes.Languages[0].ID != "loop" ||
		!reflect.DeepEqual(m.Contributes.Languages[0].Extensions, []string{".loop"}) {
		t.Errorf("contributes.languages = %+v, want one language loop for .loop", m.Contributes.Languages)
	}
	for _, p := range []string{m.Contributes.Languages[0].Configuration, m.Contributes.Grammars[0].Path, m.Contributes.Snippets[0].Path} {
		var v any
		loadJSON(t, filepath.Join(dir, p), &v)
	}
	// Language configuration: '#' comments, brace pairs, folding by braces.
	var lc struct {
		Comments struct {
			LineComment string `json:"lineComment"`
		} `json:"comments"`
		Brackets         [][2]string `json:"brackets"`
		AutoClosingPairs []struct {
			Open, Close string
		} `json:"autoClosingPairs"`
		Folding struct {
			Markers struct{ Start, End string } `json:"markers"`
		} `json:"folding"`
	}
	loadJSON(t, filepath.Join(dir, m.Contributes.Languages[0].Configuration), &lc)
	if lc.Comments.LineComment != "#" || len(lc.Brackets) != 2 || len(lc.AutoClosingPairs) != 3 {
		t.Errorf("language configuration %+v", lc)
	}
	start := regexp.MustCompile(lc.Folding.Markers.Start)
	end := regexp.MustCompile(lc.Folding.Markers.End)
	for line, want := range map[string][2]bool{
		"loop rack {":                         {true, false},
		"  pipe p from a to b {   # comment":  {true, false},
		"  }":                                 {false, true},
		"}":                                   {false, true},
		"  pipe p from a to b { length 1 m }": {false, false},
		"  length 1 m":                        {false, false},
	} {
		if got := [2]bool{start.MatchString(line), end.MatchString(line)}; got != want {
			t.Errorf("folding markers on %q: start, end = %v, want %v", line, got, want)
		}
	}
	if g := m.Contributes.Grammars[0]; g.ScopeName != "source.loop" || g.Language != "loop" {
		t.Errorf("grammar = %+v", g)
	}
	props := m.Contributes.Configuration.Properties
	if p := props["circa.path"]; p.Default != "circa" {
		t.Errorf("circa.path default = %v, want circa", p.Default)
	}
	// Correlation choices offered are the language's, plus "" for the server default.
	for setting, field := range map[string]string{"circa.methods.voidFraction": "void_fraction", "circa.methods.friction": "friction"} {
		got := append([]string(nil), props[setting].Enum...)
		want := append([]string{""}, lang.MethodChoices[field]...)
		sort.Strings(got)
		sort.Strings(want)
		if !reflect.DeepEqual(got, want) {
			t.Errorf("%s enum = %v, want %v", setting, got, want)
		}
	}
	var limits []string
	for k := range props["circa.limits"].Properties {
		limits = append(limits, k)
	}
	sort.Strings(limits)
	want := append([]string(nil), lang.LimitFields...)
	sort.Strings(want)
	if !reflect.DeepEqual(limits, want) {
		t.Errorf("circa.limits fields = %v, want the limits block's %v", limits, want)
	}
	if props["circa.inlayHints.enabled"].Default != true {
		t.Error("circa.inlayHints.enabled should default to true")
	}
	// The keys the extension sends are the server's settings fields.
	src := readFile(t, filepath.Join(dir, "src", "extension.ts"))
	tags := serverSettingKeys(t)
	if len(tags) == 0 {
		t.Fatal("found no fields in the server's Settings")
	}
	for _, tag := range tags {
		if !regexp.MustCompile(`\b` + tag + `:`).MatchString(src) {
			t.Errorf("extension.ts does not send the server setting %q", tag)
		}
	}
}

// serverSettingKeys returns the JSON names of the server's Settings fields,
// read from the lsp package's source (so this test does not depend on that
// package building).
func serverSettingKeys(t *testing.T) []string {
	t.Helper()
	path := filepath.Join(repoRoot(t), "lsp", "settings.go")
	f, err := parser.ParseFile(token.NewFileSet(), path, nil, 0)
	if err != nil {
		t.Fatalf("reading the server's settings: %v", err)
	}
	var keys []string
	ast.Inspect(f, func(n ast.Node) bool {
		ts, ok := n.(*ast.TypeSpec)
		if !ok || ts.Name.Name != "Settings" {
			return true
		}
		st, ok := ts.Type.(*ast.StructType)
		if !ok {
			return false
		}
		for _, fld := range st.Fields.List {
			if fld.Tag == nil {
				continue
			}
			tag := reflect.StructTag(strings.Trim(fld.Tag.Value, "`")).Get("json")
			if k := strings.Split(tag, ",")[0]; k != "" && k != "-" {
				keys = append(keys, k)
			}
		}
		return false
	})
	return keys
}

// TestVSCodeSnippets checks that every component kind has a snippet and
// that each snippet body is text the language accepts once its
// placeholders are filled with their defaults.
func TestVSCodeSnippets(t *testing.T) {
	var snips map[string]struct {
		Prefix string   `json:"prefix"`
		Body   []string `json:"body"`
	}
	loadJSON(t, filepath.Join(vscodeDir(t), "snippets", "loop.json"), &snips)
	prefixes := map[string]string{}
	for _, s := range snips {
		prefixes[s.Prefix] = strings.Join(s.Body, "\n")
	}
	for _, k := range append(lang.Kinds(), "loop", "case", "node", "junction") {
		if prefixes[k] == "" {
			t.Errorf("no snippet for %q", k)
		}
	}
	// Filling placeholders: ${1:x} → x, ${1|a,b|} → a, $0 → "".
	choice := regexp.MustCompile(`\$\{\d+\|([^,|]*)[^}]*\}`)
	holder := regexp.MustCompile(`\$\{\d+:([^}]*)\}`)
	tab := regexp.MustCompile(`\$\d+`)
	body := prefixes["loop"]
	body = choice.ReplaceAllString(body, "$1")
	body = holder.ReplaceAllString(body, "$1")
	body = tab.ReplaceAllString(body, "")
	m := lang.LoadSource("new.loop", []byte(body), nil)
	for _, d := range m.Diags {
		if d.Severity == lang.Error {
			t.Errorf("the new-loop snippet gives %s: %s", d.Rule, d.Message())
		}
	}
	if len(m.Loops) != 1 || len(m.Loops[0].Components) != 4 || m.Nominal == nil {
		t.Errorf("the new-loop snippet should give one loop of four components and a nominal case:\n%s", body)
	}
}

// TestVSCodeExtension installs the extension's locked dependencies, compiles
// it, runs its unit test (test/extension.test.js, the editor API faked),
// packages it into a .vsix and runs the grammar tests: the scope
// assertions in test/ and a scan of the shipped examples for text the
// grammar leaves unscoped.
func TestVSCodeExtension(t *testing.T) {
	needTool(t, "npm")
	needTool(t, "npx")
	needTool(t, "node")
	if testing.Short() {
		t.Skip("installs npm packages")
	}
	// Work on a copy so the test never writes into the source tree.
	work := filepath.Join(t.TempDir(), "vscode")
	copyTree(t, vscodeDir(t), work, func(rel string) bool {
		return !strings.HasPrefix(rel, "node_modules") && !strings.HasPrefix(rel, "out") && !strings.HasSuffix(rel, ".vsix")
	})
	env := []string{"npm_config_fund=false", "npm_config_audit=false", "npm_config_update_notifier=false"}
	start := time.Now()
	run(t, work, 15*time.Minute, env, "npm", "ci", "--no-audit", "--no-fund")
	t.Logf("npm ci: %v", time.Since(start).Round(time.Second))
	run(t, work, 5*time.Minute, env, "npx", "--no-install", "tsc", "-p", ".")
	if _, err := os.Stat(filepath.Join(work, "out", "extension.js")); err != nil {
		t.Fatalf("tsc wrote no out/extension.js: %v", err)
	}
	// The extension's logic against fakes of the editor API.
	if out := run(t, work, time.Minute, env, "node", "test/extension.test.js"); !strings.Contains(out, "extension tests passed") {
		t.Errorf("extension tests:\n%s", out)
	}
	start = time.Now()
	vsix := filepath.Join(work, "circa-loop.vsix")
	run(t, work, 5*time.Minute, env, "npx", "--no-install", "vsce", "package", "--skip-license", "-o", vsix)
	t.Logf("vsce package: %v", time.Since(start).Round(time.Second))
	if fi, err := os.Stat(vsix); err != nil || fi.Size() == 0 {
		t.Fatalf("no .vsix written: %v", err)
	}
	out := run(t, work, 5*time.Minute, env, "npx", "--no-install", "vscode-tmgrammar-test", "-g", "syntaxes/loop.tmLanguage.json", "test/*.loop")
	if !strings.Contains(out, "scopes.loop") {
		t.Errorf("grammar test ran no test file:\n%s", out)
	}

	snaps := filepath.Join(work, "examples")
	if err := os.MkdirAll(snaps, 0o755); err != nil {
		t.Fatal(err)
	}
	for _, f := range examples(t) {
		copyFile(t, f, filepath.Join(snaps, filepath.Base(f)))
	}
	run(t, work, 5*time.Minute, env, "npx", "--no-install", "vscode-tmgrammar-snap", "-u", "-g", "syntaxes/loop.tmLanguage.json", "examples/*.loop")
	for _, f := range examples(t) {
		checkSnapshot(t, filepath.Base(f), readFile(t, filepath.Join(snaps, filepath.Base(f)+".snap")))
	}
}

// checkSnapshot reads a grammar snapshot (">" source lines, each followed
// by "#  ^^^ scopes" lines) and reports non-blank text that has no scope
// besides the file's own, and fluid names not scoped as fluids.
func checkSnapshot(t *testing.T, name, snap string) {
	t.Helper()
	var line string
	lineNo, tokens := 0, 0
	for _, l := range strings.Split(snap, "\n") {
		switch {
		case strings.HasPrefix(l, ">"):
			line = l[1:]
			lineNo++
		case strings.HasPrefix(l, "#"):
			i := strings.IndexByte(l, '^')
			j := strings.LastIndexByte(l, '^') + 1
			if i < 0 {
				continue
			}
			scopes := strings.Fields(l[j:])
			// Columns count UTF-16 units; the examples' non-ASCII text is in
			// the BMP, so runes are the same count.
			r := []rune(line)
			if j-1 > len(r) {
				t.Errorf("%s:%d: assertion past the line end", name, lineNo)
				continue
			}
			text := string(r[i-1 : j-1])
			tokens++
			if len(scopes) == 1 && strings.TrimSpace(text) != "" {
				t.Errorf("%s:%d: %q has no scope", name, lineNo, text)
			}
			if regexp.MustCompile(`^\s*fluid\s`).MatchString(line) && regexp.MustCompile(`^R\d`).MatchString(text) &&
				!strings.Contains(l, "support.constant.fluid.loop") {
				t.Errorf("%s:%d: fluid %q scoped %v", name, lineNo, text, scopes)
			}
		}
	}
	if tokens < 100 {
		t.Errorf("%s: only %d tokens in the snapshot", name, tokens)
	}
}

func copyFile(t *testing.T, from, to string) {
	t.Helper()
	b, err := os.ReadFile(from)
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(to, b, 0o644); err != nil {
		t.Fatal(err)
	}
}

func copyTree(t *testing.T, from, to string, keep func(rel string) bool) {
	t.Helper()
	err := filepath.Walk(from, func(p string, fi os.FileInfo, err error) error {
		if err != nil {
			return err
		}
		rel, _ := filepath.Rel(from, p)
		if rel != "." && !keep(filepath.ToSlash(rel)) {
			if fi.IsDir() {
				return filepath.SkipDir
			}
			return nil
		}
		if fi.IsDir() {
			return os.MkdirAll(filepath.Join(to, rel), 0o755)
		}
		b, err := os.ReadFile(p)
		if err != nil {
			return err
		}
		return os.WriteFile(filepath.Join(to, rel), b, fi.Mode())
	})
	if err != nil {
		t.Fatal(err)
	}
}
