package output

import (
	"encoding/json"
	"fmt"
	"io"
	"math"
	"sort"
	"strings"
	"text/tabwriter"

	"circa/check/flow"
	"circa/check/geom"
	"circa/check/picture"
	"circa/lang"
)

// BudgetConvention says how every pressure budget is signed; the text, CSV
// and JSON budgets all follow it.
const BudgetConvention = "pressure drop along the flow, p_in − p_out, Pa: every term is a drop (positive where the pressure falls, gravity positive going up), so the terms add up to the row's total and the totals to zero around the loop"

// EstimateJSON writes the estimate as one indented JSON document
// (docs/estimate-json.md).
func EstimateJSON(w io.Writer, res *flow.Result) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(res)
}

// EstimateText writes the estimate for people: the cautions, then per loop
// its methods and assumptions, every case's operating point, pressure
// budget and margins, sweep points as one table per case, and the worst
// case per margin.
// env, when not nil, holds tilt envelopes whose first margin failures the
// tilt lines name.
func EstimateText(w io.Writer, res *flow.Result, env Envelopes) error {
	ew := &errWriter{w: w}
	for _, c := range res.Cautions {
		fmt.Fprintln(ew, "caution:", c)
	}
	for _, p := range res.Set {
		fmt.Fprintln(ew, Printable(ParamSetText(p)))
	}
	for _, f := range res.Findings {
		fmt.Fprintf(ew, "%s: %s\n", f.Severity, f.Message)
	}
	if len(res.Loops) == 0 {
		fmt.Fprintln(ew, "\nthe file has no loop: no estimate was made")
	}
	for i := range res.Loops {
		loopText(ew, &res.Loops[i], env)
	}
	return ew.err
}

// errWriter keeps the first write error so a writer can print freely and
// report once.
type errWriter struct {
	w   io.Writer
	err error
}

func (e *errWriter) Write(p []byte) (int, error) {
	if e.err != nil {
		return len(p), nil
	}
	n, err := e.w.Write(p)
	e.err = err
	return n, nil
}

func loopText(w io.Writer, l *flow.LoopResult, env Envelopes) {
	fmt.Fprintf(w, "\nloop %s: fluid %s", l.Loop, l.Fluid)
	if l.Safety != "" {
		fmt.Fprintf(w, " (safety class %s)", l.Safety)
	}
	kind := "single loop"
	if l.Network {
		kind = "network"
	}
	fmt.Fprintf(w, ", %s\n", kind)
	sat := ""
	switch l.Methods.Saturation {
	case "local":
		sat = ", saturation at local pressure"
	case "auto":
		sat = fmt.Sprintf(", saturation at local pressure where the liquid column raises it by more than %g K (else one state)", flow.AutoLocalShift)
	}
	fmt.Fprintf(w, "methods: void %s, friction %s, single-phase %s, CHF %s%s, %d cells per heated component\n",
		l.Methods.Void, l.Methods.Friction, l.Methods.SinglePhase, l.Methods.CHF, sat, l.Methods.Cells)
	fmt.Fprintf(w, "assumptions: %s\n", strings.Join(l.Assumptions, "; "))
	for _, f := range l.Findings {
		fmt.Fprintf(w, "%s: %s\n", f.Severity, f.Message)
	}
	for i := 0; i < len(l.Cases); {
		j := i + 1
		for j < len(l.Cases) && l.Cases[j].Grid {
			j++
		}
		caseText(w, l, &l.Cases[i], env[[2]string{l.Loop, l.Cases[i].Case}])
		profileText(w, l, &l.Cases[i])
		envelopeText(w, l, &l.Cases[i])
		if j > i+1 {
			sweepText(w, l, &l.Cases[i], l.Cases[i+1:j])
		}
		i = j
	}
	if r := l.ChargeRange; r != nil {
		fmt.Fprintf(w, "\ncharge (loop %s): %s\n", l.Loop, ChargeSummary(r))
	}
	if len(l.Worst) > 0 {
		fmt.Fprintf(w, "\nworst case per margin (loop %s):\n", l.Loop)
		tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
		fmt.Fprintln(tw, "  margin\tcase\tcomponent\tvalue\tlimit\tuse\tstatus")
		for _, m := range l.Worst {
			where := m.Case
			if m.Point != "" {
				where += " at " + m.Point
			}
			v, lim := MarginValue(l, CaseOf(l, m), m)
			fmt.Fprintf(tw, "  %s\t%s\t%s\t%s\t%s\t%s\t%s\n", m.Margin, where, m.Component, v, lim, fixed(m.Use, 2), m.Status)
		}
		tw.Flush()
	}
}

