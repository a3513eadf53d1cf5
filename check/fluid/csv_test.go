package fluid

import (
	"errors"
	"fmt"
	"math"
	"os"
	"strings"
	"testing"
)

const demoCSV = "../../testdata/fluids/demo-coolant.csv"

// TestDemoCoolant reads the sample table, whose values are IAPWS water
// rounded to five figures at 10 K steps, and checks its interpolation between
// rows against the IAPWS equations: within 0.1 % in every field (rounding
// plus interpolation error of monotone cubics on 10 K rows; common practice
// for tabulated properties).
func TestDemoCoolant(t *testing.T) {
	f, err := LoadCSV(demoCSV)
	if err != nil {
		t.Fatal(err)
	}
	in := f.Info()
	if in.Name != "demo coolant" || in.Safety != "A1" || in.MolarMass != 0.018015 ||
		in.Tc != 647.096 || in.Pc != 22.064e6 || in.RhoC != 322 {
		t.Errorf("Info() = %+v", in)
	}
	if math.Abs(in.Tmin-283.15) > 1e-9 || math.Abs(in.Tmax-473.15) > 1e-9 {
		t.Errorf("range %g to %g K, want 283.15 to 473.15 K", in.Tmin, in.Tmax)
	}
	for T := in.Tmin + 0.37; T < in.Tmax; T += 1.3 {
		got, err := f.AtT(T)
		if err != nil {
			t.Fatal(err)
		}
		want, _ := water{}.Direct(T) // IAPWS IF97, R12-08, R15-11, R1-76(2014)
		for _, c := range []struct {
			name      string
			got, want float64
		}{
			{"p", got.P, want.P}, {"rho_l", got.RhoL, want.RhoL}, {"rho_v", got.RhoV, want.RhoV},
			{"h_lv", got.Hlv, want.Hlv}, {"cp_l", got.CpL, want.CpL}, {"cp_v", got.CpV, want.CpV},
			{"mu_l", got.MuL, want.MuL}, {"mu_v", got.MuV, want.MuV}, {"k_l", got.KL, want.KL},
			{"k_v", got.KV, want.KV}, {"sigma", got.Sigma, want.Sigma},
		} {
			if math.Abs(c.got-c.want) > 1e-3*c.want {
				t.Errorf("%s(%.2f K) = %.6g, IAPWS %.6g", c.name, T, c.got, c.want)
			}
		}
		// h_l is not in the table: the integral of cp_l from 10 °C.
		w0, _ := water{}.Direct(in.Tmin)
		if d := got.HL - (want.HL - w0.HL); math.Abs(d) > 1e-3*want.Hlv {
			t.Errorf("h_l(%.2f K) off by %.4g J/kg from IAPWS", T, d)
		}
		back, err := f.AtP(got.P)
		if err != nil || math.Abs(back.T-T) > 1e-9*T || back.P != got.P {
			t.Errorf("AtP(AtT(%g).P) = %v, %v", T, back.T, err)
		}
	}
	// A row is reproduced exactly: 100 °C, 101.42 kPa, 958.354 kg/m³ (the file's row).
	s, err := f.AtT(373.15)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(s.P-101420) > 1e-6 || math.Abs(s.RhoL-958.354) > 1e-9 || math.Abs(s.MuV-12.232e-6) > 1e-15 {
		t.Errorf("AtT(373.15) = %+v, want the 100 °C row", s)
	}
	for _, T := range []float64{in.Tmin - 1e-6, in.Tmax + 1e-6, math.NaN(), math.Inf(1)} {
		var re *RangeError
		if _, err := f.AtT(T); !errors.As(err, &re) {
			t.Errorf("AtT(%g) error = %v, want *RangeError (no extrapolation)", T, err)
		}
	}
	for _, p := range []float64{1228.1, 1554.8e3, math.NaN(), 0} {
		var re *RangeError
		if _, err := f.AtP(p); !errors.As(err, &re) {
			t.Errorf("AtP(%g) error = %v, want *RangeError (no extrapolation)", p, err)
		}
	}
}

