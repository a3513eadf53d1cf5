package units

import (
	"strconv"
	"strings"

	"gonum.org/v1/gonum/unit"
)

// Dim is a physical dimension: exponents of the SI base quantities plus plane angle.
//
// L length, M mass, T time, I electric current, Th thermodynamic temperature,
// N amount of substance, J luminous intensity, A plane angle.
type Dim struct{ L, M, T, I, Th, N, J, A int8 }

// Named dimensions required by fields of a model.
var (
	Dimensionless           = Dim{}
	Length                  = Dim{L: 1}
	Area                    = Dim{L: 2}
	Volume                  = Dim{L: 3}
	Mass                    = Dim{M: 1}
	Time                    = Dim{T: 1}
	Temperature             = Dim{Th: 1}
	Pressure                = Dim{M: 1, L: -1, T: -2}
	Power                   = Dim{M: 1, L: 2, T: -3}
	Energy                  = Dim{M: 1, L: 2, T: -2}
	MassFlow                = Dim{M: 1, T: -1}
	SpecificEnergy          = Dim{L: 2, T: -2}                // J/kg
	Conductance             = Dim{M: 1, L: 2, T: -3, Th: -1}  // W/K
	HeatTransferCoefficient = Dim{M: 1, T: -3, Th: -1}        // W/(m2*K)
	HeatFlux                = Dim{M: 1, T: -3}                // W/m2
	Angle                   = Dim{A: 1}                       // rad
	Acceleration            = Dim{L: 1, T: -2}                // m/s2
	Velocity                = Dim{L: 1, T: -1}                // m/s
	Density                 = Dim{M: 1, L: -3}                // kg/m3
	Viscosity               = Dim{M: 1, L: -1, T: -1}         // Pa*s (dynamic)
	ThermalConductivity     = Dim{M: 1, L: 1, T: -3, Th: -1}  // W/(m*K)
	SurfaceTension          = Dim{M: 1, T: -2}                // N/m
	SpecificHeat            = Dim{L: 2, T: -2, Th: -1}        // J/(kg*K)
	Force                   = Dim{M: 1, L: 1, T: -2}          // N
	Frequency               = Dim{T: -1}                      // Hz
	VolumeFlow              = Dim{L: 3, T: -1}                // m3/s
	ThermalResistance       = Dim{M: -1, L: -2, T: 3, Th: 1}  // K/W
	Current                 = Dim{I: 1}                       // A
	Amount                  = Dim{N: 1}                       // mol
	LuminousIntensity       = Dim{J: 1}                       // cd
	MolarMass               = Dim{M: 1, N: -1}                // kg/mol
	VolumetricHeatCapacity  = Dim{M: 1, L: -1, T: -2, Th: -1} // J/(m3*K)
)

// names gives the field-facing noun of each named dimension.
var names = map[Dim]string{
	Dimensionless:           "a dimensionless number",
	Length:                  "a length",
	Area:                    "an area",
	Volume:                  "a volume",
	Mass:                    "a mass",
	Time:                    "a time",
	Temperature:             "a temperature",
	Pressure:                "a pressure",
	Power:                   "a power",
	Energy:                  "an energy",
	MassFlow:                "a mass flow rate",
	SpecificEnergy:          "a specific energy",
	Conductance:             "a thermal conductance",
	HeatTransferCoefficient: "a heat transfer coefficient",
	HeatFlux:                "a heat flux",
	Angle:                   "an angle",
	Acceleration:            "an acceleration",
	Velocity:                "a velocity",
	Density:                 "a density",
	Viscosity:               "a dynamic viscosity",
	ThermalConductivity:     "a thermal conductivity",
	SurfaceTension:          "a surface tension",
	SpecificHeat:            "a specific heat capacity",
	Force:                   "a force",
	Frequency:               "a frequency",
	VolumeFlow:              "a volume flow rate",
	ThermalResistance:       "a thermal resistance",
	Current:                 "an electric current",
	Amount:                  "an amount of substance",
	LuminousIntensity:       "a luminous intensity",
	MolarMass:               "a molar mass",
	VolumetricHeatCapacity:  "a volumetric heat capacity",
}

