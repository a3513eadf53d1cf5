package fluid

// R1234yf: 2,3,3,3-tetrafluoropropene.
//
// Equation of state: E.W. Lemmon and R. Akasaka, 'Equation of State for the Thermodynamic Properties of 2,3,3,3-Tetrafluoroprop-1-ene (R1234yf)', Int. J. Thermophys. 43 (2022) 119. (Older EOS: M. Richter, M.O. McLinden, E.W. Lemmon, J. Chem. Eng. Data 56 (2011) 3254-3264.)
// Coefficients as published in the public fluid file of C. Bell et al., Ind.
// Eng. Chem. Res. 53 (2014) 2498, which cites that paper; checked against
// saturation values computed from it (see eos_test.go).

func init() { register(r1234yf) }

var r1234yf = (&helmholtz{
	info: Info{
		Name:      "R1234yf",
		Aliases:   []string{"R-1234yf", "HFO-1234yf", "HFO1234yf", "2,3,3,3-tetrafluoroprop-1-ene"},
		MolarMass: 114.0416 / 1000,
		Tc:        367.85, Pc: 3384400, RhoC: 476.69,
		Tmin:   233.15, // −40 °C; triple point 121.6 K
		Tmax:   367.85 - 3,
		Safety: "A2L", // ASHRAE 34 safety group, as the CoolProp library lists it (dev/fluids/R1234yf.json, INFO.ENVIRONMENTAL.ASHRAE34)
		Source: "EOS: Lemmon and Akasaka, Int. J. Thermophys. 43 (2022) 119; viscosity: Huber and Assael, Int. J. Refrig. 71 (2016) 39; thermal conductivity: Perkins and Huber, J. Chem. Eng. Data 56 (2011) 4868; surface tension: Mulero et al., J. Phys. Chem. Ref. Data 41 (2012) 043105",
	},
	R: 8.314462618, M: 114.0416 / 1000,
	Tr: 367.85, rhoR: 4180.0 * 114.0416 / 1000,
	res: r1234yfResidual, id: r1234yfIdeal,
	// Chung et al. (1988) constants (ω is set from the equation of state);
	// dipole moment: Tanaka and Higashi, Int. J. Refrig. 33 (2010) 474 (from memory).
	chung: chung{M: 114.0416, Tc: 367.85, Vc: 114.0416 / 476.69 * 1000, mu: 2.48, kappa: 0},
	trans: pair{
		visc: r1234yfViscosity,
		// Thermal conductivity: R.A. Perkins, M.L. Huber, "Measurement and
		// correlation of the thermal conductivity of 2,3,3,3-tetrafluoroprop-1-ene
		// (R1234yf) and trans-1,3,3,3-tetrafluoropropene (R1234ze(E))",
		// J. Chem. Eng. Data 56 (2011) 4868–4874.
		cond: &refConductivity{Tr: 367.85, rhoR: 475.55,
			a:  []float64{-0.0102778, 0.0291098, 0.000860643},
			b1: []float64{-0.0368219, 0.0883226, -0.0705909, 0.0259026, -0.0032295},
			b2: []float64{0.0397166, -0.077239, 0.0664707, -0.0249071, 0.00336228},
			crit: olchowy{R0: 1.03, gamma: 1.239, nu: 0.63, Gamma: 0.0496, xi0: 1.94e-10, qD: 1.7137960582e9,
				Tref: 1.5 * 367.85, pc: 3384400, rhoc: 476.69}},
	},
	refT: 273.15, refH: 200e3,
	liq: ancillary{form: ancLinear, overT: false, Tr: 367.85, red: 4180.0 * 114.0416 / 1000,
		n: []float64{3.392, -4.119, 8.932, -8.525, 3.384},
		t: []float64{0.4, 0.7, 1.1, 1.5, 2.1}},
	vap: ancillary{form: ancExp, overT: false, Tr: 367.85, red: 4180.0 * 114.0416 / 1000,
		n: []float64{-3.616, -74.91, 197.7, -152.76, -61.062, -115.53},
		t: []float64{0.426, 2.0, 2.4, 2.7, 7.5, 15.0}},
	sigma: mulero{Tc: 367.85, a: []float64{0.06274}, n: []float64{1.394}},
}).prepare()

