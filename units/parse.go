package units

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"sync"
	"sync/atomic"
	"unicode/utf8"
)

// Unit is a parsed unit expression.
type Unit struct {
	Text   string  // canonical ASCII spelling, e.g. "W/(m2*K)", "degC", "bar(g)"
	Dim    Dim     // dimension
	Factor float64 // SI value = Factor*v + Offset
	Offset float64
	Affine bool // an offset temperature scale (degC, degF): the value is an absolute temperature
	Gauge  bool // a gauge pressure: the SI value adds the standard atmosphere, 101325 Pa
}

// ToSI converts a value written in u to SI. The zero Unit acts as the
// dimensionless unit.
func (u Unit) ToSI(v float64) float64 { return u.scale()*v + u.Offset }

// FromSI converts an SI value to u.
func (u Unit) FromSI(si float64) float64 { return (si - u.Offset) / u.scale() }

func (u Unit) scale() float64 {
	if u.Factor == 0 {
		return 1
	}
	return u.Factor
}

// IsDifference reports whether u writes only temperature differences
// (degC_diff, degF_diff and their Unicode forms), not absolute temperatures.
func (u Unit) IsDifference() bool { return u.Text == "degC_diff" || u.Text == "degF_diff" }

// Quantity returns the quantity that v written in u denotes.
func (u Unit) Quantity(v float64) Quantity {
	return Quantity{SI: u.ToSI(v), Dim: u.Dim, AbsTemp: u.Affine}
}

// Error locates a problem inside a unit's text. Offsets are bytes from the
// start of the string given to Parse; End is exclusive.
type Error struct {
	Offset, End int
	Msg         string
	Suggestions []string // replacement spellings, best first
}

func (e *Error) Error() string { return e.Msg }

// MustParse is Parse that panics on error; for tables and tests only.
func MustParse(s string) Unit {
	u, err := Parse(s)
	if err != nil {
		panic("units.MustParse(" + strconv.Quote(s) + "): " + err.Error())
	}
	return u
}

// cache holds successful parses. The parser calls Parse once per quantity in
// a file, and a file uses few distinct units, so a lookup is the common path.
// The size is bounded so that arbitrary input cannot grow it without limit.
var (
	cache     sync.Map // string -> Unit
	cacheSize atomic.Int32
)

const cacheLimit = 4096

// Parse reads a unit expression. The empty string (or "1") is the
// dimensionless unit. Errors are *Error.
func Parse(s string) (Unit, error) {
	if v, ok := cache.Load(s); ok {
		return v.(Unit), nil
	}
	u, err := parse(s)
	if err != nil {
		return Unit{}, err
	}
	if cacheSize.Load() < cacheLimit {
		// The key is a copy: s may share a buffer its caller reuses.
		if _, loaded := cache.LoadOrStore(strings.Clone(s), u); !loaded {
			cacheSize.Add(1)
		}
	}
	return u, nil
}

// part is one symbol of a canonical spelling with its exponent.
type part struct {
	name string
	exp  int
}

// special marks a symbol whose meaning depends on standing alone: an offset
// temperature scale or a pressure with a gauge/absolute reference.
type special struct {
	kind       int // specialAffine, specialGauge, specialAbsolute
	off, end   int
	canon      string
	offset     float64
	atomFactor float64
}

const (
	specialAffine = iota + 1
	specialGauge
	specialAbsolute
)

// val is the value of a sub-expression during parsing.
type val struct {
	dim      dimAcc
	factor   float64
	parts    []part
	specials []special
}

func (v *val) mul(o val, sign int) {
	v.dim = v.dim.add(o.dim, sign)
	if sign > 0 {
		v.factor *= o.factor
	} else {
		v.factor /= o.factor
	}
	for _, p := range o.parts {
		v.addPart(p.name, sign*p.exp)
	}
	v.specials = append(v.specials, o.specials...)
}

func (v *val) addPart(name string, exp int) {
	for i := range v.parts {
		if v.parts[i].name == name {
			v.parts[i].exp += exp
			return
		}
	}
	v.parts = append(v.parts, part{name, exp})
}

func (v *val) pow(n int) {
	v.dim = v.dim.scale(n)
	v.factor = math.Pow(v.factor, float64(n))
	for i := range v.parts {
		v.parts[i].exp *= n
	}
}

type parser struct {
	s     string
	pos   int
	depth int
}

const (
	maxDepth = 16  // nesting of parentheses
	maxPower = 12  // largest power written on one factor
	maxExp   = 100 // largest exponent of a base dimension in a result
)

