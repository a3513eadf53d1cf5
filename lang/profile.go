// Manoeuvres: a case's attitude and acceleration against time (a profile),
// written as a table in the case or read from a CSV file, and the bounds of
// a search for the worst combination of attitude and acceleration (an
// envelope).

package lang

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"

	"circa/check/fluid"
	"circa/units"
)

// Profile is a manoeuvre: the case's attitude and acceleration at a list of
// instants, each evaluated as a steady state. A column the profile does not
// give keeps the case's own value at every instant.
type Profile struct {
	File string
	Span Span // the profile statement's head
	// Table is the CSV file the rows come from ("" for rows in the case).
	Table   string
	Columns []string // the columns given, in ProfileColumns' spelling, time first
	Rows    []ProfileRow
}

// Loc returns where the profile was written.
func (p *Profile) Loc() Location { return Location{File: p.File, Span: p.Span} }

// ProfileRow is one instant of a profile, in SI (s, rad, m/s²).
type ProfileRow struct {
	Time             float64
	Pitch, Roll, Yaw float64
	Accel            [3]float64
	Span             Span // the row in the loop file, or the table's path
	TimeSpan         Span // the row's time as written (the table's path for a CSV row)
	Line             int  // the row's line in the CSV file (0 for a row in the case)
	TableSpan        Span // the row's time in the CSV file (a row in the case: zero)
}

// TableLoc returns where a row read from the profile's CSV file is written
// there (its time); false for a row written in the case.
func (p *Profile) TableLoc(r ProfileRow) (Location, bool) {
	if p.Table == "" || r.Line == 0 {
		return Location{}, false
	}
	return Location{File: p.Table, Span: r.TableSpan}, true
}

// Envelope bounds the search for the worst combination of attitude and
// acceleration of a case. An axis it does not bound keeps the case's own
// value.
type Envelope struct {
	File string
	Span Span
	Axes []EnvelopeAxis
}

// Loc returns where the envelope was written.
func (e *Envelope) Loc() Location { return Location{File: e.File, Span: e.Span} }

// EnvelopeAxis is one bounded axis of an envelope, SI (rad or m/s²).
type EnvelopeAxis struct {
	Name   string // one of EnvelopeAxes
	Lo, Hi float64
	Span   Span
}

// ProfileColumns are the columns of a profile: the time, the attitude and
// the acceleration's components in the equipment frame.
var ProfileColumns = []string{"time", "pitch", "roll", "yaw", "accel_x", "accel_y", "accel_z"}

// EnvelopeAxes are the axes an envelope may bound.
var EnvelopeAxes = []string{"pitch", "roll", "accel_x", "accel_y", "accel_z"}

// ProfileFields and EnvelopeFields are the statements of the two blocks.
var (
	ProfileFields  = []string{"columns", "row"}
	EnvelopeFields = EnvelopeAxes
)

// MaxProfileRows bounds the instants of one profile: each is a full
// estimate.
const MaxProfileRows = 10000

// Angle ranges of an attitude: pitch within a quarter turn either way, roll
// and yaw within half a turn.
const (
	maxPitch = math.Pi / 2
	maxRoll  = math.Pi
)

// columnField is the case field a profile column gives at each instant:
// pitch, roll and yaw are the case's own fields and each accel_ column a
// component of its accel, so a column's value is read as that field's
// (its dimension and its range); time is the profile's own.
func columnField(col string) string {
	if strings.HasPrefix(col, "accel_") {
		return "accel"
	}
	return col
}

// columnNeed is the dimension of a column's values: its case field's.
func columnNeed(col string) units.Need {
	if col == "time" {
		return units.Need{Dim: units.Time}
	}
	return FieldNeeds[columnField(col)]
}

func degText(rad float64) string {
	return strconv.FormatFloat(rad*180/math.Pi, 'g', 6, 64) + "°"
}

