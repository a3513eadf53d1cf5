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
		fmt.Fprintln(stdout, "circa", buildVersion())
		return exitOK
	}})
}

// buildVersion is the module version the binary was built from.
func buildVersion() string {
	if bi, ok := debug.ReadBuildInfo(); ok && bi.Main.Version != "" {
		return bi.Main.Version
	}
	return "(devel)"
}
