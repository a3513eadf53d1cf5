package lang

import (
	"fmt"
	"math"
	"strings"
	"testing"
)

const profileLoop = `loop l {
  fluid R134a
}
case drive {
  pitch 1 deg
  accel (0, 0, 0.1) gn
  profile {
    columns time pitch accel_x
    row 0 s 0 deg 0 gn
    row 2.5 s -2.3 deg -0.13 gn
    row 3 min 90 deg 1 m/s2
  }
}
`

func TestProfileRows(t *testing.T) {
	m := LoadSource("p.loop", []byte(profileLoop), memFS{})
	for _, d := range m.Diags {
		t.Errorf("unexpected finding %s: %s", d.Rule, d.Message())
	}
	c := m.Case("drive")
	if c == nil || c.Profile == nil || c.Unresolved {
		t.Fatalf("case drive has no usable profile: %+v", c)
	}
	p := c.Profile
	if got := strings.Join(p.Columns, " "); got != "time pitch accel_x" {
		t.Errorf("columns %q", got)
	}
	if len(p.Rows) != 3 {
		t.Fatalf("%d rows, want 3", len(p.Rows))
	}
	// 1 gn = 9.80665 m/s² exactly (CGPM 1901); 3 min = 180 s.
	r := p.Rows[1]
	if r.Time != 2.5 || math.Abs(r.Pitch+2.3*math.Pi/180) > 1e-15 || math.Abs(r.Accel[0]+0.13*9.80665) > 1e-12 {
		t.Errorf("row 1 = %+v", r)
	}
	if p.Rows[2].Time != 180 || p.Rows[2].Accel[0] != 1 {
		t.Errorf("row 2 = %+v", p.Rows[2])
	}
	// The columns the profile leaves out keep the case's own values.
	for _, r := range p.Rows {
		if r.Roll != 0 || math.Abs(r.Accel[2]-0.1*9.80665) > 1e-12 {
			t.Errorf("row at %g s: roll %g, accel_z %g; want the case's 0 and 0.1 gn", r.Time, r.Roll, r.Accel[2])
		}
	}
}

// profileFinding loads a case whose profile block is body and returns the
// one finding it gives, with the text it points at.
func profileFinding(t *testing.T, body string, fs memFS) (Diagnostic, string) {
	t.Helper()
	src := "loop l {\n  fluid R134a\n}\ncase c {\n" + body + "\n}\n"
	m := LoadSource("p.loop", []byte(src), fs)
	if len(m.Diags) != 1 {
		for _, d := range m.Diags {
			t.Logf("%s: %s", d.Rule, d.Message())
		}
		t.Fatalf("%d findings, want 1, for\n%s", len(m.Diags), body)
	}
	if c := m.Case("c"); c == nil || !c.Unresolved {
		t.Errorf("a case with a bad profile must be left out of the estimate")
	}
	d := m.Diags[0]
	return d, src[d.Loc.Span.Start:d.Loc.Span.End]
}

// bodyFinding is a case body and the one finding it must give: its rule,
// the text it points at and words of its message.
type bodyFinding struct{ name, body, rule, at, msg string }

func checkFindings(t *testing.T, cases []bodyFinding) {
	t.Helper()
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			d, at := profileFinding(t, tc.body, memFS{})
			if d.Rule != tc.rule || at != tc.at || !strings.Contains(d.Message(), tc.msg) {
				t.Errorf("got %s at %q: %s\nwant %s at %q containing %q", d.Rule, at, d.Message(), tc.rule, tc.at, tc.msg)
			}
		})
	}
}