// CaseOf finds the case (or sweep point) a loop's worst margin comes from.
func CaseOf(l *flow.LoopResult, m flow.Margin) *flow.CaseResult {
	for i := range l.Cases {
		c := &l.Cases[i]
		if c.Case != m.Case || c.Grid != (m.Point != "" && m.Time == nil) {
			continue
		}
		if !c.Grid || c.PointLabel() == m.Point {
			return c
		}
	}
	return nil
}

// ChargeSummary says where the fill charge stands against the range every
// case accepts: inside it and how far from the nearer end, or how far
// outside.
func ChargeSummary(r *flow.ChargeRange) string {
	kg := func(v float64) string { return sig(v, 3) + " kg" }
	// The ends keep their trailing zeros, as the margin table's range of
	// each case does (0.110–0.150 kg): 0.15 kg beside it read as another
	// figure for the same end.
	end := func(v float64) string { return sigZeros(v, 3) + " kg" }
	by := func(c, p string) string {
		if p != "" {
			return c + " at " + p
		}
		return c
	}
	s := fmt.Sprintf("%s; the cases accept %s (set by %s) to %s (set by %s)", kg(r.Charge), end(r.Low), by(r.LowCase, r.LowPoint), end(r.High), by(r.HighCase, r.HighPoint))
	switch {
	case r.Low > r.High:
		s += fmt.Sprintf(": no charge suits every case (the ranges miss each other by %s)", kg(r.Low-r.High))
	case r.Charge < r.Low:
		s += fmt.Sprintf(": outside, %s short; add at least %s", kg(r.Low-r.Charge), kg(r.Low-r.Charge))
	case r.Charge > r.High:
		s += fmt.Sprintf(": outside, %s over; remove at least %s", kg(r.Charge-r.High), kg(r.Charge-r.High))
	default:
		s += fmt.Sprintf(": inside, %s above the low end and %s below the high end", kg(r.Charge-r.Low), kg(r.High-r.Charge))
	}
	return s
}

// MarginValue formats a margin's value and limit for people: temperatures
// in °C, pressures as the design pressure was written, angles in degrees,
// and the charge against the range the case accepts (c may be nil).
func MarginValue(l *flow.LoopResult, c *flow.CaseResult, m flow.Margin) (value, limit string) {
	if m.Margin == flow.MarginCharge && c != nil && c.ChargeRange != nil {
		r := c.ChargeRange
		return sig(m.Value, 3) + " kg", sigRange(r.Low, r.High, 3) + " kg"
	}
	if m.Unit == "Pa" {
		return pressureAs(m.Value, l.DesignPressureUnit), pressureAs(m.Limit, l.DesignPressureUnit)
	}
	if m.LimitField == flow.LimitFluidRange {
		// No design limit: where the fluid's properties end, to the
		// hundredth the fluid list gives it.
		return unitValue(m.Value, m.Unit), fixed(celsius(m.Limit), 2) + " °C (top of " + l.Fluid + "'s range)"
	}
	return unitValue(m.Value, m.Unit), unitValue(m.Limit, m.Unit)
}

func unitValue(v float64, unit string) string {
	switch unit {
	case "K":
		return temperature(v)
	case "Pa":
		return pressureAs(v, "")
	case "rad":
		return fixed(deg(v), 1) + "°"
	case "W":
		return fixed(v, 0) + " W"
	case "kg":
		return sig(v, 3) + " kg"
	}
	// Ratios and qualities keep their trailing zeros (0.500, 2.00), as the
	// findings and the check's summary print them beside a 0.605.
	return sigZeros(v, 3)
}

