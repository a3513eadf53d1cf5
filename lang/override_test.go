package lang

import (
	"errors"
	"math"
	"strings"
	"sync"
	"testing"

	"circa/units"
)

func TestParseOverride(t *testing.T) {
	for _, tc := range []struct {
		in   string
		name string
		si   float64
		dim  units.Dim
		abs  bool
		text string
		unit string
	}{
		// 1 mm = 1e-3 m (SI prefix milli, SI Brochure 9th ed. table 7).
		{"riser_bore=10mm", "riser_bore", 0.010, units.Length, false, "10mm", "mm"},
		{" riser_bore = 10 mm ", "riser_bore", 0.010, units.Length, false, "10 mm", "mm"},
		// T/K = t/°C + 273.15 (SI Brochure 9th ed. 2.3.1).
		{"sink=28 degC", "sink", 301.15, units.Temperature, true, "28 degC", "degC"},
		{"heat=(2+1) kW", "heat", 3000, units.Power, false, "(2+1) kW", "kW"},
		{"ratio=0.5", "ratio", 0.5, units.Dim{}, false, "0.5", ""},
		// 1 bar = 1e5 Pa (SI Brochure 9th ed. table 8).
		{"p=-0.5 bar", "p", -0.5e5, units.Pressure, false, "-0.5 bar", "bar"},
	} {
		o, err := ParseOverride(tc.in)
		if err != nil {
			t.Errorf("%q: %v", tc.in, err)
			continue
		}
		if o.Name != tc.name || math.Abs(o.Value.SI-tc.si) > 1e-9*math.Abs(tc.si) || o.Value.Dim != tc.dim || o.Value.AbsTemp != tc.abs || o.Text != tc.text || o.Unit != tc.unit {
			t.Errorf("%q: got %+v", tc.in, o)
		}
	}
}

func TestParseOverrideErrors(t *testing.T) {
	for _, tc := range []struct{ in, want string }{
		{"riser_bore", "want NAME=VALUE"},
		{"=10mm", "want NAME=VALUE"},
		{"9bore=10mm", "9bore: not a parameter name"},
		{"bore=", "bore: no value"},
		{"bore=10 qq", "bore: column 4:"},
		{"bore=other_bore", "bore: column 1: other_bore is a name"},
		{"bore=2*other", "column 3: other is a name"},
		{"bore=10 mm mm", "bore: \"10 mm mm\" is not one value"},
		{"bore=1e300 m", "out of the model's range"},
		{"bore=\"10 mm\"", "found a string"},
		{"bore=(1, 2, 3) m", "vector"},
		{"bore=1\n2", "one line"},
	} {
		_, err := ParseOverride(tc.in)
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%q: got %v, want an error containing %q", tc.in, err, tc.want)
		}
	}
}

const overrideSrc = `include "parts.loop"
param stack_height = 0.4 m
param riser_length = 3 * stack_height
param sink = 25 degC
param approach = 5 degC_diff

loop l {
  fluid R1234ze(E)
  charge 0.39 kg
  node a
  node b
  evaporator e from a to b {
    use tube
    length stack_height
    rise stack_height
    heat 2 kW
  }
  condenser c from b to a {
    use tube
    length riser_length
    rise 0 m
    conductance 200 W/K
    sink sink
    subcool approach
  }
}
`

func overrideFS() memFS {
	return memFS{"main.loop": []byte(overrideSrc), "parts.loop": []byte("part tube {\n  bore 10 mm\n}\n")}
}

