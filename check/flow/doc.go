// Package flow estimates the steady circulation of a passive two-phase loop
// (a thermosiphon: no pump) in every operating case, and how close each case
// is to a design limit.
//
// It is a quick, one-dimensional, quasi-static estimate for early design:
// it is not a transient simulator, and every number it gives is an estimate
// with a stated method.
//
// Model (each choice is also stated in the output):
//
//   - One saturation state per loop and case. The saturation temperature is
//     the case's or the loop's `saturation` when given, else a condenser's
//     fixed `outlet` temperature, else the condenser balance
//     Q = Σ UA·(T_sat − T_sink) solved for T_sat (the condensing-side
//     temperature is taken uniform). All two-phase properties are those of
//     that saturation state; the pressure variation around the loop is small
//     against the saturation pressure and is not fed back into properties.
//   - Enthalpy is carried as the quality-equivalent x = (h − h_l)/h_lv.
//     Subcooled liquid has x < 0 and single-phase liquid properties at its
//     own temperature T = T_sat + x·h_lv/c_p,l (saturated-liquid density and
//     viscosity at T). Above x = 1 the vapour keeps the saturated-vapour
//     properties; that state is reported as dryout.
//   - An evaporator adds its heat uniformly over its heated length, which is
//     centred on the component. A condenser brings the fluid leaving it to
//     saturated liquid, or subcooled by its `subcool`, linearly over its
//     length; it never heats (fluid already colder passes unchanged). The
//     heat each condenser rejects therefore follows from the flow; the sum
//     closes the energy balance.
//   - Per cell: void fraction (Rouhani–Axelsson by default, its horizontal
//     form where the tube is within 5° of perpendicular to the body force),
//     two-phase friction (Müller-Steinhagen & Heck by default) or
//     single-phase friction (Churchill by default), gravity ∫ρ_m b·ŝ ds
//     with the case's body force b, acceleration out minus in, and the
//     component's local loss K·G²/(2ρ_h) on its outlet state. Components
//     without heat keep one state along their length and are evaluated once.
//   - A single loop has one unknown mass flow. Its excess head
//     E(ṁ) = −Σ(p_in − p_out) is bracketed on a logarithmic grid from
//     1e-6 to 10 kg/s, continued above it while E stays positive (a
//     boiler-scale loop circulates more) up to 1e5 kg/s, finer over the
//     boiling band (between the flows at which the heat just dries
//     out and just saturates a subcooled return, where E need not be
//     monotone), and refined by Brent's method; a root with dE/dṁ < 0 is stable, one with
//     dE/dṁ > 0 statically unstable (Ledinegg) and flagged. The stable root
//     of highest flow is the estimate.
//   - A network (parallel branches between junctions) is solved for its
//     independent cycle flows: every branch flow is a sum of cycle flows, so
//     mass is conserved at each junction exactly, and the momentum balance
//     around each fundamental cycle (the junction pressures eliminated) is
//     driven to zero by Newton's method with a backtracking line search,
//     started from one-cycle-at-a-time estimates. Enthalpy mixes at merges
//     in proportion to the incoming flows.
package flow
