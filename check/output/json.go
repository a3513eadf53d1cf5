package output

import (
	"encoding/json"
	"io"

	"circa/lang"
)

type jsonPos struct {
	Line   int `json:"line"`
	Column int `json:"column"` // bytes
	Char   int `json:"char"`   // characters (code points), as the text format prints
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

type jsonProblem struct {
	File    string `json:"file"`
	Message string `json:"message"`
}

type jsonReport struct {
	Version  int           `json:"version"`
	Findings []jsonFinding `json:"findings"`
	Errors   []jsonProblem `json:"errors"`
	Summary  struct {
		Files    int `json:"files"`
		Errors   int `json:"errors"`
		Warnings int `json:"warnings"`
		Notes    int `json:"notes"`
	} `json:"summary"`
}

func jloc(m *lang.Model, loc lang.Location) jsonLoc {
	s, e, _ := Span(m, loc)
	return jsonLoc{File: loc.File,
		Start: jsonPos{s.Line, s.Byte, s.Char, s.UTF16, loc.Span.Start},
		End:   jsonPos{e.Line, e.Byte, e.Char, e.UTF16, max(loc.Span.End, loc.Span.Start)}}
}

// JSON writes the findings, the paths that could not be read and a summary
// as one JSON document (docs/check-json.md).
func JSON(w io.Writer, runs []File, fs []Finding, problems ...Problem) error {
	rep := jsonReport{Version: 1, Findings: []jsonFinding{}, Errors: []jsonProblem{}}
	for _, p := range problems {
		rep.Errors = append(rep.Errors, jsonProblem{p.File, p.Message})
	}
	rep.Summary.Files = len(runs)
	for _, f := range fs {
		d := f.Diagnostic
		switch d.Severity {
		case lang.Error:
			rep.Summary.Errors++
		case lang.Warning:
			rep.Summary.Warnings++
		default:
			rep.Summary.Notes++
		}
		jf := jsonFinding{Rule: d.Rule, Severity: d.Severity.String(), jsonLoc: jloc(f.Model, d.Loc), Message: d.Message(),
			Related: []jsonRelated{}, Fixes: []jsonFix{}}
		for _, r := range d.Related {
			jf.Related = append(jf.Related, jsonRelated{jloc(f.Model, r.Loc), r.Message})
		}
		for _, fx := range d.Fixes {
			jx := jsonFix{Title: fx.Title, Edits: []jsonEdit{}}
			for _, e := range fx.Edits {
				jx.Edits = append(jx.Edits, jsonEdit{jloc(f.Model, e.Loc), e.NewText})
			}
			jf.Fixes = append(jf.Fixes, jx)
		}
		rep.Findings = append(rep.Findings, jf)
	}
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(rep)
}
