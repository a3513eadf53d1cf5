package main

import (
	"bytes"
	"errors"
	"flag"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strings"

	"circa/lang"
)

func init() {
	register(&command{name: "fmt", summary: "format .loop files in the canonical layout", run: runFmt})
}

const fmtUsage = `Usage: circa fmt [-w] [-d] [-l] [FILE|DIR|-]...

Formats .loop files in the one canonical layout. Directories are searched
recursively for *.loop files; with no arguments, or "-", the text is read
from standard input and the result written to standard output.

A file with syntax errors is left untouched; its errors are printed and the
exit status is 1. Usage and I/O errors give status 2.

Options:
`

// fmtOptions are the flags of circa fmt.
type fmtOptions struct {
	write, diff, list bool
}

func runFmt(args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	fl := flag.NewFlagSet("fmt", flag.ContinueOnError)
	fl.SetOutput(stderr)
	var o fmtOptions
	fl.BoolVar(&o.write, "w", false, "write the result back to the file (only when it changes)")
	fl.BoolVar(&o.diff, "d", false, "print a unified diff instead of the formatted text")
	fl.BoolVar(&o.list, "l", false, "list the files whose formatting differs")
	fl.Usage = func() {
		fmt.Fprint(stderr, fmtUsage)
		fl.PrintDefaults()
	}
	if err := fl.Parse(args); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			return exitOK
		}
		return exitUsage
	}
	paths := fl.Args()
	if len(paths) == 0 {
		paths = []string{"-"}
	}
	status := exitOK
	worse := func(s int) {
		if s == exitUsage || status == exitOK {
			status = s
		}
	}
	for _, p := range paths {
		if p == "-" {
			if o.write {
				fmt.Fprintln(stderr, "circa fmt: -w cannot write back to standard input")
				return exitUsage
			}
			src, err := io.ReadAll(stdin)
			if err != nil {
				fmt.Fprintf(stderr, "circa fmt: reading standard input: %v\n", err)
				worse(exitUsage)
				continue
			}
			worse(fmtOne("<standard input>", src, 0, o, stdout, stderr))
			continue
		}
		info, err := os.Stat(p)
		if err != nil {
			fmt.Fprintf(stderr, "circa fmt: %v\n", err)
			worse(exitUsage)
			continue
		}
		if !info.IsDir() {
			worse(fmtFile(p, o, stdout, stderr))
			continue
		}
		err = filepath.WalkDir(p, func(path string, d fs.DirEntry, err error) error {
			if err != nil {
				fmt.Fprintf(stderr, "circa fmt: %v\n", err)
				worse(exitUsage)
				return nil
			}
			if !d.IsDir() && strings.HasSuffix(d.Name(), ".loop") {
				worse(fmtFile(path, o, stdout, stderr))
			}
			return nil
		})
		if err != nil {
			fmt.Fprintf(stderr, "circa fmt: %v\n", err)
			worse(exitUsage)
		}
	}
	return status
}

func fmtFile(path string, o fmtOptions, stdout, stderr io.Writer) int {
	info, err := os.Stat(path)
	if err != nil {
		fmt.Fprintf(stderr, "circa fmt: %v\n", err)
		return exitUsage
	}
	if info.Size() > lang.MaxFileSize {
		fmt.Fprintf(stderr, "circa fmt: %s is larger than %d MiB\n", path, lang.MaxFileSize>>20)
		return exitUsage
	}
	src, err := os.ReadFile(path)
	if err != nil {
		fmt.Fprintf(stderr, "circa fmt: %v\n", err)
		return exitUsage
	}
	return fmtOne(path, src, info.Mode().Perm(), o, stdout, stderr)
}

// fmtOne formats one text and does what the options ask with the result.
// mode is the file's permission bits, 0 for standard input.
func fmtOne(name string, src []byte, mode os.FileMode, o fmtOptions, stdout, stderr io.Writer) int {
	f := lang.Parse(name, src)
	if len(f.Errors) > 0 {
		for _, d := range f.Errors {
			pos := f.Mapper.OffsetPosition(d.Loc.Span.Start, lang.UTF8)
			fmt.Fprintf(stderr, "%s:%d:%d: %s: %s [%s]\n", name, pos.Line+1, pos.Col+1, d.Severity, d.Message(), d.Rule)
		}
		return exitFindings
	}
	out, err := lang.Format(f)
	if err != nil {
		fmt.Fprintf(stderr, "circa fmt: %v\n", err)
		return exitFindings
	}
	changed := !bytes.Equal(src, out)
	if o.list && changed {
		fmt.Fprintln(stdout, name)
	}
	if o.diff && changed {
		io.WriteString(stdout, unifiedDiff(name, name, src, out))
	}
	if o.write && changed && mode != 0 {
		if err := writeKeepingMode(name, out, mode); err != nil {
			fmt.Fprintf(stderr, "circa fmt: %v\n", err)
			return exitUsage
		}
	}
	if !o.list && !o.diff && !o.write {
		stdout.Write(out)
	}
	return exitOK
}

