package main

import (
	"fmt"
	"io"
	"strings"

	"circa/check"
	"circa/lang"
)

func init() {
	register(&command{name: "explain", summary: "explain a rule, or list the rules", run: runExplain})
}

const explainUsage = `Usage: circa explain [RULE]

Without a rule, lists every rule with its severity and summary. With one,
prints why the rule matters, an example that triggers it and how to fix it.
`

func runExplain(args []string, _ io.Reader, stdout, stderr io.Writer) int {
	if len(args) > 0 && (args[0] == "-h" || args[0] == "--help") {
		fmt.Fprint(stderr, explainUsage)
		return exitOK
	}
	if len(args) > 1 {
		fmt.Fprint(stderr, explainUsage)
		return exitUsage
	}
	var b strings.Builder
	if len(args) == 0 {
		cat := ""
		for _, r := range check.Rules() {
			if r.Category != cat {
				cat = r.Category
				fmt.Fprintf(&b, "\n%s:\n", cat)
			}
			sev := r.Severity.String()
			if r.Escalation != "" {
				sev += "+" // can be raised to error; see the rule
			}
			fmt.Fprintf(&b, "  %-30s %-8s %s\n", r.ID, sev, r.Summary)
		}
		b.WriteString("\nwarning+ is a warning that becomes an error past a second threshold.\nRun 'circa explain RULE' for a rule's rationale, example and fix.\n")
		_, _ = io.WriteString(stdout, strings.TrimPrefix(b.String(), "\n"))
		return exitOK
	}
	r, ok := check.Lookup(args[0])
	if !ok {
		var ids []string
		for _, r := range check.Rules() {
			ids = append(ids, r.ID)
		}
		msg := fmt.Sprintf("circa explain: no rule is called %q", args[0])
		if s := lang.Closest(args[0], ids); s != "" {
			msg += fmt.Sprintf(" (did you mean %s?)", s)
		}
		fmt.Fprintln(stderr, msg+"; 'circa explain' lists them")
		return exitUsage
	}
	fmt.Fprintf(&b, "%s (%s, %s): %s\n\n", r.ID, r.Severity, r.Category, r.Summary)
	if r.Escalation != "" {
		fmt.Fprintf(&b, "Severity:\n%s\n\n", indent(fmt.Sprintf("%s; error when %s.", r.Severity, r.Escalation)))
	}
	fmt.Fprintf(&b, "Why:\n%s\n\n", indent(r.Rationale))
	fmt.Fprintf(&b, "Example:\n%s\n\n", indent(r.Example))
	fmt.Fprintf(&b, "Fix:\n%s\n", indent(r.Fix))
	if r.Run != nil {
		fmt.Fprintf(&b, "\nSilence one finding with a trailing \"# allow: %s\" on its line.\n", r.ID)
	}
	_, _ = io.WriteString(stdout, b.String())
	return exitOK
}

func indent(s string) string {
	lines := strings.Split(s, "\n")
	for i, l := range lines {
		lines[i] = "  " + l
	}
	return strings.Join(lines, "\n")
}
