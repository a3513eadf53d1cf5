package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"strings"
	"text/tabwriter"

	"circa/check/fluid"
	"circa/units"
)

func init() {
	register(&command{name: "fluid", summary: "print a working fluid's saturated properties", run: runFluid})
}

func runFluid(args []string, _ io.Reader, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("fluid", flag.ContinueOnError)
	fs.SetOutput(stderr)
	list := fs.Bool("list", false, "list the built-in fluids with their ranges and safety classes")
	at := fs.String("at", "", "saturation temperature, e.g. 40degC")
	atP := fs.String("at-pressure", "", "saturation pressure, e.g. 5bar or 3bar(g)")
	table := fs.String("table", "", "a CSV table of saturated properties instead of a built-in fluid")
	fs.Usage = func() {
		fmt.Fprintln(stderr, "Usage: circa fluid --list\n       circa fluid NAME (--at TEMPERATURE | --at-pressure PRESSURE)\n       circa fluid --table FILE.csv (--at … | --at-pressure …)")
		fs.PrintDefaults()
	}
	// Accept the fluid name before or after the flags.
	var name string
	if len(args) > 0 && !strings.HasPrefix(args[0], "-") {
		name, args = args[0], args[1:]
	}
	if err := fs.Parse(args); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			return exitOK
		}
		return exitUsage
	}
	if name == "" && fs.NArg() > 0 {
		name = fs.Arg(0)
	}
	if *list {
		printFluidList(stdout)
		return exitOK
	}
	var f fluid.Fluid
	var err error
	switch {
	case *table != "":
		f, err = fluid.LoadCSV(*table)
	case name != "":
		f, err = fluid.Lookup(name)
	default:
		fs.Usage()
		return exitUsage
	}
	if err != nil {
		errs := []error{err}
		if tes := (*fluid.TableErrors)(nil); errors.As(err, &tes) {
			errs = tes.Unwrap()
		}
		for _, e := range errs {
			fmt.Fprintln(stderr, "circa fluid:", e)
		}
		return exitUsage
	}
	var sat fluid.Sat
	switch {
	case *at != "" && *atP != "":
		fmt.Fprintln(stderr, "circa fluid: give --at or --at-pressure, not both")
		return exitUsage
	case *at != "":
		q, err := parseQuantity(*at, units.Need{Dim: units.Temperature})
		if err != nil {
			fmt.Fprintln(stderr, "circa fluid: --at:", err)
			return exitUsage
		}
		sat, err = f.AtT(q)
		if err != nil {
			fmt.Fprintln(stderr, "circa fluid:", err)
			return exitFindings
		}
	case *atP != "":
		q, err := parseQuantity(*atP, units.Need{Dim: units.Pressure})
		if err != nil {
			fmt.Fprintln(stderr, "circa fluid: --at-pressure:", err)
			return exitUsage
		}
		sat, err = f.AtP(q)
		if err != nil {
			fmt.Fprintln(stderr, "circa fluid:", err)
			return exitFindings
		}
	default:
		fmt.Fprintln(stderr, "circa fluid: give --at TEMPERATURE or --at-pressure PRESSURE")
		return exitUsage
	}
	printSat(stdout, f.Info(), sat)
	return exitOK
}

// parseQuantity reads "40degC", "40 degC" or "5 bar(g)" and returns SI.
func parseQuantity(s string, need units.Need) (float64, error) {
	s = strings.TrimSpace(s)
	i := 0
	for i < len(s) && (s[i] >= '0' && s[i] <= '9' || s[i] == '.' || s[i] == '-' || s[i] == '+' || s[i] == 'e' && i > 0 && i+1 < len(s) && (s[i+1] >= '0' && s[i+1] <= '9' || s[i+1] == '-')) {
		i++
	}
	var v float64
	if _, err := fmt.Sscan(s[:i], &v); err != nil || i == 0 {
		return 0, fmt.Errorf("expected a number with a unit, e.g. 40degC, not %q", s)
	}
	ut := strings.TrimSpace(s[i:])
	if ut == "" {
		return 0, fmt.Errorf("%q needs a unit (%s)", s, units.Name(need.Dim))
	}
	u, err := units.Parse(ut)
	if err != nil {
		return 0, err
	}
	q := u.Quantity(v)
	if err := units.Check(q, ut, need); err != nil {
		return 0, err
	}
	return q.SI, nil
}

// celsiusText writes an absolute temperature in °C, as the estimate does.
func celsiusText(k float64) string {
	return strings.TrimSuffix(units.Format(k, units.MustParse("degC")), " degC") + " °C"
}

func printFluidList(w io.Writer) {
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "NAME\tALIASES\tRANGE\tCRITICAL POINT\tSAFETY CLASS")
	for _, in := range fluid.List() {
		fmt.Fprintf(tw, "%s\t%s\t%s to %s\t%s, %s\t%s\n", in.Name, strings.Join(in.Aliases[:min(3, len(in.Aliases))], ", "),
			celsiusText(in.Tmin), celsiusText(in.Tmax),
			celsiusText(in.Tc), units.Format(in.Pc, units.MustParse("MPa")), in.Safety)
	}
	tw.Flush()
	fmt.Fprintln(w, "\nSafety classes follow ASHRAE 34 / ISO 817 (A: lower toxicity, B: higher toxicity; 1: no flame")
	fmt.Fprintln(w, "propagation, 2L/2/3: increasingly flammable). Flammable or toxic fluids need the precautions of")
	fmt.Fprintln(w, "local refrigerant-safety codes; follow them and licensed engineering practice.")
}

func printSat(w io.Writer, in fluid.Info, s fluid.Sat) {
	u := units.MustParse
	fmt.Fprintf(w, "%s, saturated at %s (%s)\n", in.Name, celsiusText(s.T), units.Format(s.T, u("K")))
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	row := func(name string, si float64, unit string) {
		fmt.Fprintf(tw, "  %s\t%s\n", name, units.Format(si, u(unit)))
	}
	row("pressure", s.P, "kPa")
	row("liquid density", s.RhoL, "kg/m3")
	row("vapour density", s.RhoV, "kg/m3")
	row("latent heat", s.Hlv, "kJ/kg")
	row("liquid enthalpy", s.HL, "kJ/kg")
	row("vapour enthalpy", s.HV, "kJ/kg")
	row("liquid specific heat", s.CpL, "kJ/(kg*K)")
	row("vapour specific heat", s.CpV, "kJ/(kg*K)")
	row("liquid viscosity", s.MuL, "uPa*s")
	row("vapour viscosity", s.MuV, "uPa*s")
	row("liquid conductivity", s.KL, "mW/(m*K)")
	row("vapour conductivity", s.KV, "mW/(m*K)")
	row("surface tension", s.Sigma, "mN/m")
	tw.Flush()
	fmt.Fprintf(w, "  critical point %s, %s; molar mass %s\n", celsiusText(in.Tc), units.Format(in.Pc, u("MPa")),
		units.Format(in.MolarMass, u("g/mol")))
	fmt.Fprintf(w, "  range %s to %s: the saturation temperatures the estimate takes; the top is the condensers' limit unless limits saturation_max is lower\n",
		celsiusText(in.Tmin), celsiusText(in.Tmax))
	if in.Safety != "" {
		fmt.Fprintf(w, "  safety class %s\n", in.Safety)
	}
	if in.Source != "" {
		fmt.Fprintf(w, "  source: %s\n", in.Source)
	}
	if caution := in.Caution(); caution != "" {
		fmt.Fprintln(w, "Caution: "+caution)
	}
}
