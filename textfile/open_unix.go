//go:build unix

package textfile

import (
	"os"
	"syscall"
)

// openNonBlocking opens path for reading without waiting for a writer, as
// opening a FIFO would.
func openNonBlocking(path string) (*os.File, error) {
	return os.OpenFile(path, os.O_RDONLY|syscall.O_NONBLOCK, 0)
}
