package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"slices"
	"strings"

	"circa/check"
	"circa/check/output"
	"circa/lang"
)

func init() {
	register(&command{name: "check", summary: "check .loop files and report findings", run: runCheck})
}

const checkUsage = `Usage: circa check [--format text|json|sarif|github] [--fail-on error|warning|info]
                   [--no-estimates] [--set NAME=VALUE]... [PATH|-]...

Checks .loop files: the language (syntax, units, names), the loop's
topology and geometry, the circulation direction and tilt limits, traps,
and (unless --no-estimates) the estimated margins. Directories are searched
recursively for *.loop files, skipping hidden directories; "-" (or no
argument) reads standard input, reported as <stdin>. --set checks a
variant: every file checked must declare the parameter, and a hint at
the parameter says that the run gave it another value.

Formats: text (file:line:col: severity: message [rule], like a compiler),
json (docs/check-json.md), sarif (SARIF 2.1.0), github (workflow
annotations). "circa explain RULE" tells what a rule checks and how to fix
its findings.

Exit status: 0 no finding at or above --fail-on (default error), 1 some,
2 usage or I/O errors.

Options:
`

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
	failOn := fl.String("fail-on", "error", "least severe finding that fails the check: error, warning or info")
	noEst := fl.Bool("no-estimates", false, "skip the estimated margins; structural checks only")
	var set setFlag
	fl.Var(&set, "set", setUsage)
	fl.Usage = func() {
		fmt.Fprint(stderr, checkUsage)
		fl.PrintDefaults()
	}
	if err := fl.Parse(splitFlags(args, map[string]bool{"format": true, "fail-on": true, "set": true})); err != nil {
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
	if !slices.Contains(output.Formats, *format) {
		fmt.Fprintf(stderr, "circa check: unknown --format %q (text, json, sarif or github)\n", *format)
		return exitUsage
	}
	paths := fl.Args()
	if len(paths) == 0 {
		if isTerminal(stdin) {
			fl.Usage()
			return exitUsage
		}
		paths = []string{"-"}
	}
	status := exitOK
	var runs []output.File
	stdinRead := false
	// Read errors are printed and also go into the JSON, SARIF and GitHub
	// outputs.
	problems := &problemLog{Writer: stderr}
	stderr = problems
	for _, p := range paths {
		if p == "-" {
			if stdinRead {
				continue
			}
			stdinRead = true
			src, ok := readSource("check", "-", stdin, stderr)
			if !ok {
				status = exitUsage
				continue
			}
			m, ok := set.load("check", "<stdin>", src, stderr)
			if !ok {
				status = exitUsage
				continue
			}
			runs = append(runs, output.File{Path: "<stdin>", Model: m, Report: check.RunReport(m, opts)})
			continue
		}
		files, ok := loopFiles("check", p, stderr)
		if !ok {
			status = exitUsage
		}
		for _, f := range files {
			src, ok := readSource("check", f, stdin, stderr)
			if !ok {
				status = exitUsage
				continue
			}
			m, ok := set.load("check", f, src, stderr)
			if !ok {
				status = exitUsage
				continue
			}
			runs = append(runs, output.File{Path: f, Model: m, Report: check.RunReport(m, opts)})
		}
	}
	findings := output.Collect(runs)
	if err := output.Write(stdout, *format, runs, findings, useColour(stdout), problems.list...); err != nil {
		fmt.Fprintf(stderr, "circa check: writing output: %v\n", err)
		return exitUsage
	}
	if status != exitOK {
		return status
	}
	for _, f := range findings {
		if f.Diagnostic.Severity <= opts.FailOn {
			return exitFindings
		}
	}
	return exitOK
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
