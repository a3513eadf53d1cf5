package main

import (
	"bytes"
	"flag"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"

	"circa/check/flow"
	"circa/check/output"
	"circa/check/picture"
)

func init() {
	register(&command{name: "plot", summary: "draw circulation, pressure budget, tilt and geometry figures", run: runPlot})
}

const plotUsage = `Usage: circa plot FILE [--case NAME] [--out DIR] [--format svg,png] [--set NAME=VALUE]...
       [--vary NAME=FROM..TO:N]...

Draws, for each loop in FILE:
  LOOP-circulation  mass flow and exit quality against heat load (the case's
                    loads from 5 % to 150 %), the cases' operating points,
                    statically unstable balances dashed, the exit-quality
                    limit
  LOOP-budget       the case's pressure budget per component, each bar with
                    its value: the pressure drop along the flow by friction,
                    gravity, phase-change acceleration, flow-area change and
                    local losses (the whole loop's adds up to zero)
  LOOP-tilt         mass flow and worst margin against pitch and roll around
                    the case, with the critical angles
  LOOP-geometry     side and front views of the loop
  LOOP-vary-NAME    with --vary: each margin's use of its limit, in its
                    worst case (of every case, or of the one --case
                    names), against the parameter NAME; given twice, the
                    limiting margin against the first NAME, a line per
                    value of the second (see circa estimate --help)
The case is the nominal one unless --case names another. Figures are written
to DIR (default: the current directory) in each format given, and their
paths printed. Exit status 1 when the file has errors or a figure cannot be
drawn (a figure with nothing to show, such as the budget of a case that does
not circulate, is not written), 2 for usage and I/O errors.

Options:
`

func runPlot(args []string, _ io.Reader, stdout, stderr io.Writer) int {
	fl := flag.NewFlagSet("plot", flag.ContinueOnError)
	fl.SetOutput(stderr)
	var opts picture.Options
	var out, formats string
	fl.StringVar(&opts.Case, "case", "", "case to sweep, budget and tilt (default: the nominal case)")
	fl.StringVar(&out, "out", ".", "directory to write the figures to")
	fl.StringVar(&formats, "format", "svg", "comma-separated formats: svg, png")
	var set setFlag
	fl.Var(&set, "set", setUsage)
	var vy varyFlag
	fl.Var(&vy, "vary", varyUsage)
	fl.Usage = func() {
		fmt.Fprint(stderr, plotUsage)
		fl.PrintDefaults()
	}
	file, rc, ok := oneFile(fl, args, stderr)
	if !ok {
		return rc
	}
	var exts []string
	for _, f := range strings.Split(formats, ",") {
		f = strings.ToLower(strings.TrimSpace(f))
		ok := false
		for _, k := range picture.Formats {
			ok = ok || f == k
		}
		if !ok {
			fmt.Fprintf(stderr, "circa plot: unknown format %q (want %s)\n", f, strings.Join(picture.Formats, ", "))
			return exitUsage
		}
		exts = append(exts, f)
	}
	m, rc, ok := loadClean(file, "plot", "no figures", set, false, stderr)
	if !ok {
		return rc
	}
	if len(m.Loops) == 0 {
		fmt.Fprintf(stderr, "circa plot: %s has no loop: no figures\n", output.Printable(file))
		return exitFindings
	}
	if opts.Case != "" && m.Case(opts.Case) == nil {
		var names []string
		for _, c := range m.Cases {
			names = append(names, c.Name)
		}
		fmt.Fprintf(stderr, "circa plot: no case %q (cases: %s)\n", opts.Case, strings.Join(names, ", "))
		return exitUsage
	}
	if err := os.MkdirAll(out, 0o755); err != nil {
		fmt.Fprintf(stderr, "circa plot: %v\n", err)
		return exitUsage
	}
	figs, errs := picture.Figures(m, opts)
	if len(vy) > 0 {
		res, ok := vy.sweep("plot", m, flow.Options{Case: opts.Case}, stderr)
		if !ok {
			return exitUsage
		}
		for _, l := range m.Loops {
			f, err := picture.VaryFigure(res, l.Name)
			if err != nil {
				errs = append(errs, fmt.Errorf("loop %s: %v", l.Name, err))
				continue
			}
			f.Name = l.Name + "-" + f.Name
			f.Title += picture.VariantNote(m)
			figs = append(figs, f)
		}
	}
	status := exitOK
	for _, err := range errs {
		fmt.Fprintf(stderr, "circa plot: %v\n", err)
		status = exitFindings
	}
	for _, f := range figs {
		for _, ext := range exts {
			var buf bytes.Buffer
			path := filepath.Join(out, f.Name+"."+ext)
			err := f.Render(&buf, ext)
			if err == nil {
				err = os.WriteFile(path, buf.Bytes(), 0o644)
			}
			if err != nil {
				fmt.Fprintf(stderr, "circa plot: %s: %v\n", path, err)
				status = exitFindings
				continue
			}
			fmt.Fprintln(stdout, path)
		}
	}
	return status
}
