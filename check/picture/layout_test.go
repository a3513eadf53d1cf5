package picture

import (
	"math"
	"strings"
	"testing"

	"gonum.org/v1/plot/vg"

	"circa/lang"
)

// checkLayout fails when a figure's placed texts overlap each other or
// the legend, or when a text, the legend or a limit line leaves the axes.
func checkLayout(t *testing.T, name string, f *Figure) *Layout {
	t.Helper()
	lay, err := f.Layout()
	if err != nil {
		t.Fatalf("%s: %v", name, err)
	}
	for pi, p := range lay.Panels {
		if p.Data.Size().X <= 0 || p.Data.Size().Y <= 0 {
			t.Errorf("%s panel %d: no data area recorded", name, pi)
		}
		if p.Legend != (vg.Rectangle{}) && !Inside(p.Legend, p.Data) {
			t.Errorf("%s panel %d: legend %v outside the axes %v", name, pi, p.Legend, p.Data)
		}
		for i, a := range p.Texts {
			if !Inside(a.Rect, p.Data) {
				t.Errorf("%s panel %d: %q at %v outside the axes %v", name, pi, a.Text, a.Rect, p.Data)
			}
			if p.Legend != (vg.Rectangle{}) && Overlaps(a.Rect, p.Legend) {
				t.Errorf("%s panel %d: %q under the legend", name, pi, a.Text)
			}
			for _, b := range p.Texts[i+1:] {
				if Overlaps(a.Rect, b.Rect) {
					t.Errorf("%s panel %d: %q %v overlaps %q %v", name, pi, a.Text, a.Rect, b.Text, b.Rect)
				}
			}
		}
		for _, m := range p.Marks {
			for _, q := range []vg.Point{m.From, m.To} {
				if !Inside(vg.Rectangle{Min: q, Max: q}, p.Data) {
					t.Errorf("%s panel %d: limit line %q ends at %v outside the axes %v", name, pi, m.Name, q, p.Data)
				}
			}
		}
	}
	return lay
}

// The figures of the throttled loop, with its low-flow stable branch,
// lay out cleanly (the shipped examples and fixtures are checked as they
// are drawn by TestShippedExamples and TestFiguresRender).
func TestFigureLayoutsSeveralBalances(t *testing.T) {
	m := lang.Load("../../testdata/flow/ledinegg.loop", nil)
	figs, errs := Figures(m, Options{TiltStep: 10 * math.Pi / 180})
	if len(errs) > 0 || len(figs) != 4 {
		t.Fatalf("%d figures, %v", len(figs), errs)
	}
	for _, f := range figs {
		checkLayout(t, f.Name, f)
	}
}

// Cases that share a load get their labels without overlap: five of the
// inverter's six cases run at 2500 W (all of their labels are placed and
// none overlaps, checked by checkLayout), and the exit-quality limit line
// is drawn inside the axes even where every case is far below it.
func TestCirculationLabelsAndLimit(t *testing.T) {
	for _, name := range []string{"forestry-inverter", "rack-door"} {
		m := loadExample(t, name)
		c, err := CirculationOf(m, m.Loops[0], Options{})
		if err != nil {
			t.Fatal(err)
		}
		f, err := c.Figure()
		if err != nil {
			t.Fatal(err)
		}
		lay := checkLayout(t, name, f)
		placed := map[string]int{}
		for _, p := range lay.Panels {
			for _, tb := range p.Texts {
				placed[tb.Text]++
			}
		}
		for _, cp := range c.Cases {
			if cp.Circulates && placed[cp.Case] != 2 {
				t.Errorf("%s: case %s labelled %d times, want once per panel", name, cp.Case, placed[cp.Case])
			}
		}
		// The limit the margins use (0.5, common practice for electronics
		// loops), drawn in the exit-quality panel.
		if c.ExitQualityLimit != 0.5 {
			t.Errorf("%s: exit-quality limit %g, want 0.5", name, c.ExitQualityLimit)
		}
		found := false
		for _, mk := range lay.Panels[1].Marks {
			found = found || strings.HasPrefix(mk.Name, "exit-quality limit")
		}
		if !found {
			t.Errorf("%s: no exit-quality limit line", name)
		}
	}
}

