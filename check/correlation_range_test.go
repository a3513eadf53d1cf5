package check

import (
	"strings"
	"testing"

	"circa/check/correlate"
	"circa/lang"
)

// A correlation-range note stands at the component, names the worst case
// and the other cases once, and points at the methods entry that chose the
// correlation.
func TestCorrelationRangeFinding(t *testing.T) {
	src := `
loop l {
  fluid R134a
  node a at (0, 0, 0) m
  node b at (0, 0, 0.2) m
  node c at (0, 0, 1.2) m
  node d at (0, 0, 1.0) m
  evaporator e from a to b { length 0.2 m; rise 0.2 m; bore 10 mm; heat 40 W }
  pipe up from b to c { length 1 m; bore 10 mm }
  condenser k from c to d { length 1 m; bore 10 mm; sink 25 °C }
  pipe down from d to a { length 1.1 m; bore 10 mm }
}
case light { heat e 20 W }
case medium { heat e 40 W }
methods { condensation shah }
`
	m := lang.LoadSource("t.loop", []byte(src), lang.OSFS{})
	var got []lang.Diagnostic
	for _, d := range Run(m, Options{NoTilt: true}) {
		if d.Rule == "correlation-range" {
			got = append(got, d)
		}
	}
	if len(got) != 1 {
		t.Fatalf("%d correlation-range findings, want one for the condenser: %v", len(got), got)
	}
	d := got[0]
	at := func(loc lang.Location) string { return src[loc.Span.Start:loc.Span.End] }
	msg := d.Message()
	if d.Severity != lang.Info || at(d.Loc) != "k" || !strings.Contains(msg, "in case light") || !strings.Contains(msg, "also in case medium") {
		t.Errorf("finding %s at %q: %s", d.Severity, at(d.Loc), msg)
	}
	var method bool
	for _, r := range d.Related {
		if r.Message == "the method chosen" && at(r.Loc) == "shah" {
			method = true
		}
	}
	if !method {
		t.Errorf("no related location at the methods entry: %+v", d.Related)
	}
}

// circa explain correlation-range lists every stated range with its source.
func TestCorrelationRangeExplained(t *testing.T) {
	r, ok := Lookup("correlation-range")
	if !ok || r.Severity != lang.Info {
		t.Fatalf("correlation-range registered %v, %+v", ok, r)
	}
	for _, v := range correlate.Validities() {
		for _, b := range v.Bounds {
			if !strings.Contains(r.Rationale, v.Correlation+": ") || !strings.Contains(r.Rationale, b.Text()+" ("+b.What+"; "+b.Source+")") {
				t.Errorf("the rationale does not give %s's range %s with its source", v.Correlation, b.Text())
			}
		}
	}
}

// The margin rules that rest on a published correlation name it with its
// year in circa explain, so a reader can find the source.
func TestMarginRulesNameTheirSources(t *testing.T) {
	for id, want := range map[string][]string{
		"margin-flooding":         {"Wallis 1969", "One-Dimensional Two-Phase Flow"},
		"margin-wall-temperature": {"Cooper 1984", "Advances in Heat Transfer", "local codes"},
		"margin-chf":              {"Lienhard & Dhir 1973", "Katto & Ohno (1984"},
		"margin-condenser":        {"Nusselt 1916", "Chato 1962", "Shah (1979"},
		"ledinegg-unstable":       {"Ledinegg 1938"},
	} {
		r, ok := Lookup(id)
		if !ok {
			t.Errorf("%s is not registered", id)
			continue
		}
		for _, w := range want {
			if !strings.Contains(r.Rationale, w) {
				t.Errorf("%s's rationale does not name %q", id, w)
			}
		}
	}
}
