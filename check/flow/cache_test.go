package flow

import (
	"math"
	"testing"

	"circa/check/correlate"
	"circa/check/geom"
	"circa/lang"
)

// The march's cached friction preparation gives the very values of a fresh
// preparation: branch pressure changes of the
// two-branch example, marched again and again at a few flows and attitudes
// in an order that reuses and evicts cache entries, equal bit for bit those
// of a state without the cache.
func TestMarchCacheExact(t *testing.T) {
	m := lang.Load("../../testdata/examples/ferry-cabinet.loop", lang.OSFS{})
	mu, _ := chooseMethods(m.Methods, Options{})
	for _, fm := range []correlate.FrictionMethod{correlate.MullerSteinhagenHeck, correlate.Friedel, correlate.LockhartMartinelliChisholm} {
		p := prepare(m, m.Loops[0], mu)
		p.fric.Method = fm
		var cr CaseResult
		s, _ := p.newState(point{c: m.Cases[0]}, &cr)
		if s == nil || s.pfc == nil {
			t.Fatal("no state with a friction cache")
		}
		for _, tiltDeg := range []float64{0, 25, -40} {
			b := geom.BodyForceAt(0, tiltDeg*math.Pi/180, 0, geom.Vec3{})
			c := s.withBody(b)
			fresh := *c
			fresh.pfc = nil
			for _, mf := range []float64{0.02, 0.03, 0.02, 0.021, 0.05, 0.02, 0.03} {
				for bi := range s.net.branches {
					for _, xin := range []float64{-0.01, 0.05} {
						got := c.branchDP(bi, mf, xin, nil)
						want := fresh.branchDP(bi, mf, xin, nil)
						if got != want || math.IsNaN(got) {
							t.Fatalf("%v, %g°, branch %d, %g kg/s, x %g: cached %v Pa, fresh %v Pa", fm, tiltDeg, bi, mf, xin, got, want)
						}
					}
				}
			}
		}
	}
}