// at is where a row keeps a column's SI value.
func (row *ProfileRow) at(col string) *float64 {
	switch col {
	case "time":
		return &row.Time
	case "pitch":
		return &row.Pitch
	case "roll":
		return &row.Roll
	case "yaw":
		return &row.Yaw
	case "accel_x":
		return &row.Accel[0]
	case "accel_y":
		return &row.Accel[1]
	case "accel_z":
		return &row.Accel[2]
	}
	return new(float64)
}

// set stores a column's SI value in a row.
func (row *ProfileRow) set(col string, v float64) { *row.at(col) = v }

// caseProfile reads "profile { columns …; row … }" or "profile "FILE.csv"".
func (r *resolver) caseProfile(c *Case, s *Stmt) {
	file := c.File()
	if c.Profile != nil {
		d := r.errorf("duplicate-name", file, s.Word.Span(), "case %s gives a profile twice", c.Name)
		d.Related = append(d.Related, Related{Loc: c.Profile.Loc(), Message: "first given here"})
		c.Unresolved = true
		return
	}
	p := &Profile{File: file, Span: s.Span()}
	var ok bool
	switch {
	case len(s.Args) == 0 && s.Block != nil:
		ok = r.profileBlock(p, s.Block)
	case len(s.Args) == 1 && s.Block == nil:
		str, isStr := (*Str)(nil), false
		if a := singleAtom(s.Args[0].Expr); a != nil && a.Str != nil {
			str, isStr = a.Str, true
		}
		if !isStr {
			r.shapeError(file, s, "profile takes a block of rows or a quoted CSV file: profile \"braking.csv\"")
			c.Unresolved = true
			return
		}
		ok = r.profileTable(p, str)
	default:
		r.shapeError(file, s, "profile takes a block of rows (profile { columns time pitch; row 0 s 0 deg }) or a quoted CSV file (profile \"braking.csv\"), not both")
		c.Unresolved = true
		return
	}
	// The rows that did read are checked for order too, so a file with a
	// bad value and a time out of order shows both.
	if !r.profileTimes(p) {
		ok = false
	}
	c.Profile = p
	if !ok {
		c.Unresolved = true
	}
}

// profileBlock reads the columns and rows written in the case.
func (r *resolver) profileBlock(p *Profile, b *Block) bool {
	file := p.File
	ok := true
	var colsAt *Stmt
	for _, s := range b.Stmts {
		if s.Bad {
			ok = false
			continue
		}
		r.noBlock(file, s)
		switch s.Keyword() {
		case "columns":
			if colsAt != nil {
				d := r.errorf("duplicate-name", file, s.Word.Span(), "the profile names its columns twice")
				d.Related = append(d.Related, Related{Loc: Location{File: file, Span: colsAt.Word.Span()}, Message: "first named here"})
				ok = false
				continue
			}
			colsAt = s
			if !r.profileColumns(p, s) {
				return false
			}
		case "row":
			if colsAt == nil {
				r.errorf("syntax", file, s.Word.Span(), "a profile names its columns before its rows: columns time pitch roll accel_x")
				return false
			}
			if len(p.Rows) == MaxProfileRows {
				r.errorf("bad-value", file, s.Span(), "a profile holds at most %d rows", MaxProfileRows)
				return false
			}
			if !r.profileRow(p, s) {
				ok = false
			}
		default:
			r.unknownWord(file, s, ProfileFields, "in a profile")
			ok = false
		}
	}
	if ok && len(p.Rows) == 0 {
		r.errorf("missing-value", file, p.Span, "the profile has no rows: add row TIME VALUE… after its columns")
		ok = false
	}
	return ok
}

