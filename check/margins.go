package check

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"circa/check/flow"
	"circa/lang"
	"circa/units"
)

// The margin rules run the flow estimate once per loop (shared through the
// context's memo) and report its findings, each at the component it
// concerns, with the case and the written limit as related locations.

// marginRule describes one family of estimate findings.
type marginRule struct {
	id        string
	sev       lang.Severity
	summary   string
	rationale string
	example   string
	fix       string
}

// escalations say when a margin finding is an error rather than a warning.
var escalations = map[string]string{
	flow.RuleCHF:      "the wall flux reaches the critical heat flux (ratio below 1)",
	flow.RuleFlooding: "the flooding fraction reaches 1",
	flow.RuleCharge:   "the charge is more than the loop full of liquid, empties the liquid lines, or floods the whole condenser",
}

var marginRules = []marginRule{
	{flow.RuleExitQuality, lang.Warning, "the evaporator's exit quality exceeds the limit",
		"High exit quality brings the evaporator close to dryout, where the wall loses its liquid film and its temperature jumps; the limit (default 0.5) is common practice for electronics loops.",
		"limits { exit_quality 0.3 }", "Lower the load, raise the flow (wider downcomer, lower losses, more height), or relax the limit with a reason."},
	{flow.RuleDryout, lang.Error, "the evaporator dries out (exit quality reaches 1)",
		"At quality 1 the outlet is dry vapour: the heated wall is no longer wetted and its temperature is not bounded by boiling. Past it the vapour superheats; the finding then says how many times the heat that evaporates the flow the evaporator takes in. In a parallel network it names the flow split between the branches beside the evaporator and the element of its branch with the largest loss, the usual cause (a narrow feed, a high loss coefficient).",
		"heat plate 20 kW", "Lower the load or increase the circulation."},
	{flow.RuleCHF, lang.Warning, "the wall heat flux comes too close to the critical heat flux",
		"Above the critical heat flux the wall blankets with vapour. By default the ratio is taken with the pool-boiling form (Lienhard & Dhir 1973, or Zuber 1959) at the local body force, so low or tilted gravity lowers it; methods { chf katto_ohno } takes instead the flow-boiling correlation of Katto & Ohno (1984, Int. J. Heat Mass Transfer 27:1641) for uniformly heated tubes, at the evaporator's mass flux, heated length, bore and inlet subcooling. Its coefficients agree with a published transcription (NASA NTRS 20230009827), but no check value printed by the paper could be compared, and its regime rules are reproduced from a textbook from memory (that transcription writes them as plain minima and maxima, which differ from the rules used here for dense vapour, ρv/ρl above 0.15). Against CHF data in channels of 3 mm bore and less it showed a mean absolute deviation of 33.2 % (Shah 2016, Heat Transfer Engineering 37(18), as reported in the 2021 ASHRAE Handbook—Fundamentals, ch. 5); as written here it runs 27.5 % high on average against measured CHF of water at 100 kPa in 4 and 4.8 mm tubes with subcooled inlet (the U.S. NRC compilation behind the 2006 look-up table, ADAMS ML22264A009, reference 1), and lies 20 % from the 2006 look-up table (Groeneveld et al. 2007) at 16 MPa, though well above that table at 100 kPa (1.8 times at the median, most at low flow in short tubes): read it as a second opinion beside the pool-boiling form.",
		"wetted_area 0.001 m²", "Spread the heat over more wetted area, or use a fluid with higher latent heat and vapour density."},
	{flow.RuleFlooding, lang.Warning, "vapour and liquid flow counter-current close to the flooding limit",
		"Where vapour rises against returning liquid, the liquid is held up and finally carried back above the flooding limit; the loop then stalls. The limit is Wallis's, √j_g* + m·√j_f* = C in the dimensionless superficial velocities j* = j·√(ρ/(g·D·Δρ)) along the body force, with m = 1 and C = 0.725 for sharp-edged tube ends (Wallis 1969, One-Dimensional Two-Phase Flow, McGraw-Hill; constants from memory); the finding gives the fraction of it used.",
		"evaporator e from a to b { rise -0.3 m ... }", "Give the vapour a separate upward path, or widen the tube."},
	{flow.RuleWall, lang.Error, "the estimated wall temperature exceeds the device limit",
		"The wall runs at the saturation temperature plus the nucleate-boiling superheat, from Cooper's pool-boiling coefficient h = 55 p_r^(0.12 − 0.2 log10 R_p) (−log10 p_r)^−0.55 M^−0.5 q^0.67 (Cooper 1984, Advances in Heat Transfer 16:157–239, as listed in the 2021 ASHRAE Handbook—Fundamentals, ch. 5, whose Table 1 takes R_p = 1 µm where it is unknown and which does not recommend Cooper's multiplier of 1.7 for copper); above wall_limit minus wall_margin the device overheats. The wall and the device on it run hot: guard surfaces people can touch as local codes require.",
		"wall_limit 50 °C", "Lower the saturation temperature (more condenser conductance, colder sink) or the heat flux."},
	{flow.RuleJunction, lang.Error, "the estimated junction temperature of a device exceeds its limit",
		"The device's heat crosses its thermal stack in series — junction to case, the interface material, the plate's spreading resistance — above the boiling wall, so T_junction = T_wall + Q·(R_jc + R_interface + R_spreading), with the wall at the saturation temperature plus the nucleate-boiling superheat (Cooper). The resistances are the device maker's and the assembly's figures; above junction_limit the device is outside its rating. The device case and the plate run hot: guard surfaces people can touch as local codes require.",
		"junction_limit 90 °C", "Lower the stack resistance (thinner interface, better spreading), the saturation temperature or the load."},
	{flow.RulePressure, lang.Error, "the saturation pressure exceeds the design pressure",
		"The loop holds the saturation pressure of its hottest case; pressure equipment must satisfy local pressure-equipment codes and be approved by licensed engineers.",
		"design_pressure 2 bar(g)", "Rate the loop for the pressure, or lower the saturation temperature."},
	{flow.RuleCondenser, lang.Error, "the condensers cannot reject the load within the allowed saturation temperature",
		"The condenser balance Q = UA·(T_sat − T_sink) sets the saturation temperature; above saturation_max (or the fluid's range) the loop cannot run as designed. A condenser given by its bore, length and tubes instead of a conductance takes UA from an in-tube condensation coefficient: by default laminar film condensation (Nusselt 1916 within 45° of the body force, Chato 1962, ASHRAE J. 4(2) 52, flatter); with methods { condensation shah } the forced-convection correlation of Shah (1979, Int. J. Heat Mass Transfer 22, 547), with boyko_kruzhilin that of Boyko & Kruzhilin (1967, Int. J. Heat Mass Transfer 10, 361, as given in Hewitt, Shires & Bott, Process Heat Transfer, 1994), with akers_deans_crosser that of Akers, Deans & Crosser (1959, Chem. Eng. Prog. Symp. Ser. 55(29)) and with cavallini_smith_zecchin that of Cavallini, Smith & Zecchin (1974, Int. Heat Transfer Conf., Tokyo), the last two as given in Kakaç, Boilers, Evaporators and Condensers (1991); each is averaged over the quality from saturated vapour to liquid at the mass flux that condenses the load, the least flow that can carry it. Each is checked against the value the open-source ht library prints for it, Boyko & Kruzhilin's also against the worked example of Process Heat Transfer (p. 589).",
		"conductance 10 W/K", "Increase the condenser conductance or lower the sink temperature."},
	{flow.RuleCharge, lang.Warning, "the fill charge does not match the inventory at the operating point",
		"Too little charge starves the evaporator; too much backs liquid up into the condenser and takes away condensing area; more than the loop full of liquid leaves no room for vapour. The finding says for each case whether the loop is short or over and by how much, and the charge range that suits every case, or that none does (the cases then need a reservoir to absorb the difference). A reservoir on the vapour line counts as vapour.",
		"charge 5 kg", "Set the charge inside the range the finding gives, or add a reservoir on the liquid side to widen it."},
	{flow.RuleHead, lang.Warning, "the design has little reserve of gravity head over its losses",
		"Friction and local losses are the least certain part of an estimate. The case is solved again with them limits.head_ratio times as large (default 1.5; available head at least 1.5–2 times the predicted losses is common practice): the loop should still circulate, keep its evaporators wet and, if it meets the exit-quality limit now, still meet it.",
		"loss 20", "Raise the condenser, widen the tubes or cut local losses; or state a smaller head_ratio with the reason."},
	{flow.RuleTilt, lang.Warning, "the case is close to an attitude where circulation stops",
		"Tilting moves the condenser down relative to the evaporator along the body force; beyond the critical angle the loop stops. These angles are where the estimate's circulation stops, weighing the liquid and vapour columns and the losses; tilt-limits gives the angles at which the condensers' thermal centre stops being above the evaporators', a purely geometric and usually different number. When this rule runs, tilt-margin does not repeat the case.",
		"pitch 60 deg", "Raise the condenser or place it above the evaporator along the expected tilt axes."},
	{flow.RuleNoCirculation, lang.Error, "the loop does not circulate in a case",
		"Without a balance between gravity head and losses no flow is carried: the evaporator boils dry. The finding quotes the gravity head and the losses at the flow the heat just evaporates (exit quality about 1), where the numbers mean something, and says whether the head itself is missing (the condenser not above the evaporator) or the losses exceed it at every flow searched.",
		"node coil_in at (0, 0, -1) m", "Put the condenser above the evaporator along the body force and keep the losses below the head."},
	{flow.RuleUnstable, lang.Warning, "a statically unstable operating point (Ledinegg) exists",
		"Where the excess head rises with flow, a small disturbance drives the flow away from the balance; the loop may jump between operating points (the static criterion of Ledinegg 1938). A single loop is checked at every balance found on its flow grid; in a network each branch's pressure-drop curve, slope d(p_from − p_to)/dṁ at its inlet state, is set against the curve of the rest of the network seen from the branch's junctions (all other branches combined as a linear network of slopes): the branch is stable when its slope exceeds that one. That test takes the rest as passive and misses flow moving between branches that are themselves unstable (two channels of falling curves closed by a rising return: each passes, yet shifting flow from one to the other lowers the balance), so a network of up to 48 independent cycles is also held stable only when the Jacobian of its cycle balances with respect to the cycle flows, Cᵀ diag(S) C, is positive definite; an unstable mode no branch test catches is reported with the branches it moves flow from and to. A network of up to 12 independent cycles whose condensers return subcooled liquid (or under local saturation: a subcooled inlet is what lets the excess head rise with flow) is also searched for further balances along the flow pattern of the one found (the excess head projected on that pattern, over the single-loop grid and its boiling band, each sign change a start for Newton's iteration); when it has several, each is listed with the slope of that projected head along its own pattern, a rising one flagged as unstable, and the stable one of highest flow is reported, as for a single loop.",
		"loss 50", "Add inlet restriction to the evaporator side or reduce the two-phase share of the losses."},
	{flow.RuleConverge, lang.Error, "the network estimate did not converge",
		"The Newton iteration on the branch flows found no balance; the network may have no steady state or several.",
		"junction split ... (many parallel evaporators with very different heights)", "Check the branch geometry and loads; simplify parallel paths."},
	{flow.RuleReverse, lang.Error, "an evaporator carries flow against its direction",
		"In a parallel network a weak branch can be driven backwards by the others; its evaporator then sees vapour from the wrong end.",
		"evaporator low from split to merge { rise 0.1 m ... } beside a taller one", "Balance the branches (equal height and losses) or add restriction to the strong branch."},
	{flow.RuleFluidRange, lang.Error, "the case's saturation temperature is outside the fluid's range or past its critical point",
		"There is no two-phase state to estimate with above the critical temperature or outside the tabulated range. The finding stands at the value that sets the saturation temperature (the case's or loop's saturation, a condenser outlet, or the sink), with the fluid as related information; a sink written in the wrong scale (35 K for 35 °C) gets a probably-meant fix. Water's range ends at 646 K (372.85 °C), 1.1 K below its critical point of 647.096 K and inside IF97 region 3 (which starts at 623.15 K): nearer the critical point the saturated phases' properties change faster than a quick estimate can use.",
		"saturation 200 °C", "Choose a fluid with a higher critical temperature or lower the saturation temperature."},
	{flow.RuleNearCritical, lang.Warning, "the loop runs close to the fluid's critical point",
		"Towards the critical temperature Tc the latent heat and the surface tension fall to zero (latent heat about as (1 − T/Tc)^0.38, Watson 1943, Ind. Eng. Chem. 35, 398; surface tension about as (1 − T/Tc)^(11/9), Guggenheim 1945, J. Chem. Phys. 13, 253; both from memory), and the liquid and vapour densities approach each other. The pool-boiling critical heat flux (Zuber) goes with latent heat, vapour density and surface tension, so the evaporator's capacity, the driving head and the estimate's correlations all degrade together. Reported from T/Tc = 0.95 (circa's choice, common practice), with the margin to Tc in kelvin.",
		"fluid R134a   # Tc 101.1 °C\ncase hot { saturation 90 °C }", "Lower the saturation temperature (more condenser conductance, a colder sink) or choose a fluid with a higher critical temperature."},
	{flow.RuleGeyser, lang.Warning, "a low-pressure fluid under a tall liquid column: geyser boiling at the evaporator",
		"At a low saturation pressure (water below about 0.2 bar) the weight of the liquid column above the evaporator inlet adds a large share to the local pressure, so the liquid there must be heated well above the loop's saturation temperature before it boils. It then flashes in bursts that throw liquid up the riser and let it fall back: geyser boiling, with pressure and temperature swings (Casarosa, Latrofa and Shelginski 1983, Int. J. Heat Mass Transfer 26, 933; Aritomi et al. 1992, J. Nucl. Sci. Technol. 29, 631; both from memory). The rule takes the column at rest, from the highest condenser outlet to the evaporator inlet along the body force, and the local saturation temperature at p_sat + ρ_l·g·H, the static head alone: geysering is a low-flow cycle whose liquid waits nearly still between bursts, and liquid heated to boiling at the inlet is superheated by this shift against the saturation at the condenser's level, so it flashes as it rises. It warns when that is more than 5 K above the loop's saturation temperature (circa's choice, common practice). The warning also quotes the inlet at the estimated flow, as the local-saturation table gives it: a lower pressure by the losses on the way, and a subcooling that includes the condenser's; that state does not decide the warning. The same shift decides saturation_state auto (the default): such a case is estimated at local saturation, the pressure marched around the loop and each cell at its own saturated state, so the subcooled inlet, the late boiling and the flashing in the riser are in the estimate (its saturated states interpolated on a grid in ln p, about 1e-5 relative; its flows within 1e-4 of a march of exact look-ups); below 5 K the single state is kept, and the estimate notes each evaporator inlet it treats as saturated though it is more than 1 K subcooled. saturation_state single or local in the methods block fixes either.",
		"fluid water; saturation 35 °C; condenser outlet 1.5 m above the evaporator inlet", "Shorten the liquid column (condenser closer above the evaporator), run at a higher saturation pressure, or choose a fluid with a higher vapour pressure at the operating temperature."},
	{flow.RuleDensityWave, lang.Info, "an evaporator lies beyond the density-wave stability boundary",
		"Density-wave oscillations travel with the void through a boiling channel when the phase change is large and the inlet restriction small. The indicator takes the phase-change and subcooling numbers of Ishii (1971; Saha, Ishii and Zuber 1976, J. Heat Transfer 98:616), N_pch = Q/(ṁ h_fg)·Δρ/ρ_g and N_sub = Δh_sub/h_fg·Δρ/ρ_g, against Ishii's simplified boundary N_pch − N_sub = 2 (K_i + f L/2D + K_e)/(1 + ½ (f L/2D + 2 K_e)) (quoted from memory), with the liquid-side and two-phase-side losses of the loop as the inlet and exit coefficients on the channel's liquid velocity head. The boundary was derived for heated channels under a fixed pressure difference, and most thermosiphons with a saturated inlet lie beyond it without oscillating, so it is an indicator in the estimate's stability output (circa estimate, text and JSON), never a finding, and there is nothing to silence; the estimate is steady and says nothing about the oscillation itself. Under a single saturation state N_sub takes the inlet subcooling of that model (the evaporator's inlet quality below zero), under local saturation the subcooling of the local march.",
		"evaporator e from a to b { ... }  # saturated inlet, little inlet loss, x_out 0.3", "Add inlet restriction (an orifice at the evaporator inlet), reduce the riser's local losses, or test the design."},
	{flow.RuleMaldistribution, lang.Warning, "parallel heated branches share the flow unevenly",
		"Parallel evaporator branches between the same junctions should carry flow in proportion to their heat; where the flow per unit heat differs by more than a factor 2 (circa's choice, common practice), or a branch is statically unstable, the weaker channel runs at higher quality and nearer dryout.",
		"two evaporators of 3 kW and 2 kW in parallel, rolled 20°", "Balance the branches (equal heights and losses, or restriction in the stronger one), or feed each from its own downcomer."},
	{flow.RuleManoeuvre, lang.Warning, "a case's profile changes faster than the loop's fluid can follow",
		"Each instant of a profile is estimated as a steady state, which holds while the attitude and acceleration change slowly against the time the fluid takes round the loop (its inventory over its mass flow). Where the body force changes, within one transit time, by at least 1 % of standard gravity and by half or more of the change of that stretch of the manoeuvre (a step, a ramp shorter than about two transit times), the liquid and vapour lag behind it: the quasi-static estimate no longer holds there, and a transient model or a test is needed.",
		"row 0 s 0 gn\nrow 0.1 s -0.3 gn   # a hard stop", "Confirm the stretch by a transient model or a test; a slower manoeuvre, where the application allows, stays quasi-static."},
	{flow.RuleFluidSafety, lang.Info, "the working fluid is flammable or toxic (safety class other than A1)",
		"Fluids of ASHRAE 34 / ISO 817 classes A2L, A2, A3, B1, B2L, ... carry charge limits, ventilation and detection requirements under local codes.",
		"fluid R1234yf", "Follow the local codes for the fluid's safety class."},
	{flow.RuleNoSink, lang.Error, "no saturation temperature can be set for a case",
		"The estimate needs either a given saturation temperature or a condenser conductance with a sink temperature.",
		"condenser coil from a to b { length 1 m }", "Give the condenser conductance and sink, an outlet temperature, or a saturation."},
	{flow.RuleNegativeHeat, lang.Error, "an evaporator load is negative",
		"An evaporator takes heat in; a negative load is a sign error.", "heat plate -2 kW", "Give the load as a positive power."},
	{flow.RuleFluidUnknown, lang.Error, "the working fluid cannot be loaded for the estimate",
		"Without the fluid's properties there is no estimate.", "fluid R999", "Name a built-in fluid or a valid CSV table."},
	{flow.RuleEnergyClosure, lang.Warning, "the estimate's energy balance does not close",
		"A sign of a numerical problem in the estimate: the heat added and the heat rejected differ by more than 1e-9 of the load.", "(no known trigger)", "Report the file."},
	{flow.RuleSuperheatCells, lang.Warning, "a tube carries dry vapour after an evaporator dried out",
		"Past quality 1 the vapour superheats; the estimate keeps saturated-vapour properties there, so its numbers are rough.",
		"heat plate 20 kW", "Lower the load or increase the circulation so that the evaporator does not dry out."},
	{flow.RuleNonFinite, lang.Warning, "the estimate produced non-finite numbers",
		"A sign of a numerical problem: the numbers were replaced by 0 or the largest float and should not be trusted.",
		"(no known trigger)", "Report the file."},
	{flow.RuleCorrelationRange, lang.Info, "a correlation is applied outside the range of data it was fitted to",
		correlationRangeRationale,
		"methods { condensation shah }   # a low-flow thermosiphon condenser: Re_lo well below Shah's 350",
		"Read the number as an extrapolation: compare with another method (methods { … }), with a test, or with a correlation fitted to these conditions; nothing is wrong with the design itself."},
	{flow.RuleTooLarge, lang.Warning, "the network has too many independent cycles to estimate",
		"The estimate solves every independent cycle's momentum balance; its work grows with their number, and past 10,000 cycles one estimate would take the checker and the language server tens of seconds on every edit, so it is skipped and says so. The structural rules still run.",
		"(a generated network of 10,001 parallel evaporator branches)", "Estimate a representative part of the network (a few branches of each kind, with their share of the load), or merge identical parallel channels into one component with channels N."},
	{flow.RuleMethod, lang.Error, "an unknown estimate method",
		"The estimate can only use the methods it knows.", "methods { void_fraction slip }", "Use one of the listed methods."},
}

