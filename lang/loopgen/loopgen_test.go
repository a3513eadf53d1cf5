package loopgen

import (
	"bytes"
	"math"
	"strings"
	"testing"

	"circa/lang"
)

func load(t *testing.T, src []byte) *lang.Model {
	t.Helper()
	m := lang.LoadSource("gen.loop", src, nil)
	for _, d := range m.Diags {
		p := m.Files["gen.loop"].Mapper.OffsetPosition(d.Loc.Span.Start, lang.UTF8)
		t.Errorf("gen.loop:%d:%d: %s [%s]", p.Line+1, p.Col+1, d.Message(), d.Rule)
	}
	return m
}

// checkClosure assigns each node an elevation from the rises (breadth
// first from the first node) and checks every component against it: the
// rises sum to zero around every cycle exactly when this succeeds. Node
// coordinates, where given, must agree with the same elevations.
func checkClosure(t *testing.T, l *lang.Loop) {
	t.Helper()
	z := map[*lang.Node]float64{l.Nodes[0]: 0}
	adj := map[*lang.Node][]*lang.Component{}
	for _, c := range l.Components {
		if c.To != nil {
			adj[c.From] = append(adj[c.From], c)
			adj[c.To] = append(adj[c.To], c)
		}
	}
	queue := []*lang.Node{l.Nodes[0]}
	for len(queue) > 0 {
		n := queue[0]
		queue = queue[1:]
		for _, c := range adj[n] {
			other, dz := c.To, c.Rise.SI
			if n == c.To {
				other, dz = c.From, -dz
			}
			if _, seen := z[other]; !seen {
				z[other] = z[n] + dz
				queue = append(queue, other)
			}
		}
	}
	for _, c := range l.Components {
		if c.To == nil {
			continue // a reservoir is a dead end, in no cycle
		}
		if !c.Rise.Set {
			t.Errorf("%s has no rise", c.Name)
			continue
		}
		if math.Abs(z[c.To]-z[c.From]-c.Rise.SI) > 1e-9 {
			t.Errorf("%s: rise %g m does not close the cycle through it", c.Name, c.Rise.SI)
		}
		if c.Length.SI < math.Abs(c.Rise.SI) {
			t.Errorf("%s: length %g m shorter than its rise %g m", c.Name, c.Length.SI, c.Rise.SI)
		}
	}
	var ref *lang.Node
	for _, n := range l.Nodes {
		if _, ok := z[n]; !ok {
			t.Errorf("node %s is not connected", n.Name)
		}
		if !n.At.Set {
			continue
		}
		if ref == nil {
			ref = n
			continue
		}
		if math.Abs((n.At.Z-ref.At.Z)-(z[n]-z[ref])) > 1e-9 {
			t.Errorf("node %s: coordinates disagree with the rises", n.Name)
		}
	}
}

func cycles(l *lang.Loop) int {
	edges := 0
	for _, c := range l.Components {
		if c.To != nil {
			edges++
		}
	}
	return edges - len(l.Nodes) + 1
}

func TestNetwork(t *testing.T) {
	for _, tc := range []struct{ comps, cycles int }{
		{4, 1}, {5, 1}, {6, 2}, {12, 3}, {13, 3}, {40, 5}, {300, 20}, {5000, 50},
	} {
		src := Network(tc.comps, tc.cycles)
		m := load(t, src)
		if len(m.Loops) != 1 {
			t.Fatalf("Network(%d, %d): %d loops", tc.comps, tc.cycles, len(m.Loops))
		}
		l := m.Loops[0]
		if len(l.Components) != tc.comps || cycles(l) != tc.cycles {
			t.Errorf("Network(%d, %d): %d components, %d cycles", tc.comps, tc.cycles, len(l.Components), cycles(l))
		}
		checkClosure(t, l)
		junctions, coords := 0, 0
		for _, n := range l.Nodes {
			if n.Junction {
				junctions++
			}
			if n.At.Set {
				coords++
			}
		}
		if (tc.cycles > 1) != (junctions == 2) || coords < 4 {
			t.Errorf("Network(%d, %d): %d junctions, %d nodes with coordinates", tc.comps, tc.cycles, junctions, coords)
		}
		if len(m.Cases) != 2 || m.Nominal == nil || len(m.Nominal.Heat) != tc.cycles {
			t.Errorf("Network(%d, %d): cases %d", tc.comps, tc.cycles, len(m.Cases))
		}
		if !bytes.Equal(src, Network(tc.comps, tc.cycles)) {
			t.Error("Network is not deterministic")
		}
		if out, err := lang.Format(lang.Parse("gen.loop", src)); err != nil || !bytes.Equal(out, src) {
			t.Errorf("Network(%d, %d) is not in the canonical layout (%v)", tc.comps, tc.cycles, err)
		}
	}
	// Too few components for the cycles: raised to the minimum.
	if l := load(t, Network(1, 4)).Loops[0]; len(l.Components) != MinComponents(4) || cycles(l) != 4 {
		t.Errorf("Network(1, 4): %d components, %d cycles", len(l.Components), cycles(l))
	}
}

func TestLines(t *testing.T) {
	for _, n := range []int{100, 300, 1000, 5000} {
		src := Lines(n)
		got := bytes.Count(src, []byte("\n"))
		if got != n {
			t.Errorf("Lines(%d) has %d lines", n, got)
		}
		m := load(t, src)
		if len(m.Loops) < 1 || len(m.Params) < 3 || len(m.Parts) != len(m.Loops) || len(m.Cases) != 2*len(m.Loops) {
			t.Errorf("Lines(%d): %d loops, %d params, %d parts, %d cases", n, len(m.Loops), len(m.Params), len(m.Parts), len(m.Cases))
		}
		for _, l := range m.Loops {
			checkClosure(t, l)
		}
		if !strings.Contains(string(src), "# sized for every branch") {
			t.Error("no comments")
		}
	}
	if m := load(t, Lines(1)); len(m.Loops) != 1 {
		t.Error("Lines(1) holds no loop")
	}
}
