// Package loopgen writes valid .loop texts of a chosen size, for benchmarks
// and load tests of the parser, the checker and the language server.
//
// Network builds one loop with a given number of components and of
// independent cycles: parallel evaporator branches between two junctions,
// a riser, a condenser and a downcomer that returns to the first junction,
// split into as many series segments as the component count asks for.
// Every node has an elevation in whole millimetres and every component's
// rise is the difference of its ends' elevations, so the rises sum to zero
// around every cycle exactly. Some nodes carry coordinates consistent with
// those elevations. Lines builds a realistic file of about n lines from
// several such loops with parameters, parts and cases.
//
// The output is deterministic: the same arguments give the same bytes.
package loopgen

import (
	"fmt"
	"strings"
)

// MinComponents returns the fewest components a network with the given
// number of cycles can have: one evaporator per cycle, a riser, a condenser
// and a downcomer.
func MinComponents(cycles int) int {
	if cycles < 1 {
		cycles = 1
	}
	return cycles + 3
}

// Network returns the text of one loop, named "net", with exactly
// components components (counting its one reservoir, when there is room for
// it) and cycles independent cycles (components − nodes + 1 over the
// components that join two nodes), followed by two cases. cycles is raised
// to at least 1 and components to at least MinComponents(cycles).
//
// With more components than the minimum, each branch first gets a feed
// pipe, then an exit pipe, then a reservoir hangs off the first junction,
// and the rest lengthen the downcomer as a chain of pipes and bends.
func Network(components, cycles int) []byte {
	var b strings.Builder
	b.WriteString("# Generated network: parallel evaporator branches between two junctions.\n")
	b.WriteString("param bore_main = 10 mm\n\n")
	writeParts(&b, "")
	writeNetwork(&b, "net", "", components, cycles)
	writeCases(&b, "net", "", cycles, true)
	return []byte(strings.TrimRight(b.String(), "\n") + "\n")
}

func writeParts(b *strings.Builder, prefix string) {
	fmt.Fprintf(b, "part %stube {\n  bore bore_main\n  roughness 1.5 um\n}\n\n", prefix)
}

// evaporatorName and condenserName give the names writeNetwork uses, for
// the cases.
func evaporatorName(prefix string, i int) string { return fmt.Sprintf("%sevap%d", prefix, i) }
func condenserName(prefix string) string         { return prefix + "cond" }

// writeNetwork writes the loop; names are prefixed so several loops can
// share one file.
func writeNetwork(b *strings.Builder, loop, prefix string, components, cycles int) {
	if cycles < 1 {
		cycles = 1
	}
	if components < MinComponents(cycles) {
		components = MinComponents(cycles)
	}
	extra := components - MinComponents(cycles)
	feeds := min(extra, cycles)
	extra -= feeds
	exits := min(extra, cycles)
	extra -= exits
	reservoir := extra > 0
	if reservoir {
		extra--
	}
	segments := 1 + extra // downcomer pieces

	type node struct {
		name     string
		z        int // elevation in mm
		junction bool
		coords   bool
	}
	type comp struct {
		kind, name, from, to string
	}
	var nodes []node
	var comps []comp
	z := map[string]int{}
	addNode := func(name string, elev int, junction, coords bool) {
		nodes = append(nodes, node{name, elev, junction, coords})
		z[name] = elev
	}
	n := func(s string, i int) string { return fmt.Sprintf("%s%s%d", prefix, s, i) }
	split, merge := prefix+"split", prefix+"merge"
	cIn, cOut := prefix+"cond_in", prefix+"cond_out"
	junction := cycles > 1
	addNode(split, 0, junction, true)
	addNode(merge, 500, junction, true)
	for i := 0; i < cycles; i++ {
		from, to := split, merge
		if i < feeds {
			from = n("in", i)
			addNode(from, 0, false, i%2 == 0)
			comps = append(comps, comp{"pipe", n("feed", i), split, from})
		}
		if i < exits {
			to = n("out", i)
			addNode(to, 300, false, false)
		}
		comps = append(comps, comp{"evaporator", evaporatorName(prefix, i), from, to})
		if i < exits {
			comps = append(comps, comp{"pipe", n("exit", i), to, merge})
		}
	}
	addNode(cIn, 1500, false, true)
	addNode(cOut, 1200, false, true)
	comps = append(comps, comp{"pipe", prefix + "riser", merge, cIn})
	comps = append(comps, comp{"condenser", condenserName(prefix), cIn, cOut})
	prev := cOut
	for k := 0; k < segments; k++ {
		to := split
		if k < segments-1 {
			to = n("down", k)
			addNode(to, 1200-1200*(k+1)/segments, false, k%7 == 0)
		}
		kind := "pipe"
		if k%5 == 4 {
			kind = "bend"
		}
		comps = append(comps, comp{kind, n("seg", k), prev, to})
		prev = to
	}

	fmt.Fprintf(b, "loop %s {\n  fluid R1233zd(E)\n  charge %d g\n  design_pressure 6 bar(g)\n\n", loop, 200+10*components)
	for _, nd := range nodes {
		kw := "node"
		if nd.junction {
			kw = "junction"
		}
		if nd.coords {
			// Straight above one another: no end is farther from another
			// than the length of the tube between them.
			fmt.Fprintf(b, "  %s %s at (0, 0, %d) mm\n", kw, nd.name, nd.z)
		} else {
			fmt.Fprintf(b, "  %s %s\n", kw, nd.name)
		}
	}
	b.WriteString("\n")
	for _, c := range comps {
		rise := z[c.to] - z[c.from]
		length := abs(rise) + 200
		fmt.Fprintf(b, "  %s %s from %s to %s {\n", c.kind, c.name, c.from, c.to)
		fmt.Fprintf(b, "    use %stube\n    length %d mm\n    rise %d mm\n", prefix, length, rise)
		switch c.kind {
		case "evaporator":
			b.WriteString("    heated_length 0.2 m\n    wetted_area 0.01 m²\n    wall_limit 85 °C\n    heat 400 W\n")
		case "condenser":
			fmt.Fprintf(b, "    conductance %d W/K  # sized for every branch\n", 60*cycles)
		case "bend":
			b.WriteString("    loss 0.3\n")
		}
		b.WriteString("  }\n")
	}
	if reservoir {
		fmt.Fprintf(b, "  reservoir %ssump at %s {\n    volume 0.1 L\n  }\n", prefix, split)
	}
	b.WriteString("}\n\n")
}

