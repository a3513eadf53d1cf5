package fluid

import (
	"math"
	"testing"
)

// vdiLimit is the agreement required with a VDI Heat Atlas saturation table
// (2nd ed., Springer 2010; vdiTables in eos_test.go) for one property, over
// the table rows from Tmin up to maxTr·Tc. Where the methods miss the 5 %
// target the limit says so and carries the measured deviation.
type vdiLimit struct {
	fluid, prop string
	maxTr       float64 // highest reduced temperature checked
	tol         float64 // relative tolerance
}

var vdiTransportLimits = []vdiLimit{
	// R134a: reference correlations; measured max |dev| µ' 3.4 %, µ'' 4.1 %,
	// λ' 1.8 %, λ'' 4.6 %, σ 1.6 % (to 0.98 Tc).
	{"R134a", "muL", 0.98, 0.05}, {"R134a", "muV", 0.98, 0.05},
	{"R134a", "kL", 0.98, 0.05}, {"R134a", "kV", 0.98, 0.05}, {"R134a", "sigma", 0.98, 0.05},
	// Ammonia: µ' 1.1 %, µ'' 0.1 % (Fenghour et al. 1995); λ' (VDI PPDS
	// polynomial) 6.0 % at 240 K; λ'' 4.0 %; σ 3.9 % to 0.9 Tc, 6.5 % at 370 K.
	{"Ammonia", "muL", 0.95, 0.05}, {"Ammonia", "muV", 0.95, 0.05},
	{"Ammonia", "kL", 0.95, 0.065}, {"Ammonia", "kV", 0.95, 0.05},
	{"Ammonia", "sigma", 0.9, 0.05}, {"Ammonia", "sigma", 0.95, 0.07},
	// Methanol: µ' (VDI PPDS) 3.2 %; µ'' (Chung) 9.4 % at 460 K; λ' 3.3 %,
	// λ'' 5.5 % (Sykioti et al. 2013); σ 0.6 %.
	{"Methanol", "muL", 0.95, 0.05}, {"Methanol", "muV", 0.95, 0.10},
	{"Methanol", "kL", 0.95, 0.05}, {"Methanol", "kV", 0.95, 0.06}, {"Methanol", "sigma", 0.95, 0.05},
	// Ethanol: µ' 2.9 %, µ'' 2.7 % (Kiselev et al. 2005); λ' 7.0 % at 320 K
	// and λ'' 4.3 % to 0.75 Tc, 7.1 % to 0.8 Tc, 31 % at 0.92 Tc (Assael et
	// al. 2013; the VDI table departs from that correlation); σ 4.9 %.
	{"Ethanol", "muL", 0.95, 0.05}, {"Ethanol", "muV", 0.95, 0.05},
	{"Ethanol", "kL", 0.95, 0.075}, {"Ethanol", "kV", 0.75, 0.05}, {"Ethanol", "kV", 0.8, 0.075},
	{"Ethanol", "sigma", 0.95, 0.05},
	// Acetone: µ' 2.7 % to 0.8 Tc (the VDI PPDS equation departs from the
	// table above: 18 % at 0.87 Tc, not claimed); µ'' 3.7 %; λ' 9.1 %; λ''
	// 9.7 % to 0.8 Tc; σ 4.5 % to 0.72 Tc (the table falls below the Mulero
	// correlation towards Tc, 34 % at 0.87 Tc).
	{"Acetone", "muL", 0.8, 0.05}, {"Acetone", "muV", 0.95, 0.05},
	{"Acetone", "kL", 0.95, 0.095}, {"Acetone", "kV", 0.8, 0.10}, {"Acetone", "sigma", 0.72, 0.05},
}

// TestVDITransport compares viscosity, thermal conductivity and surface
// tension with the VDI Heat Atlas saturation tables (source beside each
// table in eos_test.go) within the limits above.
func TestVDITransport(t *testing.T) {
	for _, lim := range vdiTransportLimits {
		e, ok := Direct(lim.fluid)
		if !ok {
			t.Fatalf("no fluid %s", lim.fluid)
		}
		in := e.Info()
		n := 0
		for _, r := range vdiTables[in.Name] {
			if r.T < in.Tmin || r.T > in.Tmax || r.T > lim.maxTr*in.Tc {
				continue
			}
			s, err := e.Direct(r.T)
			if err != nil {
				t.Fatal(err)
			}
			got, want := map[string]float64{"muL": s.MuL, "muV": s.MuV, "kL": s.KL, "kV": s.KV, "sigma": s.Sigma}[lim.prop],
				map[string]float64{"muL": r.muL, "muV": r.muV, "kL": r.kL, "kV": r.kV, "sigma": r.sigma}[lim.prop]
			if math.IsNaN(want) {
				continue
			}
			n++
			if !within(got, want, 0, lim.tol) {
				t.Errorf("%s %s at %.2f K: %.5g, VDI Heat Atlas %.5g (%+.1f %%, limit %.1f %%)",
					in.Name, lim.prop, r.T, got, want, 100*(got/want-1), 100*lim.tol)
			}
		}
		if n == 0 {
			t.Errorf("%s %s: no VDI rows checked", lim.fluid, lim.prop)
		}
	}
}

