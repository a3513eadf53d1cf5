package output

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"math"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"circa/check/flow"
	"circa/lang"
)

// exampleFiles are every loop file shipped as an example or test scenario.
func exampleFiles(t *testing.T) []string {
	t.Helper()
	var files []string
	for _, g := range []string{"../../testdata/examples/*.loop", "../../testdata/flow/*.loop", "../../testdata/plot/*.loop"} {
		fs, err := filepath.Glob(g)
		if err != nil {
			t.Fatal(err)
		}
		files = append(files, fs...)
	}
	if len(files) < 7 {
		t.Fatalf("only %d example files", len(files))
	}
	return files
}

func estimateFile(t *testing.T, path string, opts flow.Options) *flow.Result {
	t.Helper()
	m := lang.Load(path, lang.OSFS{})
	for _, d := range m.Diags {
		if d.Severity == lang.Error {
			t.Fatalf("%s: %s", path, d.Message())
		}
	}
	res, err := flow.Estimate(m, opts)
	if err != nil {
		t.Fatal(err)
	}
	return res
}

// The pressure budget follows one sign convention in every format: the
// terms of a row add up to its total, and around a closed loop the totals
// add up to zero (a steady momentum balance: ∮dp = 0 around any closed
// path). Checked for every example in JSON, CSV and text.
func TestBudgetAddsUp(t *testing.T) {
	for _, path := range exampleFiles(t) {
		t.Run(filepath.Base(path), func(t *testing.T) {
			res := estimateFile(t, path, flow.Options{NoTilt: true, Sweep: &flow.Sweep{Pitch: []float64{0.2}}})
			var js, cs, txt bytes.Buffer
			if err := EstimateJSON(&js, res); err != nil {
				t.Fatal(err)
			}
			if err := EstimateCSV(&cs, res); err != nil {
				t.Fatal(err)
			}
			if err := EstimateText(&txt, res, nil); err != nil {
				t.Fatal(err)
			}
			n := checkJSONBudget(t, js.Bytes())
			if n == 0 {
				t.Fatal("no case circulates: nothing to sum")
			}
			if c := checkCSVBudget(t, cs.String()); c != n {
				t.Errorf("CSV has %d case budgets, JSON %d", c, n)
			}
			if c := checkTextBudget(t, txt.String()); c != n-sweepPoints(res) {
				t.Errorf("text has %d budget tables, want %d (sweep points are a table row)", c, n-sweepPoints(res))
			}
		})
	}
}

func sweepPoints(res *flow.Result) int {
	n := 0
	for _, l := range res.Loops {
		for _, c := range l.Cases {
			if c.Grid && c.Circulates && len(c.Components) > 0 {
				n++
			}
		}
	}
	return n
}

// near compares a sum with its total, to a tolerance scaled by the terms.
func near(sum, total, scale float64) bool {
	return math.Abs(sum-total) <= 1e-9*math.Max(scale, 1)
}

type jsonBudget struct {
	Friction, Gravity, Acceleration, AreaChange, Local, Total float64
}

func (b jsonBudget) terms() []float64 {
	return []float64{b.Friction, b.Gravity, b.Acceleration, b.AreaChange, b.Local}
}

func sumAbs(v []float64) (s, a float64) {
	for _, x := range v {
		s += x
		a += math.Abs(x)
	}
	return
}

