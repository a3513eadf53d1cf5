package output

import (
	"fmt"
	"math"
	"regexp"

	"circa/check/flow"
	"circa/lang"
)

var ashrae34 = regexp.MustCompile(`^([AB])(1|2L|2|3)$`)

// SafetyClassMeaning spells out an ASHRAE 34 / ISO 817 safety class
// ("A2L": lower toxicity, lower flammability); other descriptions are
// returned as they are.
func SafetyClassMeaning(class string) string {
	g := ashrae34.FindStringSubmatch(class)
	if g == nil {
		return class
	}
	tox := map[string]string{"A": "lower toxicity", "B": "higher toxicity"}[g[1]]
	flam := map[string]string{"1": "no flame propagation", "2L": "lower flammability", "2": "flammable", "3": "higher flammability"}[g[2]]
	return fmt.Sprintf("%s: %s, %s (ASHRAE 34 / ISO 817)", class, tox, flam)
}

// specificCautions are the cautions this file's results call for: the
// pressure the loop reaches against its rating, the fluid's safety class,
// and the surface temperatures; each defers to local codes and licensed
// engineering practice.
func specificCautions(m *lang.Model, res *flow.Result) []string {
	if res == nil {
		return nil
	}
	var out []string
	for _, l := range res.Loops {
		var pMax, tWall, tSat float64
		pMin := math.Inf(1)
		pCase, wCase, minCase := "", "", ""
		var tDev float64 // hottest device case above an evaporator
		dCase, dComp := "", ""
		for _, c := range l.Cases {
			if c.SatPressure > pMax {
				pMax, pCase = c.SatPressure, c.Case
			}
			if c.SatPressure > 0 && c.SatPressure < pMin {
				pMin, minCase = c.SatPressure, c.Case
			}
			tSat = math.Max(tSat, c.SatTemperature)
			for _, mg := range c.Margins {
				if mg.Margin == flow.MarginWall && mg.Value > tWall {
					tWall, wCase = mg.Value, c.Case
				}
			}
			for _, cs := range c.Components {
				if j := cs.Junction; j != nil && j.Case > tDev {
					tDev, dCase, dComp = j.Case, c.Case, cs.Component
				}
			}
		}
		if pCase != "" {
			s := fmt.Sprintf("Loop %s: the saturation pressure reaches %s in case %s", l.Loop, pressureAs(pMax, l.DesignPressureUnit), pCase)
			var rating float64
			if ml := loopNamed(m, l.Loop); ml != nil && ml.DesignPressure.Set {
				rating = ml.DesignPressure.SI
				s += fmt.Sprintf(" against a design pressure of %s", pressureAs(rating, l.DesignPressureUnit))
			} else {
				s += " and the file states no design pressure"
			}
			s += "; the loop is pressure equipment: its rating, relief, testing and marking must follow local pressure-equipment codes and be approved by licensed engineers."
			if pMin < 101325 {
				s += fmt.Sprintf(" It runs below atmospheric pressure (%s in case %s): rate it for vacuum and keep air out.", pressureAs(pMin, l.DesignPressureUnit), minCase)
			}
			out = append(out, s)
		}
		if l.Safety != "" {
			out = append(out, fmt.Sprintf("Loop %s: fluid %s, safety class %s. Charge limits, ventilation, leak detection and marking follow local refrigerant-safety codes.", l.Loop, l.Fluid, SafetyClassMeaning(l.Safety)))
		}
		if wCase != "" || tSat > 0 || dCase != "" {
			s := fmt.Sprintf("Loop %s: hot surfaces —", l.Loop)
			if wCase != "" {
				s += fmt.Sprintf(" the evaporator wall reaches about %s in case %s;", temperature(tWall), wCase)
			}
			if dCase != "" {
				s += fmt.Sprintf(" the device case on evaporator %s about %s in case %s;", dComp, temperature(tDev), dCase)
			}
			if tSat > 0 {
				s += fmt.Sprintf(" vapour lines and condensers run at up to %s.", temperature(tSat))
			}
			s += " Guard or insulate surfaces people can touch as local codes require."
			out = append(out, s)
		}
	}
	return out
}
