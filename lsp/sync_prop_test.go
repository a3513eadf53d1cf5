package lsp

import (
	"fmt"
	"math/rand/v2"
	"reflect"
	"sort"
	"strings"
	"testing"
	"unicode/utf16"
	"unicode/utf8"

	"go.lsp.dev/protocol"

	"circa/lang"
)

// clientText is a client's copy of a document, kept the way an editor
// keeps it: as lines of characters, with the line endings the protocol
// names ("\n", "\r\n", "\r"; LSP 3.17, "Text Documents"), and columns
// counted by encoding each line (RFC 3629 for UTF-8, RFC 2781 for UTF-16,
// code points for UTF-32). It shares no code with lang.Mapper.
type clientText struct {
	lines []clientLine
}

type clientLine struct {
	runes []rune
	eol   string
}

func newClientText(text string) *clientText {
	c := &clientText{}
	var cur []rune
	rs := []rune(text)
	for i := 0; i < len(rs); i++ {
		switch {
		case rs[i] == '\r' && i+1 < len(rs) && rs[i+1] == '\n':
			c.lines = append(c.lines, clientLine{cur, "\r\n"})
			cur = nil
			i++
		case rs[i] == '\r' || rs[i] == '\n':
			c.lines = append(c.lines, clientLine{cur, string(rs[i])})
			cur = nil
		default:
			cur = append(cur, rs[i])
		}
	}
	c.lines = append(c.lines, clientLine{runes: cur})
	return c
}

func (c *clientText) String() string {
	var b strings.Builder
	for _, l := range c.lines {
		b.WriteString(string(l.runes))
		b.WriteString(l.eol)
	}
	return b.String()
}

// charUnits is the length of each character of a line in enc.
func charUnits(rs []rune, enc lang.Encoding) []int {
	out := make([]int, len(rs))
	for i, r := range rs {
		switch enc {
		case lang.UTF8:
			out[i] = len(string(r))
		case lang.UTF16:
			out[i] = len(utf16.Encode([]rune{r}))
		default:
			out[i] = 1
		}
	}
	return out
}

// index converts a position to a character index in the whole text (runes
// before it), clamping a line past the end to the end of the text and a
// column past a line's end to that end; a column inside a character counts
// from that character's start.
func (c *clientText) index(p protocol.Position, enc lang.Encoding) int {
	n := 0
	for li, l := range c.lines {
		if li == int(p.Line) {
			col := 0
			for k, w := range charUnits(l.runes, enc) {
				if col+w > int(p.Character) {
					return n + k
				}
				col += w
			}
			return n + len(l.runes)
		}
		n += len(l.runes) + utf8.RuneCountInString(l.eol)
	}
	return n
}

// apply makes the client's edit: the text between the two positions is
// replaced, and the text is split into lines again.
func (c *clientText) apply(r protocol.Range, text string, enc lang.Encoding) {
	all := []rune(c.String())
	s, e := c.index(r.Start, enc), c.index(r.End, enc)
	if e < s {
		e = s
	}
	out := append(append(append([]rune(nil), all[:s]...), []rune(text)...), all[e:]...)
	*c = *newClientText(string(out))
}

// positions lists positions worth editing at: every character boundary of
// every line in enc (each line's end and the end of the text included),
// columns past a line's end and inside a character, and the line after the
// last.
func (c *clientText) positions(enc lang.Encoding) []protocol.Position {
	var out []protocol.Position
	for li, l := range c.lines {
		col := 0
		for _, w := range charUnits(l.runes, enc) {
			out = append(out, protocol.Position{Line: uint32(li), Character: uint32(col)})
			if w > 1 {
				out = append(out, protocol.Position{Line: uint32(li), Character: uint32(col + 1)})
			}
			col += w
		}
		out = append(out, protocol.Position{Line: uint32(li), Character: uint32(col)}, protocol.Position{Line: uint32(li), Character: uint32(col + 2)})
	}
	return append(out, protocol.Position{Line: uint32(len(c.lines)), Character: 0})
}

// The pieces random documents and edits are made of: ASCII, ° µ ² (two
// UTF-8 bytes, one UTF-16 unit), CJK (three bytes, one unit), characters
// outside the basic plane (four bytes, a surrogate pair) and the three
// line endings.
var editPieces = []string{"a", "z", " ", "=", "1", "°", "µ", "²", "中", "文", "😀", "𝜃", "\n", "\r\n", "\r"}

func randomText(r *rand.Rand, n int) string {
	var b strings.Builder
	for range r.IntN(n + 1) {
		b.WriteString(editPieces[r.IntN(len(editPieces))])
	}
	return b.String()
}

// randomRange picks two positions, most often in order, most often near
// each other; a few are reversed.
func randomRange(r *rand.Rand, ps []protocol.Position) protocol.Range {
	i := r.IntN(len(ps))
	j := i + r.IntN(min(6, len(ps)-i))
	if r.IntN(4) == 0 {
		j = r.IntN(len(ps))
	}
	return protocol.Range{Start: ps[i], End: ps[j]}
}

