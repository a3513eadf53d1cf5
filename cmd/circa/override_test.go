package main

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

const rackDoor = "../../testdata/examples/rack-door.loop"

// runCommand runs circa with args and no standard input.
func runCommand(t *testing.T, args ...string) (int, string, string) {
	t.Helper()
	var out, errb bytes.Buffer
	code := run(args, strings.NewReader(""), &out, &errb)
	return code, out.String(), errb.String()
}

// editedCopy writes the rack-door example with one line replaced into a
// temporary directory, with the parts it includes, and returns its path.
func editedCopy(t *testing.T, old, new string) string {
	t.Helper()
	src, err := os.ReadFile(rackDoor)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(src), old) {
		t.Fatalf("%s does not contain %q", rackDoor, old)
	}
	dir := t.TempDir()
	parts, err := os.ReadFile("../../testdata/examples/parts/tubes.loop")
	if err != nil {
		t.Fatal(err)
	}
	if err := os.MkdirAll(filepath.Join(dir, "parts"), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "parts", "tubes.loop"), parts, 0o644); err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(dir, "rack-door.loop")
	if err := os.WriteFile(path, []byte(strings.Replace(string(src), old, new, 1)), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// An estimate with a parameter set on the command line is the estimate of
// the file with that value written in it, and says it is a variant's.
func TestEstimateSet(t *testing.T) {
	edited := editedCopy(t, "param lift = 1.2 m", "param lift = 1.0 m")
	type result struct {
		Loops []struct {
			Cases []struct {
				Case     string  `json:"case"`
				MassFlow float64 `json:"mass_flow"`
			} `json:"cases"`
		} `json:"loops"`
		Set []struct {
			Param       string   `json:"param"`
			Dimension   string   `json:"dimension"`
			Value       float64  `json:"value"`
			Written     string   `json:"written"`
			FileValue   *float64 `json:"file_value"`
			FileWritten string   `json:"file_written"`
		} `json:"set"`
	}
	estimate := func(args ...string) result {
		t.Helper()
		code, out, errs := runEstimateCmd(t, append([]string{"--no-tilt", "--format", "json"}, args...)...)
		var res result
		if err := json.Unmarshal([]byte(out), &res); err != nil || code == exitUsage {
			t.Fatalf("%v: %d %v %s", args, code, err, errs)
		}
		return res
	}
	base, set, file := estimate(rackDoor), estimate(rackDoor, "--set", "lift=1.0 m"), estimate(edited)
	if len(base.Set) != 0 || len(file.Set) != 0 {
		t.Errorf("a run without --set lists %+v %+v", base.Set, file.Set)
	}
	if len(set.Set) != 1 || set.Set[0].Param != "lift" || set.Set[0].Dimension != "length" || set.Set[0].Value != 1.0 ||
		set.Set[0].Written != "1.0 m" || set.Set[0].FileValue == nil || *set.Set[0].FileValue != 1.2 || set.Set[0].FileWritten != "1.2 m" {
		t.Errorf("set %+v", set.Set)
	}
	if len(set.Loops) != 1 || len(set.Loops[0].Cases) == 0 || len(file.Loops) != 1 || len(file.Loops[0].Cases) != len(set.Loops[0].Cases) {
		t.Fatalf("loops %+v %+v", set.Loops, file.Loops)
	}
	for i, c := range set.Loops[0].Cases {
		if c.MassFlow != file.Loops[0].Cases[i].MassFlow {
			t.Errorf("case %s: mass flow %g with --set, %g with the value written", c.Case, c.MassFlow, file.Loops[0].Cases[i].MassFlow)
		}
		if c.MassFlow == base.Loops[0].Cases[i].MassFlow {
			t.Errorf("case %s: mass flow %g unchanged by a lower coil", c.Case, c.MassFlow)
		}
	}
	code, out, _ := runEstimateCmd(t, "--no-tilt", "--set", "lift=1.0 m", rackDoor)
	if code == exitUsage || !strings.Contains(out, "variant: lift = 1.0 m in place of the file's 1.2 m\n") {
		t.Errorf("text: %d %s", code, out)
	}
	code, out, _ = runEstimateCmd(t, "--no-tilt", "--format", "csv", "--set", "lift=1.0 m", rackDoor)
	if code == exitUsage || !strings.Contains(out, "\n# variant: lift = 1.0 m in place of the file's 1.2 m\n") {
		t.Errorf("csv: %d %s", code, out)
	}
}

func TestSetErrors(t *testing.T) {
	for _, tc := range []struct {
		cmd  string
		args []string
		want string
	}{
		{"estimate", []string{"--set", "lfit=1 m"}, "rack-door.loop: --set: lfit: no such parameter at the top level; did you mean lift?"},
		{"estimate", []string{"--set", "lift=1 kW"}, "--set: lift: expected a length, found a power (kW); the file gives 1.2 m at"},
		{"estimate", []string{"--set", "lift=1 m", "--set", "lift=2 m"}, "lift: given twice"},
		{"estimate", []string{"--set", "lift"}, `invalid value "lift" for flag -set: "lift": want NAME=VALUE`},
		{"estimate", []string{"--set", "lift=1 mx"}, "lift: column 3: unknown unit"},
		{"plot", []string{"--set", "zz=1 m"}, "--set: zz: no such parameter"},
		{"report", []string{"--set", "zz=1 m"}, "--set: zz: no such parameter"},
		{"check", []string{"--set", "zz=1 m"}, "--set: zz: no such parameter"},
	} {
		code, _, errs := runCommand(t, append(append([]string{tc.cmd}, tc.args...), rackDoor)...)
		if code != exitUsage || !strings.Contains(errs, tc.want) {
			t.Errorf("%s %v: %d %q, want status 2 and %q", tc.cmd, tc.args, code, errs, tc.want)
		}
	}
}

// check notes a parameter set for the run where the file writes it, in
// every format, and finds what the file with that value written finds.
func TestCheckSet(t *testing.T) {
	code, out, errs := runCommand(t, "check", "--no-estimates", rackDoor, "--set", "plate_height=0.3 m")
	if code != exitOK || !strings.Contains(out, "rack-door.loop:6:22: hint: plate_height is 0.3 m in this run in place of the file's 0.35 m [param-set]") {
		t.Errorf("text: %d %s %s", code, out, errs)
	}
	type report struct {
		Findings []struct {
			Rule     string `json:"rule"`
			Severity string `json:"severity"`
			Message  string `json:"message"`
		} `json:"findings"`
	}
	check := func(args ...string) (int, []string) {
		t.Helper()
		code, out, errs := runCommand(t, append([]string{"check", "--format", "json"}, args...)...)
		var rep report
		if err := json.Unmarshal([]byte(out), &rep); err != nil {
			t.Fatalf("%v: %v %s", args, err, errs)
		}
		var fs []string
		for _, f := range rep.Findings {
			fs = append(fs, f.Severity+" "+f.Rule+": "+f.Message)
		}
		return code, fs
	}
	edited := editedCopy(t, "param lift = 1.2 m", "param lift = 0.5 m")
	codeSet, set := check("--set", "lift=0.5 m", rackDoor)
	codeFile, file := check(edited)
	if len(set) == 0 || set[0] != "hint param-set: lift is 0.5 m in this run in place of the file's 1.2 m" {
		t.Fatalf("findings with --set: %q", set)
	}
	if codeSet != codeFile || strings.Join(set[1:], "\n") != strings.Join(file, "\n") {
		t.Errorf("with --set (status %d):\n%s\nwith the value written (status %d):\n%s", codeSet, strings.Join(set, "\n"), codeFile, strings.Join(file, "\n"))
	}
	// A hint never fails a check, whatever --fail-on says.
	code, _, errs = runCommand(t, "check", "--no-estimates", "--fail-on", "info", "--set", "lift=1.2 m", rackDoor)
	base, _, _ := runCommand(t, "check", "--no-estimates", "--fail-on", "info", rackDoor)
	if code != base {
		t.Errorf("status %d with a --set that changes nothing, %d without: %s", code, base, errs)
	}
}

func TestPlotAndReportSet(t *testing.T) {
	dir := t.TempDir()
	code, _, errs := runCommand(t, "plot", "--case", "hot_aisle", "--out", dir, "--set", "lift=1.0m", rackDoor)
	if code != exitOK {
		t.Fatalf("plot: %d %s", code, errs)
	}
	svg, err := os.ReadFile(filepath.Join(dir, "rack-circulation.svg"))
	if err != nil || !strings.Contains(string(svg), "(variant: lift=1.0m)") {
		t.Errorf("circulation figure: %v, no variant in its title", err)
	}
	code, out, errs := runCommand(t, "report", "--set", "lift=1.0m", rackDoor)
	if code == exitUsage || !strings.Contains(out, "variant: lift = 1.0m in place of the file&#39;s 1.2 m: this report is of a variant") {
		t.Errorf("report: %d %s", code, errs)
	}
}

func TestEstimateVary(t *testing.T) {
	code, out, errs := runEstimateCmd(t, rackDoor, "--vary", "lift=0.8m..1.2m:3")
	if code != exitOK || !strings.Contains(out, "sweep: lift from 0.8 m to 1.2 m, 3 values (the file's 1.2 m)\n") ||
		!strings.Contains(out, "caution:") || !strings.Contains(out, "\n  lift   charge") || !strings.Contains(out, "\n  1.2 m  ") {
		t.Errorf("text: %d %s %s", code, out, errs)
	}
	code, out, errs = runEstimateCmd(t, rackDoor, "--format", "json", "--vary", "lift=0.8m,1.2m", "--vary", "plate_height=0.3m,0.35m")
	var res struct {
		Cautions []string `json:"cautions"`
		Params   []struct {
			Param  string    `json:"param"`
			Values []float64 `json:"values"`
		} `json:"params"`
		Points []struct {
			Index []int `json:"index"`
			Loops []struct {
				Margins  []map[string]any `json:"margins"`
				Limiting map[string]any   `json:"limiting"`
			} `json:"loops"`
		} `json:"points"`
	}
	if err := json.Unmarshal([]byte(out), &res); err != nil || code != exitOK {
		t.Fatalf("json: %d %v %s", code, err, errs)
	}
	if len(res.Cautions) == 0 || len(res.Params) != 2 || len(res.Points) != 4 || len(res.Points[3].Loops) != 1 ||
		len(res.Points[3].Loops[0].Margins) == 0 || res.Points[3].Loops[0].Limiting == nil {
		t.Errorf("json: %+v", res)
	}
	code, out, _ = runEstimateCmd(t, rackDoor, "--format", "csv", "--vary", "lift=0.8m,1.2m")
	if code != exitOK || !strings.Contains(out, "\nlift_SI,loop,margin,case,component,value,limit,unit,use,status,note\n") || !strings.Contains(out, "\n1.2,rack,charge,") {
		t.Errorf("csv: %d %s", code, out)
	}
	for _, tc := range []struct {
		args []string
		want string
	}{
		{[]string{"--vary", "lift=0.8m..1.2m"}, `"lift=0.8m..1.2m", column 16: a range needs its number of values`},
		{[]string{"--vary", "lfit=1m,2m"}, "--vary: lfit: no such parameter at the top level; did you mean lift?"},
		{[]string{"--vary", "lift=1m,2m", "--vary", "lift=1m,3m"}, "--vary: lift is varied twice"},
		{[]string{"--vary", "lift=1m,2m", "--vary", "plate_height=1m,2m", "--vary", "plate_height=1m,2m"}, "at most two parameters"},
		{[]string{"--vary", "lift=1m,2m", "--sweep-pitch", "10"}, "--vary cannot be combined with --sweep-pitch"},
	} {
		code, _, errs := runEstimateCmd(t, append([]string{rackDoor}, tc.args...)...)
		if code != exitUsage || !strings.Contains(errs, tc.want) {
			t.Errorf("%v: %d %q, want status 2 and %q", tc.args, code, errs, tc.want)
		}
	}
}

func TestPlotAndReportVary(t *testing.T) {
	dir := t.TempDir()
	code, out, errs := runCommand(t, "plot", "--out", dir, "--vary", "lift=0.8m..1.2m:3", rackDoor)
	if code != exitOK || !strings.Contains(out, "rack-vary-lift.svg") {
		t.Fatalf("plot: %d %s %s", code, out, errs)
	}
	svg, err := os.ReadFile(filepath.Join(dir, "rack-vary-lift.svg"))
	if err != nil || !strings.Contains(string(svg), "Margins of loop rack against lift") {
		t.Errorf("sweep figure: %v", err)
	}
	code, out, errs = runCommand(t, "report", "--vary", "lift=0.8m..1.2m:3", rackDoor)
	if code == exitUsage || !strings.Contains(out, "<h3>Parameter sweep</h3>") || !strings.Contains(out, "Margins of loop rack against lift") ||
		!strings.Contains(out, "<th>lift</th>") {
		t.Errorf("report: %d %s", code, errs)
	}
}

// A sweep of a variant varies the variant: --set holds at every point.
func TestVaryWithSet(t *testing.T) {
	chargeUse := func(out string, sweep bool) float64 {
		t.Helper()
		var est struct {
			Loops []struct {
				Worst []struct {
					Margin string  `json:"margin"`
					Use    float64 `json:"use"`
				} `json:"worst"`
			} `json:"loops"`
			Points []struct {
				Loops []struct {
					Margins []struct {
						Margin string  `json:"margin"`
						Use    float64 `json:"use"`
					} `json:"margins"`
				} `json:"loops"`
			} `json:"points"`
		}
		if err := json.Unmarshal([]byte(out), &est); err != nil {
			t.Fatal(err)
		}
		if sweep {
			for _, m := range est.Points[0].Loops[0].Margins {
				if m.Margin == "charge" {
					return m.Use
				}
			}
		} else {
			for _, m := range est.Loops[0].Worst {
				if m.Margin == "charge" {
					return m.Use
				}
			}
		}
		t.Fatal("no charge margin")
		return 0
	}
	_, plain, _ := runEstimateCmd(t, rackDoor, "--no-tilt", "--no-guidance", "--format", "json", "--set", "lift=1.0m")
	_, swept, errs := runEstimateCmd(t, rackDoor, "--format", "json", "--set", "lift=1.0m", "--vary", "plate_height=0.35m,0.4m")
	_, file, _ := runEstimateCmd(t, rackDoor, "--format", "json", "--vary", "plate_height=0.35m,0.4m")
	if a, b, c := chargeUse(plain, false), chargeUse(swept, true), chargeUse(file, true); a != b || b == c {
		t.Errorf("charge use %g with --set alone, %g swept with --set, %g swept without: %s", a, b, c, errs)
	}
	if !strings.Contains(swept, `"set": [`) || !strings.Contains(swept, `"file_written": "0.35 m"`) {
		t.Errorf("the sweep of a variant lists neither the parameter set nor the swept one's file value:\n%s", swept)
	}
	code, out, _ := runEstimateCmd(t, rackDoor, "--set", "lift=1.0m", "--vary", "plate_height=0.35m,0.4m")
	if code != exitOK || !strings.Contains(out, "variant: lift = 1.0m in place of the file's 1.2 m\nsweep: plate_height from 0.35 m to 0.4 m, 2 values (the file's 0.35 m)\n") {
		t.Errorf("text: %d %s", code, out)
	}
}

// Control bytes in --set and --vary come back escaped, as in source
// excerpts: an ESC echoed raw would let a command line clear the terminal.
func TestSetEchoesEscaped(t *testing.T) {
	for _, args := range [][]string{
		{"check", "--set", "a\x1b[2J=1", rackDoor},
		{"check", "--set", "nope=1\x1bmm", rackDoor},
		{"estimate", "--set", "lift=1\x07m", rackDoor},
		{"estimate", "--vary", "li\x1bft=1..2:3", rackDoor},
	} {
		code, out, errs := runCommand(t, args...)
		if code == 0 {
			t.Errorf("%q: exit 0", args)
		}
		for _, b := range []byte{0x1b, 0x07} {
			if strings.IndexByte(out+errs, b) >= 0 {
				t.Errorf("%q: raw control byte %#x in the output:\n%s%s", args, b, out, errs)
			}
		}
		if !strings.Contains(errs, `\x1b`) && !strings.Contains(errs, `\a`) {
			t.Errorf("%q: no escaped control byte in the message:\n%s", args, errs)
		}
	}
}
