package main

import (
	"bytes"
	"errors"
	"flag"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strings"

	"circa/check/flow"
	"circa/check/output"
	"circa/lang"
	"circa/textfile"
)

func init() {
	register(&command{name: "report", summary: "write a design review report of a loop file as one HTML page", run: runReport})
}

const reportUsage = `Usage: circa report FILE [-o OUT.html] [--set NAME=VALUE]... [--vary NAME=FROM..TO:N]...
       circa report --out-dir DIR [--set NAME=VALUE]... [--vary NAME=FROM..TO:N]... FILE...

Writes a design review report of each .loop file: one self-contained HTML
page (no scripts, no network; figures inline as SVG) with the cautions, the
findings and their locations, and per loop the geometry, every case's
operating point, the margins with the limiting case of each, the charge, the
circulation curve and pressure budget, the tilt and acceleration envelope,
and the methods and assumptions. With one file and no -o the page goes to
standard output; with --out-dir each FILE.loop becomes DIR/FILE.html.
--vary adds a parameter sweep: each margin's use against the parameter,
drawn and tabulated per loop (see circa estimate --help).

Exit status: 0 when written and no finding is an error, 1 when some is,
2 for usage or I/O errors.

Options:
`

func runReport(args []string, _ io.Reader, stdout, stderr io.Writer) int {
	fl := flag.NewFlagSet("report", flag.ContinueOnError)
	fl.SetOutput(stderr)
	out := fl.String("o", "", "write the report of the one FILE to this path")
	dir := fl.String("out-dir", "", "write each FILE's report into this directory as FILE.html")
	var set setFlag
	fl.Var(&set, "set", setUsage)
	var vy varyFlag
	fl.Var(&vy, "vary", varyUsage)
	fl.Usage = func() {
		fmt.Fprint(stderr, reportUsage)
		fl.PrintDefaults()
	}
	files, rc, ok := parseInterleaved(fl, args)
	if !ok {
		return rc
	}
	switch {
	case len(files) == 0:
		fmt.Fprintln(stderr, "circa report: give a .loop file")
		fl.Usage()
		return exitUsage
	case *out != "" && *dir != "":
		fmt.Fprintln(stderr, "circa report: give -o or --out-dir, not both")
		return exitUsage
	case len(files) > 1 && *dir == "":
		fmt.Fprintln(stderr, "circa report: several files need --out-dir")
		return exitUsage
	}
	stop := removeTempsOnSignal()
	defer stop()
	status := exitOK
	for _, file := range files {
		src, ok := readInput("report", file, stderr)
		if !ok {
			status = exitUsage
			continue
		}
		m, ok := set.apply("report", lang.LoadSource(file, src, inputFS{}), stderr)
		if !ok {
			status = exitUsage
			continue
		}
		opts := output.ReportOptions{Version: buildVersion()}
		if len(vy) > 0 && !hasErrors(m) {
			if opts.Vary, ok = vy.sweep("report", m, flow.Options{}, stderr); !ok {
				status = exitUsage
				continue
			}
		}
		pr := startProgress(stderr, "report", "reading "+file)
		opts.Progress = func(s string) { pr.Set(file + ": " + s) }
		var page bytes.Buffer
		err := output.Report(&page, file, m, opts)
		pr.Stop()
		if err != nil {
			fmt.Fprintf(stderr, "circa report: %s: %v\n", file, err)
			status = exitUsage
			continue
		}
		target := *out
		if *dir != "" {
			target = filepath.Join(*dir, strings.TrimSuffix(filepath.Base(file), ".loop")+".html")
		}
		if target == "" {
			if _, err := stdout.Write(page.Bytes()); err != nil {
				fmt.Fprintf(stderr, "circa report: writing output: %v\n", err)
				return exitUsage
			}
		} else if err := writeNew(target, page.Bytes()); err != nil {
			fmt.Fprintf(stderr, "circa report: %s: %v\n", target, err)
			status = exitUsage
			continue
		} else {
			fmt.Fprintln(stdout, target)
		}
		if status == exitOK {
			for _, d := range m.Diags {
				if d.Severity == lang.Error {
					status = exitFindings
				}
			}
		}
	}
	return status
}

// writeNew writes a file that may not exist yet: an existing one is
// replaced as every command replaces files; a new one is written to a
// temporary file in its directory, synced and renamed into place.
func writeNew(path string, data []byte) error {
	if _, err := os.Lstat(path); err == nil {
		return textfile.Write(path, data)
	} else if !errors.Is(err, fs.ErrNotExist) {
		return err
	}
	dir := filepath.Dir(path)
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	tmp, err := os.CreateTemp(dir, "."+filepath.Base(path)+".*")
	if err != nil {
		return err
	}
	name := tmp.Name()
	_, err = tmp.Write(data)
	if err == nil {
		err = tmp.Chmod(0o644)
	}
	if err == nil {
		err = tmp.Sync()
	}
	if cerr := tmp.Close(); err == nil {
		err = cerr
	}
	if err == nil {
		err = os.Rename(name, path)
	}
	if err != nil {
		os.Remove(name)
	}
	return err
}

// hasErrors reports whether the model has an error, which leaves a report
// without estimates.
func hasErrors(m *lang.Model) bool {
	for _, d := range m.Diags {
		if d.Severity == lang.Error {
			return true
		}
	}
	return false
}
