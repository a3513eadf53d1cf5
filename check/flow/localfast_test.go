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
			var got localProps
			s.propsAt(p, &got)
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

// TestLocalGridFriction: the liquid-only and vapour-only gradients the
// local march takes from the grid's nodes (Darcy factors interpolated as
// the viscosities are, divided by the cell's densities) agree with those
// prepared at the table's state of the cell's pressure to 4e-5 relative,
// for water under vacuum and R1233zd(E) near one bar, from laminar through
// transitional to turbulent flow, in a smooth and a rough tube.
func TestLocalGridFriction(t *testing.T) {
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
		for _, rr := range []float64{0, 1e-3} {
			for _, G := range []float64{5, 100, 2000} {
				s := &state{fl: fl, info: info, sat: sat, pLo: lo.P, pHi: hi.P, grid: gridFor(fl, lo.P, hi.P), bmag: 9.80665}
				s.p.MolarMass = info.MolarMass
				cp := &comp{D: 0.01, rr: rr}
				for f := 0.3; f < 3; f *= 1.0037 {
					p := sat.P * f
					var lp localProps
					s.propsAt(p, &lp)
					gotL, gotV := s.singlePhaseLocal(cp, G, &lp)
					_, pl := s.satAt(p)
					pf := s.fric.Prepare(G, cp.D, cp.rr, pl, s.bmag)
					wantL, wantV := pf.SinglePhaseGradients()
					if !agree(gotL, wantL, 4e-5) || !agree(gotV, wantV, 4e-5) {
						t.Errorf("%s G=%g e/D=%g at %.6g Pa: %.9g, %.9g Pa/m, prepared at the table's state %.9g, %.9g", c.fluid, G, rr, p, gotL, gotV, wantL, wantV)
					}
				}
			}
		}
	}
}

// agree reports whether a and b agree to rel of the larger, or both are
// below 1e-9 (an absolute floor for values that vanish).
func agree(a, b, rel float64) bool {
	return math.Abs(a-b) <= rel*math.Max(math.Abs(a), math.Abs(b))+1e-9
}

// TestLocalExcessHeadSmooth: under local saturation the excess head is
// smooth in the flow, so the slope at a balance, which decides its static
// stability from a flow change of 1e-6, agrees with the secant over ±0.1 %
// (within 5 %). A vacuum water loop whose riser flashes is the hard case:
// adaptive steps, accepted or refused as the flow changes, once made that
// slope the size of the integration error and its sign arbitrary.
func TestLocalExcessHeadSmooth(t *testing.T) {
	srcs := map[string]string{"condenser-balance 150 W": shortVacuum}
	for _, q := range []string{"50 W", "300 W", "1500 W"} {
		srcs[q] = strings.ReplaceAll(vacuumLoop, "HEAT", q)
	}
	for q, src := range srcs {
		m := load(t, src)
		mu, err := chooseMethods(m.Methods, Options{Saturation: "local"})
		if err != nil {
			t.Fatal(err)
		}
		p := prepare(m, m.Loops[0], mu)
		var cr CaseResult
		var c *lang.Case
		if len(m.Cases) > 0 {
			c = m.Cases[0]
		}
		s, _ := p.newState(point{c: c}, &cr)
		if s == nil || !s.local {
			t.Fatalf("%s: no local state", q)
		}
		ev := s.newEval()
		roots, _ := s.ringRoots(ev)
		if len(roots) != 1 {
			t.Fatalf("%s: balances %+v, want one", q, roots)
		}
		r := roots[0]
		E := func(m float64) float64 {
			s.evaluate([]float64{m}, ev)
			return ev.e[0]
		}
		secant := (E(r.m*1.001) - E(r.m*0.999)) / (0.002 * r.m)
		if !(r.slope < 0) || math.Abs(r.slope-secant) > 0.05*math.Abs(secant) {
			t.Errorf("%s: slope %.6g Pa/(kg/s) at %.4g g/s, secant over ±0.1 %% %.6g", q, r.slope, r.m*1e3, secant)
		}
	}
}

// shortVacuum is a water loop whose saturation the condenser balance sets
// (28.8 °C, 4 kPa) under a 1 m liquid column.
const shortVacuum = `
loop l {
  fluid water
  node a at (0, 0, 0) m
  node b at (0, 0, 0.2) m
  node c at (0, 0, 1.2) m
  node d at (0, 0, 1.0) m
  evaporator e from a to b { length 0.2 m; rise 0.2 m; bore 10 mm; heat 150 W }
  pipe up from b to c { length 1 m; bore 10 mm }
  condenser k from c to d { length 0.3 m; bore 10 mm; conductance 40 W/K; sink 25 °C }
  pipe down from d to a { length 1.1 m; bore 10 mm }
}
`
