package lang

import (
	"fmt"
	"os"
	"path/filepath"
	"reflect"
	"runtime"
	"strings"
	"testing"

	"golang.org/x/tools/txtar"
)

// sameModel checks that LoadSourceModel gives the model LoadSource and
// DropSyntax give.
func sameModel(t *testing.T, path string, src []byte) {
	t.Helper()
	want := LoadSource(path, src, nil)
	want.DropSyntax()
	got := LoadSourceModel(path, src, nil)
	if !reflect.DeepEqual(got, want) {
		t.Errorf("%s: LoadSourceModel differs from LoadSource and DropSyntax:\n%s", path, modelDiff(got, want))
	}
	if noEvaporator != (evaporatorFields{BoilRoughness: Value{SI: 1e-6}}) || noCondenser != (condenserFields{}) || noExtra != (extraFields{Roughness: Value{SI: 1.5e-6}}) ||
		noFields.extraFields != &noExtra || noFields.evaporatorFields != &noEvaporator || noFields.condenserFields != &noCondenser || noFields.Uses != nil {
		t.Fatalf("%s: resolving wrote the fields that components of other kinds share", path)
	}
}

// modelDiff names the first parts of two models that differ.
func modelDiff(got, want *Model) string {
	var out []string
	gv, wv := reflect.ValueOf(got).Elem(), reflect.ValueOf(want).Elem()
	for i := range gv.NumField() {
		name := gv.Type().Field(i).Name
		if !gv.Field(i).CanInterface() {
			continue
		}
		if !reflect.DeepEqual(gv.Field(i).Interface(), wv.Field(i).Interface()) {
			out = append(out, name)
		}
	}
	if !reflect.DeepEqual(got.Diags, want.Diags) {
		for i := range max(len(got.Diags), len(want.Diags)) {
			if i >= len(got.Diags) || i >= len(want.Diags) || !reflect.DeepEqual(got.Diags[i], want.Diags[i]) {
				var g, w Diagnostic
				if i < len(got.Diags) {
					g = got.Diags[i]
				}
				if i < len(want.Diags) {
					w = want.Diags[i]
				}
				out = append(out, "diag "+g.Message()+" | want "+w.Message())
				break
			}
		}
	}
	return strings.Join(out, "\n")
}

// TestLoadSourceModel compares the two ways of loading on the examples, on
// the fuzz corpora and on texts where a statement's parts are read again
// from the middle of a line, after a byte-order mark or after lone
// carriage returns.
func TestLoadSourceModel(t *testing.T) {
	for p, src := range exampleFiles(t) {
		sameModel(t, p, src)
	}
	corpus, _ := filepath.Glob(filepath.Join("testdata", "fuzz", "*", "*"))
	for _, p := range corpus {
		b, err := os.ReadFile(p)
		if err != nil {
			t.Fatal(err)
		}
		if src, err := parseCorpusBytes(b); err == nil {
			sameModel(t, p, src)
		}
	}
	for i, src := range []string{
		"\ufeffparam a = 3 mm\nparam b = -a * 2 + (1 m) / 4\n",
		"param a = 3 mm; param b = a^2 # area\rparam c = b*-1\r\n",
		"loop l { fluid water; node a at (0, 0, 0) mm; node b at (0,0,-1) m\n pipe p from a to b { length 1 m; bore a_bore }\n}\nparam a_bore = 8 mm\n",
		"part bp { bore 8 mm; length 2 m }\nloop l {\n fluid water\n node a\n node b\n pipe p from a to b { use bp }\n evaporator e from b to a { use bp; heat 50 W }\n}\ncase c nominal { heat e 40 W; sink 20 degC }\nlimits { exit_quality 0.4 }\nmethods { friction friedel }\n",
		"param a = 3 mm $\nparam b = a +\nloop l {\n node a at (0 0 0)\n pipe from a\n}\n",
		"param a = b\nparam b = a\nparam c = 1 km; param c = 2 m\n",
		// Values that name parameters declared later, at several depths,
		// so that one statement's parts are read while another's are.
		"param a = b + c * 2\nparam b = c^2 / (1 m) - (d)\nparam c = 3 m\nparam d = 1 mm\n" +
			"part bp { bore d * 8; length a }\n" +
			"loop l {\n fluid water\n saturation ts\n node x at (a, -b, c) mm\n node y at (0, 0, d) \n" +
			" pipe p from x to y { use bp; rise c - a; loss k }\n" +
			" condenser k1 from y to x { length 1 m; bore d; conductance ua; sink ts }\n}\n" +
			"param ts = 40 degC\nparam ua = 2 W/K * k\nparam k = 3\n" +
			"case c nominal { sink ts; pitch k * 1 deg }\n",
		// Components' one-line blocks, which are parsed again from their
		// line: separators, spacing, comments, neighbours on the line,
		// errors inside and lines ended by a lone carriage return.
		"loop l { fluid water; node a; node b\r pipe p from a to b { ; length 1 m;; bore 8 mm ; }\r" +
			" pipe q from b to a {length(1 m)*2;bore 8 mm} # c\n pipe r from a to b { length 1 m }; pipe s from b to a { bore 1 mm; loss 2 }\n" +
			" pipe t from a to b { length 1 m bore 8 mm }\n pipe u from a to b { length 1 $ }\n pipe v from a to b { loss { 1 } }\n" +
			" evaporator e from a to b { heat 5 W; use nopart; channels 3 }\n condenser k from b to a { conductance 3 W/K; sink 20 degC }\n}\n",
	} {
		sameModel(t, "text"+string(rune('a'+i))+".loop", []byte(src))
	}
}

