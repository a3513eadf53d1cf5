package units

import "math"

// atom is one unit symbol that may appear in a unit expression.
type atom struct {
	canon      string  // canonical ASCII spelling
	dim        dimAcc  // dimension
	factor     float64 // SI value of one of this unit
	offset     float64 // added after scaling, for offset temperature scales
	affine     bool    // an offset temperature scale (degC, degF)
	prefixable bool    // accepts SI prefixes
	pressure   bool    // accepts a (g) or (a) reference suffix
	gauge      bool    // the spelling itself says gauge (barg, psig)
	absolute   bool    // the spelling itself says absolute (bara, psia)
	known      string  // prefixes listed by Known, space separated
	aliases    []string
}

// Exact conversion factors. Where a value is derived, the derivation uses
// only exact defined quantities.
const (
	inch          = 0.0254                     // international inch, exact
	foot          = 0.3048                     // international foot, exact
	pound         = 0.45359237                 // avoirdupois pound, exact
	standardGrav  = 9.80665                    // standard acceleration of gravity, exact
	poundForce    = pound * standardGrav       // 4.4482216152605 N
	psiPa         = poundForce / (inch * inch) // 6894.757293168... Pa
	btuIT         = 1055.05585262              // International Table Btu, exact
	standardAtm   = 101325                     // standard atmosphere, exact
	celsiusOffset = 273.15                     // 0 degC in K, exact
	rankine       = 5.0 / 9.0                  // 1 degR = 1 degF interval in K
	fahrenheitOff = 459.67 * rankine           // 0 degF in K
	degreeAngle   = math.Pi / 180              // 1 deg in rad
	hourSeconds   = 3600                       // 1 h in s
	ounce         = pound / 16                 // avoirdupois ounce
	milLength     = inch / 1000                // one thousandth of an inch
	litre         = 1e-3                       // 1 L in m3, exact
	poise         = 0.1                        // 1 P in Pa*s, exact
	wattHour      = hourSeconds                // 1 Wh in J
	minuteSeconds = 60                         // 1 min in s
	perCent       = 0.01                       // 1 % as a fraction
	perMillion    = 1e-6                       // 1 ppm as a fraction
	noFactor      = 1                          // coherent SI unit
)

func d(l, m, t, i, th, n, j, a int) dimAcc { return dimAcc{l, m, t, i, th, n, j, a} }

var (
	dLength   = d(1, 0, 0, 0, 0, 0, 0, 0)
	dMass     = d(0, 1, 0, 0, 0, 0, 0, 0)
	dTime     = d(0, 0, 1, 0, 0, 0, 0, 0)
	dCurrent  = d(0, 0, 0, 1, 0, 0, 0, 0)
	dTemp     = d(0, 0, 0, 0, 1, 0, 0, 0)
	dAmount   = d(0, 0, 0, 0, 0, 1, 0, 0)
	dLuminous = d(0, 0, 0, 0, 0, 0, 1, 0)
	dAngle    = d(0, 0, 0, 0, 0, 0, 0, 1)
	dVolume   = d(3, 0, 0, 0, 0, 0, 0, 0)
	dPressure = d(-1, 1, -2, 0, 0, 0, 0, 0)
	dPower    = d(2, 1, -3, 0, 0, 0, 0, 0)
	dEnergy   = d(2, 1, -2, 0, 0, 0, 0, 0)
	dForce    = d(1, 1, -2, 0, 0, 0, 0, 0)
	dFreq     = d(0, 0, -1, 0, 0, 0, 0, 0)
	dAccel    = d(1, 0, -2, 0, 0, 0, 0, 0)
	dVisc     = d(-1, 1, -1, 0, 0, 0, 0, 0)
	dNone     = dimAcc{}
)

