package fluid

// R134a: 1,1,1,2-tetrafluoroethane.
//
// Equation of state: R. Tillner-Roth and H.D. Baehr, 'An International Standard Formulation for the Thermodynamic Properties of 1,1,1,2-Tetrafluoroethane (HFC-134a) for Temperatures from 170 K to 455 K and Pressures up to 70 MPa', J. Phys. Chem. Ref. Data 23 (1994) 657-729, doi:10.1063/1.555958
// Coefficients as published in the public fluid file of C. Bell et al., Ind.
// Eng. Chem. Res. 53 (2014) 2498, which cites that paper; checked against
// saturation values computed from it (see eos_test.go).

func init() { register(r134a) }

var r134a = (&helmholtz{
	info: Info{
		Name:      "R134a",
		Aliases:   []string{"R-134a", "HFC-134a", "HFC134a", "1,1,1,2-tetrafluoroethane"},
		MolarMass: 102.032 / 1000,
		Tc:        374.21, Pc: 4059280, RhoC: 511.9,
		Tmin:   233.15, // −40 °C; triple point 169.85 K
		Tmax:   374.21 - 3,
		Safety: "A1", // ASHRAE 34 safety group, as the CoolProp library lists it (dev/fluids/R134a.json, INFO.ENVIRONMENTAL.ASHRAE34)
		Source: "EOS: Tillner-Roth and Baehr, J. Phys. Chem. Ref. Data 23 (1994) 657; viscosity: Huber et al., Ind. Eng. Chem. Res. 42 (2003) 3163; thermal conductivity: Perkins et al., NIST IR 6605 (2000); surface tension: Mulero et al., J. Phys. Chem. Ref. Data 41 (2012) 043105",
	},
	R: 8.314471, M: 102.032 / 1000,
	Tr: 374.18, rhoR: 4978.830171000001 * 102.032 / 1000,
	res: r134aResidual, id: r134aIdeal,
	// Chung et al. (1988) constants (ω is set from the equation of state);
	// dipole moment: Meyer and Morrison, J. Phys. Chem. 95 (1991) 3860 (from memory).
	chung: chung{M: 102.032, Tc: 374.21, Vc: 102.032 / 511.9 * 1000, mu: 2.058, kappa: 0},
	trans: pair{r134aViscosity, r134aConductivity},
	refT:  273.15, refH: 200e3,
	liq: ancillary{form: ancLinear, overT: false, Tr: 374.21, red: 5017.053 * 102.032 / 1000,
		n: []float64{18.772731940930015, -51.49939472178225, 40.793536440596085, -1481.6500471538966, 1600.534434298925, -67338.52423732559},
		t: []float64{0.673, 0.994, 1.257, 5.783, 5.943, 19.94}},
	vap: ancillary{form: ancExp, overT: true, Tr: 374.21, red: 5017.053 * 102.032 / 1000,
		n: []float64{-5.147386240766544, 5.34618043286371, -7.611015272838434, -28.85436432788653, -9.079306067130748, 64.0},
		t: []float64{0.476, 0.966, 1.321, 8.491, 13.463, 13.463}},
	sigma: mulero{Tc: 374.21, a: []float64{0.05801}, n: []float64{1.241}},
}).prepare()

// Residual part αʳ of the equation of state cited at the top of this file.
var r134aResidual = residual{
	power: []powerTerm{ // n, d, t, l
		{0.05586817, 2, -0.5, 0},
		{0.498223, 1, 0, 0},
		{0.02458698, 3, 0, 0},
		{0.0008570145, 6, 0, 0},
		{0.0004788584, 6, 1.5, 0},
		{-1.800808, 1, 1.5, 0},
		{0.2671641, 1, 2, 0},
		{-0.04781652, 2, 2, 0},
		{0.01423987, 5, 1, 1},
		{0.3324062, 2, 3, 1},
		{-0.007485907, 2, 5, 1},
		{0.0001017263, 4, 1, 2},
		{-0.5184567, 1, 5, 2},
		{-0.08692288, 4, 5, 2},
		{0.2057144, 1, 6, 2},
		{-0.005000457, 2, 10, 2},
		{0.0004603262, 4, 10, 2},
		{-0.003497836, 1, 10, 3},
		{0.006995038, 5, 18, 3},
		{-0.01452184, 3, 22, 3},
		{-0.0001285458, 10, 50, 4},
	},
}

var r134aIdeal = ideal{
	a1: -1.019535, a2: 9.047135,
	logTau: -1.629789,
	power:  []idealPowerTerm{{-9.723916, -0.5}, {-3.92717, -0.75}},
}

// r134aViscosity: M.L. Huber, A. Laesecke, R.A. Perkins, "Model for the
// viscosity and thermal conductivity of refrigerants, including a new
// correlation for the viscosity of R134a", Ind. Eng. Chem. Res. 42 (2003)
// 3163–3178. It is also the reference fluid of the corresponding-states
// viscosity of the other halocarbons.
var r134aViscosity = &refViscosity{
	M: 102.031, sigma: 0.468932, epsK: 299.363,
	omegaA: []float64{0.355404, -0.464337, 0.0257353},
	rfB:    []float64{-19.572881, 219.73999, -1015.3226, 2471.01251, -3375.1717, 2491.6597, -787.26086, 14.085455, -0.34664158},
	rfT:    []float64{0, -0.25, -0.5, -0.75, -1.0, -1.25, -1.5, -2.5, -5.5},
	Tr:     374.21, rhoR: 5017.053,
	hoA: []float64{-2.06900719e-05, 3.56029549e-07, 2.11101816e-06, 1.39601415e-05, -4.5643502e-06, -3.51593275e-06},
	hoD: []float64{1, 2, 2, 2, 2, 3},
	hoT: []float64{0, 6, 2, 0.5, -2, 0},
	hoF: 0.00021476332, hoG: []float64{3.163695636}, hoH: []float64{0},
	hoP: []float64{1, -0.0890173375, 0.100035295}, hoQ: []float64{0, -1, -2},
}

// r134aConductivity: R.A. Perkins, A. Laesecke, J. Howley, M.L.V. Ramires,
// A.N. Gurova, L. Cusco, "Experimental thermal conductivity values for the
// IUPAC round-robin sample of 1,1,1,2-tetrafluoroethane (R134a)", NIST IR
// 6605 (2000), with the critical enhancement of Olchowy and Sengers.
var r134aConductivity = &refConductivity{
	Tr: 1, rhoR: 515.249968352,
	a:  []float64{-0.0105248, 8.00982e-05},
	b1: []float64{0.00377406093, 0.010534223865, -0.002952794565, 0.00128672592},
	crit: olchowy{R0: 1.03, gamma: 1.239, nu: 0.63, Gamma: 0.0496, xi0: 1.94e-10, qD: 1.89202e9,
		Tref: 561.3, pc: 4059280, rhoc: 511.9},
}
