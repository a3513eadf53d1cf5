package main

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strings"

	"circa/check/output"
	"circa/textfile"
)

// readError is the one message every command gives for a path it cannot
// read: the path, then the reason in plain words ("no such file or
// directory", "it is a directory, not a regular file").
func readError(path string, err error) string {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		err = pe.Err
	}
	return output.Printable(fmt.Sprintf("cannot read %s: %v", path, err))
}

// reportRead prints readError for a command. When stderr is a problemLog
// (check's, whose JSON and SARIF outputs carry such errors too) the error
// is also recorded.
func reportRead(cmd, path string, err error, stderr io.Writer) {
	msg := readError(path, err)
	fmt.Fprintf(stderr, "circa %s: %s\n", cmd, msg)
	if l, ok := stderr.(*problemLog); ok {
		l.list = append(l.list, output.Problem{File: path, Message: msg})
	}
}

// problemLog is a command's standard error that also keeps the read errors
// printed on it.
type problemLog struct {
	io.Writer
	list []output.Problem
}

// readInput reads a file named on the command line through the shared
// reader (regular files only, size-capped). On failure it prints readError
// for the command and ok is false; the command's status is then exitUsage,
// the status of every I/O error. The text keeps a leading byte-order mark;
// textfile.CutBOM removes it.
func readInput(cmd, path string, stderr io.Writer) (src []byte, ok bool) {
	src, err := textfile.Read(path)
	if err != nil {
		reportRead(cmd, path, err, stderr)
		return nil, false
	}
	noteInput(len(src))
	return src, true
}

// readStdin reads standard input with the same size cap as a file.
func readStdin(cmd string, stdin io.Reader, stderr io.Writer) ([]byte, bool) {
	src, err := textfile.ReadAll("standard input", stdin)
	if err != nil {
		reportRead(cmd, "standard input", err, stderr)
		return nil, false
	}
	noteInput(len(src))
	return src, true
}

// readSource is readInput (or readStdin for "-") for a command that checks
// the text: without a byte-order mark, so that positions count from the
// first character an editor shows.
func readSource(cmd, path string, stdin io.Reader, stderr io.Writer) ([]byte, bool) {
	var src []byte
	var ok bool
	if path == "-" {
		src, ok = readStdin(cmd, stdin, stderr)
	} else {
		src, ok = readInput(cmd, path, stderr)
	}
	src, _ = textfile.CutBOM(src)
	return src, ok
}

// loopFiles expands a path named on the command line: a directory gives
// the *.loop files under it, skipping hidden directories; anything else is
// itself, to be read (and refused if it is no regular file) by readInput.
// ok is false when some part could not be read; the message is printed.
func loopFiles(cmd, p string, stderr io.Writer) (files []string, ok bool) {
	info, err := os.Stat(p)
	if err != nil {
		reportRead(cmd, p, err, stderr)
		return nil, false
	}
	if !info.IsDir() {
		return []string{p}, true
	}
	ok = true
	err = filepath.WalkDir(p, func(path string, d fs.DirEntry, err error) error {
		if err != nil {
			reportRead(cmd, path, err, stderr)
			ok = false
			return nil
		}
		if d.IsDir() && path != p && strings.HasPrefix(d.Name(), ".") {
			return filepath.SkipDir
		}
		if !d.IsDir() && strings.HasSuffix(d.Name(), ".loop") {
			files = append(files, path)
		}
		return nil
	})
	if err != nil {
		reportRead(cmd, p, err, stderr)
		ok = false
	}
	return files, ok
}

// plainError drops the system call and path from err, which the caller's
// message already names.
func plainError(err error) error {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}
