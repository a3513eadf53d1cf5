package editors

import (
	"bufio"
	"encoding/json"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

// kak returns the Kakoune binary. CI does not install Kakoune, so a missing
// kak skips these tests even under CI.
func kak(t *testing.T) string {
	t.Helper()
	p, err := exec.LookPath("kak")
	if err != nil {
		t.Skip("kak not found on PATH")
	}
	return p
}

func kakScript(t *testing.T, dir, body string) string {
	t.Helper()
	p := filepath.Join(dir, "probe.kak")
	src := "source " + filepath.Join(repoRoot(t), "editors", "kakoune", "loop.kak") + "\n" + body
	if err := os.WriteFile(p, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

// TestKakouneFiletypeAndIndent opens an example (filetype, comment_line),
// types a loop with hooks on and compares the indentation the hooks gave,
// and checks that loading the script left no error in the debug buffer.
func TestKakouneFiletypeAndIndent(t *testing.T) {
	bin := kak(t)
	dir := t.TempDir()
	example := filepath.Join(repoRoot(t), "editors", "testdata", "highlight.loop")
	script := kakScript(t, dir, `edit `+example+`
echo -to-file `+dir+`/ft.txt %opt{filetype} %opt{comment_line}
edit -scratch typed.loop
execute-keys -with-hooks 'iloop a {<ret>fluid water # a comment<ret>pipe p from n to n {<ret>length 1 m<ret>}<ret>}<ret>case c {<ret>heat e 1 kW<ret>}<esc>'
write `+dir+`/typed.loop
buffer *debug*
write `+dir+`/debug.txt
`)
	run(t, dir, time.Minute, []string{"HOME=" + dir}, bin, "-n", "-ui", "dummy", "-e",
		"try %{ source "+script+" } catch %{ echo -to-file "+dir+"/err.txt %val{error} }; quit!")
	if b, err := os.ReadFile(filepath.Join(dir, "err.txt")); err == nil {
		t.Fatalf("kak: %s", b)
	}
	if got := readFile(t, filepath.Join(dir, "ft.txt")); got != "loop #" {
		t.Errorf("filetype and comment_line = %q, want %q", got, "loop #")
	}
	want := "loop a {\n  fluid water # a comment\n  pipe p from n to n {\n    length 1 m\n  }\n}\ncase c {\n  heat e 1 kW\n}\n"
	if got := readFile(t, filepath.Join(dir, "typed.loop")); got != want {
		t.Errorf("typed with indent hooks:\n%s\nwant:\n%s", got, want)
	}
	debug := readFile(t, filepath.Join(dir, "debug.txt"))
	if strings.Contains(debug, "error") {
		t.Errorf("debug buffer:\n%s", debug)
	}
}

// TestKakouneHighlight draws an example through Kakoune's JSON UI with each
// standard face set to a distinct colour, and checks the face of chosen
// words.
func TestKakouneHighlight(t *testing.T) {
	bin := kak(t)
	dir := t.TempDir()
	faces := []string{"comment", "string", "keyword", "type", "value", "variable", "function", "attribute", "operator", "meta"}
	var set strings.Builder
	colour := map[string]string{}
	for i, f := range faces {
		c := "rgb:0000" + string("0123456789abcdef"[(i+1)/16]) + string("0123456789abcdef"[(i+1)%16])
		colour[c] = f
		set.WriteString("set-face global " + f + " " + c + "\n")
	}
	example := filepath.Join(repoRoot(t), "editors", "testdata", "highlight.loop")
	script := kakScript(t, dir, set.String()+"edit "+example+"\n")
	cmd := exec.Command(bin, "-n", "-ui", "json", "-e", "try %{ source "+script+" } catch %{ echo -to-file "+dir+"/err.txt %val{error} }")
	cmd.Dir = dir
	cmd.Env = append(os.Environ(), "HOME="+dir)
	stdin, _ := cmd.StdinPipe()
	stdout, _ := cmd.StdoutPipe()
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	defer cmd.Process.Kill()
	timer := time.AfterFunc(time.Minute, func() { cmd.Process.Kill() })
	defer timer.Stop()
	type atom struct {
		Face     struct{ Fg string } `json:"face"`
		Contents string              `json:"contents"`
	}
	var lines [][]atom
	sc := bufio.NewScanner(stdout)
	sc.Buffer(make([]byte, 1<<20), 1<<24)
	for sc.Scan() {
		var msg struct {
			Method string            `json:"method"`
			Params []json.RawMessage `json:"params"`
		}
		if json.Unmarshal(sc.Bytes(), &msg) != nil || msg.Method != "draw" || len(msg.Params) == 0 {
			continue
		}
		if err := json.Unmarshal(msg.Params[0], &lines); err != nil {
			t.Fatalf("draw: %v", err)
		}
		break
	}
	stdin.Write([]byte(`{"jsonrpc":"2.0","method":"keys","params":[":quit!<ret>"]}` + "\n"))
	cmd.Wait()
	if b, err := os.ReadFile(filepath.Join(dir, "err.txt")); err == nil {
		t.Fatalf("kak: %s", b)
	}
	if len(lines) < 20 {
		t.Fatalf("drew %d lines", len(lines))
	}
	// face returns the face of the first atom whose text starts with word
	// on the line that starts with prefix.
	face := func(prefix, word string) string {
		for _, l := range lines {
			var text strings.Builder
			for _, a := range l {
				text.WriteString(a.Contents)
			}
			if !strings.HasPrefix(strings.TrimLeft(text.String(), " "), prefix) {
				continue
			}
			for _, a := range l {
				if strings.HasPrefix(a.Contents, word) {
					return colour[a.Face.Fg]
				}
			}
		}
		return "(not drawn)"
	}
	for _, c := range []struct{ line, word, face string }{
		{"# editors", "# editors", "comment"},
		{"include", "include", "keyword"},
		{"include", `"parts`, "string"},
		{"param lift", "param", "keyword"},
		{"param lift", "=", "operator"},
		{"param lift", "1.2", "value"},
		{"param lift", "m", "type"},
		{"param lift", "# coil", "comment"},
		{"loop rack", "loop", "keyword"},
		{"loop rack", "rack", "type"},
		{"fluid", "fluid", "attribute"},
		{"fluid", "R1233zd(E)", "value"},
		{"design_pressure", "bar(g)", "type"},
		{"node base", "node", "keyword"},
		{"node base", "base", "variable"},
		{"node base", "at", "keyword"},
		{"evaporator plate", "evaporator", "keyword"},
		{"evaporator plate", "plate", "function"},
		{"evaporator plate", "from", "keyword"},
		{"use copper_10", "copper_10", "type"},
		{"wetted_area", "wetted_area", "attribute"},
		{"wetted_area", "m²", "type"},
		{"wall_limit", "°C", "type"},
	} {
		if got := face(c.line, c.word); got != c.face {
			t.Errorf("%q on the line %q: face %q, want %q", c.word, c.line, got, c.face)
		}
	}
}
