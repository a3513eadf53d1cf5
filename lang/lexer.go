package lang

import (
	"io"
	"unicode"
	"unicode/utf8"

	"github.com/alecthomas/participle/v2/lexer"
)

// Token types. Lexing never fails: a character that starts no token becomes
// a Bad token that the parser reports.
const (
	TokEOF     = lexer.EOF
	TokIdent   = lexer.TokenType(-2 - iota)
	TokNumber  // 12, -0.5, 1e-3 (sign included when it is a sign)
	TokUnit    // the unit word after a number or ")"
	TokString  // "..." with its quotes
	TokPunct   // { } ( ) , ; = + - * / ^
	TokNewline // end of line
	TokBad     // anything else
	TokSpace   // blanks between tokens (elided; marks where a token ends)
	TokComment // '#' to the end of the line (elided)
)

// Comment is a '#' comment; its text includes the '#'.
type Comment struct {
	Span Span
	Text string
}

// lexDef is the participle lexer definition for .loop text.
type lexDef struct{}

// Symbols names the token types. It builds its map on each call (the parser
// asks once, at start-up) so that it does not depend on the order package
// variables are initialised in.
func (lexDef) Symbols() map[string]lexer.TokenType {
	return map[string]lexer.TokenType{
		"EOF": TokEOF, "Ident": TokIdent, "Number": TokNumber, "Unit": TokUnit,
		"String": TokString, "Punct": TokPunct, "Newline": TokNewline, "Bad": TokBad,
		"Space": TokSpace, "Comment": TokComment,
	}
}

func (lexDef) Lex(filename string, r io.Reader) (lexer.Lexer, error) {
	b, err := io.ReadAll(r)
	if err != nil {
		return nil, err
	}
	toks, _ := scan(b)
	return &sliceLexer{toks: toks}, nil
}

type sliceLexer struct {
	toks []lexer.Token
	i    int
}

func (l *sliceLexer) Next() (lexer.Token, error) {
	if l.i >= len(l.toks) {
		if len(l.toks) > 0 {
			return l.toks[len(l.toks)-1], nil
		}
		return lexer.EOFToken(lexer.Position{}), nil
	}
	t := l.toks[l.i]
	l.i++
	return t, nil
}

// scan splits src into tokens (always ending with EOF) and comments.
// Positions carry byte offsets; Line and Column are filled for participle's
// messages only, every caller converts offsets through a Mapper.
func scan(src []byte) ([]lexer.Token, []Comment) {
	s := newScanner(src)
	var toks []lexer.Token
	for s.nextLine() {
		toks = append(toks, s.toks...)
		s.toks = s.toks[:0]
	}
	return toks, s.comments
}

// newScanner returns a scanner over src that the parser drives one line at
// a time (no token looks past its line's end), so the tokens of a large
// file are never all held at once.
func newScanner(src []byte) *scanner { return newScannerOf(src, string(src)) }

// newScannerOf is newScanner with str holding the text of src, the memory
// the tokens' values share.
func newScannerOf(src []byte, str string) *scanner {
	s := &scanner{src: src, str: str, line: 1, lineStart: 0}
	if len(src) >= 3 && src[0] == 0xef && src[1] == 0xbb && src[2] == 0xbf {
		// A byte-order mark at the start is a blank, not a character: the
		// text is read as UTF-8 regardless.
		s.pos = 3
		s.emit(TokSpace, 0)
	}
	return s
}

type scanner struct {
	src       []byte
	str       string // src as a string, so token values share one allocation
	pos       int
	line      int
	lineStart int
	toks      []lexer.Token // the current line's, appended by nextLine
	comments  []Comment
	done      bool // EOF emitted
	// allowsOnly keeps of the comments only the silencers ("# allow:
	// RULE"): a file read for its model alone (parseHeads) needs no others,
	// and a file of commented lines would keep a Comment for each.
	allowsOnly bool
	// endsValue is whether the last token of the line that is not elided
	// ends an operand, which decides whether a following '-' is binary;
	// kept here because the tokens themselves may already be dropped.
	endsValue bool
	// lookahead marks a copy of the scanner that reads ahead and keeps
	// nothing: it records no comments.
	lookahead bool
}

func (s *scanner) position(off int) lexer.Position {
	return lexer.Position{Offset: off, Line: s.line, Column: off - s.lineStart + 1}
}

func (s *scanner) emit(tt lexer.TokenType, start int) {
	v := s.str[start:s.pos]
	s.toks = append(s.toks, lexer.Token{Type: tt, Value: v, Pos: s.position(start)})
	switch tt {
	case TokSpace, TokComment:
	case TokIdent, TokNumber, TokUnit, TokString:
		s.endsValue = true
	case TokPunct:
		s.endsValue = v == ")"
	default:
		s.endsValue = false
	}
}

