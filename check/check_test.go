package check

import (
	"fmt"
	"io/fs"
	"path/filepath"
	"regexp"
	"sort"
	"strings"
	"testing"

	"golang.org/x/tools/txtar"

	"circa/lang"
)

// The rule tests live in testdata/check/*.txtar. Every top-level .loop file
// of an archive is checked as a model of its own (files in subdirectories
// are only included). Expected findings are written as trailing comments on
// the line where the finding starts:
//
//	pipe p from a to b { length 1 m }   # want: missing-geometry "no bore"
//
// several per line separated by commas. Expected and actual findings are
// matched one to one: a missing or an extra finding fails. The archive's
// comment may say "disable: RULE, RULE" to keep rules out of its files.
// Estimates are skipped (these are the structural rules) unless the comment
// has a line "estimates"; the search for tilt limits is skipped even then.

type archiveFS map[string][]byte

func (a archiveFS) ReadFile(p string) ([]byte, error) {
	if b, ok := a[filepath.ToSlash(filepath.Clean(p))]; ok {
		return b, nil
	}
	return nil, fs.ErrNotExist
}

type want struct {
	file string
	line int // zero-based
	rule string
	sub  string
}

var wantItem = regexp.MustCompile(`([a-z][a-z0-9-]*)(?:\s+"((?:[^"\\]|\\.)*)")?`)

func parseWants(file string, src []byte) []want {
	var out []want
	for i, line := range strings.Split(string(src), "\n") {
		j := strings.Index(line, "# want:")
		if j < 0 {
			if j = strings.Index(line, " want:"); j < 0 || !strings.Contains(line[:j+1], "#") {
				continue
			}
			j++
		} else {
			j += 2
		}
		body := line[j+len("want:"):]
		for _, m := range wantItem.FindAllStringSubmatch(body, -1) {
			out = append(out, want{file, i, m[1], strings.ReplaceAll(m[2], `\"`, `"`)})
		}
	}
	return out
}

type archiveCase struct {
	name  string // archive/file
	root  string
	fsys  archiveFS
	opts  Options
	wants []want
	set   []lang.Override // parameters given other values (lang.Model.With)
}

func loadArchives(t *testing.T) []archiveCase {
	t.Helper()
	paths, err := filepath.Glob("../testdata/check/*.txtar")
	if err != nil || len(paths) == 0 {
		t.Fatalf("no archives: %v", err)
	}
	var out []archiveCase
	for _, p := range paths {
		ar, err := txtar.ParseFile(p)
		if err != nil {
			t.Fatal(err)
		}
		fsys := archiveFS{}
		for _, f := range ar.Files {
			fsys[f.Name] = f.Data
		}
		opts := Options{SkipEstimates: true, Disabled: map[string]bool{}}
		sets := map[string][]lang.Override{}
		for _, line := range strings.Split(string(ar.Comment), "\n") {
			if rest, ok := strings.CutPrefix(strings.TrimSpace(line), "set "); ok {
				file, set, _ := strings.Cut(rest, ":")
				o, err := lang.ParseOverride(set)
				if err != nil {
					t.Fatalf("%s: %v", p, err)
				}
				sets[file] = append(sets[file], o)
			}
			if strings.TrimSpace(line) == "estimates" {
				opts.SkipEstimates, opts.NoTilt = false, true
			}
			if rest, ok := strings.CutPrefix(strings.TrimSpace(line), "disable:"); ok {
				for _, id := range strings.Split(rest, ",") {
					opts.Disabled[strings.TrimSpace(id)] = true
				}
			}
		}
		for _, f := range ar.Files {
			if !strings.HasSuffix(f.Name, ".loop") || strings.Contains(f.Name, "/") {
				continue
			}
			var ws []want
			for _, g := range ar.Files {
				ws = append(ws, parseWants(g.Name, g.Data)...)
			}
			// Wants in included files count for every root that includes them;
			// keep those of this root and of files it reads.
			out = append(out, archiveCase{name: filepath.Base(p) + "/" + f.Name, root: f.Name, fsys: fsys, opts: opts, wants: ws, set: sets[f.Name]})
		}
	}
	return out
}