// Name gives the noun, with its article, that a message uses for a dimension:
// "a length", "a heat flux", "a dimensionless number". A dimension without a
// name is described by its SI form: "a quantity of m²/s".
func Name(d Dim) string {
	if n, ok := names[d]; ok {
		return n
	}
	return "a quantity of " + d.String()
}

// IsZero reports whether d is dimensionless.
func (d Dim) IsZero() bool { return d == Dim{} }

// base lists the components in the order they are written, with their SI symbols.
func (d Dim) exps() [8]int {
	return [8]int{int(d.L), int(d.M), int(d.T), int(d.I), int(d.Th), int(d.N), int(d.J), int(d.A)}
}

var baseSymbols = [8]string{"m", "kg", "s", "A", "K", "mol", "cd", "rad"}

func dimFromExps(e [8]int) Dim {
	return Dim{L: int8(e[0]), M: int8(e[1]), T: int8(e[2]), I: int8(e[3]), Th: int8(e[4]), N: int8(e[5]), J: int8(e[6]), A: int8(e[7])}
}

// String renders d in SI base units with Unicode superscripts, numerator
// first: "m²·kg/s", "kg/(s³·K)", "1/s"; "1" when dimensionless.
func (d Dim) String() string {
	return d.format("·", true)
}

// ascii renders d in the package's own ASCII unit syntax ("m2*kg/s"), so
// that Parse(d.ascii()) yields a coherent SI unit of dimension d.
func (d Dim) ascii() string {
	if d.IsZero() {
		return ""
	}
	return d.format("*", false)
}

func (d Dim) format(sep string, super bool) string {
	e := d.exps()
	var num, den []string
	for i, x := range e {
		if x == 0 {
			continue
		}
		n := x
		if n < 0 {
			n = -n
		}
		s := baseSymbols[i]
		if n != 1 {
			if super {
				s += superscript(n)
			} else {
				s += strconv.Itoa(n)
			}
		}
		if x > 0 {
			num = append(num, s)
		} else {
			den = append(den, s)
		}
	}
	var b strings.Builder
	if len(num) == 0 {
		b.WriteString("1")
	} else {
		b.WriteString(strings.Join(num, sep))
	}
	switch len(den) {
	case 0:
	case 1:
		b.WriteString("/" + den[0])
	default:
		b.WriteString("/(" + strings.Join(den, sep) + ")")
	}
	return b.String()
}

var superDigits = []rune("⁰¹²³⁴⁵⁶⁷⁸⁹")

func superscript(n int) string {
	var b strings.Builder
	for _, c := range strconv.Itoa(n) {
		if c == '-' {
			b.WriteRune('⁻')
			continue
		}
		b.WriteRune(superDigits[c-'0'])
	}
	return b.String()
}

// gonumDims maps each component of Dim to gonum's dimension constant.
var gonumDims = [8]unit.Dimension{
	unit.LengthDim, unit.MassDim, unit.TimeDim, unit.CurrentDim,
	unit.TemperatureDim, unit.MoleDim, unit.LuminousIntensityDim, unit.AngleDim,
}

// ToGonum converts d to gonum's map form, for use with gonum.org/v1/gonum/unit.
func (d Dim) ToGonum() unit.Dimensions {
	out := unit.Dimensions{}
	for i, x := range d.exps() {
		if x != 0 {
			out[gonumDims[i]] = x
		}
	}
	return out
}

// DimFromGonum converts gonum's map form to a Dim. Dimensions that Dim does
// not hold (custom gonum dimensions) are ignored, and exponents are clamped
// to the int8 range.
func DimFromGonum(g unit.Dimensions) Dim {
	var e [8]int
	for i, gd := range gonumDims {
		x := g[gd]
		if x > 127 {
			x = 127
		} else if x < -127 {
			x = -127
		}
		e[i] = x
	}
	return dimFromExps(e)
}

// dimAcc is an unbounded working form of Dim used while combining units, so
// that overflow can be detected before converting back.
type dimAcc [8]int

func (a dimAcc) add(b dimAcc, sign int) dimAcc {
	for i := range a {
		a[i] += sign * b[i]
	}
	return a
}

func (a dimAcc) scale(n int) dimAcc {
	for i := range a {
		a[i] *= n
	}
	return a
}

func (a dimAcc) fits(limit int) bool {
	for _, x := range a {
		if x > limit || x < -limit {
			return false
		}
	}
	return true
}
