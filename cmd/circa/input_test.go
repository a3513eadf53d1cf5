package main

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"

	"github.com/santhosh-tekuri/jsonschema/v6"
)

// Every command that reads a file refuses a missing one with the same
// status and the same plain message naming the path.
func TestMissingPathSameInEveryCommand(t *testing.T) {
	missing := filepath.Join(t.TempDir(), "nowhere.loop")
	want := "cannot read " + missing + ": no such file or directory\n"
	for _, args := range [][]string{
		{"check", missing},
		{"check", "--format", "json", missing},
		{"fmt", missing},
		{"fmt", "-w", missing},
		{"estimate", missing},
		{"plot", "--out", t.TempDir(), missing},
		{"fluid", "--table", missing, "--at", "20 degC"},
	} {
		code, _, errs := circa(t, "", args...)
		if code != exitUsage {
			t.Errorf("%v: status %d, want %d", args, code, exitUsage)
		}
		if !strings.HasSuffix(errs, "circa "+args[0]+": "+want) && !strings.Contains(errs, "circa "+args[0]+": "+want) {
			t.Errorf("%v: stderr %q, want %q", args, errs, want)
		}
	}
}

// A device, a FIFO or a directory named where a file is expected is
// refused at once, without reading from it: /dev/zero would never end and
// a FIFO would wait for a writer.
func TestDevicesAndFIFOsRefused(t *testing.T) {
	dir := t.TempDir()
	fifo := filepath.Join(dir, "pipe.loop")
	if err := syscall.Mkfifo(fifo, 0o644); err != nil {
		t.Skip("no FIFOs here:", err)
	}
	for _, c := range []struct {
		path, what string
	}{
		{"/dev/zero", "character device"},
		{fifo, "named pipe"},
	} {
		for _, args := range [][]string{
			{"check", c.path},
			{"fmt", c.path},
			{"estimate", c.path},
			{"fluid", "--table", c.path, "--at", "20 degC"},
		} {
			code, _, errs := circa(t, "", args...)
			if code != exitUsage || !strings.Contains(errs, "cannot read "+c.path+": it is a "+c.what) {
				t.Errorf("%v: %d %q", args, code, errs)
			}
		}
	}
	// Includes: a located finding under the include.
	root := filepath.Join(dir, "root.loop")
	src := "include \"/dev/zero\"\ninclude \"pipe.loop\"\ninclude \"/dev/stdin\"\n"
	if err := os.WriteFile(root, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	code, out, _ := circa(t, "", "check", "--no-estimates", root)
	if code != exitFindings {
		t.Fatalf("status %d\n%s", code, out)
	}
	for _, want := range []string{
		root + ":1:9: error: cannot read included file /dev/zero: it is a character device, not a regular file [include-unreadable]",
		root + ":2:9: error: cannot read included file pipe.loop: it is a named pipe (FIFO), not a regular file [include-unreadable]",
		root + ":3:9: error: cannot read included file /dev/stdin:",
	} {
		if !strings.Contains(out, want) {
			t.Errorf("output lacks %q:\n%s", want, out)
		}
	}
}

func TestFluidTableInLoopRefusesDevice(t *testing.T) {
	dir := t.TempDir()
	root := filepath.Join(dir, "root.loop")
	src := strings.Replace(good, "fluid water", "fluid table \"/dev/zero\"", 1)
	if err := os.WriteFile(root, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	_, out, _ := circa(t, "", "check", root)
	if !strings.Contains(out, "cannot read /dev/zero: it is a character device, not a regular file") {
		t.Errorf("output:\n%s", out)
	}
}

func TestTooLargeRefused(t *testing.T) {
	p := filepath.Join(t.TempDir(), "big.loop")
	f, err := os.Create(p)
	if err != nil {
		t.Fatal(err)
	}
	f.Truncate(16<<20 + 1) // sparse
	f.Close()
	for _, cmd := range []string{"check", "fmt"} {
		code, _, errs := circa(t, "", cmd, p)
		if code != exitUsage || !strings.Contains(errs, "cannot read "+p+": it is larger than 16 MiB") {
			t.Errorf("%s: %d %q", cmd, code, errs)
		}
	}
	code, _, errs := circa(t, strings.Repeat("#", 16<<20+1), "check", "-")
	if code != exitUsage || !strings.Contains(errs, "cannot read standard input: it is larger than 16 MiB") {
		t.Errorf("stdin: %d %q", code, errs)
	}
}

// openTerminal opens a pseudo-terminal's master side, a terminal that
// needs no user.
func openTerminal(t *testing.T) *os.File {
	f, err := os.OpenFile("/dev/ptmx", os.O_RDWR, 0)
	if err != nil {
		t.Skip("no pseudo-terminals here:", err)
	}
	t.Cleanup(func() { f.Close() })
	if !isTerminal(f) {
		t.Skip("the pseudo-terminal is not seen as a terminal on this system")
	}
	return f
}

// With no path and a terminal as standard input, check and fmt print their
// usage instead of waiting for text nobody is typing; piped text and "-"
// still work.
func TestNoPathOnTerminalPrintsUsage(t *testing.T) {
	tty := openTerminal(t)
	for _, cmd := range []string{"check", "fmt"} {
		var out, errb bytes.Buffer
		code := run([]string{cmd}, tty, &out, &errb)
		if code != exitUsage || !strings.Contains(errb.String(), "Usage: circa "+cmd) {
			t.Errorf("%s on a terminal: %d %q %q", cmd, code, out.String(), errb.String())
		}
	}
	if isTerminal(strings.NewReader("")) {
		t.Error("a reader is not a terminal")
	}
	null, err := os.Open(os.DevNull)
	if err != nil {
		t.Fatal(err)
	}
	defer null.Close()
	if isTerminal(null) {
		t.Error("the null device is not a terminal")
	}
	code, out, _ := circa(t, good, "check", "--no-estimates")
	if code != exitOK || !strings.Contains(out, "1 file checked") {
		t.Errorf("piped check: %d %q", code, out)
	}
	code, out, _ = circa(t, good, "check", "--no-estimates", "-")
	if code != exitOK || !strings.Contains(out, "1 file checked") {
		t.Errorf("check -: %d %q", code, out)
	}
}

// --help is asked-for output: standard output, status 0, for every
// command.
func TestHelpOnStdout(t *testing.T) {
	cases := [][]string{{"--help"}, {"-h"}, {"help"}}
	for name := range commands {
		cases = append(cases, []string{name, "--help"}, []string{name, "-h"}, []string{"help", name})
	}
	for _, args := range cases {
		code, out, errs := circa(t, "", args...)
		if code != exitOK || errs != "" || !strings.Contains(out, "Usage") {
			t.Errorf("%v: %d, stdout %q, stderr %q", args, code, out, errs)
		}
	}
	// Without a command the usage is a complaint.
	if code, out, errs := circa(t, ""); code != exitUsage || out != "" || !strings.Contains(errs, "Usage") {
		t.Errorf("no command: %d %q %q", code, out, errs)
	}
}

// A file that starts with a byte-order mark is checked, its positions
// counted from the first character an editor shows; fmt removes the mark.
func TestByteOrderMarkFile(t *testing.T) {
	p := filepath.Join(t.TempDir(), "bom.loop")
	src := "\ufeffparam a = x\n"
	if err := os.WriteFile(p, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	_, out, _ := circa(t, "", "check", "--no-estimates", p)
	if !strings.Contains(out, p+":1:11: error: unknown parameter \"x\"") || strings.Contains(out, "unexpected character") {
		t.Errorf("check:\n%s", out)
	}
	tidy := filepath.Join(t.TempDir(), "tidy.loop")
	os.WriteFile(tidy, []byte("\ufeffparam a = 2 m\n"), 0o644)
	if code, out, _ := circa(t, "", "fmt", "-l", tidy); code != exitOK || out != tidy+"\n" {
		t.Errorf("fmt -l with only a mark to remove: %d %q", code, out)
	}
	if code, _, errs := circa(t, "", "fmt", "-w", tidy); code != exitOK {
		t.Fatalf("fmt -w: %d %s", code, errs)
	}
	if b, _ := os.ReadFile(tidy); string(b) != "param a = 2 m\n" {
		t.Errorf("after fmt -w: %q", b)
	}
}

// With --format json, sarif or github a path that cannot be read is in the
// output too, not only in the exit status; the SARIF log still validates.
func TestReadErrorsInMachineOutputs(t *testing.T) {
	missing := filepath.Join(t.TempDir(), "nowhere.loop")
	msg := "cannot read " + missing + ": no such file or directory"

	code, out, _ := circa(t, "", "check", "--no-estimates", "--format", "json", missing)
	var rep struct {
		Errors []struct{ File, Message string }
	}
	if err := json.Unmarshal([]byte(out), &rep); err != nil {
		t.Fatalf("json: %v\n%s", err, out)
	}
	if code != exitUsage || len(rep.Errors) != 1 || rep.Errors[0].File != missing || rep.Errors[0].Message != msg {
		t.Errorf("json: %d %+v", code, rep.Errors)
	}

	code, out, _ = circa(t, good, "check", "--no-estimates", "--format", "sarif", "-", missing)
	var log struct {
		Runs []struct {
			Invocations []struct {
				ExecutionSuccessful        bool
				ToolExecutionNotifications []struct {
					Level   string
					Message struct{ Text string }
				}
			}
		}
	}
	if err := json.Unmarshal([]byte(out), &log); err != nil {
		t.Fatalf("sarif: %v", err)
	}
	inv := log.Runs[0].Invocations
	if code != exitUsage || len(inv) != 1 || inv[0].ExecutionSuccessful || len(inv[0].ToolExecutionNotifications) != 1 ||
		inv[0].ToolExecutionNotifications[0].Message.Text != msg || inv[0].ToolExecutionNotifications[0].Level != "error" {
		t.Errorf("sarif: %d %+v", code, inv)
	}
	sch := sarifSchema(t)
	inst, err := jsonschema.UnmarshalJSON(strings.NewReader(out))
	if err != nil {
		t.Fatal(err)
	}
	if err := sch.Validate(inst); err != nil {
		t.Errorf("SARIF with a notification does not validate: %v", err)
	}
	// A clean run says it succeeded.
	_, out, _ = circa(t, good, "check", "--no-estimates", "--format", "sarif")
	if !strings.Contains(out, `"executionSuccessful": true`) {
		t.Errorf("clean run:\n%s", out)
	}

	_, out, _ = circa(t, "", "check", "--format", "github", missing)
	if !strings.HasPrefix(out, "::error file="+missing+",title=file-unreadable::"+msg) {
		t.Errorf("github: %q", out)
	}
}

func sarifSchema(t *testing.T) *jsonschema.Schema {
	f, err := os.Open("../../testdata/sarif-2.1.0.json")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	doc, err := jsonschema.UnmarshalJSON(f)
	if err != nil {
		t.Fatal(err)
	}
	c := jsonschema.NewCompiler()
	c.AssertFormat()
	if err := c.AddResource("sarif-2.1.0.json", doc); err != nil {
		t.Fatal(err)
	}
	sch, err := c.Compile("sarif-2.1.0.json")
	if err != nil {
		t.Fatal(err)
	}
	return sch
}

// A fluid table saved with "\r\n" line ends reads as with "\n", and every
// bad cell of it is reported with its line and column, by `circa fluid
// --table` and by a loop file's `fluid table`.
func TestFluidTableEveryError(t *testing.T) {
	demo, err := os.ReadFile("../../testdata/fluids/demo-coolant.csv")
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	crlf := filepath.Join(dir, "crlf.csv")
	if err := os.WriteFile(crlf, bytes.ReplaceAll(demo, []byte("\n"), []byte("\r\n")), 0o644); err != nil {
		t.Fatal(err)
	}
	if code, out, errs := circa(t, "", "fluid", "--table", crlf, "--at", "20 degC"); code != exitOK || !strings.Contains(out, "demo coolant, saturated at 20 °C") {
		t.Errorf("CRLF table: status %d\n%s%s", code, out, errs)
	}
	text := strings.Replace(string(demo), "998.161,", "998.1x,", 1) // line 11, column 3
	text = strings.Replace(text, "0.79722,", "-0.79722,", 1)        // line 12, column 8
	bad := filepath.Join(dir, "bad.csv")
	if err := os.WriteFile(bad, []byte(strings.ReplaceAll(text, "\n", "\r")), 0o644); err != nil {
		t.Fatal(err)
	}
	want := []string{
		bad + `: line 11, column 3 (rho_l): not a number "998.1x"`,
		bad + ": line 12, column 8 (mu_l): mu_l must be positive, got -0.79722",
	}
	_, _, errs := circa(t, "", "fluid", "--table", bad, "--at", "20 degC")
	for _, w := range want {
		if !strings.Contains(errs, "circa fluid: "+w+"\n") {
			t.Errorf("circa fluid: stderr lacks %q:\n%s", w, errs)
		}
	}
	root := filepath.Join(dir, "root.loop")
	if err := os.WriteFile(root, []byte(strings.Replace(good, "fluid water", "fluid table \"bad.csv\"", 1)), 0o644); err != nil {
		t.Fatal(err)
	}
	_, out, _ := circa(t, "", "check", root)
	for _, w := range want {
		if !strings.Contains(out, w) {
			t.Errorf("circa check: output lacks %q:\n%s", w, out)
		}
	}
}
