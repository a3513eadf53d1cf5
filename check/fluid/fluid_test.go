package fluid

import (
	"errors"
	"math"
	"strings"
	"testing"
)

func TestLookupNames(t *testing.T) {
	for _, name := range []string{"water", "WATER", "R718", "r-718", "H2O", "h2o"} {
		f, err := Lookup(name)
		if err != nil {
			t.Errorf("Lookup(%q): %v", name, err)
			continue
		}
		if f.Info().Name != "water" {
			t.Errorf("Lookup(%q) = %q, want water", name, f.Info().Name)
		}
	}
	for _, name := range []string{"", "unobtainium", "R-99999", "water2"} {
		_, err := Lookup(name)
		var ue *UnknownError
		if !errors.As(err, &ue) {
			t.Errorf("Lookup(%q) error = %v, want *UnknownError", name, err)
			continue
		}
		if ue.Name != name || !strings.Contains(err.Error(), "water") {
			t.Errorf("Lookup(%q) error %q should name the input and list the built-in fluids", name, err)
		}
		if _, ok := Direct(name); ok {
			t.Errorf("Direct(%q) found a fluid", name)
		}
	}
	names := Names()
	if len(names) != len(List()) || len(names) == 0 {
		t.Fatalf("Names() = %v", names)
	}
	for i := 1; i < len(names); i++ {
		if names[i-1] >= names[i] {
			t.Errorf("Names() not in order: %q before %q", names[i-1], names[i])
		}
	}
}

// allFluids returns every built-in fluid and the demo user table.
func allFluids(t *testing.T) []Fluid {
	t.Helper()
	var out []Fluid
	for _, in := range List() {
		f, err := Lookup(in.Name)
		if err != nil {
			t.Errorf("Lookup(%q): %v", in.Name, err)
			continue
		}
		out = append(out, f)
	}
	f, err := LoadCSV(demoCSV)
	if err != nil {
		t.Fatal(err)
	}
	return append(out, f)
}

// checkSat fails unless every field is finite and every property but the
// enthalpies positive (CpV and KV may be zero for a user table without them).
// It reports whether the state passed, so that callers stop at the first bad one.
func checkSat(t *testing.T, name string, at float64, s Sat) bool {
	t.Helper()
	for i, v := range satFields(&s) {
		if math.IsNaN(*v) || math.IsInf(*v, 0) {
			t.Errorf("%s at %g: field %d is %g", name, at, i, *v)
			return false
		}
	}
	if s.T <= 0 || s.P <= 0 || s.RhoL <= 0 || s.RhoV <= 0 || s.Hlv <= 0 || s.CpL <= 0 || s.CpV < 0 ||
		s.MuL <= 0 || s.MuV <= 0 || s.KL <= 0 || s.KV < 0 || s.Sigma <= 0 {
		t.Errorf("%s at %g: non-physical state %+v", name, at, s)
		return false
	}
	if s.RhoV >= s.RhoL {
		t.Errorf("%s at %g: vapour density %g not below liquid density %g", name, at, s.RhoV, s.RhoL)
		return false
	}
	return true
}

