package fluid

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"math"
	"path/filepath"
	"strconv"
	"strings"

	"circa/textfile"
	"circa/units"

	"gonum.org/v1/gonum/interp"
)

// TableError locates a problem in a user fluid table. Line and Column count
// from 1; Column is the field number in the row, 0 when the problem is the
// whole line, and Line is 0 when it is the whole table.
type TableError struct {
	File   string // path, when read by LoadCSV
	Line   int
	Column int
	Name   string // column name, when known
	Msg    string
}

func (e *TableError) Error() string {
	var b strings.Builder
	if e.File != "" {
		b.WriteString(e.File)
		b.WriteString(": ")
	}
	if e.Line > 0 {
		fmt.Fprintf(&b, "line %d", e.Line)
		if e.Column > 0 {
			fmt.Fprintf(&b, ", column %d", e.Column)
		}
		if e.Name != "" {
			fmt.Fprintf(&b, " (%s)", e.Name)
		}
		b.WriteString(": ")
	}
	b.WriteString(e.Msg)
	return b.String()
}

// csvColumn describes one accepted column of a user table.
type csvColumn struct {
	name     string // canonical name
	aliases  []string
	dim      units.Dim
	required bool
	partner  string // column whose unit an unmarked column borrows
	anySign  bool   // values may be zero or negative (enthalpy has an arbitrary zero)
}

// csvColumns are the columns a user table may hold, in Sat order.
var csvColumns = []csvColumn{
	{name: "T", aliases: []string{"t_sat", "tsat", "temperature"}, dim: units.Temperature, required: true},
	{name: "p", aliases: []string{"p_sat", "psat", "pressure"}, dim: units.Pressure, required: true},
	{name: "rho_l", aliases: []string{"rho_liquid", "rhol"}, dim: units.Density, required: true, partner: "rho_v"},
	{name: "rho_v", aliases: []string{"rho_vapour", "rho_vapor", "rho_g", "rhov"}, dim: units.Density, required: true, partner: "rho_l"},
	{name: "h_l", aliases: []string{"h_liquid", "hl"}, dim: units.SpecificEnergy, partner: "h_lv", anySign: true},
	{name: "h_lv", aliases: []string{"h_fg", "hlv", "hfg", "latent_heat"}, dim: units.SpecificEnergy, required: true, partner: "h_l"},
	{name: "cp_l", aliases: []string{"cp_liquid", "cpl"}, dim: units.SpecificHeat, required: true, partner: "cp_v"},
	{name: "cp_v", aliases: []string{"cp_vapour", "cp_vapor", "cp_g", "cpv"}, dim: units.SpecificHeat, partner: "cp_l"},
	{name: "mu_l", aliases: []string{"mu_liquid", "eta_l", "mul"}, dim: units.Viscosity, required: true, partner: "mu_v"},
	{name: "mu_v", aliases: []string{"mu_vapour", "mu_vapor", "mu_g", "eta_v", "muv"}, dim: units.Viscosity, required: true, partner: "mu_l"},
	{name: "k_l", aliases: []string{"k_liquid", "lambda_l", "kl"}, dim: units.ThermalConductivity, required: true, partner: "k_v"},
	{name: "k_v", aliases: []string{"k_vapour", "k_vapor", "k_g", "lambda_v", "kv"}, dim: units.ThermalConductivity, partner: "k_l"},
	{name: "sigma", aliases: []string{"surface_tension"}, dim: units.SurfaceTension, required: true},
}

// Column indexes into csvColumns.
const (
	cT = iota
	cP
	cRhoL
	cRhoV
	cHL
	cHlv
	cCpL
	cCpV
	cMuL
	cMuV
	cKL
	cKV
	cSigma
	cCount
)

// csvColumnIndex maps every accepted spelling, lower case, to its column.
var csvColumnIndex = func() map[string]int {
	m := map[string]int{}
	for i, c := range csvColumns {
		m[strings.ToLower(c.name)] = i
		for _, a := range c.aliases {
			m[a] = i
		}
	}
	return m
}()

const csvMinRows = 4

// LoadCSV reads a user fluid table from a file; see FromCSV for the format.
// The fluid is named by a "# name:" line, or else by the file's base name
// without its extension.
func LoadCSV(path string) (Fluid, error) {
	data, err := textfile.Read(path)
	if err != nil {
		var pe *fs.PathError
		if errors.As(err, &pe) {
			err = pe.Err
		}
		return nil, fmt.Errorf("cannot read %s: %w", path, err)
	}
	name := strings.TrimSuffix(filepath.Base(path), filepath.Ext(path))
	fl, err := readCSV(bytes.NewReader(data), name, false)
	var tes *TableErrors
	if errors.As(err, &tes) {
		tes.SetFile(path)
	}
	return fl, err
}