// csvHead is a valid header and rows for the rejection cases to spoil.
const csvHead = "T (K), p (kPa), rho_l (kg/m3), rho_v (kg/m3), h_lv (kJ/kg), cp_l (kJ/(kg K)), mu_l (mPa s), mu_v (uPa s), k_l (W/(m K)), sigma (mN/m)\n"

func csvRows(rows ...string) string { return csvHead + strings.Join(rows, "\n") + "\n" }

const (
	row1 = "300, 3.5, 996, 0.026, 2437, 4.18, 0.85, 9.9, 0.61, 71.7"
	row2 = "310, 6.2, 993, 0.044, 2414, 4.18, 0.69, 10.2, 0.62, 70.0"
	row3 = "320, 10.5, 989, 0.072, 2390, 4.18, 0.58, 10.5, 0.64, 68.5"
	row4 = "330, 17.2, 985, 0.11, 2366, 4.18, 0.49, 10.9, 0.65, 66.8"
)

func TestFromCSVMinimal(t *testing.T) {
	f, err := FromCSV(strings.NewReader(csvRows(row1, row2, row3, row4)), "mini")
	if err != nil {
		t.Fatal(err)
	}
	s, err := f.AtT(315)
	if err != nil {
		t.Fatal(err)
	}
	if s.CpV != 0 || s.KV != 0 || !(s.P > 6200 && s.P < 10500) || s.Hlv <= 0 {
		t.Errorf("AtT(315) = %+v", s)
	}
	if f.Info().Name != "mini" {
		t.Errorf("name %q", f.Info().Name)
	}
	// Brackets, aliases, a borrowed unit, comments and a "# name:" line used
	// when no name is given.
	text := "# name: bracketed\n# a plain comment: ignored\n" +
		"Tsat [degC], psat [bar], rho_liquid [kg/m3], rho_g, h_fg [J/g], cp_l [J/(g K)], eta_l [cP], mu_g [uPa s], lambda_l [mW/(m K)], surface_tension [N/m]\n" +
		"10, 0.012282, 999.654, 0.0094066, 2477.21, 4.1958, 1.306, 9.2384, 578.71, 0.074221\n" +
		"# a comment between rows\n" +
		"20, 0.023392, 998.161, 0.017313, 2453.55, 4.1851, 1.0016, 9.5441, 597.95, 0.072736\n" +
		"30, 0.042467, 995.609, 0.030412, 2429.84, 4.1803, 0.79722, 9.8602, 614.34, 0.071194\n" +
		"\n" +
		"40, 0.073844, 992.183, 0.051237, 2406, 4.1788, 0.65272, 10.185, 628.45, 0.069596\n"
	f, err = FromCSV(strings.NewReader(text), "")
	if err != nil {
		t.Fatal(err)
	}
	if f.Info().Name != "bracketed" || math.Abs(f.Info().Tmin-283.15) > 1e-9 {
		t.Errorf("Info() = %+v", f.Info())
	}
	// The 20 °C row in SI, as written in the table above.
	s, err = f.AtT(293.15)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name      string
		got, want float64
	}{
		{"p", s.P, 2339.2}, {"rho_v", s.RhoV, 0.017313}, {"h_lv", s.Hlv, 2453.55e3}, {"cp_l", s.CpL, 4185.1},
		{"mu_l", s.MuL, 1.0016e-3}, {"mu_v", s.MuV, 9.5441e-6}, {"k_l", s.KL, 0.59795}, {"sigma", s.Sigma, 0.072736},
	} {
		if math.Abs(c.got-c.want) > 1e-9*c.want {
			t.Errorf("%s = %.8g, want %.8g", c.name, c.got, c.want)
		}
	}
}