// TestNoNaNInRangeErrorsOutside sweeps every fluid's range by temperature and
// by pressure and probes beyond it.
func TestNoNaNInRangeErrorsOutside(t *testing.T) {
	for _, f := range allFluids(t) {
		in := f.Info()
		t.Run(in.Name, func(t *testing.T) {
			for _, v := range []float64{in.MolarMass, in.Tc, in.Pc, in.RhoC, in.Tmin, in.Tmax} {
				if math.IsNaN(v) || math.IsInf(v, 0) || v < 0 {
					t.Errorf("Info() = %+v", in)
				}
			}
			if !(in.Tmin < in.Tmax) || (in.Tc > 0 && in.Tmax >= in.Tc) {
				t.Errorf("range %g to %g K with Tc %g K", in.Tmin, in.Tmax, in.Tc)
			}
			lo, err := f.AtT(in.Tmin)
			if err != nil {
				t.Fatal(err)
			}
			hi, err := f.AtT(in.Tmax)
			if err != nil {
				t.Fatal(err)
			}
			const n = 500
			for k := 0; k <= n; k++ {
				T := in.Tmin + (in.Tmax-in.Tmin)*float64(k)/n
				T = min(T, in.Tmax)
				s, err := f.AtT(T)
				if err != nil {
					t.Fatalf("AtT(%g): %v", T, err)
				}
				if !checkSat(t, in.Name+" AtT", T, s) {
					break
				}
				p := lo.P * math.Pow(hi.P/lo.P, float64(k)/n)
				p = min(max(p, lo.P), hi.P)
				s, err = f.AtP(p)
				if err != nil {
					t.Fatalf("AtP(%g): %v", p, err)
				}
				if !checkSat(t, in.Name+" AtP", p, s) {
					break
				}
				if s.T < in.Tmin || s.T > in.Tmax {
					t.Errorf("AtP(%g).T = %g outside the range", p, s.T)
				}
			}
			for _, T := range []float64{math.NaN(), math.Inf(1), math.Inf(-1), -1, 0,
				math.Nextafter(in.Tmin, 0), math.Nextafter(in.Tmax, math.Inf(1)), 1e300} {
				_, err := f.AtT(T)
				var re *RangeError
				if !errors.As(err, &re) || re.Quantity != "temperature" || re.Unit != "K" {
					t.Errorf("AtT(%g) error = %v, want a temperature *RangeError", T, err)
				}
			}
			for _, p := range []float64{math.NaN(), math.Inf(1), math.Inf(-1), -1, 0,
				math.Nextafter(lo.P, 0), math.Nextafter(hi.P, math.Inf(1)), 1e300} {
				_, err := f.AtP(p)
				var re *RangeError
				if !errors.As(err, &re) || re.Quantity != "pressure" || re.Unit != "Pa" {
					t.Errorf("AtP(%g) error = %v, want a pressure *RangeError", p, err)
				}
			}
		})
	}
}

// TestDirectNoNaN checks the uncached evaluators: finite inside the range,
// an error (never a NaN) outside it.
func TestDirectNoNaN(t *testing.T) {
	for _, in := range List() {
		e, ok := Direct(in.Name)
		if !ok {
			t.Errorf("Direct(%q) not found", in.Name)
			continue
		}
		for k := 0; k <= 50; k++ {
			T := min(in.Tmin+(in.Tmax-in.Tmin)*float64(k)/50, in.Tmax)
			s, err := e.Direct(T)
			if err != nil {
				t.Errorf("%s Direct(%g): %v", in.Name, T, err)
				continue
			}
			if !checkSat(t, in.Name+" Direct", T, s) {
				break
			}
		}
		for _, T := range []float64{math.NaN(), math.Inf(1), -1, 0, in.Tmin - 1, in.Tmax + 1} {
			if s, err := e.Direct(T); err == nil {
				t.Errorf("%s Direct(%g) = %+v, want an error", in.Name, T, s)
			}
		}
	}
}

func TestRangeErrorMessage(t *testing.T) {
	f, err := Lookup("water")
	if err != nil {
		t.Fatal(err)
	}
	_, err = f.AtT(700)
	want := "water: saturation temperature 700 K outside the range 273.16 to 646 K"
	if err == nil || err.Error() != want {
		t.Errorf("AtT(700) error %q, want %q", err, want)
	}
}

// FuzzFromCSV feeds arbitrary text to the table reader: it must not panic,
// and whatever it accepts must answer its own range without NaN.
func FuzzFromCSV(f *testing.F) {
	f.Add(csvRows(row1, row2, row3, row4))
	f.Add("# critical: 1 K, 1 Pa\n" + csvRows(row1, row2, row3, row4))
	f.Add("T (K),p(Pa)\n1,2\n")
	f.Add("\uFEFFT [degC], p [bar]\n")
	f.Fuzz(func(t *testing.T, text string) {
		fl, err := FromCSV(strings.NewReader(text), "fuzz")
		if err != nil {
			return
		}
		in := fl.Info()
		for k := 0; k <= 20; k++ {
			T := min(in.Tmin+(in.Tmax-in.Tmin)*float64(k)/20, in.Tmax)
			s, err := fl.AtT(T)
			if err != nil {
				t.Fatalf("AtT(%g): %v", T, err)
			}
			for i, v := range satFields(&s) {
				if math.IsNaN(*v) || math.IsInf(*v, 0) {
					t.Fatalf("AtT(%g): field %d is %g", T, i, *v)
				}
			}
			if _, err := fl.AtP(s.P); err != nil {
				t.Fatalf("AtP(%g): %v", s.P, err)
			}
		}
	})
}