// profileColumns reads "columns time pitch roll …".
func (r *resolver) profileColumns(p *Profile, s *Stmt) bool {
	file := p.File
	seen := map[string]Span{}
	for _, a := range s.Args {
		id := nameOf(a.Expr)
		if id == nil || a.Key != "" {
			r.errorf("syntax", file, a.Span(), "columns lists column names: %s", strings.Join(ProfileColumns, ", "))
			return false
		}
		if indexOf(ProfileColumns, id.Name) < 0 {
			d := r.errorf("unknown-name", file, id.Span(), "unknown profile column %q (columns: %s)", id.Name, strings.Join(ProfileColumns, ", "))
			if best := Closest(id.Name, ProfileColumns); best != "" {
				d.Fixes = append(d.Fixes, Fix{Title: fmt.Sprintf("Change to %s", best), Edits: []Edit{{Loc: Location{File: file, Span: id.Span()}, NewText: best}}})
			}
			return false
		}
		if prev, dup := seen[id.Name]; dup {
			d := r.errorf("duplicate-name", file, id.Span(), "column %s is named twice", id.Name)
			d.Related = append(d.Related, Related{Loc: Location{File: file, Span: prev}, Message: "first named here"})
			return false
		}
		seen[id.Name] = id.Span()
		p.Columns = append(p.Columns, id.Name)
	}
	if _, ok := seen["time"]; !ok {
		r.errorf("missing-field", file, s.Span(), "a profile needs a time column: columns time %s", strings.Join(p.Columns, " "))
		return false
	}
	return true
}

// profileRow reads "row 2 s -3 deg …", one value per column.
func (r *resolver) profileRow(p *Profile, s *Stmt) bool {
	file := p.File
	if len(s.Args) != len(p.Columns) || len(s.Args) == 0 {
		r.errorf("syntax", file, s.Span(), "the row has %d values, but the profile has %d columns (%s)", len(s.Args), len(p.Columns), strings.Join(p.Columns, ", "))
		return false
	}
	row := ProfileRow{Span: s.Span(), TimeSpan: s.Args[0].Span()}
	ok := true
	for j, a := range s.Args {
		col := p.Columns[j]
		if a.Expr == nil {
			r.errorf("syntax", file, a.Span(), "%s needs a value", col)
			ok = false
			continue
		}
		v := r.inRange(columnField(col), file, r.expr(file, a.Expr, columnNeed(col)))
		if !v.Set {
			ok = false
			continue
		}
		row.set(col, v.SI)
	}
	if ok {
		p.Rows = append(p.Rows, row)
	}
	return ok
}

// profileTimes checks that the times increase down the profile.
func (r *resolver) profileTimes(p *Profile) bool {
	for i := 1; i < len(p.Rows); i++ {
		a, b := p.Rows[i-1], p.Rows[i]
		if b.Time > a.Time {
			continue
		}
		what := "out of order: times must increase down the profile"
		if b.Time == a.Time {
			what = "given twice"
		}
		t := strconv.FormatFloat(b.Time, 'g', -1, 64)
		if p.Table != "" {
			data := r.m.tables[p.Table].data
			col := indexOf(p.Columns, "time") + 1
			d := r.errorf("bad-value", p.Table, tableSpan(data, b.Line, col), "time %s s is %s (line %d has %s s)",
				t, what, a.Line, strconv.FormatFloat(a.Time, 'g', -1, 64))
			d.Related = append(d.Related, Related{Loc: Location{File: p.Table, Span: tableSpan(data, a.Line, col)}, Message: "the row before"},
				Related{Loc: Location{File: p.File, Span: b.TimeSpan}, Message: "the profile that reads this table"})
		} else {
			d := r.errorf("bad-value", p.File, b.TimeSpan, "time %s s is %s (the row before has %s s)", t, what, strconv.FormatFloat(a.Time, 'g', -1, 64))
			d.Related = append(d.Related, Related{Loc: Location{File: p.File, Span: a.Span}, Message: "the row before"})
		}
		return false
	}
	return true
}

