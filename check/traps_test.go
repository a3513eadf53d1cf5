package check

import (
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"circa/lang"
	"circa/lang/loopgen"
)

// trapFindings are the trap rules' findings of m, rendered.
func trapFindings(m *lang.Model, opts Options) []string {
	var out []string
	for _, d := range Run(m, opts) {
		if d.Rule == "downcomer-high-point" || d.Rule == "riser-low-point" {
			out = append(out, render(m, d))
		}
	}
	return out
}

// The pass in topological order finds the humps and dips that the walk of
// every path finds, with the same messages, in every rule archive and
// shipped example.
func TestTrapsPassMatchesWalk(t *testing.T) {
	type model struct {
		name string
		m    *lang.Model
		opts Options
	}
	var ms []model
	for _, ac := range loadArchives(t) {
		m := lang.LoadSource(ac.root, ac.fsys[ac.root], ac.fsys)
		if len(ac.set) > 0 {
			var err error
			if m, err = m.With(ac.set...); err != nil {
				t.Fatal(err)
			}
		}
		ms = append(ms, model{ac.name, m, Options{SkipEstimates: true}})
	}
	paths, _ := filepath.Glob("../testdata/examples/*.loop")
	for _, p := range paths {
		ms = append(ms, model{p, lang.Load(p, lang.OSFS{}), Options{SkipEstimates: true}})
	}
	defer func() { trapsByWalk = false }()
	seen := 0
	for _, x := range ms {
		trapsByWalk = true
		walk := trapFindings(x.m, x.opts)
		trapsByWalk = false
		pass := trapFindings(x.m, x.opts)
		seen += len(walk)
		if !slices.Equal(walk, pass) {
			t.Errorf("%s:\nwalk:\n%s\npass:\n%s", x.name, strings.Join(walk, "\n"), strings.Join(pass, "\n"))
		}
	}
	if seen == 0 {
		t.Error("no trap findings to compare")
	}
	t.Logf("%d trap findings compared", seen)
}

// BenchmarkTrapsWide runs the structural rules on a network of 20,000
// components with 2,000 parallel branches, whose liquid line has 2,000
// paths of 14,000 components each (target: under 100 ms).
func BenchmarkTrapsWide(b *testing.B) {
	m := lang.LoadSource("net.loop", loopgen.Network(20000, 2000), nil)
	b.ReportAllocs()
	u0 := cpuTime()
	for b.Loop() {
		Run(m, Options{SkipEstimates: true})
	}
	cpuPerOp(b, u0)
}
