// Package lsp is the language server for .loop files: it keeps the editor's
// open documents in immutable snapshots, analyses them with the same lang and
// check functions the command line uses, and answers the Language Server
// Protocol over a stream (normally standard input and output).
package lsp

import (
	"context"
	"fmt"
	"io"
	"os"
	"sync"
	"time"

	"go.lsp.dev/jsonrpc2"
	"go.lsp.dev/protocol"

	"circa/lang"
)

// Options configure a server beyond what the client negotiates.
type Options struct {
	// Debounce is how long the checks and estimates wait after an edit
	// before they run; a newer edit cancels the wait. Zero adapts the wait
	// to how long the last checks of the same file took (see
	// adaptiveDebounce); a negative value runs them at once.
	Debounce time.Duration
	// Log receives the server's log lines; nil means standard error.
	Log io.Writer
	// LogTiming logs, for every change, when its first and its complete
	// diagnostics were published, counted from the change's arrival.
	LogTiming bool
	// MemoryLimit, when positive, is the least soft heap limit the server
	// keeps the process under (runtime/debug.SetMemoryLimit), raised with
	// the size of the open documents (see memoryLimitFor).
	MemoryLimit int64
	// guideBudget replaces the background guidance's budget (0: the
	// default), for tests of the guidance itself on a slow race build.
	guideBudget time.Duration
}

// MemoryLimit is the soft heap limit `circa serve` runs under unless the
// environment sets GOMEMLIMIT. A workspace of 5,000 components keeps about
// 45 MB live; without a limit the collector lets the heap grow to several
// times that between cycles, which an editor's user sees as resident memory.
const MemoryLimit = 128 << 20

// heapPerTextByte is about how many bytes of heap an open document's
// analysis keeps per byte of its text (93 MB for a 5 MB file), with room
// for the old and the new analysis during an edit.
const heapPerTextByte = 60

// memoryLimitFor is the soft heap limit for open documents of textBytes
// bytes in all: the least limit, or enough for their analyses. A limit
// below the live heap would make the collector run without pause.
func memoryLimitFor(least, textBytes int64) int64 {
	return max(least, heapPerTextByte*textBytes)
}

// Server is one client's session.
type Server struct {
	opts Options
	conn jsonrpc2.Conn
	logw io.Writer
	logM sync.Mutex

	mu          sync.Mutex // guards the fields below; held only briefly
	initialized bool
	shutdown    bool
	enc         lang.Encoding
	caps        clientCaps
	settings    Settings
	pullSeq     uint64               // numbers the settings pulls; only the latest applies
	docs        map[string]*document // open documents by path
	snap        *snapshot
	nextID      uint64
	inflight    map[jsonrpc2.ID]context.CancelFunc
	// lastEst holds, by root, the last finished estimate, detached from its
	// model so an old model is not kept alive while a new one is built.
	lastEst map[string]*estimates
	// checkCost holds, by root, how long its last checks took, which sets
	// the next debounce.
	checkCost map[string]time.Duration
	// modelCost holds, by root, how long its last model took to resolve,
	// which decides whether its syntax errors go out first.
	modelCost map[string]time.Duration

	disk diskCache

	pubMu     sync.Mutex // orders publishing against snapshot switches
	published map[string]pubState
	out       outbox

	work    chan struct{}
	pending *snapshot // latest snapshot waiting for the worker (under mu)

	slowWork    chan struct{}
	slowPending *snapshot // latest snapshot waiting for the complete checks (under mu)
	guides      guideStore
	exit        chan int
	done        chan struct{}

	// testing hooks
	beforeReply func(ctx context.Context, method string)
	beforeNote  func(method string) // before a notification's handler
	beforeLoad  func(root string)   // before a root file's model is computed
	beforeCheck func(root string)   // before a root file's checks and estimate run
	onPublish   func(path string, version int32, full bool, n int)
	onAnalysed  func(snapID uint64) // quick checks and estimates published
	onComplete  func(snapID uint64) // complete checks published
	onEstimate  func(root string, tilt bool)
	syntaxFirst bool // every open root gets a syntax stage, however cheap
}

type clientCaps struct {
	watchDynamic   bool
	configDynamic  bool
	configPull     bool // answers workspace/configuration
	relatedInfo    bool
	hierarchicalDS bool
	hoverPlain     bool // the client declares hover content formats and Markdown is not among them
	inlayRefresh   bool // the client answers workspace/inlayHint/refresh
}

type pubState struct {
	version int32
	key     string
}

// Serve runs a session over rwc until the client sends exit or closes the
// stream, and returns the process exit status: 0 after shutdown then exit, 1
// when the session ended without shutdown.
func Serve(ctx context.Context, rwc io.ReadWriteCloser, opts Options) int {
	s := newServer(opts)
	return s.run(ctx, rwc)
}

func newServer(opts Options) *Server {
	logw := opts.Log
	if logw == nil {
		logw = os.Stderr
	}
	s := &Server{
		opts:      opts,
		logw:      logw,
		docs:      map[string]*document{},
		inflight:  map[jsonrpc2.ID]context.CancelFunc{},
		lastEst:   map[string]*estimates{},
		checkCost: map[string]time.Duration{},
		modelCost: map[string]time.Duration{},
		published: map[string]pubState{},
		settings:  DefaultSettings(),
		work:      make(chan struct{}, 1),
		slowWork:  make(chan struct{}, 1),
		exit:      make(chan int, 1),
		done:      make(chan struct{}),
	}
	s.out.cond = sync.NewCond(&s.out.mu)
	return s
}

func (s *Server) run(ctx context.Context, rwc io.ReadWriteCloser) int {
	ctx, cancel := context.WithCancel(ctx)
	defer cancel()
	stream := newGuardedStream(rwc, s.logf)
	s.conn = jsonrpc2.NewConn(stream, jsonrpc2.WithCodec(codec{}))
	s.mu.Lock()
	s.snap = &snapshot{ctx: ctx, docs: map[string]*document{}, roots: map[string]*analysis{}, settings: s.settings, srv: s}
	s.mu.Unlock()
	go s.worker(ctx)
	go s.slowWorker(ctx)
	go s.guideWorker(ctx)
	go s.out.run(s)
	defer s.out.close()
	s.conn.Go(ctx, s.handle)
	code := 1
	select {
	case code = <-s.exit:
	case <-s.conn.Done():
		s.mu.Lock()
		if s.shutdown {
			code = 0
		}
		s.mu.Unlock()
		if err := s.conn.Err(); err != nil {
			s.logf("connection ended: %v", err)
		}
	case <-ctx.Done():
	}
	close(s.done)
	cancel()
	// Closing the connection waits for its reader, which may be blocked on a
	// stream only the client can end (standard input stays open after
	// exit): close in the background and return at once.
	go func() {
		rwc.Close()
		s.conn.Close()
	}()
	return code
}

func (s *Server) logf(format string, args ...any) {
	s.logM.Lock()
	defer s.logM.Unlock()
	fmt.Fprintf(s.logw, "circa serve: "+format+"\n", args...)
}

// codec marshals protocol payloads with the protocol package, which knows its
// union types.
type codec struct{}

func (codec) Marshal(v any) ([]byte, error) {
	if r, ok := v.(jsonrpc2.RawMessage); ok {
		return r, nil
	}
	return protocol.Marshal(v)
}

func (codec) Unmarshal(data []byte, v any) error {
	if p, ok := v.(*jsonrpc2.RawMessage); ok {
		*p = append(jsonrpc2.RawMessage(nil), data...)
		return nil
	}
	return protocol.Unmarshal(data, v)
}