func line(m *lang.Model, d lang.Diagnostic) int {
	f := m.Files[d.Loc.File]
	if f == nil {
		return -1
	}
	return f.Mapper.OffsetLine(d.Loc.Span.Start)
}

func render(m *lang.Model, d lang.Diagnostic) string {
	return fmt.Sprintf("%s:%d: %s [%s]", d.Loc.File, line(m, d)+1, d.Message(), d.Rule)
}

func TestRules(t *testing.T) {
	for _, ac := range loadArchives(t) {
		t.Run(ac.name, func(t *testing.T) {
			m := lang.LoadSource(ac.root, ac.fsys[ac.root], ac.fsys)
			if len(ac.set) > 0 {
				var err error
				if m, err = m.With(ac.set...); err != nil {
					t.Fatal(err)
				}
			}
			got := Run(m, ac.opts)
			var wants []want
			for _, w := range ac.wants {
				if _, read := m.Files[w.file]; read {
					wants = append(wants, w)
				}
			}
			used := make([]bool, len(got))
			for _, w := range wants {
				found := false
				for i, d := range got {
					if !used[i] && d.Rule == w.rule && d.Loc.File == w.file && line(m, d) == w.line && strings.Contains(d.Message(), w.sub) {
						used[i], found = true, true
						break
					}
				}
				if !found {
					t.Errorf("%s:%d: missing %s %q", w.file, w.line+1, w.rule, w.sub)
				}
			}
			for i, d := range got {
				if !used[i] {
					t.Errorf("unexpected: %s", render(m, d))
				}
			}
		})
	}
}

// applyEdits applies edits to one file's text (they must not overlap).
func applyEdits(src []byte, edits []lang.Edit) []byte {
	sort.Slice(edits, func(i, j int) bool { return edits[i].Loc.Span.Start > edits[j].Loc.Span.Start })
	out := append([]byte(nil), src...)
	for _, e := range edits {
		out = append(out[:e.Loc.Span.Start], append([]byte(e.NewText), out[e.Loc.Span.End:]...)...)
	}
	return out
}

// TestFixes applies every suggested fix and checks that the finding goes
// away (the rule reports one finding fewer) and no new errors appear.
func TestFixes(t *testing.T) {
	n := 0
	for _, ac := range loadArchives(t) {
		m := lang.LoadSource(ac.root, ac.fsys[ac.root], ac.fsys)
		before := Run(m, ac.opts)
		count := func(ds []lang.Diagnostic, rule string) int {
			k := 0
			for _, d := range ds {
				if d.Rule == rule {
					k++
				}
			}
			return k
		}
		errs := func(ds []lang.Diagnostic) int {
			k := 0
			for _, d := range ds {
				if d.Severity == lang.Error {
					k++
				}
			}
			return k
		}
		for _, d := range before {
			for _, fx := range d.Fixes {
				n++
				fsys := archiveFS{}
				for k, v := range ac.fsys {
					fsys[k] = v
				}
				byFile := map[string][]lang.Edit{}
				for _, e := range fx.Edits {
					byFile[e.Loc.File] = append(byFile[e.Loc.File], e)
				}
				for file, es := range byFile {
					fsys[file] = applyEdits(fsys[file], es)
				}
				m2 := lang.LoadSource(ac.root, fsys[ac.root], fsys)
				after := Run(m2, ac.opts)
				if count(after, d.Rule) >= count(before, d.Rule) {
					t.Errorf("%s: fix %q for %s left the finding:\n%s", ac.name, fx.Title, render(m, d), fsys[ac.root])
				}
				if errs(after) > errs(before) {
					t.Errorf("%s: fix %q for %s added errors: %v", ac.name, fx.Title, render(m, d), after)
				}
			}
		}
	}
	if n == 0 {
		t.Fatal("no fixes were tried")
	}
}

