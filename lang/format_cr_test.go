package lang

import "testing"

// TestFormatLoneCR checks that a lone CR, which ends a line for positions
// but is a blank to the language, makes no blank line in the layout.
func TestFormatLoneCR(t *testing.T) {
	src := "param a = 1 m # x\ry\nparam b = 2 m\n# c\rd\r\nparam   c = 3 m\n"
	want := "param a = 1 m  # x\ry\nparam b = 2 m\n# c\rd\nparam c = 3 m\n"
	out, err := Format(Parse("cr.loop", []byte(src)))
	if err != nil {
		t.Fatal(err)
	}
	if string(out) != want {
		t.Errorf("Format(%q) = %q, want %q", src, out, want)
	}
}
