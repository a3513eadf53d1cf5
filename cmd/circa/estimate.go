package main

import (
	"context"
	"flag"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"circa/check/flow"
	"circa/check/geom"
	"circa/check/guide"
	"circa/check/output"
	"circa/lang"
)

func init() {
	register(&command{name: "estimate", summary: "estimate circulation and margins in every case", run: runEstimate})
}

const estimateUsage = `Usage: circa estimate FILE [--case NAME] [--format text|json|csv] [--void M] [--friction M]
       [--sweep-pitch DEG,…] [--sweep-roll DEG,…] [--sweep-accel AX,AY,AZ;…]
       [--saturation auto|local|single] [--cells N] [--no-tilt]
       [--set NAME=VALUE]... [--no-guidance] [--fluids] [--vary NAME=FROM..TO:N]...

Estimates the steady circulation of each loop in FILE in every operating case:
mass flow, qualities, void fractions, pressure changes, the saturation state,
and the design margins (exit quality, critical heat flux, flooding, wall
temperature, design pressure, condenser, charge, head ratio, tilt limits).
--set estimates a variant: the parameter takes the value given (with its
unit, of the dimension the file gives it), and the text and JSON outputs
list it beside the file's own. Text and JSON then carry design guidance:
each parameter's and each loop charge's feasible range (every margin in
every case, the rest as written) with what ends it, and each margin's
sensitivity to each parameter; --fluids adds the loop estimated with every
built-in fluid, ranked. The JSON layout is documented in
docs/estimate-json.md. Exit status 1 when any estimate or margin finding is
an error, 2 for usage errors.

--vary sweeps one parameter (or, given twice, a grid of two) and prints,
instead of the estimate, each margin's use of its limit in its worst case
at every point, and the limiting margin: text, JSON ("Parameter sweep" in
docs/estimate-json.md) or CSV. The tilt limits are not searched at sweep
points. Points where a margin fails are results, not errors: the exit
status is 0 once the sweep is made.

Options:
`

func runEstimate(args []string, _ io.Reader, stdout, stderr io.Writer) int {
	fl := flag.NewFlagSet("estimate", flag.ContinueOnError)
	fl.SetOutput(stderr)
	var opts flow.Options
	var format, pitch, roll, accel string
	var set setFlag
	fl.Var(&set, "set", setUsage)
	var vy varyFlag
	fl.Var(&vy, "vary", varyUsage)
	fl.StringVar(&opts.Case, "case", "", "estimate only this case")
	fl.StringVar(&format, "format", "text", "output format: text, json or csv")
	fl.StringVar(&opts.Void, "void", "", "void-fraction method (overrides the methods block)")
	fl.StringVar(&opts.Friction, "friction", "", "two-phase friction method (overrides the methods block)")
	fl.StringVar(&opts.Saturation, "saturation", "", "saturation state: auto (the default), local or single (overrides the methods block)")
	fl.IntVar(&opts.Cells, "cells", 0, "cells per heated component (overrides the methods block)")
	fl.BoolVar(&opts.NoTilt, "no-tilt", false, "skip the search for the attitudes where circulation stops")
	var noGuide, fluids bool
	fl.BoolVar(&noGuide, "no-guidance", false, "skip the design guidance (feasible ranges and sensitivities)")
	fl.BoolVar(&fluids, "fluids", false, "rank every built-in fluid in each loop (one more estimate per fluid)")
	fl.StringVar(&pitch, "sweep-pitch", "", "comma-separated pitch angles in degrees to sweep for every case")
	fl.StringVar(&roll, "sweep-roll", "", "comma-separated roll angles in degrees to sweep for every case")
	fl.StringVar(&accel, "sweep-accel", "", "semicolon-separated accelerations AX,AY,AZ in standard gravities to sweep for every case, e.g. \"0.5,0,0;-0.5,0,0\"")
	fl.Usage = func() {
		fmt.Fprint(stderr, estimateUsage)
		fl.PrintDefaults()
	}
	file, rc, ok := oneFile(fl, args, stderr)
	if !ok {
		return rc
	}
	switch format {
	case "text", "json", "csv":
	default:
		fmt.Fprintf(stderr, "circa estimate: unknown format %q (want text, json or csv)\n", format)
		return exitUsage
	}
	if pitch != "" || roll != "" || accel != "" {
		var sw flow.Sweep
		var err error
		if sw.Pitch, err = degrees(pitch); err == nil {
			if sw.Roll, err = degrees(roll); err == nil {
				sw.Accel, err = accelerations(accel)
			}
		}
		if err != nil {
			fmt.Fprintf(stderr, "circa estimate: %v\n", err)
			return exitUsage
		}
		opts.Sweep = &sw
	}
	m, rc, ok := loadClean(file, "estimate", "no estimate and no design guidance", set, (noGuide || format == "csv") && len(vy) == 0, stderr)
	if !ok {
		return rc
	}
	if len(vy) > 0 {
		return estimateSweep(m, vy, opts, format, stdout, stderr)
	}
	pr := startProgress(stderr, "estimate", fmt.Sprintf("solving %d operating points and their margins", points(m, opts)))
	res, err := flow.Estimate(m, opts)
	var env output.Envelopes
	if err == nil && format == "text" && !opts.NoTilt {
		// The tilt lines say where the first margin fails as well.
		env = output.TiltEnvelopes(m, res, pr.Set)
	}
	var g *guide.Guidance
	if err == nil && format != "csv" && !noGuide {
		pr.Set("design guidance: feasible ranges and sensitivities")
		g, err = guide.Compute(context.Background(), m, guide.Options{Flow: opts, Base: res, Fluids: fluids})
	}
	pr.Stop()
	if err != nil {
		fmt.Fprintf(stderr, "circa estimate: %v\n", err)
		return exitUsage
	}
	switch format {
	case "json":
		err = output.EstimateGuidedJSON(stdout, res, g)
	case "csv":
		err = output.EstimateCSV(stdout, res)
	default:
		err = output.EstimateText(stdout, res, env)
		if err == nil && g != nil {
			err = output.GuidanceText(stdout, g, res)
		}
	}
	if err != nil {
		fmt.Fprintf(stderr, "circa estimate: writing output: %v\n", err)
		return exitUsage
	}
	for _, l := range res.Loops {
		for _, f := range l.Findings {
			if f.Severity == "error" {
				return exitFindings
			}
		}
		for _, c := range l.Cases {
			for _, f := range c.Findings {
				if f.Severity == "error" {
					return exitFindings
				}
			}
		}
	}
	return exitOK
}