// TestLoadSourceModelIncludes compares the two ways of loading on the
// resolver's archives, whose files include one another.
func TestLoadSourceModelIncludes(t *testing.T) {
	files, _ := filepath.Glob(filepath.Join("testdata", "resolve", "*.txtar"))
	if len(files) == 0 {
		t.Fatal("no archives")
	}
	for _, file := range files {
		ar, err := txtar.ParseFile(file)
		if err != nil {
			t.Fatal(err)
		}
		fsys := archiveFS(ar)
		src, err := fsys.ReadFile("main.loop")
		if err != nil {
			t.Fatal(err)
		}
		want := LoadSource("main.loop", src, fsys)
		want.DropSyntax()
		if got := LoadSourceModel("main.loop", src, fsys); !reflect.DeepEqual(got, want) {
			t.Errorf("%s: LoadSourceModel differs from LoadSource and DropSyntax:\n%s", file, modelDiff(got, want))
		}
	}
}

// FuzzLoadSourceModel checks that loading for the model alone gives the
// model LoadSource and DropSyntax give, whatever the text.
func FuzzLoadSourceModel(f *testing.F) {
	addSeeds(f)
	f.Fuzz(func(t *testing.T, src []byte) {
		sameModel(t, "fuzz.loop", src)
	})
}

// TestLoadSourceModelBadLinesMemory reads a file whose every line is a
// statement cut short by a token that starts no part. Read for its model,
// such a statement is marked Bad and nothing reads its parts, so it keeps
// its head alone and the nodes of its parts are reused for the next line:
// kept whole, the parts of every line were held until the file was read,
// about 35 bytes for each byte of the file.
func TestLoadSourceModelBadLinesMemory(t *testing.T) {
	var b strings.Builder
	for i := 0; i < 20000; i++ {
		fmt.Fprintf(&b, "param x%d = 3 $ (\n", i)
	}
	src := []byte(b.String())
	var before, after runtime.MemStats
	runtime.GC()
	runtime.ReadMemStats(&before)
	m := LoadSourceModel("bad.loop", src, nil)
	runtime.ReadMemStats(&after)
	runtime.KeepAlive(m)
	if got := after.TotalAlloc - before.TotalAlloc; got > 10*uint64(len(src)) {
		t.Errorf("reading the model of %d bytes of bad lines allocated %d bytes", len(src), got)
	}
}