// FromCSV reads a user fluid table: saturated properties against temperature,
// one row per temperature, comma-separated.
//
// The first row that is not a comment names the columns, each with its unit
// in parentheses or brackets, e.g. "T (degC)", "p [kPa]", "cp_l (kJ/(kg K))".
// Units are any the units package reads, checked against the column's
// dimension. A column without a unit takes the unit of its liquid or vapour
// partner (cp_v that of cp_l, mu_v that of mu_l, and so on). Names are
// case-insensitive; the columns, with accepted aliases, are:
//
//	T      saturation temperature (t_sat, tsat, temperature)       required
//	p      saturation pressure (p_sat, psat, pressure)             required
//	rho_l  liquid density (rho_liquid, rhol)                       required
//	rho_v  vapour density (rho_vapour, rho_vapor, rho_g, rhov)     required
//	h_lv   latent heat (h_fg, hlv, hfg, latent_heat)               required
//	h_l    liquid enthalpy (h_liquid, hl)                          optional
//	cp_l   liquid specific heat (cp_liquid, cpl)                   required
//	cp_v   vapour specific heat (cp_vapour, cp_vapor, cp_g, cpv)   optional
//	mu_l   liquid viscosity (mu_liquid, eta_l, mul)                required
//	mu_v   vapour viscosity (mu_vapour, mu_vapor, mu_g, eta_v, muv) required
//	k_l    liquid conductivity (k_liquid, lambda_l, kl)            required
//	k_v    vapour conductivity (k_vapour, k_vapor, k_g, lambda_v, kv) optional
//	sigma  surface tension (surface_tension)                       required
//
// The required columns are those the loop estimates use. Without h_l the
// liquid enthalpy is the integral of cp_l over temperature (trapezoidal over
// the rows), zero at the first row, which neglects the small pressure term of
// a saturated liquid's enthalpy. Without cp_v or k_v those fields are zero.
//
// Temperatures must increase down the table (by at least a millionth from
// row to row), pressures with them, and every value except h_l must be
// positive; at least four rows are needed. Values
// between rows are interpolated with monotone cubics in the logarithms of the
// values (ln p against −1/T, the others against T; h_l as it is);
// nothing is extrapolated: look-ups outside the table's range are
// *RangeError.
//
// Lines starting with '#' are comments. Comments of the form "# key: value"
// with these keys give the fluid's description:
//
//	# name: demo coolant           name used when the name argument is empty
//	# safety: A1                   ASHRAE 34 safety class
//	# molar_mass: 0.1 kg/mol       molar mass, with unit
//	# critical: 400 K, 3.5 MPa     critical temperature and pressure, optionally density
//	# source: ...                  where the values come from
//
// Lines end at "\n", "\r\n" or a lone "\r". Errors are *TableErrors: every
// bad cell of the data rows, located by line and column, up to
// MaxTableErrors and a count of the rest; an error in the header stops the
// reading.
func FromCSV(r io.Reader, name string) (Fluid, error) {
	return readCSV(r, name, true)
}

// readCSV parses a table; nameFirst says whether the name argument beats a
// "# name:" line.
func readCSV(r io.Reader, name string, nameFirst bool) (Fluid, error) {
	p := csvParser{info: Info{Name: name}}
	metaName := ""
	sc := bufio.NewScanner(r)
	sc.Buffer(make([]byte, 64*1024), 1<<20)
	sc.Split(ScanLines)
	var errs TableErrors
	line := 0
	for sc.Scan() {
		line++
		text := strings.TrimSpace(sc.Text())
		if line == 1 {
			text = strings.TrimPrefix(text, "\uFEFF")
		}
		if text == "" {
			continue
		}
		if strings.HasPrefix(text, "#") {
			n, err := p.meta(line, text[1:])
			if err != nil {
				errs.Add(err)
			}
			if n != "" {
				metaName = n
			}
			continue
		}
		if p.cols == nil {
			if err := p.header(line, text); err != nil {
				errs.Add(err)
				return nil, &errs
			}
			continue
		}
		p.row(line, text, &errs)
	}
	if err := sc.Err(); err != nil {
		errs.Add(&TableError{Line: line + 1, Msg: "reading the table: " + err.Error()})
	}
	if err := errs.err(); err != nil {
		return nil, err
	}
	if metaName != "" && (!nameFirst || p.info.Name == "") {
		p.info.Name = metaName
	}
	if p.info.Name == "" {
		p.info.Name = "user fluid"
	}
	fl, err := p.finish()
	if err != nil {
		errs.Add(err)
		return nil, &errs
	}
	return fl, nil
}

