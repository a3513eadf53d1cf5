package output

import (
	"fmt"
	"io"
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
	fmt.Fprintln(w)
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