func TestProfileFindings(t *testing.T) {
	checkFindings(t, []bodyFinding{
		{"out of order", "profile {\n columns time pitch\n row 0 s 0 deg\n row 5 s 1 deg\n row 4 s 2 deg\n}", "bad-value", "4 s", "out of order"},
		{"duplicate time", "profile {\n columns time pitch\n row 0 s 0 deg\n row 0 s 1 deg\n}", "bad-value", "0 s", "given twice"},
		{"pitch range", "profile {\n columns time pitch\n row 0 s 91 deg\n}", "bad-value", "91 deg", "within ±90°"},
		{"roll range", "profile {\n columns time roll\n row 0 s -3.2 rad\n}", "bad-value", "-3.2 rad", "within ±180°"},
		{"wrong unit", "profile {\n columns time accel_y\n row 0 s 0.2 deg\n}", "unit", "0.2 deg", "acceleration"},
		{"time unit", "profile {\n columns time pitch\n row 0 m 0 deg\n}", "unit", "0 m", "time"},
		{"unknown column", "profile {\n columns time ptich\n row 0 s 0 deg\n}", "unknown-name", "ptich", "ptich"},
		{"no time", "profile {\n columns pitch\n row 0 deg\n}", "missing-field", "columns pitch", "time column"},
		{"short row", "profile {\n columns time pitch roll\n row 0 s 0 deg\n}", "syntax", "row 0 s 0 deg", "2 values"},
		{"rows first", "profile {\n row 0 s\n columns time\n}", "syntax", "row", "columns before"},
		{"no rows", "profile {\n columns time pitch\n}", "missing-value", "profile", "no rows"},
		{"duplicate column", "profile {\n columns time pitch pitch\n row 0 s 0 deg 0 deg\n}", "duplicate-name", "pitch", "twice"},
		{"twice", "profile {\n columns time\n row 0 s\n}\nprofile {\n columns time\n row 0 s\n}", "duplicate-name", "profile", "twice"},
		{"not a path", "profile 3 s", "syntax", "profile 3 s", "CSV"},
		{"unknown statement", "profile {\n columns time\n rows 0 s\n}", "unknown-field", "rows", "row"},
	})
}