// TestCoverage checks that every rule that runs has a triggering example
// (a want naming it) and a clean one (a file named RULE.ok.loop).
func TestCoverage(t *testing.T) {
	triggered, clean := map[string]bool{}, map[string]bool{}
	for _, ac := range loadArchives(t) {
		for _, w := range ac.wants {
			triggered[w.rule] = true
		}
		if id, ok := strings.CutSuffix(ac.root, ".ok.loop"); ok {
			clean[id] = true
			for _, w := range ac.wants {
				if w.file == ac.root && w.rule == id {
					t.Errorf("%s: the clean example expects %s", ac.name, id)
				}
			}
		}
	}
	for _, r := range Rules() {
		if r.Run == nil && r.Category != CategoryAllow {
			continue
		}
		if r.Category == CategoryMargin {
			continue
		}
		if !triggered[r.ID] {
			t.Errorf("rule %s has no triggering example", r.ID)
		}
		if !clean[r.ID] {
			t.Errorf("rule %s has no clean example (%s.ok.loop)", r.ID, r.ID)
		}
	}
}

func TestRegistry(t *testing.T) {
	for _, r := range Rules() {
		if !regexp.MustCompile(`^[a-z]+(-[a-z]+)*$`).MatchString(r.ID) {
			t.Errorf("rule id %q is not kebab-case", r.ID)
		}
		if r.Summary == "" || r.Rationale == "" || r.Example == "" || r.Fix == "" {
			t.Errorf("rule %s lacks text", r.ID)
		}
		if got, ok := Lookup(r.ID); !ok || got != r {
			t.Errorf("Lookup(%s)", r.ID)
		}
	}
	if _, ok := Lookup("no-such-rule"); ok {
		t.Error("Lookup of an unknown rule succeeded")
	}
}

// A rule that panics is reported as an internal finding; the others still run.
func TestInternal(t *testing.T) {
	r := &Rule{ID: "test-panics", Category: CategoryTopology, Severity: lang.Error, Summary: "s", Rationale: "r", Example: "e", Fix: "f",
		Run: func(c *Context) { panic("boom") }}
	Register(r)
	defer func() { regMu.Lock(); delete(registry, r.ID); regMu.Unlock() }()
	m := lang.LoadSource("x.loop", []byte("loop l {\n  fluid water\n}\n"), archiveFS{})
	ds := Run(m, Options{SkipEstimates: true})
	var internal, other int
	for _, d := range ds {
		if d.Rule == "internal" && strings.Contains(d.Message(), "boom") {
			internal++
		} else {
			other++
		}
	}
	if internal != 1 || other == 0 {
		t.Errorf("internal %d other %d: %v", internal, other, ds)
	}
	if Run(nil, Options{}) != nil {
		t.Error("Run(nil) found something")
	}
}

// Every finding has the severity "circa explain" documents for its rule: the
// rule's severity, or error where the rule says when it escalates.
func TestSeveritiesAsDocumented(t *testing.T) {
	check := func(name string, ds []lang.Diagnostic) {
		for _, d := range ds {
			r, ok := Lookup(d.Rule)
			if !ok || d.Severity == r.Severity || (d.Severity == lang.Error && r.Escalation != "") {
				continue
			}
			t.Errorf("%s: %s reported as %s, documented as %s", name, d.Rule, d.Severity, r.SeverityText())
		}
	}
	for _, ac := range loadArchives(t) {
		opts := ac.opts
		opts.SkipEstimates, opts.NoTilt = false, true
		m := lang.LoadSource(ac.root, ac.fsys[ac.root], ac.fsys)
		check(ac.name, Run(m, opts))
	}
	// A charge larger than the loop full of liquid is an error of a rule
	// documented as a warning that escalates.
	src := `
loop l {
  fluid water
  charge 5 kg
  node a at (0, 0, 0) m
  node b at (0, 0, 0.2) m
  node c at (0, 0, 1.2) m
  node d at (0, 0, 1.0) m
  evaporator e from a to b { length 0.2 m; rise 0.2 m; bore 10 mm; heat 150 W }
  pipe up from b to c { length 1 m; bore 10 mm }
  condenser k from c to d { length 0.3 m; bore 10 mm; conductance 40 W/K; sink 25 °C }
  pipe down from d to a { length 1.1 m; bore 10 mm }
}
`
	m := lang.LoadSource("over.loop", []byte(src), archiveFS{})
	ds := Run(m, Options{NoTilt: true})
	found := false
	for _, d := range ds {
		if d.Rule == "margin-charge" && d.Severity == lang.Error {
			found = true
		}
	}
	if !found {
		t.Errorf("no margin-charge error for 5 kg in about 0.2 L: %v", ds)
	}
	check("over.loop", ds)
}
