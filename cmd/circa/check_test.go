package main

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/santhosh-tekuri/jsonschema/v6"
)

func circa(t *testing.T, stdin string, args ...string) (int, string, string) {
	t.Helper()
	var out, errb bytes.Buffer
	code := run(args, strings.NewReader(stdin), &out, &errb)
	return code, out.String(), errb.String()
}

// good is a clean loop: condenser 1 m above the evaporator. Its only
// finding is the tilt-limits note.
const good = `loop l {
  fluid water
  node a at (0, 0, 0) m
  node b at (0, 0, 0.2) m
  node c at (0, 0, 1.2) m
  node d at (0, 0, 1.0) m
  evaporator e from a to b { length 0.2 m; rise 0.2 m; bore 8 mm }
  pipe up from b to c { length 1 m; rise 1 m; bore 8 mm }
  condenser k from c to d { length 0.3 m; rise -0.2 m; bore 8 mm }
  pipe down from d to a { length 1.1 m; rise -1 m; bore 8 mm }
}
`

// bad has an error after a two-byte character on its line ("²" is two
// bytes in UTF-8, one UTF-16 unit): the rise 0.5 m of a 0.2 m evaporator;
// and a warning (a copied pipe), and a tab before a finding.
const bad = "loop l {\n" +
	"  fluid water\n" +
	"  node a\n  node b\n  node c\n  node d\n" +
	"  evaporator e from a to b { wetted_area 1 cm²; length 0.2 m; rise 0.5 m; bore 8 mm }\n" +
	"  pipe up from b to c { length 1 m; rise 0.7 m; bore 8 mm }\n" +
	"  condenser k from c to d { length 0.3 m; rise -0.2 m; bore 8 mm }\n" +
	"  pipe down from d to a { length 1.1 m; rise -1 m; bore 8 mm }\n" +
	"\tpipe down2 from d to a { length 1.1 m; rise -1 m; bore 8 mm }\n" +
	"}\n"