func TestProfileCSV(t *testing.T) {
	good := "# braking then a curve\ntime (s), pitch [deg], accel_x (gn), accel_y (m/s2)\n0, 0, 0, 0\n4, -2.3, -0.13, 1.2\n"
	m := LoadSource("dir/p.loop", []byte("loop l {\n  fluid R134a\n}\ncase c {\n  roll 2 deg\n  profile \"m/brake.csv\"\n}\n"),
		memFS{"dir/m/brake.csv": []byte(good)})
	if len(m.Diags) != 0 {
		t.Fatalf("findings: %v", m.Diags)
	}
	p := m.Case("c").Profile
	if p.Table != "dir/m/brake.csv" || len(p.Rows) != 2 || p.Rows[1].Line != 4 {
		t.Fatalf("profile %+v", p)
	}
	r := p.Rows[1]
	if r.Time != 4 || math.Abs(r.Accel[0]+0.13*9.80665) > 1e-12 || r.Accel[1] != 1.2 || math.Abs(r.Roll-2*math.Pi/180) > 1e-15 {
		t.Errorf("row %+v", r)
	}
	for i, want := range []string{"0", "4"} {
		loc, ok := p.TableLoc(p.Rows[i])
		if !ok || loc.File != "dir/m/brake.csv" || good[loc.Span.Start:loc.Span.End] != want {
			t.Errorf("row %d's time in the table at %+v, want %q", i, loc, want)
		}
	}

	// A table's finding points into the table, at the line and field it
	// is about, and back at the profile that reads it. at is the text the
	// finding covers; line its one-based line in the table.
	for _, tc := range []struct {
		name, csv, at string
		line          int
		msg           string
	}{
		{"wrong unit", "time (s), pitch (m)\n0, 1\n", "pitch (m)", 1, `pitch: unit "m" is not an angle`},
		{"no unit", "time (s), accel_y\n0, 1\n", "accel_y", 1, `accel_y: no unit`},
		{"time unit", "time (kg), pitch (deg)\n0, 1\n", "time (kg)", 1, `time: unit "kg" is not a time`},
		{"unknown unit", "time (s), pitch (degs)\n0, 1\n", "pitch (degs)", 1, `pitch: unit "degs"`},
		{"unclosed unit", "time (s, pitch (deg)\n0, 1\n", "time (s", 1, `unit in "time (s" not closed`},
		{"not a number", "time (s), pitch (deg)\n0, 1\n1, abc\n", "abc", 3, `pitch: not a number "abc"`},
		{"quoted", "time (s), pitch (deg)\r\n0, 1\r\n1,  \"x1\" \r\n", "x1", 3, `pitch: not a number "x1"`},
		{"field count", "time (s), pitch (deg)\n0, 1, 2\n", "0, 1, 2", 2, `3 fields`},
		{"angle range", "# c\ntime (s), roll (deg)\n0, 181\n", "181", 3, `roll: roll must be within ±180°, not 181°`},
		{"order", "time (s), roll (deg)\n0, 1\n2, 1\n1, 1\n", "1", 4, `time 1 s is out of order`},
		{"duplicate", "roll (deg), time (min)\n1, 0\n1, 0\n", "0", 3, `time 0 s is given twice`},
		{"no time", "pitch (deg)\n1\n", "pitch (deg)", 1, `missing column time`},
		{"unknown column", "time (s), rol (deg)\n0, 1\n", "rol (deg)", 1, `did you mean roll?`},
		{"empty", "# nothing\n", "", 1, `no header`},
		{"no rows", "time (s)\n", "", 1, `no rows`},
	} {
		t.Run(tc.name, func(t *testing.T) {
			fs := memFS{"m/brake.csv": []byte(tc.csv)}
			src := "loop l {\n  fluid R134a\n}\ncase c {\n  profile \"m/brake.csv\"\n}\n"
			m := LoadSource("p.loop", []byte(src), fs)
			if len(m.Diags) != 1 {
				t.Fatalf("%d findings, want 1: %v", len(m.Diags), m.Diags)
			}
			d := m.Diags[0]
			if d.Loc.File != "m/brake.csv" || !strings.Contains(d.Message(), tc.msg) {
				t.Fatalf("got %s in %s: %s\nwant in m/brake.csv, containing %q", d.Rule, d.Loc.File, d.Message(), tc.msg)
			}
			if at := tc.csv[d.Loc.Span.Start:d.Loc.Span.End]; at != tc.at {
				t.Errorf("finding covers %q, want %q", at, tc.at)
			}
			mp := m.Mapper("m/brake.csv")
			if mp == nil {
				t.Fatal("no positions for the table")
			}
			if l := mp.OffsetPosition(d.Loc.Span.Start, UTF8).Line + 1; l != tc.line {
				t.Errorf("finding on line %d, want %d", l, tc.line)
			}
			back := d.Related[len(d.Related)-1].Loc
			if back.File != "p.loop" || src[back.Span.Start:back.Span.End] != `"m/brake.csv"` {
				t.Errorf("related %+v does not point at the profile statement", d.Related)
			}
		})
	}
	d, at := profileFinding(t, "  profile \"none.csv\"", memFS{})
	if d.Rule != "file-unreadable" || at != `"none.csv"` {
		t.Errorf("missing file: %s at %s: %s", d.Rule, at, d.Message())
	}
}

func TestEnvelope(t *testing.T) {
	m := LoadSource("p.loop", []byte("loop l {\n  fluid R134a\n}\ncase c {\n  envelope {\n    pitch -8 deg 4 deg\n    accel_y 0.2 gn\n  }\n}\n"), memFS{})
	if len(m.Diags) != 0 {
		t.Fatalf("findings: %v", m.Diags)
	}
	e := m.Case("c").Envelope
	if e == nil || len(e.Axes) != 2 {
		t.Fatalf("envelope %+v", e)
	}
	if a := e.Axes[0]; a.Name != "pitch" || math.Abs(a.Lo+8*math.Pi/180) > 1e-15 || math.Abs(a.Hi-4*math.Pi/180) > 1e-15 {
		t.Errorf("pitch axis %+v", a)
	}
	if a := e.Axes[1]; a.Name != "accel_y" || math.Abs(a.Lo+0.2*9.80665) > 1e-12 || a.Hi != -a.Lo {
		t.Errorf("accel_y axis %+v", a)
	}
	checkFindings(t, []bodyFinding{
		{"order", "envelope {\n pitch 4 deg -8 deg\n}", "bad-value", "-8 deg", "below its low bound"},
		{"range", "envelope {\n pitch 100 deg\n}", "bad-value", "100 deg", "within ±90°"},
		{"negative half", "envelope {\n roll -5 deg\n}", "bad-value", "-5 deg", "half-range"},
		{"unit", "envelope {\n accel_x 5 deg\n}", "unit", "5 deg", "acceleration"},
		{"unknown axis", "envelope {\n yaw 5 deg\n}", "unknown-field", "yaw", "in an envelope"},
		{"twice", "envelope {\n roll 5 deg\n roll 6 deg\n}", "duplicate-name", "roll", "twice"},
		{"empty", "envelope {\n}", "missing-value", "envelope", "no axis"},
		{"no block", "envelope 5 deg", "syntax", "envelope 5 deg", "block of bounds"},
	})
}

