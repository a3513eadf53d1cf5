package lsp

import (
	"context"
	"encoding/json"
	"errors"
	"io"
	"strconv"
	"sync"

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
//
// It also writes the frames itself: the header stream composes every
// message in one buffer that it keeps at the size of the largest message
// of the session (the outline of a 5 MB file is 14 MB), and moves each
// body once more to put the header before it. Here a message is composed
// after room for its header, filled in last, and a buffer grown past
// keepFrame is kept only until a smaller message follows.
type guardedStream struct {
	frameStream
	logf func(format string, args ...any)

	w    io.Writer
	wmu  sync.Mutex // orders the frames written
	wbuf []byte     // the last frame's buffer, for the next
}

// keepFrame is the largest write buffer the stream keeps once it writes
// frames no larger.
const keepFrame = 1 << 20

func newGuardedStream(rwc io.ReadWriteCloser, logf func(string, ...any)) *guardedStream {
	fs, ok := jsonrpc2.NewHeaderStream(rwc).(frameStream)
	if !ok {
		panic("lsp: header stream without raw frames")
	}
	return &guardedStream{frameStream: fs, logf: logf, w: rwc}
}

// Write frames and writes one message.
func (s *guardedStream) Write(ctx context.Context, msg jsonrpc2.Message) (int64, error) {
	if err := ctx.Err(); err != nil {
		return 0, err
	}
	s.wmu.Lock()
	defer s.wmu.Unlock()
	if err := ctx.Err(); err != nil {
		return 0, err
	}
	buf := jsonrpc2.AppendMessage(s.reserve(), msg)
	return s.writeFrame(buf)
}

// WriteFrame frames and writes an encoded message (a batch's replies).
func (s *guardedStream) WriteFrame(ctx context.Context, data []byte) (int64, error) {
	if err := ctx.Err(); err != nil {
		return 0, err
	}
	s.wmu.Lock()
	defer s.wmu.Unlock()
	if err := ctx.Err(); err != nil {
		return 0, err
	}
	return s.writeFrame(append(s.reserve(), data...))
}

// frameHead is room for the longest header, which writeFrame fills in
// right before the body.
const frameHead = len("Content-Length: \r\n\r\n") + 20

// reserve returns a buffer holding room for the header, for the body to
// be appended to.
func (s *guardedStream) reserve() []byte {
	if cap(s.wbuf) < frameHead {
		s.wbuf = make([]byte, 0, 4<<10)
	}
	return s.wbuf[:frameHead]
}

// writeFrame writes buf (header room, then the body) with its header in
// one write. The caller holds wmu.
func (s *guardedStream) writeFrame(buf []byte) (int64, error) {
	var head [frameHead]byte
	h := appendHeader(head[:0], len(buf)-frameHead)
	start := frameHead - len(h)
	copy(buf[start:], h)
	n, err := s.w.Write(buf[start:])
	// A large buffer serves the next large frame (an outline asked for
	// again) and is dropped at the next small one.
	if cap(buf) > keepFrame && len(buf) <= keepFrame {
		s.wbuf = nil
	} else {
		s.wbuf = buf[:0]
	}
	return int64(n), err
}

func appendHeader(b []byte, n int) []byte {
	b = append(b, "Content-Length: "...)
	b = strconv.AppendInt(b, int64(n), 10)
	return append(b, "\r\n\r\n"...)
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
	if _, err := s.WriteFrame(ctx, b); err != nil {
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
