package lang

import (
	"math/rand/v2"
	"strings"
	"testing"
	"unicode/utf16"
	"unicode/utf8"
)

// The pieces random documents are made of. Widths follow the encodings'
// definitions (Unicode Standard ch. 3.9, RFC 3629, RFC 2781): ° µ ² are
// two UTF-8 bytes and one UTF-16 unit; 中 and 文 three bytes and one unit;
// 😀 U+1F600 and 𝜃 U+1D703 four bytes and a surrogate pair. The line
// endings are the three the Language Server Protocol (3.17, "Text
// Documents") names: "\n", "\r\n" and "\r".
var docPieces = []string{"a", "z", "_", " ", "=", "1", "°", "µ", "²", "中", "文", "😀", "𝜃", "\n", "\r\n", "\r"}

// randomDoc builds a text of up to n pieces; about half end without a line
// ending.
func randomDoc(r *rand.Rand, n int) string {
	var b strings.Builder
	for range r.IntN(n + 1) {
		b.WriteString(docPieces[r.IntN(len(docPieces))])
	}
	return b.String()
}

// refLine is one line of a text as a client sees it: its byte offset, its
// characters and the line ending that follows it.
type refLine struct {
	start int
	runes []rune
	eol   string
}

// refLines splits text at "\r\n", "\n" and "\r" independently of Mapper.
func refLines(text string) []refLine {
	var out []refLine
	start := 0
	rest := text
	for {
		i := strings.IndexAny(rest, "\r\n")
		if i < 0 {
			out = append(out, refLine{start: start, runes: []rune(rest)})
			return out
		}
		eol := rest[i : i+1]
		if strings.HasPrefix(rest[i:], "\r\n") {
			eol = "\r\n"
		}
		out = append(out, refLine{start: start, runes: []rune(rest[:i]), eol: eol})
		start += i + len(eol)
		rest = rest[i+len(eol):]
	}
}

// refCol is the column of the first k characters of rs in enc.
func refCol(rs []rune, k int, enc Encoding) int {
	switch enc {
	case UTF8:
		return len(string(rs[:k]))
	case UTF16:
		return len(utf16.Encode(rs[:k]))
	}
	return k
}

var encodings = []Encoding{UTF8, UTF16, UTF32}

func encName(enc Encoding) string {
	return [...]string{UTF16: "utf-16", UTF8: "utf-8", UTF32: "utf-32"}[enc]
}

