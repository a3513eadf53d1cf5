// Package vary estimates a design over a range of values of one or two of
// its parameters, so the user sees how each margin's use moves with them.
package vary

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"circa/lang"
	"circa/units"
)

// MaxValues bounds the values of one axis.
const MaxValues = 101

// Axis is a top-level parameter and the values a sweep gives it.
type Axis struct {
	Param  string
	Values []lang.Override
	// Unit is the unit the values are shown in: the unit of the spec's
	// first value ("" for plain numbers).
	Unit string
}

// SpecError is a sweep spec that cannot be read; Col is the 1-based
// column of the spec it concerns.
type SpecError struct {
	Spec string
	Col  int
	Msg  string
}

func (e *SpecError) Error() string { return fmt.Sprintf("%q, column %d: %s", e.Spec, e.Col, e.Msg) }

// Parse reads an axis: NAME=FROM..TO:N for N values evenly spaced from
// FROM to TO, ends included ("riser_bore=6mm..20mm:8"; a unit written only
// after TO applies to FROM too: "riser_bore=6..20mm:8"), or
// NAME=V1,V2,… for the values listed ("sink=20degC,30degC,40degC").
// Values are written as in a file; all must have one dimension.
func Parse(spec string) (Axis, error) {
	fail := func(at int, format string, args ...any) (Axis, error) {
		return Axis{}, &SpecError{Spec: spec, Col: at + 1, Msg: fmt.Sprintf(format, args...)}
	}
	eq := strings.IndexByte(spec, '=')
	if eq < 0 {
		return fail(0, "want NAME=FROM..TO:N or NAME=V1,V2,…, e.g. riser_bore=6mm..20mm:8")
	}
	name := strings.TrimSpace(spec[:eq])
	if !lang.IsIdent(name) {
		return fail(0, "%q is not a parameter name", name)
	}
	body := spec[eq+1:]
	base := eq + 1
	if strings.TrimSpace(body) == "" {
		return fail(base, "no values after %s=", name)
	}
	ax := Axis{Param: name}
	// quantity reads the value in body[lo:hi], reporting at its column.
	quantity := func(lo, hi int, unit string) (units.Quantity, string, error) {
		text := strings.TrimSpace(body[lo:hi])
		lead := lo + strings.Index(body[lo:hi], text)
		if text == "" {
			return units.Quantity{}, "", &SpecError{Spec: spec, Col: base + lo + 1, Msg: "a value is missing"}
		}
		if unit != "" {
			text += " " + unit
		}
		q, ut, err := lang.ParseQuantity(text)
		if err != nil {
			return units.Quantity{}, "", &SpecError{Spec: spec, Col: base + lead + 1, Msg: err.Error()}
		}
		return q, ut, nil
	}
	var qs []units.Quantity
	var unitText string
	if dots := strings.Index(body, ".."); dots >= 0 {
		colon := strings.LastIndexByte(body, ':')
		if colon < dots {
			return fail(base+len(body), "a range needs its number of values: FROM..TO:N, e.g. 6mm..20mm:8")
		}
		nText := strings.TrimSpace(body[colon+1:])
		n, err := strconv.Atoi(nText)
		if err != nil || n < 2 || n > MaxValues {
			return fail(base+colon+1, "the number of values must be a whole number from 2 to %d, not %q", MaxValues, nText)
		}
		to, toUnit, err := quantity(dots+2, colon, "")
		if err != nil {
			return Axis{}, err
		}
		from, fromUnit, err := quantity(0, dots, "")
		if err != nil {
			return Axis{}, err
		}
		if from.Dim != to.Dim && from.Dim.IsZero() && toUnit != "" {
			if from, fromUnit, err = quantity(0, dots, toUnit); err != nil {
				return Axis{}, err
			}
		}
		if from.Dim != to.Dim {
			return fail(base+dots+2, "%s is %s but %s is %s", strings.TrimSpace(body[:dots]), units.Name(from.Dim), strings.TrimSpace(body[dots+2:colon]), units.Name(to.Dim))
		}
		if from.SI == to.SI {
			return fail(base+dots+2, "the range is empty: FROM and TO are equal")
		}
		unitText = fromUnit
		for i := range n {
			f := float64(i) / float64(n-1)
			qs = append(qs, units.Quantity{SI: from.SI + f*(to.SI-from.SI), Dim: from.Dim, AbsTemp: from.AbsTemp})
		}
	} else {
		lo := 0
		for i := 0; i <= len(body); i++ {
			if i < len(body) && body[i] != ',' {
				continue
			}
			q, ut, err := quantity(lo, i, "")
			if err != nil {
				return Axis{}, err
			}
			if len(qs) == 0 {
				unitText = ut
			} else if q.Dim != qs[0].Dim {
				return fail(base+lo, "%s is %s but the first value is %s", strings.TrimSpace(body[lo:i]), units.Name(q.Dim), units.Name(qs[0].Dim))
			}
			qs = append(qs, q)
			lo = i + 1
		}
		if len(qs) > MaxValues {
			return fail(base, "at most %d values", MaxValues)
		}
	}
	show := units.Unit{Dim: qs[0].Dim, Text: ""}
	if unitText != "" {
		if u, err := units.Parse(unitText); err == nil && u.Dim == qs[0].Dim {
			show, ax.Unit = u, unitText
		}
	}
	for _, q := range qs {
		if math.Abs(q.SI) > lang.ModelRange {
			return fail(base, "a value is out of the model's range (values below 1e12 in SI units)")
		}
		text := units.Format(q.SI, show)
		if ax.Unit == "" && !q.Dim.IsZero() {
			text = strconv.FormatFloat(q.SI, 'g', 5, 64) + " " + q.Dim.String()
		}
		ax.Values = append(ax.Values, lang.Override{Name: name, Value: q, Text: text, Unit: ax.Unit})
	}
	return ax, nil
}

// Show writes an SI value of the axis in its unit: "12 mm".
func (a Axis) Show(si float64) string {
	if a.Unit != "" {
		if u, err := units.Parse(a.Unit); err == nil {
			return units.Format(si, u)
		}
	}
	return strconv.FormatFloat(si, 'g', 5, 64)
}

// Describe names the axes: "riser_bore and sink".
func Describe(axes []Axis) string {
	names := make([]string, len(axes))
	for i, a := range axes {
		names[i] = a.Param
	}
	return strings.Join(names, " and ")
}

// DescribeParams names the parameters of a sweep result: "lift and sink".
func DescribeParams(r *Result) string {
	names := make([]string, len(r.Params))
	for i, p := range r.Params {
		names[i] = p.Param
	}
	return strings.Join(names, " and ")
}
