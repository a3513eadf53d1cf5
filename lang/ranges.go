// Ranges: the physically possible values of each numeric field, checked
// where the value is written so that a sign slip or an impossible limit is
// reported at its text instead of turning into a meaningless estimate.

package lang

import (
	"math"
	"sort"
	"strings"

	"circa/units"
)

// valueRange is the span of values a field can take, in SI. A value outside
// [min, max] (or on an open end) is an error; a possible value outside
// [usualMin, +∞) draws a warning instead.
type valueRange struct {
	min, max         float64
	minOpen, maxOpen bool
	want             string // the allowed range in words, for the message
	unit             string // display unit of a computed value
	usualMin         float64
	usual            string // why a value below usualMin is suspect ("" for none)
}

const absZero = "above absolute zero (−273.15 °C)"

var inf = math.Inf(1)

// fieldRanges lists, per field, the values it can take. Sizes of a
// component's tubes (length, bore, areas, volume) are checked by the
// not-positive rule, which knows that bends and fittings may have no length;
// rise and run carry a direction and take any sign.
var fieldRanges = map[string]valueRange{
	"charge":          {min: 0, max: inf, minOpen: true, want: "more than 0 kg", unit: "kg"},
	"design_pressure": {min: 0, max: inf, minOpen: true, want: "above 0 bar absolute (−1.01325 bar(g))", unit: "bar"},
	"saturation":      {min: 0, max: inf, minOpen: true, want: absZero, unit: "degC"},
	"wall_limit":      {min: 0, max: inf, minOpen: true, want: absZero, unit: "degC"},
	"junction_limit":  {min: 0, max: inf, minOpen: true, want: absZero, unit: "degC"},
	"sink":            {min: 0, max: inf, minOpen: true, want: absZero, unit: "degC"},
	"outlet":          {min: 0, max: inf, minOpen: true, want: absZero, unit: "degC"},
	"saturation_max":  {min: 0, max: inf, minOpen: true, want: absZero, unit: "degC"},
	"heat":            {min: 0, max: inf, want: "zero or more (an evaporator takes heat in)", unit: "W"},
	"loss":            {min: 0, max: inf, want: "zero or more (a loss coefficient takes pressure away)", unit: ""},
	"heat_flux":       {min: 0, max: inf, minOpen: true, want: "more than 0 W/m² (an evaporator takes heat in)", unit: "W/cm2"},
	"roughness_boiling": {min: 0, max: inf, minOpen: true,
		want: "more than 0 µm (the boiling correlation takes its logarithm; leave it out for the 1 µm default)", unit: "um"},
	"conductance":          {min: 0, max: inf, want: "zero or more", unit: "W/K"},
	"coolant_htc":          {min: 0, max: inf, minOpen: true, want: "more than 0 W/(m² K)", unit: "W/(m2 K)"},
	"subcool":              {min: 0, max: inf, want: "zero or more (the outlet liquid is at or below its saturation temperature)", unit: "K"},
	"junction_to_case":     {min: 0, max: inf, want: "zero or more", unit: "K/W"},
	"interface_resistance": {min: 0, max: inf, want: "zero or more", unit: "K/W"},
	"spreading_resistance": {min: 0, max: inf, want: "zero or more", unit: "K/W"},
	"pitch":                {min: -maxPitch, max: maxPitch, want: "within ±90° (a pitch past a quarter turn is the same attitude as a smaller pitch with roll and yaw turned by 180°)", unit: "deg"},
	"roll":                 {min: -maxRoll, max: maxRoll, want: "within ±180°", unit: "deg"},
	"yaw":                  {min: -maxRoll, max: maxRoll, want: "within ±180°", unit: "deg"},
	"exit_quality":         {min: 0, max: 1, minOpen: true, want: "more than 0 and at most 1 (a vapour mass fraction)", unit: ""},
	"flooding":             {min: 0, max: 1, minOpen: true, want: "more than 0 and at most 1 (a fraction of the flooding limit)", unit: ""},
	"chf_ratio": {min: 0, max: inf, minOpen: true, want: "more than 0", unit: "",
		usualMin: 1, usual: "a ratio below 1 accepts a heat flux above the estimated critical heat flux"},
	"head_ratio": {min: 0, max: inf, minOpen: true, want: "more than 0", unit: "",
		usualMin: 1, usual: "a ratio below 1 tests the loop with less friction than the estimate itself"},
	"tilt_margin": {min: 0, max: inf, want: "zero or more", unit: "deg"},
	"wall_margin": {min: 0, max: inf, want: "zero or more", unit: "K"},
}

