package lsp

import (
	"bufio"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"net"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"

	"go.lsp.dev/jsonrpc2"
)

// testClient speaks the protocol to an in-process server over a pipe. It
// writes frames itself (so tests can send malformed ones) and keeps the
// latest diagnostics published for each URI.
type testClient struct {
	t      testing.TB
	conn   net.Conn
	srv    *Server
	exitCh chan int
	// patience is how long a reply or a settled analysis may take before
	// the test calls the server hung (20 s unless a test sets it).
	patience time.Duration

	wmu      sync.Mutex
	mu       sync.Mutex
	nextID   int
	pending  map[string]chan rpcReply
	diags    map[string]publishedDiags
	notes    []rpcMessage
	calls    []rpcMessage        // requests from the server
	answers  map[string]string   // results to reply to the server's requests, by method; else null
	analysed map[uint64]bool     // complete checks published
	quick    map[uint64]bool     // quick checks and estimates published
	firstPub map[int32]time.Time // when each version was first published, where a benchmark records it
	anCond   *sync.Cond
}

type rpcMessage struct {
	JSONRPC string          `json:"jsonrpc"`
	ID      json.RawMessage `json:"id,omitempty"`
	Method  string          `json:"method,omitempty"`
	Params  json.RawMessage `json:"params,omitempty"`
	Result  json.RawMessage `json:"result,omitempty"`
	Error   *rpcError       `json:"error,omitempty"`
}

type rpcError struct {
	Code    int    `json:"code"`
	Message string `json:"message"`
}

func (e *rpcError) Error() string { return fmt.Sprintf("%d %s", e.Code, e.Message) }

type rpcReply struct {
	result json.RawMessage
	err    *rpcError
}

type publishedDiags struct {
	Version     *int32            `json:"version"`
	Diagnostics []json.RawMessage `json:"diagnostics"`
	count       int
}

// newTestClient starts a server with the given options and a zero debounce
// unless set.
func newTestClient(t testing.TB, opts Options) *testClient {
	if opts.Log == nil {
		opts.Log = io.Discard
	}
	a, b := net.Pipe()
	srv := newServer(opts)
	c := &testClient{t: t, conn: a, srv: srv, exitCh: make(chan int, 1), pending: map[string]chan rpcReply{},
		diags: map[string]publishedDiags{}, analysed: map[uint64]bool{}, quick: map[uint64]bool{}}
	c.anCond = sync.NewCond(&c.mu)
	srv.onAnalysed = func(id uint64) {
		c.mu.Lock()
		c.quick[id] = true
		c.anCond.Broadcast()
		c.mu.Unlock()
	}
	srv.onComplete = func(id uint64) {
		c.mu.Lock()
		c.analysed[id] = true
		c.anCond.Broadcast()
		c.mu.Unlock()
	}
	go func() { c.exitCh <- srv.run(context.Background(), b) }()
	go c.read()
	t.Cleanup(func() { a.Close() })
	return c
}

func (c *testClient) read() {
	r := bufio.NewReader(c.conn)
	for {
		n := -1
		for {
			line, err := r.ReadString('\n')
			if err != nil {
				c.fail(err)
				return
			}
			line = strings.TrimRight(line, "\r\n")
			if line == "" {
				break
			}
			if v, ok := strings.CutPrefix(line, "Content-Length: "); ok {
				n, _ = strconv.Atoi(v)
			}
		}
		body := make([]byte, n)
		if _, err := io.ReadFull(r, body); err != nil {
			c.fail(err)
			return
		}
		m, err := decodeRPC(body)
		if err != nil {
			c.t.Errorf("server sent a message a JSON-RPC client cannot read (%v): %.200s", err, body)
			continue
		}
		c.mu.Lock()
		switch {
		case m.Method != "" && len(m.ID) > 0:
			c.calls = append(c.calls, m)
			result := "null"
			if a, ok := c.answers[m.Method]; ok {
				result = a
			}
			go c.write(fmt.Appendf(nil, `{"jsonrpc":"2.0","id":%s,"result":%s}`, m.ID, result))
		case m.Method != "":
			c.notes = append(c.notes, m)
			if m.Method == "textDocument/publishDiagnostics" {
				var p struct {
					URI string `json:"uri"`
					publishedDiags
				}
				json.Unmarshal(m.Params, &p)
				prev := c.diags[p.URI]
				p.publishedDiags.count = prev.count + 1
				c.diags[p.URI] = p.publishedDiags
			}
		default:
			key := string(m.ID)
			if ch, ok := c.pending[key]; ok {
				delete(c.pending, key)
				ch <- rpcReply{m.Result, m.Error}
			} else {
				// replies to ids we did not send (null id): keep them for tests
				c.notes = append(c.notes, m)
			}
		}
		c.mu.Unlock()
	}
}

