package lsp

import (
	"math/rand"
	"strings"
	"testing"
)

// applyHunks rebuilds the new text from the old lines and the hunks.
func applyHunks(a []string, hs []hunk) string {
	var b strings.Builder
	at := 0
	for _, h := range hs {
		b.WriteString(join(a[at:h.oldStart]))
		b.WriteString(h.text)
		at = h.oldEnd
	}
	b.WriteString(join(a[at:]))
	return b.String()
}

// TestLineDiff checks that the hunks turn the old lines into the new ones,
// in order and without overlap, on random line lists.
func TestLineDiff(t *testing.T) {
	rng := rand.New(rand.NewSource(1))
	pick := func() []string {
		n := rng.Intn(12)
		out := make([]string, n)
		for i := range out {
			out[i] = string(rune('a'+rng.Intn(4))) + "\n"
		}
		return out
	}
	for i := 0; i < 5000; i++ {
		a, b := pick(), pick()
		hs := lineDiff(a, b)
		if got := applyHunks(a, hs); got != join(b) {
			t.Fatalf("diff of %q and %q: %+v gives %q", a, b, hs, got)
		}
		for j := 1; j < len(hs); j++ {
			if hs[j].oldStart < hs[j-1].oldEnd {
				t.Fatalf("overlapping hunks %+v", hs)
			}
		}
	}
	if hs := lineDiff([]string{"x\n"}, []string{"x\n"}); len(hs) != 0 {
		t.Errorf("equal texts give hunks %+v", hs)
	}
}
