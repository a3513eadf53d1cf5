package output

import (
	"encoding/csv"
	"encoding/json"
	"fmt"
	"io"
	"strconv"
	"strings"
	"text/tabwriter"

	"circa/check/flow"
	"circa/check/vary"
)

// VaryJSON writes a parameter sweep as one indented JSON document
// (docs/estimate-json.md, "Parameter sweep").
func VaryJSON(w io.Writer, r *vary.Result) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(r)
}

// VaryHeading says what a sweep varied: "lift from 0.8 m to 1.6 m, 5
// values (the file's 1.2 m)".
func VaryHeading(r *vary.Result) string {
	parts := make([]string, len(r.Params))
	for i, p := range r.Params {
		n := len(p.Written)
		parts[i] = fmt.Sprintf("%s from %s to %s, %d values (the file's %s)", p.Param, p.Written[0], p.Written[n-1], n, p.FileWritten)
	}
	return strings.Join(parts, "; ")
}

// VaryText writes a sweep for people: the cautions, then per loop one
// table with a row per point, each margin's use of its limit in its worst
// case, and the limiting margin.
func VaryText(w io.Writer, r *vary.Result) error {
	ew := &errWriter{w: w}
	for _, c := range r.Cautions {
		fmt.Fprintln(ew, "caution:", c)
	}
	for _, p := range r.Set {
		fmt.Fprintln(ew, Printable(ParamSetText(p)))
	}
	fmt.Fprintf(ew, "sweep: %s\n", Printable(VaryHeading(r)))
	if !r.Tilt {
		fmt.Fprintln(ew, "the tilt limits are not searched at sweep points")
	}
	for _, loop := range r.LoopNames() {
		names := r.MarginNames(loop)
		fmt.Fprintf(ew, "\nloop %s: use of each margin's limit in its worst case (100 %% is at the limit)\n", loop)
		tw := tabwriter.NewWriter(ew, 0, 0, 2, ' ', 0)
		var head []string
		for _, p := range r.Params {
			head = append(head, p.Param)
		}
		head = append(append(head, names...), "limiting")
		switched := stateSwitches(r, loop)
		if switched {
			head = append(head, "saturation state")
		}
		fmt.Fprintln(tw, "  "+strings.Join(head, "\t"))
		for _, pt := range r.Points {
			row := append([]string(nil), pt.Written...)
			l := pointLoop(pt, loop)
			for _, n := range names {
				cell := "–"
				if l != nil {
					for _, mg := range l.Margins {
						if mg.Margin == n {
							cell = fixed(100*mg.Use, 0) + " %"
						}
					}
				}
				row = append(row, cell)
			}
			row = append(row, Printable(limitingText(pt, l)))
			if switched {
				row = append(row, Printable(stateText(l)))
			}
			fmt.Fprintln(tw, "  "+strings.Join(row, "\t"))
		}
		tw.Flush()
		if switched {
			fmt.Fprintf(ew, "  the saturation state changes across the sweep: saturation_state auto takes local saturation where a case's liquid column raises the saturation at an evaporator inlet by more than %g K, and a margin may step between two points where it changes; methods { saturation_state single } or local fixes one\n", flow.AutoLocalShift)
		}
	}
	return ew.err
}

// stateSwitches reports whether the cases of a loop take different
// saturation states at different points of r.
func stateSwitches(r *vary.Result, loop string) bool {
	first, seen := "", false
	for _, pt := range r.Points {
		l := pointLoop(pt, loop)
		if l == nil {
			continue
		}
		k := strings.Join(l.Local, "\x00")
		if seen && k != first {
			return true
		}
		first, seen = k, true
	}
	return false
}

// stateText names the cases a point estimated at local saturation.
func stateText(l *vary.Loop) string {
	switch {
	case l == nil:
		return ""
	case len(l.Local) == 0:
		return "single"
	}
	return "local in " + strings.Join(l.Local, ", ")
}

func pointLoop(pt vary.Point, loop string) *vary.Loop {
	for i := range pt.Loops {
		if pt.Loops[i].Loop == loop {
			return &pt.Loops[i]
		}
	}
	return nil
}

// limitingText names what limits a point: its margin of highest use, or
// why it has none.
func limitingText(pt vary.Point, l *vary.Loop) string {
	switch {
	case pt.Error != "":
		return "no estimate: " + pt.Error
	case l == nil:
		return "no estimate"
	}
	var s string
	if mg := l.Limiting; mg != nil {
		s = fmt.Sprintf("%s %s %%", mg.Margin, fixed(100*mg.Use, 0))
		if mg.Case != "" {
			s += " in case " + mg.Case
		}
		if mg.Status != "ok" {
			s += " (" + mg.Status + ")"
		}
	}
	if len(l.NoCirculation) > 0 {
		if s != "" {
			s += "; "
		}
		s += "no circulation in case " + strings.Join(l.NoCirculation, ", ")
	}
	return s
}

// VaryCSV writes a sweep as one table: a row per point, loop and margin,
// the parameters' values in SI in the first columns; the cautions first as
// lines starting with '#'.
func VaryCSV(w io.Writer, r *vary.Result) error {
	ew := &errWriter{w: w}
	for _, c := range r.Cautions {
		fmt.Fprintln(ew, "# caution:", c)
	}
	for _, p := range r.Set {
		fmt.Fprintln(ew, "# "+Printable(ParamSetText(p)))
	}
	fmt.Fprintf(ew, "# sweep: %s\n", Printable(VaryHeading(r)))
	cw := csv.NewWriter(ew)
	var head []string
	for _, p := range r.Params {
		head = append(head, p.Param+"_SI")
	}
	cw.Write(append(head, "loop", "margin", "case", "component", "value", "limit", "unit", "use", "status", "note"))
	g := func(v float64) string { return strconv.FormatFloat(v, 'g', 8, 64) }
	for _, pt := range r.Points {
		var vals []string
		for _, v := range pt.Values {
			vals = append(vals, g(v))
		}
		if pt.Error != "" {
			cw.Write(append(append([]string(nil), vals...), "", "", "", "", "", "", "", "", "", "no estimate: "+pt.Error))
			continue
		}
		for _, l := range pt.Loops {
			note := ""
			if len(l.NoCirculation) > 0 {
				note = "no circulation in case " + strings.Join(l.NoCirculation, ", ")
			}
			for _, mg := range l.Margins {
				cw.Write(append(append([]string(nil), vals...), l.Loop, mg.Margin, mg.Case, mg.Component, g(mg.Value), g(mg.Limit), mg.Unit, g(mg.Use), mg.Status, note))
			}
			if len(l.Margins) == 0 {
				cw.Write(append(append([]string(nil), vals...), l.Loop, "", "", "", "", "", "", "", "", note))
			}
		}
	}
	cw.Flush()
	if err := cw.Error(); err != nil && ew.err == nil {
		return err
	}
	return ew.err
}
