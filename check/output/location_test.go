package output

import (
	"math/rand/v2"
	"strings"
	"testing"
	"unicode/utf8"

	"circa/lang"
)

// refPos is a position counted from its line's start with the Mapper's
// own conversions: bytes and UTF-16 units by OffsetPosition, characters by
// utf8.RuneCount (which counts each byte that is not UTF-8 as one).
func refPos(mp *lang.Mapper, off int) Pos {
	b := mp.OffsetPosition(off, lang.UTF8)
	u := mp.OffsetPosition(off, lang.UTF16)
	start := mp.LineStart(b.Line)
	return Pos{Line: b.Line + 1, Byte: b.Col + 1, Char: utf8.RuneCount(mp.Text()[start:start+b.Col]) + 1, UTF16: u.Col + 1}
}

// TestSpanPositions checks Position and Span, which count a span's end on
// from its start, against refPos for every pair of offsets of random texts
// of one- to four-byte characters (° 中 𝜃: RFC 3629), bytes that are not
// UTF-8 and the three line ends.
func TestSpanPositions(t *testing.T) {
	pieces := []string{"a", " ", "°", "中", "𝜃", "\n", "\r\n", "\r", "\x80", "\xe4\xb8", "\xf0\x9f\x98"}
	r := rand.New(rand.NewPCG(5, 6))
	for range 150 {
		var b strings.Builder
		for range r.IntN(25) {
			b.WriteString(pieces[r.IntN(len(pieces))])
		}
		text := b.String()
		m := lang.LoadSource("t.loop", []byte(text), nil)
		mp := m.Mapper("t.loop")
		for s := 0; s <= len(text); s++ {
			if got, _ := Position(m, "t.loop", s); got != refPos(mp, s) {
				t.Fatalf("%q offset %d: %+v, want %+v", text, s, got, refPos(mp, s))
			}
			for e := s; e <= len(text); e++ {
				gs, ge, _ := Span(m, lang.Location{File: "t.loop", Span: lang.Span{Start: s, End: e}})
				ws, we := refPos(mp, s), refPos(mp, e)
				if we.Line < ws.Line || (we.Line == ws.Line && we.Byte < ws.Byte) {
					we = ws
				}
				if gs != ws || ge != we {
					t.Fatalf("%q span %d-%d: %+v %+v, want %+v %+v", text, s, e, gs, ge, ws, we)
				}
			}
		}
	}
}
