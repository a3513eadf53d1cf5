package lsp

import (
	"bytes"
	"context"
	"fmt"
	"io"
	"strings"
	"testing"

	"go.lsp.dev/jsonrpc2"
)

// bufferRWC is a stream whose writes collect in a buffer.
type bufferRWC struct{ bytes.Buffer }

func (*bufferRWC) Close() error { return nil }

// TestStreamWritesFrames writes messages of every kind, a large result
// among them, and reads them back with the protocol library's own header
// stream: each arrives whole and in order, and the write buffer kept
// afterwards is small.
func TestStreamWritesFrames(t *testing.T) {
	var out bufferRWC
	s := newGuardedStream(&out, t.Logf)
	ctx := context.Background()
	var big strings.Builder
	big.WriteString("[")
	for i := range 60000 {
		if i > 0 {
			big.WriteString(",")
		}
		fmt.Fprintf(&big, `{"name":"p%d","kind":14}`, i)
	}
	big.WriteString("]")
	msgs := []jsonrpc2.Message{
		jsonrpc2.NewResponse(jsonrpc2.NewNumberID(7), jsonrpc2.RawMessage(big.String()), nil),
		jsonrpc2.NewNotification("textDocument/publishDiagnostics", jsonrpc2.RawMessage(`{"uri":"file:///a.loop","diagnostics":[]}`)),
		jsonrpc2.NewResponse(jsonrpc2.NewStringID("x\"y"), jsonrpc2.RawMessage(big.String()), nil),
		jsonrpc2.NewResponse(jsonrpc2.NewNumberID(8), nil, jsonrpc2.NewError(jsonrpc2.InvalidParams, "bad")),
		jsonrpc2.NewCall(jsonrpc2.NewNumberID(1), "workspace/configuration", jsonrpc2.RawMessage(`{"items":[]}`)),
		jsonrpc2.NewResponse(jsonrpc2.NewNumberID(9), jsonrpc2.RawMessage(`null`), nil),
	}
	var want [][]byte
	for _, m := range msgs {
		if _, err := s.Write(ctx, m); err != nil {
			t.Fatal(err)
		}
		want = append(want, jsonrpc2.AppendMessage(nil, m))
	}
	if _, err := s.WriteFrame(ctx, []byte(`[{"jsonrpc":"2.0","id":2,"result":1}]`)); err != nil {
		t.Fatal(err)
	}
	want = append(want, []byte(`[{"jsonrpc":"2.0","id":2,"result":1}]`))
	if cap(s.wbuf) > keepFrame {
		t.Errorf("after small frames the stream keeps a write buffer of %d bytes", cap(s.wbuf))
	}
	in := jsonrpc2.NewHeaderStream(struct {
		io.Reader
		io.Writer
		io.Closer
	}{&out, io.Discard, io.NopCloser(nil)}).(frameStream)
	for i, w := range want {
		got, _, err := in.ReadFrame(ctx)
		if err != nil {
			t.Fatalf("frame %d: %v", i, err)
		}
		if !bytes.Equal(got, w) {
			t.Errorf("frame %d: %.120s, want %.120s", i, got, w)
		}
	}
	if out.Len() != 0 {
		t.Errorf("%d bytes left after the frames", out.Len())
	}
}
