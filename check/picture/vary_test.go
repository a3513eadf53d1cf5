package picture

import (
	"bytes"
	"context"
	"strings"
	"testing"

	"circa/check/vary"
)

// The sweep figures of the shipped examples lay out cleanly: one line per
// margin against one parameter, one line per value of the second for two,
// the limit and the file's value marked inside the axes.
func TestVaryFigureLayout(t *testing.T) {
	for _, tc := range []struct {
		example string
		specs   []string
		lines   int
	}{
		{"rack-door", []string{"lift=0.6m..1.6m:6"}, 0},
		{"rack-door", []string{"lift=0.6m..1.6m:4", "plate_height=0.3m,0.35m,0.4m"}, 3},
		{"ferry-cabinet", []string{"stack_height=0.3m..0.5m:3"}, 0},
		{"forestry-inverter", []string{"roof=0.5m..1.3m:5"}, 0},
	} {
		m := loadExample(t, tc.example)
		var axes []vary.Axis
		for _, s := range tc.specs {
			a, err := vary.Parse(s)
			if err != nil {
				t.Fatal(err)
			}
			axes = append(axes, a)
		}
		res, err := vary.Run(context.Background(), m, axes, vary.Options{})
		if err != nil {
			t.Fatal(err)
		}
		f, err := VaryFigure(res, m.Loops[0].Name)
		if err != nil {
			t.Fatalf("%s %v: %v", tc.example, tc.specs, err)
		}
		name := tc.example + " " + strings.Join(tc.specs, " ")
		lay := checkLayout(t, name, f)
		marks := map[string]bool{}
		for _, mk := range lay.Panels[0].Marks {
			marks[mk.Name] = true
		}
		if !marks["limit (100 %)"] || !marks["file: "+res.Params[0].FileWritten] {
			t.Errorf("%s: marks %v", name, marks)
		}
		want := tc.lines
		if want == 0 {
			want = len(res.MarginNames(m.Loops[0].Name))
		}
		if want == 0 || lay.Panels[0].Legend.Size().X <= 0 {
			t.Errorf("%s: nothing to draw", name)
		}
		var svg bytes.Buffer
		if err := f.Render(&svg, "svg"); err != nil {
			t.Fatal(err)
		}
		if n := strings.Count(svg.String(), "limiting margin, plate_height"); tc.lines > 0 && n != tc.lines {
			t.Errorf("%s: %d legend entries for plate_height, want %d", name, n, tc.lines)
		}
	}
}

func TestVaryFigureNothing(t *testing.T) {
	if _, err := VaryFigure(nil, "l"); err == nil {
		t.Error("no sweep drew a figure")
	}
	m := loadExample(t, "rack-door")
	a, _ := vary.Parse("lift=1m,1.2m")
	res, err := vary.Run(context.Background(), m, []vary.Axis{a}, vary.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if _, err := VaryFigure(res, "no_such_loop"); err == nil || !strings.Contains(err.Error(), "no margin") {
		t.Errorf("unknown loop: %v", err)
	}
}
