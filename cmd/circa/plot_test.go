package main

import (
	"bytes"
	"encoding/xml"
	"image/png"
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func runPlotCmd(t *testing.T, args ...string) (int, string, string) {
	t.Helper()
	var out, errb bytes.Buffer
	code := run(append([]string{"plot"}, args...), strings.NewReader(""), &out, &errb)
	return code, out.String(), errb.String()
}

func TestPlotWritesFigures(t *testing.T) {
	dir := t.TempDir()
	code, out, errs := runPlotCmd(t, "../../testdata/plot/rack.loop", "--out", dir, "--format", "svg,png", "--case", "overload")
	if code != exitOK {
		t.Fatalf("plot = %d: %s", code, errs)
	}
	paths := strings.Fields(out)
	if len(paths) != 8 {
		t.Fatalf("wrote %v, want 4 figures in 2 formats", paths)
	}
	for _, kind := range []string{"circulation", "budget", "tilt", "geometry"} {
		svg, err := os.ReadFile(filepath.Join(dir, "rack-"+kind+".svg"))
		if err != nil {
			t.Fatal(err)
		}
		d := xml.NewDecoder(bytes.NewReader(svg))
		for {
			_, err := d.Token()
			if err == io.EOF {
				break
			}
			if err != nil {
				t.Fatalf("%s.svg: %v", kind, err)
			}
		}
		f, err := os.Open(filepath.Join(dir, "rack-"+kind+".png"))
		if err != nil {
			t.Fatal(err)
		}
		if _, err := png.Decode(f); err != nil {
			t.Errorf("%s.png: %v", kind, err)
		}
		f.Close()
	}
	budget, _ := os.ReadFile(filepath.Join(dir, "rack-budget.svg"))
	if !bytes.Contains(budget, []byte("case overload")) {
		t.Error("the budget is not of the case asked for")
	}
}

func TestPlotUsage(t *testing.T) {
	const file = "../../testdata/plot/rack.loop"
	for _, args := range [][]string{{}, {file, "--format", "gif"}, {file, "--case", "nope"}, {file, file}} {
		if code, _, _ := runPlotCmd(t, append(args, "--out", t.TempDir())...); code != exitUsage {
			t.Errorf("plot %v = %d, want %d", args, code, exitUsage)
		}
	}
	bad := filepath.Join(t.TempDir(), "bad.loop")
	os.WriteFile(bad, []byte("loop l {\n  fluid water\n  pipe p from a to b { length 1 s }\n}\n"), 0o644)
	if code, _, errs := runPlotCmd(t, bad, "--out", t.TempDir()); code != exitFindings || !strings.Contains(errs, "bad.loop:") {
		t.Errorf("file with errors: %d %q", code, errs)
	}
	if code, _, _ := runPlotCmd(t, "--help"); code != exitOK {
		t.Errorf("--help = %d", code)
	}
}

// A file with errors, or a loop that circulates in no case drawn, gives a
// non-zero status and no empty figure: only the geometry of the loop that
// does not circulate (its condenser below its evaporator) is drawn.
func TestPlotDrawsNoEmptyFigure(t *testing.T) {
	dir := t.TempDir()
	bad := filepath.Join(dir, "bad.loop")
	os.WriteFile(bad, []byte("loop l {\n  pipe p from a to b\n}\n"), 0o644)
	out := filepath.Join(dir, "out")
	if code, stdout, _ := runPlotCmd(t, bad, "--out", out); code != exitFindings || stdout != "" {
		t.Errorf("file with errors: %d %q", code, stdout)
	}
	if ents, _ := os.ReadDir(out); len(ents) != 0 {
		t.Errorf("figures written for a file with errors: %v", ents)
	}

	src, err := os.ReadFile("../../testdata/flow/hand.loop")
	if err != nil {
		t.Fatal(err)
	}
	down := strings.NewReplacer("node c at (0.1, 0, 1) m", "node c at (0.1, 0, -1) m", "node d at (0, 0, 1) m", "node d at (0, 0, -1) m").Replace(string(src))
	table, err := os.ReadFile("../../testdata/flow/constant.csv")
	if err != nil {
		t.Fatal(err)
	}
	os.WriteFile(filepath.Join(dir, "constant.csv"), table, 0o644)
	p := filepath.Join(dir, "down.loop")
	if err := os.WriteFile(p, []byte(down), 0o644); err != nil {
		t.Fatal(err)
	}
	code, stdout, errs := runPlotCmd(t, p, "--out", filepath.Join(dir, "figs"))
	if code != exitFindings {
		t.Errorf("loop that does not circulate: status %d", code)
	}
	if got := strings.Fields(stdout); len(got) != 1 || !strings.HasSuffix(got[0], "hand-geometry.svg") {
		t.Errorf("figures %v, want the geometry only\n%s", got, errs)
	}
	if !strings.Contains(errs, "no pressure budget to draw") {
		t.Errorf("stderr %q", errs)
	}
}
