package check

import (
	"math"
	"strings"

	"circa/check/correlate"
	"circa/check/flow"
	"circa/lang"
)

// correlationRangeRationale explains the correlation-range rule with every
// stated range and its source, so that circa explain shows them.
var correlationRangeRationale = func() string {
	var b strings.Builder
	b.WriteString("Each correlation was fitted to data over a range of conditions; outside it the formula still gives a number, but nothing vouches for it. " +
		"The forced-convection condensation correlations, for one, were fitted to turbulent flow, while a low-flow thermosiphon condenser is often laminar. " +
		"The estimate checks, at each case's own operating point, the inputs of the correlations it applied against the ranges below and reports, per component and correlation, the input furthest outside, with its value and the range. " +
		"It is information, not a warning: most thermosiphons sit outside some fitted range, and the estimate stays the best figure the chosen method gives. " +
		"Stated ranges:")
	for _, v := range correlate.Validities() {
		b.WriteString(" " + v.Correlation + ": ")
		for i, bd := range v.Bounds {
			if i > 0 {
				b.WriteString("; ")
			}
			b.WriteString(bd.Text() + " (" + bd.What + "; " + bd.Source + ")")
		}
		b.WriteString(".")
	}
	b.WriteString(" Correlations for which no source at hand states a range (Müller-Steinhagen & Heck, the homogeneous models, the void fractions, Akers, Deans & Crosser, the pool-boiling critical heat flux, Wallis flooding, the Nusselt and Chato films) are not checked.")
	return b.String()
}()

// rangeFactor is how far a correlation-range finding's value lies outside
// its range, as a ratio ≥ 1.
func rangeFactor(f flow.Finding) float64 {
	v, l := f.Value, f.Limit
	if !(v > 0) || !(l > 0) {
		return math.Inf(1)
	}
	return math.Max(v/l, l/v)
}

// methodChoice is the methods { … } entry that selects the named
// correlation; ok is false for a correlation no entry selects.
func methodChoice(ms lang.Methods, correlation string) (lang.Choice, bool) {
	v, ok := correlate.ValidityOf(correlation)
	if !ok {
		return lang.Choice{}, false
	}
	switch v.Method {
	case "friction":
		return ms.Friction, true
	case "chf":
		return ms.CHF, true
	case "condensation":
		return ms.Condensation, true
	}
	return lang.Choice{}, false
}
