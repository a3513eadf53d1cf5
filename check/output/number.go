package output

import (
	"math"
	"strconv"
	"strings"

	"circa/check/flow"
	"circa/units"
)

// fixed formats v with prec decimals; a value that rounds to zero prints
// without a sign ("0", not "-0").
func fixed(v float64, prec int) string {
	s := strconv.FormatFloat(v, 'f', prec, 64)
	if strings.HasPrefix(s, "-") && strings.Trim(s, "-0.") == "" {
		s = s[1:]
	}
	return s
}

// sig formats v to n significant digits, without a negative zero.
func sig(v float64, n int) string {
	s := strconv.FormatFloat(v, 'g', n, 64)
	if f, err := strconv.ParseFloat(s, 64); err == nil && f == 0 {
		return "0"
	}
	return s
}

// sigRange formats the ends of a range to n significant digits of the
// larger end, both with the same decimals: 0.172–0.210, not 0.172–0.21,
// whose dropped zero reads as a value known to two digits only.
func sigRange(lo, hi float64, n int) string {
	if m := math.Max(math.Abs(lo), math.Abs(hi)); m == 0 || math.IsNaN(m) || math.IsInf(m, 0) {
		return sig(lo, n) + "–" + sig(hi, n)
	}
	d := sigDecimals([]float64{lo, hi}, n)
	return fixed(lo, d) + "–" + fixed(hi, d)
}

// sigDecimals is the number of decimals that gives the largest of vs n
// significant digits: a column printed with it keeps its decimal points
// lined up and never shows one row to more digits than the rest.
func sigDecimals(vs []float64, n int) int {
	m := 0.0
	for _, v := range vs {
		if a := math.Abs(v); a > m && !math.IsInf(a, 0) {
			m = a
		}
	}
	if m == 0 || math.IsNaN(m) {
		return n - 1
	}
	return units.SigDecimals(m, n)
}

// sigZeros is sig keeping trailing zeros: 3.10, not 3.1, beside a 4.23
// that it is compared with.
func sigZeros(v float64, n int) string { return units.Sig(v, n) }

func celsius(k float64) float64 { return k - 273.15 }

func deg(r float64) float64 { return r * 180 / math.Pi }

// temperature is an absolute temperature in degrees Celsius, spelt as every
// command spells it.
func temperature(k float64) string { return fixed(celsius(k), 1) + " °C" }

// angle is an angle in signed degrees with one decimal.
func angle(r float64) string {
	s := fixed(deg(r), 1)
	if s != "0.0" && !strings.HasPrefix(s, "-") {
		s = "+" + s
	}
	return s + "°"
}

// pressureAs formats an absolute pressure in the unit the design pressure
// was written in (gauge stays gauge), else in bar absolute.
func pressureAs(pa float64, written string) string { return flow.PressureText(pa, written) }

// roundToSum rounds each value to an integer so that the integers add up
// to total (itself an integer near the values' sum): each value moves by
// less than one, and the largest remainders take the difference.
func roundToSum(vals []float64, total int) []int {
	out := make([]int, len(vals))
	rem := make([]float64, len(vals))
	sum := 0
	for i, v := range vals {
		f := math.Floor(v)
		out[i] = int(f)
		rem[i] = v - f
		sum += out[i]
	}
	for d := total - sum; d != 0; {
		best := -1
		for i := range vals {
			if d > 0 && (best < 0 || rem[i] > rem[best]) || d < 0 && (best < 0 || rem[i] < rem[best]) {
				best = i
			}
		}
		if best < 0 {
			break
		}
		if d > 0 {
			out[best]++
			rem[best] -= 1
			d--
		} else {
			out[best]--
			rem[best] += 1
			d++
		}
	}
	return out
}