func TestFromCSVRejects(t *testing.T) {
	for _, c := range []struct{ name, text, want string }{
		{"not a number", csvRows(row1, row2, "320, 10.5, 989, 1.2x, 2390, 4.18, 0.58, 10.5, 0.64, 68.5", row4),
			`line 4, column 4 (rho_v): not a number "1.2x"`},
		{"missing column", strings.Replace(csvRows(row1, row2, row3, row4), ", sigma (mN/m)", "", 1),
			"line 1: missing column sigma"},
		{"duplicate column", strings.Replace(csvRows(row1, row2, row3, row4), "sigma (mN/m)", "rho_g (kg/m3)", 1),
			"line 1, column 10 (rho_g): duplicate column: rho_v is also column 4"},
		{"unknown column", strings.Replace(csvRows(row1, row2, row3, row4), "sigma (mN/m)", "zeta (mN/m)", 1),
			`line 1, column 10 (zeta): unknown column "zeta"`},
		{"wrong dimension", strings.Replace(csvRows(row1, row2, row3, row4), "p (kPa)", "p (kJ/kg)", 1),
			`line 1, column 2 (p): unit "kJ/kg" is not a pressure, as p needs`},
		{"no unit", strings.Replace(csvRows(row1, row2, row3, row4), "T (K)", "T", 1),
			`line 1, column 1 (T): no unit`},
		{"bad unit", strings.Replace(csvRows(row1, row2, row3, row4), "T (K)", "T (kelvinz)", 1),
			`line 1, column 1 (T): unit "kelvinz"`},
		{"temperature not increasing", csvRows(row1, row3, row2, row4),
			"line 4, column 1 (T): temperatures must increase down the table (previous row, line 3, has 320 K, this one 310 K)"},
		{"pressure not increasing", csvRows(row1, row2, "320, 6.0, 989, 0.072, 2390, 4.18, 0.58, 10.5, 0.64, 68.5", row4),
			"line 4, column 2 (p): pressure must increase with temperature (previous row, line 3, has 6200 Pa, this one 6000 Pa)"},
		{"too few rows", csvRows(row1, row2, row3), "3 data rows; at least 4 are needed"},
		{"non-positive", csvRows(row1, row2, "320, 10.5, 989, 0.072, 2390, 4.18, 0.58, 10.5, 0.64, 0", row4),
			"line 4, column 10 (sigma): sigma must be positive, got 0"},
		{"negative kelvin", csvRows("-5, 3.5, 996, 0.026, 2437, 4.18, 0.85, 9.9, 0.61, 71.7", row2, row3, row4),
			"line 2, column 1 (T): temperature -5 is not above absolute zero"},
		{"temperatures too close", csvRows(row1, row2, row3, strings.Replace(row4, "330", "320.00000000000006", 1)),
			"line 5, column 1 (T): temperature 320.00000000000006 K is too close to the previous row's 320 K"},
		{"field count", csvRows(row1, row2, row3+", 7", row4), "line 4: 11 fields, but the header names 10 columns"},
		{"NaN value", csvRows(row1, row2, strings.Replace(row3, "989", "NaN", 1), row4),
			`line 4, column 3 (rho_l): not a number "NaN"`},
		{"no header", "# only a comment\n", "no header row"},
		{"bad critical", "# critical: 400 K\n" + csvRows(row1, row2, row3, row4),
			"line 1: critical: want a temperature and a pressure"},
		{"critical below table", "# critical: 320 K, 3 MPa\n" + csvRows(row1, row2, row3, row4),
			"line 6: temperature 330 K is not below the critical temperature 320 K"},
		{"bad molar mass", "# molar_mass: 18 kJ\n" + csvRows(row1, row2, row3, row4),
			`line 1: molar_mass: unit "kJ" is not`},
	} {
		t.Run(c.name, func(t *testing.T) {
			f, err := FromCSV(strings.NewReader(c.text), "bad")
			var te *TableError
			if !errors.As(err, &te) {
				t.Fatalf("FromCSV = %v, %v; want *TableError", f, err)
			}
			if !strings.Contains(err.Error(), c.want) {
				t.Errorf("error %q\nwant it to contain %q", err, c.want)
			}
		})
	}
}

func TestLoadCSVErrorNamesFile(t *testing.T) {
	if _, err := LoadCSV("no/such/file.csv"); err == nil {
		t.Error("LoadCSV of a missing file: no error")
	}
	dir := t.TempDir()
	path := dir + "/bad.csv"
	if err := writeFile(path, csvRows(row1, row2, "320, x, 989, 0.072, 2390, 4.18, 0.58, 10.5, 0.64, 68.5", row4)); err != nil {
		t.Fatal(err)
	}
	_, err := LoadCSV(path)
	if err == nil || !strings.HasPrefix(err.Error(), path+": line 4, column 2 (p)") {
		t.Errorf("error %v, want it to start with the path and location", err)
	}
}

