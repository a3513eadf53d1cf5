package main

import (
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"io/fs"
	"net/url"
	"os"
	"path/filepath"
	"strings"
	"unicode/utf8"

	"circa/check"
	"circa/lang"
)

func init() {
	register(&command{name: "check", summary: "check .loop files and report findings", run: runCheck})
}

const checkUsage = `Usage: circa check [--format text|json|sarif|github] [--fail-on error|warning|info]
                   [--no-estimates] [PATH|-]...

Checks .loop files: the language (syntax, units, names), the loop's
topology and geometry, the circulation direction and tilt limits, traps,
and (unless --no-estimates) the estimated margins. Directories are searched
recursively for *.loop files, skipping hidden directories; "-" (or no
argument) reads standard input, reported as <stdin>.

Formats: text (file:line:col: severity: message [rule], like a compiler),
json (docs/check-json.md), sarif (SARIF 2.1.0), github (workflow
annotations). "circa explain RULE" tells what a rule checks and how to fix
its findings.

Exit status: 0 no finding at or above --fail-on (default error), 1 some,
2 usage or I/O errors.

Options:
`

// checkedFile is one root file's model and report.
type checkedFile struct {
	path  string
	model *lang.Model
	rep   *check.Report
}

// checkFinding is a diagnostic with the model that can locate it.
type checkFinding struct {
	d lang.Diagnostic
	m *lang.Model
}

// splitFlags moves flags written after the paths in front of them, so that
// "circa check dir --format json" works; "--" ends the flags.
func splitFlags(args []string, valued map[string]bool) []string {
	var flags, rest []string
	for i := 0; i < len(args); i++ {
		a := args[i]
		if a == "--" {
			rest = append(rest, args[i+1:]...)
			break
		}
		if strings.HasPrefix(a, "-") && a != "-" {
			flags = append(flags, a)
			name := strings.TrimLeft(a, "-")
			if valued[name] && !strings.Contains(a, "=") && i+1 < len(args) {
				flags = append(flags, args[i+1])
				i++
			}
			continue
		}
		rest = append(rest, a)
	}
	return append(append(flags, "--"), rest...)
}

func runCheck(args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	fl := flag.NewFlagSet("check", flag.ContinueOnError)
	fl.SetOutput(stderr)
	format := fl.String("format", "text", "output format: text, json, sarif or github")
	failOn := fl.String("fail-on", "error", "least severe checkFinding that fails the check: error, warning or info")
	noEst := fl.Bool("no-estimates", false, "skip the estimated margins; structural checks only")
	fl.Usage = func() {
		fmt.Fprint(stderr, checkUsage)
		fl.PrintDefaults()
	}
	if err := fl.Parse(splitFlags(args, map[string]bool{"format": true, "fail-on": true})); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			return exitOK
		}
		return exitUsage
	}
	opts := check.Options{SkipEstimates: *noEst}
	sev, ok := lang.ParseSeverity(*failOn)
	if !ok || sev == lang.Hint {
		fmt.Fprintf(stderr, "circa check: --fail-on takes error, warning or info, not %q\n", *failOn)
		return exitUsage
	}
	opts.FailOn = sev
	switch *format {
	case "text", "json", "sarif", "github":
	default:
		fmt.Fprintf(stderr, "circa check: unknown --format %q (text, json, sarif or github)\n", *format)
		return exitUsage
	}
	paths := fl.Args()
	if len(paths) == 0 {
		paths = []string{"-"}
	}
	status := exitOK
	var runs []checkedFile
	stdinRead := false
	for _, p := range paths {
		if p == "-" {
			if stdinRead {
				continue
			}
			stdinRead = true
			src, err := io.ReadAll(io.LimitReader(stdin, lang.MaxFileSize+1))
			if err != nil {
				fmt.Fprintf(stderr, "circa check: reading standard input: %v\n", err)
				status = exitUsage
				continue
			}
			m := lang.LoadSource("<stdin>", src, nil)
			runs = append(runs, checkedFile{"<stdin>", m, check.RunReport(m, opts)})
			continue
		}
		info, err := os.Stat(p)
		if err != nil {
			fmt.Fprintf(stderr, "circa check: %v\n", err)
			status = exitUsage
			continue
		}
		var files []string
		if info.IsDir() {
			err = filepath.WalkDir(p, func(path string, d fs.DirEntry, err error) error {
				if err != nil {
					fmt.Fprintf(stderr, "circa check: %v\n", err)
					status = exitUsage
					return nil
				}
				if d.IsDir() && path != p && strings.HasPrefix(d.Name(), ".") {
					return filepath.SkipDir
				}
				if !d.IsDir() && strings.HasSuffix(d.Name(), ".loop") {
					files = append(files, path)
				}
				return nil
			})
			if err != nil {
				fmt.Fprintf(stderr, "circa check: %v\n", err)
				status = exitUsage
			}
		} else {
			files = []string{p}
		}
		for _, f := range files {
			if _, err := os.ReadFile(f); err != nil {
				fmt.Fprintf(stderr, "circa check: %v\n", err)
				status = exitUsage
				continue
			}
			m := lang.Load(f, nil)
			runs = append(runs, checkedFile{f, m, check.RunReport(m, opts)})
		}
	}
	findings := collectFindings(runs)
	var err error
	switch *format {
	case "text":
		err = writeText(stdout, runs, findings, useColour(stdout))
	case "json":
		err = writeJSON(stdout, runs, findings)
	case "sarif":
		err = writeSARIF(stdout, findings)
	case "github":
		err = writeGitHub(stdout, findings)
	}
	if err != nil {
		fmt.Fprintf(stderr, "circa check: writing output: %v\n", err)
		return exitUsage
	}
	if status != exitOK {
		return status
	}
	for _, f := range findings {
		if f.d.Severity <= opts.FailOn {
			return exitFindings
		}
	}
	return exitOK
}

