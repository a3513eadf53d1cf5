package correlate

import (
	"math"
	"testing"

	"circa/check/fluid"
)

// The only published accuracy figure found for Katto & Ohno's correlation
// is a mean absolute deviation of 33.2 % against CHF data in channels of
// 3 mm bore and less (Shah 2016, Heat Transfer Eng. 37(18), as reported in
// the 2021 ASHRAE Handbook—Fundamentals (SI), ch. 5). The two tests below
// take it as the band that circa's form must keep over measured and
// tabulated water CHF in larger tubes: a wrong coefficient, exponent or
// regime would leave it. Properties are circa's own saturated water
// (IAPWS-IF97, surface tension IAPWS R1-76).
const kattoOhnoPublishedMAD = 0.332

func waterAt(t *testing.T, p float64) Props {
	t.Helper()
	f, err := fluid.Lookup("water")
	if err != nil {
		t.Fatal(err)
	}
	s, err := f.AtP(p)
	if err != nil {
		t.Fatal(err)
	}
	return Props{RhoL: s.RhoL, RhoV: s.RhoV, Sigma: s.Sigma, Hlv: s.Hlv, MuL: s.MuL, MuV: s.MuV, KL: s.KL, CpL: s.CpL}
}

// kattoOhnoAtmospheric are measured CHF points for water at 100 kPa in
// uniformly heated vertical tubes with subcooled inlet: reference 1 of the
// U.S. NRC compilation of the data behind the 2006 CHF look-up table
// (ADAMS accession ML22264A009), rows 1–61, as transcribed in the public
// repository InfoSage05/BTP, file
// data/raw/external/nrc_groeneveld_24579pt_chf_database.csv. Columns: bore
// D (m), heated length L (m), mass flux G (kg/m²s), inlet subcooling
// (kJ/kg), CHF (kW/m²). The rows are self-consistent: the outlet quality
// each row also lists follows from the heat balance
// −Δh_in/hlv + 4 q L/(G D hlv) to within 0.04.
var kattoOhnoAtmospheric = [][5]float64{
	{0.004, 0.396, 77.5, 317.0, 442.0},
	{0.004, 0.396, 142.7, 317.0, 757.0},
	{0.004, 0.396, 203.9, 317.0, 978.0},
	{0.004, 0.396, 271.8, 317.0, 1325.0},
	{0.004, 0.396, 421.3, 317.0, 1798.0},
	{0.004, 0.396, 543.6, 317.0, 2239.0},
	{0.004, 0.396, 679.5, 317.0, 2712.0},
	{0.004, 0.396, 978.5, 317.0, 3564.0},
	{0.004, 0.396, 1372.7, 317.0, 4573.0},
	{0.004, 0.396, 1644.5, 317.0, 5236.0},
	{0.004, 0.594, 77.5, 324.0, 300.0},
	{0.004, 0.594, 135.9, 324.0, 505.0},
	{0.004, 0.594, 203.9, 324.0, 694.0},
	{0.004, 0.594, 258.2, 331.0, 852.0},
	{0.004, 0.594, 407.7, 331.0, 1199.0},
	{0.004, 0.594, 543.6, 331.0, 1514.0},
	{0.004, 0.594, 693.1, 331.0, 1892.0},
	{0.004, 0.594, 992.1, 331.0, 2618.0},
	{0.004, 0.792, 78.8, 331.0, 196.0},
	{0.004, 0.792, 135.9, 331.0, 347.0},
	{0.004, 0.792, 217.5, 331.0, 536.0},
	{0.004, 0.792, 244.6, 331.0, 631.0},
	{0.004, 0.792, 407.7, 329.0, 915.0},
	{0.004, 0.792, 543.6, 329.0, 1135.0},
	{0.004, 0.792, 706.7, 329.0, 1451.0},
	{0.004, 0.792, 720.3, 324.0, 1482.0},
	{0.004, 0.792, 203.9, 324.0, 505.0},
	{0.004, 0.991, 78.8, 329.0, 196.0},
	{0.004, 0.991, 135.9, 329.0, 315.0},
	{0.004, 0.991, 203.9, 329.0, 442.0},
	{0.004, 0.991, 271.8, 329.0, 568.0},
	{0.004, 0.991, 421.3, 329.0, 820.0},
	{0.004, 0.991, 421.3, 329.0, 820.0},
	{0.004, 0.991, 421.3, 329.0, 789.0},
	{0.004, 0.991, 421.3, 329.0, 883.0},
	{0.0048, 0.478, 69.3, 319.0, 442.0},
	{0.0048, 0.478, 135.9, 319.0, 757.0},
	{0.0048, 0.478, 203.9, 319.0, 1041.0},
	{0.0048, 0.478, 285.4, 319.0, 1325.0},
	{0.0048, 0.478, 407.7, 319.0, 1672.0},
	{0.0048, 0.478, 543.6, 319.0, 2145.0},
	{0.0048, 0.478, 665.9, 319.0, 2586.0},
	{0.0048, 0.478, 706.7, 319.0, 2649.0},
	{0.0048, 0.478, 937.8, 319.0, 3280.0},
	{0.0048, 0.478, 1386.3, 319.0, 4510.0},
	{0.0048, 0.716, 135.9, 326.0, 536.0},
	{0.0048, 0.716, 203.9, 317.0, 694.0},
	{0.0048, 0.716, 271.8, 317.0, 883.0},
	{0.0048, 0.716, 407.7, 317.0, 1167.0},
	{0.0048, 0.716, 557.2, 317.0, 1545.0},
	{0.0048, 0.716, 665.9, 317.0, 1829.0},
	{0.0048, 0.716, 951.4, 317.0, 2492.0},
	{0.0048, 0.716, 937.8, 317.0, 2429.0},
	{0.0048, 0.716, 1413.4, 317.0, 3532.0},
	{0.0048, 0.955, 203.9, 317.0, 631.0},
	{0.0048, 0.955, 271.8, 317.0, 694.0},
	{0.0048, 0.955, 407.7, 317.0, 946.0},
	{0.0048, 0.955, 543.6, 317.0, 1199.0},
	{0.0048, 0.955, 679.5, 317.0, 1482.0},
	{0.0048, 0.955, 951.4, 317.0, 1861.0},
	{0.0048, 0.955, 1100.9, 317.0, 1987.0},
}