type csvParser struct {
	info  Info
	cols  []int // csvColumns index of each field; nil before the header
	tcol  int   // field number of T, from 1
	names []string
	unit  [cCount]units.Unit
	has   [cCount]bool
	data  [cCount][]float64 // SI values
	lines []int             // line of each row
}

// meta reads a comment line, returning the name it gives, if any.
func (p *csvParser) meta(line int, text string) (string, *TableError) {
	key, val, ok := strings.Cut(text, ":")
	if !ok {
		return "", nil
	}
	key = strings.ToLower(strings.TrimSpace(key))
	val = strings.TrimSpace(val)
	bad := func(format string, a ...any) *TableError {
		return &TableError{Line: line, Msg: fmt.Sprintf("%s: ", key) + fmt.Sprintf(format, a...)}
	}
	switch key {
	case "name":
		return val, nil
	case "safety":
		p.info.Safety = val
	case "source":
		p.info.Source = val
	case "molar_mass", "molar mass":
		q, err := quantity(val, units.MolarMass)
		if err != nil {
			return "", bad("%v", err)
		}
		if q <= 0 {
			return "", bad("molar mass must be positive")
		}
		p.info.MolarMass = q
	case "critical":
		parts := strings.Split(val, ",")
		if len(parts) < 2 || len(parts) > 3 {
			return "", bad("want a temperature and a pressure, optionally a density, e.g. \"400 K, 3.5 MPa\"")
		}
		dims := []units.Dim{units.Temperature, units.Pressure, units.Density}
		var v [3]float64
		for i, s := range parts {
			q, err := quantity(s, dims[i])
			if err != nil {
				return "", bad("%v", err)
			}
			if q <= 0 {
				return "", bad("critical values must be positive")
			}
			v[i] = q
		}
		p.info.Tc, p.info.Pc, p.info.RhoC = v[0], v[1], v[2]
	}
	return "", nil
}

// quantity reads "number unit" and returns it in SI, checking the dimension.
func quantity(s string, dim units.Dim) (float64, error) {
	s = strings.TrimSpace(s)
	i := strings.IndexFunc(s, func(r rune) bool { return r == ' ' || r == '\t' })
	num, us := s, ""
	if i >= 0 {
		num, us = s[:i], strings.TrimSpace(s[i:])
	}
	v, err := strconv.ParseFloat(num, 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
		return 0, fmt.Errorf("not a number %q", num)
	}
	u, err := units.Parse(us)
	if err != nil {
		return 0, fmt.Errorf("unit %q: %v", us, err)
	}
	if u.Dim != dim {
		return 0, fmt.Errorf("unit %q is not %s", us, units.Name(dim))
	}
	return u.ToSI(v), nil
}

// splitFields splits a row at commas, trimming spaces and surrounding quotes.
func splitFields(text string) []string {
	f := strings.Split(text, ",")
	for i, s := range f {
		s = strings.TrimSpace(s)
		if len(s) >= 2 && s[0] == '"' && s[len(s)-1] == '"' {
			s = strings.TrimSpace(s[1 : len(s)-1])
		}
		f[i] = s
	}
	return f
}

// header reads the column names and units.
func (p *csvParser) header(line int, text string) *TableError {
	fields := splitFields(text)
	p.cols = make([]int, len(fields))
	p.names = make([]string, len(fields))
	unitText := make([]string, cCount)
	unitCol := make([]int, cCount)
	for j, f := range fields {
		name, u, err := HeaderCell(f)
		if err != nil {
			return &TableError{Line: line, Column: j + 1, Msg: err.Error()}
		}
		p.names[j] = name
		c, ok := csvColumnIndex[strings.ToLower(name)]
		if !ok {
			return &TableError{Line: line, Column: j + 1, Name: name, Msg: fmt.Sprintf("unknown column %q (columns: %s)", name, csvColumnList())}
		}
		if p.has[c] {
			return &TableError{Line: line, Column: j + 1, Name: name, Msg: fmt.Sprintf("duplicate column: %s is also column %d", csvColumns[c].name, unitCol[c])}
		}
		p.has[c] = true
		p.cols[j] = c
		if c == cT {
			p.tcol = j + 1
		}
		unitText[c], unitCol[c] = u, j+1
	}
	for c, col := range csvColumns {
		if col.required && !p.has[c] {
			return &TableError{Line: line, Msg: fmt.Sprintf("missing column %s", col.name)}
		}
	}
	for c, col := range csvColumns {
		if !p.has[c] {
			continue
		}
		us := unitText[c]
		if us == "" && col.partner != "" {
			pc := csvColumnIndex[col.partner]
			us = unitText[pc]
		}
		if us == "" {
			return &TableError{Line: line, Column: unitCol[c], Name: col.name,
				Msg: fmt.Sprintf("no unit: write it in parentheses, e.g. %q", col.name+" ("+exampleUnit(c)+")")}
		}
		u, err := units.Parse(us)
		if err != nil {
			return &TableError{Line: line, Column: unitCol[c], Name: col.name, Msg: fmt.Sprintf("unit %q: %v", us, err)}
		}
		if u.Dim != col.dim {
			return &TableError{Line: line, Column: unitCol[c], Name: col.name,
				Msg: fmt.Sprintf("unit %q is not %s, as %s needs", us, units.Name(col.dim), col.name)}
		}
		p.unit[c] = u
	}
	return nil
}