// inRange reports a value of field kw that lies outside its range, at the
// value's text. An impossible value is an error and comes back unset and
// bad, so that nothing is estimated from it; an unusual one is a warning and
// is kept.
func (r *resolver) inRange(kw, file string, v Value) Value {
	rg, ok := fieldRanges[kw]
	if !ok || !v.Set {
		return v
	}
	x := v.SI
	switch {
	case rg.outside(x):
		r.errorf("bad-value", file, v.Span(), "%s must be %s, not %s", kw, rg.want, r.valueText(file, v, rg.unit))
		v.Set, v.Bad = false, true
	case rg.usual != "" && x < rg.usualMin:
		r.diag("unusual-value", Warning, file, v.Span(), "%s %s is unusual: %s", kw, r.valueText(file, v, rg.unit), rg.usual)
	}
	return v
}

func (rg valueRange) outside(x float64) bool {
	return x < rg.min || (rg.minOpen && x == rg.min) || x > rg.max || (rg.maxOpen && x == rg.max)
}

// rangeWant says what a value x of field kw must be when x is outside the
// field's range, and is "" within it: a value read from a table is held to
// the range of the field it gives.
func rangeWant(kw string, x float64) string {
	if rg, ok := fieldRanges[kw]; ok && rg.outside(x) {
		return rg.want
	}
	return ""
}

// valueText shows a value as written; a value computed from parameters
// also shows what it came to and which parameters it came from.
func (r *resolver) valueText(file string, v Value, unit string) string {
	text := src(r.m.Files[file], v.Span())
	ps := r.m.ParamsIn(v.Loc())
	if len(ps) == 0 {
		return text
	}
	u := units.Unit{}
	if v.Unit() != "" {
		unit = v.Unit()
	}
	if unit != "" {
		if pu, err := units.Parse(unit); err == nil {
			u = pu
		}
	}
	word := "param "
	if len(ps) > 1 {
		word = "params "
	}
	return text + " = " + units.Format(v.SI, u) + " (from " + word + strings.Join(ps, ", ") + ")"
}

// ParamsIn returns the parameters used within loc, in the order written,
// each once.
func (m *Model) ParamsIn(loc Location) []string {
	var ps []string
	for ref := range m.Refs() {
		if ref.Kind != RefParam || ref.IsDecl || ref.File() != loc.File || ref.Span().Start < loc.Span.Start || ref.Span().End > loc.Span.End {
			continue
		}
		if indexOf(ps, ref.Name) < 0 {
			ps = append(ps, ref.Name)
		}
	}
	return ps
}

// ParamsReaching returns the top-level parameters whose values reach a
// field of a loop, component, case, limit or method: named there, or named
// by another parameter that does, at any depth. A parameter outside the set
// changes no estimate whatever its value. The set is found from the
// references alone, in time proportional to their number.
func (m *Model) ParamsReaching() map[string]bool {
	// The span of each parameter's expression, by file, in file order.
	type span struct {
		start, end int
		name       string
	}
	exprs := map[string][]span{}
	for _, p := range m.Params {
		if p.Expr == nil {
			continue
		}
		s := p.Expr.Span()
		exprs[p.File()] = append(exprs[p.File()], span{s.Start, s.End, p.Name})
	}
	for _, ss := range exprs {
		sort.Slice(ss, func(i, j int) bool { return ss[i].start < ss[j].start })
	}
	// within returns the parameter whose expression holds the reference.
	within := func(ref Ref) (string, bool) {
		ss := exprs[ref.File()]
		i := sort.Search(len(ss), func(i int) bool { return ss[i].start > ref.Span().Start }) - 1
		if i >= 0 && ref.Span().End <= ss[i].end {
			return ss[i].name, true
		}
		return "", false
	}
	uses := map[string][]string{}
	reach := map[string]bool{}
	var todo []string
	for ref := range m.Refs() {
		if ref.Kind != RefParam || ref.IsDecl {
			continue
		}
		if by, ok := within(ref); ok {
			uses[by] = append(uses[by], ref.Name)
			continue
		}
		if !reach[ref.Name] {
			reach[ref.Name] = true
			todo = append(todo, ref.Name)
		}
	}
	for len(todo) > 0 {
		n := todo[len(todo)-1]
		todo = todo[:len(todo)-1]
		for _, u := range uses[n] {
			if !reach[u] {
				reach[u] = true
				todo = append(todo, u)
			}
		}
	}
	return reach
}