// r1234yfViscosity: M.L. Huber, M.J. Assael, "Correlations for the viscosity
// of 2,3,3,3-tetrafluoroprop-1-ene (R1234yf) and trans-1,3,3,3-
// tetrafluoropropene (R1234ze(E))", Int. J. Refrig. 71 (2016) 39–45: dilute
// gas as a ratio of polynomials in T, the Rainwater–Friend initial-density
// term (ε/k = 275 K, σ = 0.531 nm) and a residual in δ = ρ/(4.17 mol/L),
// τ = 367.85 K/T. Coefficients as given in the public property library of
// J.J. Gómez Romera (pychemqt), which cites that paper; checked against the
// paper's verification values in transport_test.go.
var r1234yfViscosity = &refViscosity{
	M: 114.0416, sigma: 0.531, epsK: 275,
	diluteNum: []float64{-836950, 6336.28, -2.3547, 0.0395563},
	diluteDen: []float64{39509.1, 121.018, 1},
	rfB:       []float64{-19.572881, 219.73999, -1015.3226, 2471.01251, -3375.1717, 2491.6597, -787.26086, 14.085455, -0.34664158},
	rfT:       []float64{0, -0.25, -0.5, -0.75, -1.0, -1.25, -1.5, -2.5, -5.5},
	Tr:        367.85, rhoR: 4170,
	hoA:    []float64{-0.19425910e-6, -2.079577245e-6},
	hoD:    []float64{2.0 / 3, 5.0 / 3},
	hoT:    []float64{-0.5, -0.5},
	hoRatN: -43.47027288e-6, hoRatT: -0.5, hoRatD: 5.0 / 3,
	hoRatC: []float64{-3.53682791, 1}, hoRatCT: []float64{-1, -1}, hoRatCD: []float64{0, 1},
}

// Residual part αʳ of the equation of state cited at the top of this file.
var r1234yfResidual = residual{
	power: []powerTerm{ // n, d, t, l
		{0.0340387, 4, 1, 0},
		{1.912859, 1, 0.222, 0},
		{-2.1984719881617, 1, 0.61, 0},
		{-0.8147645305033, 2, 1.122, 0},
		{0.2288282, 3, 0.5, 0},
		{-1.65436, 1, 2.14, 2},
		{-1.446628, 3, 2.284, 2},
		{0.5961722, 2, 1.05, 1},
		{-0.6148209, 2, 2.33, 2},
		{-0.0180069, 7, 0.778, 1},
	},
	gaussian: []gaussianTerm{ // n, d, t, eta, epsilon, beta, gamma
		{0.2845275, 1, 1, 28.1, 0.96, 1016, 1.061},
		{-0.3050809, 1, 2, 28, 0.96, 1000, 1.062},
		{2.198935, 1, 1.236, 1.307, 0.853, 1.16, 1.3},
		{-0.4270329, 1, 1.6, 1.96, 1.15, 1.2, 1.04},
		{-0.4015581, 1, 1.85, 1.25, 1.3, 1.26, 1},
		{0.1179587, 1, 0.7, 1, 1.5, 1.6, 1.14},
		{-0.3141002, 1, 1.75, 2.2, 0.762, 0.87, 1.1},
	},
}

var r1234yfIdeal = ideal{
	a1: -12.081525543189, a2: 8.52896238365,
	logTau: 3,
	planck: []planckTerm{ // n, θ
		{8.65, 1.3918716868288703},
		{9.75, 4.268044039690091},
		{2.11, 12.233247247519369},
	},
}