func caseHeader(c *flow.CaseResult) string {
	s := "case " + c.Case
	if c.Grid || c.Pitch != 0 || c.Roll != 0 || c.Yaw != 0 || c.Accel != [3]float64{} {
		s += fmt.Sprintf(" (pitch %s, roll %s, yaw %s", angle(c.Pitch), angle(c.Roll), angle(c.Yaw))
		if a := c.Accel; a != [3]float64{} {
			s += fmt.Sprintf(", acceleration (%s, %s, %s) gn", sig(a[0]/geom.Gn, 3), sig(a[1]/geom.Gn, 3), sig(a[2]/geom.Gn, 3))
		}
		s += ")"
	}
	if len(StableRoots(c)) > 1 {
		s += " [several operating points]"
	}
	return s
}

// OverridesText lists the component values a case replaces, each with the
// component's own: "conductance coil 35 W/K (own 180 W/K); sink coil 45.0 °C (own 35.0 °C)".
func OverridesText(ovs []flow.Override) string {
	parts := make([]string, 0, len(ovs))
	for _, o := range ovs {
		show := func(v float64) string {
			switch o.Field {
			case "sink":
				return temperature(v)
			case "conductance":
				return sig(v, 3) + " W/K"
			}
			return fixed(v, 0) + " W"
		}
		t := fmt.Sprintf("%s %s %s", o.Field, o.Component, show(o.Value))
		switch {
		case o.Own != nil:
			t += " (own " + show(*o.Own) + ")"
		case o.Field == "conductance":
			t += " (own: by geometry)"
		}
		parts = append(parts, t)
	}
	return strings.Join(parts, "; ")
}

func caseText(w io.Writer, l *flow.LoopResult, c *flow.CaseResult, tilt *picture.Tilt) {
	fmt.Fprintf(w, "\n%s: heat %s W", caseHeader(c), fixed(c.Heat, 0))
	if c.SatSource != "" {
		fmt.Fprintf(w, ", saturation %s, %s (%s)", temperature(c.SatTemperature), pressureAs(c.SatPressure, l.DesignPressureUnit), c.SatSource)
	}
	if l.Methods.Saturation == "auto" && c.SatState != "" {
		fmt.Fprintf(w, "; %s saturation state (%s)", c.SatState, ColumnShiftText(c.ColumnShift))
	}
	fmt.Fprintln(w)
	if len(c.Overrides) > 0 {
		fmt.Fprintf(w, "  this case: %s\n", OverridesText(c.Overrides))
	}
	if !c.Circulates {
		fmt.Fprintf(w, "  no circulation: %s\n", c.Reason)
	} else {
		fmt.Fprintf(w, "  mass flow %s g/s\n", fixed(c.MassFlow*1e3, 2))
		stateTable(w, c)
		localTable(w, l, c)
		budgetTable(w, l, c)
		t := c.Totals
		fmt.Fprintf(w, "  heat in %s W, rejected %s W; gravity head at vanishing flow %s Pa; inventory %s kg (+ %s kg in reservoirs)\n",
			fixed(t.Heat, 1), fixed(t.Rejected, 1), fixed(t.HeadMax, 0), sigZeros(t.Inventory, 3), reservoirText(t.Reservoirs))
		if t.Transit > 0 {
			fmt.Fprintf(w, "  transit time round the loop %s s: attitude or acceleration changing faster than this is beyond this quasi-static estimate; a transient model or a test is needed\n", sigZeros(t.Transit, 3))
		}
		for _, cs := range c.Components {
			if j := cs.Junction; j != nil {
				fmt.Fprintf(w, "  junction on %s: %s (device case %s, wall %s; %s K/W)\n",
					cs.Component, temperature(j.Junction), temperature(j.Case), temperature(j.Wall), sig(j.Resistance, 3))
			}
		}
		rootsText(w, c)
		stabilityText(w, c)
	}
	if c.Tilt != nil {
		fmt.Fprintf(w, "  tilt: %s", TiltSummary(c.Tilt))
		if tilt != nil {
			fmt.Fprintf(w, "; first margin to fail: %s", FailureText(tilt.FirstFailures(), TiltEnvelopeStep))
		}
		fmt.Fprintln(w)
	}
	if len(c.Margins) > 0 {
		tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
		fmt.Fprintln(tw, "  margin\tcomponent\tvalue\tlimit\tuse\tstatus")
		for _, m := range c.Margins {
			v, lim := MarginValue(l, c, m)
			fmt.Fprintf(tw, "  %s\t%s\t%s\t%s\t%s\t%s\n", m.Margin, m.Component, v, lim, fixed(m.Use, 2), m.Status)
		}
		tw.Flush()
	}
	for _, f := range c.Findings {
		fmt.Fprintf(w, "  %s: %s\n", f.Severity, f.Message)
	}
}

