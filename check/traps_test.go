package check

import (
	"fmt"
	"math/rand/v2"
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

// randomLine is a loop whose liquid and vapour lines each pass a group of
// parallel chains, with node heights drawn from r (whole millimetres).
func randomLine(r *rand.Rand) []byte {
	var b strings.Builder
	b.WriteString("part tube {\n  bore 10 mm\n  roughness 1.5 um\n}\n\nloop t {\n  fluid R1233zd(E)\n  charge 200 g\n  design_pressure 6 bar(g)\n\n")
	z := map[string]int{}
	var nodes, comps []string
	node := func(name string, h int, junction bool) {
		z[name] = h
		kw := "node"
		if junction {
			kw = "junction"
		}
		nodes = append(nodes, fmt.Sprintf("  %s %s at (0, 0, %d) mm\n", kw, name, h))
	}
	comp := func(kind, name, from, to, extra string) {
		rise := z[to] - z[from]
		comps = append(comps, fmt.Sprintf("  %s %s from %s to %s {\n    use tube\n    length %d mm\n    rise %d mm\n%s  }\n", kind, name, from, to, max(rise, -rise)+200, rise, extra))
	}
	chain := func(prefix, from, to string, n int) {
		prev := from
		for i := 0; i < n; i++ {
			name := fmt.Sprintf("%s%d", prefix, i)
			node(name, r.IntN(40)*50, false)
			comp("pipe", name+"p", prev, name, "")
			prev = name
		}
		comp("pipe", prefix+"end", prev, to, "")
	}
	group := func(prefix, from, to string) {
		node(from, r.IntN(40)*50, true)
		node(to, r.IntN(40)*50, true)
		for k := 1 + r.IntN(3); k > 0; k-- {
			chain(fmt.Sprintf("%sg%c", prefix, 'a'+k), from, to, r.IntN(4))
		}
	}
	node("cin", 3000, false)
	node("cout", 2800, false)
	node("ein", r.IntN(10)*50, false)
	node("eout", r.IntN(10)*50+300, false)
	comp("condenser", "cond", "cin", "cout", "    conductance 20 W/K\n")
	group("l", "ls", "lj")
	chain("ld", "cout", "ls", r.IntN(4))
	chain("le", "lj", "ein", r.IntN(3))
	comp("evaporator", "evap", "ein", "eout", "    heated_length 0.1 m\n    wetted_area 0.01 m²\n    heat 10 W\n")
	group("v", "vs", "vj")
	chain("vd", "eout", "vs", r.IntN(3))
	chain("ve", "vj", "cin", r.IntN(4))
	b.WriteString(strings.Join(nodes, ""))
	b.WriteString("\n")
	b.WriteString(strings.Join(comps, ""))
	b.WriteString("}\n\ncase c nominal {\n  heat evap 10 W\n  sink cond 30 °C\n}\n")
	return []byte(b.String())
}

// trapNodes are the rule and node of each trap finding, sorted.
func trapNodes(fs []string) []string {
	var out []string
	for _, f := range fs {
		_, rest, _ := strings.Cut(f, " to node ")
		node, _, _ := strings.Cut(rest, " ")
		_, rule, _ := strings.Cut(f, " [")
		out = append(out, rule+" "+node)
	}
	slices.Sort(out)
	return out
}

// On random lines with parallel chains the pass finds the humps and dips
// the walk finds. Where several paths pass a top, the walk tells the climb
// and fall of the first it takes, the pass the largest.
func TestTrapsPassMatchesWalkRandom(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 5))
	defer func() { trapsByWalk = false }()
	seen := 0
	for trial := 0; trial < 300; trial++ {
		src := randomLine(r)
		m := lang.LoadSource("t.loop", src, nil)
		for _, d := range m.Diags {
			if d.Severity == lang.Error {
				t.Fatalf("trial %d: %s\n%s", trial, d.Message(), src)
			}
		}
		opts := Options{SkipEstimates: true}
		trapsByWalk = true
		walk := trapFindings(m, opts)
		trapsByWalk = false
		pass := trapFindings(m, opts)
		seen += len(walk)
		if !slices.Equal(trapNodes(walk), trapNodes(pass)) {
			t.Fatalf("trial %d:\nwalk:\n%s\npass:\n%s\n%s", trial, strings.Join(walk, "\n"), strings.Join(pass, "\n"), src)
		}
	}
	t.Logf("%d trap findings compared", seen)
}
