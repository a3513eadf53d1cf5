//go:build !unix

package textfile

import (
	"io/fs"
	"os"
)

func links(fs.FileInfo) uint64 { return 1 }

func keepOwner(*os.File, fs.FileInfo) error { return nil }

func writable(string) error { return nil }
