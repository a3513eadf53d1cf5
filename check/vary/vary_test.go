package vary

import (
	"context"
	"errors"
	"math"
	"reflect"
	"strings"
	"testing"

	"circa/check/flow"
	"circa/lang"
)

func TestParse(t *testing.T) {
	for _, tc := range []struct {
		spec    string
		param   string
		si      []float64
		written []string
		unit    string
	}{
		// 1 mm = 1e-3 m (SI Brochure 9th ed., table 7); eight values evenly
		// spaced from 6 to 20 mm are 2 mm apart.
		{"riser_bore=6mm..20mm:8", "riser_bore", []float64{0.006, 0.008, 0.010, 0.012, 0.014, 0.016, 0.018, 0.020},
			[]string{"6 mm", "8 mm", "10 mm", "12 mm", "14 mm", "16 mm", "18 mm", "20 mm"}, "mm"},
		{"riser_bore = 6..20 mm : 3", "riser_bore", []float64{0.006, 0.013, 0.020}, []string{"6 mm", "13 mm", "20 mm"}, "mm"},
		// T/K = t/°C + 273.15 (SI Brochure 9th ed., 2.3.1).
		{"sink=20degC..40degC:3", "sink", []float64{293.15, 303.15, 313.15}, []string{"20 degC", "30 degC", "40 degC"}, "degC"},
		{"sink=20degC,25degC,35degC", "sink", []float64{293.15, 298.15, 308.15}, []string{"20 degC", "25 degC", "35 degC"}, "degC"},
		// 1 kW = 1000 W (SI prefix kilo).
		{"heat=1.5kW,2000W", "heat", []float64{1500, 2000}, []string{"1.5 kW", "2 kW"}, "kW"},
		{"ratio=0.5..1.5:3", "ratio", []float64{0.5, 1, 1.5}, []string{"0.5", "1", "1.5"}, ""},
		{"h=1.6m..0.6m:3", "h", []float64{1.6, 1.1, 0.6}, []string{"1.6 m", "1.1 m", "0.6 m"}, "m"},
	} {
		a, err := Parse(tc.spec)
		if err != nil {
			t.Errorf("%q: %v", tc.spec, err)
			continue
		}
		if a.Param != tc.param || a.Unit != tc.unit || len(a.Values) != len(tc.si) {
			t.Errorf("%q: %+v", tc.spec, a)
			continue
		}
		for i, v := range a.Values {
			if math.Abs(v.Value.SI-tc.si[i]) > 1e-12*math.Max(1, tc.si[i]) || v.Written() != tc.written[i] || v.Name != tc.param {
				t.Errorf("%q value %d: %g %q, want %g %q", tc.spec, i, v.Value.SI, v.Written(), tc.si[i], tc.written[i])
			}
		}
	}
}

func TestParseErrors(t *testing.T) {
	for _, tc := range []struct {
		spec string
		col  int
		want string
	}{
		{"riser_bore", 1, "want NAME=FROM..TO:N"},
		{"9x=1m..2m:3", 1, "not a parameter name"},
		{"bore=", 6, "no values"},
		{"bore=6mm..20mm", 15, "needs its number of values"},
		{"bore=6mm..20mm:1", 16, "from 2 to 101"},
		{"bore=6mm..20mm:x", 16, "from 2 to 101"},
		{"bore=6mm..20mm:500", 16, "from 2 to 101"},
		{"bore=6mm..20qq:5", 11, "unknown unit"},
		{"bore=6kg..20mm:5", 11, "a mass but 20mm is a length"},
		{"bore=..20mm:5", 6, "a value is missing"},
		{"bore=6mm..6mm:5", 11, "the range is empty"},
		{"bore=6mm,,8mm", 10, "a value is missing"},
		{"bore=6mm, 8kg", 10, "8kg is a mass but the first value is a length"},
		{"bore=6mm..other:3", 11, "other is a name"},
	} {
		_, err := Parse(tc.spec)
		var se *SpecError
		if !errors.As(err, &se) || se.Col != tc.col || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%q: got %v (column %v), want column %d and %q", tc.spec, err, colOf(se), tc.col, tc.want)
		}
	}
}

func colOf(se *SpecError) any {
	if se == nil {
		return nil
	}
	return se.Col
}

