package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/santhosh-tekuri/jsonschema/v6"
)

// A finding about a profile's CSV file points into the file, at the line
// and field it is about, in every output; the profile statement that reads
// the table is its related location.
func TestCheckProfileTableLocation(t *testing.T) {
	dir := t.TempDir()
	loop := filepath.Join(dir, "main.loop")
	src := good + "case drive {\n  profile \"logs/drive.csv\"\n}\n"
	if err := os.WriteFile(loop, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	table := filepath.Join(dir, "logs", "drive.csv")
	os.MkdirAll(filepath.Dir(table), 0o755)
	// Line 4, the second field: "1O" (a letter O for a zero) from column 5.
	if err := os.WriteFile(table, []byte("# logged\ntime (s), pitch (deg)\n0, 1\n2,  1O\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	stmtLine, stmtCol := strings.Count(src[:strings.Index(src, `"logs/`)], "\n")+1, 11

	code, out, errs := circa(t, "", "check", "--no-estimates", loop)
	if code != 1 {
		t.Fatalf("exit %d: %s%s", code, out, errs)
	}
	want := table + `:4:5: error: pitch: not a number "1O" [bad-table]`
	if !strings.Contains(out, want) || !strings.Contains(out, "  2,  1O\n      ^~\n") {
		t.Errorf("text output lacks %q with its caret:\n%s", want, out)
	}
	if note := loop + ":" + strconv.Itoa(stmtLine) + ":" + strconv.Itoa(stmtCol) + ": the profile that reads this table"; !strings.Contains(out, note) {
		t.Errorf("text output lacks %q:\n%s", note, out)
	}

	_, out, _ = circa(t, "", "check", "--no-estimates", "--format", "json", loop)
	var rep struct {
		Findings []struct {
			Rule, File string
			Start, End struct{ Line, Column int }
			Related    []struct {
				File  string
				Start struct{ Line, Column int }
			}
		}
	}
	if err := json.Unmarshal([]byte(out), &rep); err != nil {
		t.Fatal(err)
	}
	found := false
	for _, f := range rep.Findings {
		if f.Rule != "bad-table" {
			continue
		}
		found = true
		if f.File != table || f.Start.Line != 4 || f.Start.Column != 5 || f.End.Column != 7 {
			t.Errorf("JSON finding at %s %+v–%+v, want %s 4:5–4:7", f.File, f.Start, f.End, table)
		}
		if len(f.Related) != 1 || f.Related[0].File != loop || f.Related[0].Start.Line != stmtLine || f.Related[0].Start.Column != stmtCol {
			t.Errorf("JSON related %+v, want %s:%d:%d", f.Related, loop, stmtLine, stmtCol)
		}
	}
	if !found {
		t.Fatalf("no bad-table finding in\n%s", out)
	}

	_, out, _ = circa(t, "", "check", "--no-estimates", "--format", "sarif", loop)
	inst, err := jsonschema.UnmarshalJSON(strings.NewReader(out))
	if err != nil {
		t.Fatal(err)
	}
	if err := sarifSchema(t).Validate(inst); err != nil {
		t.Errorf("SARIF output does not validate: %v", err)
	}
	type region struct{ StartLine, StartColumn, EndColumn int }
	type phys struct {
		ArtifactLocation struct{ URI string }
		Region           region
	}
	var log struct {
		Runs []struct {
			Results []struct {
				RuleID           string
				Locations        []struct{ PhysicalLocation phys }
				RelatedLocations []struct{ PhysicalLocation phys }
			}
		}
	}
	if err := json.Unmarshal([]byte(out), &log); err != nil {
		t.Fatal(err)
	}
	for _, r := range log.Runs[0].Results {
		if r.RuleID != "bad-table" {
			continue
		}
		p := r.Locations[0].PhysicalLocation
		if !strings.HasSuffix(p.ArtifactLocation.URI, "logs/drive.csv") || p.Region != (region{4, 5, 7}) {
			t.Errorf("SARIF location %+v, want logs/drive.csv 4:5–7", p)
		}
		if len(r.RelatedLocations) != 1 || !strings.HasSuffix(r.RelatedLocations[0].PhysicalLocation.ArtifactLocation.URI, "main.loop") ||
			r.RelatedLocations[0].PhysicalLocation.Region.StartLine != stmtLine {
			t.Errorf("SARIF related %+v", r.RelatedLocations)
		}
		return
	}
	t.Errorf("no bad-table result in the SARIF log")
}
