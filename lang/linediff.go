package lang

import "sort"

// Line diffs (circa fmt -d, the editor's formatting edits). Their memory is
// linear in the texts: the edit script is found by anchoring on lines that
// occur once in each side (their longest increasing run), recursing between
// anchors, with a quadratic longest-common-subsequence table only for small
// stretches.

// smallDiffCells bounds the table of the quadratic search; a larger stretch
// without unique common lines is shown as one replacement.
const smallDiffCells = 1 << 16

// LineEdit is one line of an edit script.
type LineEdit struct {
	// Kind is ' ' for a line kept, '-' removed, '+' added.
	Kind byte
	Text string
}

// LineEdits returns the line edits that turn a into b: every line of a
// kept or removed and every line of b kept or added, in order, with the
// removals of a change before its additions.
func LineEdits(a, b []string) []LineEdit {
	// A script has at most one op per line of either text: reserved at
	// once, a long script is never copied into a doubled array.
	ops := make([]LineEdit, 0, len(a)+len(b))
	return diffLines(ops, a, b)
}

// diffLines appends to ops the edits that turn a into b.
func diffLines(ops []LineEdit, a, b []string) []LineEdit {
	pre, suf := CommonEnds(a, b)
	for _, l := range a[:pre] {
		ops = append(ops, LineEdit{' ', l})
	}
	am, bm := a[pre:len(a)-suf], b[pre:len(b)-suf]
	switch {
	case len(am) == 0 || len(bm) == 0:
		ops = replaceLines(ops, am, bm)
	case len(am)*len(bm) <= smallDiffCells:
		ops = lcsLines(ops, am, bm)
	default:
		ops = anchoredLines(ops, am, bm)
	}
	for _, l := range a[len(a)-suf:] {
		ops = append(ops, LineEdit{' ', l})
	}
	return ops
}

// replaceLines removes all of a and adds all of b; removals come first.
func replaceLines(ops []LineEdit, a, b []string) []LineEdit {
	for _, l := range a {
		ops = append(ops, LineEdit{'-', l})
	}
	for _, l := range b {
		ops = append(ops, LineEdit{'+', l})
	}
	return ops
}

// lcsLines is a longest common subsequence of a and b by the quadratic
// table; a and b are small.
func lcsLines(ops []LineEdit, a, b []string) []LineEdit {
	n, m := len(a), len(b)
	// lcs[i*w+j] is the LCS length of a[i:] and b[j:].
	w := m + 1
	lcs := make([]int32, (n+1)*w)
	for i := n - 1; i >= 0; i-- {
		for j := m - 1; j >= 0; j-- {
			if a[i] == b[j] {
				lcs[i*w+j] = lcs[(i+1)*w+j+1] + 1
			} else {
				lcs[i*w+j] = max(lcs[(i+1)*w+j], lcs[i*w+j+1])
			}
		}
	}
	i, j := 0, 0
	for i < n || j < m {
		switch {
		case i < n && j < m && a[i] == b[j]:
			ops = append(ops, LineEdit{' ', a[i]})
			i++
			j++
		case j == m || (i < n && lcs[(i+1)*w+j] >= lcs[i*w+j+1]):
			// Removals come before additions within a change.
			ops = append(ops, LineEdit{'-', a[i]})
			i++
		default:
			ops = append(ops, LineEdit{'+', b[j]})
			j++
		}
	}
	return ops
}

// anchoredLines matches the lines that occur exactly once in a and once in
// b, keeps the longest run of them in the same order in both, and diffs
// the stretches between them.
func anchoredLines(ops []LineEdit, a, b []string) []LineEdit {
	// How often each line of a occurs in a and in b, and where in b; the
	// counts stop at 2, which is all that matters.
	type seen struct{ na, nb, ib int32 }
	index := make(map[string]int32, len(a))
	var counts []seen
	for _, l := range a {
		k, ok := index[l]
		if !ok {
			k = int32(len(counts))
			index[l] = k
			counts = append(counts, seen{})
		}
		counts[k].na = min(counts[k].na+1, 2)
	}
	for j, l := range b {
		if k, ok := index[l]; ok {
			counts[k].nb = min(counts[k].nb+1, 2)
			counts[k].ib = int32(j)
		}
	}
	// Unique pairs in a's order.
	var pairs [][2]int
	for i, l := range a {
		if s := counts[index[l]]; s.na == 1 && s.nb == 1 {
			pairs = append(pairs, [2]int{i, int(s.ib)})
		}
	}
	index, counts = nil, nil
	anchors := increasingRun(pairs)
	if len(anchors) == 0 {
		return replaceLines(ops, a, b)
	}
	i, j := 0, 0
	for _, p := range anchors {
		ops = diffLines(ops, a[i:p[0]], b[j:p[1]])
		ops = append(ops, LineEdit{' ', a[p[0]]})
		i, j = p[0]+1, p[1]+1
	}
	return diffLines(ops, a[i:], b[j:])
}

// increasingRun returns a longest subsequence of pairs (sorted by their
// first element) whose second elements increase (patience sorting).
func increasingRun(pairs [][2]int) [][2]int {
	if len(pairs) == 0 {
		return nil
	}
	tails := []int{}                // index into pairs of the smallest tail of each length
	prev := make([]int, len(pairs)) // predecessor in the run ending at each pair
	for k, p := range pairs {
		n := sort.Search(len(tails), func(t int) bool { return pairs[tails[t]][1] >= p[1] })
		if n > 0 {
			prev[k] = tails[n-1]
		} else {
			prev[k] = -1
		}
		if n == len(tails) {
			tails = append(tails, k)
		} else {
			tails[n] = k
		}
	}
	run := make([][2]int, len(tails))
	for k, t := len(tails)-1, tails[len(tails)-1]; k >= 0; k, t = k-1, prev[t] {
		run[k] = pairs[t]
	}
	return run
}
