package fluid

// R1233zd(E): trans-1-chloro-3,3,3-trifluoropropene.
//
// Equation of state: R. Akasaka and E.W. Lemmon, 'An International Standard Formulation for trans-1-Chloro-3,3,3-trifluoroprop-1-ene [R1233zd(E)] Covering Temperatures from the Triple-point Temperature to 450 K and Pressures up to 100 MPa', J. Phys. Chem. Ref. Data 51 (2022) 023101. (Older EOS: E. Mondejar, M.O. McLinden, E.W. Lemmon, J. Chem. Eng. Data 60 (2015) 2477.)
// Coefficients as published in the public fluid file of C. Bell et al., Ind.
// Eng. Chem. Res. 53 (2014) 2498, which cites that paper; checked against
// saturation values computed from it (see eos_test.go).

func init() { register(r1233zd) }

var r1233zd = (&helmholtz{
	info: Info{
		Name:      "R1233zd(E)",
		Aliases:   []string{"R-1233zd(E)", "R1233zdE", "R1233zd", "HCFO-1233zd(E)", "HCFO1233zdE", "trans-1-chloro-3,3,3-trifluoropropene"},
		MolarMass: 130.4962 / 1000,
		Tc:        438.86, Pc: 3582800, RhoC: 483.36,
		Tmin:   233.15, // −40 °C; triple point 165.75 K
		Tmax:   438.86 - 3,
		Safety: "A1", // ASHRAE 34 safety group (from memory)
		Source: "EOS: Akasaka and Lemmon, J. Phys. Chem. Ref. Data 51 (2022) 023101; viscosity: extended corresponding states (Huber et al., Ind. Eng. Chem. Res. 42 (2003) 3163) with R134a as reference; thermal conductivity: Perkins and Huber, J. Chem. Eng. Data 62 (2017) 2659; surface tension: Kondou et al., Int. J. Refrig. 53 (2015) 80",
	},
	R: 8.314462618, M: 130.4962 / 1000,
	Tr: 438.86, rhoR: 3704.0 * 130.4962 / 1000,
	res: r1233zdResidual, id: r1233zdIdeal,
	// Chung et al. (1988) constants (ω is set from the equation of state);
	// dipole moment: value commonly quoted for this fluid (from memory).
	chung: chung{M: 130.4962, Tc: 438.86, Vc: 130.4962 / 483.36 * 1000, mu: 1.44, kappa: 0},
	// Surface tension: C. Kondou, R. Nagata, N. Nii, S. Koyama, Y. Higashi,
	// "Surface tension of low GWP refrigerants R1243zf, R1234ze(Z), and
	// R1233zd(E)", Int. J. Refrig. 53 (2015) 80–89, in the Mulero form.
	// Unverified: no published check values are held here.
	sigma: mulero{Tc: 438.75, a: []float64{0.06195}, n: []float64{1.277}},
	trans: pair{
		// Viscosity: extended corresponding states with R134a as reference
		// fluid (Huber et al. 2003), no fitted shape factor, Chung dilute gas.
		// Unverified for this fluid: no published check values are held
		// here. The same method is 6–13 % high for R1234yf and within 6 %
		// of the R1234ze(E) check values (transport_test.go).
		visc: &ecsViscosity{ref: r134aViscosity, refEOS: r134a, dilute: chungDilute{}},
		// Thermal conductivity: R.A. Perkins, M.L. Huber, "Measurement and
		// correlation of the thermal conductivity of trans-1-chloro-3,3,3-
		// trifluoropropene (R1233zd(E))", J. Chem. Eng. Data 62 (2017)
		// 2659–2665, with its own reducing constants (439.6 K, 480.219
		// kg/m³) and critical-enhancement constants (qD = 1/0.598 nm).
		// Coefficients as given in the public property library of J.J.
		// Gómez Romera (pychemqt), which cites that paper; checked against
		// the paper's Table 2 in transport_test.go.
		cond: &refConductivity{Tr: 439.6, rhoR: 480.219,
			a:  []float64{-0.0140033, 0.0378160, -0.00245832},
			b1: []float64{0.00862816, -0.0208988, 0.0511968, -0.0349076, 0.00975727, -0.000926484},
			b2: []float64{0.000914709, -0.00407914, 0.00845668, -0.0108985, 0.00538262, -0.000806009},
			crit: olchowy{R0: 1.02, gamma: 1.239, nu: 0.63, Gamma: 0.059, xi0: 2.13e-10, qD: 1 / 0.598e-9,
				Tref: 1.5 * 439.6, pc: 3582800, rhoc: 483.36}},
	},
	refT: 273.15, refH: 200e3,
	liq: ancillary{form: ancLinear, overT: false, Tr: 438.86, red: 3704.0 * 130.4962 / 1000,
		n: []float64{0.61448, 2.6345, -1.316, 0.86885, 0.34071},
		t: []float64{0.22, 0.55, 0.94, 1.4, 6.8}},
	vap: ancillary{form: ancExp, overT: false, Tr: 438.86, red: 3704.0 * 130.4962 / 1000,
		n: []float64{-0.80785, -3.2355, -2.7567, -10.863, -33.456, -69.31},
		t: []float64{0.24, 0.59, 1.0, 2.2, 4.7, 9.0}},
}).prepare()

// Residual part αʳ of the equation of state cited at the top of this file.
var r1233zdResidual = residual{
	power: []powerTerm{ // n, d, t, l
		{0.04394257, 4, 1, 0},
		{1.062919, 1, 0.182, 0},
		{-1.2879140374971, 1, 0.865, 0},
		{-0.8088618920845, 2, 1.0924, 0},
		{0.2372427, 3, 0.49, 0},
		{-1.9403, 1, 1.958, 2},
		{-2.831967, 3, 2.05, 2},
		{0.373421, 2, 0.658, 1},
		{-1.515798, 2, 2.051, 2},
		{-0.02755627, 7, 0.862, 1},
	},
	gaussian: []gaussianTerm{ // n, d, t, eta, epsilon, beta, gamma
		{4.24023, 1, 1.852, 1.532, 0.8834, 0.2912, 1.7171},
		{-0.03152671, 2, 1.92, 0.635, 1.386, 0.6245, 0.63},
		{-1.366494, 3, 1.936, 1.4056, 0.5196, 0.669, 0.7852},
		{2.647143, 1, 1.515, 1.451, 1.133, 0.5798, 2.251},
		{-2.325463, 1, 2.668, 1.395, 0.9788, 0.4643, 1.821},
		{-0.2541521, 1, 1.755, 2.259, 1.166, 2.449, 2.074},
		{0.1330834, 1, 0.526, 24.3, 0.9244, 1061.4, 1.0797},
		{-0.1569217, 1, 2.98, 23.6, 0.9372, 917.8, 1.084},
	},
}

var r1233zdIdeal = ideal{
	a1: -17.291229931888, a2: 10.404947446884,
	logTau: 3,
	planck: []planckTerm{ // n, θ
		{13.7, 1.7340381898555348},
		{7.0974, 6.539670965683817},
	},
}
