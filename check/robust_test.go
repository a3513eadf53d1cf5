package check

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"circa/lang"
)

// Every prefix of the example files (cut every few bytes, so through the
// middle of statements, numbers and blocks) is checked without an internal
// error and without NaN or Inf in any message.
func TestTruncatedInputs(t *testing.T) {
	paths, _ := filepath.Glob("../testdata/examples/*.loop")
	if len(paths) == 0 {
		t.Fatal("no examples")
	}
	for _, p := range paths {
		src, err := os.ReadFile(p)
		if err != nil {
			t.Fatal(err)
		}
		for cut := 0; cut <= len(src); cut += 5 {
			m := lang.LoadSource(p, src[:cut], lang.OSFS{})
			for _, d := range Run(m, Options{SkipEstimates: true}) {
				msg := d.Message()
				if d.Rule == "internal" || strings.Contains(msg, "NaN") || strings.Contains(msg, "Inf") {
					t.Fatalf("%s cut at %d: %s: %s", p, cut, d.Rule, msg)
				}
			}
		}
	}
}

func TestOptions(t *testing.T) {
	src := []byte("loop l {\n  fluid water\n  node a\n  node b\n  node spare\n  pipe p from a to b { length 1 m; bore 8 mm }\n}\n")
	m := lang.LoadSource("o.loop", src, archiveFS{})
	has := func(ds []lang.Diagnostic, rule string, sev lang.Severity) bool {
		for _, d := range ds {
			if d.Rule == rule && d.Severity == sev {
				return true
			}
		}
		return false
	}
	if ds := Run(m, Options{SkipEstimates: true}); !has(ds, "unused-node", lang.Warning) || !has(ds, "no-evaporator", lang.Error) {
		t.Errorf("defaults: %v", ds)
	}
	ds := Run(m, Options{SkipEstimates: true, Disabled: map[string]bool{"no-evaporator": true}, Severity: map[string]lang.Severity{"unused-node": lang.Error}})
	if has(ds, "no-evaporator", lang.Error) || !has(ds, "unused-node", lang.Error) {
		t.Errorf("disabled/override: %v", ds)
	}
	if !(Options{FailOn: lang.Warning}).Fails(ds) || (Options{}).Fails([]lang.Diagnostic{{Severity: lang.Warning}}) {
		t.Error("Fails")
	}
	// Running twice on one model gives the same findings (silencers reset).
	a, b := Run(m, Options{SkipEstimates: true}), Run(m, Options{SkipEstimates: true})
	if len(a) != len(b) {
		t.Errorf("second run differs: %d vs %d", len(a), len(b))
	}
}

// A silencer for a rule that is disabled (or skipped with the estimates) is
// not reported as unused: the rule did not run.
func TestAllowForDisabledRule(t *testing.T) {
	src := []byte("loop l {\n  fluid water\n  node a   # allow: unused-node\n  node b\n  node c\n  pipe p from b to c { length 1 m; bore 8 mm }\n}\n")
	m := lang.LoadSource("o.loop", src, archiveFS{})
	for _, d := range Run(m, Options{SkipEstimates: true, Disabled: map[string]bool{"unused-node": true}}) {
		if d.Rule == "unused-allow" {
			t.Errorf("reported: %s", d.Message())
		}
	}
	used := false
	for _, d := range Run(m, Options{SkipEstimates: true}) {
		if d.Rule == "unused-node" || d.Rule == "unused-allow" {
			used = true
		}
	}
	if used {
		t.Error("the silencer did not silence unused-node")
	}
}
