package lsp

import (
	"fmt"
	"strconv"
	"strings"

	"circa/check/flow"
	"circa/lang"
	"circa/units"
)

// componentHeadline is the answer a component's hover opens with: its
// closest margin in the nominal case against its limit, else its flow, or
// why there is none ("" before the first estimate).
func (s *Server) componentHeadline(c *cursor, comp *lang.Component) string {
	est := s.estimatesFor(c.snap, c.a)
	cr, ok := est.nominalCase(c.m, comp.Loop.Name)
	if !ok {
		return ""
	}
	if !cr.Circulates {
		return fmt.Sprintf("no circulation in `%s`", cr.Case)
	}
	var worst *flow.Margin
	for i := range cr.Margins {
		if mg := &cr.Margins[i]; mg.Component == comp.Name && (worst == nil || mg.Use > worst.Use) {
			worst = mg
		}
	}
	if worst != nil {
		return fmt.Sprintf("%s %s in `%s` (%s)", marginWords(worst.Margin), marginValue(*worst, worst.Value), cr.Case, limitWords(*worst))
	}
	if st, ok := componentState(cr, comp.Name); ok {
		return fmt.Sprintf("mass flow %s, exit quality %.2f in `%s`", prettyFormat(st.MassFlow, uGs), st.XOut, cr.Case)
	}
	return ""
}

// caseHeadline is the answer a case's hover opens with: the loop that does
// not circulate, else the closest margin over its loops ("" before the
// first estimate).
func (s *Server) caseHeadline(c *cursor, cs *lang.Case) string {
	est := s.estimatesFor(c.snap, c.a)
	if est == nil || est.flow == nil {
		return ""
	}
	var worst *flow.Margin
	for _, l := range est.flow.Loops {
		cr, ok := est.caseResult(l.Loop, cs.Name)
		if !ok {
			continue
		}
		if !cr.Circulates {
			return fmt.Sprintf("loop `%s` does not circulate", l.Loop)
		}
		for i := range cr.Margins {
			if mg := &cr.Margins[i]; worst == nil || mg.Use > worst.Use {
				worst = mg
			}
		}
	}
	if worst == nil {
		return ""
	}
	at := ""
	if worst.Component != "" {
		at = " at `" + worst.Component + "`"
	}
	return fmt.Sprintf("closest margin %s %s%s (%s)", marginWords(worst.Margin), marginValue(*worst, worst.Value), at, limitWords(*worst))
}

// marginWords spells a margin's name as words ("exit quality").
func marginWords(name string) string {
	if name == flow.MarginHead {
		// The exit quality with the losses scaled by head_ratio.
		return "exit quality at reserve losses"
	}
	return strings.ReplaceAll(name, "_", " ")
}

// marginValue formats a margin's value or limit: temperatures in °C, other
// values to three significant digits in the margin's unit.
func marginValue(mg flow.Margin, v float64) string {
	if mg.Margin == flow.MarginWall || mg.Margin == flow.MarginJunction {
		return prettyFormat(v, uDegC)
	}
	num := units.Sig(v, 3)
	if mg.Margin == flow.MarginCharge && v == mg.Value {
		num = strconv.FormatFloat(v, 'g', 3, 64) // the fill charge, as the margin table gives it
	}
	if mg.Unit == "" {
		return num
	}
	return num + " " + mg.Unit
}

// limitWords is "limit 0.5", saying so when the limit is passed.
func limitWords(mg flow.Margin) string {
	s := "limit " + marginValue(mg, mg.Limit)
	switch mg.Status {
	case "warning", "error":
		s += ", over the limit"
	}
	return s
}

// headlined joins what a thing is to its answer: "case `hot` — ...".
func headlined(what, answer string) string {
	if answer == "" {
		return what
	}
	return what + " — " + answer
}
