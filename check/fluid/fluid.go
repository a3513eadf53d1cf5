// Package fluid gives the saturated properties of working fluids: built-in
// fluids from published reference equations and user tables read from CSV.
//
// All values are SI: K, Pa, kg/m³, J/kg, J/(kg·K), Pa·s, W/(m·K), N/m.
package fluid

import (
	"fmt"
	"sort"
	"strings"
	"sync"
)

// Info describes a fluid: identity, critical point, valid range and safety class.
type Info struct {
	Name      string   // canonical name, e.g. "R1233zd(E)"
	Aliases   []string // other accepted spellings, matched case-insensitively
	MolarMass float64  // kg/mol
	Tc        float64  // critical temperature, K
	Pc        float64  // critical pressure, Pa
	RhoC      float64  // critical density, kg/m³
	Tmin      float64  // lowest saturation temperature answered, K
	Tmax      float64  // highest saturation temperature answered, K (below Tc)
	// Safety is the ASHRAE 34 / ISO 817 safety class ("A1", "A2L", "B2L", ...);
	// empty for user tables that do not state one.
	Safety string
	// Source cites the equation of state and property correlations used.
	Source string
}

// Caution returns the usual caution for a fluid whose safety class marks it
// flammable or of higher toxicity, or "" for class A1 and unclassified
// non-flammable fluids.
func (in Info) Caution() string {
	c := strings.ToUpper(in.Safety)
	lower := strings.ToLower(in.Safety)
	var parts []string
	if strings.HasPrefix(c, "B") || strings.Contains(lower, "toxic") {
		parts = append(parts, "higher toxicity")
	}
	switch {
	case strings.Contains(c, "2L"):
		parts = append(parts, "mildly flammable")
	case strings.Contains(c, "2") || strings.Contains(c, "3") || strings.Contains(lower, "flammable"):
		parts = append(parts, "flammable")
	}
	if len(parts) == 0 {
		return ""
	}
	return in.Name + " is a " + strings.Join(parts, " and ") + " working fluid (" + in.Safety + "): charge limits, " +
		"ventilation, ignition sources and leak detection are set by local refrigerant-safety codes; follow them " +
		"and licensed engineering practice."
}

// Sat is the saturated state at one temperature: both phases' properties.
type Sat struct {
	T     float64 // saturation temperature, K
	P     float64 // saturation pressure, Pa
	RhoL  float64 // liquid density, kg/m³
	RhoV  float64 // vapour density, kg/m³
	HL    float64 // liquid specific enthalpy, J/kg (fluid's own reference state)
	HV    float64 // vapour specific enthalpy, J/kg
	Hlv   float64 // latent heat HV−HL, J/kg
	CpL   float64 // liquid isobaric specific heat, J/(kg·K)
	CpV   float64 // vapour isobaric specific heat, J/(kg·K)
	MuL   float64 // liquid dynamic viscosity, Pa·s
	MuV   float64 // vapour dynamic viscosity, Pa·s
	KL    float64 // liquid thermal conductivity, W/(m·K)
	KV    float64 // vapour thermal conductivity, W/(m·K)
	Sigma float64 // surface tension, N/m
}

// Fluid answers saturated-property look-ups. Implementations are safe for
// concurrent use.
type Fluid interface {
	Info() Info
	// AtT returns the saturated state at temperature T (K). It returns an
	// error outside [Tmin, Tmax]; it never returns NaN or Inf.
	AtT(T float64) (Sat, error)
	// AtP returns the saturated state at pressure p (Pa), the inverse of AtT.
	AtP(p float64) (Sat, error)
}

// Evaluator computes saturated states directly from a fluid's equations. It
// is slow; Lookup wraps each built-in evaluator in a cached table.
type Evaluator interface {
	Info() Info
	Direct(T float64) (Sat, error)
}

// RangeError reports a temperature or pressure outside a fluid's range.
type RangeError struct {
	Fluid    string
	Quantity string // "temperature" or "pressure"
	Value    float64
	Min, Max float64
	Unit     string // "K" or "Pa"
}

func (e *RangeError) Error() string {
	return fmt.Sprintf("%s: saturation %s %.6g %s outside the range %.6g to %.6g %s",
		e.Fluid, e.Quantity, e.Value, e.Unit, e.Min, e.Max, e.Unit)
}

var (
	regMu    sync.Mutex
	registry = map[string]*entry{} // by canonical lower-case key
	ordered  []*entry
)

type entry struct {
	eval  Evaluator
	once  sync.Once
	fluid Fluid
	err   error
}

// register adds a built-in fluid. It is called from init functions.
func register(e Evaluator) {
	regMu.Lock()
	defer regMu.Unlock()
	en := &entry{eval: e}
	info := e.Info()
	for _, n := range append([]string{info.Name}, info.Aliases...) {
		registry[key(n)] = en
	}
	ordered = append(ordered, en)
	sort.Slice(ordered, func(i, j int) bool { return ordered[i].eval.Info().Name < ordered[j].eval.Info().Name })
}

// key normalises a fluid name: case-insensitive, ignoring '-', '_' and spaces,
// so "R-134a", "r134a" and "R 134a" are one fluid.
func key(name string) string {
	var b strings.Builder
	for _, r := range strings.ToLower(name) {
		switch r {
		case '-', '_', ' ':
			continue
		}
		b.WriteRune(r)
	}
	return b.String()
}

// Lookup returns the built-in fluid of that name (or alias), building its
// cached table on first use.
func Lookup(name string) (Fluid, error) {
	regMu.Lock()
	en, ok := registry[key(name)]
	regMu.Unlock()
	if !ok {
		return nil, &UnknownError{Name: name, Known: Names()}
	}
	en.once.Do(func() { en.fluid, en.err = newTabulated(en.eval) })
	return en.fluid, en.err
}

// Direct returns the uncached evaluator of a built-in fluid (for tests and
// for checking the cache).
func Direct(name string) (Evaluator, bool) {
	regMu.Lock()
	defer regMu.Unlock()
	en, ok := registry[key(name)]
	if !ok {
		return nil, false
	}
	return en.eval, true
}

// List returns the built-in fluids' descriptions in name order.
func List() []Info {
	regMu.Lock()
	defer regMu.Unlock()
	out := make([]Info, len(ordered))
	for i, en := range ordered {
		out[i] = en.eval.Info()
	}
	return out
}

// Names returns the canonical names of the built-in fluids.
func Names() []string {
	infos := List()
	out := make([]string, len(infos))
	for i, in := range infos {
		out[i] = in.Name
	}
	return out
}

// Known reports whether name is a built-in fluid's name or alias, without
// building its table.
func Known(name string) bool {
	regMu.Lock()
	defer regMu.Unlock()
	_, ok := registry[key(name)]
	return ok
}

// Spellings returns every built-in fluid's name and aliases, for
// suggestions.
func Spellings() []string {
	var out []string
	for _, in := range List() {
		out = append(out, in.Name)
		out = append(out, in.Aliases...)
	}
	return out
}

// UnknownError reports a fluid name that is not built in.
type UnknownError struct {
	Name  string
	Known []string
}

func (e *UnknownError) Error() string {
	return fmt.Sprintf("unknown fluid %q (built-in fluids: %s)", e.Name, strings.Join(e.Known, ", "))
}