// indicators are the estimate's outputs listed with the rules so that
// "circa explain" can say what they mean, though they never make a finding.
var indicators = map[string]bool{flow.RuleDensityWave: true}

// Findings the structural rules already report (open ends, zero lengths,
// no condenser) are not repeated from the estimate.
var structural = map[string]bool{flow.RuleGeometry: true, flow.RuleNoCondenser: true}

func init() {
	for _, r := range marginRules {
		r := r
		rule := &Rule{ID: r.id, Category: CategoryMargin, Severity: r.sev, Escalation: escalations[r.id], Scope: PerLoop,
			Summary: r.summary, Rationale: r.rationale, Example: r.example, Fix: r.fix,
			Run: func(c *Context) { reportEstimate(c, r.id) }}
		if indicators[r.id] {
			rule.Run = nil // nothing to report, nothing to silence
		}
		Register(rule)
	}
}

// loopEstimate returns the flow estimate of the context's loop: the
// caller's, when it passed one, else computed once per loop.
func loopEstimate(c *Context) *flow.LoopResult {
	v := c.Memo("flow-estimate", func() any {
		if lr := c.Options.Estimate.LoopOf(c.Model, c.Loop); lr != nil {
			return lr
		}
		lr := flow.EstimateLoop(c.Model, c.Loop, flow.Options{NoTilt: c.Options.NoTilt, Layout: c.Layout})
		return &lr
	})
	return v.(*flow.LoopResult)
}