// profileTable reads the rows of a profile from a CSV file named relative
// to the loop file.
func (r *resolver) profileTable(p *Profile, str *Str) bool {
	path := str.Value()
	if !filepath.IsAbs(path) {
		path = filepath.Join(filepath.Dir(p.File), filepath.FromSlash(path))
	}
	p.Table = path
	data, err := r.readTable(path)
	if err != nil {
		msg := err.Error()
		var pe *os.PathError
		if errors.As(err, &pe) {
			msg = pe.Err.Error()
		}
		r.errorf("file-unreadable", p.File, str.Span(), "cannot read profile %s: %s", str.Value(), msg)
		return false
	}
	cols, rows, terrs := readProfileCSV(data)
	if len(terrs) > 0 {
		for _, terr := range terrs {
			d := r.errorf("bad-table", path, tableSpan(data, terr.Line, terr.Column), "%s", tableMessage(terr))
			d.Related = append(d.Related, Related{Loc: Location{File: p.File, Span: str.Span()}, Message: "the profile that reads this table"})
		}
		return false
	}
	col := indexOf(cols, "time") + 1
	lines := tableLines(data)
	for i := range rows {
		rows[i].Span, rows[i].TimeSpan = str.Span(), str.Span()
		if l := rows[i].Line; l >= 1 && l <= len(lines) {
			rows[i].TableSpan = fieldSpan(data, lines[l-1], col)
		}
	}
	p.Columns, p.Rows = cols, rows
	return true
}

// tableMessage is a table error's text without its place, which the
// finding's location gives.
func tableMessage(e *fluid.TableError) string {
	if e.Name != "" {
		return e.Name + ": " + e.Msg
	}
	return e.Msg
}

// tableSpan locates field col (one-based; 0 for the whole line) of line
// (one-based, lines ending as fluid.LineEnd ends them; 0 for the
// start of the file) in a table's text, without the blanks and quotes
// around the field.
func tableSpan(data []byte, line, col int) Span {
	start := 0
	if bytes.HasPrefix(data, []byte("\uFEFF")) {
		start = len("\uFEFF")
	}
	if line <= 0 {
		return Span{start, start}
	}
	for l := 1; l < line; l++ {
		_, next := fluid.LineEnd(data, start)
		if next < 0 {
			return Span{len(data), len(data)}
		}
		start = next
	}
	return fieldSpan(data, start, col)
}

// tableLines returns where each line of a table starts, lines counted as
// ReadProfileCSV counts them: index 0 holds line 1.
func tableLines(data []byte) []int {
	start := 0
	if bytes.HasPrefix(data, []byte("\uFEFF")) {
		start = len("\uFEFF")
	}
	out := make([]int, 0, bytes.Count(data, []byte("\n"))+1)
	for {
		out = append(out, start)
		_, next := fluid.LineEnd(data, start)
		if next < 0 {
			return out
		}
		start = next
	}
}

// fieldSpan is tableSpan on the line that starts at offset start.
func fieldSpan(data []byte, start, col int) Span {
	end, _ := fluid.LineEnd(data, start)
	for f := 1; f < col; f++ {
		k := bytes.IndexByte(data[start:end], ',')
		if k < 0 {
			break
		}
		start += k + 1
	}
	if col > 0 {
		if k := bytes.IndexByte(data[start:end], ','); k >= 0 {
			end = start + k
		}
	}
	trim := func(c byte) bool { return c == ' ' || c == '\t' || c == '"' }
	for start < end && trim(data[start]) {
		start++
	}
	for end > start && trim(data[end-1]) {
		end--
	}
	return Span{start, end}
}

// tableRead is the outcome of reading a table file.
type tableRead struct {
	data   []byte
	err    error
	mapper *Mapper // positions in data, for findings located in the table
}

// readTable reads a table file once per model: a variant of the model
// (Model.With) has no file system and reuses what the model read.
func (r *resolver) readTable(path string) ([]byte, error) {
	if t, ok := r.m.tables[path]; ok {
		return t.data, t.err
	}
	if r.fs == nil {
		return nil, fmt.Errorf("%s was not read with the model", path)
	}
	data, err := r.fs.ReadFile(path)
	if r.m.tables == nil {
		r.m.tables = map[string]tableRead{}
	}
	t := tableRead{data: data, err: err}
	if err == nil {
		t.mapper = NewMapper(data)
	}
	r.m.tables[path] = t
	return data, err
}

