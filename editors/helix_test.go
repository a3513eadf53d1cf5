package editors

import (
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

// tomlTables reads the subset of TOML the Helix snippet uses: [table] and
// [[array-table]] headers, key = value lines with strings, booleans,
// arrays of strings and one-line inline tables, and comments. It returns,
// per table header (array tables numbered: "language#0"), the raw value of
// each key, and an error for any line outside that subset.
func tomlTables(src string) (map[string]map[string]string, error) {
	tables := map[string]map[string]string{}
	cur := ""
	count := map[string]int{}
	tables[cur] = map[string]string{}
	for n, line := range strings.Split(src, "\n") {
		line = strings.TrimSpace(stripTOMLComment(line))
		switch {
		case line == "":
			continue
		case strings.HasPrefix(line, "[[") && strings.HasSuffix(line, "]]"):
			name := strings.TrimSpace(line[2 : len(line)-2])
			cur = fmt.Sprintf("%s#%d", name, count[name])
			count[name]++
		case strings.HasPrefix(line, "[") && strings.HasSuffix(line, "]"):
			cur = strings.TrimSpace(line[1 : len(line)-1])
			if _, dup := tables[cur]; dup {
				return nil, fmt.Errorf("line %d: table [%s] defined twice", n+1, cur)
			}
		default:
			k, v, ok := strings.Cut(line, "=")
			k, v = strings.TrimSpace(k), strings.TrimSpace(v)
			if !ok || k == "" || strings.ContainsAny(k, " \"") {
				return nil, fmt.Errorf("line %d: not key = value: %q", n+1, line)
			}
			if err := checkTOMLValue(v); err != nil {
				return nil, fmt.Errorf("line %d: %s: %v", n+1, k, err)
			}
			if tables[cur] == nil {
				tables[cur] = map[string]string{}
			}
			if _, dup := tables[cur][k]; dup {
				return nil, fmt.Errorf("line %d: key %s given twice", n+1, k)
			}
			tables[cur][k] = v
			continue
		}
		if tables[cur] == nil {
			tables[cur] = map[string]string{}
		}
	}
	return tables, nil
}

func stripTOMLComment(line string) string {
	in := false
	for i, c := range line {
		switch {
		case c == '"' && (i == 0 || line[i-1] != '\\'):
			in = !in
		case c == '#' && !in:
			return line[:i]
		}
	}
	return line
}

// checkTOMLValue accepts a basic string, true/false, an integer, an array of
// values or an inline table of key = value pairs.
func checkTOMLValue(v string) error {
	switch {
	case v == "true" || v == "false":
		return nil
	case strings.HasPrefix(v, `"`):
		if len(v) < 2 || !strings.HasSuffix(v, `"`) || strings.Contains(v[1:len(v)-1], `"`) {
			return fmt.Errorf("bad string %s", v)
		}
		return nil
	case strings.HasPrefix(v, "[") && strings.HasSuffix(v, "]"):
		for _, e := range splitTOMLList(v[1 : len(v)-1]) {
			if err := checkTOMLValue(e); err != nil {
				return err
			}
		}
		return nil
	case strings.HasPrefix(v, "{") && strings.HasSuffix(v, "}"):
		for _, kv := range splitTOMLList(v[1 : len(v)-1]) {
			k, e, ok := strings.Cut(kv, "=")
			if !ok || strings.TrimSpace(k) == "" {
				return fmt.Errorf("bad inline table entry %q", kv)
			}
			if err := checkTOMLValue(strings.TrimSpace(e)); err != nil {
				return err
			}
		}
		return nil
	}
	for _, c := range v {
		if c < '0' || c > '9' {
			return fmt.Errorf("unknown value %s", v)
		}
	}
	if v == "" {
		return fmt.Errorf("empty value")
	}
	return nil
}

// splitTOMLList splits at top-level commas.
func splitTOMLList(s string) []string {
	var out []string
	depth, in, start := 0, false, 0
	for i, c := range s {
		switch {
		case c == '"':
			in = !in
		case in:
		case c == '[' || c == '{':
			depth++
		case c == ']' || c == '}':
			depth--
		case c == ',' && depth == 0:
			out = append(out, strings.TrimSpace(s[start:i]))
			start = i + 1
		}
	}
	if rest := strings.TrimSpace(s[start:]); rest != "" {
		out = append(out, rest)
	}
	return out
}

func TestTOMLSubsetRejects(t *testing.T) {
	for _, bad := range []string{
		"name = loop",          // unquoted string
		`file-types = ["loop"`, // unclosed array
		"[language-server.circa]\n[language-server.circa]", // table twice
		"a = 1\na = 2",
		`x = { a = }`,
	} {
		if _, err := tomlTables(bad); err == nil {
			t.Errorf("accepted %q", bad)
		}
	}
}

// TestHelixLanguages checks the Helix snippet's structure: the loop
// language with its file type, comment token and server, and the server's
// command. With hx installed, `hx --health loop` must also find it.
func TestHelixLanguages(t *testing.T) {
	path := filepath.Join(repoRoot(t), "editors", "helix", "languages.toml")
	tables, err := tomlTables(readFile(t, path))
	if err != nil {
		t.Fatalf("languages.toml: %v", err)
	}
	lang := tables["language#0"]
	for k, want := range map[string]string{
		"name":             `"loop"`,
		"file-types":       `["loop"]`,
		"comment-token":    `"#"`,
		"language-servers": `["circa"]`,
	} {
		if lang[k] != want {
			t.Errorf("[[language]] %s = %s, want %s", k, lang[k], want)
		}
	}
	srv := tables["language-server.circa"]
	if srv["command"] != `"circa"` || srv["args"] != `["serve"]` {
		t.Errorf("[language-server.circa] = %v, want command circa, args [serve]", srv)
	}
	if _, ok := tables["language#1"]; ok {
		t.Error("more than one [[language]]")
	}
	if _, err := exec.LookPath("hx"); err == nil {
		home := t.TempDir()
		if err := os.MkdirAll(filepath.Join(home, "helix"), 0o755); err != nil {
			t.Fatal(err)
		}
		copyFile(t, path, filepath.Join(home, "helix", "languages.toml"))
		out, _ := runErr(home, time.Minute, []string{"XDG_CONFIG_HOME=" + home}, "hx", "--health", "loop")
		if !strings.Contains(out, "circa") {
			t.Errorf("hx --health loop does not list circa:\n%s", out)
		}
	} else {
		t.Log("hx not installed: structural check only")
	}
}
