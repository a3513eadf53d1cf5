package lsp

import (
	"fmt"
	"math"
	"path/filepath"
	"sort"
	"strconv"
	"strings"

	"go.lsp.dev/protocol"

	"circa/check/flow"
	"circa/lang"
)

// manoeuvreHover describes a case's profile and envelope as written.
func manoeuvreHover(cs *lang.Case) string {
	var b strings.Builder
	if p := cs.Profile; p != nil && len(p.Rows) > 0 {
		from := ""
		if p.Table != "" {
			from = " from `" + filepath.Base(p.Table) + "`"
		}
		fmt.Fprintf(&b, "- profile%s: %d instants, %s s to %s s (%s)\n", from, len(p.Rows),
			secs(p.Rows[0].Time), secs(p.Rows[len(p.Rows)-1].Time), strings.Join(p.Columns, ", "))
	}
	if e := cs.Envelope; e != nil && len(e.Axes) > 0 {
		parts := make([]string, len(e.Axes))
		for i, a := range e.Axes {
			parts[i] = a.Name + " " + axisValue(a.Name, a.Lo) + " to " + axisValue(a.Name, a.Hi)
		}
		fmt.Fprintf(&b, "- envelope: %s\n", strings.Join(parts, ", "))
	}
	return b.String()
}

func secs(t float64) string { return strconv.FormatFloat(t, 'g', 4, 64) }

// axisValue writes an envelope bound in degrees or standard gravities.
func axisValue(axis string, v float64) string {
	if axis == "pitch" || axis == "roll" {
		return strconv.FormatFloat(math.Round(v*180/math.Pi*10)/10, 'f', -1, 64) + "°"
	}
	return strconv.FormatFloat(v/9.80665, 'g', 3, 64) + " gn"
}

// manoeuvreEstimate adds to a case's hover the fluid's transit time, the
// worst instant of its profile and the worst combination of its envelope.
func manoeuvreEstimate(cr *flow.CaseResult) string {
	var b strings.Builder
	if t := cr.Totals.Transit; t > 0 {
		fmt.Fprintf(&b, "\ntransit time round the loop %s s: changes faster than this are beyond the quasi-static estimate\n", secs(t))
	}
	if p := cr.Profile; p != nil {
		if w, ok := worstOf(p.Worst); ok {
			fmt.Fprintf(&b, "\nprofile: worst instant t = %s s for **%s**%s — %.0f %% of the limit used (%s)\n", secs(*w.Time), w.Margin, atComponent(w.Component), 100*w.Use, w.Status)
		}
		if n := len(p.Fast); n > 0 {
			fmt.Fprintf(&b, "\n%d stretch(es) faster than the loop can follow (from t = %s s): the quasi-static estimate no longer holds there; a transient model or a test is needed\n", n, secs(p.Fast[0].From))
		}
	}
	if e := cr.Envelope; e != nil {
		ms := make([]flow.Margin, len(e.Worst))
		for i, w := range e.Worst {
			ms[i] = w.Margin
		}
		if w, ok := worstOf(ms); ok {
			at := e.Worst[0].At
			for _, x := range e.Worst {
				if x.Margin.Margin == w.Margin && x.Component == w.Component {
					at = x.At
				}
			}
			lab := (&flow.CaseResult{Yaw: at.Yaw, Pitch: at.Pitch, Roll: at.Roll, Accel: at.Accel}).PointLabel()
			fmt.Fprintf(&b, "\nenvelope: worst **%s**%s at %s — %.0f %% of the limit used (%s; %d steady states searched)\n", w.Margin, atComponent(w.Component), lab, 100*w.Use, w.Status, e.Estimates)
		}
		if s := e.Stops; s != nil {
			lab := (&flow.CaseResult{Yaw: s.Yaw, Pitch: s.Pitch, Roll: s.Roll, Accel: s.Accel}).PointLabel()
			fmt.Fprintf(&b, "\ncirculation stops within the envelope, at %s\n", lab)
		}
	}
	return b.String()
}

func atComponent(c string) string {
	if c == "" {
		return ""
	}
	return " at `" + c + "`"
}

// worstOf returns the margin with the largest use.
func worstOf(ms []flow.Margin) (flow.Margin, bool) {
	if len(ms) == 0 {
		return flow.Margin{}, false
	}
	s := append([]flow.Margin(nil), ms...)
	sort.SliceStable(s, func(i, j int) bool { return s[i].Use > s[j].Use })
	return s[0], true
}

// lineHint is an inlay hint for the end of the line holding off.
type lineHint struct {
	file  string
	off   int
	label string
}

// fieldHints label a component's channel count with the flow of one
// channel and its junction limit with the junction temperature, in the
// nominal case.
func fieldHints(c *cursor, est *estimates, comp *lang.Component) []lineHint {
	cr, ok := est.nominalCase(c.m, comp.Loop.Name)
	if !ok || !cr.Circulates {
		return nil
	}
	st, ok := componentState(cr, comp.Name)
	if !ok {
		return nil
	}
	var out []lineHint
	if n := comp.ChannelCount(); comp.Channels.Set && n > 1 {
		out = append(out, lineHint{comp.Channels.File(), comp.Channels.Span().Start, "ṁ " + prettyFormat(st.MassFlow/n, uGs) + " per channel"})
	}
	if j := st.Junction; j != nil {
		// Beside the limit, else beside the first resistance of the stack.
		for _, v := range []lang.Value{comp.JunctionLimit, comp.JunctionToCase, comp.InterfaceRes, comp.SpreadingRes} {
			if v.Set && v.File() != "" {
				out = append(out, lineHint{v.File(), v.Span().Start, "T_junction " + prettyFormat(j.Junction, uDegC)})
				break
			}
		}
	}
	return out
}

