package main

import (
	"encoding/csv"
	"encoding/json"
	"flag"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"text/tabwriter"

	"circa/check/flow"
	"circa/check/geom"
)

func init() {
	register(&command{name: "estimate", summary: "estimate circulation and margins in every case", run: runEstimate})
}

const estimateUsage = `Usage: circa estimate FILE [--case NAME] [--format text|json|csv] [--void M] [--friction M]
       [--sweep-pitch DEG,…] [--sweep-roll DEG,…] [--sweep-accel AX,AY,AZ;…]

Estimates the steady circulation of each loop in FILE in every operating case:
mass flow, qualities, void fractions, pressure changes, the saturation state,
and the design margins (exit quality, critical heat flux, flooding, wall
temperature, design pressure, condenser, charge, head ratio, tilt limits).
The JSON layout is documented in docs/estimate-json.md. Exit status 1 when
any estimate or margin finding is an error, 2 for usage errors.

Options:
`

func runEstimate(args []string, _ io.Reader, stdout, stderr io.Writer) int {
	fl := flag.NewFlagSet("estimate", flag.ContinueOnError)
	fl.SetOutput(stderr)
	var opts flow.Options
	var format, pitch, roll, accel string
	fl.StringVar(&opts.Case, "case", "", "estimate only this case")
	fl.StringVar(&format, "format", "text", "output format: text, json or csv")
	fl.StringVar(&opts.Void, "void", "", "void-fraction method (overrides the methods block)")
	fl.StringVar(&opts.Friction, "friction", "", "two-phase friction method (overrides the methods block)")
	fl.IntVar(&opts.Cells, "cells", 0, "cells per heated component (overrides the methods block)")
	fl.BoolVar(&opts.NoTilt, "no-tilt", false, "skip the search for the attitudes where circulation stops")
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
	m, rc, ok := loadClean(file, "estimate", "no estimate", stderr)
	if !ok {
		return rc
	}
	res, err := flow.Estimate(m, opts)
	if err != nil {
		fmt.Fprintf(stderr, "circa estimate: %v\n", err)
		return exitUsage
	}
	switch format {
	case "json":
		enc := json.NewEncoder(stdout)
		enc.SetIndent("", "  ")
		if err := enc.Encode(res); err != nil {
			fmt.Fprintf(stderr, "circa estimate: %v\n", err)
			return exitUsage
		}
	case "csv":
		writeEstimateCSV(stdout, res)
	default:
		writeEstimateText(stdout, res)
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

func celsius(k float64) float64 { return k - 273.15 }

func deg(r float64) float64 { return r * 180 / math.Pi }

func writeEstimateText(w io.Writer, res *flow.Result) {
	for _, c := range res.Cautions {
		fmt.Fprintln(w, "caution:", c)
	}
	for _, l := range res.Loops {
		fmt.Fprintf(w, "\nloop %s: fluid %s", l.Loop, l.Fluid)
		if l.Safety != "" {
			fmt.Fprintf(w, " (safety class %s)", l.Safety)
		}
		kind := "single loop"
		if l.Network {
			kind = "network"
		}
		fmt.Fprintf(w, ", %s\n", kind)
		fmt.Fprintf(w, "methods: void %s, friction %s, single-phase %s, CHF %s, %d cells per heated component\n",
			l.Methods.Void, l.Methods.Friction, l.Methods.SinglePhase, l.Methods.CHF, l.Methods.Cells)
		fmt.Fprintf(w, "assumptions: %s\n", strings.Join(l.Assumptions, "; "))
		for _, f := range l.Findings {
			fmt.Fprintf(w, "%s: %s\n", f.Severity, f.Message)
		}
		for _, c := range l.Cases {
			writeCaseText(w, &c)
		}
		if len(l.Worst) > 0 {
			fmt.Fprintf(w, "\nworst case per margin (loop %s):\n", l.Loop)
			tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
			fmt.Fprintln(tw, "  margin\tcase\tcomponent\tvalue\tlimit\tuse\tstatus")
			for _, m := range l.Worst {
				fmt.Fprintf(tw, "  %s\t%s\t%s\t%s\t%s\t%.2f\t%s\n", m.Margin, m.Case, m.Component,
					marginValue(m.Value, m.Unit), marginValue(m.Limit, m.Unit), m.Use, m.Status)
			}
			tw.Flush()
		}
	}
}

func marginValue(v float64, unit string) string {
	switch unit {
	case "K":
		return fmt.Sprintf("%.1f °C", celsius(v))
	case "Pa":
		return fmt.Sprintf("%.2f bar", v/1e5)
	case "rad":
		return fmt.Sprintf("%.1f°", deg(v))
	case "W":
		return fmt.Sprintf("%.0f W", v)
	case "kg":
		return fmt.Sprintf("%.3g kg", v)
	}
	return fmt.Sprintf("%.3g", v)
}

func writeCaseText(w io.Writer, c *flow.CaseResult) {
	fmt.Fprintf(w, "\ncase %s", c.Case)
	if c.Grid || c.Pitch != 0 || c.Roll != 0 || c.Yaw != 0 || c.Accel != [3]float64{} {
		fmt.Fprintf(w, " (pitch %.1f°, roll %.1f°, yaw %.1f°", deg(c.Pitch), deg(c.Roll), deg(c.Yaw))
		if a := c.Accel; a != [3]float64{} {
			fmt.Fprintf(w, ", acceleration (%.3g, %.3g, %.3g) gn", a[0]/geom.Gn, a[1]/geom.Gn, a[2]/geom.Gn)
		}
		fmt.Fprint(w, ")")
	}
	fmt.Fprintf(w, ": heat %.0f W", c.Heat)
	if c.SatSource != "" {
		fmt.Fprintf(w, ", saturation %.1f °C, %.3f bar (%s)", celsius(c.SatTemperature), c.SatPressure/1e5, c.SatSource)
	}
	fmt.Fprintln(w)
	if !c.Circulates {
		fmt.Fprintf(w, "  no circulation: %s\n", c.Reason)
	} else {
		fmt.Fprintf(w, "  mass flow %.2f g/s\n", c.MassFlow*1e3)
		tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
		fmt.Fprintln(tw, "  component\tkind\tg/s\tkg/m²s\tx in\tx out\tα out\tα mean\tu_l m/s\tu_v m/s\tΔp fric\tΔp grav\tΔp acc\tΔp local\tp in−out Pa\t")
		for _, s := range c.Components {
			fmt.Fprintf(tw, "  %s\t%s\t%.2f\t%.0f\t%.3f\t%.3f\t%.3f\t%.3f\t%.2f\t%.2f\t%.0f\t%.0f\t%.0f\t%.0f\t%.0f\t\n",
				s.Component, s.Kind, s.MassFlow*1e3, s.MassFlux, s.XIn, s.XOut, s.VoidOut, s.VoidMean,
				s.VelLiquid, s.VelVapour, s.DpFriction, s.DpGravity, s.DpAccel, s.DpLocal, s.DpTotal)
		}
		t := c.Totals
		fmt.Fprintf(tw, "  total\t\t\t\t\t\t\t\t\t\t%.0f\t%.0f\t%.0f\t%.0f\t%.0f\t\n", t.Friction, t.Gravity, t.Accel, t.Local,
			t.Friction+t.Local+t.Accel-t.Gravity)
		tw.Flush()
		fmt.Fprintf(w, "  heat in %.1f W, rejected %.1f W; gravity head at vanishing flow %.0f Pa; inventory %.3g kg (+ %.3g kg in reservoirs)\n",
			t.Heat, t.Rejected, t.HeadMax, t.Inventory, t.Reservoirs)
		for _, r := range c.Roots {
			if !r.Stable {
				fmt.Fprintf(w, "  unstable balance at %.2f g/s (dE/dṁ = %.3g Pa per kg/s)\n", r.MassFlow*1e3, r.Slope)
			}
		}
	}
	if c.Tilt != nil {
		fmt.Fprintf(w, "  tilt: circulation stops at")
		any := false
		for _, a := range []struct {
			n string
			v *float64
		}{{"pitch", c.Tilt.PitchUp}, {"pitch", c.Tilt.PitchDown}, {"roll", c.Tilt.RollLeft}, {"roll", c.Tilt.RollRight}} {
			if a.v != nil {
				fmt.Fprintf(w, " %s %.1f°", a.n, deg(*a.v))
				any = true
			}
		}
		if !any {
			fmt.Fprint(w, " no attitude within ±90°")
		}
		fmt.Fprintf(w, " (margin %.1f°)\n", deg(c.Tilt.Margin))
	}
	if len(c.Margins) > 0 {
		tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
		fmt.Fprintln(tw, "  margin\tcomponent\tvalue\tlimit\tuse\tstatus")
		for _, m := range c.Margins {
			fmt.Fprintf(tw, "  %s\t%s\t%s\t%s\t%.2f\t%s\n", m.Margin, m.Component, marginValue(m.Value, m.Unit),
				marginValue(m.Limit, m.Unit), m.Use, m.Status)
		}
		tw.Flush()
	}
	for _, f := range c.Findings {
		fmt.Fprintf(w, "  %s: %s\n", f.Severity, f.Message)
	}
}

// writeEstimateCSV writes one row per case and component; the cautions
// come first as lines starting with '#'.
func writeEstimateCSV(w io.Writer, res *flow.Result) {
	for _, c := range res.Cautions {
		fmt.Fprintln(w, "# caution:", c)
	}
	cw := csv.NewWriter(w)
	cw.Write([]string{"loop", "case", "circulates", "saturation_temperature_K", "saturation_pressure_Pa",
		"loop_mass_flow_kg_s", "component", "kind", "mass_flow_kg_s", "mass_flux_kg_m2s", "quality_in", "quality_out",
		"void_out", "void_mean", "velocity_liquid_m_s", "velocity_vapour_m_s", "heat_W",
		"dp_friction_Pa", "dp_gravity_Pa", "dp_acceleration_Pa", "dp_local_Pa", "dp_total_Pa"})
	g := func(v float64) string { return strconv.FormatFloat(v, 'g', 8, 64) }
	for _, l := range res.Loops {
		for _, c := range l.Cases {
			head := []string{l.Loop, c.Case, strconv.FormatBool(c.Circulates), g(c.SatTemperature), g(c.SatPressure), g(c.MassFlow)}
			if len(c.Components) == 0 {
				cw.Write(append(head, make([]string, 16)...))
				continue
			}
			for _, s := range c.Components {
				cw.Write(append(append([]string(nil), head...), s.Component, s.Kind, g(s.MassFlow), g(s.MassFlux),
					g(s.XIn), g(s.XOut), g(s.VoidOut), g(s.VoidMean), g(s.VelLiquid), g(s.VelVapour), g(s.Heat),
					g(s.DpFriction), g(s.DpGravity), g(s.DpAccel), g(s.DpLocal), g(s.DpTotal)))
			}
		}
	}
	cw.Flush()
}
