package fluid

// Ammonia (R717).
//
// Equation of state: K. Gao, J. Wu, I.H. Bell, A.H. Harvey, E.W. Lemmon,
// "A reference equation of state with an associating term for the
// thermodynamic properties of ammonia", J. Phys. Chem. Ref. Data 52 (2023)
// 013102 (journal reference from memory). It replaces R. Tillner-Roth,
// F. Harms-Watzenberg, H.D. Baehr, DKV-Tagungsbericht 20 (1993) 167.
// Coefficients as published in the public fluid file of C. Bell et al., Ind.
// Eng. Chem. Res. 53 (2014) 2498, which cites that paper; checked against
// saturation values computed from it (see eos_test.go).

func init() { register(ammonia) }

var ammonia = (&helmholtz{
	info: Info{
		Name:      "Ammonia",
		Aliases:   []string{"R717", "R-717", "NH3"},
		MolarMass: 17.03052 / 1000,
		Tc:        405.56, Pc: 1.136339e+07, RhoC: 233.25,
		Tmin:   233.15, // −40 °C; triple point 195.495 K
		Tmax:   405.56 - 3,
		Safety: "B2L", // ASHRAE 34 safety group (from memory; the CoolProp library lists "B2", without the L of the 2L subclass)
		Source: "EOS: Gao et al., J. Phys. Chem. Ref. Data 52 (2023) 013102; viscosity: Fenghour et al., J. Phys. Chem. Ref. Data 24 (1995) 1649; thermal conductivity: VDI Heat Atlas, 2nd ed. (2010), D3.1 liquid and dilute-gas polynomials with the density dependence of Chung et al., Ind. Eng. Chem. Res. 27 (1988) 671; surface tension: Mulero et al., J. Phys. Chem. Ref. Data 41 (2012) 043105",
	},
	R: 8.3144598, M: 17.03052 / 1000,
	Tr: 405.56, rhoR: 13696 * 17.03052 / 1000,
	res: ammoniaResidual, id: ammoniaIdeal,
	// Chung et al. (1988) constants (ω is set from the equation of state);
	// dipole moment: Poling et al., The Properties of Gases and Liquids 5th ed., App. A
	// (from memory);
	// no association factor is tabulated for ammonia, so κ = 0.
	chung: chung{M: 17.03052, Tc: 405.56, Vc: 17.03052 / 233.25 * 1000, mu: 1.47, kappa: 0,
		// Thermal conductivity: VDI Heat Atlas, 2nd ed. (2010), section D3.1,
		// PPDS polynomials for the liquid and the dilute gas.
		liqK:  ppdsPoly{-0.5047, 0.017496, -9.2075e-5, 1.97003e-7, -1.61999e-10}.at,
		gasK0: ppdsPoly{-0.006678, 9.2e-5, 4.767e-8, 0, 0}.at,
	},
	// Viscosity: A. Fenghour, W.A. Wakeham, V. Vesovic, J.T.R. Watson,
	// J. Millat, E. Vogel, "The viscosity of ammonia", J. Phys. Chem. Ref.
	// Data 24 (1995) 1649–1667 (residual terms in reduced variables).
	// (The Tufeu et al. 1984 conductivity correlation was tried and matched
	// the VDI table worse than the VDI polynomials with Chung's density
	// dependence: 8 % at 240 K, 17 % at 390 K without its critical term.)
	trans: pair{
		visc: &refViscosity{c0: 2.1357, M: 17.03026, sigma: 0.2957, epsK: 386,
			omegaA: []float64{4.9931822, -0.61122364, 0, 0.18535124, -0.11160946},
			rfB: []float64{-1.7999496, 46.692621, -534.60794, 3360.4074, -13019.164, 33414.23,
				-58711.743, 71426.686, -59834.012, 33652.741, -12027.35, 2434.8205, -208.07957},
			rfT: []float64{0, -0.5, -1, -1.5, -2, -2.5, -3, -3.5, -4, -4.5, -5, -5.5, -6},
			Tr:  405.4, rhoR: 13211.8,
			hoA: []float64{4.005040600989671e-06, -1.4107915123955129e-05, 3.4760743039321816e-05,
				4.631310990138071e-06, -3.937374461785061e-06, -1.200075068367531e-05, 1.9284977991745303e-06},
			hoD: []float64{3, 3, 2, 4, 4, 2, 4},
			hoT: []float64{0, 1, 2, 2, 3, 4, 4},
		},
		cond: chungConductivity{},
	},
	refT: 273.15, refH: 200e3,
	liq: ancillary{form: ancLinear, overT: false, Tr: 405.56, red: 13696 * 17.03052 / 1000,
		n: []float64{2.447, 5.8341, -25.944, 53.383, -54.411, 22.771},
		t: []float64{0.384, 1.65, 2.2, 2.75, 3.35, 4.0}},
	vap: ancillary{form: ancExp, overT: false, Tr: 405.56, red: 13696 * 17.03052 / 1000,
		n: []float64{-0.053296, -3.4589, -6.7572, -17.26, -43.12, -115.18},
		t: []float64{0.14, 0.44, 1.314, 3.225, 6.4, 14.0}},
	sigma: mulero{Tc: 405.4, a: []float64{0.1028, -0.09453}, n: []float64{1.211, 5.585}},
}).prepare()

// Residual part αʳ of the equation of state cited at the top of this file.
var ammoniaResidual = residual{
	power: []powerTerm{ // n, d, t, l
		{0.006132232, 4, 1, 0},
		{1.7395866, 1, 0.382, 0},
		{-2.2261792, 1, 1, 0},
		{-0.30127553, 2, 1, 0},
		{0.08967023, 3, 0.677, 0},
		{-0.076387037, 3, 2.915, 2},
		{-0.84063963, 2, 3.51, 2},
		{-0.27026327, 3, 1.063, 1},
	},
	gaussian: []gaussianTerm{ // n, d, t, eta, epsilon, beta, gamma
		{6.212578, 1, 0.655, 0.42776, -0.0726, 1.708, 1.036},
		{-5.7844357, 1, 1.3, 0.6424, -0.1274, 1.4865, 1.2777},
		{2.4817542, 1, 3.1, 0.8175, 0.7527, 2.0915, 1.083},
		{-2.3739168, 2, 1.4395, 0.7995, 0.57, 2.43, 1.2906},
		{0.01493697, 2, 1.623, 0.91, 2.2, 0.488, 0.928},
		{-3.7749264, 1, 0.643, 0.3574, -0.243, 1.1, 0.934},
		{0.0006254348, 3, 1.13, 1.21, 2.96, 0.85, 0.919},
		{-1.7359e-05, 3, 4.5, 4.14, 3.02, 1.14, 1.852},
		{-0.13462033, 1, 1, 22.56, 0.9574, 945.64, 1.05897},
		{0.07749072839, 1, 4, 22.68, 0.9576, 993.85, 1.05277},
	},
	gaoB: []gaoBTerm{ // n, d, t, eta, epsilon, beta, gamma, b
		{-1.6909858, 1, 4.3315, -2.8452, 0.4478, 0.3696, 1.108, 1.244},
		{0.93739074, 1, 4.015, -2.8342, 0.44689, 0.2962, 1.313, 0.6826},
	},
}

var ammoniaIdeal = ideal{
	a1: -6.59406093943886, a2: 5.60101151987913,
	logTau: 3,
	planck: []planckTerm{ // n, θ
		{2.224, 4.0585856593352405},
		{3.148, 9.776605187888352},
		{0.9579, 17.829667620080876},
	},
}