func checkJSONBudget(t *testing.T, doc []byte) int {
	t.Helper()
	var r struct {
		Loops []struct {
			Network bool
			Cases   []struct {
				Case       string
				Circulates bool
				MassFlow   float64 `json:"mass_flow"`
				Components []struct {
					Component string
					MassFlow  float64 `json:"mass_flow"`
					DpGravity float64 `json:"dp_gravity"`
					DpTotal   float64 `json:"dp_total"`
					Budget    struct {
						jsonBudget
						AreaChange float64 `json:"area_change"`
					}
				}
				Totals struct {
					Budget struct {
						jsonBudget
						AreaChange float64 `json:"area_change"`
					}
				}
			}
		}
	}
	if err := json.Unmarshal(doc, &r); err != nil {
		t.Fatal(err)
	}
	n := 0
	for _, l := range r.Loops {
		for _, c := range l.Cases {
			if len(c.Components) == 0 {
				continue
			}
			n++
			var col [6]float64
			scale := 0.0
			for _, s := range c.Components {
				b := s.Budget.jsonBudget
				b.AreaChange = s.Budget.AreaChange
				sum, abs := sumAbs(b.terms())
				scale += abs
				if !near(sum, b.Total, abs) || !near(b.Total, s.DpTotal, abs) || !near(b.Gravity, -s.DpGravity, abs) {
					t.Errorf("JSON %s %s: terms %v add up to %g, total %g, dp_total %g", c.Case, s.Component, b.terms(), sum, b.Total, s.DpTotal)
				}
				w := 1.0
				if l.Network {
					w = math.Abs(s.MassFlow) / c.MassFlow
				}
				for k, v := range append(b.terms(), b.Total) {
					col[k] += w * v
				}
			}
			tb := c.Totals.Budget.jsonBudget
			tb.AreaChange = c.Totals.Budget.AreaChange
			for k, v := range append(tb.terms(), tb.Total) {
				if !near(col[k], v, scale) {
					t.Errorf("JSON %s: column %d adds up to %g, the total row says %g", c.Case, k, col[k], v)
				}
			}
			if sum, _ := sumAbs(tb.terms()); !near(sum, tb.Total, scale) || math.Abs(tb.Total) > 1e-6*scale {
				t.Errorf("JSON %s: total row %v, total %g: not zero around the loop", c.Case, tb.terms(), tb.Total)
			}
		}
	}
	return n
}

func checkCSVBudget(t *testing.T, text string) int {
	t.Helper()
	rd := csv.NewReader(strings.NewReader(text))
	rd.Comment = '#'
	recs, err := rd.ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	col := map[string]int{}
	for i, h := range recs[0] {
		col[h] = i
	}
	drops := []string{"drop_friction_Pa", "drop_gravity_Pa", "drop_acceleration_Pa", "drop_area_change_Pa", "drop_local_Pa"}
	num := func(rec []string, name string) float64 {
		v, err := strconv.ParseFloat(rec[col[name]], 64)
		if err != nil {
			t.Fatalf("column %s: %q", name, rec[col[name]])
		}
		return v
	}
	n, margins := 0, 0
	for _, rec := range recs[1:] {
		switch rec[0] {
		case "component", "total":
			if rec[0] == "total" && rec[col["drop_total_Pa"]] == "" {
				continue // no circulation: no budget
			}
			var terms []float64
			for _, d := range drops {
				terms = append(terms, num(rec, d))
			}
			sum, abs := sumAbs(terms)
			// Eight significant digits per term.
			if tot := num(rec, "drop_total_Pa"); math.Abs(sum-tot) > 1e-7*math.Max(abs, 1) {
				t.Errorf("CSV %v: terms add up to %g, total %g", rec[:3], sum, tot)
			}
			if rec[0] == "total" {
				n++
				if tot := num(rec, "drop_total_Pa"); math.Abs(tot) > 1e-6*math.Max(abs, 1) {
					t.Errorf("CSV %v: total %g is not zero around the loop", rec[:4], tot)
				}
			}
		case "margin":
			margins++
			if rec[col["margin"]] == "" || rec[col["status"]] == "" {
				t.Errorf("CSV margin row without a name or status: %v", rec)
			}
		default:
			t.Errorf("CSV row of unknown kind %q", rec[0])
		}
	}
	if margins == 0 {
		t.Error("CSV carries no margins")
	}
	return n
}

var budgetHead = regexp.MustCompile(`^\s+component\s+friction\s+gravity\s+acceleration\s+area change\s+local\s+total$`)

func checkTextBudget(t *testing.T, text string) int {
	t.Helper()
	lines := strings.Split(text, "\n")
	n := 0
	for i := 0; i < len(lines); i++ {
		if !budgetHead.MatchString(lines[i]) {
			continue
		}
		network := strings.Contains(lines[i-1], "share of the loop flow")
		if !strings.Contains(lines[i-1], "p_in − p_out") {
			t.Errorf("budget table without its sign convention: %q", lines[i-1])
		}
		n++
		var col [6]int
		for i++; i < len(lines); i++ {
			f := strings.Fields(lines[i])
			if len(f) != 7 {
				t.Fatalf("budget row %q", lines[i])
			}
			var v [6]int
			for k := range v {
				x, err := strconv.Atoi(f[k+1])
				if err != nil {
					t.Fatalf("budget row %q: %v", lines[i], err)
				}
				v[k] = x
			}
			if v[0]+v[1]+v[2]+v[3]+v[4] != v[5] {
				t.Errorf("text row %q does not add up", lines[i])
			}
			if f[0] == "total" {
				if v[5] != 0 {
					t.Errorf("text total row %q is not zero", lines[i])
				}
				if !network && v != col {
					t.Errorf("text total row %q, columns add up to %v", lines[i], col)
				}
				break
			}
			for k := range v {
				col[k] += v[k]
			}
		}
	}
	return n
}