func stateTable(w io.Writer, c *flow.CaseResult) {
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "  component\tkind\tg/s\tkg/(m²·s)\tx in\tx out\tα out\tα mean\tu_l m/s\tu_v m/s\t")
	for _, s := range c.Components {
		fmt.Fprintf(tw, "  %s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t\n",
			s.Component, s.Kind, fixed(s.MassFlow*1e3, 2), fixed(s.MassFlux, 0), fixed(s.XIn, 3), fixed(s.XOut, 3),
			fixed(s.VoidOut, 3), fixed(s.VoidMean, 3), fixed(s.VelLiquid, 2), fixed(s.VelVapour, 2))
	}
	tw.Flush()
}

// reservoirText is the liquid held in reservoirs, kg: "0" for none.
func reservoirText(kg float64) string {
	if kg == 0 {
		return "0"
	}
	return sigZeros(kg, 3)
}

// ColumnShiftText says what a case's column shift is, the number
// saturation_state auto decides by: the static head of the liquid column
// at rest, without the losses or the condenser's subcooling that the
// evaporator inlet's subcooling at the estimated flow includes.
func ColumnShiftText(k float64) string {
	return fmt.Sprintf("liquid column at rest: saturation +%s K at the lowest evaporator inlet", fixed(k, 2))
}

// inletSubcoolingText explains an evaporator's inlet subcooling at the
// estimated flow, which the single saturation state leaves out: the local
// saturation temperature there (the loop's, raised by the liquid column's
// head less the losses on the way) less the liquid's own temperature (the
// loop's, less the condenser's subcooling). The parts are taken from the
// printed figures, so they add up as printed.
func inletSubcoolingText(c *flow.CaseResult, s *flow.ComponentState) string {
	l := s.Local
	r := func(v float64) float64 { return math.Round(v*100) / 100 }
	sub, tin, tl := r(l.SubcoolingIn), r(celsius(l.SatTempIn)), r(celsius(c.SatTemperature))
	t := fmt.Sprintf("at the estimated flow the liquid enters evaporator %s %s K below its local saturation temperature, %s °C at %s kPa, which the single saturation state ignores",
		s.Component, fixed(sub, 2), fixed(tin, 2), sigZeros(l.PressureIn/1e3, 4))
	if cond := r(sub - (tin - tl)); cond >= 0.05 {
		return t + fmt.Sprintf(": the liquid column's head less the losses on the way puts it %s K above the loop's saturation temperature, and the liquid left the condenser %s K below that",
			fixed(tin-tl, 2), fixed(cond, 2))
	}
	return t + ": the loop's saturation temperature raised by the liquid column's head less the losses on the way"
}

// localTable lists each component's local saturation: with saturation at
// local pressure always, with the single state only where the two differ by
// more than 1 K of evaporator-inlet subcooling.
func localTable(w io.Writer, l *flow.LoopResult, c *flow.CaseResult) {
	local := c.SatState == "local" || c.SatState == "" && l.Methods.Saturation == "local"
	if !local {
		for _, s := range c.Components {
			if s.Local != nil && s.Local.SubcoolingIn > 1 {
				fmt.Fprintf(w, "  note: %s; methods { saturation_state local } follows it\n", inletSubcoolingText(c, &s))
			}
		}
		return
	}
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	var ps []float64
	for _, s := range c.Components {
		if s.Local != nil {
			ps = append(ps, s.Local.PressureIn/1e3)
		}
	}
	pd := sigDecimals(ps, 4)
	fmt.Fprintln(tw, "  local saturation\tp in kPa\tT_sat in °C\tT_sat out °C\tinlet subcooling K\tboiling onset m\t")
	for _, s := range c.Components {
		if s.Local == nil {
			continue
		}
		sub, onset := "", ""
		if s.Kind == "evaporator" {
			sub = fixed(s.Local.SubcoolingIn, 2)
			onset = "—"
			if s.Local.BoilingOnset != nil {
				onset = fixed(*s.Local.BoilingOnset, 3)
			}
		}
		fmt.Fprintf(tw, "  %s\t%s\t%s\t%s\t%s\t%s\t\n", s.Component, fixed(s.Local.PressureIn/1e3, pd),
			fixed(s.Local.SatTempIn-273.15, 2), fixed(s.Local.SatTempOut-273.15, 2), sub, onset)
	}
	tw.Flush()
}