// caseHints label a case's head with the fluid's transit time, each
// conductance it overrides with the condenser's own, its profile with the
// worst instant (and each stretch faster than the loop), and its envelope
// with the worst combination.
func caseHints(est *estimates, cs *lang.Case) []lineHint {
	var out []lineHint
	for _, g := range cs.Conductances {
		if g.Comp == nil {
			continue
		}
		own := "own: by geometry"
		if g.Comp.Conductance.Set {
			own = "own " + asWritten(g.Comp.Conductance, "W/K")
		}
		out = append(out, lineHint{cs.File(), g.NameSpan.Start, own})
	}
	if est == nil || est.flow == nil {
		return out
	}
	for _, l := range est.flow.Loops {
		cr, ok := est.caseResult(l.Loop, cs.Name)
		if !ok {
			continue
		}
		if t := cr.Totals.Transit; t > 0 {
			out = append(out, lineHint{cs.File(), cs.Span().Start, "transit " + secs(t) + " s"})
		}
		if p := cr.Profile; p != nil && cs.Profile != nil {
			if w, ok := worstOf(p.Worst); ok {
				out = append(out, lineHint{cs.File(), cs.Profile.Span.Start, fmt.Sprintf("worst t = %s s: %s %.0f %%", secs(*w.Time), w.Margin, 100*w.Use)})
			}
			if cs.Profile.Table == "" {
				for _, fc := range p.Fast {
					for _, r := range cs.Profile.Rows {
						if r.Time == fc.From {
							out = append(out, lineHint{cs.File(), r.Span.Start, "faster than the loop (transit " + secs(fc.Transit) + " s)"})
						}
					}
				}
			}
		}
		if e := cr.Envelope; e != nil && cs.Envelope != nil {
			best := -1
			for i, w := range e.Worst {
				if best < 0 || w.Use > e.Worst[best].Use {
					best = i
				}
			}
			if best >= 0 {
				w := e.Worst[best]
				lab := (&flow.CaseResult{Yaw: w.At.Yaw, Pitch: w.At.Pitch, Roll: w.At.Roll, Accel: w.At.Accel}).PointLabel()
				out = append(out, lineHint{cs.File(), cs.Envelope.Span.Start, fmt.Sprintf("worst %s %.0f %% at %s", w.Margin.Margin, 100*w.Use, lab)})
			}
		}
		break
	}
	return out
}

// rowHover shows the estimate at one row of a case's profile: the flow,
// the transit time and the margin closest to its limit at that instant.
func (s *Server) rowHover(c *cursor, st *lang.Stmt) string {
	for _, cs := range c.m.Cases {
		p := cs.Profile
		if p == nil || p.File != c.path || p.Table != "" {
			continue
		}
		for _, r := range p.Rows {
			if r.Span.Start == st.Span().Start {
				return s.instantHover(c.snap, c.a, cs, r)
			}
		}
	}
	return ""
}

// tableRowHover shows, on a row of a profile's CSV file open in the
// editor, the estimate at that instant, as on a row written in a case; sp
// is the row's time.
func (s *Server) tableRowHover(sn *snapshot, path string, pos protocol.Position) (text string, sp lang.Span, ok bool) {
	a := sn.analysisFor(path)
	mp := sn.mapperFor(path)
	if a == nil || mp == nil {
		return "", lang.Span{}, false
	}
	off, _ := sn.offsetIn(path, pos)
	for _, cs := range a.Model().Cases {
		p := cs.Profile
		if p == nil || p.Table != path {
			continue
		}
		for _, r := range p.Rows {
			if loc, in := p.TableLoc(r); in && mp.OffsetLine(loc.Span.Start) == mp.OffsetLine(off) {
				return s.instantHover(sn, a, cs, r), loc.Span, true
			}
		}
	}
	return "", lang.Span{}, false
}

// instantHover is the estimate at row r of case cs's profile.
func (s *Server) instantHover(sn *snapshot, a *analysis, cs *lang.Case, r lang.ProfileRow) string {
	var b strings.Builder
	fmt.Fprintf(&b, "instant t = %s s of case `%s`'s profile, estimated as a steady state\n", secs(r.Time), cs.Name)
	est := s.estimatesFor(sn, a)
	if est == nil || est.flow == nil {
		b.WriteString("\n_No estimate yet._\n")
		return b.String()
	}
	for _, l := range est.flow.Loops {
		cr, ok := est.caseResult(l.Loop, cs.Name)
		if !ok || cr.Profile == nil {
			continue
		}
		for _, in := range cr.Profile.Instants {
			if in.Time != r.Time {
				continue
			}
			fmt.Fprintf(&b, "\n**Loop `%s`**: ", l.Loop)
			if !in.Circulates {
				fmt.Fprintf(&b, "no circulation — %s\n", in.Reason)
				break
			}
			fmt.Fprintf(&b, "mass flow %s, transit time %s s\n", prettyFormat(in.MassFlow, uGs), secs(in.Transit))
			if w, ok := worstOf(in.Margins); ok {
				fmt.Fprintf(&b, "\nworst margin: **%s**%s — %.0f %% of the limit used (%s)\n", w.Margin, atComponent(w.Component), 100*w.Use, w.Status)
			}
		}
	}
	return b.String()
}