func (p *parser) errf(off, end int, format string, args ...any) *Error {
	if off > len(p.s) {
		off = len(p.s)
	}
	if end > len(p.s) {
		end = len(p.s)
	}
	if end < off {
		end = off
	}
	return &Error{Offset: off, End: end, Msg: fmt.Sprintf(format, args...)}
}

func (p *parser) peek() (rune, int) {
	if p.pos >= len(p.s) {
		return -1, 0
	}
	r, n := utf8.DecodeRuneInString(p.s[p.pos:])
	return r, n
}

func (p *parser) skipSpace() bool {
	start := p.pos
	for p.pos < len(p.s) && (p.s[p.pos] == ' ' || p.s[p.pos] == '\t') {
		p.pos++
	}
	return p.pos > start
}

func parse(s string) (Unit, error) {
	p := &parser{s: s}
	p.skipSpace()
	if p.pos == len(s) {
		return Unit{Factor: 1}, nil
	}
	v, err := p.expr()
	if err != nil {
		return Unit{}, err
	}
	if p.pos < len(s) {
		r, n := p.peek()
		if r == ')' {
			return Unit{}, p.errf(p.pos, p.pos+n, "unmatched \")\"")
		}
		return Unit{}, p.errf(p.pos, p.pos+n, "unexpected %q in unit", string(r))
	}
	return p.finish(v)
}

// finish turns the value of the whole expression into a Unit.
func (p *parser) finish(v val) (Unit, error) {
	if !v.dim.fits(maxExp) {
		return Unit{}, p.errf(0, len(p.s), "unit powers are too large")
	}
	for _, pt := range v.parts {
		if pt.exp > maxPower || pt.exp < -maxPower {
			return Unit{}, p.errf(0, len(p.s), "the power of %q is too large", pt.name)
		}
	}
	if !finitePositive(v.factor) {
		return Unit{}, p.errf(0, len(p.s), "unit scale is out of range")
	}
	u := Unit{Dim: dimFromExps(v.dim), Factor: v.factor}
	lone := len(v.parts) == 1 && v.parts[0].exp == 1 && len(v.specials) == 1
	for _, sp := range v.specials {
		switch {
		case lone && sp.kind == specialAffine:
			u.Affine = true
			u.Offset = sp.offset
		case lone && sp.kind == specialGauge:
			u.Gauge = true
			u.Offset = standardAtm
		case lone && sp.kind == specialAbsolute:
		case sp.kind == specialAffine:
			// Inside a compound unit (W/(m*degC)) a temperature scale
			// stands for its degree, an interval: no offset.
		default:
			return Unit{}, p.errf(sp.off, sp.end,
				"%q is a pressure with a reference point; it cannot be part of a compound unit", sp.canon)
		}
	}
	u.Text = canonText(v.parts)
	return u, nil
}

func finitePositive(f float64) bool {
	return f > 0 && !math.IsInf(f, 0) && !math.IsNaN(f)
}

func canonText(parts []part) string {
	var num, den []string
	for _, pt := range parts {
		if pt.exp == 0 {
			continue
		}
		n := pt.exp
		if n < 0 {
			n = -n
		}
		s := pt.name
		if n != 1 {
			last := s[len(s)-1]
			if (last >= 'a' && last <= 'z') || (last >= 'A' && last <= 'Z') {
				s += strconv.Itoa(n)
			} else {
				s += "^" + strconv.Itoa(n)
			}
		}
		if pt.exp > 0 {
			num = append(num, s)
		} else {
			den = append(den, s)
		}
	}
	if len(num) == 0 && len(den) == 0 {
		return ""
	}
	t := strings.Join(num, "*")
	if len(num) == 0 {
		t = "1"
	}
	switch len(den) {
	case 0:
	case 1:
		t += "/" + den[0]
	default:
		t += "/(" + strings.Join(den, "*") + ")"
	}
	return t
}

func isProductRune(r rune) bool {
	return r == '*' || r == '·' || r == '⋅' || r == '×'
}

// expr := factor { ( "*" | "·" | "×" | "/" | space ) factor }, left-associative.
func (p *parser) expr() (val, error) {
	v, err := p.factor()
	if err != nil {
		return val{}, err
	}
	for {
		spaced := p.skipSpace()
		r, n := p.peek()
		opStart := p.pos
		sign := 1
		switch {
		case r < 0 || r == ')':
			return v, nil
		case isProductRune(r):
			p.pos += n
		case r == '/':
			p.pos += n
			sign = -1
		case r == '.':
			return val{}, p.errf(p.pos, p.pos+n, "write a product with \"*\" or \"·\", not \".\"")
		case spaced && startsFactor(r):
			// A space between two units is a product: "Pa s", "W/(m2 K)".
		case startsFactor(r):
			return val{}, p.errf(p.pos, p.pos+n, "put \"*\" or a space between two units (as in %s*%s)",
				strings.TrimSpace(p.s[:p.pos]), p.s[p.pos:p.pos+n])
		default:
			return val{}, p.errf(p.pos, p.pos+n, "unexpected %q in unit", string(r))
		}
		p.skipSpace()
		if r2, _ := p.peek(); r2 < 0 || r2 == ')' || r2 == '/' || isProductRune(r2) {
			return val{}, p.errf(opStart, opStart+n, "expected a unit after %q", string(r))
		}
		o, err := p.factor()
		if err != nil {
			return val{}, err
		}
		v.mul(o, sign)
		if !v.dim.fits(1000) {
			return val{}, p.errf(0, len(p.s), "unit powers are too large")
		}
	}
}