func degrees(s string) ([]float64, error) {
	if strings.TrimSpace(s) == "" {
		return nil, nil
	}
	var out []float64
	for _, f := range strings.Split(s, ",") {
		v, err := strconv.ParseFloat(strings.TrimSpace(f), 64)
		if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, fmt.Errorf("bad angle %q in a sweep (want degrees, comma-separated)", f)
		}
		out = append(out, v*math.Pi/180)
	}
	return out, nil
}

// accelerations reads "AX,AY,AZ;…" in standard gravities (9.80665 m/s²)
// and returns them in m/s².
func accelerations(s string) ([][3]float64, error) {
	if strings.TrimSpace(s) == "" {
		return nil, nil
	}
	var out [][3]float64
	for _, vec := range strings.Split(s, ";") {
		parts := strings.Split(vec, ",")
		if len(parts) != 3 {
			return nil, fmt.Errorf("bad acceleration %q in a sweep (want AX,AY,AZ in standard gravities)", vec)
		}
		var a [3]float64
		for i, f := range parts {
			v, err := strconv.ParseFloat(strings.TrimSpace(f), 64)
			if err != nil || math.IsNaN(v) || math.IsInf(v, 0) || math.Abs(v) > 100 {
				return nil, fmt.Errorf("bad acceleration %q in a sweep (want AX,AY,AZ in standard gravities)", vec)
			}
			a[i] = v * geom.Gn
		}
		out = append(out, a)
	}
	return out, nil
}

// points counts the operating points an estimate solves per loop: every
// case (or the one asked for) and its sweep points.
func points(m *lang.Model, opts flow.Options) int {
	cases := len(m.Cases)
	if opts.Case != "" || cases == 0 {
		cases = 1
	}
	per := 1
	if sw := opts.Sweep; sw != nil {
		n := func(k int) int { return max(k, 1) }
		per += n(len(sw.Pitch)) * n(len(sw.Roll)) * n(len(sw.Accel))
	}
	return cases * per * max(len(m.Loops), 1)
}

// estimateSweep prints the sweep --vary asks for.
func estimateSweep(m *lang.Model, vy varyFlag, opts flow.Options, format string, stdout, stderr io.Writer) int {
	if opts.Sweep != nil {
		fmt.Fprintln(stderr, "circa estimate: --vary cannot be combined with --sweep-pitch, --sweep-roll or --sweep-accel")
		return exitUsage
	}
	res, ok := vy.sweep("estimate", m, opts, stderr)
	if !ok {
		return exitUsage
	}
	var err error
	switch format {
	case "json":
		err = output.VaryJSON(stdout, res)
	case "csv":
		err = output.VaryCSV(stdout, res)
	default:
		err = output.VaryText(stdout, res)
	}
	if err != nil {
		fmt.Fprintf(stderr, "circa estimate: writing output: %v\n", err)
		return exitUsage
	}
	return exitOK
}
