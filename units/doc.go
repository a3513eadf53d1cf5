// Package units parses the unit written after every dimensional number in a
// .loop file, converts values to and from SI, and checks that a quantity has
// the dimension a field needs.
//
// A dimension is a Dim: a small comparable struct of int8 exponents. It is
// used instead of gonum's map-based unit.Dimensions because the checker
// compares and combines dimensions for every quantity it reads: a struct is
// compared with ==, used as a map key, and costs no allocation. ToGonum and
// DimFromGonum convert to and from gonum.org/v1/gonum/unit, whose Dimension
// constants name the components.
//
// # Syntax
//
// A unit is a product or quotient of symbols, each with an optional power:
//
//	W/(m2*K)   W/(m² K)   W/m2/K   kg/s   m/s^2   s^-1   1/s   Pa s   N·m
//
// Products: "*", "·" (U+00B7), "⋅" (U+22C5), "×", or a space. "." is refused.
// Quotients: "/", left-associative, so W/m2/K is W/(m2*K). Powers: "^2",
// "^-1", trailing digits on a symbol ("m2"), Unicode superscripts ("m²",
// "s⁻¹"). "s-1" is refused as ambiguous. Parentheses group. The empty string
// and "1" are dimensionless.
//
// # Symbols
//
// Prefixable (SI prefixes y z a f p n u µ μ m c d da h k M G T P E):
// m, g (gram; never gravity), s, K, Pa, bar, W, J, Wh, N, L (also l), P (poise),
// rad, Hz, A, mol, cd. Common prefixed forms: km cm mm um µm μm nm, mL, mg,
// ms, mK, hPa kPa MPa, mbar, mW kW MW, kJ MJ, kWh MWh, mN kN, cP, mrad, kHz.
//
// Not prefixable: kg, in (inch), ft, mil (0.001 in), lb (also lbm), oz, min,
// h (also hr), degC (°C ℃), degF (°F ℉), degR (°R), degC_diff (Δ°C ΔdegC),
// degF_diff (Δ°F ΔdegF), psi, atm, Btu (International Table), lbf, gn (standard
// gravity, also g0 g_n), deg (°), % and ppm.
//
// Pressure references: bar(g) barg, bar(a) bara, psig psia, and a (g) or (a)
// suffix on any Pa, bar or psi form: kPa(g), MPa(g), Pa(g), kPa(a), psi(g). A
// gauge pressure has Gauge set and its SI value adds the standard atmosphere,
// 101325 Pa; an absolute pressure is the plain unit. A reference cannot be
// part of a compound unit.
//
// # Temperatures
//
// degC and degF alone are offset scales (Affine): 20 degC is the absolute
// temperature 293.15 K. K and degR are plain scales, usable for an absolute
// temperature or a difference. degC_diff (1 K) and degF_diff (5/9 K) are
// differences, read "degree Celsius difference" as engineers say it; their
// Unicode forms Δ°C and Δ°F follow the ΔT notation. SI itself writes a
// temperature difference in kelvin, which is always the safe choice. Inside a compound unit a scale stands for its degree, an
// interval: W/(m*degC) equals W/(m*K).
//
// Parse caches successful results, so a repeated unit costs one map lookup.
package units
