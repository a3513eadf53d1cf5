package fluid

// Methanol.
//
// Equation of state: K.M. de Reuck and R.J.B. Craven, 'Methanol: International Thermodynamic Tables of the Fluid State - 12', IUPAC, Blackwell Scientific, Oxford, 1993
// Coefficients as published in the public fluid file of C. Bell et al., Ind.
// Eng. Chem. Res. 53 (2014) 2498, which cites that paper; checked against
// saturation values computed from it (see eos_test.go).

func init() { register(methanol) }

var methanol = (&helmholtz{
	info: Info{
		Name:      "Methanol",
		Aliases:   []string{"CH3OH", "methyl alcohol"},
		MolarMass: 32.04216 / 1000,
		Tc:        512.5, Pc: 8089819, RhoC: 273,
		Tmin:   233.15, // −40 °C; triple point 175.61 K
		Tmax:   512.5 - 3,
		Safety: "flammable, toxic (not classified in ASHRAE 34)", // descriptive; no ASHRAE 34 number
		Source: "EOS: de Reuck and Craven, IUPAC Methanol tables (1993); viscosity: VDI Heat Atlas, 2nd ed. (2010), D3.1 (liquid) and Chung et al., Ind. Eng. Chem. Res. 27 (1988) 671 (vapour); thermal conductivity: Sykioti et al., J. Phys. Chem. Ref. Data 42 (2013) 043101; surface tension: Mulero et al., J. Phys. Chem. Ref. Data 41 (2012) 043105",
	},
	R: 8.31448, M: 32.04216 / 1000,
	Tr: 513.38, rhoR: 8785.17 * 32.04216 / 1000,
	res: methanolResidual, id: methanolIdeal,
	// Chung et al. (1988) constants (ω is set from the equation of state);
	// dipole moment: Poling et al., The Properties of Gases and Liquids 5th ed., App. A
	// (from memory);
	// association factor κ: Chung et al. (1988), Table 1 (from memory).
	chung: chung{M: 32.04216, Tc: 512.5, Vc: 32.04216 / 273 * 1000, mu: 1.7, kappa: 0.215175,
		// VDI Heat Atlas, 2nd ed. (2010), section D3.1, tables of PPDS coefficients:
		liqMu:  ppdsViscosity{3.79226, 0.17755, 546.563, 87.845, 7.91e-6}.at,
		gasMu0: ppdsPoly{-1.5159e-6, 3.927e-8, -6.541e-12, 0, 0}.at,
	},
	// Thermal conductivity: M. Sykioti, M.J. Assael, M.L. Huber, R.A.
	// Perkins, "Reference correlation of the thermal conductivity of
	// methanol from the triple point to 660 K and up to 245 MPa", J. Phys.
	// Chem. Ref. Data 42 (2013) 043101.
	trans: pair{
		visc: chungViscosity{},
		cond: &refConductivity{Tr: 512.6, rhoR: 275.563,
			a:    []float64{-0.00357796, 0.0629638, -0.0373047, -0.0521182, 0.231607, 0.0441575},
			aDen: []float64{3.33313, -6.08398, 8.18739, -0.261074, 1},
			b1:   []float64{0.0556918, 0.112174, -0.0843893, 0.0197525, -0.0015253},
			b2:   []float64{0.0104771, -0.0745272, 0.0637569, -0.0246826, 0.00434656},
			crit: olchowy{R0: 1.03, gamma: 1.239, nu: 0.63, Gamma: 0.05283, xi0: 1.487e-10, qD: 1.0 / 0.7e-9,
				Tref: 1.5 * 512.6, pc: 8089819, rhoc: 273}},
	},
	refT: 273.15, refH: 200e3,
	liq: ancillary{form: ancLinear, overT: false, Tr: 512.5, red: 8520.024867237415 * 32.04216 / 1000,
		n: []float64{-5161.133254659156, 5793.274196569594, -850.8567738433294, 221.20959935245452, 0.8350964167808183, -322.4150322686462},
		t: []float64{0.099, 0.1, 0.115, 0.137, 4.0, 25.0}},
	vap: ancillary{form: ancExp, overT: true, Tr: 512.5, red: 8520.024867237415 * 32.04216 / 1000,
		n: []float64{-3.567397307329701, 6.410399799034237, -7.619523084192452, -4.47952181298982, -2.9395458001342796, 5.838421064753882},
		t: []float64{0.07600000000000001, 0.14, 0.362, 1.8333333333333333, 7.0, 14.166666666666666}},
	sigma: mulero{Tc: 513.38, a: []float64{0.22421, -0.21408, 0.083233}, n: []float64{1.3355, 1.677, 4.4402}},
}).prepare()

