package fluid

import (
	"errors"
	"math"
	"sync"
	"testing"
)

// TestTableMatchesDirect checks every registered fluid's cached table against
// its own equations at temperatures between the grid nodes: every field
// within 0.01 % (enthalpies relative to |h| + h_lv, their zero being
// arbitrary), and AtP inverting AtT.
func TestTableMatchesDirect(t *testing.T) {
	for _, info := range List() {
		t.Run(info.Name, func(t *testing.T) {
			f, err := Lookup(info.Name)
			if err != nil {
				t.Fatal(err)
			}
			e, _ := Direct(info.Name)
			const n = 1999 // not a multiple of any grid's interval count
			worst, worstT := 0.0, 0.0
			for k := 0; k <= n; k++ {
				T := info.Tmin + (info.Tmax-info.Tmin)*float64(k)/n
				got, err := f.AtT(T)
				if err != nil {
					t.Fatalf("AtT(%g): %v", T, err)
				}
				want, err := e.Direct(T)
				if err != nil {
					t.Fatalf("Direct(%g): %v", T, err)
				}
				if d := satDeviation(got, want); d > worst {
					worst, worstT = d, T
				}
				back, err := f.AtP(got.P)
				if err != nil {
					t.Fatalf("AtP(%g): %v", got.P, err)
				}
				if math.Abs(back.T-T) > 1e-9*T {
					t.Errorf("AtP(AtT(%.10g K).P).T = %.10g K", T, back.T)
				}
			}
			if worst > 1e-4 {
				t.Errorf("cached table deviates from the equations by %.3g%% at %g K", 100*worst, worstT)
			}
			t.Logf("largest deviation %.2g%% at %g K", 100*worst, worstT)
		})
	}
}

func TestTableRange(t *testing.T) {
	f, err := Lookup("water")
	if err != nil {
		t.Fatal(err)
	}
	in := f.Info()
	for _, T := range []float64{in.Tmin - 1e-9, in.Tmax + 1e-9, 0, -1, math.NaN(), math.Inf(1), math.Inf(-1)} {
		var re *RangeError
		if _, err := f.AtT(T); !errors.As(err, &re) {
			t.Errorf("AtT(%g) error = %v, want *RangeError", T, err)
		}
	}
	lo, _ := f.AtT(in.Tmin)
	hi, _ := f.AtT(in.Tmax)
	for _, p := range []float64{lo.P * (1 - 1e-9), hi.P * (1 + 1e-9), 0, -1, math.NaN(), math.Inf(1)} {
		var re *RangeError
		if _, err := f.AtP(p); !errors.As(err, &re) {
			t.Errorf("AtP(%g) error = %v, want *RangeError", p, err)
		}
	}
	// The ends are answered, and equal the equations there.
	for _, T := range []float64{in.Tmin, in.Tmax} {
		got, err := f.AtT(T)
		if err != nil {
			t.Fatalf("AtT(%g): %v", T, err)
		}
		want, _ := water{}.Direct(T)
		if d := satDeviation(got, want); d > 1e-12 {
			t.Errorf("AtT(%g) deviates by %.2g at a node", T, d)
		}
	}
}

// TestTableConcurrent looks up one fluid from many goroutines, for the race detector.
func TestTableConcurrent(t *testing.T) {
	var wg sync.WaitGroup
	for g := 0; g < 8; g++ {
		wg.Add(1)
		go func(g int) {
			defer wg.Done()
			f, err := Lookup("R718")
			if err != nil {
				t.Error(err)
				return
			}
			for k := 0; k < 200; k++ {
				if _, err := f.AtT(300 + float64(g*k%300)); err != nil {
					t.Error(err)
					return
				}
			}
		}(g)
	}
	wg.Wait()
}

var sink Sat

func BenchmarkAtT(b *testing.B) {
	f, err := Lookup("water")
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	T := 300.0
	for b.Loop() {
		s, _ := f.AtT(T)
		sink = s
		T += 0.37
		if T > 620 {
			T = 300
		}
	}
}

func BenchmarkAtP(b *testing.B) {
	f, err := Lookup("water")
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	p := 5e3
	for b.Loop() {
		s, _ := f.AtP(p)
		sink = s
		p *= 1.01
		if p > 1.5e7 {
			p = 5e3
		}
	}
}

// BenchmarkBuild times building one fluid's table, for every built-in fluid.
func BenchmarkBuild(b *testing.B) {
	for _, in := range List() {
		e, _ := Direct(in.Name)
		b.Run(in.Name, func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := newTabulated(e); err != nil {
					b.Skip(err)
				}
			}
			if tb, err := newTabulated(e); err == nil {
				b.ReportMetric(float64(tb.(*tabulated).n), "intervals")
			}
		})
	}
}

func BenchmarkWaterDirect(b *testing.B) {
	w := water{}
	for b.Loop() {
		s, _ := w.Direct(400)
		sink = s
	}
}
