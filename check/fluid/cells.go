package fluid

import (
	"bytes"
	"fmt"
	"strings"
)

// SplitFields splits a row of a comma-separated table as fluid tables are
// read: at commas, trimming spaces and surrounding double quotes. Other
// tables a loop file names (manoeuvre profiles) follow the same layout.
func SplitFields(text string) []string { return splitFields(text) }

// HeaderCell splits a header cell into its column name and its unit,
// written in parentheses or brackets after the name: "T (degC)",
// "p [kPa]". A cell without either has an empty unit.
func HeaderCell(f string) (name, unit string, err error) {
	k := strings.IndexAny(f, "([")
	if k < 0 {
		return f, "", nil
	}
	closer := map[byte]byte{'(': ')', '[': ']'}[f[k]]
	if f[len(f)-1] != closer {
		return "", "", fmt.Errorf("unit in %q not closed by %q", f, closer)
	}
	return strings.TrimSpace(f[:k]), strings.TrimSpace(f[k+1 : len(f)-1]), nil
}

// LineEnd returns where the line of a table starting at start ends (before
// its line break) and where the next line starts, -1 after the last line.
// A line ends at "\n", "\r\n" or a lone "\r", as editors end lines, so
// that a table's line numbers are those the editor shows.
func LineEnd(data []byte, start int) (end, next int) {
	k := bytes.IndexAny(data[start:], "\r\n")
	if k < 0 {
		return len(data), -1
	}
	end = start + k
	if data[end] == '\r' && end+1 < len(data) && data[end+1] == '\n' {
		return end, end + 2
	}
	return end, end + 1
}

// ScanLines is a bufio.SplitFunc splitting a table at the line ends that
// LineEnd knows.
func ScanLines(data []byte, atEOF bool) (int, []byte, error) {
	if atEOF && len(data) == 0 {
		return 0, nil, nil
	}
	end, next := LineEnd(data, 0)
	if next >= 0 && (next < len(data) || data[next-1] == '\n' || atEOF) {
		return next, data[:end], nil
	}
	if atEOF {
		return len(data), data, nil
	}
	return 0, nil, nil // a lone '\r' at the end of the buffer may be a "\r\n"
}

// MaxTableErrors is how many errors of one table are reported; a last
// error counts the rest.
const MaxTableErrors = 20

// TableErrors collects the errors of one table in the order of the text:
// the first MaxTableErrors of them, then one that counts the rest. As an
// error it reads as its errors, one a line.
type TableErrors struct {
	list  []*TableError
	found int // errors added, also those past the cap
}

// Add records an error.
func (t *TableErrors) Add(e *TableError) {
	t.found++
	switch {
	case len(t.list) < MaxTableErrors:
		t.list = append(t.list, e)
	case len(t.list) == MaxTableErrors:
		t.list = append(t.list, &TableError{File: e.File, Line: e.Line, Column: e.Column})
	}
	if len(t.list) > MaxTableErrors {
		t.list[MaxTableErrors].Msg = fmt.Sprintf("%d more errors not shown", t.found-MaxTableErrors)
	}
}

// Len is the number of errors added, also those past the cap.
func (t *TableErrors) Len() int { return t.found }

// List returns the errors to report: at most MaxTableErrors, then one
// counting the rest.
func (t *TableErrors) List() []*TableError { return t.list }

// SetFile names the table's file in every error.
func (t *TableErrors) SetFile(path string) {
	for _, e := range t.list {
		e.File = path
	}
}

func (t *TableErrors) Error() string {
	s := make([]string, len(t.list))
	for i, e := range t.list {
		s[i] = e.Error()
	}
	return strings.Join(s, "\n")
}

// Unwrap gives the errors, so that errors.As finds the first.
func (t *TableErrors) Unwrap() []error {
	out := make([]error, len(t.list))
	for i, e := range t.list {
		out[i] = e
	}
	return out
}

// err is t as an error, nil when it holds none.
func (t *TableErrors) err() error {
	if t.found == 0 {
		return nil
	}
	return t
}