// No number in any format prints as a negative zero.
func TestNoNegativeZero(t *testing.T) {
	negZero := regexp.MustCompile(`(^|[^0-9.e])-0(\.0*)?([^0-9.]|$)`)
	for _, path := range exampleFiles(t) {
		res := estimateFile(t, path, flow.Options{NoTilt: true})
		for name, write := range map[string]func(*bytes.Buffer) error{
			"text": func(b *bytes.Buffer) error { return EstimateText(b, res, nil) },
			"json": func(b *bytes.Buffer) error { return EstimateJSON(b, res) },
			"csv":  func(b *bytes.Buffer) error { return EstimateCSV(b, res) },
		} {
			var b bytes.Buffer
			if err := write(&b); err != nil {
				t.Fatal(err)
			}
			for _, line := range strings.Split(b.String(), "\n") {
				if negZero.MatchString(line) {
					t.Errorf("%s %s: negative zero in %q", filepath.Base(path), name, line)
				}
			}
		}
	}
}

func TestFixed(t *testing.T) {
	for _, c := range []struct {
		v    float64
		prec int
		want string
	}{{-0.0001, 3, "0.000"}, {-0.4, 0, "0"}, {math.Copysign(0, -1), 1, "0.0"}, {-0.0006, 3, "-0.001"}, {2.5, 1, "2.5"}} {
		if got := fixed(c.v, c.prec); got != c.want {
			t.Errorf("fixed(%g, %d) = %q, want %q", c.v, c.prec, got, c.want)
		}
	}
}

// roundToSum keeps the sum and moves each value by less than one.
func TestRoundToSum(t *testing.T) {
	for _, vals := range [][]float64{{0.4, 0.4, 0.4, -1.2}, {812.99, 561.15, 1311.17, -545.72, 0}, {-0.5, -0.5, 1}, {}} {
		s := 0.0
		for _, v := range vals {
			s += v
		}
		total := int(math.Round(s))
		got := roundToSum(vals, total)
		sum := 0
		for i, g := range got {
			sum += g
			if math.Abs(float64(g)-vals[i]) >= 1 {
				t.Errorf("%v: %d moved by a unit or more", vals, g)
			}
		}
		if sum != total {
			t.Errorf("%v → %v adds up to %d, want %d", vals, got, sum, total)
		}
	}
}

// Design pressures print as written: a gauge rating stays gauge and says
// so; an absolute one is labelled absolute. 1 standard atmosphere =
// 101325 Pa (CGPM 1954).
func TestPressureAsWritten(t *testing.T) {
	for _, c := range []struct {
		pa      float64
		written string
		want    string
	}{{501325, "bar(g)", "4.00 bar(g)"}, {500000, "bar", "5.00 bar abs"}, {500000, "bar(a)", "5.00 bar(a)"}, {500000, "", "5.00 bar abs"}, {101325 + 6894.757, "psig", "1.00 psig"}} {
		if got := pressureAs(c.pa, c.written); got != c.want {
			t.Errorf("pressureAs(%g, %q) = %q, want %q", c.pa, c.written, got, c.want)
		}
	}
	res := estimateFile(t, "../../testdata/examples/rack-door.loop", flow.Options{NoTilt: true})
	var b bytes.Buffer
	EstimateText(&b, res, nil)
	if !regexp.MustCompile(`design_pressure\s+\S+ bar\(g\)\s+4\.00 bar\(g\)`).MatchString(b.String()) {
		t.Errorf("design pressure not as written (4 bar(g)):\n%s", b.String())
	}
}

