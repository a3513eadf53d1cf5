// Package correlate holds the published two-phase flow, boiling,
// condensation and flooding correlations that the circulation estimator
// evaluates cell by cell.
//
// Every function takes plain float64 SI inputs and a [Props] value with the
// saturated phase properties, so the package does not depend on any property
// source. Functions never panic. For physical inputs they return finite
// numbers; inputs outside the physical range (negative densities,
// diameters, NaN) give 0 rather than NaN, and overflow is clamped to
// ±math.MaxFloat64, so callers validate their inputs first
// ([Props.Validate]) and must not read a 0 as a verdict.
// Quality below 0 is treated as saturated liquid and above 1 as saturated
// vapour.
//
// Methods and their references (volume and page numbers beyond author,
// year and journal are given from memory, except those that agree with the
// reference list of the 2021 ASHRAE Handbook—Fundamentals (SI), ch. 5:
// Zivi, Rouhani–Axelsson, Müller-Steinhagen & Heck, Lockhart–Martinelli,
// Zuber's report, Cooper's review, Katto–Ohno, Shah (1979) and Nusselt):
//
// Single-phase Darcy friction factor:
//   - [Churchill] (default): S.W. Churchill, "Friction-factor equation spans
//     all fluid-flow regimes", Chem. Eng. 84(24) (1977) 91–92.
//   - [Colebrook]: C.F. Colebrook, J. Inst. Civil Eng. 11 (1939) 133–156;
//     laminar 64/Re below Re = 2300.
//   - [BlasiusLaminar]: 0.184 Re^−0.2 turbulent, 64/Re below Re = 2000, the
//     pair used with the Lockhart–Martinelli method.
//
// Void fraction ([VoidMethod]):
//   - homogeneous (no slip).
//   - Zivi: S.M. Zivi, J. Heat Transfer 86 (1964) 247–252.
//   - Chisholm slip: D. Chisholm, Int. J. Heat Mass Transfer 16 (1973) 347–358.
//   - Rouhani–Axelsson drift flux (default): S.Z. Rouhani, E. Axelsson,
//     Int. J. Heat Mass Transfer 13 (1970) 383–393, in the Zuber–Findlay form
//     (N. Zuber, J.A. Findlay, J. Heat Transfer 87 (1965) 453–468); its
//     horizontal variant C0 = 1 + 0.12(1−x) after D. Steiner, VDI Heat Atlas
//     (1993).
//
// Two-phase frictional pressure gradient ([FrictionMethod]):
//   - Müller-Steinhagen & Heck (default): H. Müller-Steinhagen, K. Heck,
//     Chem. Eng. Process. 20 (1986) 297–308.
//   - Friedel: L. Friedel, European Two-Phase Flow Group Meeting, Ispra
//     (1979), paper E2; Froude exponent 0.0454 as printed by P.B. Whalley,
//     Boiling, Condensation and Gas-Liquid Flow (1987).
//   - Lockhart–Martinelli in Chisholm's form: R.W. Lockhart, R.C. Martinelli,
//     Chem. Eng. Prog. 45 (1949) 39–48; D. Chisholm, Int. J. Heat Mass
//     Transfer 10 (1967) 1767–1778.
//   - Homogeneous with the mixture viscosity of W.H. McAdams et al., Trans.
//     ASME 64 (1942) 193–200; A. Cicchitti et al., Energia Nucleare 7 (1960)
//     407–425; or A.E. Dukler et al., AIChE J. 10 (1964) 38–51.
//
// Boiling and condensation:
//   - [CHFPool]: pool-boiling critical heat flux, N. Zuber, AECU-4439 (1959)
//     with K = π/24, or J.H. Lienhard, V.K. Dhir, NASA CR-2270 (1973) with
//     K = 0.149 (default, [LienhardDhir]).
//   - [Cooper]: nucleate pool boiling, M.G. Cooper, IChemE Symp. Ser. 86
//     (1984) 785–793; the ASHRAE Handbook gives for it M.G. Cooper, Adv.
//     Heat Transfer 16 (1984) 157–239.
//   - [CHFKattoOhno]: flow-boiling critical heat flux in uniformly heated
//     tubes, Y. Katto, H. Ohno, Int. J. Heat Mass Transfer 27 (1984)
//     1641–1648; coefficients and regime rules as reproduced in J.G. Collier,
//     J.R. Thome, Convective Boiling and Condensation, 3rd ed. (1994), from
//     memory.
//   - [Shah1979]: film condensation in tubes, M.M. Shah, Int. J. Heat Mass
//     Transfer 22 (1979) 547–556.
//   - [BoykoKruzhilin]: condensation in tubes, L.D. Boyko, G.N. Kruzhilin,
//     Int. J. Heat Mass Transfer 10 (1967) 361–373, in the form of G.F.
//     Hewitt, G.L. Shires, T.R. Bott, Process Heat Transfer (1994).
//   - [AkersDeansCrosser]: condensation in horizontal tubes, W.W. Akers,
//     H.A. Deans, O.K. Crosser, Chem. Eng. Prog. Symp. Ser. 55(29) (1959),
//     in the form of S. Kakaç (ed.), Boilers, Evaporators and Condensers
//     (1991).
//   - [CavalliniSmithZecchin]: forced-convection condensation in tubes,
//     A. Cavallini, J.R. Smith, R. Zecchin, Int. Heat Transfer Conf., Tokyo
//     (1974) 309–313, in the form of Kakaç (1991).
//     These three are checked against the values the open-source ht library
//     (C. Bell) prints for them, Boyko–Kruzhilin also against Process Heat
//     Transfer's worked example; [CondensationMethod] selects one.
//   - [FilmVertical]: laminar film condensation on a vertical wall,
//     W. Nusselt, Z. VDI 60 (1916) 541–546, with the film-subcooling latent
//     heat of W.M. Rohsenow, Trans. ASME 78 (1956) 1645–1648.
//   - [FilmHorizontalTube]: stratified condensation inside a horizontal
//     tube at low vapour velocity, J.C. Chato, ASHRAE J. 4(2) (1962) 52–60.
//
// Ranges: [Validities] lists, for the correlations with one, the range of
// inputs their sources state, so that an estimate can say where it
// extrapolates; a range not checked against a printed source says "from
// memory".
//
// Counter-current flooding:
//   - [WallisFraction]: G.B. Wallis, One-Dimensional Two-Phase Flow,
//     McGraw-Hill (1969).
//   - [KutateladzeFraction]: large-diameter Kutateladze-number form; its
//     constant [KutateladzeCK] ≈ √3.2 is from memory.
//   - [FaghriQmax]: closed two-phase thermosiphon flooding limit, A. Faghri,
//     M.M. Chen, M. Morgan, J. Heat Transfer 111 (1989) 611–618; written from
//     memory, not checked against the paper.
package correlate
