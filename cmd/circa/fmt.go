package main

import (
	"bytes"
	"flag"
	"fmt"
	"io"
	"os"
	"os/signal"
	"syscall"

	"circa/check/output"
	"circa/lang"
	"circa/textfile"
)

func init() {
	register(&command{name: "fmt", summary: "format .loop files in the canonical layout", run: runFmt})
}

const fmtUsage = `Usage: circa fmt [-w] [-d] [-l] [-check] [FILE|DIR|-]...

Formats .loop files in the one canonical layout. Directories are searched
recursively for *.loop files, skipping hidden directories; "-", or no
argument when standard input is not a terminal, reads standard input and
writes the result to standard output.

-w rewrites a file in place only when its formatting changes: through a
symbolic link to its target, keeping its mode, owner and hard links; a
read-only file is refused. -check makes the exit status 1 when some file is
not formatted (listing it, as -l does, unless -d or -w is given), for CI.

A file with syntax errors is left untouched; its errors are printed and the
exit status is 1. Usage and I/O errors give status 2.

Options:
`

// fmtOptions are the flags of circa fmt.
type fmtOptions struct {
	write, diff, list, check bool
}

func runFmt(args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	fl := flag.NewFlagSet("fmt", flag.ContinueOnError)
	fl.SetOutput(stderr)
	var o fmtOptions
	fl.BoolVar(&o.write, "w", false, "write the result back to the file (only when it changes)")
	fl.BoolVar(&o.diff, "d", false, "print a unified diff instead of the formatted text")
	fl.BoolVar(&o.list, "l", false, "list the files whose formatting differs")
	fl.BoolVar(&o.check, "check", false, "exit with status 1 when a file's formatting differs")
	fl.Usage = func() {
		fmt.Fprint(stderr, fmtUsage)
		fl.PrintDefaults()
	}
	paths, rc, ok := parseInterleaved(fl, args)
	if !ok {
		return rc
	}
	if o.check && !o.diff && !o.write {
		o.list = true
	}
	if len(paths) == 0 {
		if isTerminal(stdin) {
			fl.Usage()
			return exitUsage
		}
		paths = []string{"-"}
	}
	if o.write {
		stop := removeTempsOnSignal()
		defer stop()
	}
	status := exitOK
	worse := func(s int) {
		if s == exitUsage || status == exitOK {
			status = s
		}
	}
	for _, p := range paths {
		if p == "-" {
			if o.write {
				fmt.Fprintln(stderr, "circa fmt: -w cannot write back to standard input")
				return exitUsage
			}
			src, ok := readStdin("fmt", stdin, stderr)
			if !ok {
				worse(exitUsage)
				continue
			}
			worse(fmtOne("<standard input>", src, false, o, stdout, stderr))
			continue
		}
		files, ok := loopFiles("fmt", p, stderr)
		if !ok {
			worse(exitUsage)
		}
		for _, f := range files {
			src, ok := readInput("fmt", f, stderr)
			if !ok {
				worse(exitUsage)
				continue
			}
			worse(fmtOne(f, src, true, o, stdout, stderr))
		}
	}
	return status
}

// fmtOne formats one text and does what the options ask with the result.
// onDisk is false for standard input, which cannot be written back.
//
// The canonical layout has no byte-order mark: a file that starts with one
// is not formatted, and -w removes the mark.
func fmtOne(name string, src []byte, onDisk bool, o fmtOptions, stdout, stderr io.Writer) int {
	text, _ := textfile.CutBOM(src)
	// Formatted as parsed, statement by statement: a large file is never
	// held as a syntax tree.
	out, f := lang.FormatSource(name, text)
	if len(f.Errors) > 0 {
		for _, d := range f.Errors {
			pos := f.Mapper.OffsetPosition(d.Loc.Span.Start, lang.UTF8)
			fmt.Fprintf(stderr, "%s:%d:%d: %s: %s [%s]\n", output.Printable(name), pos.Line+1, pos.Col+1, d.Severity, output.Printable(d.Message()), d.Rule)
		}
		return exitFindings
	}
	changed := !bytes.Equal(src, out)
	if o.list && changed {
		fmt.Fprintln(stdout, name)
	}
	if o.diff && changed {
		writeUnifiedDiff(stdout, name, name, src, out)
	}
	if o.write && changed && onDisk {
		if err := textfile.Write(name, out); err != nil {
			fmt.Fprintf(stderr, "circa fmt: cannot write %s: %v\n", name, plainError(err))
			return exitUsage
		}
	}
	if !o.list && !o.diff && !o.write {
		stdout.Write(out)
	}
	if o.check && changed {
		return exitFindings
	}
	return exitOK
}

// removeTempsOnSignal makes SIGINT and SIGTERM remove the temporary files of
// writes in progress before the program ends with the usual status for the
// signal. stop undoes it.
func removeTempsOnSignal() (stop func()) {
	sig := make(chan os.Signal, 1)
	signal.Notify(sig, os.Interrupt, syscall.SIGTERM)
	done := make(chan struct{})
	go func() {
		select {
		case s := <-sig:
			textfile.RemoveTemps()
			code := 130 // 128 + SIGINT
			if s == syscall.SIGTERM {
				code = 143
			}
			os.Exit(code)
		case <-done:
		}
	}()
	return func() {
		signal.Stop(sig)
		close(done)
	}
}
