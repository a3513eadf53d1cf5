//go:build !linux

package main

import (
	"io"
	"io/fs"
	"os"
)

// isTerminal reports whether r is a terminal, where reading would wait for
// the user to type a file: a command given no path then prints its usage.
// Any character device but the null device counts, as a terminal is one.
func isTerminal(r io.Reader) bool {
	f, ok := r.(*os.File)
	if !ok {
		return false
	}
	st, err := f.Stat()
	if err != nil || st.Mode()&fs.ModeCharDevice == 0 {
		return false
	}
	null, err := os.Stat(os.DevNull)
	return err != nil || !os.SameFile(st, null)
}
