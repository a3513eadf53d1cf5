package suggest

import (
	"context"
	"math"
	"os"
	"path/filepath"
	"sort"
	"testing"

	"circa/check"
	"circa/check/guide"
	"circa/lang"
)

// apply writes a fix's edits into the texts of fsys.
func apply(t *testing.T, fsys lang.Overlay, f lang.Fix) {
	t.Helper()
	byFile := map[string][]lang.Edit{}
	for _, e := range f.Edits {
		byFile[e.Loc.File] = append(byFile[e.Loc.File], e)
	}
	for file, es := range byFile {
		src, err := fsys.ReadFile(file)
		if err != nil {
			t.Fatal(err)
		}
		sort.Slice(es, func(i, j int) bool { return es[i].Loc.Span.Start > es[j].Loc.Span.Start })
		for _, e := range es {
			src = []byte(string(src[:e.Loc.Span.Start]) + e.NewText + string(src[e.Loc.Span.End:]))
		}
		fsys[file] = src
	}
}

// The examples that warn get, for each margin warning, a fix that, written
// into the file, makes the warning go away without adding an error.
func TestExampleFixes(t *testing.T) {
	for _, name := range []string{"forestry-inverter", "ferry-cabinet"} {
		path := filepath.Join("..", "..", "testdata", "examples", name+".loop")
		m := lang.Load(path, nil)
		before := check.Run(m, check.Options{NoTilt: true})
		every, err := guide.Compute(context.Background(), m, guide.Options{})
		if err != nil {
			t.Fatal(err)
		}
		fixed := 0
		for _, d := range before {
			if !IsMargin(d) {
				continue
			}
			fixes, err := Fixes(context.Background(), m, d, every, Options{})
			if err != nil {
				t.Fatal(err)
			}
			t.Logf("%s: %s: %d fixes", name, d.Message(), len(fixes))
			for _, f := range fixes {
				t.Logf("  %s", f.Title)
				fsys := lang.Overlay{}
				apply(t, fsys, f)
				src, _ := fsys.ReadFile(path)
				m2 := lang.LoadSource(path, src, fsys)
				after := check.Run(m2, check.Options{NoTilt: true})
				errs := 0
				for _, d2 := range after {
					if d2.Rule == d.Rule && d2.Loc == d.Loc && d2.Severity <= lang.Warning {
						t.Errorf("%s: fix %q leaves %s", name, f.Title, d2.Message())
					}
					if d2.Severity == lang.Error {
						errs++
					}
				}
				if errs > 0 {
					t.Errorf("%s: fix %q adds %d errors", name, f.Title, errs)
				}
			}
			if len(fixes) > 0 {
				fixed++
			}
		}
		if fixed == 0 {
			t.Errorf("%s: no margin warning got a fix", name)
		}
	}
}

func TestNearestInside(t *testing.T) {
	rng := func(lo, hi float64, loOpen, hiOpen bool) *guide.Range {
		return &guide.Range{Feasible: true, Low: &guide.Bound{Value: lo, Unbounded: loOpen}, High: &guide.Bound{Value: hi, Unbounded: hiOpen}}
	}
	for _, tc := range []struct {
		x    float64
		r    *guide.Range
		unit string
		want string
		ok   bool
	}{
		// A bore below a range of 9.2–21 mm goes to 10 mm: the coarsest
		// round step (1 mm) that keeps it inside and within 10 % of 9.2 mm.
		{0.008, rng(0.0092, 0.021, false, false), "mm", "10 mm", true},
		{0.025, rng(0.0092, 0.021, false, false), "mm", "20 mm", true},
		// 1.218 m: 2 m, 1.5 m and 1.4 m move it by more than 10 %.
		{0.9, rng(1.218, 3, false, false), "m", "1.3 m", true},
		// A narrow range keeps a finer step: 0.56 to 0.58 kg.
		{0.5, rng(0.5612, 0.5799, false, false), "kg", "0.57 kg", true},
		{0.7, rng(0.5612, 0.5799, false, false), "kg", "0.57 kg", true},
		// Offset units round in their own scale: 31.4 °C = 304.55 K (SI
		// Brochure 9th ed., 2.3.1) goes down to 30 °C, 10 °C being the
		// step of its first digit.
		{310, rng(290, 304.55, false, false), "degC", "30 degC", true},
		{0.3, rng(0.35, 0.9, true, false), "m", "", false}, // inside an open low end
		{0.5, rng(0.35, 0.9, false, false), "m", "", false},
		{0.5, &guide.Range{Feasible: false}, "m", "", false},
		{0.5, nil, "m", "", false},
	} {
		if tc.r != nil && tc.r.Feasible {
			tc.r.Contains = tc.x >= tc.r.Low.Value && tc.x <= tc.r.High.Value || tc.r.Low.Unbounded && tc.x <= tc.r.High.Value
		}
		v, text, ok := nearestInside(tc.x, tc.r, tc.unit)
		if ok != tc.ok || text != tc.want {
			t.Errorf("%g in %+v: %q %v, want %q %v", tc.x, tc.r, text, ok, tc.want, tc.ok)
			continue
		}
		if ok && (v < tc.r.Low.Value-1e-12 || v > tc.r.High.Value+1e-12 || math.IsNaN(v)) {
			t.Errorf("%g: %g outside the range", tc.x, v)
		}
	}
}