// decodeRPC reads one frame as a client built on the protocol's own
// JSON-RPC library does: one scan of the message, with the params and the
// result left raw for the caller to decode into protocol types.
func decodeRPC(body []byte) (rpcMessage, error) {
	msg, err := jsonrpc2.DecodeMessage(body)
	if err != nil {
		return rpcMessage{}, err
	}
	m := rpcMessage{JSONRPC: "2.0"}
	switch x := msg.(type) {
	case *jsonrpc2.Call:
		m.ID, m.Method, m.Params = rawID(x.ID()), x.Method(), json.RawMessage(x.Params())
	case *jsonrpc2.Notification:
		m.Method, m.Params = x.Method(), json.RawMessage(x.Params())
	case *jsonrpc2.Response:
		m.ID = rawID(x.ID())
		if e := x.Err(); e != nil {
			var je *jsonrpc2.Error
			if !errors.As(e, &je) {
				return rpcMessage{}, fmt.Errorf("response error of type %T", e)
			}
			m.Error = &rpcError{Code: int(je.Code), Message: je.Message}
		} else if m.Result = json.RawMessage(x.Result()); m.Result == nil {
			m.Result = json.RawMessage("null")
		}
	default:
		return rpcMessage{}, fmt.Errorf("unexpected message %T", msg)
	}
	return m, nil
}

// rawID is the JSON text of a message id, null when it has none.
func rawID(id jsonrpc2.ID) json.RawMessage {
	if n, ok := id.Number(); ok {
		return strconv.AppendInt(nil, n, 10)
	}
	if s, ok := id.StringValue(); ok {
		b, _ := json.Marshal(s)
		return b
	}
	return json.RawMessage("null")
}

// answer sets the result the client replies to the server's requests of
// one method, as JSON.
func (c *testClient) answer(method, result string) {
	c.mu.Lock()
	defer c.mu.Unlock()
	if c.answers == nil {
		c.answers = map[string]string{}
	}
	c.answers[method] = result
}

// serverCalls returns the server's requests of one method so far.
func (c *testClient) serverCalls(method string) []rpcMessage {
	c.mu.Lock()
	defer c.mu.Unlock()
	var out []rpcMessage
	for _, m := range c.calls {
		if m.Method == method {
			out = append(out, m)
		}
	}
	return out
}

func (c *testClient) fail(err error) {
	c.mu.Lock()
	defer c.mu.Unlock()
	for k, ch := range c.pending {
		ch <- rpcReply{err: &rpcError{Code: 0, Message: "connection closed: " + err.Error()}}
		delete(c.pending, k)
	}
}

func (c *testClient) write(body []byte) {
	c.wmu.Lock()
	defer c.wmu.Unlock()
	fmt.Fprintf(c.conn, "Content-Length: %d\r\n\r\n", len(body))
	c.conn.Write(body)
}

// callID sends a request with the given raw id and waits for its reply.
func (c *testClient) callID(id string, method string, params any) (json.RawMessage, *rpcError) {
	ch := c.send(id, method, params)
	select {
	case r := <-ch:
		return r.result, r.err
	case <-time.After(c.timeout()):
		c.t.Fatalf("%s: no reply", method)
		return nil, nil
	}
}

