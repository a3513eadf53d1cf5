package units

import (
	"math"
	"slices"
	"strconv"
	"strings"
)

// Format renders an SI value in unit u with five significant digits and
// no trailing zeros: Format(0.012, MustParse("mm")) == "12 mm".
func Format(si float64, u Unit) string {
	num := formatNumber(u.FromSI(si))
	if u.Text == "" {
		return num
	}
	return num + " " + u.Text
}

func formatNumber(v float64) string {
	switch {
	case math.IsNaN(v):
		return "NaN"
	case math.IsInf(v, 1):
		return "+Inf"
	case math.IsInf(v, -1):
		return "-Inf"
	case v == 0:
		return "0"
	}
	const sig = 5
	a := math.Abs(v)
	if a >= 1e-3 && a < 1e7 {
		mag := int(math.Floor(math.Log10(a))) + 1 // digits before the point
		dec := sig - mag
		if dec < 0 {
			dec = 0
		}
		s := strconv.FormatFloat(v, 'f', dec, 64)
		if strings.Contains(s, ".") {
			s = strings.TrimRight(s, "0")
			s = strings.TrimSuffix(s, ".")
		}
		if s == "-0" {
			s = "0"
		}
		return s
	}
	s := strconv.FormatFloat(v, 'e', sig-1, 64)
	mant, exp, _ := strings.Cut(s, "e")
	if strings.Contains(mant, ".") {
		mant = strings.TrimRight(mant, "0")
		mant = strings.TrimSuffix(mant, ".")
	}
	exp = strings.TrimPrefix(exp, "+")
	neg := strings.HasPrefix(exp, "-")
	exp = strings.TrimLeft(strings.TrimPrefix(exp, "-"), "0")
	if neg {
		exp = "-" + exp
	}
	return mant + "e" + exp
}

// commonTexts lists, per dimension, the units engineers commonly write,
// SI first.
var commonTexts = map[Dim][]string{
	Dimensionless:           {"", "%", "ppm"},
	Length:                  {"m", "mm", "cm", "km", "um", "in", "ft", "mil"},
	Area:                    {"m2", "mm2", "cm2", "in2", "ft2"},
	Volume:                  {"m3", "L", "mL", "cm3", "in3", "ft3"},
	Mass:                    {"kg", "g", "mg", "lb", "oz"},
	Time:                    {"s", "ms", "min", "h"},
	Temperature:             {"K", "degC", "degF", "degR", "degC_diff", "degF_diff"},
	Pressure:                {"Pa", "kPa", "bar", "MPa", "mbar", "hPa", "psi", "atm", "bar(g)", "kPa(g)", "psig", "bar(a)", "psia"},
	Power:                   {"W", "kW", "MW", "mW", "Btu/h"},
	Energy:                  {"J", "kJ", "MJ", "Wh", "kWh", "Btu"},
	MassFlow:                {"kg/s", "g/s", "kg/h", "lb/h", "lb/s"},
	SpecificEnergy:          {"J/kg", "kJ/kg", "Btu/lb"},
	Conductance:             {"W/K", "kW/K", "Btu/(h*degF)"},
	HeatTransferCoefficient: {"W/(m2*K)", "kW/(m2*K)", "Btu/(h*ft2*degF)"},
	HeatFlux:                {"W/m2", "kW/m2", "W/cm2", "Btu/(h*ft2)"},
	Angle:                   {"rad", "deg", "mrad"},
	Acceleration:            {"m/s2", "gn", "ft/s2"},
	Velocity:                {"m/s", "mm/s", "km/h", "ft/s", "ft/min"},
	Density:                 {"kg/m3", "g/cm3", "kg/L", "lb/ft3"},
	Viscosity:               {"Pa*s", "mPa*s", "cP", "P", "uPa*s"},
	ThermalConductivity:     {"W/(m*K)", "Btu/(h*ft*degF)"},
	SurfaceTension:          {"N/m", "mN/m"},
	SpecificHeat:            {"J/(kg*K)", "kJ/(kg*K)", "Btu/(lb*degF)"},
	Force:                   {"N", "kN", "lbf"},
	Frequency:               {"Hz", "1/s", "kHz", "1/min"},
	VolumeFlow:              {"m3/s", "L/s", "L/min", "m3/h", "ft3/min"},
	ThermalResistance:       {"K/W", "degF*h/Btu"},
}