// TestMulero checks the surface-tension correlations against the values
// computed from the coefficients of A. Mulero, I. Cachadiña, M.I. Parra,
// J. Phys. Chem. Ref. Data 41 (2012) 043105 (R1234ze(E): Mulero and
// Cachadiña, J. Phys. Chem. Ref. Data 43 (2014) 023104), in mN/m at 0, 25
// and 50 °C.
func TestMulero(t *testing.T) {
	for name, want := range map[string][3]float64{
		"R134a":      {11.427, 8.031, 4.898},
		"R1234yf":    {9.463, 6.173, 3.323},
		"R1234ze(E)": {12.623, 8.925, 5.666},
		"R245fa":     {16.906, 13.633, 10.479},
		"Ammonia":    {26.295, 20.486, 14.883},
		"Methanol":   {24.268, 22.148, 20.052},
		"Ethanol":    {24.292, 21.884, 19.463},
		"Acetone":    {25.872, 22.707, 19.601},
	} {
		e, _ := Direct(name)
		for i, tc := range []float64{0, 25, 50} {
			s, err := e.Direct(273.15 + tc)
			if err != nil {
				t.Fatal(err)
			}
			if !within(s.Sigma*1e3, want[i], 6e-4, 0) {
				t.Errorf("%s at %v °C: σ = %.4f mN/m, correlation %.3f", name, tc, s.Sigma*1e3, want[i])
			}
		}
	}
}

// TestLiquidViscosityDIPPR is an independent check of the liquid viscosity
// against the DIPPR equation-101 fits of Perry's Chemical Engineers'
// Handbook, 8th ed. (2008), Table 2-313, inside their fitted ranges
// (methanol 175–338 K, ethanol 200–440 K, acetone 190–329 K); measured max
// deviation 2.8 % (methanol at 260 K).
func TestLiquidViscosityDIPPR(t *testing.T) {
	perry := map[string]dippr101{
		"Methanol": {-25.317, 1789.2, 2.069, 0, 0},  // Perry Table 2-313
		"Ethanol":  {7.875, 781.98, -3.0418, 0, 0},  // Perry Table 2-313
		"Acetone":  {-14.918, 1023.4, 0.5961, 0, 0}, // Perry Table 2-313
	}
	for name, d := range perry {
		e, _ := Direct(name)
		for _, T := range []float64{240, 260, 280, 300, 320} {
			s, err := e.Direct(T)
			if err != nil {
				t.Fatal(err)
			}
			if want := d.at(T); !within(s.MuL, want, 0, 0.05) {
				t.Errorf("%s at %v K: µ' = %.4g Pa·s, DIPPR %.4g (%+.1f %%)", name, T, s.MuL, want, 100*(s.MuL/want-1))
			}
		}
	}
}

// TestHalocarbonLiquids is a coarse check, within 10 %, of the saturated
// liquid at 25 °C for fluids without a VDI table here. The reference
// values are from memory (values of the fluids' reference transport
// correlations as commonly tabulated), so the tolerance is wide.
func TestHalocarbonLiquids(t *testing.T) {
	for _, c := range []struct {
		name     string
		mu, k    float64 // Pa·s, W/(m·K); 0: not checked
		muSource string
	}{
		{"R1234yf", 155e-6, 0.0630, "from memory"},
		{"R1234ze(E)", 200e-6, 0.0750, "from memory"},
		{"R245fa", 402e-6, 0.0810, "from memory"},
	} {
		e, _ := Direct(c.name)
		s, err := e.Direct(298.15)
		if err != nil {
			t.Fatal(err)
		}
		if !within(s.MuL, c.mu, 0, 0.10) {
			t.Errorf("%s at 25 °C: µ' = %.4g Pa·s, expected about %.4g (%s)", c.name, s.MuL, c.mu, c.muSource)
		}
		if c.k > 0 && !within(s.KL, c.k, 0, 0.10) {
			t.Errorf("%s at 25 °C: λ' = %.4g W/(m·K), expected about %.4g (%s)", c.name, s.KL, c.k, c.muSource)
		}
	}
}

// TestCorrespondingStatesConductivity checks the corresponding-states
// conductivity used for R245fa and R1233zd(E) where a reference correlation
// exists: against R.A. Perkins and M.L. Huber, J. Chem. Eng. Data 56 (2011)
// 4868 for R1234yf and R1234ze(E) on the saturation line, 233 K to 0.9 Tc.
// Measured: liquid within 5.3 %, vapour within 10.4 % (R1234yf at 233 K).
func TestCorrespondingStatesConductivity(t *testing.T) {
	for _, h := range []*helmholtz{r1234yf, r1234ze} {
		e := &ecsConductivity{ref: r134aConductivity, refEOS: r134a,
			crit: olchowy{R0: 1.03, gamma: 1.239, nu: 0.63, Gamma: 0.0496, xi0: 1.94e-10, qD: 2e9,
				Tref: 1.5 * h.info.Tc, pc: h.info.Pc, rhoc: h.info.RhoC}}
		for i := 0; i <= 10; i++ {
			T := h.info.Tmin + float64(i)/10*(0.9*h.info.Tc-h.info.Tmin)
			dl, dv, err := h.saturate(T)
			if err != nil {
				t.Fatal(err)
			}
			for _, ph := range []struct {
				rho    float64
				liquid bool
				tol    float64
			}{{dl * h.rhoR, true, 0.06}, {dv * h.rhoR, false, 0.11}} {
				p := h.phaseAt(T, ph.rho)
				st := state{T: T, rho: ph.rho, cp: p.cp, cv: p.cv, cv0: h.cv0(T), liquid: ph.liquid, h: h}
				mu, want := h.trans.transport(st)
				if got := e.conductivity(st, mu); !within(got, want, 0, ph.tol) {
					t.Errorf("%s at %.2f K (liquid %v): corresponding states %.5g, Perkins and Huber %.5g", h.info.Name, T, ph.liquid, got, want)
				}
			}
		}
	}
}