// ReadProfileCSV reads a profile table: comma-separated, '#' comments, a
// header naming the columns (ProfileColumns) each with its unit in
// parentheses or brackets, as fluid tables are written:
//
//	# braking then a curve
//	time (s), pitch (deg), accel_x (gn), accel_y (gn)
//	0, 0, 0, 0
//	4, -2.3, -0.13, 0
//
// Errors are located by line and column.
func ReadProfileCSV(data []byte) (cols []string, rows []ProfileRow, err *fluid.TableError) {
	cols, rows, errs := readProfileCSV(data)
	if len(errs) > 0 {
		return nil, nil, errs[0]
	}
	return cols, rows, nil
}

// MaxTableErrors is how many errors of one table are reported; a note
// counts the rest.
const MaxTableErrors = fluid.MaxTableErrors

// readProfileCSV is ReadProfileCSV giving every bad cell of the rows, in
// the order of the text, up to MaxTableErrors+1 (the extra one tells that
// more were found); an error in the header stops the reading.
func readProfileCSV(data []byte) (cols []string, rows []ProfileRow, errs []*fluid.TableError) {
	data = bytes.TrimPrefix(data, []byte("\uFEFF"))
	sc := bufio.NewScanner(bytes.NewReader(data))
	sc.Buffer(make([]byte, 64*1024), 1<<20)
	sc.Split(fluid.ScanLines)
	var us []units.Unit
	line := 0
	var found fluid.TableErrors
	for sc.Scan() {
		line++
		text := strings.TrimSpace(sc.Text())
		if text == "" || strings.HasPrefix(text, "#") {
			continue
		}
		fields := fluid.SplitFields(text)
		if cols == nil {
			var herr *fluid.TableError
			cols, us, herr = profileHeader(line, fields)
			if herr != nil {
				return nil, nil, []*fluid.TableError{herr}
			}
			continue
		}
		if len(fields) != len(cols) {
			found.Add(&fluid.TableError{Line: line, Msg: fmt.Sprintf("%d fields, but the header names %d columns", len(fields), len(cols))})
			continue
		}
		if len(rows) == MaxProfileRows {
			found.Add(&fluid.TableError{Line: line, Msg: fmt.Sprintf("a profile holds at most %d rows", MaxProfileRows)})
			break
		}
		row := ProfileRow{Line: line}
		ok := true
		for j, f := range fields {
			fail := func(format string, a ...any) {
				ok = false
				found.Add(&fluid.TableError{Line: line, Column: j + 1, Name: cols[j], Msg: fmt.Sprintf(format, a...)})
			}
			v, perr := strconv.ParseFloat(f, 64)
			if perr != nil || math.IsNaN(v) || math.IsInf(v, 0) {
				fail("not a number %q", f)
				continue
			}
			si := us[j].ToSI(v)
			if math.IsNaN(si) || math.IsInf(si, 0) {
				fail("value %q out of range", f)
				continue
			}
			if want := rangeWant(columnField(cols[j]), si); want != "" {
				fail("%s must be %s, not %s", cols[j], want, degText(si))
				continue
			}
			row.set(cols[j], si)
		}
		if ok {
			rows = append(rows, row)
		}
	}
	if serr := sc.Err(); serr != nil {
		found.Add(&fluid.TableError{Line: line + 1, Msg: "reading the table: " + serr.Error()})
	}
	if found.Len() > 0 {
		return nil, nil, found.List()
	}
	if cols == nil {
		return nil, nil, []*fluid.TableError{{Msg: "no header: the first line names the columns, e.g. \"time (s), pitch (deg), accel_x (gn)\""}}
	}
	if len(rows) == 0 {
		return nil, nil, []*fluid.TableError{{Msg: "the table has no rows"}}
	}
	return cols, rows, nil
}

