package output

import (
	"fmt"
	"io"
	"path/filepath"
	"strings"

	"circa/lang"
)

func ghData(s string) string {
	return strings.NewReplacer("%", "%25", "\r", "%0D", "\n", "%0A").Replace(printableLines(s))
}

// printableLines is Printable on each line of s, keeping its line ends,
// which the workflow command encodes.
func printableLines(s string) string {
	lines := strings.SplitAfter(s, "\n")
	for i, l := range lines {
		body := strings.TrimRight(l, "\r\n")
		lines[i] = Printable(body) + l[len(body):]
	}
	return strings.Join(lines, "")
}

func ghProp(s string) string {
	return strings.NewReplacer("%", "%25", "\r", "%0D", "\n", "%0A", ":", "%3A", ",", "%2C").Replace(printableLines(s))
}

// GitHub writes one workflow-command annotation per finding; related
// locations are appended to the message as notes.
func GitHub(w io.Writer, fs []Finding, problems ...Problem) error {
	var b strings.Builder
	for _, p := range problems {
		fmt.Fprintf(&b, "::error file=%s,title=file-unreadable::%s\n", ghProp(filepath.ToSlash(p.File)), ghData(p.Message))
	}
	for _, f := range fs {
		d := f.Diagnostic
		cmd := "notice"
		switch d.Severity {
		case lang.Error:
			cmd = "error"
		case lang.Warning:
			cmd = "warning"
		}
		s, e, _ := Span(f.Model, d.Loc)
		msg := d.Message()
		for _, r := range d.Related {
			rs, _, _ := Span(f.Model, r.Loc)
			msg += fmt.Sprintf("\nnote: %s:%d:%d: %s", r.Loc.File, rs.Line, rs.Char, r.Message)
		}
		fmt.Fprintf(&b, "::%s file=%s,line=%d,col=%d,endLine=%d,endColumn=%d,title=%s::%s\n",
			cmd, ghProp(filepath.ToSlash(d.Loc.File)), s.Line, s.UTF16, e.Line, e.UTF16, ghProp(d.Rule), ghData(msg))
	}
	_, err := io.WriteString(w, b.String())
	return err
}