func writeFile(path, text string) error { return os.WriteFile(path, []byte(text), 0o644) }

// A table reads the same with lines ended by "\r\n" or a lone "\r" (as
// editors on other systems save them) as with "\n", and its errors count
// lines as the editor does.
func TestFromCSVLineEnds(t *testing.T) {
	lf := "# name: ends\n" + csvRows(row1, row2, row3, row4)
	want, err := FromCSV(strings.NewReader(lf), "")
	if err != nil {
		t.Fatal(err)
	}
	for _, end := range []string{"\r\n", "\r"} {
		text := strings.ReplaceAll(lf, "\n", end)
		got, err := FromCSV(strings.NewReader(text), "")
		if err != nil {
			t.Fatalf("%q line ends: %v", end, err)
		}
		if gi, wi := got.Info(), want.Info(); gi.Name != wi.Name || gi.Tmin != wi.Tmin || gi.Tmax != wi.Tmax {
			t.Errorf("%q line ends: Info %+v, want %+v", end, got.Info(), want.Info())
		}
		a, _ := got.AtT(315)
		b, _ := want.AtT(315)
		if a != b {
			t.Errorf("%q line ends: AtT(315) = %+v, want %+v", end, a, b)
		}
		bad := strings.ReplaceAll(csvRows(row1, row2, strings.Replace(row3, "989", "98x", 1), row4), "\n", end)
		if _, err := FromCSV(strings.NewReader(bad), ""); err == nil || err.Error() != `line 4, column 3 (rho_l): not a number "98x"` {
			t.Errorf("%q line ends: error %v, want it on line 4", end, err)
		}
	}
}

// Every bad cell of the rows is reported, in the order of the text, up to
// MaxTableErrors and then a count of the rest; a bad row does not hide the
// rows after it.
func TestFromCSVEveryError(t *testing.T) {
	text := csvRows(row1, strings.Replace(row2, "6.2", "six", 1), row3, strings.Replace(strings.Replace(row4, "985", "-985", 1), "66.8", "x", 1))
	_, err := FromCSV(strings.NewReader(text), "bad")
	var tes *TableErrors
	if !errors.As(err, &tes) {
		t.Fatalf("error %v, want *TableErrors", err)
	}
	want := []string{
		`line 3, column 2 (p): not a number "six"`,
		"line 5, column 3 (rho_l): rho_l must be positive, got -985",
		`line 5, column 10 (sigma): not a number "x"`,
	}
	if got := err.Error(); got != strings.Join(want, "\n") {
		t.Errorf("errors\n%s\nwant\n%s", got, strings.Join(want, "\n"))
	}

	rows := []string{row1}
	for i := 0; i < 30; i++ {
		rows = append(rows, fmt.Sprintf("%d, x, 993, 0.044, 2414, 4.18, 0.69, 10.2, 0.62, 70.0", 310+i))
	}
	_, err = FromCSV(strings.NewReader(csvRows(rows...)), "bad")
	if !errors.As(err, &tes) || tes.Len() != 30 || len(tes.List()) != MaxTableErrors+1 {
		t.Fatalf("30 bad cells: %v", err)
	}
	if last := tes.List()[MaxTableErrors]; last.Line != 23 || last.Msg != "10 more errors not shown" {
		t.Errorf("last error %q on line %d, want the count of the other 10 on line 23", last.Msg, last.Line)
	}
}

// A file's errors each name the file.
func TestLoadCSVErrorsNameFile(t *testing.T) {
	path := t.TempDir() + "/bad.csv"
	if err := writeFile(path, csvRows(row1, strings.Replace(row2, "6.2", "y", 1), strings.Replace(row3, "10.5", "x", 1), row4)); err != nil {
		t.Fatal(err)
	}
	_, err := LoadCSV(path)
	lines := strings.Split(fmt.Sprint(err), "\n")
	if len(lines) != 2 || !strings.HasPrefix(lines[0], path+": line 3, column 2 (p)") || !strings.HasPrefix(lines[1], path+": line 4, column 2 (p)") {
		t.Errorf("errors %q, want two, each with the path and location", lines)
	}
}
