package lang

import "fmt"

// Span is a half-open range of byte offsets in one file's text.
type Span struct{ Start, End int }

// Severity orders findings from most to least serious.
type Severity int

const (
	Error Severity = iota
	Warning
	Info
	Hint
)

func (s Severity) String() string {
	switch s {
	case Error:
		return "error"
	case Warning:
		return "warning"
	case Info:
		return "info"
	}
	return "hint"
}

// ParseSeverity reads "error", "warning", "info" or "hint".
func ParseSeverity(s string) (Severity, bool) {
	switch s {
	case "error":
		return Error, true
	case "warning":
		return Warning, true
	case "info":
		return Info, true
	case "hint":
		return Hint, true
	}
	return 0, false
}

// Location is a span in a named file (the path as the loader saw it).
type Location struct {
	File string
	Span Span
}

// Related points at another place that explains a finding.
type Related struct {
	Loc     Location
	Message string
}

// Edit replaces the text at Loc with NewText.
type Edit struct {
	Loc     Location
	NewText string
}

// Fix is a suggested change that resolves a finding.
type Fix struct {
	Title string
	Edits []Edit
}

// Diagnostic is one finding: a syntax, unit or name error from this package,
// or a rule's finding from the checker. The message template and its
// arguments are kept apart so each front end can render them.
type Diagnostic struct {
	Rule     string // stable identifier, e.g. "syntax", "unknown-name", "loop-not-closed"
	Severity Severity
	Loc      Location
	Format   string
	Args     []any
	Related  []Related
	Fixes    []Fix
}

// Message renders the diagnostic's text.
func (d Diagnostic) Message() string {
	if len(d.Args) == 0 {
		return d.Format
	}
	return fmt.Sprintf(d.Format, d.Args...)
}