func TestCheckExitCodes(t *testing.T) {
	dir := t.TempDir()
	write := func(name, text string) string {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	g := write("good.loop", good)
	b := write("bad.loop", bad)
	warnOnly := write("warn.loop", strings.TrimSuffix(good, "}\n")+"  node spare\n}\n")
	for _, tc := range []struct {
		args []string
		want int
	}{
		{[]string{"check", "--no-estimates", g}, exitOK},
		{[]string{"check", "--no-estimates", b}, exitFindings},
		{[]string{"check", "--no-estimates", warnOnly}, exitOK},
		{[]string{"check", "--no-estimates", "--fail-on", "warning", warnOnly}, exitFindings},
		{[]string{"check", warnOnly, "--fail-on=warning", "--no-estimates"}, exitFindings}, // flags after paths
		{[]string{"check", "--no-estimates", "--fail-on", "info", g}, exitFindings},
		{[]string{"check", "--no-estimates", filepath.Join(dir, "missing.loop")}, exitUsage},
		{[]string{"check", "--no-estimates", g, filepath.Join(dir, "missing.loop")}, exitUsage},
		{[]string{"check", "--format", "xml", g}, exitUsage},
		{[]string{"check", "--fail-on", "hint", g}, exitUsage},
		{[]string{"check", "--bogus", g}, exitUsage},
		{[]string{"check", "--help"}, exitOK},
	} {
		if code, out, errs := circa(t, "", tc.args...); code != tc.want {
			t.Errorf("%v: exit %d, want %d\n%s%s", tc.args, code, tc.want, out, errs)
		}
	}
}

func TestCheckText(t *testing.T) {
	t.Setenv("NO_COLOR", "")
	code, out, _ := circa(t, bad, "check", "--no-estimates", "-")
	if code != exitFindings {
		t.Fatalf("exit %d\n%s", code, out)
	}
	if strings.Contains(out, "\x1b[") {
		t.Error("colour written to a non-terminal")
	}
	// The rise starts at character 68 of line 7 (byte 69: "²" is two bytes).
	want := "<stdin>:7:68: error: evaporator e rises 0.5 m but is only 0.2 m long [rise-exceeds-length]\n" +
		"  " + strings.Split(bad, "\n")[6] + "\n" +
		"  " + strings.Repeat(" ", 67) + "^~~~~\n"
	if !strings.Contains(out, want) {
		t.Errorf("missing\n%s\nin\n%s", want, out)
	}
	// The tab before the finding's span is kept in the caret line.
	if !strings.Contains(out, "<stdin>:11:7: warning: pipe down2 runs from d to a") || !strings.Contains(out, "\n  \t     ^~~~~\n") {
		t.Errorf("tab not preserved:\n%s", out)
	}
	// Related locations as notes; the summary line closes the output.
	if !regexp.MustCompile(`\n    note: <stdin>:\d+:\d+: pipe down has the same ends\n`).MatchString(out) {
		t.Errorf("no note:\n%s", out)
	}
	if !strings.HasSuffix(out, "1 file checked: 1 error, 1 warning, 1 note\n") {
		t.Errorf("summary:\n%s", out)
	}
}

func TestCheckColour(t *testing.T) {
	var b strings.Builder
	t.Setenv("NO_COLOR", "1")
	if useColour(os.Stdout) {
		t.Error("colour with NO_COLOR set")
	}
	if useColour(&b) {
		t.Error("colour on a buffer")
	}
}

func TestCheckDirectories(t *testing.T) {
	dir := t.TempDir()
	sub := filepath.Join(dir, "sub")
	hidden := filepath.Join(dir, ".hidden")
	for _, d := range []string{sub, hidden} {
		if err := os.MkdirAll(d, 0o755); err != nil {
			t.Fatal(err)
		}
	}
	os.WriteFile(filepath.Join(sub, "a.loop"), []byte(good), 0o644)
	os.WriteFile(filepath.Join(dir, "b.loop"), []byte(good), 0o644)
	os.WriteFile(filepath.Join(hidden, "bad.loop"), []byte(bad), 0o644)
	os.WriteFile(filepath.Join(dir, "notes.txt"), []byte(bad), 0o644)
	code, out, errs := circa(t, "", "check", "--no-estimates", dir)
	if code != exitOK || !strings.HasSuffix(out, "2 files checked: 0 errors, 0 warnings, 2 notes\n") {
		t.Errorf("exit %d\n%s%s", code, out, errs)
	}
}

// The examples shipped with the project: the structural rules find no
// error or warning in them; each loop gets its tilt-limits note.
func TestCheckExamples(t *testing.T) {
	code, out, errs := circa(t, "", "check", "--no-estimates", "../../testdata/examples")
	if code != exitOK || !strings.Contains(out, "0 errors, 0 warnings") || strings.Count(out, "[tilt-limits]") != 5 {
		t.Errorf("exit %d\n%s%s", code, out, errs)
	}
}

func TestCheckJSON(t *testing.T) {
	code, out, _ := circa(t, bad, "check", "--no-estimates", "--format", "json")
	if code != exitFindings {
		t.Fatalf("exit %d", code)
	}
	var rep struct {
		Version  int
		Findings []struct {
			Rule, Severity, File, Message string
			Start, End                    struct{ Line, Column, UTF16, Offset int }
			Related                       []struct{ Message string }
			Fixes                         []struct {
				Title string
				Edits []struct{ NewText string }
			}
		}
		Summary struct{ Files, Errors, Warnings, Notes int }
	}
	if err := json.Unmarshal([]byte(out), &rep); err != nil {
		t.Fatal(err)
	}
	if rep.Version != 1 || rep.Summary.Files != 1 || rep.Summary.Errors != 1 || rep.Summary.Warnings != 1 {
		t.Errorf("%+v", rep)
	}
	found := false
	for _, f := range rep.Findings {
		if f.Rule == "rise-exceeds-length" {
			found = true
			// "²" is two UTF-8 bytes and one UTF-16 code unit (Unicode 15, §3.9).
			if f.File != "<stdin>" || f.Start.Line != 7 || f.Start.Column != 69 || f.Start.UTF16 != 68 || f.End.Column != 74 {
				t.Errorf("position %+v", f)
			}
			if f.Start.Offset != strings.Index(bad, "0.5 m") {
				t.Errorf("offset %d", f.Start.Offset)
			}
		}
	}
	if !found {
		t.Error("no rise-exceeds-length finding")
	}
}

// SARIF output is validated against the OASIS SARIF 2.1.0 schema
// (errata 01), testdata/sarif-2.1.0.json: a byte-for-byte copy of
// Schemata/sarif-schema-2.1.0.json of the OASIS TC's sarif-spec repository,
// obtained from the Go module github.com/securego/gosec/v2@v2.30.0
// (report/sarif/testdata/sarif-schema-2.1.0.json) and checked against the
// OASIS repository's text.
func TestCheckSARIF(t *testing.T) {
	sch := sarifSchema(t)
	// A file with fixes (a loop not closed, a misspelt silencer) and related locations.
	src := strings.Replace(bad, "  pipe down from d to a", "  pipe down from d to x", 1)
	src = strings.Replace(src, "  node d\n", "  node d\n  node x\n", 1)
	src = strings.Replace(src, "\tpipe down2 from d to a { length 1.1 m; rise -1 m; bore 8 mm }\n", "  pipe p from a to b { length 1 m; bore 8 mm }   # allow: dangling-ends\n", 1)
	for _, in := range []string{bad, src, good} {
		code, out, errs := circa(t, in, "check", "--no-estimates", "--format", "sarif")
		if code == exitUsage {
			t.Fatalf("exit %d: %s", code, errs)
		}
		inst, err := jsonschema.UnmarshalJSON(strings.NewReader(out))
		if err != nil {
			t.Fatal(err)
		}
		if err := sch.Validate(inst); err != nil {
			t.Errorf("SARIF output does not validate: %v\n%s", err, out)
		}
		var log struct {
			Runs []struct {
				ColumnKind string
				Tool       struct {
					Driver struct{ Rules []struct{ ID string } }
				}
				Results []struct {
					RuleID    string
					RuleIndex int
					Fixes     []any
				}
			}
		}
		if err := json.Unmarshal([]byte(out), &log); err != nil {
			t.Fatal(err)
		}
		r := log.Runs[0]
		if r.ColumnKind != "utf16CodeUnits" {
			t.Errorf("columnKind %q", r.ColumnKind)
		}
		for _, res := range r.Results {
			if res.RuleIndex < 0 || res.RuleIndex >= len(r.Tool.Driver.Rules) || r.Tool.Driver.Rules[res.RuleIndex].ID != res.RuleID {
				t.Errorf("result %s has rule index %d", res.RuleID, res.RuleIndex)
			}
		}
	}
}

func TestCheckGitHub(t *testing.T) {
	_, out, _ := circa(t, bad, "check", "--no-estimates", "--format", "github")
	want := "::error file=<stdin>,line=7,col=68,endLine=7,endColumn=73,title=rise-exceeds-length::evaporator e rises 0.5 m but is only 0.2 m long\n"
	if !strings.Contains(out, want) {
		t.Errorf("missing %q in\n%s", want, out)
	}
	if !strings.Contains(out, "::warning file=<stdin>,line=11,") || !strings.Contains(out, "%0Anote: <stdin>:") {
		t.Errorf("warning or note missing:\n%s", out)
	}
}

func TestExplain(t *testing.T) {
	code, out, _ := circa(t, "", "explain")
	if code != exitOK || !strings.Contains(out, "rise-misclosure") || !strings.Contains(out, "topology:") || !strings.Contains(out, "syntax") {
		t.Errorf("explain: %d\n%s", code, out)
	}
	code, out, _ = circa(t, "", "explain", "loop-not-closed")
	for _, s := range []string{"loop-not-closed (error, topology)", "Why:", "Example:", "Fix:", "# allow: loop-not-closed"} {
		if code != exitOK || !strings.Contains(out, s) {
			t.Errorf("explain loop-not-closed lacks %q:\n%s", s, out)
		}
	}
	code, _, errs := circa(t, "", "explain", "loop-not-close")
	if code != exitUsage || !strings.Contains(errs, "did you mean loop-not-closed?") {
		t.Errorf("unknown rule: %d %s", code, errs)
	}
}