func TestWithOverrides(t *testing.T) {
	fsys := overrideFS()
	base := Load("main.loop", fsys)
	if len(base.Diags) > 0 {
		t.Fatalf("base has findings: %s", base.Diags[0].Message())
	}
	// Nothing may be read again: an FS that fails shows it.
	for k := range fsys {
		delete(fsys, k)
	}
	h, _ := ParseOverride("stack_height=0.5 m")
	v, err := base.With(h)
	if err != nil {
		t.Fatal(err)
	}
	if len(v.Diags) > 0 {
		t.Fatalf("variant has findings: %s", v.Diags[0].Message())
	}
	evap := v.Loops[0].Components[0]
	cond := v.Loops[0].Components[1]
	if evap.Length.SI != 0.5 || evap.Rise.SI != 0.5 {
		t.Errorf("evaporator length %g rise %g, want 0.5 m", evap.Length.SI, evap.Rise.SI)
	}
	// A parameter defined from the one overridden follows it: 3 × 0.5 m.
	if math.Abs(cond.Length.SI-1.5) > 1e-12 {
		t.Errorf("condenser length %g, want 1.5 m", cond.Length.SI)
	}
	if evap.Bore.SI != 0.010 {
		t.Errorf("bore from the included part %g, want 0.010 m", evap.Bore.SI)
	}
	if base.Loops[0].Components[0].Length.SI != 0.4 {
		t.Errorf("the base model changed: length %g", base.Loops[0].Components[0].Length.SI)
	}
	if len(v.Overrides) != 1 || v.Overrides[0].Param.Name != "stack_height" || v.Overrides[0].File.SI != 0.4 || v.Overrides[0].Text != "0.5 m" || v.Overrides[0].FileText != "0.4 m" {
		t.Errorf("overrides %+v", v.Overrides)
	}
	if len(base.Overrides) != 0 {
		t.Errorf("base has overrides %+v", base.Overrides)
	}
	// Overriding a derived parameter leaves its inputs alone.
	rl, _ := ParseOverride("riser_length=2 m")
	v, err = base.With(rl)
	if err != nil {
		t.Fatal(err)
	}
	if v.Loops[0].Components[1].Length.SI != 2 || v.Loops[0].Components[0].Length.SI != 0.4 {
		t.Errorf("lengths %g, %g", v.Loops[0].Components[1].Length.SI, v.Loops[0].Components[0].Length.SI)
	}
	// A plain kelvin value may stand for an absolute temperature:
	// 300 K = 26.85 °C (SI Brochure 9th ed. 2.3.1).
	s, _ := ParseOverride("sink=300 K")
	if v, err = base.With(s); err != nil || v.Loops[0].Components[1].Sink.SI != 300 {
		t.Errorf("sink=300 K: %v", err)
	}
}

func TestWithOverrideErrors(t *testing.T) {
	base := Load("main.loop", overrideFS())
	for _, tc := range []struct{ set, want string }{
		{"stack_hieght=1 m", "stack_hieght: no such parameter at the top level; did you mean stack_height?"},
		{"zzz=1 m", "zzz: no such parameter at the top level"},
		{"stack_height=1 K", "stack_height: expected a length, found"},
		{"stack_height=1 K", "the file gives 0.4 m at main.loop:2:22"},
		{"stack_height=2", "stack_height: expected a length"},
		{"approach=30 degC", "approach: expected a temperature difference"},
		{"sink=20 degC_diff", "sink: expected an absolute temperature"},
	} {
		o, err := ParseOverride(tc.set)
		if err != nil {
			t.Fatal(err)
		}
		v, err := base.With(o)
		var oe *OverrideError
		if v != nil || !errors.As(err, &oe) || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: got %v, want an error containing %q", tc.set, err, tc.want)
		}
	}
	a, _ := ParseOverride("sink=20 degC")
	if _, err := base.With(a, a); err == nil || !strings.Contains(err.Error(), "sink: given twice") {
		t.Errorf("twice: %v", err)
	}
}

