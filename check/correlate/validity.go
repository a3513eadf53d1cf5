package correlate

import (
	"math"
	"strconv"
)

// A correlation is fitted to data over a range of conditions; outside it
// the formula still returns a number, but nothing vouches for it. Validity
// lists, for the correlations the estimator selects, the ranges of their
// inputs that a source states, each with that source. A range that could
// not be checked against a printed source says "from memory"; a correlation
// whose range no source at hand states lists none rather than a guessed one.

// Bound is the stated range of one input of a correlation. Min or Max is
// ±Inf where the source states no end.
type Bound struct {
	// Quantity is the input's symbol as printed in findings ("Re_lo").
	Quantity string
	// What says what the quantity is ("liquid-only Reynolds number G·D/μl").
	What     string
	Unit     string // "" for a dimensionless quantity
	Min, Max float64
	// Source names where the range is stated.
	Source string
}

// Text writes the range: "Re_lo ≥ 350", "0.002 ≤ p_r ≤ 0.44".
func (b Bound) Text() string {
	u := ""
	if b.Unit != "" {
		u = " " + b.Unit
	}
	lo, hi := !math.IsInf(b.Min, -1), !math.IsInf(b.Max, 1)
	switch {
	case lo && hi:
		return num(b.Min) + u + " ≤ " + b.Quantity + " ≤ " + num(b.Max) + u
	case lo:
		return b.Quantity + " ≥ " + num(b.Min) + u
	case hi:
		return b.Quantity + " ≤ " + num(b.Max) + u
	}
	return b.Quantity + " unbounded"
}