// TestMapperProperties checks, over random documents, every character
// boundary of every line (each line's end and the end of the text
// included) in the three encodings: offset → position → offset round
// trips, columns past a line's end clamp to it, offsets inside a
// character or a line ending map to the character's start or the line's
// end, and a column inside a character maps to its start.
func TestMapperProperties(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	for iter := range 3000 {
		text := randomDoc(r, 40)
		m := NewMapper([]byte(text))
		lines := refLines(text)
		if m.Lines() != len(lines) {
			t.Fatalf("%q: %d lines, want %d", text, m.Lines(), len(lines))
		}
		fail := func(format string, args ...any) {
			t.Helper()
			t.Fatalf("doc %d %q: "+format, append([]any{iter, text}, args...)...)
		}
		for li, l := range lines {
			end := l.start + len(string(l.runes))
			if m.LineStart(li) != l.start || m.LineEnd(li) != end {
				fail("line %d spans %d..%d, want %d..%d", li, m.LineStart(li), m.LineEnd(li), l.start, end)
			}
			if got := m.LineText(li); got != string(l.runes) {
				fail("LineText(%d) = %q, want %q", li, got, string(l.runes))
			}
			for _, enc := range encodings {
				off := l.start
				for k := 0; k <= len(l.runes); k++ {
					col := refCol(l.runes, k, enc)
					want := Position{li, col}
					if got := m.OffsetPosition(off, enc); got != want {
						fail("%s: OffsetPosition(%d) = %v, want %v", encName(enc), off, got, want)
					}
					if got := m.PositionOffset(want, enc); got != off {
						fail("%s: PositionOffset(%v) = %d, want %d", encName(enc), want, got, off)
					}
					if k == len(l.runes) {
						break
					}
					n := utf8.RuneLen(l.runes[k])
					// Inside the character: bytes, and columns of the
					// encoding that fall between its units.
					for b := 1; b < n; b++ {
						if got := m.OffsetPosition(off+b, enc); got != want {
							fail("%s: OffsetPosition(%d) inside a character = %v, want %v", encName(enc), off+b, got, want)
						}
					}
					for c := col + 1; c < refCol(l.runes, k+1, enc); c++ {
						if got := m.PositionOffset(Position{li, c}, enc); got != off {
							fail("%s: PositionOffset({%d %d}) inside a character = %d, want %d", encName(enc), li, c, got, off)
						}
					}
					off += n
				}
				// Past the line's end, and inside its line ending.
				lineEnd := Position{li, refCol(l.runes, len(l.runes), enc)}
				for _, extra := range []int{1, 2, 1000} {
					if got := m.PositionOffset(Position{li, lineEnd.Col + extra}, enc); got != end {
						fail("%s: PositionOffset({%d %d}) past the line's end = %d, want %d", encName(enc), li, lineEnd.Col+extra, got, end)
					}
				}
				for b := 1; b < len(l.eol); b++ {
					if got := m.OffsetPosition(end+b, enc); got != lineEnd {
						fail("%s: OffsetPosition(%d) inside %q = %v, want %v", encName(enc), end+b, l.eol, got, lineEnd)
					}
				}
			}
		}
		last := lines[len(lines)-1]
		for _, enc := range encodings {
			eof := Position{len(lines) - 1, refCol(last.runes, len(last.runes), enc)}
			if got := m.OffsetPosition(len(text), enc); got != eof {
				fail("%s: end of the text at %v, want %v", encName(enc), got, eof)
			}
			if got := m.OffsetPosition(len(text)+3, enc); got != eof {
				fail("%s: past the end of the text at %v, want %v", encName(enc), got, eof)
			}
			if got := m.PositionOffset(Position{len(lines), 0}, enc); got != len(text) {
				fail("%s: the line after the last at %d, want %d", encName(enc), got, len(text))
			}
		}
	}
}

// TestMapperInvalidUTF8 checks that bytes that are not UTF-8 (a file read
// from disk may hold them) are characters of their own and never panic.
func TestMapperInvalidUTF8(t *testing.T) {
	for _, text := range []string{"\x80", "a\xff\n\xe4\xb8", "\xf0\x9f\x98", "\xe4\xb8\xad\x80z", "\xf0\xe2\x82\xac"} {
		m := NewMapper([]byte(text))
		for _, enc := range encodings {
			prev := Position{-1, -1}
			for off := 0; off <= len(text); off++ {
				p := m.OffsetPosition(off, enc)
				back := m.PositionOffset(p, enc)
				if back > off || m.OffsetPosition(back, enc) != p {
					t.Errorf("%q %s: offset %d → %v → %d", text, encName(enc), off, p, back)
				}
				if p.Line < prev.Line || (p.Line == prev.Line && p.Col < prev.Col) {
					t.Errorf("%q %s: positions go backwards at offset %d: %v after %v", text, encName(enc), off, p, prev)
				}
				prev = p
			}
		}
	}
}

// TestOffsetPositionFrom checks the position counted on from an earlier
// one against OffsetPosition, over random documents and bytes that are not
// UTF-8, for every pair of offsets.
func TestOffsetPositionFrom(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	texts := []string{"\x80", "a\xff\n\xe4\xb8", "\xf0\x9f\x98", "\xe4\xb8\xad\x80z", "\xf0\xe2\x82\xac", "a\r\nb\rc"}
	for range 200 {
		texts = append(texts, randomDoc(r, 30))
	}
	for _, text := range texts {
		m := NewMapper([]byte(text))
		for _, enc := range encodings {
			for from := 0; from <= len(text); from++ {
				p := m.OffsetPosition(from, enc)
				for off := 0; off <= len(text); off++ {
					if got, want := m.OffsetPositionFrom(from, p, off, enc), m.OffsetPosition(off, enc); got != want {
						t.Fatalf("%q %s: from %d (%v) to %d: %v, want %v", text, encName(enc), from, p, off, got, want)
					}
				}
			}
		}
	}
}
