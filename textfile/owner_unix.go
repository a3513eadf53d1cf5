//go:build unix

package textfile

import (
	"io/fs"
	"os"
	"syscall"
)

// links is the number of hard links of the file st describes.
func links(st fs.FileInfo) uint64 {
	if s, ok := st.Sys().(*syscall.Stat_t); ok {
		return uint64(s.Nlink)
	}
	return 1
}

// keepOwner gives f the owner and group of the file st describes, or fails
// when the system does not allow it (only the superuser may give a file
// away).
func keepOwner(f *os.File, st fs.FileInfo) error {
	s, ok := st.Sys().(*syscall.Stat_t)
	if !ok {
		return nil
	}
	mine, err := f.Stat()
	if err != nil {
		return err
	}
	if m, ok := mine.Sys().(*syscall.Stat_t); ok && m.Uid == s.Uid && m.Gid == s.Gid {
		return nil
	}
	return f.Chown(int(s.Uid), int(s.Gid))
}

// writable asks the system whether the caller may write path.
func writable(path string) error {
	return syscall.Access(path, 2) // W_OK
}