// profileHeader reads a profile table's column names and units.
func profileHeader(line int, fields []string) ([]string, []units.Unit, *fluid.TableError) {
	cols := make([]string, len(fields))
	us := make([]units.Unit, len(fields))
	seen := map[string]int{}
	for j, f := range fields {
		name, u, err := fluid.HeaderCell(f)
		if err != nil {
			return nil, nil, &fluid.TableError{Line: line, Column: j + 1, Msg: err.Error()}
		}
		name = strings.ToLower(name)
		if indexOf(ProfileColumns, name) < 0 {
			msg := fmt.Sprintf("unknown column %q (columns: %s)", name, strings.Join(ProfileColumns, ", "))
			if best := Closest(name, ProfileColumns); best != "" {
				msg = fmt.Sprintf("unknown column %q; did you mean %s? (columns: %s)", name, best, strings.Join(ProfileColumns, ", "))
			}
			return nil, nil, &fluid.TableError{Line: line, Column: j + 1, Name: name, Msg: msg}
		}
		if k, dup := seen[name]; dup {
			return nil, nil, &fluid.TableError{Line: line, Column: j + 1, Name: name, Msg: fmt.Sprintf("duplicate column: %s is also column %d", name, k)}
		}
		seen[name] = j + 1
		need := columnNeed(name)
		if u == "" {
			return nil, nil, &fluid.TableError{Line: line, Column: j + 1, Name: name,
				Msg: fmt.Sprintf("no unit: write it in parentheses, e.g. %q", name+" ("+exampleProfileUnit(name)+")")}
		}
		pu, perr := units.Parse(u)
		if perr != nil {
			return nil, nil, &fluid.TableError{Line: line, Column: j + 1, Name: name, Msg: fmt.Sprintf("unit %q: %v", u, perr)}
		}
		if pu.Dim != need.Dim {
			return nil, nil, &fluid.TableError{Line: line, Column: j + 1, Name: name,
				Msg: fmt.Sprintf("unit %q is not %s, as %s needs", u, units.Name(need.Dim), name)}
		}
		cols[j], us[j] = name, pu
	}
	if _, ok := seen["time"]; !ok {
		return nil, nil, &fluid.TableError{Line: line, Msg: "missing column time"}
	}
	return cols, us, nil
}

func exampleProfileUnit(col string) string {
	switch col {
	case "time":
		return "s"
	case "accel_x", "accel_y", "accel_z":
		return "gn"
	}
	return "deg"
}

// finishProfile gives every row the case's own value in the columns the
// profile leaves out.
func finishProfile(c *Case) {
	p := c.Profile
	if p == nil {
		return
	}
	has := map[string]bool{}
	for _, col := range p.Columns {
		has[col] = true
	}
	own := ProfileRow{Pitch: c.Pitch.SI, Roll: c.Roll.SI, Yaw: c.Yaw.SI, Accel: [3]float64{c.Accel.X, c.Accel.Y, c.Accel.Z}}
	for i := range p.Rows {
		row := &p.Rows[i]
		for _, col := range ProfileColumns[1:] {
			if !has[col] {
				row.set(col, *own.at(col))
			}
		}
	}
}

