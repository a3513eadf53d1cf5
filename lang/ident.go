package lang

import (
	"unicode"
	"unicode/utf8"
)

// The definition of a name, shared by the lexer and by anything that must
// know whether a text would be read as one name (renaming, suggestions).

// IdentStart reports whether r can begin a name: '_' or a letter of any
// script.
func IdentStart(r rune) bool {
	if r < utf8.RuneSelf {
		return isIdentStart(byte(r))
	}
	return unicode.IsLetter(r)
}

// IdentPart reports whether r can continue a name: what can begin one, or
// a digit of any script.
func IdentPart(r rune) bool {
	if r < utf8.RuneSelf {
		return isIdentStart(byte(r)) || isDigit(byte(r))
	}
	return unicode.IsLetter(r) || unicode.IsDigit(r)
}

func isIdentStart(c byte) bool { return c == '_' || (c|0x20 >= 'a' && c|0x20 <= 'z') }

// isomerSuffix reports whether s starts with a stereo-isomer suffix written
// without a space, as in R1234ze(E) and R1233zd(Z); it belongs to the name
// before it.
func isomerSuffix(s string) bool {
	return len(s) >= 3 && s[0] == '(' && s[1] >= 'A' && s[1] <= 'Z' && s[2] == ')'
}

// Connectives are the words that join a statement's parts; they are never
// read as names.
var connectives = [...]string{"from", "to", "at"}

func isConnective(s string) bool {
	for _, c := range connectives {
		if s == c {
			return true
		}
	}
	return false
}

// IsIdent reports whether s is read as exactly one name: IdentStart, then
// IdentPart characters, optionally a stereo-isomer suffix, and not a
// connective.
func IsIdent(s string) bool {
	if s == "" || isConnective(s) {
		return false
	}
	for i, r := range s {
		if i == 0 && !IdentStart(r) {
			return false
		}
		if !IdentPart(r) {
			return i > 0 && isomerSuffix(s[i:]) && len(s) == i+3
		}
	}
	return true
}
