// Command circa checks .loop files that describe passive two-phase cooling
// loops, formats them, estimates their circulation and serves editors.
package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"sort"
	"strings"

	"circa/check/output"
	"circa/lang"
)

// Exit statuses shared by every subcommand.
const (
	exitOK       = 0
	exitFindings = 1
	exitUsage    = 2
)

// command is one subcommand. run gets the arguments after the subcommand's
// name and returns the exit status.
type command struct {
	name    string
	summary string
	run     func(args []string, stdin io.Reader, stdout, stderr io.Writer) int
}

var commands = map[string]*command{}

func register(c *command) { commands[c.name] = c }

func main() {
	os.Exit(run(os.Args[1:], os.Stdin, os.Stdout, os.Stderr))
}

func run(args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	if len(args) == 0 {
		usage(stderr)
		return exitUsage
	}
	if isHelp(args[0]) || args[0] == "help" && len(args) == 1 {
		usage(stdout)
		return exitOK
	}
	name := args[0]
	if name == "help" {
		name = args[1]
		args = []string{name, "--help"}
	}
	c, ok := commands[name]
	if !ok {
		fmt.Fprintf(stderr, "circa: unknown command %q\n\n", name)
		usage(stderr)
		return exitUsage
	}
	if helpAsked(args[1:]) {
		// Asked-for help is the output, not a complaint: it goes to
		// standard output (and the status is 0).
		stderr = stdout
	}
	defer limitMemory()()
	return c.run(args[1:], stdin, stdout, stderr)
}

func isHelp(a string) bool { return a == "-h" || a == "-help" || a == "--help" || a == "--h" }

// helpAsked reports whether a help flag stands among a command's flags.
func helpAsked(args []string) bool {
	for _, a := range args {
		if a == "--" {
			return false
		}
		if isHelp(a) {
			return true
		}
	}
	return false
}

func usage(w io.Writer) {
	fmt.Fprintln(w, "circa checks passive two-phase cooling loops written as .loop files.")
	fmt.Fprintln(w, "\nUsage: circa COMMAND [options] [arguments]\n\nCommands:")
	names := make([]string, 0, len(commands))
	for n := range commands {
		names = append(names, n)
	}
	sort.Strings(names)
	for _, n := range names {
		fmt.Fprintf(w, "  %-10s %s\n", n, commands[n].summary)
	}
	fmt.Fprintln(w, "\nRun 'circa COMMAND --help' for a command's options.")
	fmt.Fprintln(w, strings.TrimSpace(`
Estimates are for early design only. Pressure equipment, flammable or toxic
working fluids and hot surfaces must follow local codes and licensed
engineering practice.`))
}

// parseInterleaved parses flags that may stand before or after the
// positional arguments and returns the positional ones. ok is false when
// parsing failed; rc is then the exit status (0 after -h).
func parseInterleaved(fl *flag.FlagSet, args []string) (pos []string, rc int, ok bool) {
	for {
		if err := fl.Parse(args); err != nil {
			if errors.Is(err, flag.ErrHelp) {
				return nil, exitOK, false
			}
			return nil, exitUsage, false
		}
		if fl.NArg() == 0 {
			return pos, 0, true
		}
		pos = append(pos, fl.Arg(0))
		args = fl.Args()[1:]
	}
}

// oneFile parses flags around exactly one file argument, printing the usage
// when there is not exactly one. ok false means: return rc.
func oneFile(fl *flag.FlagSet, args []string, stderr io.Writer) (file string, rc int, ok bool) {
	files, rc, ok := parseInterleaved(fl, args)
	if !ok {
		return "", rc, false
	}
	if len(files) != 1 {
		fmt.Fprintf(stderr, "circa %s: give exactly one .loop file\n", fl.Name())
		fl.Usage()
		return "", exitUsage, false
	}
	return files[0], 0, true
}

// loadClean loads a .loop file for a command that needs it free of errors
// (estimate, plot): the errors are printed and ok is false when there are
// any, rc then being the command's status (exitUsage when the file cannot
// be read or a --set does not apply, exitFindings when it has errors).
//
// With modelOnly the caller needs the model and the texts, not the trees
// (an estimate without guidance or sweeps, which resolve variants).
func loadClean(file, cmd, nothing string, set setFlag, modelOnly bool, stderr io.Writer) (m *lang.Model, rc int, ok bool) {
	src, ok := readSource(cmd, file, nil, stderr)
	if !ok {
		return nil, exitUsage, false
	}
	if modelOnly {
		m, ok = set.load(cmd, file, src, stderr)
	} else {
		m, ok = set.apply(cmd, lang.LoadSource(file, src, inputFS{}), stderr)
	}
	if !ok {
		return m, exitUsage, false
	}
	bad := false
	for _, d := range m.Diags {
		if d.Severity == lang.Error {
			fmt.Fprintf(stderr, "%s: %s: %s [%s]\n", output.Printable(output.Where(m, d.Loc)), d.Severity, output.Printable(d.Message()), d.Rule)
			bad = true
		}
	}
	if bad {
		fmt.Fprintf(stderr, "circa %s: the file has errors; %s\n", cmd, nothing)
		return m, exitFindings, false
	}
	return m, exitOK, true
}
