package lsp

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"regexp"
	"sort"
	"strconv"
	"strings"
	"testing"

	"go.lsp.dev/uri"
	"golang.org/x/tools/txtar"

	"circa/lang"
)

// TestScenarios runs every testdata/*.txtar archive: its files are written to
// a temporary directory and its "script" section drives a server. Expected
// diagnostics are written beside the text that causes them, as comments
// "#@RULE" or "#@RULE(\"part of the message\")"; "diags FILE" matches the
// published ones against them one to one.
//
// Script commands (one a line; # starts a comment line):
//
//	init [CAPABILITIES-JSON]      initialize (and initialized)
//	config SETTINGS-JSON          workspace/didChangeConfiguration
//	open FILE | close FILE
//	change FILE POS-POS TEXT      incremental edit; TEXT is a Go string
//	write FILE SECTION            put SECTION's text on disk as FILE and say so
//	disk FILE SECTION             put SECTION's text on disk as FILE silently
//	settle                        wait until the analysis of the last change is published
//	diags FILE                    compare published diagnostics with the markers
//	hover|complete|def|refs|prepare FILE POS
//	rename FILE POS NEWNAME
//	format FILE | symbols FILE | tokens FILE | folds FILE | hints FILE | actions FILE POS-POS
//	call METHOD JSON              any request ($FILE names are replaced by URIs)
//	~ "TEXT"... / !~ "TEXT"       the last reply's strings hold (or lack) each TEXT
//	first "TEXT"...               the last hover's first paragraph holds each TEXT
//	has "LABEL"... / lacks "LABEL"... the completion list has (or lacks) each label
//	tok FILE POS TYPE             after tokens: a semantic token of TYPE starts at POS
//	null | count N | error CODE | want JSON
//	apply                         apply the last reply's edits to the files
//	want-file FILE SECTION        FILE's text now equals SECTION
//	file~ FILE "TEXT"... / file!~ the file's current text holds (or lacks) each TEXT
//	sync FILE                     send the file's current text as a whole-document change
//
// POS is LINE:COL (zero-based, in the negotiated encoding) or "NEEDLE" or
// "NEEDLE"+N: the start of NEEDLE's first occurrence, plus N bytes.
func TestScenarios(t *testing.T) {
	files, err := filepath.Glob("testdata/*.txtar")
	if err != nil {
		t.Fatal(err)
	}
	if len(files) == 0 {
		t.Fatal("no scenarios")
	}
	for _, file := range files {
		t.Run(strings.TrimSuffix(filepath.Base(file), ".txtar"), func(t *testing.T) {
			ar, err := txtar.ParseFile(file)
			if err != nil {
				t.Fatal(err)
			}
			runScenario(t, ar)
		})
	}
}

type scenario struct {
	t        *testing.T
	c        *testClient
	dir      string
	sections map[string]string
	texts    map[string]string // current text of each file, by name
	versions map[string]int32
	enc      lang.Encoding
	last     json.RawMessage
	lastErr  *rpcError
	lastCmd  string
}

func runScenario(t *testing.T, ar *txtar.Archive) {
	sc := &scenario{t: t, dir: t.TempDir(), sections: map[string]string{}, texts: map[string]string{}, versions: map[string]int32{}}
	script := ""
	for _, f := range ar.Files {
		if f.Name == "script" {
			script = string(f.Data)
			continue
		}
		sc.sections[f.Name] = string(f.Data)
		if strings.HasSuffix(f.Name, ".loop") || strings.HasSuffix(f.Name, ".csv") {
			sc.texts[f.Name] = string(f.Data)
			p := filepath.Join(sc.dir, filepath.FromSlash(f.Name))
			os.MkdirAll(filepath.Dir(p), 0o755)
			if err := os.WriteFile(p, f.Data, 0o644); err != nil {
				t.Fatal(err)
			}
		}
	}
	sc.c = newTestClient(t, Options{Debounce: -1})
	for i, line := range strings.Split(script, "\n") {
		line = strings.TrimSpace(line)
		if line == "" || strings.HasPrefix(line, "#") {
			continue
		}
		sc.run(i+1, line)
		if t.Failed() {
			t.Fatalf("script line %d: %s", i+1, line)
		}
	}
}

func (sc *scenario) uri(name string) uri.URI {
	return uri.File(filepath.Join(sc.dir, filepath.FromSlash(name)))
}

// names replaces the scenario's URIs in a reply by file names.
func (sc *scenario) names(b []byte) []byte {
	for name := range sc.texts {
		b = bytes.ReplaceAll(b, []byte(`"`+string(sc.uri(name))+`"`), []byte(`"`+name+`"`))
	}
	return b
}

