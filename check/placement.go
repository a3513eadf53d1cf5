package check

import (
	"math"

	"circa/check/geom"
	"circa/lang"
)

// Placement rules: a condenser must drain downward, and a reservoir must
// hang where there is liquid to store. Heights are taken along the nominal
// case's body force.

func init() {
	Register(&Rule{ID: "condenser-drains-upward", Category: CategoryDirection, Severity: lang.Warning,
		Summary: "a condenser whose outlet is above its inlet",
		Rationale: "The condensate leaves a condenser by gravity. With the outlet above the inlet it must climb against the vapour that enters at the bottom: the liquid is held up and runs back, the counter-current flow floods, and the condenser's lower part fills with liquid instead of condensing. " +
			"Where the vapour rises slowly, below the flooding velocity, the condensate runs down against it as in a reflux condenser, and no prediction for that flow has been verified widely enough for general use; data on inclined tubes disagree even on how inclination changes the heat transfer (Lips and Meyer 2011, Int. J. Multiphase Flow 37:845–859, as summarised in the 2021 ASHRAE Handbook—Fundamentals, ch. 5). " +
			"Reported when the outlet is more than 5 mm or 1 % of the length above the inlet (the layout-drawing tolerance of the geometry rules; common practice).",
		Example: "node coil_in at (0, 0, 1.0) m\nnode coil_out at (0, 0, 1.3) m\ncondenser coil from coil_in to coil_out { ... }",
		Fix:     "Feed the vapour at the condenser's top and take the liquid from its bottom (swap the nodes and the riser's connection), or lay it level or falling along the flow.",
		Run:     condenserDrainsUpward, Partial: true})
	Register(&Rule{ID: "reservoir-on-vapour-line", Category: CategoryTraps, Severity: lang.Warning,
		Summary:   "a reservoir hung from the vapour line",
		Rationale: "A reservoir stores liquid where liquid is: below the condenser outlet, on the downcomer or at the evaporator inlet. Hung from a node between an evaporator outlet and a condenser inlet it fills with vapour and holds no liquid, so it neither takes up surplus charge nor feeds the evaporator. The charge check counts it as vapour, not as liquid.",
		Example:   "node riser_top at (0, 0, 1.3) m   # between the evaporator outlet and the condenser inlet\nreservoir tank at riser_top { volume 0.1 L }",
		Fix:       "Hang the reservoir from the liquid line (the downcomer, or the evaporator inlet).",
		Run:       reservoirOnVapourLine, Partial: true})
}

// upOf returns the unit vector against the nominal body force.
func upOf(m *lang.Model) geom.Vec3 {
	return geom.BodyForce(m.Nominal).Unit().Scale(-1)
}

func condenserDrainsUpward(c *Context) {
	up := upOf(c.Model)
	if up == (geom.Vec3{}) {
		return
	}
	for _, comp := range c.Components() {
		if comp.Kind != lang.Condenser || comp.To == nil {
			continue
		}
		rise := c.Layout.Disp(comp.Index).Dot(up)
		L, _ := lengthOf(comp)
		if rise <= math.Max(agreeAbs, agreeRel*L) {
			continue
		}
		d := c.Reportf(valueLoc(comp.Rise, compLoc(comp)), "condenser %s drains upward: its outlet %s is %s above its inlet %s (nominal case), so the condensate must climb against the vapour",
			comp.Name, comp.To.Name, q(rise, "m"), comp.From.Name)
		d.Related = append(d.Related, lang.Related{Loc: comp.To.NameLoc(), Message: "outlet node " + comp.To.Name},
			lang.Related{Loc: comp.From.NameLoc(), Message: "inlet node " + comp.From.Name})
	}
}

func reservoirOnVapourLine(c *Context) {
	// The vapour line is marked only for a loop with a reservoir: the
	// marking's lists are a few words per node of a large loop.
	var vap []bool
	for _, comp := range c.Components() {
		if comp.Kind != lang.Reservoir {
			continue
		}
		if vap == nil {
			vap = c.Loop.VapourNodes()
		}
		if comp.From == nil || comp.From.Index >= len(vap) || !vap[comp.From.Index] {
			continue
		}
		d := c.Reportf(compLoc(comp), "reservoir %s hangs from node %s on the vapour line (between an evaporator outlet and a condenser inlet): it fills with vapour, holds no liquid, and is not counted as liquid in the charge check",
			comp.Name, comp.From.Name)
		d.Related = append(d.Related, lang.Related{Loc: comp.From.NameLoc(), Message: "node " + comp.From.Name})
	}
}