// BudgetRow is one line of a case's pressure budget in whole pascals.
type BudgetRow struct {
	Component string
	// Friction, gravity, acceleration (phase change), area change, local, total.
	Terms [6]int
}

// BudgetRows rounds a case's budget to whole pascals for display so that
// every row's terms add up to its total exactly and, for a single loop, each
// column of the total row (the last) is the sum of the rows above it, its
// total zero. Each number is within about a pascal of the estimate.
func BudgetRows(network bool, c *flow.CaseResult) []BudgetRow {
	terms := func(b flow.Budget) []float64 {
		return []float64{b.Friction, b.Gravity, b.Acceleration, b.AreaChange, b.Local}
	}
	rows := make([]BudgetRow, 0, len(c.Components)+1)
	mk := func(name string, b flow.Budget, total int) BudgetRow {
		r := BudgetRow{Component: name}
		copy(r.Terms[:5], roundToSum(terms(b), total))
		r.Terms[5] = total
		return r
	}
	tot := c.Totals.Budget
	if network {
		// Parallel branches: each row stands alone; the total row is the
		// flow-weighted sum, rounded to add up to zero.
		for _, s := range c.Components {
			rows = append(rows, mk(s.Component, s.Budget, int(roundHalf(s.Budget.Total))))
		}
		return append(rows, mk("total", tot, int(roundHalf(tot.Total))))
	}
	totals := make([]float64, len(c.Components))
	for i, s := range c.Components {
		totals[i] = s.Budget.Total
	}
	rt := roundToSum(totals, int(roundHalf(tot.Total)))
	sum := mk("total", tot, int(roundHalf(tot.Total)))
	vals := make([][]float64, len(c.Components))
	for i, s := range c.Components {
		rows = append(rows, mk(s.Component, s.Budget, rt[i]))
		vals[i] = terms(s.Budget)
	}
	balanceColumns(rows, vals, sum.Terms[:5])
	return append(rows, sum)
}

// balanceColumns moves units between the terms of the rows, keeping every
// row's sum, until each column adds up to its target: a unit goes from a
// column over its target to one under it, in the row whose rounding that
// helps most.
func balanceColumns(rows []BudgetRow, vals [][]float64, target []int) {
	n := len(target)
	disc := make([]int, n)
	for j := range disc {
		disc[j] = -target[j]
		for i := range rows {
			disc[j] += rows[i].Terms[j]
		}
	}
	for guard := 0; guard < 1000; guard++ {
		over, under := -1, -1
		for j := range disc {
			if disc[j] > 0 && over < 0 {
				over = j
			}
			if disc[j] < 0 && under < 0 {
				under = j
			}
		}
		if over < 0 || under < 0 || len(rows) == 0 {
			return
		}
		best, gain := 0, 0.0
		for i := range rows {
			g := (float64(rows[i].Terms[over]) - vals[i][over]) + (vals[i][under] - float64(rows[i].Terms[under]))
			if i == 0 || g > gain {
				best, gain = i, g
			}
		}
		rows[best].Terms[over]--
		rows[best].Terms[under]++
		disc[over]--
		disc[under]++
	}
}

func roundHalf(v float64) float64 {
	if v < 0 {
		return -float64(int(-v + 0.5))
	}
	return float64(int(v + 0.5))
}

func budgetTable(w io.Writer, l *flow.LoopResult, c *flow.CaseResult) {
	fmt.Fprintf(w, "  %s", BudgetConvention)
	if l.Network {
		fmt.Fprint(w, "; the total row weights each component by its share of the loop flow")
	}
	fmt.Fprintln(w)
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "  component\tfriction\tgravity\tacceleration\tarea change\tlocal\ttotal\t")
	for _, r := range BudgetRows(l.Network, c) {
		fmt.Fprintf(tw, "  %s\t%d\t%d\t%d\t%d\t%d\t%d\t\n", r.Component, r.Terms[0], r.Terms[1], r.Terms[2], r.Terms[3], r.Terms[4], r.Terms[5])
	}
	tw.Flush()
}