// TestCHFKattoOhnoMeasured compares the correlation with the 61 measured
// points above (ρv/ρl = 6.2e-4, L/D 99–248, G 69–1645 kg/m²s, about
// 320 kJ/kg of inlet subcooling: the low-density rules, q”co1 and q”co2,
// and the subcooling factor K1). Worked when written: circa's form lies
// 28 % from the data on average and above them at all but four points
// (mean +27.5 %), most where the low-flow term q”co1 is taken.
func TestCHFKattoOhnoMeasured(t *testing.T) {
	p := waterAt(t, 100e3)
	sum := 0.0
	for _, r := range kattoOhnoAtmospheric {
		q := CHFKattoOhno(r[2], r[1], r[0], r[3]*1e3, p)
		sum += math.Abs(q/(r[4]*1e3) - 1)
	}
	if mad := sum / float64(len(kattoOhnoAtmospheric)); !(mad <= kattoOhnoPublishedMAD) {
		t.Errorf("mean absolute deviation from the measured CHF %.3f, above the published %.3f", mad, kattoOhnoPublishedMAD)
	}
}

// kattoOhnoLUT16MPa is the 2006 CHF look-up table (D.C. Groeneveld et al.,
// Nucl. Eng. Des. 237 (2007) 1909–1922) at 16 MPa for an 8 mm tube: every
// tabulated mass flux from 300 to 5000 kg/m²s at the local qualities 0.05,
// 0.1, 0.15, 0.2, 0.25 and 0.3, CHF in kW/m², as transcribed in the public
// repository InfoSage05/BTP, file data/chf_long_with_gridbase.csv (column
// CHF).
var kattoOhnoLUT16MPa = []struct {
	G   float64
	chf [6]float64
}{
	{300, [6]float64{2414, 2206, 1909, 1718, 1562, 1451}},
	{500, [6]float64{2417, 2180, 1909, 1595, 1406, 1261}},
	{750, [6]float64{2251, 1985, 1703, 1280, 1113, 978}},
	{1000, [6]float64{1918, 1634, 1353, 1039, 952, 814}},
	{1500, [6]float64{1888, 1505, 1226, 1005, 879, 671}},
	{2000, [6]float64{1921, 1623, 1328, 1118, 918, 715}},
	{2500, [6]float64{2086, 1747, 1450, 1213, 1004, 795}},
	{3000, [6]float64{2209, 1857, 1533, 1269, 1101, 817}},
	{3500, [6]float64{2311, 1956, 1614, 1345, 1170, 831}},
	{4000, [6]float64{2428, 2157, 1828, 1560, 1325, 1030}},
	{4500, [6]float64{2569, 2225, 1960, 1684, 1465, 1164}},
	{5000, [6]float64{2698, 2293, 2024, 1777, 1574, 1220}},
}

// TestCHFKattoOhnoLookupTable compares the dense-vapour rules (ρv/ρl =
// 0.184 at 16 MPa, above 0.15) with the look-up table. The table gives
// the CHF at a local quality; a uniformly heated tube with saturated inlet
// reaches quality x at its outlet when L = x G D hlv/(4 q), so each entry
// becomes a tube of that length (L/D 1.4–294) whose Katto–Ohno CHF should
// be the tabulated one. Worked when written: the rules used here lie 20 %
// from the table on average (mean +17 %); the plain minimum of q”co1,
// q”co4 and q”co5 would lie 24 % from it (mean −22 %), so the table
// leans to the rules used here but does not decide between the two
// readings of the selection rules.
//
// The same conversion at 100 kPa is not tested, for it does not agree:
// over the table's entries there with L/D ≥ 5 (G 50–5000 kg/m²s, x
// 0.05–0.3, 61 entries) the correlation is 1.8 times the table at the
// median and up to 4.9 times at low flow in short tubes, 1.35 times at
// the median over the 29 with L/D ≥ 50. The table is no firmer there: at
// G ≈ 80 kg/m²s and x ≈ 0.74 it interpolates to about 420 kW/m² for an
// 8 mm tube, where reference 1 above measured 196 kW/m² in a 4 mm one
// (row 19), and the measured points, in longer tubes with subcooled
// inlet, sit much closer to the correlation (TestCHFKattoOhnoMeasured).
func TestCHFKattoOhnoLookupTable(t *testing.T) {
	p := waterAt(t, 16e6)
	const D = 0.008
	x := [6]float64{0.05, 0.1, 0.15, 0.2, 0.25, 0.3}
	sum, n := 0.0, 0
	for _, r := range kattoOhnoLUT16MPa {
		for i, c := range r.chf {
			q := c * 1e3
			L := x[i] * r.G * D * p.Hlv / (4 * q)
			sum += math.Abs(CHFKattoOhno(r.G, L, D, 0, p)/q - 1)
			n++
		}
	}
	if mad := sum / float64(n); !(mad <= kattoOhnoPublishedMAD) {
		t.Errorf("mean absolute deviation from the look-up table %.3f, above the published %.3f", mad, kattoOhnoPublishedMAD)
	}
}
