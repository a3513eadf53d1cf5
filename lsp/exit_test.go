package lsp

import (
	"bufio"
	"context"
	"fmt"
	"io"
	"strings"
	"testing"
	"time"
)

// heldInput is a session stream whose reads end only when the client closes
// its end and whose Close cannot interrupt them, as with a process's
// standard input.
type heldInput struct {
	r *io.PipeReader
	w *io.PipeWriter
}

func (h heldInput) Read(p []byte) (int, error)  { return h.r.Read(p) }
func (h heldInput) Write(p []byte) (int, error) { return h.w.Write(p) }
func (h heldInput) Close() error                { return nil }

// TestExitWithInputOpen checks that the session ends on exit while the
// client keeps its end of the input open (the time it takes is measured by
// BenchmarkServeExit in cmd/circa).
func TestExitWithInputOpen(t *testing.T) {
	inR, inW := io.Pipe()
	outR, outW := io.Pipe()
	defer inW.Close()
	defer outR.Close()
	done := make(chan int, 1)
	go func() { done <- newServer(Options{Log: io.Discard}).run(context.Background(), heldInput{inR, outW}) }()
	replies := make(chan string, 8)
	go func() {
		r := bufio.NewReader(outR)
		for {
			n := 0
			for {
				line, err := r.ReadString('\n')
				if err != nil {
					return
				}
				if line == "\r\n" {
					break
				}
				fmt.Sscanf(line, "Content-Length: %d", &n)
			}
			body := make([]byte, n)
			if _, err := io.ReadFull(r, body); err != nil {
				return
			}
			if s := string(body); strings.Contains(s, `"id":`) && !strings.Contains(s, `"method"`) {
				replies <- s
			}
		}
	}()
	send := func(body string) {
		fmt.Fprintf(inW, "Content-Length: %d\r\n\r\n%s", len(body), body)
	}
	wait := func(what string) {
		select {
		case <-replies:
		case <-time.After(20 * time.Second):
			t.Fatalf("no reply to %s", what)
		}
	}
	send(`{"jsonrpc":"2.0","id":1,"method":"initialize","params":{"capabilities":{}}}`)
	wait("initialize")
	send(`{"jsonrpc":"2.0","method":"initialized","params":{}}`)
	send(`{"jsonrpc":"2.0","id":2,"method":"shutdown"}`)
	wait("shutdown")
	send(`{"jsonrpc":"2.0","method":"exit"}`)
	select {
	case code := <-done:
		if code != 0 {
			t.Errorf("exit status %d after shutdown, want 0", code)
		}
	case <-time.After(10 * time.Second):
		t.Fatal("the session did not end after exit")
	}
}