func startsFactor(r rune) bool {
	return r == '(' || isAtomRune(r) || (r >= '0' && r <= '9')
}

func isAtomRune(r rune) bool {
	switch {
	case r >= 'a' && r <= 'z', r >= 'A' && r <= 'Z', r == '_', r == '%':
		return true
	case r == '°', r == 'µ', r == 'μ', r == '℃', r == '℉', r == 'Δ':
		return true
	}
	return false
}

// factor := ( atom | "(" expr ")" | "1" ) [ power ]
func (p *parser) factor() (val, error) {
	p.skipSpace()
	r, n := p.peek()
	start := p.pos
	var v val
	switch {
	case r < 0:
		return val{}, p.errf(p.pos, p.pos, "expected a unit")
	case r == '(':
		if p.depth >= maxDepth {
			return val{}, p.errf(p.pos, p.pos+1, "parentheses nested too deeply")
		}
		p.depth++
		p.pos++
		p.skipSpace()
		if r2, _ := p.peek(); r2 == ')' {
			return val{}, p.errf(start, p.pos+1, "empty parentheses")
		}
		inner, err := p.expr()
		if err != nil {
			return val{}, err
		}
		p.depth--
		if r2, _ := p.peek(); r2 != ')' {
			return val{}, p.errf(start, start+1, "unclosed \"(\"")
		}
		p.pos++
		v = inner
		if err := p.power(&v); err != nil {
			return val{}, err
		}
		return v, nil
	case r >= '0' && r <= '9':
		for p.pos < len(p.s) && p.s[p.pos] >= '0' && p.s[p.pos] <= '9' {
			p.pos++
		}
		if p.s[start:p.pos] != "1" {
			return val{}, p.errf(start, p.pos, "a number cannot be part of a unit (only \"1\", as in 1/s)")
		}
		return val{factor: 1}, nil
	case isAtomRune(r):
		return p.atom()
	case r == ')':
		return val{}, p.errf(p.pos, p.pos+n, "expected a unit before \")\"")
	default:
		return val{}, p.errf(p.pos, p.pos+n, "unexpected %q in unit", string(r))
	}
}

// atom reads a symbol, an optional (g)/(a) pressure reference and a power.
func (p *parser) atom() (val, error) {
	start := p.pos
	for {
		r, n := p.peek()
		if r < 0 || !isAtomRune(r) {
			break
		}
		p.pos += n
	}
	end := p.pos
	// Trailing digits are a power ("m2"), unless the whole run is a symbol ("g0").
	digEnd := end
	for digEnd < len(p.s) && p.s[digEnd] >= '0' && p.s[digEnd] <= '9' {
		digEnd++
	}
	if digEnd > end {
		if _, ok := atoms[p.s[start:digEnd]]; ok {
			end = digEnd
			p.pos = digEnd
		}
	}
	name := p.s[start:end]
	res, ok := lookup(name)
	if !ok {
		if res.badPrefix != "" {
			return val{}, p.errf(start, end, "the prefix %q cannot be used with %q", res.badPrefix, res.canon)
		}
		if name == "delta_degC" || name == "delta_degF" {
			// Differences are written as SI does (K) or as degC_diff.
			alt := name[len("delta_"):] + "_diff"
			e := p.errf(start, end, "unknown unit %q; a temperature difference is written K or %s", name, alt)
			e.Suggestions = []string{alt, "K"}
			return val{}, e
		}
		e := p.errf(start, end, "unknown unit %q", name)
		e.Suggestions = Suggest(name)
		if len(e.Suggestions) > 0 {
			e.Msg += fmt.Sprintf("; did you mean %q?", e.Suggestions[0])
		}
		return val{}, e
	}
	a := res.a
	v := val{dim: a.dim, factor: res.factor}
	canon := res.canon
	switch {
	case a.affine:
		v.specials = append(v.specials, special{kind: specialAffine, off: start, end: end, canon: canon, offset: a.offset})
	case a.gauge:
		v.specials = append(v.specials, special{kind: specialGauge, off: start, end: end, canon: canon})
	case a.absolute:
		v.specials = append(v.specials, special{kind: specialAbsolute, off: start, end: end, canon: canon})
	}
	// Pressure reference: "bar(g)", "kPa(a)".
	if rest := p.s[p.pos:]; len(rest) >= 3 && rest[0] == '(' && rest[2] == ')' && (rest[1] == 'g' || rest[1] == 'a') {
		if !a.pressure {
			return val{}, p.errf(start, p.pos+3, "%q marks a gauge or absolute pressure; %q is not a pressure unit", rest[:3], name)
		}
		kind := specialGauge
		if rest[1] == 'a' {
			kind = specialAbsolute
		}
		if a.canon == "psi" {
			canon += string(rest[1]) // psig, psia
		} else {
			canon += rest[:3]
		}
		p.pos += 3
		v.specials = append(v.specials, special{kind: kind, off: start, end: p.pos, canon: canon})
	}
	v.parts = []part{{canon, 1}}
	if err := p.power(&v); err != nil {
		return val{}, err
	}
	// "s-1" is ambiguous (a power or a subtraction?): ask for s^-1.
	if rest := p.s[p.pos:]; len(rest) >= 2 && rest[0] == '-' && rest[1] >= '0' && rest[1] <= '9' {
		e := p.pos + 1
		for e < len(p.s) && p.s[e] >= '0' && p.s[e] <= '9' {
			e++
		}
		return val{}, p.errf(start, e, "%q is ambiguous; write %s^%s or 1/%s", p.s[start:e], name, p.s[p.pos:e], name)
	}
	return v, nil
}

