//go:build !unix

package textfile

import "os"

// openNonBlocking opens path for reading; the caller has checked that it is
// a regular file.
func openNonBlocking(path string) (*os.File, error) { return os.Open(path) }