func (sc *scenario) uris(s string) string {
	for name := range sc.texts {
		s = strings.ReplaceAll(s, `"$`+name+`"`, `"`+string(sc.uri(name))+`"`)
	}
	return s
}

var posRe = regexp.MustCompile(`^(\d+):(\d+)$`)

// pos reads a position argument against a file's current text.
func (sc *scenario) pos(name, arg string) map[string]int {
	if m := posRe.FindStringSubmatch(arg); m != nil {
		l, _ := strconv.Atoi(m[1])
		c, _ := strconv.Atoi(m[2])
		return map[string]int{"line": l, "character": c}
	}
	extra := 0
	if i := strings.LastIndex(arg, `"+`); i >= 0 {
		extra, _ = strconv.Atoi(arg[i+2:])
		arg = arg[:i+1]
	}
	needle, err := strconv.Unquote(arg)
	if err != nil {
		sc.t.Fatalf("bad position %s", arg)
	}
	text := sc.texts[name]
	off := strings.Index(text, needle)
	if off < 0 {
		sc.t.Fatalf("%q not in %s", needle, name)
	}
	p := lang.NewMapper([]byte(text)).OffsetPosition(off+extra, sc.enc)
	return map[string]int{"line": p.Line, "character": p.Col}
}

func (sc *scenario) rng(name, arg string) map[string]any {
	a, b, ok := strings.Cut(arg, "-")
	if !ok {
		sc.t.Fatalf("bad range %s", arg)
	}
	return map[string]any{"start": sc.pos(name, a), "end": sc.pos(name, b)}
}

// fields splits a command line at blanks outside double quotes; a
// trailing JSON argument is kept whole.
func fields(line string) []string {
	var out []string
	for {
		line = strings.TrimLeft(line, " \t")
		if line == "" {
			return out
		}
		if line[0] == '{' || line[0] == '[' {
			return append(out, line)
		}
		in, i := false, 0
		for ; i < len(line); i++ {
			ch := line[i]
			if ch == '\\' && in {
				i++
				continue
			}
			if ch == '"' {
				in = !in
			}
			if !in && (ch == ' ' || ch == '\t') {
				break
			}
		}
		if i > len(line) {
			i = len(line)
		}
		out = append(out, line[:i])
		line = line[i:]
	}
}

func (sc *scenario) doc(name string) map[string]any {
	return map[string]any{"uri": sc.uri(name)}
}

func (sc *scenario) at(name, p string) map[string]any {
	return map[string]any{"textDocument": sc.doc(name), "position": sc.pos(name, p)}
}

func (sc *scenario) request(method string, params any) {
	sc.last, sc.lastErr = sc.c.call(method, params)
	sc.last = sc.names(sc.last)
	sc.lastCmd = method
}