func TestChargeSummary(t *testing.T) {
	for _, c := range []struct {
		r    flow.ChargeRange
		want string
	}{
		{flow.ChargeRange{Charge: 0.4, Low: 0.35, High: 0.45, LowCase: "cool", HighCase: "hot"}, "inside, 0.05 kg above the low end and 0.05 kg below the high end"},
		{flow.ChargeRange{Charge: 0.3, Low: 0.35, High: 0.45, LowCase: "cool", HighCase: "hot"}, "outside, 0.05 kg short"},
		{flow.ChargeRange{Charge: 0.5, Low: 0.35, High: 0.45, LowCase: "cool", HighCase: "hot", HighPoint: "pitch +10.0°, roll 0.0°"}, "outside, 0.05 kg over"},
		{flow.ChargeRange{Charge: 0.4, Low: 0.45, High: 0.35, LowCase: "cool", HighCase: "hot"}, "no charge suits every case"},
	} {
		got := ChargeSummary(&c.r)
		if !strings.Contains(got, c.want) || !strings.Contains(got, "set by cool") {
			t.Errorf("%+v: %q lacks %q", c.r, got, c.want)
		}
	}
}

// Several stable balances are listed, the reported one named, the case
// flagged. The throttled loop has three balances (TestLedineggLoop in
// check/flow works them out by hand).
func TestSeveralOperatingPoints(t *testing.T) {
	res := estimateFile(t, "../../testdata/flow/ledinegg.loop", flow.Options{NoTilt: true})
	var b bytes.Buffer
	EstimateText(&b, res, nil)
	out := b.String()
	c := res.Loops[0].Cases[0]
	if len(StableRoots(&c)) < 2 {
		t.Fatalf("want two stable balances, have %+v", c.Roots)
	}
	for _, want := range []string{"[several operating points]", "balances: stable at ", "statically unstable", "reported: " + fixed(c.MassFlow*1e3, 2) + " g/s", "depends on its history"} {
		if !strings.Contains(out, want) {
			t.Errorf("missing %q in\n%s", want, out)
		}
	}
}

// A sweep prints one row per point; the worst margins name the point.
func TestSweepTable(t *testing.T) {
	sw := &flow.Sweep{Pitch: []float64{0, 20 * math.Pi / 180, 40 * math.Pi / 180}}
	res := estimateFile(t, "../../testdata/examples/forestry-inverter.loop", flow.Options{NoTilt: true, Case: "level_work", Sweep: sw})
	var b bytes.Buffer
	EstimateText(&b, res, nil)
	out := b.String()
	if strings.Count(out, "\ncase ") != 1 || !strings.Contains(out, "sweep of case level_work: 3 points") {
		t.Fatalf("sweep not a table:\n%s", out)
	}
	for _, p := range []string{"  0.0°", "  +20.0°", "  +40.0°"} {
		if !strings.Contains(out, "\n"+p) {
			t.Errorf("no row for pitch %s:\n%s", p, out)
		}
	}
	// The exit quality is worst at the steepest pitch tried (less head,
	// less flow): the worst table names that point, not the base case.
	if !regexp.MustCompile(`exit_quality\s+level_work at pitch \+40\.0°, roll 0\.0°`).MatchString(out) {
		t.Errorf("worst exit quality not attributed to the sweep point:\n%s", out)
	}
}

// The tilt lines say where the first margin fails, not only where the flow
// stops.
func TestTiltLineFirstFailure(t *testing.T) {
	path := "../../testdata/examples/forestry-inverter.loop"
	m := lang.Load(path, lang.OSFS{})
	res := estimateFile(t, path, flow.Options{Case: "level_work"})
	var stages []string
	env := TiltEnvelopes(m, res, func(s string) { stages = append(stages, s) })
	var b bytes.Buffer
	if err := EstimateText(&b, res, env); err != nil {
		t.Fatal(err)
	}
	line := regexp.MustCompile(`(?m)^  tilt: circulation stops at .*; first margin to fail: pitch \+\d+\.\d° \(exit_quality cold_plate\), pitch -\d+\.\d° .*\(5° steps\)$`)
	if !line.MatchString(b.String()) || len(stages) != 1 {
		t.Errorf("tilt line (stages %v):\n%s", stages, b.String())
	}
}