func exampleUnit(c int) string {
	return [cCount]string{"K", "Pa", "kg/m3", "kg/m3", "J/kg", "J/kg", "J/(kg K)", "J/(kg K)", "Pa s", "Pa s", "W/(m K)", "W/(m K)", "N/m"}[c]
}

func csvColumnList() string {
	names := make([]string, len(csvColumns))
	for i, c := range csvColumns {
		names[i] = c.name
	}
	return strings.Join(names, ", ")
}

// row reads one data row, adding an error for each bad cell; a row with
// any is left out, so that the next is checked against the last good one.
func (p *csvParser) row(line int, text string, errs *TableErrors) {
	fields := splitFields(text)
	if len(fields) != len(p.cols) {
		errs.Add(&TableError{Line: line, Msg: fmt.Sprintf("%d fields, but the header names %d columns", len(fields), len(p.cols))})
		return
	}
	n := len(p.lines)
	var vals [cCount]float64
	ok := true
	for j, f := range fields {
		c := p.cols[j]
		bad := func(format string, a ...any) {
			ok = false
			errs.Add(&TableError{Line: line, Column: j + 1, Name: p.names[j], Msg: fmt.Sprintf(format, a...)})
		}
		v, err := strconv.ParseFloat(f, 64)
		if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
			bad("not a number %q", f)
			continue
		}
		si := p.unit[c].ToSI(v)
		if math.IsNaN(si) || math.IsInf(si, 0) {
			bad("value %q out of range", f)
			continue
		}
		if c == cT && si <= 0 {
			bad("temperature %s is not above absolute zero", f)
			continue
		}
		if !csvColumns[c].anySign && si <= 0 {
			bad("%s must be positive, got %s", csvColumns[c].name, f)
			continue
		}
		if n > 0 {
			prev := p.data[c][n-1]
			switch c {
			case cT:
				if si <= prev {
					bad("temperatures must increase down the table (previous row, line %d, has %g K, this one %g K)", p.lines[n-1], prev, si)
					continue
				}
			case cP:
				if si <= prev {
					bad("pressure must increase with temperature (previous row, line %d, has %g Pa, this one %g Pa)", p.lines[n-1], prev, si)
					continue
				}
			}
		}
		vals[c] = si
	}
	if !ok {
		return
	}
	for j := range fields {
		c := p.cols[j]
		p.data[c] = append(p.data[c], vals[c])
	}
	p.lines = append(p.lines, line)
}