func (sc *scenario) run(n int, line string) {
	t := sc.t
	f := fields(line)
	cmd, args := f[0], f[1:]
	arg := func(i int) string {
		if i >= len(args) {
			t.Fatalf("line %d: %s needs %d arguments", n, cmd, i+1)
		}
		return args[i]
	}
	switch cmd {
	case "init":
		caps := map[string]any{}
		if len(args) > 0 {
			if err := json.Unmarshal([]byte(args[0]), &caps); err != nil {
				t.Fatal(err)
			}
		}
		r := sc.c.initialize(caps)
		if bytes.Contains(r, []byte(`"positionEncoding":"utf-8"`)) {
			sc.enc = lang.UTF8
		}
		sc.last = r
	case "config":
		sc.c.notify("workspace/didChangeConfiguration", map[string]any{"settings": json.RawMessage(arg(0))})
	case "open":
		name := arg(0)
		sc.versions[name] = 1
		sc.c.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{
			"uri": sc.uri(name), "languageId": "loop", "version": 1, "text": sc.texts[name]}})
	case "close":
		delete(sc.versions, arg(0))
		sc.c.notify("textDocument/didClose", map[string]any{"textDocument": sc.doc(arg(0))})
	case "change":
		name := arg(0)
		text, err := strconv.Unquote(arg(2))
		if err != nil {
			t.Fatalf("line %d: %v", n, err)
		}
		r := sc.rng(name, arg(1))
		sc.versions[name]++
		sc.c.notify("textDocument/didChange", map[string]any{
			"textDocument":   map[string]any{"uri": sc.uri(name), "version": sc.versions[name]},
			"contentChanges": []any{map[string]any{"range": r, "text": text}},
		})
		sc.applyEdit(name, r, text)
	case "write":
		name := arg(0)
		sc.texts[name] = sc.sections[arg(1)]
		os.WriteFile(filepath.Join(sc.dir, filepath.FromSlash(name)), []byte(sc.texts[name]), 0o644)
		sc.c.notify("workspace/didChangeWatchedFiles", map[string]any{"changes": []any{map[string]any{"uri": sc.uri(name), "type": 2}}})
	case "disk":
		name := arg(0)
		sc.texts[name] = sc.sections[arg(1)]
		if err := os.WriteFile(filepath.Join(sc.dir, filepath.FromSlash(name)), []byte(sc.texts[name]), 0o644); err != nil {
			sc.t.Fatal(err)
		}
	case "settle":
		sc.c.settle()
	case "diags":
		sc.c.settle()
		sc.checkDiags(n, arg(0))
	case "hover":
		sc.request("textDocument/hover", sc.at(arg(0), arg(1)))
	case "complete":
		sc.request("textDocument/completion", sc.at(arg(0), arg(1)))
	case "def":
		sc.request("textDocument/definition", sc.at(arg(0), arg(1)))
	case "prepare":
		sc.request("textDocument/prepareRename", sc.at(arg(0), arg(1)))
	case "refs":
		p := sc.at(arg(0), arg(1))
		p["context"] = map[string]any{"includeDeclaration": true}
		sc.request("textDocument/references", p)
	case "rename":
		p := sc.at(arg(0), arg(1))
		p["newName"] = arg(2)
		sc.request("textDocument/rename", p)
	case "format":
		sc.request("textDocument/formatting", map[string]any{"textDocument": sc.doc(arg(0)), "options": map[string]any{"tabSize": 2, "insertSpaces": true}})
		sc.lastCmd = "format " + arg(0)
	case "rangeformat":
		sc.request("textDocument/rangeFormatting", map[string]any{"textDocument": sc.doc(arg(0)), "range": sc.rng(arg(0), arg(1)), "options": map[string]any{"tabSize": 2, "insertSpaces": true}})
		sc.lastCmd = "format " + arg(0)
	case "symbols":
		sc.request("textDocument/documentSymbol", map[string]any{"textDocument": sc.doc(arg(0))})
	case "tokens":
		sc.request("textDocument/semanticTokens/full", map[string]any{"textDocument": sc.doc(arg(0))})
	case "folds":
		sc.request("textDocument/foldingRange", map[string]any{"textDocument": sc.doc(arg(0))})
	case "hints":
		sc.request("textDocument/inlayHint", map[string]any{"textDocument": sc.doc(arg(0)), "range": map[string]any{"start": map[string]int{"line": 0, "character": 0}, "end": map[string]int{"line": 100000, "character": 0}}})
	case "actions":
		sc.c.settle()
		sc.request("textDocument/codeAction", map[string]any{"textDocument": sc.doc(arg(0)), "range": sc.rng(arg(0), arg(1)), "context": map[string]any{"diagnostics": []any{}}})
	case "call":
		sc.request(arg(0), json.RawMessage(sc.uris(arg(1))))
	case "~", "!~":
		if sc.lastErr != nil {
			t.Fatalf("line %d: last reply was an error: %v", n, sc.lastErr)
		}
		text := strings.Join(jsonStrings(sc.last), "\n")
		for _, a := range args {
			want, err := strconv.Unquote(a)
			if err != nil {
				t.Fatalf("line %d: %v", n, err)
			}
			if strings.Contains(text, want) != (cmd == "~") {
				t.Errorf("line %d: reply %s %q:\n%s", n, map[bool]string{true: "lacks", false: "holds"}[cmd == "~"], want, text)
			}
		}
	case "first":
		// first "TEXT"...: the hover's first paragraph holds each TEXT.
		var h struct {
			Contents struct{ Value string } `json:"contents"`
		}
		if sc.lastErr != nil || json.Unmarshal(sc.last, &h) != nil {
			t.Fatalf("line %d: not a hover: %s %v", n, sc.last, sc.lastErr)
		}
		// A long first line is wrapped; it is still one paragraph.
		para, _, _ := strings.Cut(h.Contents.Value, "\n\n")
		first := strings.ReplaceAll(para, "\n", " ")
		for _, a := range args {
			want, err := strconv.Unquote(a)
			if err != nil {
				t.Fatalf("line %d: %v", n, err)
			}
			if !strings.Contains(first, want) {
				t.Errorf("line %d: first paragraph lacks %q:\n%s", n, want, h.Contents.Value)
			}
		}
	case "has", "lacks":
		var list struct {
			Items []struct{ Label string } `json:"items"`
		}
		json.Unmarshal(sc.last, &list)
		labels := map[string]bool{}
		for _, it := range list.Items {
			labels[it.Label] = true
		}
		for _, a := range args {
			want, err := strconv.Unquote(a)
			if err != nil {
				t.Fatalf("line %d: %v", n, err)
			}
			if labels[want] != (cmd == "has") {
				t.Errorf("line %d: completion %s %q: %v", n, map[bool]string{true: "lacks", false: "has"}[cmd == "has"], want, labels)
			}
		}
	case "tok":
		// tok FILE "NEEDLE" TYPE: a semantic token of TYPE starts at NEEDLE.
		var st struct{ Data []int }
		json.Unmarshal(sc.last, &st)
		p := sc.pos(arg(0), arg(1))
		line, col, found := 0, 0, ""
		for i := 0; i+4 < len(st.Data); i += 5 {
			if st.Data[i] > 0 {
				line, col = line+st.Data[i], st.Data[i+1]
			} else {
				col += st.Data[i+1]
			}
			if line == p["line"] && col == p["character"] {
				found = tokenTypes[st.Data[i+3]]
			}
		}
		if found != arg(2) {
			t.Errorf("line %d: token at %s is %q, want %q", n, arg(1), found, arg(2))
		}
	case "null":
		if sc.lastErr != nil || string(sc.last) != "null" && len(sc.last) != 0 {
			t.Errorf("line %d: want null, got %s %v", n, sc.last, sc.lastErr)
		}
	case "count":
		want, _ := strconv.Atoi(arg(0))
		var list []json.RawMessage
		var cl struct{ Items []json.RawMessage }
		if json.Unmarshal(sc.last, &cl) == nil && cl.Items != nil {
			list = cl.Items
		} else if err := json.Unmarshal(sc.last, &list); err != nil {
			t.Errorf("line %d: not a list: %s", n, sc.last)
		}
		if len(list) != want {
			t.Errorf("line %d: want %d items, got %s", n, want, sc.last)
		}
	case "error":
		want, _ := strconv.Atoi(arg(0))
		if sc.lastErr == nil || sc.lastErr.Code != want {
			t.Errorf("line %d: want error %d, got %s %v", n, want, sc.last, sc.lastErr)
		}
	case "want":
		var a, b any
		json.Unmarshal(sc.last, &a)
		if err := json.Unmarshal([]byte(arg(0)), &b); err != nil {
			t.Fatalf("line %d: %v", n, err)
		}
		ja, _ := json.Marshal(a)
		jb, _ := json.Marshal(b)
		if !bytes.Equal(ja, jb) {
			t.Errorf("line %d: reply\n%s\nwant\n%s", n, ja, jb)
		}
	case "apply":
		sc.applyReply(n)
	case "file~", "file!~":
		for _, a := range args[1:] {
			want, err := strconv.Unquote(a)
			if err != nil {
				t.Fatalf("line %d: %v", n, err)
			}
			if strings.Contains(sc.texts[arg(0)], want) != (cmd == "file~") {
				t.Errorf("line %d: %s %s %q:\n%s", n, arg(0), map[bool]string{true: "lacks", false: "holds"}[cmd == "file~"], want, sc.texts[arg(0)])
			}
		}
	case "sync":
		name := arg(0)
		sc.versions[name]++
		sc.c.notify("textDocument/didChange", map[string]any{
			"textDocument":   map[string]any{"uri": sc.uri(name), "version": sc.versions[name]},
			"contentChanges": []any{map[string]any{"text": sc.texts[name]}},
		})
	case "want-file":
		got, want := sc.texts[arg(0)], sc.sections[arg(1)]
		if got != want {
			t.Errorf("line %d: %s is\n%s\nwant\n%s", n, arg(0), got, want)
		}
	default:
		t.Fatalf("line %d: unknown command %s", n, cmd)
	}
}

