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

// transportCheck is one published verification value of a fluid-specific
// correlation at (T, ρ), compared with this package's model of that fluid.
type transportCheck struct {
	h      *helmholtz
	T, rho float64 // K, kg/m³ (0: dilute-gas limit)
	prop   string  // "mu" (µPa·s) or "k" (W/(m·K))
	want   float64
	tol    float64 // relative
}

// transportChecks are the papers' own sample values for computer
// verification. Where this package uses that correlation the tolerance is
// the printed precision (plus a small critical-term difference); where it
// uses corresponding states instead, the tolerance sits just above the
// measured deviation, stated beside it.
var transportChecks = []transportCheck{
	// R1234yf viscosity: M.L. Huber, M.J. Assael, Int. J. Refrig. 71 (2016)
	// 39, section 2.4 (300 K; 0, 0.044 and 10.522 mol/L). Measured < 0.01 %
	// (the extended corresponding-states model used before was +8.6 %,
	// +8.6 %, +12.0 %).
	{r1234yf, 300, 0, "mu", 11.579, 1e-4},                 // Huber and Assael 2016, sec. 2.4
	{r1234yf, 300, 0.044 * 114.0416, "mu", 11.549, 1e-4},  // Huber and Assael 2016, sec. 2.4
	{r1234yf, 300, 10.522 * 114.0416, "mu", 217.97, 1e-4}, // Huber and Assael 2016, sec. 2.4
	// R1234ze(E) viscosity: same paper and states; the model here is
	// extended corresponding states without shape factors (the paper's
	// coefficients were not available): measured −3.0 %, −5.5 %, +4.2 %.
	{r1234ze, 300, 0, "mu", 11.777, 0.06},                 // Huber and Assael 2016, sec. 2.4
	{r1234ze, 300, 0.044 * 114.0416, "mu", 12.041, 0.06},  // Huber and Assael 2016, sec. 2.4
	{r1234ze, 300, 10.522 * 114.0416, "mu", 217.89, 0.06}, // Huber and Assael 2016, sec. 2.4
	// R245fa viscosity: R.A. Perkins, M.L. Huber, M.J. Assael, J. Chem. Eng.
	// Data 61 (2016) 3286, Table 8; the model here is the corresponding-
	// states model of Huber et al. (2003) with its published shape factor:
	// measured +0.5 %, +6.4 %, +2.5 %. The table's fourth point (430 K,
	// 530 kg/m³, 30.632 µPa·s), above Tc and near the critical density, is
	// missed by +27 % and is outside the saturation range claimed.
	{r245fa, 250, 0, "mu", 8.6291, 0.07},      // Perkins et al. 2016, Table 8
	{r245fa, 250, 1500, "mu", 1085.562, 0.07}, // Perkins et al. 2016, Table 8
	{r245fa, 430, 0, "mu", 14.630, 0.07},      // Perkins et al. 2016, Table 8
	// R1234yf and R1234ze(E) conductivity: R.A. Perkins, M.L. Huber, J.
	// Chem. Eng. Data 56 (2011) 4868, Table 2 (densities as printed there).
	// Measured within 0.25 % (the liquid points carry the critical term,
	// which depends on the viscosity model).
	{r1234yf, 250, 2.80006, "k", 0.0098482, 3e-3}, // Perkins and Huber 2011, Table 2
	{r1234yf, 300, 4.671553, "k", 0.013996, 3e-3}, // Perkins and Huber 2011, Table 2
	{r1234yf, 250, 1299.50, "k", 0.088580, 3e-3},  // Perkins and Huber 2011, Table 2
	{r1234yf, 300, 1182.05, "k", 0.075254, 3e-3},  // Perkins and Huber 2011, Table 2
	{r1234ze, 250, 2.80451, "k", 0.0098506, 3e-3}, // Perkins and Huber 2011, Table 2
	{r1234ze, 300, 4.67948, "k", 0.013934, 3e-3},  // Perkins and Huber 2011, Table 2
	{r1234ze, 250, 1349.37, "k", 0.10068, 3e-3},   // Perkins and Huber 2011, Table 2
	{r1234ze, 300, 1233.82, "k", 0.085574, 3e-3},  // Perkins and Huber 2011, Table 2
	// R1233zd(E) conductivity: R.A. Perkins, M.L. Huber, J. Chem. Eng. Data
	// 62 (2017) 2659, Table 2. Measured within 0.02 %, except +0.4 % at
	// 445 K (critical term; the paper's viscosity model differs). The
	// corresponding-states model used before was −3.2 %, −3.8 %, −4.7 %,
	// −8.8 %, −4.3 %.
	{r1233zd, 300, 0, "k", 0.010659, 2e-3},      // Perkins and Huber 2017, Table 2
	{r1233zd, 300, 5.4411, "k", 0.010766, 2e-3}, // Perkins and Huber 2017, Table 2
	{r1233zd, 300, 1308.8, "k", 0.091409, 2e-3}, // Perkins and Huber 2017, Table 2
	{r1233zd, 445, 0, "k", 0.021758, 2e-3},      // Perkins and Huber 2017, Table 2
	{r1233zd, 445, 168.52, "k", 0.026044, 5e-3}, // Perkins and Huber 2017, Table 2
}

