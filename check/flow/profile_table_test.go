package flow

import (
	"fmt"
	"math"
	"os"
	"strings"
	"testing"

	"circa/lang"
)

// profileTable writes a drive of n rows half a second apart: slow swings
// of pitch, braking and curves, logged at twice the rate they change, and
// the heading (yaw), which turns at every row.
func profileTable(n int) []byte {
	var b strings.Builder
	b.WriteString("time (s), yaw (deg), pitch (deg), accel_x (gn), accel_y (gn)\n")
	for i := 0; i < n; i++ {
		t := float64(i) * 0.5
		k := float64(i / 2)
		fmt.Fprintf(&b, "%g, %.4f, %.4f, %.4f, %.4f\n", t, 170*math.Sin(t/300), -2.3*math.Sin(k/40), -0.08*math.Sin(k/25), 0.06*math.Sin(k/30))
	}
	return []byte(b.String())
}

// tramWithTable is the tram example with its depot approach read from a
// CSV table of n rows.
func tramWithTable(tb testing.TB, n int) *lang.Model {
	tb.Helper()
	const path = "../../testdata/examples/tram-inverter.loop"
	src, err := os.ReadFile(path)
	if err != nil {
		tb.Fatal(err)
	}
	s := string(src)
	i := strings.Index(s, "  profile {")
	j := strings.Index(s[i:], "  }\n}")
	if i < 0 || j < 0 {
		tb.Fatal("no profile block in the tram example")
	}
	s = s[:i] + "  profile \"drive.csv\"\n" + s[i+j+4:]
	m := lang.LoadSource(path, []byte(s), lang.Overlay{"../../testdata/examples/drive.csv": profileTable(n)})
	for _, d := range m.Diags {
		if d.Severity == lang.Error {
			tb.Fatal(d.Message())
		}
	}
	if p := m.Case("depot_approach").Profile; p == nil || len(p.Rows) != n {
		tb.Fatalf("profile %+v", p)
	}
	return m
}

// BenchmarkProfile2000 is the tram example's depot approach read from a
// 2,000-row table (1,000 distinct body forces), with the tilt search of
// the case's own attitude, on every core.
func BenchmarkProfile2000(b *testing.B) {
	m := tramWithTable(b, 2000)
	opts := Options{Case: "depot_approach"}
	benchOnce(b, m, opts)
	b.ResetTimer()
	u0 := cpuTime()
	for i := 0; i < b.N; i++ {
		benchOnce(b, m, opts)
	}
	cpuPerOp(b, u0)
}

// Each instant of a profile, warm-started from the instant before on its
// worker, is the constant case at that instant's attitude, solved cold:
// the same balance and margins to within a part in 10⁹ (the refinement
// stops within 10⁻¹² of the flow; the margins follow from it). The drive
// swings slowly, steps, and tips the loop past where it circulates and
// back; yaw alone turns in some rows, which leaves the body force as it
// was.
func TestProfileWarmMatchesCold(t *testing.T) {
	var rows []string
	for i := 0; i < 120; i++ {
		x := float64(i)
		pitch := -2.3 * math.Sin(x/9)
		switch {
		case i >= 40 && i < 60:
			pitch = 4 * (x - 39) // up to 80°: past the tilt limit
		case i >= 60 && i < 70:
			pitch = 80 - 8*(x-59)
		case i == 90:
			pitch = 20 // a step
		}
		yaw := 0.0
		if i%3 == 0 {
			yaw = 10 * x
			for yaw > 180 {
				yaw -= 360
			}
		}
		rows = append(rows, fmt.Sprintf("%g, %.4f, %.4f, %.4f, %.4f", 0.5*x, yaw, pitch, -0.08*math.Sin(x/7), 0.06*math.Sin(x/11)))
	}
	table := "time (s), yaw (deg), pitch (deg), accel_x (gn), accel_y (gn)\n" + strings.Join(rows, "\n") + "\n"
	const path = "../../testdata/examples/tram-inverter.loop"
	src, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	s := string(src)
	i := strings.Index(s, "  profile {")
	j := strings.Index(s[i:], "  }\n}")
	s = s[:i] + "  profile \"drive.csv\"\n" + s[i+j+4:]
	// The constant cases, one per row, heat and sink as the profile's case.
	for k, r := range rows {
		var tm, yaw, pitch, ax, ay float64
		fmt.Sscanf(strings.ReplaceAll(r, ",", ""), "%g %g %g %g %g", &tm, &yaw, &pitch, &ax, &ay)
		s += fmt.Sprintf("case row%d { heat cold_plate 1.6 kW; sink 35 °C; yaw %g deg; pitch %g deg; accel (%g, %g, 0) gn }\n", k, yaw, pitch, ax, ay)
	}
	m := lang.LoadSource(path, []byte(s), lang.Overlay{"../../testdata/examples/drive.csv": []byte(table)})
	for _, d := range m.Diags {
		if d.Severity == lang.Error {
			t.Fatal(d.Message())
		}
	}
	for _, workers := range []int{1, 2, 3} {
		r, err := Estimate(m, Options{NoTilt: true, Workers: workers})
		if err != nil {
			t.Fatal(err)
		}
		byName := map[string]*CaseResult{}
		for k := range r.Loops[0].Cases {
			byName[r.Loops[0].Cases[k].Case] = &r.Loops[0].Cases[k]
		}
		pr := byName["depot_approach"].Profile
		if pr == nil || len(pr.Instants) != len(rows) {
			t.Fatalf("profile %+v", pr)
		}
		stops := 0
		for k, in := range pr.Instants {
			c := byName[fmt.Sprintf("row%d", k)]
			if in.Circulates != c.Circulates || !near(in.MassFlow, c.MassFlow, 1e-9) {
				t.Errorf("%d workers, t = %g s: circulates %v at %.12g kg/s; cold %v at %.12g kg/s", workers, in.Time, in.Circulates, in.MassFlow, c.Circulates, c.MassFlow)
			}
			if !c.Circulates {
				stops++
			}
			want := map[string]float64{}
			for _, mg := range c.Margins {
				want[mg.Margin+"/"+mg.Component] = mg.Value
			}
			for _, mg := range in.Margins {
				if w, ok := want[mg.Margin+"/"+mg.Component]; !ok || !near(mg.Value, w, 1e-9) {
					t.Errorf("%d workers, t = %g s: %s %s = %.12g, cold %.12g", workers, in.Time, mg.Margin, mg.Component, mg.Value, w)
				}
			}
		}
		if stops == 0 || stops == len(rows) {
			t.Errorf("%d instants of %d stop circulating: the drive should tip the loop past its limit and back", stops, len(rows))
		}
	}
}

// near reports whether a and b agree within rel of the larger.
func near(a, b, rel float64) bool {
	return a == b || math.Abs(a-b) <= rel*math.Max(math.Abs(a), math.Abs(b))
}