var marginRuleOf = map[string]string{
	flow.MarginExitQuality: flow.RuleExitQuality, flow.MarginCHF: flow.RuleCHF, flow.MarginFlooding: flow.RuleFlooding,
	flow.MarginWall: flow.RuleWall, flow.MarginJunction: flow.RuleJunction, flow.MarginPressure: flow.RulePressure, flow.MarginCondenser: flow.RuleCondenser,
	flow.MarginCharge: flow.RuleCharge, flow.MarginHead: flow.RuleHead, flow.MarginTilt: flow.RuleTilt,
}

// lowerIsWorse lists the findings whose value falls below a minimum.
var lowerIsWorse = map[string]bool{flow.RuleCHF: true, flow.RuleHead: true, flow.RuleTilt: true}

// reportEstimate reports the estimate's findings of one rule: per
// component, the worst case, naming the other cases with the same finding.
func reportEstimate(c *Context, id string) {
	if !c.Loop.Fluid.Set || c.Loop.Fluid.Bad {
		return // the resolver reported the missing or unknown fluid
	}
	lr := loopEstimate(c)
	for _, f := range lr.Findings {
		if f.Rule == id && !structural[f.Rule] {
			c.Report(diagnostic(c, f, nil))
		}
	}
	type group struct {
		worst  flow.Finding
		others []string
	}
	var order []string
	groups := map[string]*group{}
	for i := range lr.Cases {
		cr := &lr.Cases[i]
		for _, f := range cr.Findings {
			if f.Rule != id || structural[f.Rule] {
				continue
			}
			if f.Rule == flow.RuleManoeuvre {
				// Each stretch of a manoeuvre is its own finding.
				c.Report(diagnostic(c, f, nil))
				continue
			}
			key := f.Component
			if f.Correlation != "" {
				// One finding per component and correlation.
				key += "\x00" + f.Correlation
			}
			g := groups[key]
			if g == nil {
				groups[key] = &group{worst: f}
				order = append(order, key)
				continue
			}
			// A case's profile repeats its case's findings at other
			// instants: the case is named once.
			switch {
			case worse(f, g.worst):
				if g.worst.Case != f.Case {
					g.others = append(g.others, g.worst.Case)
				}
				g.worst = f
			case f.Case != g.worst.Case:
				g.others = append(g.others, f.Case)
			}
		}
		for _, m := range cr.Margins {
			if marginRuleOf[m.Margin] != id {
				continue
			}
			c.NoteMargin(Margin{Rule: id, Case: m.Case, Component: m.Component, Used: m.Use,
				Message: marginText(c, m, cr),
				Loc:     componentLoc(c.Loop, m.Component)})
		}
		if cr.Envelope != nil {
			for _, w := range cr.Envelope.Worst {
				if marginRuleOf[w.Margin.Margin] == id {
					at := flow.CaseResult{Yaw: w.At.Yaw, Pitch: w.At.Pitch, Roll: w.At.Roll, Accel: w.At.Accel}
					c.NoteMargin(Margin{Rule: id, Case: w.Case, Component: w.Component, Used: w.Use,
						Message: marginText(c, w.Margin, cr) + " at the envelope's worst, " + at.PointLabel(),
						Loc:     componentLoc(c.Loop, w.Component)})
				}
			}
		}
		if cr.Profile == nil {
			continue
		}
		for _, m := range cr.Profile.Worst {
			if marginRuleOf[m.Margin] == id {
				c.NoteMargin(Margin{Rule: id, Case: m.Case, Component: m.Component, Used: m.Use,
					Message: marginText(c, m, cr) + " at t = " + strconv.FormatFloat(*m.Time, 'g', 4, 64) + " s of its profile",
					Loc:     componentLoc(c.Loop, m.Component)})
			}
		}
	}
	if id == flow.RuleCharge {
		reportCharge(c, lr)
		return
	}
	for _, comp := range order {
		g := groups[comp]
		c.Report(diagnostic(c, g.worst, g.others))
	}
}

