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