// collectFindings merges the findings of every run, dropping repeats (an included
// file checked on its own and through its includer reports the same
// finding twice).
func collectFindings(runs []checkedFile) []checkFinding {
	type key struct {
		file       string
		start, end int
		rule, msg  string
	}
	seen := map[key]bool{}
	var out []checkFinding
	for _, r := range runs {
		for _, d := range r.rep.Diagnostics {
			k := key{d.Loc.File, d.Loc.Span.Start, d.Loc.Span.End, d.Rule, d.Message()}
			if seen[k] {
				continue
			}
			seen[k] = true
			out = append(out, checkFinding{d, r.model})
		}
	}
	return out
}

// useColour reports whether w is a terminal and NO_COLOR is unset (or
// empty, as the NO_COLOR convention has it).
func useColour(w io.Writer) bool {
	if os.Getenv("NO_COLOR") != "" {
		return false
	}
	f, ok := w.(*os.File)
	if !ok {
		return false
	}
	st, err := f.Stat()
	return err == nil && st.Mode()&os.ModeCharDevice != 0
}

// checkPos is a 1-based line with 1-based byte, character and UTF-16 columns.
type checkPos struct {
	Line, Byte, Char, UTF16 int
}

// checkPosition locates a byte offset in a model's file; ok is false when the
// file is not known (then only the path can be shown).
func checkPosition(m *lang.Model, file string, off int) (checkPos, bool) {
	f := m.Files[file]
	if f == nil || f.Mapper == nil {
		return checkPos{Line: 1, Byte: 1, Char: 1, UTF16: 1}, false
	}
	mp := f.Mapper
	b := mp.OffsetPosition(off, lang.UTF8)
	u := mp.OffsetPosition(off, lang.UTF16)
	start := mp.LineStart(b.Line)
	chars := utf8.RuneCount(mp.Text()[start : start+b.Col])
	return checkPos{Line: b.Line + 1, Byte: b.Col + 1, Char: chars + 1, UTF16: u.Col + 1}, true
}

// checkSpan returns a location's start and end, the end clipped to the start's
// line as the mapper does for editors.
func checkSpan(m *lang.Model, loc lang.Location) (checkPos, checkPos, bool) {
	s, ok := checkPosition(m, loc.File, loc.Span.Start)
	e, _ := checkPosition(m, loc.File, loc.Span.End)
	if e.Line < s.Line || (e.Line == s.Line && e.Byte < s.Byte) {
		e = s
	}
	return s, e, ok
}

const (
	ansiReset = "\x1b[0m"
	ansiBold  = "\x1b[1m"
	ansiRed   = "\x1b[1;31m"
	ansiYel   = "\x1b[1;33m"
	ansiCyan  = "\x1b[1;36m"
	ansiGreen = "\x1b[1;32m"
)

