package lang

import (
	"math/rand/v2"
	"strings"
	"testing"
)

// TestIsIdentAgreesWithLexer checks, over random short texts, that IsIdent
// holds exactly when the lexer reads the whole text as one identifier
// token that is not a connective. The pieces mix ASCII, letters of other
// scripts (é, ß, Greek μ, CJK 高, Arabic ع), digits of other scripts
// (U+0663 ARABIC-INDIC DIGIT THREE is a decimal digit, Unicode category
// Nd), '²' (a number that is not a decimal digit, category No) and an
// emoji (a symbol, category So).
func TestIsIdentAgreesWithLexer(t *testing.T) {
	pieces := []string{"a", "Z", "_", "0", "7", "é", "ß", "μ", "高", "ع", "٣", "²", "😀", " ", "-", "(", "E", ")", "(E)", "from", "to", "at", "\n", "#", "\""}
	r := rand.New(rand.NewPCG(3, 5))
	seen := map[bool]int{}
	for range 20000 {
		var b strings.Builder
		for range 1 + r.IntN(4) {
			b.WriteString(pieces[r.IntN(len(pieces))])
		}
		s := b.String()
		toks, _ := scan([]byte(s))
		lexed := len(toks) == 2 && toks[0].Type == TokIdent && toks[0].Value == s && !isConnective(s)
		if got := IsIdent(s); got != lexed {
			t.Fatalf("IsIdent(%q) = %v, but the lexer reads %v", s, got, toks)
		}
		seen[lexed]++
	}
	if seen[true] < 1000 || seen[false] < 1000 {
		t.Fatalf("too few cases of one kind: %v", seen)
	}
	for _, s := range []string{"Kühler_oben", "高さ", "x٣", "R1234ze(E)", "_"} {
		if !IsIdent(s) {
			t.Errorf("IsIdent(%q) = false", s)
		}
	}
	for _, s := range []string{"", "to", "2nd", "a b", "x²", "(E)", "a(E)b", "😀"} {
		if IsIdent(s) {
			t.Errorf("IsIdent(%q) = true", s)
		}
	}
}
