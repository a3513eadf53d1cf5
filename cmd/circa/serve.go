package main

import (
	"context"
	"flag"
	"fmt"
	"io"
	"os"
	"os/signal"
	"runtime/debug"
	"syscall"

	"circa/lsp"
)

func init() {
	register(&command{name: "serve", summary: "run the language server on standard input and output", run: runServe})
}

func runServe(args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("serve", flag.ContinueOnError)
	fs.SetOutput(stderr)
	fs.Usage = func() {
		fmt.Fprintln(stderr, "Usage: circa serve [-log-timing]\n\nRuns the language server for .loop files, speaking the Language Server\nProtocol on standard input and output; logs go to standard error.\nSettings are described in docs/lsp.md.")
		fmt.Fprintln(stderr)
		fs.PrintDefaults()
	}
	logTiming := fs.Bool("log-timing", false, "log when each change's first and complete diagnostics are published")
	if err := fs.Parse(args); err != nil {
		if err == flag.ErrHelp {
			return exitOK
		}
		return exitUsage
	}
	if fs.NArg() > 0 {
		fmt.Fprintf(stderr, "circa serve: unexpected argument %q\n", fs.Arg(0))
		return exitUsage
	}
	opts := lsp.Options{Log: stderr, LogTiming: *logTiming}
	if os.Getenv("GOMEMLIMIT") == "" {
		debug.SetMemoryLimit(lsp.MemoryLimit)
		opts.MemoryLimit = lsp.MemoryLimit
	}
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	return lsp.Serve(ctx, stdio{stdin, stdout}, opts)
}

// stdio joins standard input and output into one stream.
type stdio struct {
	r io.Reader
	w io.Writer
}

func (s stdio) Read(p []byte) (int, error)  { return s.r.Read(p) }
func (s stdio) Write(p []byte) (int, error) { return s.w.Write(p) }
func (s stdio) Close() error {
	if c, ok := s.r.(io.Closer); ok {
		c.Close()
	}
	return nil
}