func writeText(w io.Writer, runs []checkedFile, fs []checkFinding, colour bool) error {
	paint := func(code, s string) string {
		if !colour {
			return s
		}
		return code + s + ansiReset
	}
	var b strings.Builder
	counts := map[lang.Severity]int{}
	for _, f := range fs {
		d := f.d
		counts[d.Severity]++
		s, e, ok := checkSpan(f.m, d.Loc)
		code := ansiCyan
		switch d.Severity {
		case lang.Error:
			code = ansiRed
		case lang.Warning:
			code = ansiYel
		}
		if ok {
			fmt.Fprintf(&b, "%s: %s: %s [%s]\n", paint(ansiBold, fmt.Sprintf("%s:%d:%d", d.Loc.File, s.Line, s.Char)), paint(code, d.Severity.String()), d.Message(), d.Rule)
			checkCaret(&b, f.m, d.Loc, s, e, func(x string) string { return paint(ansiGreen, x) })
		} else {
			fmt.Fprintf(&b, "%s: %s: %s [%s]\n", paint(ansiBold, d.Loc.File), paint(code, d.Severity.String()), d.Message(), d.Rule)
		}
		for _, r := range d.Related {
			rs, _, rok := checkSpan(f.m, r.Loc)
			if rok {
				fmt.Fprintf(&b, "    %s %s:%d:%d: %s\n", paint(ansiCyan, "note:"), r.Loc.File, rs.Line, rs.Char, r.Message)
			} else {
				fmt.Fprintf(&b, "    %s %s\n", paint(ansiCyan, "note:"), r.Message)
			}
		}
		for _, fx := range d.Fixes {
			fmt.Fprintf(&b, "    %s %s\n", paint(ansiGreen, "fix:"), fx.Title)
		}
	}
	fmt.Fprintln(&b, checkSummary(runs, counts))
	_, err := io.WriteString(w, b.String())
	return err
}

// checkCaret prints the source line and a caret line under the span; tabs
// before the span are kept so the caret lines up.
func checkCaret(b *strings.Builder, m *lang.Model, loc lang.Location, s, e checkPos, paint func(string) string) {
	f := m.Files[loc.File]
	if f == nil {
		return
	}
	text := f.Mapper.LineText(s.Line - 1)
	fmt.Fprintf(b, "  %s\n", text)
	var pad strings.Builder
	i := 0
	for _, r := range text {
		if i >= s.Char-1 {
			break
		}
		if r == '\t' {
			pad.WriteByte('\t')
		} else {
			pad.WriteByte(' ')
		}
		i++
	}
	n := 1
	if e.Line == s.Line && e.Char > s.Char {
		n = e.Char - s.Char
	}
	fmt.Fprintf(b, "  %s%s\n", pad.String(), paint("^"+strings.Repeat("~", n-1)))
}

func checkPlural(n int, word string) string {
	if n == 1 {
		return fmt.Sprintf("%d %s", n, word)
	}
	return fmt.Sprintf("%d %ss", n, word)
}

// checkSummary is the closing line: files, errors, warnings, and the worst
// margin when the estimates noted any.
func checkSummary(runs []checkedFile, counts map[lang.Severity]int) string {
	s := fmt.Sprintf("%s checked: %s, %s", checkPlural(len(runs), "file"), checkPlural(counts[lang.Error], "error"), checkPlural(counts[lang.Warning], "warning"))
	if n := counts[lang.Info] + counts[lang.Hint]; n > 0 {
		s += ", " + checkPlural(n, "note")
	}
	var worst *check.Margin
	for _, r := range runs {
		if w, ok := r.rep.Worst(); ok && (worst == nil || w.Used > worst.Used) {
			worst = &w
		}
	}
	if worst != nil {
		s += fmt.Sprintf("; worst margin: %s (%.0f %% of the limit", worst.Message, 100*worst.Used)
		if worst.Case != "" {
			s += ", case " + worst.Case
		}
		s += ")"
	}
	return s
}

// JSON output (docs/check-json.md).

type jsonPos struct {
	Line   int `json:"line"`
	Column int `json:"column"`
	UTF16  int `json:"utf16"`
	Offset int `json:"offset"`
}

type jsonLoc struct {
	File  string  `json:"file"`
	Start jsonPos `json:"start"`
	End   jsonPos `json:"end"`
}

type jsonRelated struct {
	jsonLoc
	Message string `json:"message"`
}

type jsonEdit struct {
	jsonLoc
	NewText string `json:"newText"`
}

type jsonFix struct {
	Title string     `json:"title"`
	Edits []jsonEdit `json:"edits"`
}

type jsonFinding struct {
	Rule     string `json:"rule"`
	Severity string `json:"severity"`
	jsonLoc
	Message string        `json:"message"`
	Related []jsonRelated `json:"related"`
	Fixes   []jsonFix     `json:"fixes"`
}

type jsonReport struct {
	Version  int           `json:"version"`
	Findings []jsonFinding `json:"findings"`
	Summary  struct {
		Files    int `json:"files"`
		Errors   int `json:"errors"`
		Warnings int `json:"warnings"`
		Notes    int `json:"notes"`
	} `json:"summary"`
}

