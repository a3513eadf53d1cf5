//go:build unix

package guide

import (
	"context"
	"fmt"
	"math"
	"os"
	"strings"
	"testing"

	"circa/check/flow"
	"circa/lang"
)

// BenchmarkProfile2000 is the estimate and the guidance of the tram
// example with its depot approach read from a 2,000-row table.
func BenchmarkProfile2000(b *testing.B) {
	const path = "../../testdata/examples/tram-inverter.loop"
	src, err := os.ReadFile(path)
	if err != nil {
		b.Fatal(err)
	}
	s := string(src)
	i := strings.Index(s, "  profile {")
	j := strings.Index(s[i:], "  }\n}")
	s = s[:i] + "  profile \"drive.csv\"\n" + s[i+j+4:]
	var t strings.Builder
	t.WriteString("time (s), pitch (deg), accel_x (gn), accel_y (gn)\n")
	for i := 0; i < 2000; i++ {
		x := float64(i) * 0.5
		fmt.Fprintf(&t, "%g, %.4f, %.4f, %.4f\n", x, -2.3*math.Sin(x/40), -0.08*math.Sin(x/25), 0.06*math.Sin(x/30))
	}
	m := lang.LoadSource(path, []byte(s), lang.Overlay{"../../testdata/examples/drive.csv": []byte(t.String())})
	for _, d := range m.Diags {
		if d.Severity == lang.Error {
			b.Fatal(d.Message())
		}
	}
	b.ResetTimer()
	cpu0 := cpuTime()
	for i := 0; i < b.N; i++ {
		res, err := flow.Estimate(m, flow.Options{})
		if err != nil {
			b.Fatal(err)
		}
		g, err := Compute(context.Background(), m, Options{Base: res})
		if err != nil {
			b.Fatal(err)
		}
		b.ReportMetric(float64(g.Estimates), "estimates/op")
	}
	b.ReportMetric(float64(cpuTime()-cpu0)/float64(b.N)/1e6, "cpu-ms/op")
}
