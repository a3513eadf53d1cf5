package fluid

// Acetone (propanone).
//
// Equation of state: E.W. Lemmon and R. Span, 'Short Fundamental Equations of State for 20 Industrial Fluids', J. Chem. Eng. Data 51 (2006) 785-850, doi:10.1021/je050186n
// Coefficients as published in the public fluid file of C. Bell et al., Ind.
// Eng. Chem. Res. 53 (2014) 2498, which cites that paper; checked against
// saturation values computed from it (see eos_test.go).

func init() { register(acetone) }

var acetone = (&helmholtz{
	info: Info{
		Name:      "Acetone",
		Aliases:   []string{"propanone", "2-propanone", "dimethyl ketone"},
		MolarMass: 58.07914 / 1000,
		Tc:        508.1, Pc: 4700000, RhoC: 272.97,
		Tmin:   233.15, // −40 °C; triple point 178.5 K
		Tmax:   508.1 - 3,
		Safety: "flammable (not classified in ASHRAE 34)", // descriptive; no ASHRAE 34 number
		Source: "EOS: Lemmon and Span, J. Chem. Eng. Data 51 (2006) 785; liquid viscosity and conductivity: VDI Heat Atlas, 2nd ed. (2010), D3.1; vapour: Chung et al., Ind. Eng. Chem. Res. 27 (1988) 671, conductivity scaled to the VDI dilute-gas polynomial; surface tension: Mulero et al., J. Phys. Chem. Ref. Data 41 (2012) 043105",
	},
	R: 8.314472, M: 58.07914 / 1000,
	Tr: 508.1, rhoR: 4699.999999999999 * 58.07914 / 1000,
	res: acetoneResidual, id: acetoneIdeal,
	// Chung et al. (1988) constants (ω is set from the equation of state);
	// dipole moment: Poling et al., The Properties of Gases and Liquids 5th ed., App. A
	// (from memory).
	chung: chung{M: 58.07914, Tc: 508.1, Vc: 58.07914 / 272.97 * 1000, mu: 2.88, kappa: 0,
		// VDI Heat Atlas, 2nd ed. (2010), section D3.1, tables of PPDS coefficients:
		liqMu: ppdsViscosity{1.65496, 0.5733, 610.687, 11.477, 2.915e-5}.at,
		liqK:  ppdsPoly{0.2871, -4.233e-4, 1.9e-8, -1.48e-10, 2.28e-13}.at,
		gasK0: ppdsPoly{-0.001474, 1.2e-5, 1.0358e-7, 0, 0}.at,
	},
	refT: 273.15, refH: 200e3,
	liq: ancillary{form: ancLinear, overT: false, Tr: 508.1, red: 4699.999999999999 * 58.07914 / 1000,
		n: []float64{7.78253597073335, -18.960548358570204, 22.83032556167124, -224.35339428090518, 232.0353784600054, -16.31650346262528},
		t: []float64{0.45, 0.684, 0.944, 1.818, 1.876, 2.307}},
	vap: ancillary{form: ancExp, overT: true, Tr: 508.1, red: 4699.999999999999 * 58.07914 / 1000,
		n: []float64{-2.7083518485413607, -3.1091181958405696, -11.940789313674161, 6086.186843505146, -12978.535578983987, 7630.400461122001},
		t: []float64{0.375, 0.899, 5.115, 12.812, 13.551, 14.638}},
	sigma: mulero{Tc: 508.1, a: []float64{0.0633}, n: []float64{1.16}},
}).prepare()

// Residual part αʳ of the equation of state cited at the top of this file.
var acetoneResidual = residual{
	power: []powerTerm{ // n, d, t, l
		{0.90041, 1, 0.25, 0},
		{-2.1267, 1, 1.25, 0},
		{-0.083409, 1, 1.5, 0},
		{0.065683, 3, 0.25, 0},
		{0.00016527, 7, 0.875, 0},
		{-0.039663, 1, 2.375, 1},
		{0.72085, 2, 2, 1},
		{0.0092318, 5, 2.125, 1},
		{-0.17217, 1, 3.5, 2},
		{-0.14961, 1, 6.5, 2},
		{-0.076124, 4, 4.75, 2},
		{-0.018166, 2, 12.5, 3},
	},
}

var acetoneIdeal = ideal{
	a1: -9.4883659997, a2: 7.1422719708,
	// reference-state offset a1=9.7898709978717 a2=-4.41053410795899 (NBP) dropped: the evaluator sets its own reference state
	logTau: 3,
	planck: []planckTerm{ // n, θ
		{3.7072, 0.6101161188742373},
		{7.0675, 6.849045463491438},
		{11.012, 3.101751623696123},
	},
}