// A variant repeats the findings of the files it was resolved from,
// those of reading them included.
func TestWithKeepsFindings(t *testing.T) {
	fsys := memFS{"main.loop": []byte("include \"missing.loop\"\nparam h = 1 m\nparam bad = 2 qq\nloop l {\n  fluid water\n  node a at (0, 0, h) m\n}\n")}
	base := Load("main.loop", fsys)
	o, _ := ParseOverride("h=2 m")
	v, err := base.With(o)
	if err != nil {
		t.Fatal(err)
	}
	msgs := func(m *Model) string {
		var b strings.Builder
		for _, d := range m.Diags {
			b.WriteString(d.Rule + " " + d.Message() + "\n")
		}
		return b.String()
	}
	if msgs(v) != msgs(base) || !strings.Contains(msgs(v), "include-unreadable") {
		t.Errorf("variant findings\n%s\nbase findings\n%s", msgs(v), msgs(base))
	}
	if v.Loops[0].Nodes[0].At.Z != 2 {
		t.Errorf("node height %g, want 2 m", v.Loops[0].Nodes[0].At.Z)
	}
	// A parameter whose own value is in error takes the override as given.
	b, _ := ParseOverride("bad=3 m")
	if v, err = base.With(b); err != nil || v.Params[1].Value.SI != 3 {
		t.Errorf("bad=3 m: %v", err)
	}
}

// Variants of one model may be resolved at once (run with -race).
func TestWithConcurrent(t *testing.T) {
	base := Load("main.loop", overrideFS())
	var wg sync.WaitGroup
	for i := range 8 {
		wg.Add(1)
		go func() {
			defer wg.Done()
			h := 0.1 + 0.1*float64(i)
			v, err := base.With(Override{Name: "stack_height", Value: units.Quantity{SI: h, Dim: units.Length}})
			if err != nil {
				t.Error(err)
				return
			}
			if got := v.Loops[0].Components[0].Length.SI; got != h {
				t.Errorf("length %g, want %g", got, h)
			}
		}()
	}
	wg.Wait()
}

func FuzzParseOverride(f *testing.F) {
	for _, s := range []string{"riser_bore=10mm", "sink = 28 degC", "heat=(2+1) kW", "a=b", "=", "x=1e999 m", "x=-(2) m^2", "é=1 µm"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		o, err := ParseOverride(s)
		if err == nil && (o.Name == "" || math.IsNaN(o.Value.SI) || math.Abs(o.Value.SI) > ModelRange) {
			t.Fatalf("%q: accepted %+v", s, o)
		}
	})
}

