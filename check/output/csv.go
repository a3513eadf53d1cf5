package output

import (
	"encoding/csv"
	"fmt"
	"io"
	"strconv"

	"circa/check/flow"
)

// CSVHeader names the columns of EstimateCSV. Each row is one of three
// kinds, named in the first column: "component" (a component at the
// operating point), "total" (the loop's sums) or "margin" (one margin of the
// case; its component, when it has one, in the component column). The
// pressure drops follow BudgetConvention.
var CSVHeader = []string{"row", "loop", "case", "point", "circulates", "saturation_temperature_K", "saturation_pressure_Pa",
	"loop_mass_flow_kg_s", "component", "kind", "mass_flow_kg_s", "mass_flux_kg_m2s", "quality_in", "quality_out",
	"void_out", "void_mean", "velocity_liquid_m_s", "velocity_vapour_m_s", "heat_W",
	"drop_friction_Pa", "drop_gravity_Pa", "drop_acceleration_Pa", "drop_area_change_Pa", "drop_local_Pa", "drop_total_Pa",
	"margin", "value", "limit", "unit", "use", "status"}

// EstimateCSV writes one table: per case, a row per component, a total row
// and a row per margin; the cautions come first as lines starting with '#'.
func EstimateCSV(w io.Writer, res *flow.Result) error {
	ew := &errWriter{w: w}
	for _, c := range res.Cautions {
		fmt.Fprintln(ew, "# caution:", c)
	}
	for _, p := range res.Set {
		fmt.Fprintln(ew, "# "+Printable(ParamSetText(p)))
	}
	fmt.Fprintf(ew, "# %s\n", BudgetConvention)
	cw := csv.NewWriter(ew)
	cw.Write(CSVHeader)
	g := func(v float64) string { return strconv.FormatFloat(v, 'g', 8, 64) }
	budget := func(b flow.Budget) []string {
		return []string{g(b.Friction), g(b.Gravity), g(b.Acceleration), g(b.AreaChange), g(b.Local), g(b.Total)}
	}
	blank := func(n int) []string { return make([]string, n) }
	for _, l := range res.Loops {
		for i := range l.Cases {
			c := &l.Cases[i]
			point := ""
			if c.Grid {
				point = c.PointLabel()
			}
			head := func(kind string) []string {
				return []string{kind, l.Loop, c.Case, point, strconv.FormatBool(c.Circulates), g(c.SatTemperature), g(c.SatPressure), g(c.MassFlow)}
			}
			for _, s := range c.Components {
				row := append(head("component"), s.Component, s.Kind, g(s.MassFlow), g(s.MassFlux),
					g(s.XIn), g(s.XOut), g(s.VoidOut), g(s.VoidMean), g(s.VelLiquid), g(s.VelVapour), g(s.Heat))
				row = append(append(row, budget(s.Budget)...), blank(6)...)
				cw.Write(row)
			}
			row := append(head("total"), blank(10)...)
			row = append(row, g(c.Totals.Heat))
			if len(c.Components) > 0 {
				row = append(row, budget(c.Totals.Budget)...)
			} else {
				row = append(row, blank(6)...)
			}
			cw.Write(append(row, blank(6)...))
			for _, m := range c.Margins {
				row := append(head("margin"), m.Component)
				row = append(row, blank(16)...)
				cw.Write(append(row, m.Margin, g(m.Value), g(m.Limit), m.Unit, g(m.Use), m.Status))
			}
		}
	}
	cw.Flush()
	if ew.err != nil {
		return ew.err
	}
	return cw.Error()
}