// jsonStrings lists every string value in a JSON document.
func jsonStrings(b []byte) []string {
	var v any
	json.Unmarshal(b, &v)
	var out []string
	var walk func(any)
	walk = func(v any) {
		switch v := v.(type) {
		case string:
			out = append(out, v)
		case []any:
			for _, x := range v {
				walk(x)
			}
		case map[string]any:
			keys := make([]string, 0, len(v))
			for k := range v {
				keys = append(keys, k)
			}
			sort.Strings(keys)
			for _, k := range keys {
				walk(v[k])
			}
		}
	}
	walk(v)
	return out
}

type wireRange struct {
	Start struct{ Line, Character int } `json:"start"`
	End   struct{ Line, Character int } `json:"end"`
}

func (sc *scenario) applyEdit(name string, r map[string]any, text string) {
	b, _ := json.Marshal(r)
	var wr wireRange
	json.Unmarshal(b, &wr)
	sc.applyWire(name, []wireEdit{{Range: wr, NewText: text}})
}

type wireEdit struct {
	Range   wireRange `json:"range"`
	NewText string    `json:"newText"`
}

// applyWire applies edits given in one text's coordinates, last first.
func (sc *scenario) applyWire(name string, edits []wireEdit) {
	text := []byte(sc.texts[name])
	m := lang.NewMapper(text)
	type span struct {
		s, e int
		t    string
	}
	var spans []span
	for _, e := range edits {
		s := m.PositionOffset(lang.Position{Line: e.Range.Start.Line, Col: e.Range.Start.Character}, sc.enc)
		en := m.PositionOffset(lang.Position{Line: e.Range.End.Line, Col: e.Range.End.Character}, sc.enc)
		if e.Range.End.Line >= m.Lines() {
			en = len(text)
		}
		spans = append(spans, span{s, en, e.NewText})
	}
	sort.Slice(spans, func(i, j int) bool { return spans[i].s > spans[j].s })
	for _, sp := range spans {
		text = append(text[:sp.s:sp.s], append([]byte(sp.t), text[sp.e:]...)...)
	}
	sc.texts[name] = string(text)
}