// BenchmarkWith resolves a variant of a shipped example, as the design
// guidance does for every trial value; BenchmarkWithLoad reads and parses
// it again instead, for comparison.
func BenchmarkWith(b *testing.B) {
	base := Load("../testdata/examples/ferry-cabinet.loop", nil)
	o := Override{Name: "stack_height", Value: units.Quantity{SI: 0.45, Dim: units.Length}}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := base.With(o); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkWithLoad(b *testing.B) {
	b.ReportAllocs()
	for b.Loop() {
		Load("../testdata/examples/ferry-cabinet.loop", nil)
	}
}

// TestDropSyntax checks that a model without its trees keeps what a report
// reads (texts, Mappers, comments, values and their locations), leaves the
// files it shared untouched, and refuses to be resolved again.
func TestDropSyntax(t *testing.T) {
	src := []byte("# note\n# allow: some-rule\nparam d = 8 mm\npart p { bore d }\nloop l {\n  fluid water\n  node a at (0, 0, 0) m\n  node b at (0, 0, 1) m\n  pipe q from a to b { length 1 m; use p }\n}\n")
	m := LoadSource("/x.loop", src, nil)
	if len(m.Diags) > 0 {
		t.Fatalf("unexpected findings: %v", m.Diags[0].Message())
	}
	shared := m.Files["/x.loop"]
	variant, err := m.With()
	if err != nil {
		t.Fatal(err)
	}
	m.DropSyntax()
	f := m.Files["/x.loop"]
	if f == shared || f.Stmts != nil || shared.Stmts == nil {
		t.Fatalf("DropSyntax must give the model its own file without statements and leave the shared one as it was")
	}
	if string(f.Src) != string(src) || f.Mapper == nil || len(f.Comments) != 1 || f.Comments[0].Text != "# allow: some-rule" {
		t.Fatalf("the file lost its text, Mapper or silencer, or kept the other comment: %v", f.Comments)
	}
	if variant.Files["/x.loop"] != shared {
		t.Fatalf("the variant's file changed")
	}
	bore := m.Loops[0].Components[0].Bore
	if !bore.Set || math.Abs(bore.SI-0.008) > 1e-15 || string(src[bore.Span().Start:bore.Span().End]) != "d" {
		t.Fatalf("bore = %+v at %v, want 8 mm written as d", bore, bore.Span())
	}
	if m.Params[0].Expr != nil || m.Parts[0].Stmts != nil {
		t.Fatalf("the parameter's expression or the part's statements were kept")
	}
	if _, err := m.With(); err == nil {
		t.Fatalf("With on a model without its trees must fail")
	}
}

// Limits and methods the caller gave the base model where its files set
// none (an editor's settings) hold for its variants; those the files set
// are the variant's own.
func TestWithKeepsUnsetLimits(t *testing.T) {
	fsys := overrideFS()
	fsys["main.loop"] = append(fsys["main.loop"], []byte("limits {\n  chf_ratio 2.5\n}\n")...)
	base := Load("main.loop", fsys)
	if len(base.Diags) > 0 {
		t.Fatal(base.Diags[0].Message())
	}
	base.Limits.ExitQuality.SI = 0.4
	base.Limits.CHFRatio.SI = 9
	base.Methods.Void.Name = "zivi"
	base.Methods.Cells = 7
	v, err := base.With(Override{Name: "stack_height", Value: units.Quantity{SI: 0.5, Dim: units.Length}})
	if err != nil {
		t.Fatal(err)
	}
	if v.Limits.ExitQuality.SI != 0.4 || v.Methods.Void.Name != "zivi" || v.Methods.Cells != 7 {
		t.Errorf("unset limits and methods not kept: %+v %+v", v.Limits.ExitQuality, v.Methods)
	}
	if v.Limits.CHFRatio.SI != 2.5 {
		t.Errorf("the file's chf_ratio %g, want 2.5", v.Limits.CHFRatio.SI)
	}
}

// A variant of a variant keeps the first one's overrides, unless it gives
// the same parameter again.
func TestWithOfVariant(t *testing.T) {
	base := Load("main.loop", overrideFS())
	h, _ := ParseOverride("stack_height=0.5 m")
	v, err := base.With(h)
	if err != nil {
		t.Fatal(err)
	}
	s, _ := ParseOverride("sink=30 degC")
	w, err := v.With(s)
	if err != nil {
		t.Fatal(err)
	}
	if got := w.Loops[0].Components[0].Length.SI; got != 0.5 {
		t.Errorf("length %g, want the first variant's 0.5 m", got)
	}
	// 30 °C = 303.15 K (SI Brochure 9th ed., 2.3.1).
	if got := w.Loops[0].Components[1].Sink.SI; math.Abs(got-303.15) > 1e-9 {
		t.Errorf("sink %g K, want 303.15", got)
	}
	if len(w.Overrides) != 2 || w.Overrides[0].Name != "stack_height" || w.Overrides[1].Name != "sink" {
		t.Errorf("overrides %+v", w.Overrides)
	}
	h2, _ := ParseOverride("stack_height=0.3 m")
	x, err := v.With(h2)
	if err != nil {
		t.Fatal(err)
	}
	if got := x.Loops[0].Components[0].Length.SI; got != 0.3 || len(x.Overrides) != 1 || x.Overrides[0].File.SI != 0.4 {
		t.Errorf("length %g, overrides %+v: want 0.3 m over the file's 0.4 m", got, x.Overrides)
	}
}