// marginLabel names a margin for the summary line; the loss reserve's value
// is an exit quality, so it says which.
func marginLabel(name string, headRatio float64) string {
	if name == flow.MarginHead {
		return fmt.Sprintf("exit quality with losses ×%.3g:", headRatio)
	}
	return strings.ReplaceAll(name, "_", " ")
}

// worse reports whether finding a is worse than b: more severe, else
// further past its limit.
func worse(a, b flow.Finding) bool {
	sa, _ := lang.ParseSeverity(a.Severity)
	sb, _ := lang.ParseSeverity(b.Severity)
	if sa != sb {
		return sa < sb
	}
	if a.Rule == flow.RuleCorrelationRange {
		return rangeFactor(a) > rangeFactor(b)
	}
	if lowerIsWorse[a.Rule] {
		return a.Value < b.Value
	}
	return a.Value > b.Value
}

func componentLoc(l *lang.Loop, name string) lang.Location {
	for _, comp := range l.Components {
		if comp.Name == name {
			return comp.NameLoc()
		}
	}
	return l.NameLoc()
}

// diagnostic turns an estimate finding into a located finding.
func diagnostic(c *Context, f flow.Finding, others []string) lang.Diagnostic {
	sev, ok := lang.ParseSeverity(f.Severity)
	if !ok {
		sev = lang.Warning
	}
	msg := f.Message
	if len(others) > 0 {
		word := "case"
		if len(others) > 1 {
			word = "cases"
		}
		msg += fmt.Sprintf("; also in %s %s", word, strings.Join(others, ", "))
	}
	if strings.HasPrefix(f.Rule, "margin-") {
		msg += " (early-design estimate)"
	}
	d := lang.Diagnostic{Rule: f.Rule, Severity: sev, Format: "%s", Args: []any{msg}}
	l := c.Loop
	switch {
	case f.Rule == flow.RuleFluidRange || f.Rule == flow.RuleNearCritical:
		// The cause is the value that sets the saturation temperature.
		d.Loc = l.Fluid.Loc()
		if v, what := saturationSource(c.Model, l, c.Model.Case(f.Case)); v.Set && v.File() != "" {
			d.Loc = v.Loc()
			d.Related = append(d.Related, lang.Related{Loc: l.Fluid.Loc(), Message: "the fluid " + l.Fluid.Name})
			if f.Rule == flow.RuleFluidRange {
				meantHint(&d, v, what, f)
			}
		}
	case f.Rule == flow.RuleFluidSafety || f.Rule == flow.RuleFluidUnknown:
		d.Loc = l.Fluid.Loc()
		if l.Fluid.File == "" {
			d.Loc = l.NameLoc()
		}
	case f.Rule == flow.RulePressure && l.DesignPressure.Set:
		d.Loc = l.DesignPressure.Loc()
	case f.Rule == flow.RuleCharge && l.Charge.Set:
		d.Loc = l.Charge.Loc()
	case f.Rule == flow.RuleManoeuvre && c.Model.Case(f.Case) != nil && c.Model.Case(f.Case).Profile != nil:
		p := c.Model.Case(f.Case).Profile
		d.Loc = profileRowLoc(p, f.Time)
		if loc, ok := tableRowLoc(p, f.Time); ok {
			d.Related = append(d.Related, lang.Related{Loc: loc, Message: "the row of the profile's table"})
		}
	default:
		d.Loc = componentLoc(l, f.Component)
	}
	if cs := c.Model.Case(f.Case); f.Time != nil && f.Rule != flow.RuleManoeuvre && cs != nil && cs.Profile != nil {
		loc, ok := tableRowLoc(cs.Profile, f.Time)
		if !ok {
			loc = profileRowLoc(cs.Profile, f.Time)
		}
		d.Related = append(d.Related, lang.Related{Loc: loc, Message: "the instant of the profile"})
	}
	for _, name := range append([]string{f.Case}, others...) {
		if cs := c.Model.Case(name); name != "" && cs != nil {
			d.Related = append(d.Related, lang.Related{Loc: cs.NameLoc(), Message: "case " + cs.Name})
		}
	}
	if f.Rule == flow.RuleCorrelationRange {
		if ch, ok := methodChoice(c.Model.Methods, f.Correlation); ok && ch.Set && ch.File != "" {
			d.Related = append(d.Related, lang.Related{Loc: lang.Location{File: ch.File, Span: ch.Span}, Message: "the method chosen"})
		}
	}
	if v, ok := limitValue(c.Model, l, f); ok && v.Set && v.File() != "" {
		d.Related = append(d.Related, lang.Related{Loc: v.Loc(), Message: "the limit " + f.LimitField})
	}
	return d
}

