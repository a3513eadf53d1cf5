package fluid

import (
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
