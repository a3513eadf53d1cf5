package fluid

// Ethanol.
//
// Equation of state: J.A. Schroeder, S.G. Penoncello, J.S. Schroeder, 'A Fundamental Equation of State for Ethanol', J. Phys. Chem. Ref. Data 43 (2014) 043102, doi:10.1063/1.4895394
// Coefficients as published in the public fluid file of C. Bell et al., Ind.
// Eng. Chem. Res. 53 (2014) 2498, which cites that paper; checked against
// saturation values computed from it (see eos_test.go).

func init() { register(ethanol) }

var ethanol = (&helmholtz{
	info: Info{
		Name:      "Ethanol",
		Aliases:   []string{"C2H5OH", "ethyl alcohol"},
		MolarMass: 46.06844 / 1000,
		Tc:        514.71, Pc: 6268000, RhoC: 273.19,
		Tmin:   233.15, // −40 °C; triple point 159.10000000000002 K
		Tmax:   514.71 - 3,
		Safety: "flammable (not classified in ASHRAE 34)", // descriptive; no ASHRAE 34 number
		Source: "EOS: Schroeder et al., J. Phys. Chem. Ref. Data 43 (2014) 043102; viscosity: Kiselev et al., Ind. Eng. Chem. Res. 44 (2005) 6916; thermal conductivity: Assael et al., J. Phys. Chem. Ref. Data 42 (2013) 023102; surface tension: Mulero et al., J. Phys. Chem. Ref. Data 41 (2012) 043105",
	},
	R: 8.314472, M: 46.06844 / 1000,
	Tr: 514.71, rhoR: 5930 * 46.06844 / 1000,
	res: ethanolResidual, id: ethanolIdeal,
	// Chung et al. (1988) constants (ω is set from the equation of state);
	// dipole moment: Poling et al., The Properties of Gases and Liquids 5th ed., App. A
	// (from memory);
	// association factor κ: Chung et al. (1988), Table 1 (from memory).
	chung: chung{M: 46.06844, Tc: 514.71, Vc: 46.06844 / 273.19 * 1000, mu: 1.69, kappa: 0.174823},
	// Viscosity: S.B. Kiselev, J.F. Ely, I.M. Abdulagatov, M.L. Huber,
	// "Generalized SAFT-DFT/DMT model for the thermodynamic, interfacial,
	// and transport properties of associating fluids: application for
	// n-alkanols", Ind. Eng. Chem. Res. 44 (2005) 6916–6927.
	// Thermal conductivity: M.J. Assael, E.A. Sykioti, M.L. Huber, R.A.
	// Perkins, "Reference correlation of the thermal conductivity of ethanol
	// from the triple point to 600 K and up to 245 MPa", J. Phys. Chem. Ref.
	// Data 42 (2013) 023102.
	trans: pair{
		visc: &refViscosity{M: 46.06844, sigma: 0.453, epsK: 362.6,
			dilutePoly: []float64{-1.03116e-06, 3.48379e-08, -6.50264e-12},
			rfB:        []float64{-19.572881, 219.73999, -1015.3226, 2471.01251, -3375.1717, 2491.6597, -787.26086, 14.085455, -0.34664158},
			rfT:        []float64{0, -0.25, -0.5, -0.75, -1.0, -1.25, -1.5, -2.5, -5.5},
			Tr:         513.9, rhoR: 5991,
			hoA: []float64{0.000131194057, -0.000382240694, -8.05700894e-05, 0.000153811778, -0.000110578307},
			hoD: []float64{2, 2, 3, 3, 3},
			hoT: []float64{0, 1, 0, 1, 2},
			hoF: 0.0237222995, hoFD: 1,
			hoG: []float64{-3.38264465, 12.7568864}, hoH: []float64{0, -0.5},
			hoP: []float64{1}, hoQ: []float64{0},
		},
		cond: &refConductivity{Tr: 514.71, rhoR: 273.186,
			a:    []float64{-0.00209575, 0.0199045, -0.053964, 0.0821223, -0.00198864, -0.000495513},
			aDen: []float64{0.17223, -0.078273, 1},
			b1:   []float64{0.0267222, 0.148279, -0.130429, 0.0346232, -0.00244293},
			b2:   []float64{0.0177166, -0.0893088, 0.0684664, -0.0145702, 0.000809189},
			crit: olchowy{R0: 1.02, gamma: 1.239, nu: 0.63, Gamma: 0.05885, xi0: 1.64296e-10, qD: 1.88e9,
				Tref: 1.5 * 514.71, pc: 6268000, rhoc: 273.19}},
	},
	refT: 273.15, refH: 200e3,
	liq: ancillary{form: ancLinear, overT: false, Tr: 514.71, red: 5930.0 * 46.06844 / 1000,
		n: []float64{7.824518623386008, -338.93732001583646, 368.3422016038343, -90.14206962630433, 80.35347134933373, -26.00710239571597},
		t: []float64{0.596, 1.495, 1.561, 2.737, 3.606, 4.943}},
	vap: ancillary{form: ancExp, overT: true, Tr: 514.71, red: 5930.0 * 46.06844 / 1000,
		n: []float64{-4.698337259111072, -10.953380258011986, 12.92351305172882, -1017.0017776259273, 1604.552160868234, -1439.9265562459323},
		t: []float64{0.443, 2.304, 4.146, 11.027, 12.113, 17.485}},
	sigma: mulero{Tc: 513.9, a: []float64{0.05}, n: []float64{0.952}},
}).prepare()