var commonUnits = func() map[Dim][]Unit {
	m := map[Dim][]Unit{}
	for d, ts := range commonTexts {
		for _, t := range ts {
			u := MustParse(t)
			if u.Dim != d {
				panic("units: common unit " + t + " has the wrong dimension")
			}
			m[d] = append(m[d], u)
		}
	}
	return m
}()

// Common returns the units commonly used for a dimension, SI first, for
// hover text and completion. A dimension without a list gets its coherent
// SI unit alone.
func Common(d Dim) []Unit {
	if us, ok := commonUnits[d]; ok {
		return slices.Clone(us)
	}
	u, err := Parse(d.ascii())
	if err != nil || u.Dim != d {
		return nil
	}
	return []Unit{u}
}

var known = func() []string {
	var out []string
	seen := map[string]bool{}
	add := func(s string) {
		if !seen[s] {
			seen[s] = true
			out = append(out, s)
		}
	}
	for _, a := range atomList {
		add(a.canon)
		for _, al := range a.aliases {
			add(al)
		}
		for _, p := range strings.Fields(a.known) {
			add(p + a.canon)
		}
		if a.pressure {
			for _, p := range append([]string{""}, strings.Fields(a.known)...) {
				if a.canon == "psi" {
					continue
				}
				add(p + a.canon + "(g)")
				add(p + a.canon + "(a)")
			}
		}
	}
	return out
}()

// Known returns every unit symbol spelling in the table, with the commonly
// prefixed forms (mm, kPa, kW ...), for completion and did-you-mean.
func Known() []string { return slices.Clone(known) }

// suggestPool is what Suggest draws from: the symbols and the common
// compound units.
var suggestPool = func() []string {
	out := slices.Clone(known)
	seen := map[string]bool{}
	for _, s := range out {
		seen[s] = true
	}
	dims := make([]Dim, 0, len(commonTexts))
	for d := range commonTexts {
		dims = append(dims, d)
	}
	slices.SortFunc(dims, func(a, b Dim) int { return strings.Compare(a.String(), b.String()) })
	for _, d := range dims {
		for _, t := range commonTexts[d] {
			if t != "" && !seen[t] {
				seen[t] = true
				out = append(out, t)
			}
		}
	}
	return out
}()

// poolEntry is a spelling Suggest may offer, with its forms precomputed.
type poolEntry struct {
	text, lower, skel string
	sorted            []rune
}

var suggestEntries = func() []poolEntry {
	out := make([]poolEntry, len(suggestPool))
	for i, t := range suggestPool {
		out[i] = poolEntry{text: t, lower: strings.ToLower(t), skel: skeleton(t), sorted: sortedRunes(t)}
	}
	return out
}()

// Suggest returns up to three known spellings closest to s, best first:
// spellings equal but for case, then those with the same letters and
// digits (kgs -> kg/s), then two symbols run together (kgK -> kg*K), then
// anagrams (psgi -> psig), then by edit distance.
func Suggest(s string) []string {
	if s == "" || len(s) > 64 {
		return nil
	}
	type cand struct {
		text                    string
		fold, skel, split, anag int
		edits                   int
		idx                     int
	}
	sk := skeleton(s)
	lower := strings.ToLower(s)
	sorted := sortedRunes(s)
	limit := 1
	if n := len([]rune(s)); n > 4 {
		limit = 2
	}
	var cs []cand
	for i, e := range suggestEntries {
		if e.text == s {
			continue
		}
		c := cand{text: e.text, idx: i, fold: 1, skel: 1, anag: 1, edits: editDistance(s, e.text)}
		if e.lower == lower {
			c.fold = 0
		}
		if sk != "" && e.skel == sk {
			c.skel = 0
		}
		if slices.Equal(sorted, e.sorted) {
			c.anag = 0
		}
		// A known symbol that starts s: "degree" -> "deg".
		prefix := len(e.text) >= 3 && strings.HasPrefix(s, e.text)
		if c.fold == 0 || c.skel == 0 || c.anag == 0 || c.edits <= limit || prefix {
			cs = append(cs, c)
		}
	}
	// Two unprefixed symbols run together: "kgK" -> "kg*K". Ranked after
	// known spellings with the same letters, so "kgs" still gives "kg/s".
	for i := 1; i < len(s); i++ {
		if atoms[s[:i]] != nil && atoms[s[i:]] != nil {
			cs = append(cs, cand{text: s[:i] + "*" + s[i:], fold: 1, split: 1, idx: -1})
			break
		}
	}
	slices.SortStableFunc(cs, func(a, b cand) int {
		if a.fold != b.fold {
			return a.fold - b.fold
		}
		if a.skel != b.skel {
			return a.skel - b.skel
		}
		if a.split != b.split {
			return a.split - b.split
		}
		if a.anag != b.anag {
			return a.anag - b.anag
		}
		if a.edits != b.edits {
			return a.edits - b.edits
		}
		return a.idx - b.idx
	})
	var out []string
	for _, c := range cs {
		if len(out) == 3 {
			break
		}
		if !slices.Contains(out, c.text) {
			out = append(out, c.text)
		}
	}
	return out
}

