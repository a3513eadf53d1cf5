package fluid

import (
	"math"
	"testing"
)

// EnthalpiesAtP must give AtP's liquid enthalpy and latent heat to the bit,
// across each built-in fluid's pressure range and outside it.
func TestEnthalpiesAtPMatchesAtP(t *testing.T) {
	for _, name := range Names() {
		f, err := Lookup(name)
		if err != nil {
			t.Fatal(err)
		}
		info := f.Info()
		lo, _ := f.AtT(info.Tmin)
		hi, _ := f.AtT(info.Tmax)
		const n = 200
		for k := -2; k <= n+2; k++ {
			p := lo.P * math.Pow(hi.P/lo.P, float64(k)/n)
			want, werr := f.AtP(p)
			hl, hlv, err := EnthalpiesAtP(f, p)
			if (err != nil) != (werr != nil) {
				t.Fatalf("%s at %g Pa: error %v, AtP's %v", name, p, err, werr)
			}
			if werr == nil && (hl != want.HL || hlv != want.Hlv) {
				t.Fatalf("%s at %g Pa: (%v, %v), AtP gives (%v, %v)", name, p, hl, hlv, want.HL, want.Hlv)
			}
		}
	}
}