// Residual part αʳ of the equation of state cited at the top of this file.
var ethanolResidual = residual{
	power: []powerTerm{ // n, d, t, l
		{0.058200796, 4, 1, 0},
		{0.94391227, 1, 1.04, 0},
		{-0.80941908, 1, 2.72, 0},
		{0.55359038, 2, 1.174, 0},
		{-1.4269032, 2, 1.329, 0},
		{0.13448717, 3, 0.195, 0},
		{0.42671978, 1, 2.43, 1},
		{-1.1700261, 1, 1.274, 1},
		{-0.92405872, 1, 4.16, 2},
		{0.34891808, 3, 3.3, 1},
		{-0.9132772, 3, 4.177, 2},
		{0.022629481, 2, 2.5, 1},
		{-0.15513423, 2, 0.81, 2},
		{0.21055146, 6, 2.02, 1},
		{-0.2199769, 6, 1.606, 1},
		{-0.0065857238, 8, 0.86, 1},
	},
	gaussian: []gaussianTerm{ // n, d, t, eta, epsilon, beta, gamma
		{0.75564749, 1, 2.5, 1.075, 0.779, 1.207, 1.194},
		{0.1069411, 1, 3.72, 0.463, 0.805, 0.0895, 1.986},
		{-0.069533844, 2, 1.19, 0.876, 1.869, 0.581, 1.583},
		{-0.24947395, 3, 3.25, 1.108, 0.694, 0.947, 0.756},
		{0.027177891, 3, 3, 0.741, 1.312, 2.356, 0.495},
		{-0.0009053953, 2, 2, 4.032, 2.054, 27.01, 1.002},
		{-0.12310953, 2, 2, 2.453, 0.441, 4.542, 1.077},
		{-0.08977971, 2, 1, 2.3, 0.793, 1.287, 1.493},
		{-0.39512601, 1, 1, 3.143, 0.313, 3.09, 1.542},
	},
}

var ethanolIdeal = ideal{
	a1: -12.7531, a2: 9.39094,
	// reference-state offset a1=9.10869959576363 a2=-4.32013218872146 (NBP) dropped: the evaluator sets its own reference state
	logTau: 3.43069,
	planck: []planckTerm{ // n, θ
		{2.14326, 0.816771},
		{5.09206, 2.59175},
		{6.60138, 3.80408},
		{5.70777, 8.58736},
	},
}