// A range's ends keep the same decimals, three significant digits of the
// larger end, so a trailing zero is never dropped from one end only.
func TestSigRange(t *testing.T) {
	for _, c := range []struct {
		lo, hi float64
		want   string
	}{
		{0.172, 0.21, "0.172–0.210"},
		{0.17, 0.208, "0.170–0.208"},
		{0.335, 0.431, "0.335–0.431"},
		{0.0415, 0.9996, "0.04–1.00"},
		{12.34, 150, "12–150"},
		{1234, 1500, "1234–1500"},
		{0, 0, "0–0"},
	} {
		if got := sigRange(c.lo, c.hi, 3); got != c.want {
			t.Errorf("sigRange(%g, %g) = %q, want %q", c.lo, c.hi, got, c.want)
		}
	}
}

// Every charge range an estimate prints shows its ends to the same
// decimals: one end without its trailing zero reads as a cruder figure.
func TestChargeRangeDecimals(t *testing.T) {
	re := regexp.MustCompile(`(\d+(?:\.(\d*))?)–(\d+(?:\.(\d*))?) kg`)
	for _, path := range exampleFiles(t) {
		res := estimateFile(t, path, flow.Options{NoTilt: true})
		var b bytes.Buffer
		if err := EstimateText(&b, res, nil); err != nil {
			t.Fatal(err)
		}
		for _, m := range re.FindAllStringSubmatch(b.String(), -1) {
			if len(m[2]) != len(m[4]) {
				t.Errorf("%s: charge range %q has ends of different decimals", filepath.Base(path), m[0])
			}
		}
	}
}

// The local-saturation table's pressures share their decimals, so the
// column lines up and no row shows more digits than the others (a
// pressure of 8.386 kPa under 18.56 kPa read as the better known).
func TestLocalPressureColumn(t *testing.T) {
	seen := 0
	for _, path := range exampleFiles(t) {
		res := estimateFile(t, path, flow.Options{NoTilt: true})
		var b bytes.Buffer
		if err := EstimateText(&b, res, nil); err != nil {
			t.Fatal(err)
		}
		lines := strings.Split(b.String(), "\n")
		for i := 0; i < len(lines); i++ {
			if !strings.Contains(lines[i], "local saturation") || !strings.Contains(lines[i], "p in kPa") {
				continue
			}
			dec := -1
			for _, row := range lines[i+1:] {
				f := strings.Fields(row)
				if len(f) < 4 || strings.HasSuffix(f[0], ":") || f[0] == "pressure" {
					break
				}
				d := 0
				if k := strings.IndexByte(f[1], '.'); k >= 0 {
					d = len(f[1]) - k - 1
				}
				if dec >= 0 && d != dec {
					t.Errorf("%s: pressure %s has %d decimals, the row above %d:\n%s", filepath.Base(path), f[1], d, dec, strings.Join(lines[i:i+6], "\n"))
				}
				dec = d
				seen++
			}
		}
	}
	if seen == 0 {
		t.Fatal("no local-saturation table in the examples")
	}
}

// A figure compared with another keeps its trailing zeros, so both show
// the same number of significant digits.
func TestSigZeros(t *testing.T) {
	for _, c := range []struct {
		v    float64
		want string
	}{{3.1, "3.10"}, {4.234, "4.23"}, {-36.31, "-36.3"}, {0, "0.00"}, {12345, "12345"}, {0.9996, "1.00"}} {
		if got := sigZeros(c.v, 3); got != c.want {
			t.Errorf("sigZeros(%g, 3) = %q, want %q", c.v, got, c.want)
		}
	}
}

// The inventory, the reservoirs' liquid and the transit time print to
// three significant digits, trailing zeros kept (0.100 kg, 3.20 s), as the
// other estimates do.
func TestTotalsFigures(t *testing.T) {
	re := regexp.MustCompile(`inventory (\S+) kg \(\+ (\S+) kg in reservoirs\)|transit time round the loop (\S+) s`)
	figures := func(s string) int {
		s = strings.TrimLeft(strings.ReplaceAll(strings.TrimPrefix(s, "-"), ".", ""), "0")
		return len(s)
	}
	for _, path := range exampleFiles(t) {
		res := estimateFile(t, path, flow.Options{NoTilt: true})
		var b bytes.Buffer
		if err := EstimateText(&b, res, nil); err != nil {
			t.Fatal(err)
		}
		for _, m := range re.FindAllStringSubmatch(b.String(), -1) {
			for _, v := range m[1:] {
				if v != "" && v != "0" && figures(v) < 3 {
					t.Errorf("%s: %q shows %s to fewer than three figures", filepath.Base(path), m[0], v)
				}
			}
		}
	}
}
