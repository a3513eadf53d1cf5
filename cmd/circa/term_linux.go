package main

import (
	"io"
	"os"
	"syscall"
	"unsafe"
)

// isTerminal reports whether r is a terminal, where reading would wait for
// the user to type a file: a command given no path then prints its usage.
func isTerminal(r io.Reader) bool {
	f, ok := r.(*os.File)
	if !ok {
		return false
	}
	var t syscall.Termios
	_, _, errno := syscall.Syscall(syscall.SYS_IOCTL, f.Fd(), syscall.TCGETS, uintptr(unsafe.Pointer(&t)))
	return errno == 0
}