// finish checks the whole table and fits its interpolants.
func (p *csvParser) finish() (Fluid, *TableError) {
	if p.cols == nil {
		return nil, &TableError{Msg: "no header row: the first line that is not a comment must name the columns"}
	}
	n := len(p.lines)
	if n < csvMinRows {
		return nil, &TableError{Msg: fmt.Sprintf("%d data rows; at least %d are needed", n, csvMinRows)}
	}
	T := p.data[cT]
	p.info.Tmin, p.info.Tmax = T[0], T[n-1]
	if p.info.Tc > 0 && p.info.Tmax >= p.info.Tc {
		return nil, &TableError{Line: p.lines[n-1], Msg: fmt.Sprintf("temperature %g K is not below the critical temperature %g K", p.info.Tmax, p.info.Tc)}
	}
	if !p.has[cHL] {
		h := make([]float64, n)
		cp := p.data[cCpL]
		for i := 1; i < n; i++ {
			h[i] = h[i-1] + 0.5*(cp[i]+cp[i-1])*(T[i]-T[i-1])
		}
		p.data[cHL] = h
	}
	if p.info.Source == "" {
		p.info.Source = "user table"
	}
	ct := &csvTable{info: p.info, tmin: T[0], tmax: T[n-1]}
	x := make([]float64, n)
	for i, t := range T {
		x[i] = -1 / t
		// Rows closer than a millionth of the temperature make the
		// interpolants' slopes meaninglessly steep.
		if i > 0 && !(t-T[i-1] >= 1e-6*t) {
			return nil, &TableError{Line: p.lines[i], Column: p.tcol, Name: p.names[p.tcol-1],
				Msg: fmt.Sprintf("temperature %g K is too close to the previous row's %g K (rows must differ by a millionth or more)", t, T[i-1])}
		}
	}
	lnp := make([]float64, n)
	for i, v := range p.data[cP] {
		lnp[i] = math.Log(v)
	}
	if err := ct.lnp.Fit(x, lnp); err != nil {
		return nil, &TableError{Msg: "fitting the pressure: " + err.Error()}
	}
	// The pressure range is that of the interpolant at its ends, which may
	// differ from the table in the last bit, so that AtT and AtP agree on it.
	ct.pmin = math.Exp(ct.lnp.Predict(x[0]))
	ct.pmax = math.Exp(ct.lnp.Predict(x[n-1]))
	for c := cRhoL; c < cCount; c++ {
		if !p.has[c] && c != cHL {
			continue
		}
		ct.has[c] = true
		y := p.data[c]
		if c != cHL {
			y = make([]float64, n)
			for i, v := range p.data[c] {
				y[i] = math.Log(v)
			}
		}
		if err := ct.fit[c].Fit(T, y); err != nil {
			return nil, &TableError{Msg: fmt.Sprintf("fitting %s: %v", csvColumns[c].name, err)}
		}
	}
	return ct, nil
}

// csvTable is an immutable user table with monotone cubic interpolants.
type csvTable struct {
	info       Info
	tmin, tmax float64
	pmin, pmax float64
	lnp        interp.FritschButland         // ln p against −1/T
	fit        [cCount]interp.FritschButland // ln of the value against T; h_l itself
	has        [cCount]bool
}

func (ct *csvTable) Info() Info { return ct.info }

func (ct *csvTable) AtT(T float64) (Sat, error) {
	if !(T >= ct.tmin && T <= ct.tmax) {
		return Sat{}, &RangeError{Fluid: ct.info.Name, Quantity: "temperature", Value: T, Min: ct.tmin, Max: ct.tmax, Unit: "K"}
	}
	p := math.Exp(ct.lnp.Predict(-1 / T))
	return ct.at(T, min(max(p, ct.pmin), ct.pmax)), nil // AtP accepts every pressure AtT gives
}

func (ct *csvTable) at(T, p float64) Sat {
	v := func(c int) float64 {
		switch {
		case !ct.has[c]:
			return 0
		case c == cHL:
			return ct.fit[c].Predict(T)
		}
		return math.Exp(ct.fit[c].Predict(T))
	}
	hl, hlv := v(cHL), v(cHlv)
	return Sat{
		T: T, P: p,
		RhoL: v(cRhoL), RhoV: v(cRhoV),
		HL: hl, HV: hl + hlv, Hlv: hlv,
		CpL: v(cCpL), CpV: v(cCpV),
		MuL: v(cMuL), MuV: v(cMuV),
		KL: v(cKL), KV: v(cKV),
		Sigma: v(cSigma),
	}
}

// AtP solves the interpolated p(T) for T by bisection with false-position
// steps; the interpolant is monotone, so the root is unique.
func (ct *csvTable) AtP(p float64) (Sat, error) {
	if !(p >= ct.pmin && p <= ct.pmax) {
		return Sat{}, &RangeError{Fluid: ct.info.Name, Quantity: "pressure", Value: p, Min: ct.pmin, Max: ct.pmax, Unit: "Pa"}
	}
	target := math.Log(p)
	lo, hi := -1/ct.tmin, -1/ct.tmax
	flo, fhi := ct.lnp.Predict(lo)-target, ct.lnp.Predict(hi)-target
	x := lo
	switch {
	case flo >= 0:
		x = lo
	case fhi <= 0:
		x = hi
	default:
		for iter := 0; iter < 200 && hi-lo > 1e-15*math.Abs(lo); iter++ {
			m := lo + (hi-lo)*flo/(flo-fhi)
			if iter%2 == 1 || !(m > lo && m < hi) {
				m = (lo + hi) / 2
			}
			fm := ct.lnp.Predict(m) - target
			if fm == 0 {
				lo, hi = m, m
				break
			}
			if fm < 0 {
				lo, flo = m, fm
			} else {
				hi, fhi = m, fm
			}
		}
		x = (lo + hi) / 2
	}
	T := min(max(-1/x, ct.tmin), ct.tmax)
	return ct.at(T, p), nil
}
