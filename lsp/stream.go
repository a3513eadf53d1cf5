package lsp

import (
	"context"
	"encoding/json"
	"errors"
	"io"

	"go.lsp.dev/jsonrpc2"
)

// frameStream is the raw-frame side of a jsonrpc2 stream; the header stream
// implements it and the connection prefers it.
type frameStream interface {
	jsonrpc2.Stream
	ReadFrame(ctx context.Context) ([]byte, int64, error)
	WriteFrame(ctx context.Context, data []byte) (int64, error)
}

// guardedStream answers malformed frames itself and keeps reading. The
// jsonrpc2 connection ends its read loop on a frame it cannot decode, which
// would drop the user's session over one bad message; here a frame that is
// not JSON gets a -32700 reply, a JSON value that is not a request or
// response gets -32600, and a broken header is skipped.
type guardedStream struct {
	frameStream
	logf func(format string, args ...any)
}

func newGuardedStream(rwc io.ReadWriteCloser, logf func(string, ...any)) *guardedStream {
	fs, ok := jsonrpc2.NewHeaderStream(rwc).(frameStream)
	if !ok {
		panic("lsp: header stream without raw frames")
	}
	return &guardedStream{frameStream: fs, logf: logf}
}

// ReadFrame returns the next well-formed frame.
func (s *guardedStream) ReadFrame(ctx context.Context) ([]byte, int64, error) {
	for {
		frame, n, err := s.frameStream.ReadFrame(ctx)
		if errors.Is(err, jsonrpc2.ErrInvalidHeader) {
			s.logf("skipping a message with a malformed header")
			continue
		}
		if err != nil {
			return frame, n, err
		}
		if !json.Valid(frame) {
			s.logf("answering a message that is not JSON (%d bytes)", len(frame))
			s.reply(ctx, jsonrpc2.NewError(jsonrpc2.ParseError, "message is not valid JSON"))
			continue
		}
		if _, derr := jsonrpc2.DecodeMessage(frame); derr != nil && !isBatch(frame) {
			s.logf("answering an invalid request: %v", derr)
			s.reply(ctx, jsonrpc2.NewError(jsonrpc2.InvalidRequest, "not a JSON-RPC 2.0 request: "+derr.Error()))
			continue
		}
		return frame, n, nil
	}
}

// Read is the message-level fallback; the connection uses ReadFrame.
func (s *guardedStream) Read(ctx context.Context) (jsonrpc2.Message, int64, error) {
	frame, n, err := s.ReadFrame(ctx)
	if err != nil {
		return nil, n, err
	}
	msg, err := jsonrpc2.DecodeMessage(frame)
	return msg, n, err
}

func (s *guardedStream) reply(ctx context.Context, e *jsonrpc2.Error) {
	// The id of a message that cannot be read is null.
	b := jsonrpc2.AppendResponse(nil, jsonrpc2.ID{}, nil, e)
	if _, err := s.frameStream.WriteFrame(ctx, b); err != nil {
		s.logf("cannot answer: %v", err)
	}
}

func isBatch(frame []byte) bool {
	for _, c := range frame {
		switch c {
		case ' ', '\t', '\r', '\n':
			continue
		case '[':
			return true
		}
		return false
	}
	return false
}
