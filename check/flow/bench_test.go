package flow

import (
	"fmt"
	"math"
	"syscall"
	"testing"
	"time"

	"circa/lang"
	"circa/lang/loopgen"
)

func benchModel(b *testing.B, components, cycles int) *lang.Model {
	b.Helper()
	m := lang.LoadSource("bench.loop", loopgen.Network(components, cycles), lang.OSFS{})
	for _, d := range m.Diags {
		if d.Severity == lang.Error {
			b.Fatal(d.Message())
		}
	}
	return m
}

// cpuTime is the process's CPU time so far: with cpuPerOp it gives the CPU
// an operation costs, which a loaded machine inflates far less than the
// elapsed time.
func cpuTime() time.Duration {
	var ru syscall.Rusage
	syscall.Getrusage(syscall.RUSAGE_SELF, &ru)
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}

// cpuPerOp reports the CPU per operation since u0, in milliseconds.
func cpuPerOp(b *testing.B, u0 time.Duration) {
	b.ReportMetric(float64((cpuTime()-u0).Microseconds())/1000/float64(b.N), "cpu-ms/op")
}

func benchOnce(b *testing.B, m *lang.Model, opts Options) *Result {
	r, err := Estimate(m, opts)
	if err != nil {
		b.Fatal(err)
	}
	return r
}

// BenchmarkSingleCase is one case of a 20-component single loop (target
// < 1 ms).
func BenchmarkSingleCase(b *testing.B) {
	m := benchModel(b, 20, 1)
	opts := Options{Case: m.Cases[0].Name, NoTilt: true, Workers: 1}
	if r := benchOnce(b, m, opts); !r.Loops[0].Cases[0].Circulates {
		b.Fatal("benchmark loop does not circulate")
	}
	b.ResetTimer()
	u0 := cpuTime()
	for i := 0; i < b.N; i++ {
		benchOnce(b, m, opts)
	}
	cpuPerOp(b, u0)
}

// BenchmarkSingleCaseLocal is BenchmarkSingleCase with the saturation
// state taken at the local pressure along the loop (target < 1 ms).
func BenchmarkSingleCaseLocal(b *testing.B) {
	m := benchModel(b, 20, 1)
	opts := Options{Case: m.Cases[0].Name, NoTilt: true, Workers: 1, Saturation: "local"}
	if r := benchOnce(b, m, opts); !r.Loops[0].Cases[0].Circulates {
		b.Fatal("benchmark loop does not circulate")
	}
	b.ResetTimer()
	u0 := cpuTime()
	for i := 0; i < b.N; i++ {
		benchOnce(b, m, opts)
	}
	cpuPerOp(b, u0)
}

// BenchmarkEnvelope is a 1,000-point envelope of the same loop: both of its
// cases over 10 pitches × 10 rolls × 5 accelerations, on every core
// (target < 0.5 s).
func BenchmarkEnvelope(b *testing.B) {
	m := benchModel(b, 20, 1)
	sw := &Sweep{}
	for i := 0; i < 10; i++ {
		a := (-20 + 40*float64(i)/9) * math.Pi / 180
		sw.Pitch = append(sw.Pitch, a)
		sw.Roll = append(sw.Roll, a)
	}
	for i := 0; i < 5; i++ {
		sw.Accel = append(sw.Accel, [3]float64{0.1 * float64(i) * gn, 0, 0})
	}
	opts := Options{NoTilt: true, Sweep: sw}
	r := benchOnce(b, m, opts)
	if n := len(r.Loops[0].Cases); n < 1000 {
		b.Fatalf("%d points", n)
	}
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		benchOnce(b, m, opts)
	}
}

// unequalB gives the evaporators of m loads of 4–12 W in a repeating
// pattern, so that parallel branches differ and Newton has work to do.
func unequalB(m *lang.Model) {
	i := 0
	for _, c := range m.Loops[0].Components {
		if c.Kind == lang.Evaporator {
			c.Heat.SI = 4 + 2*float64(i%5)
			i++
		}
	}
	for _, cs := range m.Cases {
		cs.Heat = nil
	}
}

// BenchmarkNetwork200 is one case of a network of 200 branches (199
// parallel evaporator branches with unequal loads, and the return)
// (target < 50 ms).
func BenchmarkNetwork200(b *testing.B) {
	m := benchModel(b, 600, 199)
	unequalB(m)
	opts := Options{Case: m.Cases[0].Name, NoTilt: true, Workers: 1}
	r := benchOnce(b, m, opts)
	c := r.Loops[0].Cases[0]
	if !c.Circulates {
		b.Fatalf("network does not circulate: %s", c.Reason)
	}
	b.ReportMetric(float64(c.Iterations), "newton-steps")
	b.ResetTimer()
	u0 := cpuTime()
	for i := 0; i < b.N; i++ {
		benchOnce(b, m, opts)
	}
	cpuPerOp(b, u0)
}

// BenchmarkNetwork5000 is the whole estimate, tilt limits included, of a
// loop of 5,000 components with 8 parallel evaporator branches and a long
// downcomer, as the language server's complete check runs it (target
// < 150 ms).
func BenchmarkNetwork5000(b *testing.B) {
	m := benchModel(b, 5000, 8)
	u0 := cpuTime()
	for b.Loop() {
		benchOnce(b, m, Options{})
	}
	cpuPerOp(b, u0)
}

// BenchmarkNetworkWide is one case of networks of many parallel evaporator
// branches with unequal loads (a feed, an evaporator and an exit each, and
// a downcomer of 50 pieces) at growing sizes: the estimate's cost against
// the number of independent cycles (target: near-linear, 2,000 cycles
// under 1 s).
func BenchmarkNetworkWide(b *testing.B) {
	for _, cycles := range []int{200, 500, 1000, 2000} {
		b.Run(fmt.Sprintf("%dx%d", 3*cycles+50, cycles), func(b *testing.B) {
			m := benchModel(b, 3*cycles+50, cycles)
			unequalB(m)
			// The same total heat at every size: 1.6 kW does not fit
			// through the return more than once.
			for _, c := range m.Loops[0].Components {
				if c.Kind == lang.Evaporator {
					c.Heat.SI *= 200 / float64(cycles)
				}
			}
			opts := Options{Case: m.Cases[0].Name, NoTilt: true, Workers: 1}
			r := benchOnce(b, m, opts)
			c := r.Loops[0].Cases[0]
			if !c.Circulates {
				b.Fatalf("network does not circulate: %s", c.Reason)
			}
			b.ReportMetric(float64(c.Iterations), "newton-steps")
			u0 := cpuTime()
			for b.Loop() {
				benchOnce(b, m, opts)
			}
			cpuPerOp(b, u0)
		})
	}
}

// BenchmarkNetwork20000x2000 is the whole estimate, tilt limits included,
// of a network of 20,000 components with 2,000 parallel evaporator
// branches at the generated loads, as `circa estimate` runs it (target
// < 2 s).
func BenchmarkNetwork20000x2000(b *testing.B) {
	m := benchModel(b, 20000, 2000)
	u0 := cpuTime()
	for b.Loop() {
		benchOnce(b, m, Options{})
	}
	cpuPerOp(b, u0)
}