// StableRoots are the stable balances of a case (a single loop's, or a
// network's when it has several), in order of flow.
func StableRoots(c *flow.CaseResult) []flow.Root {
	var out []flow.Root
	for _, r := range c.Roots {
		if r.Stable {
			out = append(out, r)
		}
	}
	sort.Slice(out, func(i, j int) bool { return out[i].MassFlow < out[j].MassFlow })
	return out
}

// OperatingPoints says, when a case has more than one balance, every one
// of them, which is reported and why; "" when there is one.
func OperatingPoints(c *flow.CaseResult) string {
	if len(c.Roots) < 2 {
		return ""
	}
	var stable, unstable []string
	for _, r := range c.Roots {
		s := fixed(r.MassFlow*1e3, 2) + " g/s"
		if r.Stable {
			stable = append(stable, s)
		} else {
			unstable = append(unstable, s)
		}
	}
	s := "balances: stable at " + strings.Join(stable, ", ")
	if len(stable) == 0 {
		s = "balances: none stable"
	}
	if len(unstable) > 0 {
		s += "; statically unstable (excess head rising with flow) at " + strings.Join(unstable, ", ")
	}
	if len(stable) > 1 {
		s += fmt.Sprintf("; reported: %s g/s, the stable balance of highest flow, which the estimate always takes; "+
			"which one the loop settles on depends on its history (start-up, load and sink changes): check the margins at the others by test",
			fixed(c.MassFlow*1e3, 2))
	}
	return s
}

func rootsText(w io.Writer, c *flow.CaseResult) {
	if s := OperatingPoints(c); s != "" {
		fmt.Fprintf(w, "  %s\n", s)
	}
}

// TiltSummary says where circulation stops around the case's attitude.
func TiltSummary(t *flow.TiltLimits) string {
	var parts []string
	for _, a := range []struct {
		n string
		v *float64
	}{{"pitch", t.PitchUp}, {"pitch", t.PitchDown}, {"roll", t.RollLeft}, {"roll", t.RollRight}} {
		if a.v != nil {
			parts = append(parts, a.n+" "+angle(*a.v))
		}
	}
	s := "circulation stops at "
	if len(parts) == 0 {
		s += "no attitude within half a turn"
	} else {
		s += strings.Join(parts, ", ")
	}
	return s + fmt.Sprintf(" (margin %s°)", fixed(deg(t.Margin), 1))
}

// sweepText writes a case's sweep points as one table: the attitude and
// acceleration, the flow and the margin closest to its limit.
func sweepText(w io.Writer, l *flow.LoopResult, base *flow.CaseResult, pts []flow.CaseResult) {
	name := base.Case
	other := 0
	for i := range pts {
		if l.Methods.Saturation == "auto" && pts[i].SatState != "" && pts[i].AutoState() != pts[i].SatState {
			other++
		}
	}
	fmt.Fprintf(w, "\nsweep of case %s: %d points (the loss reserve is not evaluated on sweep points)%s\n", name, len(pts), CaseStateText(l, base, other))
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "  pitch\troll\tacceleration gn\tmass flow g/s\tlimiting margin\tcomponent\tvalue\tlimit\tuse\tstatus")
	for i := range pts {
		c := &pts[i]
		a := c.Accel
		acc := sig(a[0]/geom.Gn, 3) + ", " + sig(a[1]/geom.Gn, 3) + ", " + sig(a[2]/geom.Gn, 3)
		flowText := "none"
		if c.Circulates {
			flowText = fixed(c.MassFlow*1e3, 2)
		}
		fmt.Fprintf(tw, "  %s\t%s\t%s\t%s", angle(c.Pitch), angle(c.Roll), acc, flowText)
		if m, ok := Limiting(c); ok {
			v, lim := MarginValue(l, c, m)
			fmt.Fprintf(tw, "\t%s\t%s\t%s\t%s\t%s\t%s\n", m.Margin, m.Component, v, lim, fixed(m.Use, 2), m.Status)
		} else {
			fmt.Fprint(tw, "\t\t\t\t\t\t\n")
		}
	}
	tw.Flush()
}

