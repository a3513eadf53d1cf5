package main

import (
	"bytes"
	"regexp"
	"strings"
	"testing"
)

// TestUsageSynopsisListsEveryFlag: the synopsis at the top of a command's
// --help names every flag the command takes, so that a reader of the first
// lines (or of the README's table, copied from them) misses none.
func TestUsageSynopsisListsEveryFlag(t *testing.T) {
	flagLine := regexp.MustCompile(`(?m)^  -([a-z][a-z-]*)`)
	for _, cmd := range []string{"check", "estimate", "plot", "report", "fmt", "serve", "fluid"} {
		var out, errb bytes.Buffer
		run([]string{cmd, "--help"}, strings.NewReader(""), &out, &errb)
		help := out.String() + errb.String()
		synopsis, _, _ := strings.Cut(help, "\n\n")
		flags := flagLine.FindAllStringSubmatch(help, -1)
		if len(flags) == 0 {
			t.Errorf("circa %s --help lists no flags:\n%s", cmd, help)
		}
		for _, f := range flags {
			if !regexp.MustCompile(`-` + regexp.QuoteMeta(f[1]) + `\b`).MatchString(synopsis) {
				t.Errorf("circa %s: the synopsis does not name -%s:\n%s", cmd, f[1], synopsis)
			}
		}
	}
}