// limitValue is the written limit a finding is checked against.
func limitValue(m *lang.Model, l *lang.Loop, f flow.Finding) (lang.Value, bool) {
	lim := m.Limits
	switch f.LimitField {
	case "exit_quality":
		return lim.ExitQuality, true
	case "chf_ratio":
		return lim.CHFRatio, true
	case "flooding":
		return lim.Flooding, true
	case "head_ratio":
		return lim.HeadRatio, true
	case "tilt_margin":
		return lim.TiltMargin, true
	case "saturation_max":
		return lim.SaturationMax, true
	case "wall_limit", "junction_limit":
		for _, comp := range l.Components {
			if comp.Name == f.Component {
				if f.LimitField == "junction_limit" {
					return comp.JunctionLimit, true
				}
				return comp.WallLimit, true
			}
		}
	}
	return lang.Value{}, false
}

// reportCharge reports the charge findings of every case as one finding at
// the charge: per case whether the loop is short or over and by how much,
// and the charge that suits every case, if one does.
func reportCharge(c *Context, lr *flow.LoopResult) {
	l := c.Loop
	kg := func(v float64) string { return sigAs(v, l.Charge, "kg") }
	var worst *flow.Finding
	var others, parts []string
	for i := range lr.Cases {
		cr := &lr.Cases[i]
		for j := range cr.Findings {
			f := &cr.Findings[j]
			if f.Rule != flow.RuleCharge || cr.ChargeRange == nil {
				continue
			}
			r := cr.ChargeRange
			switch {
			case r.Charge < r.Low:
				parts = append(parts, fmt.Sprintf("short by %s in case %s (it needs at least %s)", kg(r.Low-r.Charge), cr.Case, kg(r.Low)))
			default:
				parts = append(parts, fmt.Sprintf("over by %s in case %s (it takes at most %s)", kg(r.Charge-r.High), cr.Case, kg(r.High)))
			}
			switch {
			case worst == nil:
				worst = f
			case worse(*f, *worst):
				others = append(others, worst.Case)
				worst = f
			default:
				others = append(others, f.Case)
			}
		}
	}
	if worst == nil {
		return
	}
	msg := worst.Message
	if len(parts) > 1 {
		msg = fmt.Sprintf("charge %s is %s", kg(l.Charge.SI), strings.Join(parts, ", "))
	}
	if r := lr.ChargeRange; r != nil {
		if r.Low > r.High {
			msg += fmt.Sprintf("; no single charge suits every case: case %s needs at least %s, case %s takes at most %s", r.LowCase, kg(r.Low), r.HighCase, kg(r.High))
		} else {
			msg += fmt.Sprintf("; a charge from %s to %s suits every case", kg(math.Max(r.Low, 0)), kg(r.High))
		}
	}
	d := diagnostic(c, *worst, others)
	d.Args = []any{msg + " (early-design estimate)"}
	c.Report(d)
}

