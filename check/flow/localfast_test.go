package flow

import (
	"math"
	"strings"
	"testing"

	"circa/check/fluid"
	"circa/lang"
)

// localModels are the shipped examples and the vacuum water loop at three
// loads (its riser flashes, the hardest tube for the local march).
func localModels(t *testing.T) (names []string, ms []*lang.Model) {
	for _, f := range []string{"ferry-cabinet", "forestry-inverter", "rack-door", "shelter-rectifier", "tram-inverter"} {
		names = append(names, f)
		ms = append(ms, lang.Load("../../testdata/examples/"+f+".loop", lang.OSFS{}))
	}
	for _, q := range []string{"50 W", "300 W", "1500 W"} {
		names = append(names, "vacuum "+q)
		ms = append(ms, load(t, strings.ReplaceAll(vacuumLoop, "HEAT", q)))
	}
	return names, ms
}

// TestLocalFastMarch: the local march through the saturation grid, with
// adiabatic tubes in steps sized by the change of density and pressure
// and liquid tubes in one step, gives the flows of the fine march (every
// cell looked up in the fluid's table, every tube's steps held to an
// embedded error estimate of 1e-8 of the hydrostatic gradient) within
// 1e-4 relative, on the shipped examples and the vacuum loop.
func TestLocalFastMarch(t *testing.T) {
	names, ms := localModels(t)
	defer func() { localExact = false }()
	for i, m := range ms {
		opts := Options{NoTilt: true, Saturation: "local"}
		localExact = false
		fast := estimate(t, m, opts)
		localExact = true
		fine := estimate(t, m, opts)
		localExact = false
		for li := range fast.Loops {
			for ci, a := range fast.Loops[li].Cases {
				b := fine.Loops[li].Cases[ci]
				if a.Circulates != b.Circulates {
					t.Errorf("%s %s: circulates %v, fine march %v", names[i], a.Case, a.Circulates, b.Circulates)
					continue
				}
				if !agree(a.MassFlow, b.MassFlow, 1e-4) {
					t.Errorf("%s %s: %.9g kg/s, fine march %.9g kg/s", names[i], a.Case, a.MassFlow, b.MassFlow)
				}
			}
		}
	}
}

// TestLocalCellsConverged: halving the cells of the heated components
// changes the local estimate's flow by less than 0.1 % (the physics
// brief's rule for the march).
func TestLocalCellsConverged(t *testing.T) {
	names, ms := localModels(t)
	for i, m := range ms {
		a := estimate(t, m, Options{NoTilt: true, Saturation: "local"})
		b := estimate(t, m, Options{NoTilt: true, Saturation: "local", Cells: 80})
		for li := range a.Loops {
			for ci, ca := range a.Loops[li].Cases {
				cb := b.Loops[li].Cases[ci]
				if ca.Circulates && !agree(ca.MassFlow, cb.MassFlow, 1e-3) {
					t.Errorf("%s %s: %.6g kg/s at 40 cells, %.6g kg/s at 80", names[i], ca.Case, ca.MassFlow, cb.MassFlow)
				}
			}
		}
	}
}

// TestLocalGridProperties: the saturation grid's interpolated states agree
// with the fluid's table at and between the nodes, for water under vacuum
// and R1233zd(E) near one bar, to the accuracy localgrid.go states: 2e-5
// relative in the vapour density, 1e-5 in the other properties, 1e-7 of
// the latent heat in the liquid enthalpy (so in the local quality).
func TestLocalGridProperties(t *testing.T) {
	for _, c := range []struct {
		fluid string
		T     float64
	}{{"water", 313.15}, {"R1233zd(E)", 300}} {
		fl, err := fluid.Lookup(c.fluid)
		if err != nil {
			t.Fatal(err)
		}
		sat, _ := fl.AtT(c.T)
		info := fl.Info()
		lo, _ := fl.AtT(info.Tmin)
		hi, _ := fl.AtT(info.Tmax)
		s := &state{fl: fl, info: info, sat: sat, pLo: lo.P, pHi: hi.P, grid: gridFor(fl, lo.P, hi.P)}
		s.p.MolarMass = info.MolarMass
		for f := 0.3; f < 3; f *= 1.0037 {
			p := sat.P * f
			got := s.propsAt(p)
			want, pw := s.satAt(p)
			rel := func(name string, a, b, tol float64) {
				if math.Abs(a-b) > tol*math.Abs(b) {
					t.Errorf("%s at %.6g Pa: %s %.9g, table %.9g", c.fluid, p, name, a, b)
				}
			}
			rel("vapour density", got.pl.RhoV, pw.RhoV, 2e-5)
			rel("liquid density", got.pl.RhoL, pw.RhoL, 1e-5)
			rel("liquid viscosity", got.pl.MuL, pw.MuL, 1e-5)
			rel("vapour viscosity", got.pl.MuV, pw.MuV, 1e-5)
			rel("surface tension", got.pl.Sigma, pw.Sigma, 1e-5)
			rel("latent heat", got.hlv, want.Hlv, 1e-5)
			if math.Abs(got.hl-want.HL) > 1e-7*want.Hlv {
				t.Errorf("%s at %.6g Pa: liquid enthalpy %.9g, table %.9g", c.fluid, p, got.hl, want.HL)
			}
		}
	}
}

// agree reports whether a and b agree to rel of the larger, or both are
// below 1e-9 (an absolute floor for values that vanish).
func agree(a, b, rel float64) bool {
	return math.Abs(a-b) <= rel*math.Max(math.Abs(a), math.Abs(b))+1e-9
}