// Residual part αʳ of the equation of state cited at the top of this file.
var methanolResidual = residual{
	exponential: []exponentialTerm{ // n, d, t, g, l
		{-2.80062505988, 1, 0, 0, 0},
		{12.5636372418, 1, 1, 0, 0},
		{-13.0310563173, 1, 2, 0, 0},
		{3.2659313406, 1, 3, 0, 0},
		{-4.11425343805, 2, 1, 0, 0},
		{3.46397741254, 2, 2, 0, 0},
		{-0.083644396759, 2, 3, 0, 0},
		{-0.369240098923, 2, 4, 0, 0},
		{0.00313180842152, 2, 6, 0, 0},
		{0.603201474111, 3, 0, 0, 0},
		{-0.231158593638, 3, 3, 0, 0},
		{0.106114844945, 3, 4, 0, 0},
		{-0.0792228164995, 4, 0, 0, 0},
		{-4.22419150975e-05, 4, 7, 0, 0},
		{0.00758196739214, 5, 1, 0, 0},
		{-2.44617434701e-05, 6, 6, 0, 0},
		{1.15080328802e-06, 7, 7, 0, 0},
		{-12.5099747447, 1, 1, 1.01733510223052, 2},
		{27.0392835391, 1, 2, 1.01733510223052, 2},
		{-21.2070717086, 1, 3, 1.01733510223052, 2},
		{6.3279947227, 1, 4, 1.01733510223052, 2},
		{14.3687921636, 2, 1, 1.01733510223052, 2},
		{-28.7450766617, 2, 2, 1.01733510223052, 2},
		{18.5397216068, 2, 3, 1.01733510223052, 2},
		{-3.88720372879, 2, 5, 1.01733510223052, 2},
		{-4.16602487963, 3, 1, 1.01733510223052, 2},
		{5.29665875982, 4, 2, 1.01733510223052, 2},
		{0.509360272812, 5, 1, 1.01733510223052, 2},
		{-3.30257604839, 5, 2, 1.01733510223052, 2},
		{-0.311045210826, 5, 4, 1.01733510223052, 2},
		{0.273460830583, 5, 5, 1.01733510223052, 2},
		{0.518916583979, 6, 2, 1.01733510223052, 2},
		{-0.00227570803104, 9, 5, 1.01733510223052, 2},
		{0.0211658196182, 6, 9, 1.03497071023039, 4},
		{-0.0114335123221, 6, 14, 1.03497071023039, 4},
		{0.00249860798459, 4, 19, 1.05291203329783, 6},
	},
	doubleExp: []doubleExpTerm{ // n, d, t, gd, ld, gt, lt
		{-0.02030821799675877, 1, 0, 4.06934040892209, 2, -3.8940745646517, 1},
		{0.0011863332818003462, 1, 0, 8.20892015621185, 3, -3.8940745646517, 1},
		{-0.0011009660194048337, 1, 0, 9.15601592007471, 2, -3.8940745646517, 1},
		{0.00044523795353053076, 1, 0, 83.8326275286616, 4, -3.8940745646517, 1},
		{-0.00170439564391521, 1, 0, 16.2773616356884, 2, -3.8940745646517, 1},
		{3.3394928748983205e-11, 3, 0, 27.705105527215, 3, -23.0649031906293, 1},
		{-9.561349210975947e-11, 3, 0, 16.2773616356884, 2, -23.0649031906293, 1},
		{1.5831281419735226e-11, 3, 0, 264.95250181898, 4, -23.0649031906293, 1},
	},
}

var methanolIdeal = ideal{
	a1: 0, a2: 0,
	// The ideal-gas heat capacity term cp0/R = 3.9007912 adds that times ln τ;
	// its parts constant or linear in τ only shift the reference state.
	// reference-state offset a1=-6.204166753747667 a2=7.746973464311607 (NBP) dropped: the evaluator sets its own reference state
	logTau: -1 + 3.9007912,
	planck: []planckTerm{ // n, θ
		{10.992677, 2115.01542 / 513.38},
		{18.33683, 1676.18569 / 513.38},
		{-16.366004, 1935.16717 / 513.38},
		{-6.2332348, 1504.97016 / 513.38},
		{2.8035363, 4222.83691 / 513.38},
		{1.0778099, 5296.17127 / 513.38},
		{0.96965697, 273.36934 / 513.38},
	},
}