// TestTransportCheckValues compares the models with the published
// verification values above.
func TestTransportCheckValues(t *testing.T) {
	for _, c := range transportChecks {
		rho := c.rho
		if rho == 0 {
			rho = 1e-9 // the dilute-gas limit
		}
		p := c.h.phaseAt(c.T, rho)
		st := state{T: c.T, rho: rho, cp: p.cp, cv: p.cv, cv0: c.h.cv0(c.T), liquid: rho > c.h.info.RhoC, h: c.h}
		mu, k := c.h.trans.transport(st)
		got := k
		if c.prop == "mu" {
			got = mu * 1e6
		}
		if !within(got, c.want, 0, c.tol) {
			t.Errorf("%s %s at %v K, %v kg/m³: %.6g, published %.6g (%+.2f %%, limit %.2f %%)",
				c.h.info.Name, c.prop, c.T, c.rho, got, c.want, 100*(got/c.want-1), 100*c.tol)
		}
	}
}

// TestCorrespondingStatesViscosity measures the corresponding-states
// viscosity (R134a reference, no shape factor, Chung dilute gas) used for
// R1234ze(E) and R1233zd(E) against the correlation of Huber and Assael,
// Int. J. Refrig. 71 (2016) 39 for R1234yf on the saturation line, −20 °C
// to 0.85 Tc. Measured: liquid +6.2 % to +10.8 %, vapour +7.7 % to +13.2 %
// (largest at −20 °C), so the method alone does not meet 5 % for R1234yf.
func TestCorrespondingStatesViscosity(t *testing.T) {
	h := r1234yf
	e := &ecsViscosity{ref: r134aViscosity, refEOS: r134a, dilute: chungDilute{}}
	for i := 0; i <= 6; i++ {
		T := 253.15 + float64(i)/6*(0.85*h.info.Tc-253.15)
		dl, dv, err := h.saturate(T)
		if err != nil {
			t.Fatal(err)
		}
		for _, ph := range []struct {
			rho    float64
			liquid bool
			lo, hi float64 // measured range of got/want − 1, widened slightly
		}{{dl * h.rhoR, true, 0.05, 0.115}, {dv * h.rhoR, false, 0.07, 0.14}} {
			p := h.phaseAt(T, ph.rho)
			st := state{T: T, rho: ph.rho, cp: p.cp, cv: p.cv, cv0: h.cv0(T), liquid: ph.liquid, h: h}
			got, want := e.viscosity(st), r1234yfViscosity.viscosity(st)
			if d := got/want - 1; d < ph.lo || d > ph.hi {
				t.Errorf("R1234yf at %.2f K (liquid %v): corresponding states %.5g, Huber and Assael %.5g (%+.1f %%)",
					T, ph.liquid, got, want, 100*d)
			}
		}
	}
}

// TestCorrespondingStatesConductivity checks the corresponding-states
// conductivity used for R245fa where a reference correlation exists: against
// R.A. Perkins and M.L. Huber, J. Chem. Eng. Data 56 (2011) 4868 for R1234yf
// and R1234ze(E), and Perkins and Huber, J. Chem. Eng. Data 62 (2017) 2659
// for R1233zd(E), on the saturation line, 233 K to 0.9 Tc.
// Measured: liquid within 5.3 % (all three); vapour within 10.4 % for
// R1234yf and R1234ze(E) (R1234yf at 233 K), and for R1233zd(E) −8.5 % to
// +17.4 % (the dilute-gas terms part at 233 K, +8.5 % at 249 K).
func TestCorrespondingStatesConductivity(t *testing.T) {
	for _, h := range []*helmholtz{r1234yf, r1234ze, r1233zd} {
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
				tol := ph.tol
				if h == r1233zd && !ph.liquid {
					tol = 0.18
				}
				if got := e.conductivity(st, mu); !within(got, want, 0, tol) {
					t.Errorf("%s at %.2f K (liquid %v): corresponding states %.5g, Perkins and Huber %.5g (%+.1f %%)",
						h.info.Name, T, ph.liquid, got, want, 100*(got/want-1))
				}
			}
		}
	}
}