// saturationSource returns the written value that sets a case's saturation
// temperature, in the order the estimate takes them: the case's, the
// loop's, a condenser outlet, else the sink of the first condenser with a
// conductance (the case's per-condenser sink, the case's sink, the
// condenser's own).
func saturationSource(m *lang.Model, l *lang.Loop, cs *lang.Case) (lang.Value, string) {
	if cs != nil && cs.Saturation.Set {
		return cs.Saturation, "saturation"
	}
	if l.Saturation.Set {
		return l.Saturation, "saturation"
	}
	for _, comp := range l.Components {
		if comp.Kind == lang.Condenser && comp.Outlet.Set {
			return comp.Outlet, "outlet"
		}
	}
	for _, comp := range l.Components {
		if comp.Kind != lang.Condenser {
			continue
		}
		if cs != nil {
			for _, sv := range cs.Sinks {
				if sv.Comp == comp && sv.Value.Set {
					return sv.Value, "sink"
				}
			}
			if cs.Sink.Set {
				return cs.Sink, "sink"
			}
		}
		if comp.Sink.Set {
			return comp.Sink, "sink"
		}
	}
	return lang.Value{}, ""
}

// meantHint adds "probably meant" to a fluid-range finding when the value
// that sets the saturation temperature is far outside any sensible range
// and the same number in the other temperature scale is inside the fluid's
// range (sink 35 K for 35 °C), with the fix. A value in °C just past the
// top of the range (water at 373 °C, between the range's end and the
// critical point) is a loop run too hot, not a slip of scale: the hint
// needs the written value more than a tenth above the top in kelvin.
func meantHint(d *lang.Diagnostic, v lang.Value, what string, f flow.Finding) {
	u, err := units.Parse(v.Unit())
	if err != nil || u.Dim != units.Temperature {
		return
	}
	n := u.FromSI(v.SI)
	var alt string
	var altSI float64
	switch {
	case u.Text == "K" && n < 150:
		alt, altSI = "°C", n+273.15
	case u.Affine && u.Text == "degC" && n > 200:
		alt, altSI = "K", n
	default:
		return
	}
	// f.Value is the saturation temperature, f.Limit the top of the range;
	// only hint when the other reading is plausible for a loop (−50 to
	// 150 °C) and the written one is not.
	if altSI < 223.15 || altSI > 423.15 {
		return
	}
	// The other reading must be inside the fluid's range (f.Limit is its
	// top), and a °C reading well past it.
	if f.Limit > 0 && (altSI > f.Limit || (u.Affine && v.SI <= 1.1*f.Limit)) {
		return
	}
	num := strconv.FormatFloat(n, 'g', -1, 64)
	d.Args = []any{fmt.Sprintf("%s; %s %s %s is probably meant as %s %s", d.Args[0], what, num, v.Unit(), num, alt)}
	d.Fixes = append(d.Fixes, lang.Fix{Title: fmt.Sprintf("Write %s %s", num, alt),
		Edits: []lang.Edit{{Loc: v.Loc(), NewText: num + " " + alt}}})
}

// tableRowLoc is where the row of a profile at time t is written in the
// profile's CSV file; false for a profile written in its case.
func tableRowLoc(p *lang.Profile, t *float64) (lang.Location, bool) {
	if t != nil {
		for _, r := range p.Rows {
			if r.Time == *t {
				return p.TableLoc(r)
			}
		}
	}
	return lang.Location{}, false
}

// profileRowLoc is where the row of a profile at time t is written: its
// time in the case, or the CSV file's name in the profile statement.
func profileRowLoc(p *lang.Profile, t *float64) lang.Location {
	if t != nil {
		for _, r := range p.Rows {
			if r.Time == *t {
				return lang.Location{File: p.File, Span: r.TimeSpan}
			}
		}
	}
	return p.Loc()
}