func sortedRunes(s string) []rune {
	r := []rune(s)
	slices.Sort(r)
	return r
}

// skeleton keeps only the letters and digits of a spelling.
func skeleton(s string) string {
	var b strings.Builder
	for _, r := range s {
		if r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9' {
			b.WriteRune(r)
		}
	}
	return b.String()
}

// editDistance is the optimal string alignment distance over runes
// (insertions, deletions, substitutions and adjacent transpositions).
func editDistance(a, b string) int {
	ra, rb := []rune(a), []rune(b)
	n, m := len(ra), len(rb)
	prev2 := make([]int, m+1)
	prev := make([]int, m+1)
	cur := make([]int, m+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= n; i++ {
		cur[0] = i
		for j := 1; j <= m; j++ {
			cost := 1
			if ra[i-1] == rb[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
			if i > 1 && j > 1 && ra[i-1] == rb[j-2] && ra[i-2] == rb[j-1] {
				cur[j] = min(cur[j], prev2[j-2]+1)
			}
		}
		prev2, prev, cur = prev, cur, prev2
	}
	return prev[m]
}

// Pretty writes a unit's canonical ASCII text with the symbols people write
// and read: degC as °C, um as µm, m2 as m², * as ·, degC_diff as Δ°C. It is
// for display; Parse reads both forms.
func Pretty(text string) string {
	var b strings.Builder
	prevWord := false // the previous character ends a unit word or a group
	for i := 0; i < len(text); {
		c := text[i]
		switch {
		case isWordByte(c):
			j := i
			for j < len(text) && isWordByte(text[j]) {
				j++
			}
			b.WriteString(prettyWord(text[i:j]))
			i, prevWord = j, true
			continue
		case prevWord && (c == '2' || c == '3') && (i+1 == len(text) || !isDigitByte(text[i+1])):
			b.WriteString(map[byte]string{'2': "²", '3': "³"}[c])
		case c == '*':
			b.WriteString("·")
		default:
			b.WriteByte(c)
		}
		prevWord = c == ')'
		i++
	}
	return b.String()
}

func isWordByte(c byte) bool {
	return c == '_' || (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z')
}

func isDigitByte(c byte) bool { return c >= '0' && c <= '9' }

// prettyWord maps one unit word (letters and underscores) to its symbol.
func prettyWord(w string) string {
	switch w {
	case "degC":
		return "°C"
	case "degF":
		return "°F"
	case "degR":
		return "°R"
	case "degC_diff":
		return "Δ°C"
	case "degF_diff":
		return "Δ°F"
	case "um", "us", "uL", "ug", "uW", "uPa":
		return "µ" + w[1:]
	}
	return w
}

// SigDecimals is the number of decimals that writes a, a positive finite
// magnitude, to n significant figures, counted from a rounded to n figures
// so that 9.996 to three is 10.0, not 10.00.
func SigDecimals(a float64, n int) int {
	r, _ := strconv.ParseFloat(strconv.FormatFloat(a, 'e', n-1, 64), 64)
	return max(n-1-int(math.Floor(math.Log10(r))), 0)
}

// Sig renders v to n significant figures keeping their trailing zeros
// (0.100, 3.20, 50.0), as a value beside others of n figures reads: a
// dropped zero looks like a value known to fewer. Values from 1e-4 up are
// plain decimals (a value of more than n integer digits keeps them all);
// smaller ones take an exponent. Zero is "0.00" to three figures, never
// "-0".
func Sig(v float64, n int) string {
	n = max(n, 1)
	a := math.Abs(v)
	switch {
	case v == 0:
		return strconv.FormatFloat(0, 'f', n-1, 64)
	case math.IsNaN(v) || math.IsInf(v, 0):
		return strconv.FormatFloat(v, 'g', n, 64)
	case a < 1e-4:
		return strconv.FormatFloat(v, 'e', n-1, 64)
	}
	s := strconv.FormatFloat(v, 'f', SigDecimals(a, n), 64)
	if s[0] == '-' && strings.Trim(s, "-0.") == "" {
		s = s[1:]
	}
	return s
}
