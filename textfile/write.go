package textfile

import (
	"errors"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"time"
)

// tempMark is in the name of every temporary file Write makes, beside its
// target: ".NAME.circa-tmp-RANDOM". A temporary file left by a process that
// was killed outright (SIGKILL cannot be caught) is recognisable by it and
// removed by the next Write to the same target once it is StaleAfter old.
const tempMark = ".circa-tmp-"

// StaleAfter is the age after which a leftover temporary file of a target
// is taken to belong to a process that died, not to one still writing.
const StaleAfter = time.Minute

// Write replaces the content of the file at path with data without
// damaging the file:
//   - a symbolic link is followed and its target rewritten; the link stays;
//   - a file without write permission is refused with an *Error (even for
//     the superuser, who could write it: the user made it read-only);
//   - the file's mode and, where the system allows, owner and group are
//     kept;
//   - a file with several hard links is rewritten in place, so every name
//     still sees the same file (a crash in the middle of that one write can
//     leave it partly written; the text is small and written in one call);
//     so is a file whose owner cannot be kept or whose directory is not
//     writable;
//   - otherwise the data go to a temporary file in the target's directory,
//     which is synced, then renamed over the target, and the directory
//     synced: the file holds the old text or the new, never half of each.
//
// The temporary file is removed on failure, and by RemoveTemps, which a
// program calls when SIGINT or SIGTERM arrives.
func Write(path string, data []byte) error {
	target, err := filepath.EvalSymlinks(path)
	if err != nil {
		return err
	}
	st, err := os.Stat(target)
	if err != nil {
		return err
	}
	if err := regular(path, st); err != nil {
		return err
	}
	if st.Mode().Perm()&0o222 == 0 {
		return &Error{Path: path, Reason: "it is read-only; make it writable to format it in place", kind: ErrReadOnly}
	}
	if err := writable(target); err != nil {
		return &Error{Path: path, Reason: "it is not writable by you: " + plain(err), kind: ErrReadOnly}
	}
	dir := filepath.Dir(target)
	removeStale(dir, filepath.Base(target))
	if links(st) > 1 {
		return writeInPlace(target, data)
	}
	tmp, err := createTemp(dir, filepath.Base(target))
	if err != nil {
		if errors.Is(err, fs.ErrPermission) {
			return writeInPlace(target, data)
		}
		return err
	}
	name := tmp.Name()
	defer forget(name)
	fail := func(err error) error {
		tmp.Close()
		os.Remove(name)
		return err
	}
	if err := keepOwner(tmp, st); err != nil {
		// A file of another owner, writable through its group or by
		// everyone: renaming would hand it to us. Rewrite it in place.
		fail(nil)
		return writeInPlace(target, data)
	}
	if err := tmp.Chmod(st.Mode() & (fs.ModePerm | fs.ModeSetuid | fs.ModeSetgid | fs.ModeSticky)); err != nil {
		return fail(err)
	}
	if _, err := tmp.Write(data); err != nil {
		return fail(err)
	}
	if err := tmp.Sync(); err != nil {
		return fail(err)
	}
	if err := tmp.Close(); err != nil {
		os.Remove(name)
		return err
	}
	if err := os.Rename(name, target); err != nil {
		os.Remove(name)
		return err
	}
	syncDir(dir)
	return nil
}

// ErrReadOnly is wrapped by the refusal of a file without write permission.
var ErrReadOnly = errors.New("file not writable")

func plain(err error) string {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err.Error()
	}
	return err.Error()
}

// writeInPlace overwrites the file itself: same inode, links, owner, mode.
func writeInPlace(target string, data []byte) error {
	f, err := os.OpenFile(target, os.O_WRONLY, 0)
	if err != nil {
		return err
	}
	_, err = f.WriteAt(data, 0)
	if err == nil {
		err = f.Truncate(int64(len(data)))
	}
	if err == nil {
		err = f.Sync()
	}
	if cerr := f.Close(); err == nil {
		err = cerr
	}
	return err
}

func syncDir(dir string) {
	if d, err := os.Open(dir); err == nil {
		d.Sync() // best effort: some systems cannot sync a directory
		d.Close()
	}
}

// temps are the temporary files being written, for RemoveTemps.
var temps struct {
	sync.Mutex
	names  map[string]bool
	closed bool // RemoveTemps ran: the program is ending
}

var errEnding = errors.New("the program is ending")

func createTemp(dir, base string) (*os.File, error) {
	temps.Lock()
	defer temps.Unlock()
	if temps.closed {
		return nil, errEnding
	}
	f, err := os.CreateTemp(dir, "."+base+tempMark+"*")
	if err != nil {
		return nil, err
	}
	if temps.names == nil {
		temps.names = map[string]bool{}
	}
	temps.names[f.Name()] = true
	return f, nil
}

func forget(name string) {
	temps.Lock()
	delete(temps.names, name)
	temps.Unlock()
}

// RemoveTemps removes every temporary file a Write in progress has made and
// makes later Writes fail. A program calls it on SIGINT or SIGTERM, before
// it exits; a target is then left with its old content.
func RemoveTemps() {
	temps.Lock()
	defer temps.Unlock()
	temps.closed = true
	for name := range temps.names {
		os.Remove(name)
	}
	temps.names = nil
}

// removeStale removes temporary files of base in dir older than
// StaleAfter: those of a process killed while writing.
func removeStale(dir, base string) {
	matches, _ := filepath.Glob(filepath.Join(dir, "."+globEscape(base)+tempMark+"*"))
	for _, m := range matches {
		if st, err := os.Lstat(m); err == nil && st.Mode().IsRegular() && time.Since(st.ModTime()) > StaleAfter {
			os.Remove(m)
		}
	}
}

func globEscape(s string) string {
	r := strings.NewReplacer(`\`, `\\`, `*`, `\*`, `?`, `\?`, `[`, `\[`)
	return r.Replace(s)
}
