package lang

import "testing"

// The column counts below follow the encodings' definitions (Unicode
// Standard, ch. 3 and RFC 3629): '°' U+00B0, 'µ' U+00B5 and '²' U+00B2 are
// one UTF-16 unit and two UTF-8 bytes each; '𝜃' U+1D703 lies outside the
// basic plane, so it is a surrogate pair (two UTF-16 units) and four bytes.
const mapText = "line one\r\nt °µ²𝜃 z\n"

func TestMapperColumns(t *testing.T) {
	m := NewMapper([]byte(mapText))
	if m.Lines() != 3 {
		t.Fatalf("Lines() = %d, want 3", m.Lines())
	}
	for _, tc := range []struct {
		off           int
		line, u8, u16 int
		what          string
	}{
		{0, 0, 0, 0, "start"},
		{10, 1, 0, 0, "t after CRLF"},
		{12, 1, 2, 2, "°"},
		{14, 1, 4, 3, "µ"},
		{16, 1, 6, 4, "²"},
		{18, 1, 8, 5, "𝜃"},
		{22, 1, 12, 7, "space after 𝜃"},
		{23, 1, 13, 8, "z"},
		{24, 1, 14, 9, "end of line 1"},
		{25, 2, 0, 0, "empty last line"},
	} {
		if got := m.OffsetPosition(tc.off, UTF8); got != (Position{tc.line, tc.u8}) {
			t.Errorf("%s: OffsetPosition(%d, UTF8) = %v, want {%d %d}", tc.what, tc.off, got, tc.line, tc.u8)
		}
		if got := m.OffsetPosition(tc.off, UTF16); got != (Position{tc.line, tc.u16}) {
			t.Errorf("%s: OffsetPosition(%d, UTF16) = %v, want {%d %d}", tc.what, tc.off, got, tc.line, tc.u16)
		}
		if got := m.PositionOffset(Position{tc.line, tc.u8}, UTF8); got != tc.off {
			t.Errorf("%s: PositionOffset({%d %d}, UTF8) = %d, want %d", tc.what, tc.line, tc.u8, got, tc.off)
		}
		if got := m.PositionOffset(Position{tc.line, tc.u16}, UTF16); got != tc.off {
			t.Errorf("%s: PositionOffset({%d %d}, UTF16) = %d, want %d", tc.what, tc.line, tc.u16, got, tc.off)
		}
	}
}

func TestMapperInsideCharacters(t *testing.T) {
	m := NewMapper([]byte(mapText))
	// An offset inside '𝜃' (bytes 18..21) maps to its start.
	for off := 19; off <= 21; off++ {
		if got := m.OffsetPosition(off, UTF16); got != (Position{1, 5}) {
			t.Errorf("OffsetPosition(%d, UTF16) = %v, want {1 5}", off, got)
		}
		if got := m.OffsetPosition(off, UTF8); got != (Position{1, 8}) {
			t.Errorf("OffsetPosition(%d, UTF8) = %v, want {1 8}", off, got)
		}
	}
	// UTF-16 column 6 is between the two halves of the surrogate pair.
	if got := m.PositionOffset(Position{1, 6}, UTF16); got != 18 {
		t.Errorf("PositionOffset inside a surrogate pair = %d, want 18", got)
	}
	// UTF-8 column 9 is inside the four bytes of '𝜃'.
	if got := m.PositionOffset(Position{1, 9}, UTF8); got != 18 {
		t.Errorf("PositionOffset inside a UTF-8 sequence = %d, want 18", got)
	}
	// Inside 'µ' (bytes 14, 15).
	if got := m.OffsetPosition(15, UTF16); got != (Position{1, 3}) {
		t.Errorf("OffsetPosition(15, UTF16) = %v, want {1 3}", got)
	}
}

