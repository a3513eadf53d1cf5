package main

import (
	"fmt"
	"io"
	"runtime/debug"
)

func init() {
	register(&command{name: "version", summary: "print the version", run: func(args []string, _ io.Reader, stdout, _ io.Writer) int {
		if helpAsked(args) {
			fmt.Fprintln(stdout, "Usage: circa version\n\nPrints the version of this circa binary.")
			return exitOK
		}
		v := "(devel)"
		if bi, ok := debug.ReadBuildInfo(); ok && bi.Main.Version != "" {
			v = bi.Main.Version
		}
		fmt.Fprintln(stdout, "circa", v)
		return exitOK
	}})
}