func FuzzParse(f *testing.F) {
	for _, s := range []string{"riser_bore=6mm..20mm:8", "sink=20degC,30degC", "a=1..2:2", "a=..:", "a=1,", "=", "a=1e300 m..1 m:3"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		a, err := Parse(s)
		if err != nil {
			return
		}
		if len(a.Values) == 0 || len(a.Values) > MaxValues {
			t.Fatalf("%q: %d values", s, len(a.Values))
		}
		for _, v := range a.Values {
			if math.IsNaN(v.Value.SI) || math.Abs(v.Value.SI) > lang.ModelRange || v.Value.Dim != a.Values[0].Value.Dim {
				t.Fatalf("%q: value %+v", s, v)
			}
		}
	})
}

const rackDoor = "../../testdata/examples/rack-door.loop"

// A sweep point is the estimate of the variant: at the file's own value
// it is the plain estimate's worst margins.
func TestRunMatchesEstimate(t *testing.T) {
	m := lang.Load(rackDoor, nil)
	a, err := Parse("lift=0.8m..1.2m:3")
	if err != nil {
		t.Fatal(err)
	}
	res, err := Run(context.Background(), m, []Axis{a}, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Points) != 3 || len(res.Params) != 1 || res.Params[0].Dimension != "length" || res.Params[0].FileWritten != "1.2 m" || res.Tilt {
		t.Fatalf("result %+v", res)
	}
	est, err := flow.Estimate(m, flow.Options{NoTilt: true})
	if err != nil {
		t.Fatal(err)
	}
	last := res.Points[2]
	if last.Error != "" || len(last.Loops) != 1 || len(last.Loops[0].Margins) != len(est.Loops[0].Worst) {
		t.Fatalf("point %+v", last)
	}
	for _, w := range est.Loops[0].Worst {
		found := false
		for _, mg := range last.Loops[0].Margins {
			if reflect.DeepEqual(mg, w) {
				found = true
			}
		}
		if !found {
			t.Errorf("margin %+v of the estimate not at the point of the file's value", w)
		}
	}
	// A lower coil leaves less room for the charge: its use grows.
	use := func(p Point) float64 {
		for _, mg := range p.Loops[0].Margins {
			if mg.Margin == flow.MarginCharge {
				return mg.Use
			}
		}
		t.Fatal("no charge margin")
		return 0
	}
	if !(use(res.Points[0]) > use(res.Points[2])) {
		t.Errorf("charge use %g at 0.8 m, %g at 1.2 m", use(res.Points[0]), use(res.Points[2]))
	}
	if lim := last.Loops[0].Limiting; lim == nil {
		t.Error("no limiting margin")
	} else {
		for _, mg := range last.Loops[0].Margins {
			if mg.Use > lim.Use {
				t.Errorf("limiting %s %g below %s %g", lim.Margin, lim.Use, mg.Margin, mg.Use)
			}
		}
	}
}

func TestRunGrid(t *testing.T) {
	m := lang.Load(rackDoor, nil)
	a, _ := Parse("lift=1m,1.2m")
	b, _ := Parse("plate_height=0.3m..0.4m:3")
	res, err := Run(context.Background(), m, []Axis{a, b}, Options{Workers: 2})
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Points) != 6 {
		t.Fatalf("%d points", len(res.Points))
	}
	for k, p := range res.Points {
		i, j := k/3, k%3
		if !reflect.DeepEqual(p.Index, []int{i, j}) || p.Values[0] != a.Values[i].Value.SI || p.Values[1] != b.Values[j].Value.SI {
			t.Errorf("point %d: %+v", k, p)
		}
	}
}

func TestRunErrors(t *testing.T) {
	m := lang.Load(rackDoor, nil)
	a, _ := Parse("lfit=1m,1.2m")
	if _, err := Run(context.Background(), m, []Axis{a}, Options{}); err == nil || !strings.Contains(err.Error(), "did you mean lift?") {
		t.Errorf("unknown parameter: %v", err)
	}
	b, _ := Parse("lift=1kW,2kW")
	if _, err := Run(context.Background(), m, []Axis{b}, Options{}); err == nil || !strings.Contains(err.Error(), "expected a length") {
		t.Errorf("wrong dimension: %v", err)
	}
	c, _ := Parse("lift=1m,1.2m")
	if _, err := Run(context.Background(), m, []Axis{c, c}, Options{}); err == nil || !strings.Contains(err.Error(), "varied twice") {
		t.Errorf("twice: %v", err)
	}
	if _, err := Run(context.Background(), m, nil, Options{}); err == nil {
		t.Error("no axis accepted")
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := Run(ctx, m, []Axis{c}, Options{}); !errors.Is(err, context.Canceled) {
		t.Errorf("cancelled: %v", err)
	}
}