func TestMapperCRLFAndClamping(t *testing.T) {
	m := NewMapper([]byte(mapText))
	if got := m.LineEnd(0); got != 8 {
		t.Errorf("LineEnd(0) = %d, want 8 (before \\r\\n)", got)
	}
	if got := m.LineText(0); got != "line one" {
		t.Errorf("LineText(0) = %q", got)
	}
	if got := m.LineText(1); got != "t °µ²𝜃 z" {
		t.Errorf("LineText(1) = %q", got)
	}
	// A column past the line's end stops before the "\r\n".
	for _, enc := range []Encoding{UTF8, UTF16} {
		if got := m.PositionOffset(Position{0, 100}, enc); got != 8 {
			t.Errorf("enc %d: PositionOffset({0 100}) = %d, want 8", enc, got)
		}
		if got := m.PositionOffset(Position{1, 100}, enc); got != 24 {
			t.Errorf("enc %d: PositionOffset({1 100}) = %d, want 24", enc, got)
		}
		if got := m.PositionOffset(Position{7, 3}, enc); got != len(mapText) {
			t.Errorf("enc %d: line past the end gives %d, want %d", enc, got, len(mapText))
		}
		if got := m.PositionOffset(Position{-1, 3}, enc); got != 0 {
			t.Errorf("enc %d: negative line gives %d", enc, got)
		}
		if got := m.PositionOffset(Position{1, -4}, enc); got != 10 {
			t.Errorf("enc %d: negative column gives %d, want 10", enc, got)
		}
		if got := m.OffsetPosition(1000, enc); got != (Position{2, 0}) {
			t.Errorf("enc %d: offset past the end gives %v, want {2 0}", enc, got)
		}
		if got := m.OffsetPosition(-5, enc); got != (Position{0, 0}) {
			t.Errorf("enc %d: negative offset gives %v", enc, got)
		}
	}
	// The '\r' itself sits at column 8 of line 0.
	if got := m.OffsetPosition(8, UTF16); got != (Position{0, 8}) {
		t.Errorf("OffsetPosition(8) = %v", got)
	}
	if got := m.OffsetLine(9); got != 0 {
		t.Errorf("OffsetLine(9) (the \\n) = %d, want 0", got)
	}
}

func TestMapperRanges(t *testing.T) {
	m := NewMapper([]byte(mapText))
	// The span of "𝜃 z".
	a, b := m.SpanRange(Span{18, 24}, UTF16)
	if a != (Position{1, 5}) || b != (Position{1, 9}) {
		t.Errorf("SpanRange = %v %v, want {1 5} {1 9}", a, b)
	}
	if sp := m.RangeOffsets(a, b, UTF16); sp != (Span{18, 24}) {
		t.Errorf("RangeOffsets = %v, want {18 24}", sp)
	}
	// A reversed range collapses to its start.
	if sp := m.RangeOffsets(Position{1, 8}, Position{1, 2}, UTF16); sp != (Span{23, 23}) {
		t.Errorf("reversed RangeOffsets = %v, want {23 23}", sp)
	}
	a, b = m.SpanRange(Span{24, 12}, UTF8)
	if a != b {
		t.Errorf("reversed SpanRange = %v %v, want an empty range", a, b)
	}
}

func TestMapperEmptyAndNoFinalNewline(t *testing.T) {
	m := NewMapper(nil)
	if m.Lines() != 1 || m.OffsetPosition(3, UTF16) != (Position{}) || m.PositionOffset(Position{0, 5}, UTF8) != 0 {
		t.Error("empty text does not map to the origin")
	}
	m = NewMapper([]byte("ab\ncd"))
	if got := m.PositionOffset(Position{1, 9}, UTF16); got != 5 {
		t.Errorf("PositionOffset past the last line's end = %d, want 5", got)
	}
	if got := m.OffsetPosition(5, UTF16); got != (Position{1, 2}) {
		t.Errorf("OffsetPosition(5) = %v, want {1 2}", got)
	}
	// The end of a last line without a newline, in bytes: the column equals
	// the line's length and names the end of the text.
	for _, col := range []int{2, 3} {
		if got := m.PositionOffset(Position{1, col}, UTF8); got != 5 {
			t.Errorf("PositionOffset({1 %d}, UTF8) at the end of the text = %d, want 5", col, got)
		}
	}
	m = NewMapper([]byte("a µ"))
	if got := m.PositionOffset(Position{0, 4}, UTF8); got != 4 {
		t.Errorf("PositionOffset after a last 'µ' = %d, want 4", got)
	}
}