// nextLine appends the tokens of the next line to s.toks, up to and
// including its newline, or the EOF token after the last line. It reports
// false when EOF was already emitted.
func (s *scanner) nextLine() bool {
	if s.done {
		return false
	}
	for !s.step() {
	}
	return true
}

// step appends the next token to s.toks (a number or ')' with its unit,
// two), or the EOF token after the last line; it reports whether that
// ended the line. Once EOF was emitted, each step appends it again.
func (s *scanner) step() bool {
	src := s.src
	if s.done {
		s.toks = append(s.toks, lexer.EOFToken(s.position(s.pos)))
		return true
	}
	if s.pos < len(src) {
		c := src[s.pos]
		start := s.pos
		switch {
		case c == '\n' || loneCR(src, s.pos):
			s.pos++
			s.emit(TokNewline, start)
			s.line++
			s.lineStart = s.pos
			return true
		case isBlank(c):
			for s.pos < len(src) && isBlank(src[s.pos]) && !loneCR(src, s.pos) {
				s.pos++
			}
			s.emit(TokSpace, start)
		case c == '#':
			// A comment ends at the line's end, "\r\n" and a lone "\r" included.
			for s.pos < len(src) && src[s.pos] != '\n' && src[s.pos] != '\r' {
				s.pos++
			}
			if text := s.str[start:s.pos]; !s.lookahead && (!s.allowsOnly || isAllowComment(text)) {
				s.comments = append(s.comments, Comment{Span: Span{start, s.pos}, Text: text})
			}
			s.emit(TokComment, start)
		case c == '"':
			s.scanString()
		case isDigit(c) || (c == '.' && s.pos+1 < len(src) && isDigit(src[s.pos+1])):
			s.scanNumber(start)
		case (c == '-' || c == '+') && s.signStartsNumber():
			s.pos++
			s.scanNumber(start)
		case isIdentStart(c):
			s.scanIdent()
		case c >= 0x80:
			r, n := utf8.DecodeRune(src[s.pos:])
			if IdentStart(r) {
				s.scanIdent()
				break
			}
			s.pos += n
			s.emit(TokBad, start)
		default:
			if isPunct(c) {
				s.pos++
				s.emit(TokPunct, start)
				if c == ')' {
					s.maybeUnit()
				}
				break
			}
			s.pos++
			s.emit(TokBad, start)
		}
		return false
	}
	s.toks = append(s.toks, lexer.EOFToken(s.position(s.pos)))
	s.done = true
	return true
}

// signStartsNumber decides whether the '-' or '+' at s.pos is a number's
// sign: a digit follows, and either no operand precedes it or a space
// precedes it and no space follows (as in "heat plate -2 kW").
func (s *scanner) signStartsNumber() bool {
	p := s.pos + 1
	if p >= len(s.src) {
		return false
	}
	if !isDigit(s.src[p]) && !(s.src[p] == '.' && p+1 < len(s.src) && isDigit(s.src[p+1])) {
		return false
	}
	if !s.endsValue {
		return true
	}
	if s.pos > 0 && isBlank(s.src[s.pos-1]) {
		// "a -2": the previous token ended before a space.
		return true
	}
	return false
}

func (s *scanner) scanNumber(start int) {
	src := s.src
	if s.hexNumber() {
		// "0x10": a Bad token the parser explains (numbers are decimal),
		// never a zero with the unit "x10".
		for s.pos < len(src) && (isDigit(src[s.pos]) || isIdentStart(src[s.pos])) {
			s.pos++
		}
		s.emit(TokBad, start)
		return
	}
	for s.pos < len(src) && isDigit(src[s.pos]) {
		s.pos++
	}
	if s.pos < len(src) && src[s.pos] == '.' {
		s.pos++
		for s.pos < len(src) && isDigit(src[s.pos]) {
			s.pos++
		}
	}
	// Exponent: only when digits follow, so "2 e" or "3em" stay separate.
	if s.pos < len(src) && (src[s.pos] == 'e' || src[s.pos] == 'E') {
		p := s.pos + 1
		if p < len(src) && (src[p] == '+' || src[p] == '-') {
			p++
		}
		if p < len(src) && isDigit(src[p]) {
			for p < len(src) && isDigit(src[p]) {
				p++
			}
			s.pos = p
		}
	}
	s.emit(TokNumber, start)
	s.maybeUnit()
}

// hexNumber reports whether a hexadecimal number ("0x1F") starts at s.pos.
func (s *scanner) hexNumber() bool {
	p := s.pos
	return p+2 < len(s.src) && s.src[p] == '0' && s.src[p+1]|0x20 == 'x' && isHexDigit(s.src[p+2])
}

