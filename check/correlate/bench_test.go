package correlate

import "testing"

var sink float64

func BenchmarkFrictionGradient(b *testing.B) {
	for _, m := range allFriction {
		b.Run(m.String(), func(b *testing.B) {
			b.ReportAllocs()
			x := 0.0
			for b.Loop() {
				x += 1e-6
				if x >= 1 {
					x = 1e-6
				}
				sink += FrictionGradient(m, 300, x, 0.01, 1e-4, r134a40, gn)
			}
		})
	}
}

// BenchmarkPreparedFriction is the per-cell cost once a component's tube,
// mass flux and properties are bound.
func BenchmarkPreparedFriction(b *testing.B) {
	for _, m := range allFriction {
		b.Run(m.String(), func(b *testing.B) {
			b.ReportAllocs()
			pf := Friction{Method: m}.Prepare(300, 0.01, 1e-4, r134a40, gn)
			x := 0.0
			for b.Loop() {
				x += 1e-6
				if x >= 1 {
					x = 1e-6
				}
				sink += pf.Gradient(x)
			}
		})
	}
}

func BenchmarkVoidFraction(b *testing.B) {
	for _, m := range allVoid {
		b.Run(m.String(), func(b *testing.B) {
			b.ReportAllocs()
			x := 0.0
			for b.Loop() {
				x += 1e-6
				if x >= 1 {
					x = 1e-6
				}
				sink += VoidFraction(m, x, 300, r134a40, gn, 1)
			}
		})
	}
}

func BenchmarkSinglePhase(b *testing.B) {
	for _, c := range []struct {
		name string
		f    SinglePhase
	}{{"churchill", Churchill}, {"colebrook", Colebrook}} {
		b.Run(c.name, func(b *testing.B) {
			re := 3000.0
			for b.Loop() {
				re *= 1.0001
				if re > 1e7 {
					re = 3000
				}
				sink += c.f(re, 1e-4)
			}
		})
	}
}

// BenchmarkCondensationMean is the cost of one quality-averaged in-tube
// coefficient, which a geometry condenser evaluates once per trial
// saturation temperature (Akers–Deans–Crosser once per bisection step).
func BenchmarkCondensationMean(b *testing.B) {
	p := r134a40
	for _, m := range []CondensationMethod{CondShah1979, CondBoykoKruzhilin, CondAkersDeansCrosser, CondCavalliniSmithZecchin} {
		b.Run(m.String(), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				sink += m.Mean(300, 1, 0, 0.01, p)
			}
		})
	}
}