func (sc *scenario) applyReply(n int) {
	if strings.HasPrefix(sc.lastCmd, "format ") {
		var edits []wireEdit
		if err := json.Unmarshal(sc.last, &edits); err != nil {
			sc.t.Fatalf("line %d: %v", n, err)
		}
		sc.applyWire(strings.TrimPrefix(sc.lastCmd, "format "), edits)
		return
	}
	var we struct {
		Changes map[string][]wireEdit `json:"changes"`
		Edit    *struct {
			Changes map[string][]wireEdit `json:"changes"`
		} `json:"edit"`
	}
	raw := sc.last
	var list []json.RawMessage
	if json.Unmarshal(raw, &list) == nil && len(list) > 0 {
		raw = list[0] // the first code action
	}
	if err := json.Unmarshal(raw, &we); err != nil {
		sc.t.Fatalf("line %d: %v", n, err)
	}
	ch := we.Changes
	if we.Edit != nil {
		ch = we.Edit.Changes
	}
	if len(ch) == 0 {
		sc.t.Errorf("line %d: no edits in %s", n, raw)
	}
	for name, edits := range ch {
		sc.applyWire(name, edits)
	}
}

var markerRe = regexp.MustCompile(`#@([a-z0-9-]+)(?:\("((?:[^"\\]|\\.)*)"\))?`)

type wantDiag struct {
	line int
	rule string
	msg  string
}

// checkDiags matches the published diagnostics of a file with its markers.
func (sc *scenario) checkDiags(n int, name string) {
	t := sc.t
	var want []wantDiag
	for i, l := range strings.Split(sc.texts[name], "\n") {
		for _, m := range markerRe.FindAllStringSubmatch(l, -1) {
			msg, _ := strconv.Unquote(`"` + m[2] + `"`)
			want = append(want, wantDiag{i, m[1], msg})
		}
	}
	pub, ok := sc.c.published(string(sc.uri(name)))
	if !ok && len(want) > 0 {
		t.Errorf("line %d: nothing published for %s", n, name)
		return
	}
	if v, open := sc.versions[name]; open && ok && (pub.Version == nil || *pub.Version != v) {
		t.Errorf("line %d: %s published for version %v, want %d", n, name, pub.Version, v)
	}
	used := make([]bool, len(want))
	for _, raw := range pub.Diagnostics {
		var d struct {
			Range   wireRange `json:"range"`
			Code    string    `json:"code"`
			Message string    `json:"message"`
		}
		json.Unmarshal(raw, &d)
		hit := false
		for i, w := range want {
			if !used[i] && w.line == d.Range.Start.Line && w.rule == d.Code && strings.Contains(d.Message, w.msg) {
				used[i], hit = true, true
				break
			}
		}
		if !hit {
			t.Errorf("line %d: unexpected finding in %s line %d: %s %q", n, name, d.Range.Start.Line, d.Code, d.Message)
		}
		if d.Range.End.Line != d.Range.Start.Line {
			t.Errorf("line %d: finding %s spans lines %d-%d; ranges must be clipped to their line", n, d.Code, d.Range.Start.Line, d.Range.End.Line)
		}
	}
	for i, w := range want {
		if !used[i] {
			t.Errorf("line %d: missing finding in %s line %d: %s %q", n, name, w.line, w.rule, w.msg)
		}
	}
}