func jloc(m *lang.Model, loc lang.Location) jsonLoc {
	s, e, _ := checkSpan(m, loc)
	return jsonLoc{File: loc.File,
		Start: jsonPos{s.Line, s.Byte, s.UTF16, loc.Span.Start},
		End:   jsonPos{e.Line, e.Byte, e.UTF16, max(loc.Span.End, loc.Span.Start)}}
}

func writeJSON(w io.Writer, runs []checkedFile, fs []checkFinding) error {
	rep := jsonReport{Version: 1, Findings: []jsonFinding{}}
	rep.Summary.Files = len(runs)
	for _, f := range fs {
		d := f.d
		switch d.Severity {
		case lang.Error:
			rep.Summary.Errors++
		case lang.Warning:
			rep.Summary.Warnings++
		default:
			rep.Summary.Notes++
		}
		jf := jsonFinding{Rule: d.Rule, Severity: d.Severity.String(), jsonLoc: jloc(f.m, d.Loc), Message: d.Message(),
			Related: []jsonRelated{}, Fixes: []jsonFix{}}
		for _, r := range d.Related {
			jf.Related = append(jf.Related, jsonRelated{jloc(f.m, r.Loc), r.Message})
		}
		for _, fx := range d.Fixes {
			jx := jsonFix{Title: fx.Title, Edits: []jsonEdit{}}
			for _, e := range fx.Edits {
				jx.Edits = append(jx.Edits, jsonEdit{jloc(f.m, e.Loc), e.NewText})
			}
			jf.Fixes = append(jf.Fixes, jx)
		}
		rep.Findings = append(rep.Findings, jf)
	}
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(rep)
}

// SARIF 2.1.0 output.

type sarifText struct {
	Text string `json:"text"`
}

type sarifRegion struct {
	StartLine   int `json:"startLine"`
	StartColumn int `json:"startColumn"`
	EndLine     int `json:"endLine"`
	EndColumn   int `json:"endColumn"`
}

type sarifArtifact struct {
	URI string `json:"uri"`
}

type sarifPhysical struct {
	ArtifactLocation sarifArtifact `json:"artifactLocation"`
	Region           *sarifRegion  `json:"region,omitempty"`
}

type sarifLocation struct {
	ID               *int          `json:"id,omitempty"`
	PhysicalLocation sarifPhysical `json:"physicalLocation"`
	Message          *sarifText    `json:"message,omitempty"`
}

type sarifReplacement struct {
	DeletedRegion   sarifRegion `json:"deletedRegion"`
	InsertedContent *sarifText  `json:"insertedContent,omitempty"`
}

type sarifChange struct {
	ArtifactLocation sarifArtifact      `json:"artifactLocation"`
	Replacements     []sarifReplacement `json:"replacements"`
}

type sarifFix struct {
	Description     sarifText     `json:"description"`
	ArtifactChanges []sarifChange `json:"artifactChanges"`
}

type sarifResult struct {
	RuleID           string          `json:"ruleId"`
	RuleIndex        int             `json:"ruleIndex"`
	Level            string          `json:"level"`
	Message          sarifText       `json:"message"`
	Locations        []sarifLocation `json:"locations"`
	RelatedLocations []sarifLocation `json:"relatedLocations,omitempty"`
	Fixes            []sarifFix      `json:"fixes,omitempty"`
}

type sarifRule struct {
	ID                   string    `json:"id"`
	ShortDescription     sarifText `json:"shortDescription"`
	FullDescription      sarifText `json:"fullDescription"`
	Help                 sarifText `json:"help"`
	DefaultConfiguration struct {
		Level string `json:"level"`
	} `json:"defaultConfiguration"`
	Properties struct {
		Category string `json:"category"`
	} `json:"properties"`
}

func sarifLevel(s lang.Severity) string {
	switch s {
	case lang.Error:
		return "error"
	case lang.Warning:
		return "warning"
	}
	return "note"
}

// sarifURI is a path relative to the working directory, as a URI reference.
func sarifURI(path string) string {
	if path == "<stdin>" {
		return "stdin"
	}
	p := path
	if abs, err := filepath.Abs(path); err == nil {
		if wd, err := os.Getwd(); err == nil {
			if rel, err := filepath.Rel(wd, abs); err == nil && !strings.HasPrefix(rel, "..") {
				p = rel
			} else {
				p = abs
			}
		}
	}
	u := url.URL{Path: filepath.ToSlash(p)}
	if filepath.IsAbs(p) {
		u.Scheme = "file"
	}
	return u.String()
}