// FuzzProfileCSV checks that reading any table never panics and that every
// error names a line within the text, and a span within it.
func FuzzProfileCSV(f *testing.F) {
	f.Add([]byte("time (s), pitch (deg)\n0, 1\n2, 3\n"))
	f.Add([]byte("\uFEFF# c\ntime [min], accel_y (gn), roll (rad)\n0,0,0\n1,\"0.1\",3.2\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		cols, rows, err := ReadProfileCSV(data)
		if err != nil {
			if err.Line > len(tableLines(data)) {
				t.Fatalf("error at line %d past the text: %v", err.Line, err)
			}
			if sp := tableSpan(data, err.Line, err.Column); sp.Start < 0 || sp.Start > sp.End || sp.End > len(data) {
				t.Fatalf("error %v located at %+v in %d bytes", err, sp, len(data))
			}
			return
		}
		if len(cols) == 0 || len(rows) == 0 {
			t.Fatalf("no error and nothing read")
		}
	})
}

// A variant of a model (With) resolves its profiles from the tables the
// model read, without a file system.
func TestProfileTableInVariant(t *testing.T) {
	fs := memFS{"m/brake.csv": []byte("time (s), pitch (deg)\n0, 0\n4, -2.3\n")}
	base := LoadSource("p.loop", []byte("param q = 1 kW\nloop l {\n  fluid R134a\n}\ncase c {\n  profile \"m/brake.csv\"\n}\ncase d {\n  profile \"none.csv\"\n}\n"), fs)
	v, err := base.With()
	if err != nil {
		t.Fatal(err)
	}
	for _, m := range []*Model{base, v} {
		if p := m.Case("c").Profile; p == nil || len(p.Rows) != 2 || p.Rows[1].Time != 4 {
			t.Errorf("profile %+v", p)
		}
		n := 0
		for _, d := range m.Diags {
			if d.Rule == "file-unreadable" && strings.Contains(d.Message(), "none.csv") {
				n++
			}
		}
		if n != 1 {
			t.Errorf("%d findings for the missing table, want 1: %v", n, m.Diags)
		}
	}
}

// BenchmarkProfileTable resolves a case whose profile is a 10,000-row
// table: reading it and locating each row's time in it take time in
// proportion to the table.
func BenchmarkProfileTable(b *testing.B) {
	var t strings.Builder
	t.WriteString("time (s), pitch (deg), accel_x (gn)\n")
	for i := 0; i < MaxProfileRows; i++ {
		fmt.Fprintf(&t, "%d, %.3f, %.3f\n", i, 10*math.Sin(float64(i)/50), 0.1*math.Cos(float64(i)/70))
	}
	fs := memFS{"drive.csv": []byte(t.String())}
	src := []byte("loop l {\n  fluid R134a\n}\ncase c {\n  profile \"drive.csv\"\n}\n")
	b.ReportAllocs()
	for i := 0; i < b.N; i++ {
		m := LoadSource("p.loop", src, fs)
		if p := m.Case("c").Profile; p == nil || len(p.Rows) != MaxProfileRows {
			b.Fatal("the table did not load")
		}
	}
}