func isHexDigit(c byte) bool { return isDigit(c) || (c|0x20 >= 'a' && c|0x20 <= 'f') }

// maybeUnit reads the unit word that may follow a number or a closing
// parenthesis on the same line: optional blanks, then a character that can
// start a unit, then everything up to a blank outside parentheses or a
// delimiter.
func (s *scanner) maybeUnit() {
	src := s.src
	p := s.pos
	for p < len(src) && isBlank(src[p]) && !loneCR(src, p) {
		p++
	}
	if p >= len(src) || !s.unitStart(p) {
		return
	}
	// Keywords that follow a quantity or vector are not units.
	if w := wordAt(src, p); w == "from" || w == "to" || w == "at" || w == "nominal" {
		return
	}
	start := p
	depth := 0
	blankInParen := -1 // the first blank inside parentheses
	for p < len(src) {
		c := src[p]
		if c == '\n' || c == '#' || c == ',' || c == ';' || c == '{' || c == '}' || c == '=' || c == '"' {
			break
		}
		if isBlank(c) {
			// Inside parentheses a space or tab belongs to the unit, as in
			// "W/(m² K)"; any other blank ends it.
			if depth == 0 || (c != ' ' && c != '\t') {
				break
			}
			if blankInParen < 0 {
				blankInParen = p
			}
			p++
			continue
		}
		if c == '(' {
			depth++
		} else if c == ')' {
			if depth == 0 {
				break
			}
			depth--
		}
		if c >= 0x80 {
			_, n := utf8.DecodeRune(src[p:])
			p += n
			continue
		}
		p++
	}
	// A parenthesis left open does not swallow the rest of the line: the
	// unit ends at the first blank after it, as if it had none.
	if depth > 0 && blankInParen >= 0 {
		p = blankInParen
	}
	for p > start && isBlank(src[p-1]) {
		p--
	}
	if p == start {
		return
	}
	s.pos = p
	s.emit(TokUnit, start)
}

func wordAt(src []byte, p int) string {
	q := p
	for q < len(src) && (isIdentStart(src[q]) || isDigit(src[q])) {
		q++
	}
	if q < len(src) && (src[q] == '(' || src[q] == '/' || src[q] == '*' || src[q] == '^') {
		return ""
	}
	return string(src[p:q])
}

func (s *scanner) unitStart(p int) bool {
	c := s.src[p]
	if isIdentStart(c) || c == '%' {
		return true
	}
	if c >= 0x80 {
		r, _ := utf8.DecodeRune(s.src[p:])
		switch r {
		case '°', 'µ', 'μ', '℃', '℉', 'Å', 'Ω':
			return true
		}
		return unicode.IsLetter(r)
	}
	return false
}

func (s *scanner) scanIdent() {
	src := s.src
	start := s.pos
	for s.pos < len(src) {
		c := src[s.pos]
		if c < utf8.RuneSelf {
			if !isIdentStart(c) && !isDigit(c) {
				break
			}
			s.pos++
			continue
		}
		r, n := utf8.DecodeRune(src[s.pos:])
		if !IdentPart(r) {
			break
		}
		s.pos += n
	}
	if isomerSuffix(s.str[s.pos:]) {
		s.pos += 3
	}
	s.emit(TokIdent, start)
}

func (s *scanner) scanString() {
	src := s.src
	start := s.pos
	s.pos++
	for s.pos < len(src) {
		c := src[s.pos]
		if c == '\\' && s.pos+1 < len(src) && src[s.pos+1] != '\n' && src[s.pos+1] != '\r' {
			s.pos += 2
			continue
		}
		if c == '"' {
			s.pos++
			s.emit(TokString, start)
			return
		}
		if c == '\n' || c == '\r' {
			// A string ends on its line; a raw carriage return cannot be kept
			// in a canonical layout, so it ends the string too.
			break
		}
		s.pos++
	}
	// Unterminated: a Bad token up to the end of the line, reported by the parser.
	s.emit(TokBad, start)
}

func isDigit(c byte) bool { return c >= '0' && c <= '9' }

// isBlank reports the characters a Space token holds; every kind of blank
// separates the same way. A '\r' is a blank only before a '\n' (see loneCR).
func isBlank(c byte) bool {
	return c == ' ' || c == '\t' || c == '\r' || c == '\f' || c == '\v'
}

// loneCR reports whether src[p] is a '\r' not followed by '\n': a line end,
// as for the Mapper and the editor protocol, not a blank.
func loneCR(src []byte, p int) bool {
	return src[p] == '\r' && (p+1 == len(src) || src[p+1] != '\n')
}
func isPunct(c byte) bool {
	switch c {
	case '{', '}', '(', ')', ',', ';', '=', '+', '-', '*', '/', '^':
		return true
	}
	return false
}