var allEncodings = []lang.Encoding{lang.UTF8, lang.UTF16, lang.UTF32}

// TestIncrementalChangesMatchClient applies random incremental changes,
// several to an event at times, and checks after each event that the
// server's text is the text the client computes.
func TestIncrementalChangesMatchClient(t *testing.T) {
	r := rand.New(rand.NewPCG(7, 11))
	for _, enc := range allEncodings {
		for doc := range 300 {
			start := randomText(r, 30)
			if doc%2 == 0 {
				start = strings.TrimRight(start, "\r\n")
			}
			client := newClientText(start)
			d := newDocument("file:///p.loop", "/p.loop", 1, []byte(start))
			for ev := range 12 {
				var changes []protocol.TextDocumentContentChangeEvent
				for range 1 + r.IntN(3) {
					if r.IntN(30) == 0 {
						text := randomText(r, 20)
						changes = append(changes, &protocol.TextDocumentContentChangeWholeDocument{Text: text})
						*client = *newClientText(text)
						continue
					}
					rg := randomRange(r, client.positions(enc))
					text := randomText(r, 3)
					changes = append(changes, &protocol.TextDocumentContentChangePartial{Range: rg, Text: text})
					client.apply(rg, text, enc)
				}
				before := string(d.text)
				text, inSync := applyChanges(d, changes, enc)
				if !inSync {
					t.Fatalf("a document in sync fell out of sync")
				}
				d = newDocument(d.uri, d.path, d.version+1, text)
				if got, want := string(d.text), client.String(); got != want {
					t.Fatalf("enc %d, document %d, event %d: from %q the changes %s give %q, the client has %q",
						enc, doc, ev, before, describeChanges(changes), got, want)
				}
			}
		}
	}
}

func describeChanges(cs []protocol.TextDocumentContentChangeEvent) string {
	var b strings.Builder
	for _, c := range cs {
		switch c := c.(type) {
		case *protocol.TextDocumentContentChangePartial:
			r := c.Range
			fmt.Fprintf(&b, "[%d:%d-%d:%d %q]", r.Start.Line, r.Start.Character, r.End.Line, r.End.Character, c.Text)
		case *protocol.TextDocumentContentChangeWholeDocument:
			fmt.Fprintf(&b, "[all %q]", c.Text)
		}
	}
	return b.String()
}

// applyEdits applies edits given in one text's coordinates, as a client
// does: from the last to the first.
func (c *clientText) applyEdits(edits []protocol.TextEdit, enc lang.Encoding) {
	type span struct {
		s, e int
		text string
	}
	var spans []span
	for _, e := range edits {
		spans = append(spans, span{c.index(e.Range.Start, enc), c.index(e.Range.End, enc), e.NewText})
	}
	sort.SliceStable(spans, func(i, j int) bool { return spans[i].s > spans[j].s })
	all := []rune(c.String())
	for _, sp := range spans {
		all = append(append(append([]rune(nil), all[:sp.s]...), []rune(sp.text)...), all[sp.e:]...)
	}
	*c = *newClientText(string(all))
}

// TestFormattingEditsWithLoneCR formats documents with lone CRs (a line
// end for the client and for the language, also after a comment) and checks
// that the edits, applied by the client, give the formatter's output, for
// the whole document and for a range, in the three encodings.
func TestFormattingEditsWithLoneCR(t *testing.T) {
	texts := []string{
		"# one\rtwo\nparam   d = 12 mm\nloop l {\n fluid R134a\n  node a # x\r y\n node    b\n}\n",
		"param a = 1 m # µ\rzz\r\n\r\n\r\nparam    b = 2 m\r\n# 𝜃\r\rc\nparam  c = 3 m",
	}
	for _, enc := range allEncodings {
		for _, text := range texts {
			want, err := lang.Format(lang.Parse("/f.loop", []byte(text)))
			if err != nil {
				t.Fatal(err)
			}
			d := newDocument("file:///f.loop", "/f.loop", 1, []byte(text))
			hunks, err := formatHunks(d)
			if err != nil {
				t.Fatal(err)
			}
			client := newClientText(text)
			client.applyEdits(hunkEdits(d, enc, hunks, -1, -1), enc)
			if got := client.String(); got != string(want) {
				t.Errorf("enc %d: formatting edits on %q give %q, want %q", enc, text, got, want)
			}
			// A range on one line of the diff takes the hunks touching it.
			sn := &snapshot{docs: map[string]*document{d.path: d}, enc: enc}
			starts := diffLineStarts(d.text)
			for k, off := range starts {
				p := fromPos(d.mapper.OffsetPosition(off, enc))
				got, err := formatEdits(sn, d.uri, &protocol.Range{Start: p, End: p})
				if err != nil {
					t.Fatal(err)
				}
				if w := hunkEdits(d, enc, hunks, k, k); !reflect.DeepEqual(got, w) {
					t.Errorf("enc %d: formatting line %d of %q gives %v, want %v", enc, k, text, got, w)
				}
			}
		}
	}
}