func sregion(m *lang.Model, loc lang.Location) *sarifRegion {
	s, e, ok := checkSpan(m, loc)
	if !ok {
		return nil
	}
	return &sarifRegion{s.Line, s.UTF16, e.Line, e.UTF16}
}

func writeSARIF(w io.Writer, fs []checkFinding) error {
	rules := check.Rules()
	index := map[string]int{}
	srules := make([]sarifRule, 0, len(rules))
	for i, r := range rules {
		index[r.ID] = i
		sr := sarifRule{ID: r.ID, ShortDescription: sarifText{r.Summary}, FullDescription: sarifText{r.Rationale},
			Help: sarifText{fmt.Sprintf("%s\n\nExample:\n%s\n\nFix: %s", r.Rationale, r.Example, r.Fix)}}
		sr.DefaultConfiguration.Level = sarifLevel(r.Severity)
		sr.Properties.Category = r.Category
		srules = append(srules, sr)
	}
	results := []sarifResult{}
	for _, f := range fs {
		d := f.d
		i, ok := index[d.Rule]
		if !ok {
			i = -1
		}
		res := sarifResult{RuleID: d.Rule, RuleIndex: i, Level: sarifLevel(d.Severity), Message: sarifText{d.Message()},
			Locations: []sarifLocation{{PhysicalLocation: sarifPhysical{sarifArtifact{sarifURI(d.Loc.File)}, sregion(f.m, d.Loc)}}}}
		for k, r := range d.Related {
			id := k + 1
			res.RelatedLocations = append(res.RelatedLocations, sarifLocation{ID: &id,
				PhysicalLocation: sarifPhysical{sarifArtifact{sarifURI(r.Loc.File)}, sregion(f.m, r.Loc)}, Message: &sarifText{r.Message}})
		}
		for _, fx := range d.Fixes {
			byFile := map[string][]sarifReplacement{}
			var order []string
			for _, e := range fx.Edits {
				reg := sregion(f.m, e.Loc)
				if reg == nil {
					continue
				}
				if _, seen := byFile[e.Loc.File]; !seen {
					order = append(order, e.Loc.File)
				}
				rep := sarifReplacement{DeletedRegion: *reg}
				if e.NewText != "" {
					rep.InsertedContent = &sarifText{e.NewText}
				}
				byFile[e.Loc.File] = append(byFile[e.Loc.File], rep)
			}
			sf := sarifFix{Description: sarifText{fx.Title}}
			for _, file := range order {
				sf.ArtifactChanges = append(sf.ArtifactChanges, sarifChange{sarifArtifact{sarifURI(file)}, byFile[file]})
			}
			if len(sf.ArtifactChanges) > 0 {
				res.Fixes = append(res.Fixes, sf)
			}
		}
		if i < 0 {
			res.RuleIndex = 0
			res.RuleID = d.Rule
		}
		results = append(results, res)
	}
	doc := map[string]any{
		"$schema": "https://docs.oasis-open.org/sarif/sarif/v2.1.0/errata01/os/schemas/sarif-schema-2.1.0.json",
		"version": "2.1.0",
		"runs": []any{map[string]any{
			"tool": map[string]any{"driver": map[string]any{
				"name":  "circa",
				"rules": srules,
			}},
			"columnKind": "utf16CodeUnits",
			"results":    results,
		}},
	}
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(doc)
}

// GitHub workflow-command annotations.

func ghData(s string) string {
	return strings.NewReplacer("%", "%25", "\r", "%0D", "\n", "%0A").Replace(s)
}

func ghProp(s string) string {
	return strings.NewReplacer("%", "%25", "\r", "%0D", "\n", "%0A", ":", "%3A", ",", "%2C").Replace(s)
}

func writeGitHub(w io.Writer, fs []checkFinding) error {
	var b strings.Builder
	for _, f := range fs {
		d := f.d
		cmd := "notice"
		switch d.Severity {
		case lang.Error:
			cmd = "error"
		case lang.Warning:
			cmd = "warning"
		}
		s, e, _ := checkSpan(f.m, d.Loc)
		msg := d.Message()
		for _, r := range d.Related {
			rs, _, _ := checkSpan(f.m, r.Loc)
			msg += fmt.Sprintf("\nnote: %s:%d:%d: %s", r.Loc.File, rs.Line, rs.Char, r.Message)
		}
		fmt.Fprintf(&b, "::%s file=%s,line=%d,col=%d,endLine=%d,endColumn=%d,title=%s::%s\n",
			cmd, ghProp(filepath.ToSlash(d.Loc.File)), s.Line, s.UTF16, e.Line, e.UTF16, ghProp(d.Rule), ghData(msg))
	}
	_, err := io.WriteString(w, b.String())
	return err
}
