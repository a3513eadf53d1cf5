package picture

import (
	"fmt"
	"strings"

	"circa/lang"
)

// Figures computes and draws every figure for every loop of m: the
// geometry always, and the circulation curve, the pressure budget and the
// tilt envelope when m has a case. A figure that cannot be made is left out
// and its reason returned in errs; a figure's Name is "LOOP-KIND".
func Figures(m *lang.Model, o Options) (figs []*Figure, errs []error) {
	if m == nil {
		return nil, []error{fmt.Errorf("no model")}
	}
	for _, l := range m.Loops {
		makers := []func() (*Figure, error){
			func() (*Figure, error) {
				g, err := GeometryOf(l)
				if err != nil {
					return nil, err
				}
				return g.Figure()
			},
		}
		if len(m.Cases) > 0 {
			makers = append(makers,
				func() (*Figure, error) {
					c, err := CirculationOf(m, l, o)
					if err != nil {
						return nil, err
					}
					return c.Figure()
				},
				func() (*Figure, error) {
					b, err := BudgetOf(m, l, o.Case)
					if err != nil {
						return nil, err
					}
					return b.Figure()
				},
				func() (*Figure, error) {
					t, err := TiltOf(m, l, o.Case, o.TiltStep)
					if err != nil {
						return nil, err
					}
					return t.Figure()
				})
		}
		for _, mk := range makers {
			f, err := mk()
			if err != nil {
				errs = append(errs, fmt.Errorf("loop %s: %v", l.Name, err))
				continue
			}
			f.Name = l.Name + "-" + f.Name
			f.Title += VariantNote(m)
			figs = append(figs, f)
		}
	}
	return figs, errs
}

// VariantNote is the title's note of the parameters given other values
// than their files' for the run: " (variant: riser_bore=10mm)".
func VariantNote(m *lang.Model) string {
	if len(m.Overrides) == 0 {
		return ""
	}
	parts := make([]string, len(m.Overrides))
	for i, o := range m.Overrides {
		parts[i] = o.String()
	}
	return " (variant: " + strings.Join(parts, ", ") + ")"
}
