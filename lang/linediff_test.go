package lang

import (
	"fmt"
	"math/rand"
	"strings"
	"testing"
)

// sides rebuilds both texts from an edit script: the kept and removed lines
// give the old one, the kept and added the new.
func sides(ops []LineEdit) (old, new string) {
	var a, b strings.Builder
	for _, op := range ops {
		if op.Kind != '+' {
			a.WriteString(op.Text)
		}
		if op.Kind != '-' {
			b.WriteString(op.Text)
		}
	}
	return a.String(), b.String()
}

// lcsLen is the length of a longest common subsequence by its recursive
// definition (tiny inputs only).
func lcsLen(a, b []string) int {
	if len(a) == 0 || len(b) == 0 {
		return 0
	}
	if a[0] == b[0] {
		return 1 + lcsLen(a[1:], b[1:])
	}
	return max(lcsLen(a[1:], b), lcsLen(a, b[1:]))
}

// Small texts: the script rebuilds both sides, keeps a longest common
// subsequence, and removes before it adds within a change.
func TestLineEditsSmall(t *testing.T) {
	rng := rand.New(rand.NewSource(1))
	pick := func() []string {
		out := make([]string, rng.Intn(8))
		for i := range out {
			out[i] = string(rune('a'+rng.Intn(3))) + "\n"
		}
		return out
	}
	for k := 0; k < 3000; k++ {
		a, b := pick(), pick()
		ops := LineEdits(a, b)
		if ga, gb := sides(ops); ga != strings.Join(a, "") || gb != strings.Join(b, "") {
			t.Fatalf("edits of %q → %q rebuild %q → %q", a, b, ga, gb)
		}
		kept := 0
		for i, op := range ops {
			if op.Kind == ' ' {
				kept++
			}
			if op.Kind == '-' && i > 0 && ops[i-1].Kind == '+' {
				t.Fatalf("edits of %q → %q add before they remove: %q", a, b, ops)
			}
		}
		if want := lcsLen(a, b); kept != want {
			t.Fatalf("edits of %q → %q keep %d lines, a longest common subsequence has %d", a, b, kept, want)
		}
	}
}

// Large texts take the anchored path; the script must still rebuild both
// sides exactly, and a few edits must not become a wholesale replacement.
func TestLineEditsLarge(t *testing.T) {
	rng := rand.New(rand.NewSource(2))
	gen := func(n int) []string {
		var ls []string
		for i := 0; i < n; i++ {
			if rng.Intn(3) == 0 {
				ls = append(ls, "same\n") // repeated: never an anchor
			} else {
				ls = append(ls, fmt.Sprintf("line %d\n", rng.Intn(5*n)))
			}
		}
		return ls
	}
	for k := 0; k < 40; k++ {
		a := gen(300 + rng.Intn(300))
		b := append([]string(nil), a...)
		for e := rng.Intn(40); e > 0; e-- {
			i := rng.Intn(len(b))
			switch rng.Intn(3) {
			case 0:
				b = append(b[:i], b[i+1:]...)
			case 1:
				b = append(b[:i], append([]string{fmt.Sprintf("new %d\n", e)}, b[i:]...)...)
			default:
				b[i] = "changed\n"
			}
		}
		if len(a)*len(b) <= smallDiffCells {
			t.Fatal("texts too small for the anchored path")
		}
		ops := LineEdits(a, b)
		if ga, gb := sides(ops); ga != strings.Join(a, "") || gb != strings.Join(b, "") {
			t.Fatalf("anchored edits do not rebuild the texts")
		}
		removed := 0
		for _, op := range ops {
			if op.Kind == '-' {
				removed++
			}
		}
		if removed > 3*len(a)/4 {
			t.Errorf("edits of a few changes remove %d of %d lines", removed, len(a))
		}
	}
}