func (c *testClient) send(id, method string, params any) chan rpcReply {
	ch := make(chan rpcReply, 1)
	c.mu.Lock()
	c.pending[id] = ch
	c.mu.Unlock()
	msg := map[string]any{"jsonrpc": "2.0", "id": json.RawMessage(id), "method": method}
	if params != nil {
		msg["params"] = params
	}
	b, err := json.Marshal(msg)
	if err != nil {
		c.t.Fatal(err)
	}
	c.write(b)
	return ch
}

func (c *testClient) call(method string, params any) (json.RawMessage, *rpcError) {
	c.mu.Lock()
	c.nextID++
	id := strconv.Itoa(c.nextID)
	c.mu.Unlock()
	return c.callID(id, method, params)
}

// mustCall fails the test on an error reply.
func (c *testClient) mustCall(method string, params any) json.RawMessage {
	r, err := c.call(method, params)
	if err != nil {
		c.t.Fatalf("%s: %v", method, err)
	}
	return r
}

func (c *testClient) notify(method string, params any) {
	msg := map[string]any{"jsonrpc": "2.0", "method": method}
	if params != nil {
		msg["params"] = params
	}
	b, _ := json.Marshal(msg)
	c.write(b)
}

// initialize sends initialize with the given capabilities (or, when caps
// holds "capabilities", with caps as the whole params) and initialized.
func (c *testClient) initialize(caps map[string]any) json.RawMessage {
	params := map[string]any{"processId": nil, "rootUri": nil, "capabilities": caps}
	if caps == nil {
		params["capabilities"] = map[string]any{}
	} else if _, whole := caps["capabilities"]; whole {
		params = caps
	}
	r := c.mustCall("initialize", params)
	c.notify("initialized", map[string]any{})
	return r
}

// settle waits until the server has published the complete checks of its
// current snapshot and every notification before that point has been read.
func (c *testClient) settle() { c.wait(c.analysed) }

// settleQuick waits for the quick checks and the estimate only.
func (c *testClient) settleQuick() { c.wait(c.quick) }

func (c *testClient) wait(done map[uint64]bool) {
	// Notifications are handled in order before the next request, so after
	// this round trip the snapshot of the last change exists.
	c.mustCall("workspace/symbol", map[string]any{"query": "\x00none"})
	c.srv.mu.Lock()
	id := c.srv.snap.id
	c.srv.mu.Unlock()
	deadline := time.Now().Add(c.timeout())
	c.mu.Lock()
	for !done[id] && id != 0 {
		if time.Now().After(deadline) {
			c.mu.Unlock()
			c.t.Fatalf("snapshot %d never finished", id)
		}
		go func() { time.Sleep(10 * time.Millisecond); c.anCond.Broadcast() }()
		c.anCond.Wait()
	}
	c.mu.Unlock()
	for !c.srv.out.idle() {
		if time.Now().After(deadline) {
			c.t.Fatal("diagnostics never sent")
		}
		time.Sleep(time.Millisecond)
	}
	// A round trip: its reply follows every notification sent before it.
	c.mustCall("workspace/symbol", map[string]any{"query": "\x00none"})
}

func (c *testClient) published(uri string) (publishedDiags, bool) {
	c.mu.Lock()
	defer c.mu.Unlock()
	d, ok := c.diags[uri]
	return d, ok
}

func (c *testClient) shutdownExit() int {
	c.mustCall("shutdown", nil)
	c.notify("exit", nil)
	select {
	case code := <-c.exitCh:
		return code
	case <-time.After(5 * time.Second):
		c.t.Fatal("server did not exit")
		return -1
	}
}

// timeout is the client's patience with the server.
func (c *testClient) timeout() time.Duration {
	if c.patience > 0 {
		return c.patience
	}
	return 20 * time.Second
}
