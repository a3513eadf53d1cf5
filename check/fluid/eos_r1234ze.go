package fluid

// R1234ze(E): trans-1,3,3,3-tetrafluoropropene.
//
// Equation of state: M. Thol and E.W. Lemmon, 'Equation of State for the Thermodynamic Properties of trans-1,3,3,3-Tetrafluoropropene [R-1234ze(E)]', Int. J. Thermophys. 37 (2016) 28, doi:10.1007/s10765-016-2040-6
// Coefficients as published in the public fluid file of C. Bell et al., Ind.
// Eng. Chem. Res. 53 (2014) 2498, which cites that paper; checked against
// saturation values computed from it (see eos_test.go).

func init() { register(r1234ze) }

var r1234ze = (&helmholtz{
	info: Info{
		Name:      "R1234ze(E)",
		Aliases:   []string{"R-1234ze(E)", "R1234zeE", "R1234ze", "HFO-1234ze(E)", "HFO1234zeE", "trans-1,3,3,3-tetrafluoropropene"},
		MolarMass: 114.0416 / 1000,
		Tc:        382.52, Pc: 3635376, RhoC: 489.24,
		Tmin:   233.15, // −40 °C; triple point 168.62 K
		Tmax:   382.52 - 3,
		Safety: "A2L", // ASHRAE 34 safety group (from memory)
		Source: "EOS: Thol and Lemmon, Int. J. Thermophys. 37 (2016) 28; viscosity: extended corresponding states (Huber et al., Ind. Eng. Chem. Res. 42 (2003) 3163) with R134a as reference; thermal conductivity: Perkins and Huber, J. Chem. Eng. Data 56 (2011) 4868; surface tension: Mulero and Cachadiña, J. Phys. Chem. Ref. Data 43 (2014) 023104",
	},
	R: 8.314472, M: 114.0416 / 1000,
	Tr: 382.513, rhoR: 4290 * 114.0416 / 1000,
	res: r1234zeResidual, id: r1234zeIdeal,
	// Chung et al. (1988) constants (ω is set from the equation of state);
	// dipole moment: Tanaka and Higashi, Int. J. Refrig. 33 (2010) 474 (from memory).
	chung: chung{M: 114.0416, Tc: 382.52, Vc: 114.0416 / 489.24 * 1000, mu: 1.27, kappa: 0},
	trans: pair{
		// Viscosity: extended corresponding states with R134a as reference
		// fluid (Huber et al. 2003), no fitted shape factor, Chung dilute gas.
		// Against the verification values of the fluid's own correlation
		// (Huber and Assael, Int. J. Refrig. 71 (2016) 39, 300 K) it is
		// −3.0 % (dilute gas), −5.5 % (0.044 mol/L) and +4.2 % (liquid,
		// 10.522 mol/L); along the saturation line it is not checked (the
		// same method is 6–13 % high for R1234yf, see transport_test.go).
		visc: &ecsViscosity{ref: r134aViscosity, refEOS: r134a, dilute: chungDilute{}},
		// Thermal conductivity: R.A. Perkins, M.L. Huber, J. Chem. Eng. Data 56
		// (2011) 4868–4874 (see R1234yf).
		cond: &refConductivity{Tr: 382.52, rhoR: 489.24,
			a:  []float64{-0.0103589, 0.0308929, 0.000230348},
			b1: []float64{-0.0428296, 0.0927099, -0.0702107, 0.0249708, -0.00301838},
			b2: []float64{0.0434288, -0.0605844, 0.0440187, -0.0155082, 0.0021019},
			crit: olchowy{R0: 1.03, gamma: 1.239, nu: 0.63, Gamma: 0.0496, xi0: 1.94e-10, qD: 1.7137960582e9,
				Tref: 1.5 * 382.52, pc: 3635376, rhoc: 489.24}},
	},
	refT: 273.15, refH: 200e3,
	liq: ancillary{form: ancLinear, overT: false, Tr: 382.52, red: 4290.0 * 114.0416 / 1000,
		n: []float64{-8.42282936179494, 35.592169315198404, -27.748444759203856, 3.0869391194586315, 0.49297732386262993, 2436.2254360953007},
		t: []float64{0.07, 0.096, 0.10800000000000001, 0.383, 2.6666666666666665, 25.0}},
	vap: ancillary{form: ancExp, overT: true, Tr: 382.52, red: 4290.0 * 114.0416 / 1000,
		n: []float64{1.9861295422409955, -3.601910664347684, 110.97544193749978, -113.63727224413014, -1.7016720393939881, -5.765500312051858},
		t: []float64{0.10500000000000001, 0.139, 0.38749999999999996, 0.39449999999999996, 1.3333333333333333, 4.166666666666667}},
	sigma: mulero{Tc: 382.51, a: []float64{0.06158, 0.8247}, n: []float64{1.281, 6.505}},
}).prepare()

// Residual part αʳ of the equation of state cited at the top of this file.
var r1234zeResidual = residual{
	power: []powerTerm{ // n, d, t, l
		{0.03982797, 4, 1, 0},
		{1.812227, 1, 0.223, 0},
		{-2.537512, 1, 0.755, 0},
		{-0.5333254, 2, 1.24, 0},
		{0.1677031, 3, 0.44, 0},
		{-1.323801, 1, 2, 2},
		{-0.6694654, 3, 2.2, 2},
		{0.8072718, 2, 1.2, 1},
		{-0.7740229, 2, 1.5, 2},
		{-0.01843846, 7, 0.9, 1},
	},
	gaussian: []gaussianTerm{ // n, d, t, eta, epsilon, beta, gamma
		{1.407916, 1, 1.33, 1, 0.728, 1.21, 0.943},
		{-0.4237082, 1, 1.75, 1.61, 0.87, 1.37, 0.642},
		{-0.2270068, 3, 2.11, 1.24, 0.855, 0.98, 0.59},
		{-0.805213, 3, 1, 9.34, 0.79, 171, 1.2},
		{0.00994318, 2, 1.5, 5.78, 1.3, 47.4, 1.33},
		{-0.008798793, 1, 1, 3.08, 0.71, 15.4, 0.64},
	},
}

var r1234zeIdeal = ideal{
	a1: 0, a2: 0,
	// reference-state offset a1=-12.5586602313194 a2=8.79132625741231 (IIR) dropped: the evaluator sets its own reference state
	logTau: 3,
	planck: []planckTerm{ // n, θ
		{9.3575, 1.34113088966911},
		{10.717, 5.15538034001459},
	},
}