// atomList is the table of unit symbols. Order matters only for Known.
var atomList = []*atom{
	// length
	{canon: "m", dim: dLength, factor: 1, prefixable: true, known: "k c m u µ μ n"},
	{canon: "in", dim: dLength, factor: inch},
	{canon: "ft", dim: dLength, factor: foot},
	{canon: "mil", dim: dLength, factor: milLength},
	// volume
	{canon: "L", dim: dVolume, factor: litre, prefixable: true, known: "m", aliases: []string{"l"}},
	// mass
	{canon: "kg", dim: dMass, factor: 1},
	{canon: "g", dim: dMass, factor: 1e-3, prefixable: true, known: "m"},
	{canon: "lb", dim: dMass, factor: pound, aliases: []string{"lbm"}},
	{canon: "oz", dim: dMass, factor: ounce},
	// time
	{canon: "s", dim: dTime, factor: 1, prefixable: true, known: "m"},
	{canon: "min", dim: dTime, factor: minuteSeconds},
	{canon: "h", dim: dTime, factor: hourSeconds, aliases: []string{"hr"}},
	// temperature
	{canon: "K", dim: dTemp, factor: 1, prefixable: true, known: "m"},
	{canon: "degC", dim: dTemp, factor: 1, offset: celsiusOffset, affine: true, aliases: []string{"°C", "℃"}},
	{canon: "degF", dim: dTemp, factor: rankine, offset: fahrenheitOff, affine: true, aliases: []string{"°F", "℉"}},
	{canon: "degR", dim: dTemp, factor: rankine, aliases: []string{"°R"}},
	{canon: "degC_diff", dim: dTemp, factor: 1, aliases: []string{"Δ°C", "ΔdegC"}},
	{canon: "degF_diff", dim: dTemp, factor: rankine, aliases: []string{"Δ°F", "ΔdegF"}},
	// pressure
	{canon: "Pa", dim: dPressure, factor: 1, prefixable: true, pressure: true, known: "h k M"},
	{canon: "bar", dim: dPressure, factor: 1e5, prefixable: true, pressure: true, known: "m"},
	{canon: "psi", dim: dPressure, factor: psiPa, pressure: true},
	{canon: "atm", dim: dPressure, factor: standardAtm},
	{canon: "bar(g)", dim: dPressure, factor: 1e5, gauge: true, aliases: []string{"barg"}},
	{canon: "bar(a)", dim: dPressure, factor: 1e5, absolute: true, aliases: []string{"bara"}},
	{canon: "psig", dim: dPressure, factor: psiPa, gauge: true},
	{canon: "psia", dim: dPressure, factor: psiPa, absolute: true},
	// power and energy
	{canon: "W", dim: dPower, factor: 1, prefixable: true, known: "m k M"},
	{canon: "J", dim: dEnergy, factor: 1, prefixable: true, known: "k M"},
	{canon: "Wh", dim: dEnergy, factor: wattHour, prefixable: true, known: "k M"},
	{canon: "Btu", dim: dEnergy, factor: btuIT},
	// force
	{canon: "N", dim: dForce, factor: 1, prefixable: true, known: "m k"},
	{canon: "lbf", dim: dForce, factor: poundForce},
	// acceleration: standard gravity, never spelt "g" (that is the gram)
	{canon: "gn", dim: dAccel, factor: standardGrav, aliases: []string{"g0", "g_n"}},
	// viscosity
	{canon: "P", dim: dVisc, factor: poise, prefixable: true, known: "c"},
	// angle
	{canon: "rad", dim: dAngle, factor: 1, prefixable: true, known: "m"},
	{canon: "deg", dim: dAngle, factor: degreeAngle, aliases: []string{"°"}},
	// frequency
	{canon: "Hz", dim: dFreq, factor: 1, prefixable: true, known: "k"},
	// dimensionless
	{canon: "%", dim: dNone, factor: perCent},
	{canon: "ppm", dim: dNone, factor: perMillion},
	// other SI base units
	{canon: "A", dim: dCurrent, factor: noFactor, prefixable: true, known: "m"},
	{canon: "mol", dim: dAmount, factor: noFactor, prefixable: true, known: "k"},
	{canon: "cd", dim: dLuminous, factor: noFactor, prefixable: true},
}

// atoms maps every accepted spelling of an unprefixed symbol to its atom.
var atoms = func() map[string]*atom {
	m := map[string]*atom{}
	for _, a := range atomList {
		m[a.canon] = a
		for _, al := range a.aliases {
			m[al] = a
		}
	}
	return m
}()

// prefix is an SI prefix; the value is 10^exp.
type prefix struct {
	sym   string
	canon string // ASCII spelling
	exp   int
}

// prefixes lists the SI prefixes; "da" precedes "d" so the longer one is tried first.
var prefixes = []prefix{
	{"y", "y", -24}, {"z", "z", -21}, {"a", "a", -18}, {"f", "f", -15}, {"p", "p", -12},
	{"n", "n", -9}, {"u", "u", -6}, {"µ", "u", -6}, {"μ", "u", -6}, {"m", "m", -3},
	{"c", "c", -2}, {"da", "da", 1}, {"d", "d", -1}, {"h", "h", 2}, {"k", "k", 3},
	{"M", "M", 6}, {"G", "G", 9}, {"T", "T", 12}, {"P", "P", 15}, {"E", "E", 18},
}

// scaleBy10 multiplies f by 10^e, dividing for negative e so that the
// result is correctly rounded (1e-3 is not exact in binary, 1000 is).
func scaleBy10(f float64, e int) float64 {
	if e >= 0 {
		return f * math.Pow10(e)
	}
	return f / math.Pow10(-e)
}

// lookupResult is the outcome of resolving one symbol.
type lookupResult struct {
	a      *atom
	canon  string
	factor float64
	// badPrefix is set when the text is a prefix on a unit that takes none.
	badPrefix string
}

// lookup resolves a symbol, with or without an SI prefix.
func lookup(name string) (lookupResult, bool) {
	if a, ok := atoms[name]; ok {
		return lookupResult{a: a, canon: a.canon, factor: a.factor}, true
	}
	var bad lookupResult
	for _, p := range prefixes {
		if len(name) <= len(p.sym) || name[:len(p.sym)] != p.sym {
			continue
		}
		a, ok := atoms[name[len(p.sym):]]
		if !ok {
			continue
		}
		if !a.prefixable {
			if bad.a == nil {
				bad = lookupResult{a: a, canon: a.canon, badPrefix: p.sym}
			}
			continue
		}
		return lookupResult{a: a, canon: p.canon + a.canon, factor: scaleBy10(a.factor, p.exp)}, true
	}
	return bad, false
}