// The budget labels its bars, and its ticks are round numbers, at least
// five of them labelled.
func TestBudgetTicksAndValues(t *testing.T) {
	m := loadExample(t, "forestry-inverter")
	b, err := BudgetOf(m, m.Loops[0], "")
	if err != nil {
		t.Fatal(err)
	}
	f, err := b.Figure()
	if err != nil {
		t.Fatal(err)
	}
	lay := checkLayout(t, "budget", f)
	// Every bar long enough to see has its value (kPa, as the axis).
	want := 0
	for _, it := range append(b.Items, b.Total) {
		for _, v := range []float64{it.Drops.Friction, it.Drops.Gravity, it.Drops.Acceleration, it.Drops.AreaChange, it.Drops.Local} {
			if math.Abs(v)*1e-3 >= 0.005 {
				want++
			}
		}
	}
	if n := len(lay.Panels[0].Texts); n != want || want < 10 {
		t.Errorf("%d bar values, want %d", n, want)
	}
	p := f.rows[0][0]
	labelled := 0
	for _, tk := range p.Y.Tick.Marker.Ticks(p.Y.Min, p.Y.Max) {
		if tk.Label != "" {
			labelled++
		}
	}
	if labelled < 5 {
		t.Errorf("%d labelled ticks on the budget's axis", labelled)
	}
}

func TestNiceTicks(t *testing.T) {
	for _, c := range []struct {
		min, max float64
		want     string
	}{{-2.9, 13.9, "-2.5 0 2.5 5 7.5 10 12.5"}, {0, 1, "0 0.25 0.5 0.75 1"}, {-8.5, 6, "-7.5 -5 -2.5 0 2.5 5"}, {-9.6, 15.1, "-5 0 5 10 15"}, {0, 6000, "0 1000 2000 3000 4000 5000 6000"}} {
		var got []string
		for _, tk := range (niceTicks{}).Ticks(c.min, c.max) {
			if tk.Label != "" {
				got = append(got, tk.Label)
			}
		}
		if g := strings.Join(got, " "); g != c.want {
			t.Errorf("ticks %g..%g: %q, want %q", c.min, c.max, g, c.want)
		}
	}
}

// The first failure in each direction is the first swept angle past the
// case's attitude where a margin reaches its limit or circulation stops:
// every angle between passes, and the failure comes no later than where
// circulation stops.
func TestFirstFailures(t *testing.T) {
	m := loadExample(t, "forestry-inverter")
	tl, err := TiltOf(m, m.Loops[0], "level_work", 5*math.Pi/180)
	if err != nil {
		t.Fatal(err)
	}
	fs := tl.FirstFailures()
	if len(fs) != 4 {
		t.Fatalf("%d directions", len(fs))
	}
	for _, f := range fs {
		pts, from := tl.PitchSweep, tl.Pitch
		if f.Axis == "roll" {
			pts, from = tl.RollSweep, tl.Roll
		}
		if !f.Found || f.AtCase {
			t.Errorf("%+v: the inverter's nominal case fails within ±90° in every direction (exit quality)", f)
			continue
		}
		for _, p := range pts {
			s := float64(f.Sign)
			switch {
			case s*(p.Angle-from) >= 0 && s*(p.Angle-f.Angle) < -1e-9:
				if !p.Circulates || p.WorstUse >= 1 {
					t.Errorf("%s %+d: %.1f° fails before the reported %.1f°", f.Axis, f.Sign, deg(p.Angle), deg(f.Angle))
				}
			case math.Abs(p.Angle-f.Angle) < 1e-9:
				if p.Circulates && p.WorstUse < 1 {
					t.Errorf("%s %+d: the reported %.1f° passes", f.Axis, f.Sign, deg(f.Angle))
				}
			}
		}
		if f.Axis == "pitch" && f.Sign > 0 && tl.PitchUp != nil && f.Angle > *tl.PitchUp+1e-9 {
			t.Errorf("first failure %.1f° beyond where circulation stops, %.1f°", deg(f.Angle), deg(*tl.PitchUp))
		}
	}
	// A case that already fails says so in every direction.
	tl.CaseFails = "exit_quality cold_plate"
	for _, f := range tl.FirstFailures() {
		if !f.AtCase || f.What != tl.CaseFails {
			t.Errorf("%+v", f)
		}
	}
}
