package units

import "testing"

// BenchmarkParse measures a repeated unit, the parser's common case (cached).
func BenchmarkParse(b *testing.B) {
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Parse("W/(m2*K)"); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkParseUncached measures a first parse of a compound unit.
func BenchmarkParseUncached(b *testing.B) {
	b.ReportAllocs()
	for b.Loop() {
		if _, err := parse("Btu/(h*ft2*degF)"); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkParseError measures an unknown unit with did-you-mean suggestions.
func BenchmarkParseError(b *testing.B) {
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Parse("kgs"); err == nil {
			b.Fatal("want an error")
		}
	}
}

func BenchmarkFormat(b *testing.B) {
	u := MustParse("mm")
	b.ReportAllocs()
	for b.Loop() {
		_ = Format(0.012, u)
	}
}
