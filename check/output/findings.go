package output

import (
	"fmt"
	"io"

	"circa/check"
	"circa/check/flow"
	"circa/lang"
)

// File is one checked root file: its model and its report.
type File struct {
	Path   string
	Model  *lang.Model
	Report *check.Report
}

// Problem is a path that could not be read (missing, not a regular file,
// too large): no finding can be reported for it, so it is reported
// alongside the findings, where a tool reading the output sees it.
type Problem struct {
	File    string
	Message string // "cannot read PATH: reason"
}

// Finding is a diagnostic with the model that can locate it.
type Finding struct {
	Diagnostic lang.Diagnostic
	Model      *lang.Model
}

// Collect merges the findings of every file, dropping repeats (an included
// file checked on its own and through its includer reports the same
// finding twice).
func Collect(files []File) []Finding {
	type key struct {
		file       string
		start, end int
		rule, msg  string
	}
	seen := map[key]bool{}
	var out []Finding
	for _, r := range files {
		if r.Report == nil {
			continue
		}
		for _, d := range r.Report.Diagnostics {
			k := key{d.Loc.File, d.Loc.Span.Start, d.Loc.Span.End, d.Rule, d.Message()}
			if seen[k] {
				continue
			}
			seen[k] = true
			out = append(out, Finding{d, r.Model})
		}
	}
	return out
}

func plural(n int, word string) string {
	if n == 1 {
		return fmt.Sprintf("%d %s", n, word)
	}
	return fmt.Sprintf("%d %ss", n, word)
}

// Summary is the closing line: files, errors, warnings, and the worst
// margin when the estimates noted any.
func Summary(files []File, counts map[lang.Severity]int) string {
	s := fmt.Sprintf("%s checked: %s, %s", plural(len(files), "file"), plural(counts[lang.Error], "error"), plural(counts[lang.Warning], "warning"))
	if n := counts[lang.Info] + counts[lang.Hint]; n > 0 {
		s += ", " + plural(n, "note")
	}
	var worst *check.Margin
	for _, r := range files {
		if w, ok := r.Report.Worst(); ok && (worst == nil || w.Used > worst.Used) {
			worst = &w
		}
	}
	if worst != nil {
		s += "; worst margin: " + worst.Message
		if worst.Case != "" && worst.Case != flow.NoCase {
			s += " (case " + worst.Case + ")"
		}
	}
	return s
}

// Formats lists the names Write accepts.
var Formats = []string{"text", "json", "sarif", "github"}

// Write writes the findings in the named format; colour applies to text.
// Problems go into the JSON, SARIF and GitHub outputs; the text output
// leaves them to the command's standard error.
func Write(w io.Writer, format string, files []File, findings []Finding, colour bool, problems ...Problem) error {
	switch format {
	case "text":
		return Text(w, files, findings, colour)
	case "json":
		return JSON(w, files, findings, problems...)
	case "sarif":
		return SARIF(w, findings, problems...)
	case "github":
		return GitHub(w, findings, problems...)
	}
	return fmt.Errorf("unknown format %q", format)
}
