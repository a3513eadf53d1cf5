package units

import "testing"

// Display symbols as the SI Brochure (BIPM, 9th ed., 2019) writes them:
// the prefix micro µ, superscript powers, the half-high dot for a product,
// and the degree sign of the Celsius scale.
func TestPretty(t *testing.T) {
	for in, want := range map[string]string{
		"um": "µm", "m2": "m²", "cm3": "cm³", "degC": "°C", "W/(m2*K)": "W/(m²·K)",
		"Btu/(h*ft2)": "Btu/(h·ft²)", "degC_diff": "Δ°C", "bar(g)": "bar(g)", "kW": "kW", "W/m2": "W/m²",
	} {
		if got := Pretty(in); got != want {
			t.Errorf("Pretty(%q) = %q, want %q", in, got, want)
		}
		// Parse reads the displayed form back to the same unit.
		a, err1 := Parse(in)
		b, err2 := Parse(Pretty(in))
		if err1 != nil || err2 != nil || a.Text != b.Text {
			t.Errorf("%q and %q parse to %q and %q (%v %v)", in, Pretty(in), a.Text, b.Text, err1, err2)
		}
	}
}
