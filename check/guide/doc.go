// Package guide turns the circulation estimate into design guidance: what
// to change, and by how much, for every margin to hold.
//
//   - Feasible ranges. For each top-level parameter, the other parameters
//     as written, the values over which every margin holds in every case.
//     The search steps outward from the value as written (10 %, 25 %, 60 %,
//     then ten steps a decade to tenfold and a hundredfold, and as much
//     smaller; a parameter keeps its sign) until a margin fails, and closes the bracket by Brent's
//     method on the limiting margin's use, to 0.1 %. Where the estimate
//     stops being usable inside a bracket (the loop stops circulating, the
//     momentum balance has several roots, the value makes the file invalid
//     or the estimate reports an error), the bracket is closed by bisection
//     and the range ends there, saying why. From a value that is itself
//     outside, the search looks both ways for the nearest feasible value;
//     with none, the value that comes closest is reported. The ranges are
//     searched without the tilt search (its only product is the tilt
//     margin) and without the structural checks (topology, geometry), and
//     their ends checked with both; only a range whose end fails one is
//     searched again with them. Cases with a profile or an envelope are
//     held at their worst points during the searches (reduce.go). Where the
//     margins' slopes at the value as written foretell a limit, the first
//     step goes just past it.
//     Where the fill charge as written ends or blocks a range, the range
//     is searched again with the charge re-set to suit each value: every
//     other margin holding and some charge suiting every case.
//   - Sensitivities: each margin's use differentiated by central
//     differences (a step of 0.1 % of the value), per unit of the
//     parameter as written and per 10 % of it, ranked by size. A parameter
//     whose steps change no margin influences no estimate and gets no
//     range.
//   - The charge of each loop: the estimate's operating points do not
//     depend on it, so its range is exactly the one the charge margin
//     accepts in every case (evaporator starved below, condenser flooded,
//     reservoir overfull or no room for vapour above).
//   - Fluids (on request): the loop estimated with every built-in fluid and
//     each table the file names, ranked by the margin each leaves, with its
//     ASHRAE 34 safety class, its saturation pressure in the hottest case
//     against the design pressure and the charge range it needs.
//
// Each variant is the model resolved again with one parameter overridden
// (lang's Model.With); estimates run in parallel over parameters, sides
// and fluids, a bounded number at a time, and stop when the context is
// cancelled.
package guide