// Only margin findings at warning or above get fixes, the tilt margin's
// among them; not a note, not another rule.
func TestIsMargin(t *testing.T) {
	for _, tc := range []struct {
		d    lang.Diagnostic
		want bool
	}{
		{lang.Diagnostic{Rule: "margin-exit-quality", Severity: lang.Warning}, true},
		{lang.Diagnostic{Rule: "margin-charge", Severity: lang.Error}, true},
		{lang.Diagnostic{Rule: "margin-tilt", Severity: lang.Warning}, true},
		{lang.Diagnostic{Rule: "margin-exit-quality", Severity: lang.Info}, false},
		{lang.Diagnostic{Rule: "rise-mismatch", Severity: lang.Error}, false},
	} {
		if got := IsMargin(tc.d); got != tc.want {
			t.Errorf("%s %s: %v, want %v", tc.d.Rule, tc.d.Severity, got, tc.want)
		}
	}
}

// tiltCart is the loop of testdata/flow/tilt-cart.loop: its case tipped
// lies inside its tilt margin, which a higher condenser (lift) clears.
const tiltCart = "../../testdata/flow/tilt-cart.loop"

// tiltLoop is tiltCart's text.
func tiltLoop(t *testing.T) []byte {
	t.Helper()
	src, err := os.ReadFile(tiltCart)
	if err != nil {
		t.Fatal(err)
	}
	return src
}

// A tilt-margin warning gets a fix, found and checked with the tilt
// search: written into the file, checked again in full, the warning is
// gone and no error has come.
func TestTiltFix(t *testing.T) {
	const path = "tilt.loop"
	fsys := lang.Overlay{path: tiltLoop(t)}
	m := lang.Load(path, fsys)
	var tilt *lang.Diagnostic
	for _, d := range check.Run(m, check.Options{}) {
		if d.Rule == "margin-tilt" && d.Severity == lang.Warning {
			tilt = &d
		}
	}
	if tilt == nil {
		t.Fatal("no tilt-margin warning")
	}
	for _, d := range check.Run(m, check.Options{NoTilt: true}) {
		if d.Rule == "margin-tilt" {
			t.Fatal("the tilt margin is reported without the tilt search")
		}
	}
	fixes, err := Fixes(context.Background(), m, *tilt, nil, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(fixes) == 0 {
		t.Fatal("no fix for the tilt margin")
	}
	for _, f := range fixes {
		t.Logf("%s", f.Title)
		fs2 := lang.Overlay{path: tiltLoop(t)}
		apply(t, fs2, f)
		for _, d := range check.Run(lang.Load(path, fs2), check.Options{}) {
			if d.Rule == "margin-tilt" && d.Severity <= lang.Warning || d.Severity == lang.Error {
				t.Errorf("fix %q leaves %s: %s", f.Title, d.Rule, d.Message())
			}
		}
	}
}