// caseEnvelope reads "envelope { pitch -8 deg 8 deg; accel_y 0.2 gn … }":
// each axis between two bounds, or within ± one value.
func (r *resolver) caseEnvelope(c *Case, s *Stmt) {
	file := c.File()
	if c.Envelope != nil {
		d := r.errorf("duplicate-name", file, s.Word.Span(), "case %s gives an envelope twice", c.Name)
		d.Related = append(d.Related, Related{Loc: c.Envelope.Loc(), Message: "first given here"})
		c.Unresolved = true
		return
	}
	if len(s.Args) != 0 || s.Block == nil {
		r.shapeError(file, s, "envelope takes a block of bounds: envelope { pitch -8 deg 8 deg; accel_y 0.2 gn }")
		c.Unresolved = true
		return
	}
	e := &Envelope{File: file, Span: s.Span()}
	ok := true
	seen := map[string]Span{}
	for _, st := range s.Block.Stmts {
		if st.Bad {
			ok = false
			continue
		}
		r.noBlock(file, st)
		name := st.Keyword()
		if indexOf(EnvelopeAxes, name) < 0 {
			r.unknownWord(file, st, EnvelopeFields, "in an envelope")
			ok = false
			continue
		}
		if prev, dup := seen[name]; dup {
			d := r.errorf("duplicate-name", file, st.Word.Span(), "the envelope bounds %s twice", name)
			d.Related = append(d.Related, Related{Loc: Location{File: file, Span: prev}, Message: "first bounded here"})
			ok = false
			continue
		}
		seen[name] = st.Word.Span()
		ax, good := r.envelopeAxis(file, st)
		if !good {
			ok = false
			continue
		}
		e.Axes = append(e.Axes, ax)
	}
	if ok && len(e.Axes) == 0 {
		r.errorf("missing-value", file, s.Span(), "the envelope bounds no axis: give %s", strings.Join(EnvelopeAxes, ", "))
		ok = false
	}
	c.Envelope = e
	if !ok {
		c.Unresolved = true
	}
}

// envelopeAxis reads "AXIS LOW HIGH" or "AXIS HALF" (from −HALF to +HALF).
func (r *resolver) envelopeAxis(file string, st *Stmt) (EnvelopeAxis, bool) {
	name := st.Keyword()
	need := columnNeed(name)
	ax := EnvelopeAxis{Name: name, Span: st.Span()}
	if (len(st.Args) != 1 && len(st.Args) != 2) || st.Args[0].Expr == nil || st.Args[len(st.Args)-1].Expr == nil {
		r.shapeError(file, st, "%s takes its low and high bounds (%s -8 deg 8 deg) or one half-range (%s 8 deg)", name, name, name)
		return ax, false
	}
	lo := r.expr(file, st.Args[0].Expr, need)
	hi := lo
	if len(st.Args) == 2 {
		hi = r.expr(file, st.Args[1].Expr, need)
	}
	if !lo.Set || !hi.Set {
		return ax, false
	}
	if len(st.Args) == 1 {
		if lo.SI < 0 {
			r.errorf("bad-value", file, lo.Span(), "a half-range must be zero or more: write both bounds to give a range on one side (%s -8 deg 0 deg)", name)
			return ax, false
		}
		ax.Lo, ax.Hi = -lo.SI, lo.SI
	} else {
		ax.Lo, ax.Hi = lo.SI, hi.SI
		if ax.Lo > ax.Hi {
			r.errorf("bad-value", file, hi.Span(), "the high bound of %s is below its low bound: write the low bound first", name)
			return ax, false
		}
	}
	for _, v := range []Value{lo, hi} {
		if !r.inRange(columnField(name), file, v).Set {
			return ax, false
		}
	}
	return ax, true
}

// ReadsTable reports whether resolving the model read the table file at
// path (a profile's CSV file), so that a change to it calls for resolving
// again.
func (m *Model) ReadsTable(path string) bool {
	_, ok := m.tables[path]
	return ok
}

// Tables lists the table files (profiles' CSV files) the model read, in
// path order.
func (m *Model) Tables() []string {
	out := make([]string, 0, len(m.tables))
	for p := range m.tables {
		out = append(out, p)
	}
	sort.Strings(out)
	return out
}

// Mapper returns the positions of a file the model read: a loop file, or
// a table that a finding may point into (nil for a file it did not read).
func (m *Model) Mapper(path string) *Mapper {
	if f := m.Files[path]; f != nil {
		return f.Mapper
	}
	return m.tables[path].mapper
}
