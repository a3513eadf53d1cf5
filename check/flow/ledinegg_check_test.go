package flow_test

import (
	"path/filepath"
	"strings"
	"testing"

	"circa/check"
	"circa/check/flow"
	"circa/lang"
)

// TestLedineggCheck: checking the three-balance loop of TestLedineggLoop
// warns of its unstable middle balance (≈ 41 g/s), located at the loop's
// name, with the case as related location.
func TestLedineggCheck(t *testing.T) {
	path := filepath.Join("..", "..", "testdata", "flow", "ledinegg.loop")
	m := lang.Load(path, lang.OSFS{})
	ds := check.Run(m, check.Options{NoTilt: true})
	var hits []lang.Diagnostic
	for _, d := range ds {
		if d.Rule == flow.RuleUnstable {
			hits = append(hits, d)
		}
	}
	if len(hits) != 1 {
		t.Fatalf("%d %s findings, want 1: %v", len(hits), flow.RuleUnstable, ds)
	}
	d := hits[0]
	l := m.Loops[0]
	if d.Severity != lang.Warning || d.Loc != l.NameLoc() || !strings.HasSuffix(d.Loc.File, "ledinegg.loop") {
		t.Errorf("finding %v at %+v, want a warning at loop %s (%+v)", d.Message(), d.Loc, l.Name, l.NameLoc())
	}
	if !strings.Contains(d.Message(), "41 g/s") {
		t.Errorf("message %q does not give the unstable flow", d.Message())
	}
	if len(d.Related) == 0 || d.Related[0].Loc != m.Cases[0].NameLoc() {
		t.Errorf("related %+v, want the case nominal", d.Related)
	}
}