func num(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

// Validity is a correlation with the stated ranges of its inputs.
type Validity struct {
	// Correlation names it with its year, as in findings: "Shah (1979)".
	Correlation string
	// Method is the methods { … } field that selects it ("friction",
	// "chf", "condensation"), empty when the estimator always uses it.
	Method string
	Bounds []Bound
}

// Outside is an input that lies outside its stated range.
type Outside struct {
	Bound Bound
	Value float64
	// Limit is the end of the range the value passes.
	Limit float64
	// Factor says how far outside, as a ratio ≥ 1: Limit/Value below the
	// range, Value/Limit above it (+Inf for a value ≤ 0 below a positive
	// minimum).
	Factor float64
}

// Below reports whether the value lies below the range (else above).
func (o Outside) Below() bool { return o.Value < o.Limit }

// Worst returns the input of v furthest outside its stated range, by
// Factor, among the quantities given in values (by Bound.Quantity); ok is
// false when every given input lies inside its range. Quantities that v
// states no range for, or that are not finite, are ignored. Every bound is
// of a positive quantity, so the factor is a ratio.
func (v Validity) Worst(values map[string]float64) (o Outside, ok bool) {
	for _, b := range v.Bounds {
		x, given := values[b.Quantity]
		if !given || math.IsNaN(x) || math.IsInf(x, 0) {
			continue
		}
		var f, lim float64
		switch {
		case x < b.Min:
			lim = b.Min
			f = math.Inf(1)
			if x > 0 {
				f = b.Min / x
			}
		case x > b.Max:
			lim = b.Max
			f = x / b.Max
		default:
			continue
		}
		if !ok || f > o.Factor {
			o, ok = Outside{Bound: b, Value: x, Limit: lim, Factor: f}, true
		}
	}
	return o, ok
}

// Sources of the stated ranges.
const (
	srcFluidsFriedel = "fluids library (C. Bell), two_phase.Friedel: " +
		"\"known to work poorly when mul/mug > 1000\"; 2021 ASHRAE Handbook—Fundamentals, ch. 5: " +
		"\"generally recommended when the viscosity ratio μl/μv is less than 1000\""
	srcFluidsFriedelD  = "fluids library (C. Bell), two_phase.Friedel: \"tested on data with diameters as small as 4 mm\""
	srcFluidsFriedelUp = "fluids library (C. Bell), two_phase.Friedel: \"applicable to vertical upflow and horizontal flow\"; " +
		"a tube within 5° of horizontal (|cos θ| ≤ 0.0872) counts as horizontal (circa's choice)"
	srcFluidsLM = "fluids library (C. Bell), two_phase.Lockhart_Martinelli: \"developed for horizontal flow\"; " +
		"a tube within 5° of horizontal (|cos θ| ≤ 0.0872) counts as horizontal (circa's choice)"
	srcDittusBoelter = "the turbulent range of the Dittus–Boelter-type single-phase coefficient it scales: " +
		"Re_D ≥ 10000 as the ht library (C. Bell) states for conv_internal.turbulent_Dittus_Boelter"
	srcShahMemory = "Shah (1979) data range and Shah's later (1981) low-flow limit, from memory " +
		"(Shah, HVAC&R Research 15(5), 2009, 889–913, confirms that the 1981 paper set low-flow limits)"
	srcCooperMemory    = "Cooper (1984) data range, from memory"
	srcKattoOhnoMemory = "Katto & Ohno (1984) data range, from memory"
)

// cos85 is cos 85° to the digits printed: a tube within 5° of
// perpendicular to the body force counts as horizontal.
const cos85 = 0.0872

// The stated ranges of each correlation the estimator can select. Those
// with no range a source at hand states (Müller-Steinhagen & Heck, the
// homogeneous models, the void fractions, Akers,
// Deans & Crosser, the pool-boiling CHF, Wallis flooding, Nusselt's and
// Chato's films) are not listed.
var (
	// ValidityFriedel: Friedel's multiplier was fitted with μl/μv below
	// 1000, tubes of 4 mm and more, in upflow and horizontal flow.
	ValidityFriedel = Validity{Correlation: "Friedel (1979)", Method: "friction", Bounds: []Bound{
		{Quantity: "μl/μv", What: "liquid-to-vapour viscosity ratio", Min: math.Inf(-1), Max: 1000, Source: srcFluidsFriedel},
		{Quantity: "D", What: "tube bore", Unit: "m", Min: 0.004, Max: math.Inf(1), Source: srcFluidsFriedelD},
		{Quantity: "cos θ", What: "cosine of the angle between the flow and the body force, positive in downflow",
			Min: math.Inf(-1), Max: cos85, Source: srcFluidsFriedelUp},
	}}
	// ValidityLockhartMartinelli: Lockhart & Martinelli's data are for
	// horizontal pipes.
	ValidityLockhartMartinelli = Validity{Correlation: "Lockhart & Martinelli (1949)", Method: "friction", Bounds: []Bound{
		{Quantity: "|cos θ|", What: "cosine of the angle between the tube and the body force",
			Min: math.Inf(-1), Max: cos85, Source: srcFluidsLM},
	}}
	// ValidityShah1979: Shah's (1979) condensation correlation.
	ValidityShah1979 = Validity{Correlation: "Shah (1979)", Method: "condensation", Bounds: []Bound{
		{Quantity: "Re_lo", What: "liquid-only Reynolds number G·D/μl", Min: 350, Max: math.Inf(1), Source: srcShahMemory},
		{Quantity: "p_r", What: "reduced pressure p/p_c", Min: 0.002, Max: 0.44, Source: srcShahMemory},
	}}
	// ValidityBoykoKruzhilin: its h_lo = 0.021 (kl/D) Re_lo^0.8 Pr^0.43 is
	// a turbulent pipe-flow coefficient.
	ValidityBoykoKruzhilin = Validity{Correlation: "Boyko & Kruzhilin (1967)", Method: "condensation", Bounds: []Bound{
		{Quantity: "Re_lo", What: "liquid-only Reynolds number G·D/μl", Min: 1e4, Max: math.Inf(1), Source: srcDittusBoelter},
	}}
	// ValidityCavalliniSmithZecchin: Nu = 0.05 Re_eq^0.8 Pr^0.33 is a
	// turbulent form; Re_eq is least, equal to Re_lo, at the liquid end.
	ValidityCavalliniSmithZecchin = Validity{Correlation: "Cavallini, Smith & Zecchin (1974)", Method: "condensation", Bounds: []Bound{
		{Quantity: "Re_eq", What: "equivalent Reynolds number at the liquid end of the condenser (x = 0)", Min: 1e4, Max: math.Inf(1), Source: srcDittusBoelter},
	}}
	// ValidityCooper: Cooper's (1984) nucleate boiling coefficient.
	ValidityCooper = Validity{Correlation: "Cooper (1984)", Bounds: []Bound{
		{Quantity: "p_r", What: "reduced pressure p/p_c", Min: 0.001, Max: 0.9, Source: srcCooperMemory},
	}}
	// ValidityKattoOhno: Katto & Ohno's (1984) flow-boiling CHF.
	ValidityKattoOhno = Validity{Correlation: "Katto & Ohno (1984)", Method: "chf", Bounds: []Bound{
		{Quantity: "L/D", What: "heated length over bore", Min: 5, Max: 880, Source: srcKattoOhnoMemory},
		{Quantity: "ρv/ρl", What: "vapour-to-liquid density ratio", Min: 0.0003, Max: 0.41, Source: srcKattoOhnoMemory},
	}}
)

// Validities lists every correlation with stated ranges.
func Validities() []Validity {
	return []Validity{ValidityFriedel, ValidityLockhartMartinelli, ValidityShah1979, ValidityBoykoKruzhilin, ValidityCavalliniSmithZecchin,
		ValidityCooper, ValidityKattoOhno}
}

// ValidityOf returns the ranges of the named correlation (as in
// Validity.Correlation).
func ValidityOf(name string) (Validity, bool) {
	for _, v := range Validities() {
		if v.Correlation == name {
			return v, true
		}
	}
	return Validity{}, false
}

// Validity returns the stated ranges of an in-tube condensation method;
// ok is false for one with none listed.
func (m CondensationMethod) Validity() (Validity, bool) {
	switch m {
	case CondShah1979:
		return ValidityShah1979, true
	case CondBoykoKruzhilin:
		return ValidityBoykoKruzhilin, true
	case CondCavalliniSmithZecchin:
		return ValidityCavalliniSmithZecchin, true
	}
	return Validity{}, false
}
