package main

import (
	"bufio"
	"bytes"
	"fmt"
	"io"
	"strings"
	"unsafe"

	"circa/lang"
)

// The unified diff of circa fmt -d, from lang's line edit script. Its
// memory is linear in the texts: the lines are slices of one copy of each
// text.

// splitLines cuts s after each newline; the lines share s's memory.
func splitLines(s string) []string {
	out := make([]string, 0, strings.Count(s, "\n")+1)
	for len(s) > 0 {
		i := strings.IndexByte(s, '\n')
		if i < 0 {
			out = append(out, s)
			break
		}
		out = append(out, s[:i+1])
		s = s[i+1:]
	}
	return out
}

// viewString returns b as a string sharing its memory; b must not change
// while the string is in use.
func viewString(b []byte) string { return unsafe.String(unsafe.SliceData(b), len(b)) }

// writeUnifiedDiff writes a unified diff with three lines of context from a
// to b, nothing when they are equal.
func writeUnifiedDiff(w io.Writer, nameA, nameB string, a, b []byte) error {
	if bytes.Equal(a, b) {
		return nil
	}
	// The lines are read, never kept past the call, and a and b do not
	// change during it: they are viewed as strings without a copy.
	ops := lang.LineEdits(splitLines(viewString(a)), splitLines(viewString(b)))
	const ctx = 3
	out := bufio.NewWriter(w)
	fmt.Fprintf(out, "--- %s\n+++ %s\n", nameA, nameB)
	// Line numbers (zero-based) in a and b at the start of op k, counted as
	// the hunks advance.
	ak, bk, k := 0, 0, 0
	advance := func(to int) {
		for ; k < to; k++ {
			if ops[k].Kind != '+' {
				ak++
			}
			if ops[k].Kind != '-' {
				bk++
			}
		}
	}
	for k < len(ops) {
		next := k
		for next < len(ops) && ops[next].Kind == ' ' {
			next++
		}
		if next == len(ops) {
			break
		}
		start := max(next-ctx, k)
		advance(start)
		sa0, sb0 := ak, bk
		// Extend the hunk while the next change is within 2*ctx kept lines.
		end := next
		for {
			for end < len(ops) && ops[end].Kind != ' ' {
				end++
			}
			n := end
			for n < len(ops) && ops[n].Kind == ' ' {
				n++
			}
			if n < len(ops) && n-end <= 2*ctx {
				end = n
				continue
			}
			end = min(end+ctx, len(ops))
			break
		}
		la, lb := 0, 0
		for _, op := range ops[start:end] {
			if op.Kind != '+' {
				la++
			}
			if op.Kind != '-' {
				lb++
			}
		}
		sa, sb := sa0+1, sb0+1
		if la == 0 {
			sa--
		}
		if lb == 0 {
			sb--
		}
		fmt.Fprintf(out, "@@ -%d,%d +%d,%d @@\n", sa, la, sb, lb)
		for _, op := range ops[start:end] {
			out.WriteByte(op.Kind)
			out.WriteString(op.Text)
			if !strings.HasSuffix(op.Text, "\n") {
				out.WriteString("\n\\ No newline at end of file\n")
			}
		}
		advance(end)
	}
	return out.Flush()
}

// unifiedDiff is writeUnifiedDiff into a string.
func unifiedDiff(nameA, nameB string, a, b []byte) string {
	var sb strings.Builder
	writeUnifiedDiff(&sb, nameA, nameB, a, b)
	return sb.String()
}