// A table with several bad cells reports each, at its line and field, not
// only the first; past MaxTableErrors a note counts the rest.
func TestProfileCSVEveryError(t *testing.T) {
	load := func(csv string) *Model {
		src := "loop l {\n  fluid R134a\n}\ncase c {\n  profile \"m/t.csv\"\n}\n"
		return LoadSource("p.loop", []byte(src), memFS{"m/t.csv": []byte(csv)})
	}
	csv := "time (s), pitch (deg), roll (deg)\n0, 1x, 2\n1, 3, 200\n2, 4\n3, y, z\n"
	m := load(csv)
	want := []struct{ at, msg string }{
		{"1x", `pitch: not a number "1x"`},
		{"200", "roll: roll must be within ±180°"},
		{"2, 4", "2 fields, but the header names 3 columns"},
		{"y", `pitch: not a number "y"`},
		{"z", `roll: not a number "z"`},
	}
	if len(m.Diags) != len(want) {
		t.Fatalf("%d findings, want %d: %v", len(m.Diags), len(want), m.Diags)
	}
	for i, w := range want {
		d := m.Diags[i]
		if at := csv[d.Loc.Span.Start:d.Loc.Span.End]; at != w.at || d.Loc.File != "m/t.csv" || !strings.Contains(d.Message(), w.msg) {
			t.Errorf("finding %d: %q at %q, want %q at %q", i, d.Message(), at, w.msg, w.at)
		}
	}

	var b strings.Builder
	b.WriteString("time (s), roll (deg)\n")
	for i := 0; i < MaxTableErrors+7; i++ {
		fmt.Fprintf(&b, "%d, bad\n", i)
	}
	m = load(b.String())
	if len(m.Diags) != MaxTableErrors+1 {
		t.Fatalf("%d findings, want %d", len(m.Diags), MaxTableErrors+1)
	}
	if last := m.Diags[MaxTableErrors].Message(); !strings.Contains(last, "7 more errors not shown") {
		t.Errorf("last finding %q, want a count of the 7 errors not shown", last)
	}
}

// A table's lines end where an editor ends them: at LF, CRLF or a lone CR
// (classic Mac OS line ends, which VS Code and Vim both break lines at),
// so a bad cell is reported on the line and column the editor shows, and
// the same line the Mapper counts.
func TestProfileCSVLineEnds(t *testing.T) {
	for _, tc := range []struct{ name, nl1, nl2, nl3 string }{
		{"LF", "\n", "\n", "\n"},
		{"CRLF", "\r\n", "\r\n", "\r\n"},
		{"CR", "\r", "\r", "\r"},
		{"mixed", "\r", "\r\n", "\n"},
		{"mixed2", "\n", "\r", "\r\n"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			csv := "time (s), roll (deg)" + tc.nl1 + "0, 1" + tc.nl2 + "# c" + tc.nl3 + "1,  bad"
			src := "loop l {\n  fluid R134a\n}\ncase c {\n  profile \"t.csv\"\n}\n"
			m := LoadSource("p.loop", []byte(src), memFS{"t.csv": []byte(csv)})
			if len(m.Diags) != 1 {
				t.Fatalf("%d findings, want 1: %v", len(m.Diags), m.Diags)
			}
			d := m.Diags[0]
			if at := csv[d.Loc.Span.Start:d.Loc.Span.End]; at != "bad" {
				t.Errorf("finding covers %q, want %q", at, "bad")
			}
			pos := NewMapper([]byte(csv)).OffsetPosition(d.Loc.Span.Start, UTF16)
			if pos.Line != 3 || pos.Col != 4 {
				t.Errorf("finding at %+v, want line 3 column 4 (zero-based)", pos)
			}
			_, rows, _ := ReadProfileCSV([]byte(strings.Replace(csv, "bad", "2", 1)))
			if len(rows) != 2 || rows[0].Line != 2 || rows[1].Line != 4 {
				t.Errorf("rows %+v, want lines 2 and 4", rows)
			}
		})
	}
}