// Limiting is the case's margin that uses the most of its limit.
func Limiting(c *flow.CaseResult) (flow.Margin, bool) {
	var best flow.Margin
	ok := false
	for _, m := range c.Margins {
		if !ok || m.Use > best.Use {
			best, ok = m, true
		}
	}
	return best, ok
}

// stabilityText summarises the stability indicators of a case in a line or
// two: the static state of a network's branches, each evaporator's
// density-wave numbers against Ishii's boundary, geysering and
// maldistribution.
func stabilityText(w io.Writer, c *flow.CaseResult) {
	st := c.Stability
	if st == nil {
		return
	}
	var parts []string
	if n := len(st.Branches); n > 0 {
		bad := 0
		for _, b := range st.Branches {
			if !b.Stable {
				bad++
			}
		}
		if bad == 0 {
			parts = append(parts, fmt.Sprintf("all %d branches statically stable (Ledinegg)", n))
		} else {
			parts = append(parts, fmt.Sprintf("%d of %d branches statically unstable (Ledinegg)", bad, n))
		}
		if md := st.Mode; md != nil && bad == 0 {
			parts[len(parts)-1] = fmt.Sprintf("each of %d branches stable against the rest, but the mode shifting flow from %s to %s statically unstable (Ledinegg, slope %s Pa/(kg/s))",
				n, strings.Join(md.Lose, ", "), strings.Join(md.Gain, ", "), sigZeros(md.Slope, 3))
		}
		if st.ModeNote != "" {
			parts = append(parts, st.ModeNote)
		}
	}
	for _, ch := range st.Channels {
		s := fmt.Sprintf("%s N_pch − N_sub %s against the density-wave boundary %s", ch.Component, sigZeros(ch.Npch-ch.Nsub, 3), sigZeros(ch.Boundary, 3))
		if !ch.Stable {
			s += " (beyond it)"
		}
		if ch.Geysering {
			s += ", geysering likely"
		}
		parts = append(parts, s)
	}
	parts = append(parts, st.Maldistribution...)
	fmt.Fprintf(w, "  stability: %s\n", strings.Join(parts, "; "))
}

// Envelopes are tilt envelopes by loop and case name.
type Envelopes map[[2]string]*picture.Tilt

// TiltEnvelopeStep is the angle step of the envelopes the estimate's tilt
// lines come from, rad.
const TiltEnvelopeStep = 5 * math.Pi / 180

// TiltEnvelopes sweeps pitch and roll around every case of res whose tilt
// limits were searched (not sweep points), so the tilt lines can say where
// the first margin fails. progress, when set, is told each case.
func TiltEnvelopes(m *lang.Model, res *flow.Result, progress func(string)) Envelopes {
	env := Envelopes{}
	for _, lr := range res.Loops {
		l := loopNamed(m, lr.Loop)
		if l == nil {
			continue
		}
		for _, c := range lr.Cases {
			if c.Grid || c.Tilt == nil || m.Case(c.Case) == nil {
				continue
			}
			if progress != nil {
				progress(fmt.Sprintf("loop %s, case %s: sweeping pitch and roll for the margins", lr.Loop, c.Case))
			}
			if t, err := picture.TiltOf(m, l, c.Case, TiltEnvelopeStep); err == nil {
				env[[2]string{lr.Loop, c.Case}] = t
			}
		}
	}
	return env
}

// FailureText says where the first margin fails in each direction.
func FailureText(fs []picture.TiltFailure, step float64) string {
	var parts []string
	for _, f := range fs {
		if f.AtCase {
			return "already at the case's attitude (" + f.What + ")"
		}
		if !f.Found {
			parts = append(parts, fmt.Sprintf("%s none as far as %s", f.Axis, angle(f.Angle)))
			continue
		}
		parts = append(parts, fmt.Sprintf("%s %s (%s)", f.Axis, angle(f.Angle), f.What))
	}
	return strings.Join(parts, ", ") + fmt.Sprintf(" (%s° steps)", sig(deg(step), 3))
}

// ParamSetText says that a parameter has another value than its file's:
// "variant: stack_height = 0.5 m in place of the file's 0.4 m".
func ParamSetText(p flow.ParamSet) string {
	return fmt.Sprintf("variant: %s = %s in place of the file's %s", p.Param, p.Written, p.FileWritten)
}
