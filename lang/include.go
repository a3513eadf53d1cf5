// Reading: the root file and, depth first, the files it includes.

package lang

import (
	"errors"
	"os"
	"path/filepath"
	"strings"

	"circa/textfile"
)

// FS reads the files a model includes. The language server supplies one that
// prefers open editor buffers to the disk.
type FS interface {
	ReadFile(path string) ([]byte, error)
}

// OSFS reads from the operating system.
type OSFS struct{}

// Overlay reads the files it holds, by path, from memory and every other
// file from disk, as unsaved text shadows the file it came from.
type Overlay map[string][]byte

// ReadFile returns the held text of path, or reads it as OSFS does.
func (o Overlay) ReadFile(path string) ([]byte, error) {
	if b, ok := o[path]; ok {
		return b, nil
	}
	return OSFS{}.ReadFile(path)
}

// ReadFile reads a regular file from disk, refusing devices, FIFOs and
// files over MaxFileSize (see textfile.Read), without a leading byte-order
// mark.
func (OSFS) ReadFile(path string) ([]byte, error) {
	b, err := textfile.Read(path)
	b, _ = textfile.CutBOM(b)
	return b, err
}

// MaxFileSize bounds what the loader reads, so a wrong include cannot make
// the checker swallow a disk image.
const MaxFileSize = textfile.MaxSize

// MaxIncludeDepth bounds how deeply includes nest: the root file includes
// a file at depth 1, which includes one at depth 2, and so on. A chain of
// files each including the next (written by a generator gone wrong, say)
// is reported at the include that goes one level too deep instead of being
// read to its end; real projects nest two or three levels.
const MaxIncludeDepth = 32

// read parses one file and, depth first, the files it includes.
func (r *resolver) read(path string, src []byte, stack []string, from Location) {
	if len(src) > MaxFileSize {
		r.errorf("file-unreadable", from.File, from.Span, "%s is larger than %d MiB", path, MaxFileSize>>20)
		return
	}
	if r.heads {
		r.readParsed(parseHeads(path, src), stack)
		return
	}
	r.readParsed(Parse(path, src), stack)
}

// readParsed takes in one parsed file and, depth first, the files it
// includes.
func (r *resolver) readParsed(f *File, stack []string) {
	path := f.Path
	r.m.Files[path] = f
	r.m.Order = append(r.m.Order, path)
	r.m.Diags = append(r.m.Diags, f.Errors...)
	stack = append(stack, path)
	for _, st := range f.Stmts {
		if st.Keyword() != "include" || st.Bad {
			continue
		}
		s, ok := r.stringArg(path, r.kept(path, st, false))
		if !ok {
			continue
		}
		inc := s.Value()
		target := inc
		if !filepath.IsAbs(target) {
			target = filepath.Join(filepath.Dir(path), filepath.FromSlash(inc))
		}
		loc := Location{File: path, Span: s.Span()}
		if i := indexOf(stack, target); i >= 0 {
			d := r.errorf("include-cycle", path, s.Span(), "include cycle: %s", strings.Join(append(append([]string(nil), stack[i:]...), target), " → "))
			d.Related = append(d.Related, Related{Loc: Location{File: target}, Message: "the cycle starts here"})
			continue
		}
		if _, done := r.m.Files[target]; done {
			continue // diamond includes are read once
		}
		if len(stack) > MaxIncludeDepth {
			r.errorf("include-unreadable", path, s.Span(), "cannot read included file %s: includes nest more than %d levels deep (%s → … → %s)", inc, MaxIncludeDepth, stack[0], path)
			continue
		}
		data, err := r.fs.ReadFile(target)
		if err != nil {
			msg := err.Error()
			var pe *os.PathError
			if errors.As(err, &pe) {
				msg = pe.Err.Error()
			}
			r.errorf("include-unreadable", path, s.Span(), "cannot read included file %s: %s", inc, msg)
			continue
		}
		r.read(target, data, stack, loc)
	}
}

func indexOf(list []string, s string) int {
	for i, x := range list {
		if x == s {
			return i
		}
	}
	return -1
}

// stringArg returns the single string part of st.
func (r *resolver) stringArg(file string, st *Stmt) (*Str, bool) {
	if len(st.Args) == 1 && st.Args[0].Expr != nil {
		if a := singleAtom(st.Args[0].Expr); a != nil && a.Str != nil {
			return a.Str, true
		}
	}
	r.errorf("syntax", file, st.Span(), "%s needs one quoted path, e.g. %s \"parts.loop\"", st.Keyword(), st.Keyword())
	return nil, false
}
