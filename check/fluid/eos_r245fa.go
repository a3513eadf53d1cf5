package fluid

// R245fa: 1,1,1,3,3-pentafluoropropane.
//
// Equation of state: R. Akasaka, Y. Zhou, E.W. Lemmon, 'A Fundamental Equation of State for 1,1,1,3,3-Pentafluoropropane (R-245fa)', J. Phys. Chem. Ref. Data 44 (2015) 013104, doi:10.1063/1.4913493
// Coefficients as published in the public fluid file of C. Bell et al., Ind.
// Eng. Chem. Res. 53 (2014) 2498, which cites that paper; checked against
// saturation values computed from it (see eos_test.go).

func init() { register(r245fa) }

var r245fa = (&helmholtz{
	info: Info{
		Name:      "R245fa",
		Aliases:   []string{"R-245fa", "HFC-245fa", "HFC245fa", "1,1,1,3,3-pentafluoropropane"},
		MolarMass: 134.0479 / 1000,
		Tc:        427.01, Pc: 3651000, RhoC: 519.44,
		Tmin:   233.15, // −40 °C; triple point 171.05 K
		Tmax:   427.01 - 3,
		Safety: "B1", // ASHRAE 34 safety group, as the CoolProp library lists it (dev/fluids/R245fa.json, INFO.ENVIRONMENTAL.ASHRAE34)
		Source: "EOS: Akasaka, Zhou and Lemmon, J. Phys. Chem. Ref. Data 44 (2015) 013104; viscosity: extended corresponding states of Huber et al., Ind. Eng. Chem. Res. 42 (2003) 3163; thermal conductivity: extended corresponding states with R134a as reference; surface tension: Mulero et al., J. Phys. Chem. Ref. Data 41 (2012) 043105",
	},
	R: 8.3144621, M: 134.0479 / 1000,
	Tr: 427.01, rhoR: 3875 * 134.0479 / 1000,
	res: r245faResidual, id: r245faIdeal,
	// Chung et al. (1988) constants (ω is set from the equation of state);
	// dipole moment: Goodwin and Mehl, Int. J. Thermophys. 18 (1997) 795 (from memory).
	chung: chung{M: 134.0479, Tc: 427.01, Vc: 134.0479 / 519.44 * 1000, mu: 1.549, kappa: 0},
	trans: pair{
		// Viscosity: extended corresponding states of M.L. Huber, A. Laesecke,
		// R.A. Perkins, Ind. Eng. Chem. Res. 42 (2003) 3163 with R134a as
		// reference fluid and the fluid's published parameters (σ, ε/k, ψ).
		// Against the verification values of Perkins, Huber and Assael,
		// J. Chem. Eng. Data 61 (2016) 3286, Table 8: +0.5 % and +2.5 %
		// (dilute gas, 250 and 430 K), +6.4 % (liquid, 250 K, 1500 kg/m³).
		visc: &ecsViscosity{ref: r134aViscosity, refEOS: r134a,
			psi: []float64{1.1529, -0.044154}, psiRho: 3857,
			dilute: chapmanEnskog{M: 134.0479, sigma: 0.5529, epsK: 329.72}},
		// Thermal conductivity: the same corresponding-states method with
		// the R134a correlation as reference and a generic critical term.
		// Unverified for this fluid (no published check values are held
		// here); the method is checked against the reference correlations
		// of R1234yf, R1234ze(E) and R1233zd(E) in transport_test.go.
		cond: &ecsConductivity{ref: r134aConductivity, refEOS: r134a,
			crit: olchowy{R0: 1.03, gamma: 1.239, nu: 0.63, Gamma: 0.0496, xi0: 1.94e-10, qD: 2e9,
				Tref: 1.5 * 427.01, pc: 3651000, rhoc: 519.44}},
	},
	refT: 273.15, refH: 200e3,
	liq: ancillary{form: ancLinear, overT: false, Tr: 427.01, red: 3875.0 * 134.0479 / 1000,
		n: []float64{-0.645916749226158, 1.2435143264412414, 2.1374254146018647, -1.4105539340976712, 2.697825229930464, -1.236775453941409},
		t: []float64{0.144, 0.165, 0.53, 1.993, 2.646, 3.593}},
	vap: ancillary{form: ancExp, overT: true, Tr: 427.01, red: 3875.0 * 134.0479 / 1000,
		n: []float64{-0.12316786769188867, -3.5467162730203325, -2.100626576983384, -3.02259697521286, -10.604906302496444, 12.900898794193413},
		t: []float64{0.075, 0.466, 1.018, 2.817, 6.14, 8.5}},
	sigma: mulero{Tc: 427.16, a: []float64{0.073586, 0.0103, -0.02663}, n: []float64{1.0983, 0.60033, 0.72765}},
}).prepare()

// Residual part αʳ of the equation of state cited at the top of this file.
var r245faResidual = residual{
	power: []powerTerm{ // n, d, t, l
		{0.057506623, 4, 1, 0},
		{1.5615975, 1, 0.27, 0},
		{-2.3614485, 1, 0.9, 0},
		{-0.51773521, 2, 1.09, 0},
		{0.18509788, 3, 0.4, 0},
		{-0.87405626, 1, 2.9, 2},
		{-0.27530955, 3, 1.7, 2},
		{0.57971151, 2, 0.8, 1},
		{-0.39934306, 2, 3.6, 2},
		{-0.033230277, 7, 1.05, 1},
	},
	gaussian: []gaussianTerm{ // n, d, t, eta, epsilon, beta, gamma
		{0.83210508, 1, 1.8, 1.011, 0.709, 1.879, 1.081},
		{-0.335443, 1, 4, 1.447, 0.939, 2.454, 0.651},
		{-0.10117801, 3, 4.5, 1.079, 0.703, 1.256, 0.468},
		{-0.0091495867, 3, 2, 7.86, 0.777, 21.1, 1.293},
	},
}

var r245faIdeal = ideal{
	a1: -13.4283638514, a2: 9.87236538,
	logTau: 3,
	planck: []planckTerm{ // n, θ
		{5.5728, 0.5197115834815994},
		{10.385, 2.364453600524394},
		{12.554, 5.735555763648281},
	},
}
