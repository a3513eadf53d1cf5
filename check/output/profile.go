package output

import (
	"fmt"
	"io"
	"strings"
	"text/tabwriter"

	"circa/check/flow"
)

// profileText prints a case's manoeuvre: how many instants, the worst
// instant per margin (the findings say where the manoeuvre is faster than
// the loop).
func profileText(w io.Writer, l *flow.LoopResult, c *flow.CaseResult) {
	pr := c.Profile
	if pr == nil || len(pr.Instants) == 0 {
		return
	}
	first, last := pr.Instants[0], pr.Instants[len(pr.Instants)-1]
	stopped := 0
	for _, in := range pr.Instants {
		if !in.Circulates {
			stopped++
		}
	}
	fmt.Fprintf(w, "  profile: %d instants from %s s to %s s, each a steady state", len(pr.Instants), sig(first.Time, 4), sig(last.Time, 4))
	if stopped > 0 {
		fmt.Fprintf(w, "; no circulation at %d of them", stopped)
	}
	fmt.Fprintf(w, "%s\n", CaseStateText(l, c, pr.OtherState))
	if len(pr.Worst) > 0 {
		tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
		fmt.Fprintln(tw, "  worst instant\tmargin\tcomponent\tvalue\tlimit\tuse\tstatus")
		for _, m := range pr.Worst {
			v, lim := MarginValue(l, c, m)
			fmt.Fprintf(tw, "  t = %s s\t%s\t%s\t%s\t%s\t%s\t%s\n", sig(*m.Time, 4), m.Margin, m.Component, v, lim, fixed(m.Use, 2), m.Status)
		}
		tw.Flush()
	}
}

// envelopeText prints a case's envelope search: its bounds, the worst
// combination per margin and where circulation stops.
func envelopeText(w io.Writer, l *flow.LoopResult, c *flow.CaseResult) {
	e := c.Envelope
	if e == nil {
		return
	}
	var bounds []string
	for _, a := range e.Axes {
		if a.Name == "pitch" || a.Name == "roll" {
			bounds = append(bounds, fmt.Sprintf("%s %s to %s", a.Name, angle(a.Lo), angle(a.Hi)))
		} else {
			bounds = append(bounds, fmt.Sprintf("%s %s to %s gn", a.Name, sig(a.Lo/9.80665, 3), sig(a.Hi/9.80665, 3)))
		}
	}
	fmt.Fprintf(w, "  envelope: %s; %d steady states searched%s\n", strings.Join(bounds, ", "), e.Estimates, CaseStateText(l, c, e.OtherState))
	if len(e.Worst) > 0 {
		tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
		fmt.Fprintln(tw, "  worst combination\tmargin\tcomponent\tvalue\tlimit\tuse\tstatus")
		for _, m := range e.Worst {
			at := flow.CaseResult{Yaw: m.At.Yaw, Pitch: m.At.Pitch, Roll: m.At.Roll, Accel: m.At.Accel}
			where := at.PointLabel()
			if m.Uniform {
				where = "the same throughout"
			}
			v, lim := MarginValue(l, c, m.Margin)
			fmt.Fprintf(tw, "  %s\t%s\t%s\t%s\t%s\t%s\t%s\n", where, m.Margin.Margin, m.Component, v, lim, fixed(m.Use, 2), m.Status)
		}
		tw.Flush()
	}
}

// CaseStateText says, under saturation_state auto, that a case's sweep,
// profile or envelope points are estimated in the case's saturation state
// though n of them would take the other by their own liquid column: their
// curve does not jump where the column crosses the switch ("" when none
// would).
func CaseStateText(l *flow.LoopResult, c *flow.CaseResult, n int) string {
	if l.Methods.Saturation != "auto" || n == 0 || c.SatState == "" {
		return ""
	}
	other := "local"
	if c.SatState == "local" {
		other = "single"
	}
	return fmt.Sprintf("; all in the case's %s saturation state, though at %d of them the liquid column at rest alone, across %g K, would take the %s state", c.SatState, n, flow.AutoLocalShift, other)
}