// writeKeepingMode replaces a file's content through a temporary file in the
// same directory, so a failed write never leaves half a file, and keeps the
// file's permission bits.
func writeKeepingMode(path string, data []byte, mode os.FileMode) error {
	tmp, err := os.CreateTemp(filepath.Dir(path), "."+filepath.Base(path)+".fmt*")
	if err != nil {
		return err
	}
	name := tmp.Name()
	_, werr := tmp.Write(data)
	cerr := tmp.Close()
	if werr == nil {
		werr = cerr
	}
	if werr == nil {
		werr = os.Chmod(name, mode)
	}
	if werr == nil {
		werr = os.Rename(name, path)
	}
	if werr != nil {
		os.Remove(name)
		return fmt.Errorf("writing %s: %w", path, werr)
	}
	return nil
}

// maxDiffCells bounds the table of the longest-common-subsequence search;
// beyond it the changed middle is shown as one replacement.
const maxDiffCells = 16 << 20

// diffOp is one line of an edit script: ' ' kept, '-' removed, '+' added.
type diffOp struct {
	kind byte
	text string
}

// editScript returns the line edits that turn a into b: common prefix and
// suffix first, then a longest common subsequence of the middle.
func editScript(a, b []string) []diffOp {
	pre := 0
	for pre < len(a) && pre < len(b) && a[pre] == b[pre] {
		pre++
	}
	suf := 0
	for suf < len(a)-pre && suf < len(b)-pre && a[len(a)-1-suf] == b[len(b)-1-suf] {
		suf++
	}
	ops := make([]diffOp, 0, len(a)+len(b))
	for _, l := range a[:pre] {
		ops = append(ops, diffOp{' ', l})
	}
	am, bm := a[pre:len(a)-suf], b[pre:len(b)-suf]
	n, m := len(am), len(bm)
	if n*m > maxDiffCells {
		for _, l := range am {
			ops = append(ops, diffOp{'-', l})
		}
		for _, l := range bm {
			ops = append(ops, diffOp{'+', l})
		}
	} else {
		// lcs[i][j] is the LCS length of am[i:] and bm[j:].
		w := m + 1
		lcs := make([]int32, (n+1)*w)
		for i := n - 1; i >= 0; i-- {
			for j := m - 1; j >= 0; j-- {
				if am[i] == bm[j] {
					lcs[i*w+j] = lcs[(i+1)*w+j+1] + 1
				} else {
					lcs[i*w+j] = max(lcs[(i+1)*w+j], lcs[i*w+j+1])
				}
			}
		}
		i, j := 0, 0
		for i < n || j < m {
			switch {
			case i < n && j < m && am[i] == bm[j]:
				ops = append(ops, diffOp{' ', am[i]})
				i++
				j++
			case j == m || (i < n && lcs[(i+1)*w+j] >= lcs[i*w+j+1]):
				// Removals come before additions within a change.
				ops = append(ops, diffOp{'-', am[i]})
				i++
			default:
				ops = append(ops, diffOp{'+', bm[j]})
				j++
			}
		}
	}
	for _, l := range a[len(a)-suf:] {
		ops = append(ops, diffOp{' ', l})
	}
	return ops
}

// unifiedDiff returns a unified diff with three lines of context from a to
// b, or "" when they are equal.
func unifiedDiff(nameA, nameB string, a, b []byte) string {
	if bytes.Equal(a, b) {
		return ""
	}
	ops := editScript(lang.SplitLines(a), lang.SplitLines(b))
	const ctx = 3
	var out strings.Builder
	fmt.Fprintf(&out, "--- %s\n+++ %s\n", nameA, nameB)
	// Line numbers (zero-based) in a and b at the start of each op.
	ai := make([]int, len(ops)+1)
	bi := make([]int, len(ops)+1)
	for k, op := range ops {
		ai[k+1], bi[k+1] = ai[k], bi[k]
		if op.kind != '+' {
			ai[k+1]++
		}
		if op.kind != '-' {
			bi[k+1]++
		}
	}
	k := 0
	for k < len(ops) {
		for k < len(ops) && ops[k].kind == ' ' {
			k++
		}
		if k == len(ops) {
			break
		}
		start := max(k-ctx, 0)
		// Extend the hunk while the next change is within 2*ctx kept lines.
		end := k
		for {
			for end < len(ops) && ops[end].kind != ' ' {
				end++
			}
			next := end
			for next < len(ops) && ops[next].kind == ' ' {
				next++
			}
			if next < len(ops) && next-end <= 2*ctx {
				end = next
				continue
			}
			end = min(end+ctx, len(ops))
			break
		}
		la, lb := ai[end]-ai[start], bi[end]-bi[start]
		sa, sb := ai[start]+1, bi[start]+1
		if la == 0 {
			sa--
		}
		if lb == 0 {
			sb--
		}
		fmt.Fprintf(&out, "@@ -%d,%d +%d,%d @@\n", sa, la, sb, lb)
		for _, op := range ops[start:end] {
			out.WriteByte(op.kind)
			out.WriteString(op.text)
			if !strings.HasSuffix(op.text, "\n") {
				out.WriteString("\n\\ No newline at end of file\n")
			}
		}
		k = end
	}
	return out.String()
}
