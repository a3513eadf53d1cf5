package correlate

import (
	"math"
	"strings"
	"testing"
)

// The stated ranges, each against the source it names. A range marked
// "from memory" could not be compared with a printed source; the test then
// only pins the value that the explanation prints.
func TestValidityStatedRanges(t *testing.T) {
	for _, c := range []struct {
		v        Validity
		quantity string
		min, max float64
		memory   bool
	}{
		// fluids library (C. Bell), Debian python3-fluids 1.0.22,
		// two_phase.Friedel docstring: "Known to work poorly when
		// mul/mug > 1000."
		{ValidityFriedel, "μl/μv", math.Inf(-1), 1000, false},
		// Same docstring: "Tested on data with diameters as small as 4 mm."
		{ValidityFriedel, "D", 0.004, math.Inf(1), false},
		// Same docstring: "Applicable to vertical upflow and horizontal
		// flow"; within 5° of horizontal (cos 85° = 0.0872) counts as
		// horizontal, circa's choice.
		{ValidityFriedel, "cos θ", math.Inf(-1), 0.0872, false},
		// fluids, two_phase.Lockhart_Martinelli docstring: "Developed for
		// horizontal flow."
		{ValidityLockhartMartinelli, "|cos θ|", math.Inf(-1), 0.0872, false},
		// ht library (C. Bell), conv_internal.turbulent_Dittus_Boelter
		// docstring: "Re_{D} ≥ 10000".
		{ValidityBoykoKruzhilin, "Re_lo", 1e4, math.Inf(1), false},
		{ValidityCavalliniSmithZecchin, "Re_eq", 1e4, math.Inf(1), false},
		// Shah (1979) and his 1981 low-flow limit, from memory.
		{ValidityShah1979, "Re_lo", 350, math.Inf(1), true},
		{ValidityShah1979, "p_r", 0.002, 0.44, true},
		// Cooper (1984), from memory.
		{ValidityCooper, "p_r", 0.001, 0.9, true},
		// Katto & Ohno (1984), from memory.
		{ValidityKattoOhno, "L/D", 5, 880, true},
		{ValidityKattoOhno, "ρv/ρl", 0.0003, 0.41, true},
	} {
		var found *Bound
		for i := range c.v.Bounds {
			if c.v.Bounds[i].Quantity == c.quantity {
				found = &c.v.Bounds[i]
			}
		}
		if found == nil {
			t.Errorf("%s: no range of %s", c.v.Correlation, c.quantity)
			continue
		}
		if found.Min != c.min || found.Max != c.max {
			t.Errorf("%s %s: range [%g, %g], want [%g, %g]", c.v.Correlation, c.quantity, found.Min, found.Max, c.min, c.max)
		}
		if got := strings.Contains(found.Source, "from memory"); got != c.memory {
			t.Errorf("%s %s: source %q says from memory: %v, want %v", c.v.Correlation, c.quantity, found.Source, got, c.memory)
		}
	}
	n := 0
	for _, v := range Validities() {
		n += len(v.Bounds)
		if w, ok := ValidityOf(v.Correlation); !ok || w.Correlation != v.Correlation {
			t.Errorf("ValidityOf(%q) = %v, %v", v.Correlation, w, ok)
		}
		for _, b := range v.Bounds {
			if b.Source == "" || b.What == "" || !(b.Min < b.Max) {
				t.Errorf("%s %s: incomplete bound %+v", v.Correlation, b.Quantity, b)
			}
		}
	}
	if n != 11 {
		t.Errorf("%d stated ranges; the table above checks 11", n)
	}
}

func TestValidityWorst(t *testing.T) {
	// Inside every range: nothing.
	if o, ok := ValidityFriedel.Worst(map[string]float64{"μl/μv": 50, "D": 0.01}); ok {
		t.Errorf("inside: %+v", o)
	}
	// Both outside: the bore is 4 times too small, the ratio 1.5 times
	// too large, so the bore is named.
	o, ok := ValidityFriedel.Worst(map[string]float64{"μl/μv": 1500, "D": 0.001})
	if !ok || o.Bound.Quantity != "D" || o.Limit != 0.004 || o.Factor != 4 || !o.Below() {
		t.Errorf("worst = %+v, %v; want D below 0.004 by 4", o, ok)
	}
	o, ok = ValidityFriedel.Worst(map[string]float64{"μl/μv": 1500, "D": 0.0035})
	if !ok || o.Bound.Quantity != "μl/μv" || o.Factor != 1.5 || o.Below() {
		t.Errorf("worst = %+v, %v; want μl/μv above 1000 by 1.5", o, ok)
	}
	// Not given, NaN or infinite: ignored. Zero below a positive minimum:
	// infinitely far.
	if o, ok := ValidityKattoOhno.Worst(map[string]float64{"L/D": math.NaN(), "ρv/ρl": math.Inf(1)}); ok {
		t.Errorf("non-finite inputs: %+v", o)
	}
	if o, ok := ValidityShah1979.Worst(map[string]float64{"Re_lo": 0}); !ok || !math.IsInf(o.Factor, 1) {
		t.Errorf("Re_lo 0: %+v, %v", o, ok)
	}
}

func TestBoundText(t *testing.T) {
	for _, c := range []struct {
		b    Bound
		want string
	}{
		{ValidityShah1979.Bounds[0], "Re_lo ≥ 350"},
		{ValidityShah1979.Bounds[1], "0.002 ≤ p_r ≤ 0.44"},
		{ValidityFriedel.Bounds[0], "μl/μv ≤ 1000"},
		{ValidityFriedel.Bounds[1], "D ≥ 0.004 m"},
		{ValidityBoykoKruzhilin.Bounds[0], "Re_lo ≥ 10000"},
	} {
		if got := c.b.Text(); got != c.want {
			t.Errorf("Text() = %q, want %q", got, c.want)
		}
	}
}

func TestCondensationValidity(t *testing.T) {
	for _, c := range []struct {
		m    CondensationMethod
		name string
		ok   bool
	}{
		{CondShah1979, "Shah (1979)", true},
		{CondBoykoKruzhilin, "Boyko & Kruzhilin (1967)", true},
		{CondCavalliniSmithZecchin, "Cavallini, Smith & Zecchin (1974)", true},
		{CondAkersDeansCrosser, "", false},
	} {
		v, ok := c.m.Validity()
		if ok != c.ok || v.Correlation != c.name || (ok && v.Method != "condensation") {
			t.Errorf("%s: %+v, %v", c.m, v, ok)
		}
	}
}

// cos85 is cos 85° to the digits it prints, and the horizontal band the
// void fraction uses.
func TestCos85(t *testing.T) {
	if math.Abs(cos85-math.Cos(85*math.Pi/180)) > 5e-5 || math.Abs(cos85-HorizontalCos) > 5e-5 {
		t.Errorf("cos85 = %g, cos 85° = %g", cos85, math.Cos(85*math.Pi/180))
	}
}