// power reads "^n", "^-n", superscripts or trailing digits ("m2").
func (p *parser) power(v *val) error {
	start := p.pos
	n, have := 0, false
	{
		e := p.pos
		for e < len(p.s) && p.s[e] >= '0' && p.s[e] <= '9' {
			e++
		}
		if e > p.pos {
			if e-p.pos > 2 {
				return p.errf(p.pos, e, "power %s is too large", p.s[p.pos:e])
			}
			n, _ = strconv.Atoi(p.s[p.pos:e])
			p.pos = e
			have = true
		}
	}
	if !have {
		r, sz := p.peek()
		switch {
		case r == '^':
			p.pos += sz
			neg := false
			if r2, sz2 := p.peek(); r2 == '-' || r2 == '−' || r2 == '+' {
				neg = r2 != '+'
				p.pos += sz2
			}
			e := p.pos
			for e < len(p.s) && p.s[e] >= '0' && p.s[e] <= '9' {
				e++
			}
			if e == p.pos {
				return p.errf(start, p.pos, "expected a whole number after \"^\"")
			}
			if e-p.pos > 2 {
				return p.errf(start, e, "power %s is too large", p.s[p.pos:e])
			}
			n, _ = strconv.Atoi(p.s[p.pos:e])
			if neg {
				n = -n
			}
			p.pos = e
			have = true
		case r == '⁻' || superValue(r) >= 0:
			neg := false
			if r == '⁻' {
				neg = true
				p.pos += sz
			}
			got := 0
			for {
				r2, sz2 := p.peek()
				dv := superValue(r2)
				if dv < 0 {
					break
				}
				n = n*10 + dv
				got++
				p.pos += sz2
				if got > 2 {
					return p.errf(start, p.pos, "power is too large")
				}
			}
			if got == 0 {
				return p.errf(start, p.pos, "expected a superscript digit after \"⁻\"")
			}
			if neg {
				n = -n
			}
			have = true
		}
	}
	if !have {
		return nil
	}
	// A second power ("m2^3", "m²2") or a fractional one ("m^0.5") is refused.
	if r, sz := p.peek(); r == '^' || r == '⁻' || superValue(r) >= 0 {
		return p.errf(start, p.pos+sz, "a unit can carry only one power")
	} else if r == '.' && p.pos+1 < len(p.s) && p.s[p.pos+1] >= '0' && p.s[p.pos+1] <= '9' {
		return p.errf(start, p.pos+2, "fractional powers are not supported")
	}
	if n == 0 {
		return p.errf(start, p.pos, "a power of zero cancels the unit; leave the unit out")
	}
	if n > maxPower || n < -maxPower {
		return p.errf(start, p.pos, "power %d is too large", n)
	}
	v.pow(n)
	if !v.dim.fits(1000) {
		return p.errf(start, p.pos, "unit powers are too large")
	}
	return nil
}

func superValue(r rune) int {
	for i, s := range superDigits {
		if r == s {
			return i
		}
	}
	return -1
}