// writeCases writes two cases for one loop; the first is marked nominal
// when nominal is set (a file may mark only one).
func writeCases(b *strings.Builder, loop, prefix string, cycles int, nominal bool) {
	if cycles < 1 {
		cycles = 1
	}
	for k, c := range []struct {
		name, extra string
		watts       int
	}{
		{"nominal", "", 400},
		{"tilted", "  pitch 5 deg\n  roll -3 deg\n", 300},
	} {
		nom := ""
		if k == 0 && nominal {
			nom = " nominal"
		}
		fmt.Fprintf(b, "case %s%s_%s%s {\n", prefix, loop, c.name, nom)
		for i := 0; i < cycles; i++ {
			fmt.Fprintf(b, "  heat %s %d W\n", evaporatorName(prefix, i), c.watts)
		}
		fmt.Fprintf(b, "  sink %s 30 °C\n%s}\n\n", condenserName(prefix), c.extra)
	}
}

func abs(x int) int {
	if x < 0 {
		return -x
	}
	return x
}

// Lines returns a realistic file of n lines (more when n is too small for
// one loop): a header comment, shared parameters and parts, limits and
// methods, loops of up to 40 components each with their cases, and spare
// parameters to make up the count.
func Lines(n int) []byte {
	var b strings.Builder
	b.WriteString("# Generated plant: several independent thermosiphon loops.\n")
	b.WriteString("param bore_main = 10 mm\nparam lift = 1.2 m\nparam margin = lift / 4 + 5 cm\n\n")
	b.WriteString("limits {\n  exit_quality 0.5\n  chf_ratio 2\n}\n\n")
	b.WriteString("methods {\n  friction friedel\n  cells 20\n}\n\n")
	for k := 0; ; k++ {
		have := strings.Count(b.String(), "\n")
		prefix := fmt.Sprintf("l%d_", k)
		loop := fmt.Sprintf("loop%d", k)
		cycles := 1 + k%3
		// A loop of c components takes about 6c + 25 lines with its part
		// and cases; shrink it until it fits what is left.
		comps := max(min(40, (n-have-25)/6), MinComponents(cycles))
		var text string
		for ; comps >= MinComponents(cycles); comps-- {
			var lb strings.Builder
			writeParts(&lb, prefix)
			writeNetwork(&lb, loop, prefix, comps, cycles)
			writeCases(&lb, loop, prefix, cycles, k == 0)
			text = lb.String()
			if have+strings.Count(strings.TrimRight(text, "\n"), "\n")+1 <= n {
				break
			}
		}
		if comps < MinComponents(cycles) && k > 0 {
			break
		}
		b.WriteString(text)
	}
	// Top up with spare parameters to exactly n lines.
	out := strings.TrimRight(b.String(), "\n") + "\n"
	have := strings.Count(out, "\n")
	var pad strings.Builder
	for k := 0; have+k < n; k++ {
		fmt.Fprintf(&pad, "param spare%d = %d mm\n", k, k+1)
	}
	return []byte(out + pad.String())
}
