// Package textfile reads and writes the text files a user names (.loop
// sources, included files, fluid tables) the way a careful tool does: it
// reads only regular files, never more than MaxSize bytes, never blocking
// on a device, a FIFO or a terminal, and it replaces a file's content
// without damaging the file (see Write).
package textfile

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
)

// MaxSize bounds every file read: a wrong include or table path must not
// make the checker or the server swallow a disk image. No real .loop file
// or fluid table comes near it.
const MaxSize = 16 << 20

// Error says why a path was refused. Its message names no path: callers
// place it after the path or under the include that named it.
type Error struct {
	Path   string
	Reason string
	kind   error // ErrTooLarge or ErrNotRegular
}

func (e *Error) Error() string { return e.Reason }

// Unwrap lets errors.Is tell the two kinds of refusal apart.
func (e *Error) Unwrap() error { return e.kind }

// The kinds of refusal.
var (
	ErrTooLarge   = errors.New("file too large")
	ErrNotRegular = errors.New("not a regular file")
)

// Read returns the content of the regular file at path. Anything else — a
// directory, a device such as /dev/zero, a FIFO, a socket, a terminal — is
// refused with an *Error before anything is read, and so is a file larger
// than MaxSize. Other failures are the *fs.PathError of the system call.
func Read(path string) ([]byte, error) {
	st, err := os.Stat(path)
	if err != nil {
		return nil, err
	}
	if err := regular(path, st); err != nil {
		return nil, err
	}
	// The type is checked again on the open file: the path may have been
	// replaced in between. Opening does not block even on a FIFO.
	f, err := openNonBlocking(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	st, err = f.Stat()
	if err != nil {
		return nil, err
	}
	if err := regular(path, st); err != nil {
		return nil, err
	}
	return readCapped(path, f, st.Size())
}

// ReadAll reads r (standard input, say) with the same size cap as Read.
func ReadAll(name string, r io.Reader) ([]byte, error) {
	return readCapped(name, r, 0)
}

func readCapped(path string, r io.Reader, size int64) ([]byte, error) {
	if size > MaxSize {
		return nil, refuseSize(path)
	}
	// The size is a hint: the file may grow while it is read.
	buf := make([]byte, 0, size+1)
	lr := io.LimitReader(r, MaxSize+1)
	for {
		if len(buf) == cap(buf) {
			buf = append(buf, 0)[:len(buf)]
		}
		n, err := lr.Read(buf[len(buf):cap(buf)])
		buf = buf[:len(buf)+n]
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, err
		}
	}
	if len(buf) > MaxSize {
		return nil, refuseSize(path)
	}
	return buf, nil
}

func refuseSize(path string) error {
	return &Error{Path: path, Reason: fmt.Sprintf("it is larger than %d MiB, the most a file may hold", MaxSize>>20), kind: ErrTooLarge}
}

// regular refuses anything but a regular file, saying what it is instead.
func regular(path string, st fs.FileInfo) error {
	m := st.Mode()
	if m.IsRegular() {
		return nil
	}
	what := "not a regular file"
	switch {
	case m.IsDir():
		what = "a directory"
	case m&fs.ModeNamedPipe != 0:
		what = "a named pipe (FIFO)"
	case m&fs.ModeSocket != 0:
		what = "a socket"
	case m&fs.ModeCharDevice != 0:
		what = "a character device"
	case m&fs.ModeDevice != 0:
		what = "a block device"
	case m&fs.ModeIrregular != 0:
		what = "of an unknown type"
	}
	return &Error{Path: path, Reason: "it is " + what + ", not a regular file", kind: ErrNotRegular}
}

// bom is the UTF-8 encoding of U+FEFF, which some editors write at the
// start of a file to mark it as UTF-8.
const bom = "\xef\xbb\xbf"

// CutBOM returns text without a leading byte-order mark, and whether it had
// one. Text read from disk is cut so that line 1, column 1 is the first
// character an editor shows.
func CutBOM(text []byte) ([]byte, bool) {
	if len(text) >= 3 && string(text[:3]) == bom {
		return text[3:], true
	}
	return text, false
}
