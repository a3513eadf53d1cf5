package lsp

import (
	"context"
	"fmt"
	"runtime/debug"
	"strings"
	"time"

	"go.lsp.dev/jsonrpc2"
	"go.lsp.dev/protocol"
)

// slowRequest is the handling time past which a request is logged.
const slowRequest = 100 * time.Millisecond

// Error codes beyond JSON-RPC's own.
const (
	codeRequestCancelled jsonrpc2.Code = -32800
	codeRequestFailed    jsonrpc2.Code = -32803
)

// request is a call's handler: it runs on a snapshot taken when the call
// arrived, off the read loop, and returns the result.
type request func(ctx context.Context, s *Server, snap *snapshot, params []byte) (any, error)

// notification is handled in order on the read loop.
type notification func(ctx context.Context, s *Server, params []byte) error

var requests = map[string]request{
	"textDocument/hover":               hoverRequest,
	"textDocument/completion":          completionRequest,
	"textDocument/definition":          definitionRequest,
	"textDocument/references":          referencesRequest,
	"textDocument/prepareRename":       prepareRenameRequest,
	"textDocument/rename":              renameRequest,
	"textDocument/documentSymbol":      documentSymbolRequest,
	"workspace/symbol":                 workspaceSymbolRequest,
	"textDocument/formatting":          formattingRequest,
	"textDocument/rangeFormatting":     rangeFormattingRequest,
	"textDocument/codeAction":          codeActionRequest,
	"textDocument/semanticTokens/full": semanticTokensRequest,
	"textDocument/foldingRange":        foldingRangeRequest,
	"textDocument/inlayHint":           inlayHintRequest,
}

var notifications = map[string]notification{
	"initialized":                      initializedNotification,
	"textDocument/didOpen":             didOpen,
	"textDocument/didChange":           didChange,
	"textDocument/didClose":            didClose,
	"textDocument/didSave":             didSave,
	"workspace/didChangeWatchedFiles":  didChangeWatchedFiles,
	"workspace/didChangeConfiguration": didChangeConfiguration,
	"$/cancelRequest":                  cancelRequest,
	"$/setTrace":                       func(context.Context, *Server, []byte) error { return nil },
}

// handle is the connection's handler. Notifications never return an error:
// the connection treats a notification error as fatal.
func (s *Server) handle(ctx context.Context, req *jsonrpc2.Request) (result any, err error) {
	method := req.Method()
	if !req.IsCall() {
		s.notify(ctx, method, req.Params())
		return nil, nil
	}
	defer func() {
		if r := recover(); r != nil {
			s.logf("%s panicked: %v\n%s", method, r, debug.Stack())
			result, err = nil, jsonrpc2.Errorf(jsonrpc2.InternalError, "internal error in %s: %v", method, r)
		}
	}()
	switch method {
	case "initialize":
		return s.initialize(req.Params())
	case "shutdown":
		s.mu.Lock()
		ok := s.initialized
		s.shutdown = ok
		s.mu.Unlock()
		if !ok {
			return nil, jsonrpc2.NewError(jsonrpc2.ServerNotInitialized, "the server is not initialized")
		}
		return nil, nil
	}
	h, known := requests[method]
	s.mu.Lock()
	initialized, shutdown, snap := s.initialized, s.shutdown, s.snap
	s.mu.Unlock()
	switch {
	case !initialized:
		return nil, jsonrpc2.NewError(jsonrpc2.ServerNotInitialized, "the server is not initialized: send initialize first")
	case shutdown:
		return nil, jsonrpc2.NewError(jsonrpc2.InvalidRequest, "the server is shutting down")
	case !known:
		return nil, jsonrpc2.Errorf(jsonrpc2.MethodNotFound, "method not found: %s", method)
	case editsText[method]:
		if d := snap.outOfSyncDoc(); d != nil {
			return nil, jsonrpc2.Errorf(codeRequestFailed, "%s is out of sync with the editor; save it or reopen it first", d.path)
		}
	}
	// Copy what the handler needs before releasing the read loop; the
	// request's bytes belong to the transport.
	params := append([]byte(nil), req.Params()...)
	id := req.ID()
	rctx, cancel := context.WithCancel(jsonrpc2.DetachContext(ctx))
	s.mu.Lock()
	s.inflight[id] = cancel
	s.mu.Unlock()
	defer func() {
		s.mu.Lock()
		delete(s.inflight, id)
		s.mu.Unlock()
		cancel()
	}()
	jsonrpc2.Async(ctx)
	if s.beforeReply != nil {
		s.beforeReply(rctx, method)
	}
	start := time.Now()
	result, err = h(rctx, s, snap, params)
	if d := time.Since(start); d > slowRequest {
		s.logf("%s took %v", method, d.Round(time.Millisecond))
	}
	if rctx.Err() != nil {
		// The reply goes out on the request's own context, which the
		// cancellation did not touch.
		return nil, jsonrpc2.NewError(codeRequestCancelled, "request cancelled")
	}
	return result, err
}

func (s *Server) notify(ctx context.Context, method string, params []byte) {
	defer func() {
		if r := recover(); r != nil {
			s.notificationPanicked(method, params, r, debug.Stack())
		}
	}()
	if method == "exit" {
		s.mu.Lock()
		code := 1
		if s.shutdown {
			code = 0
		}
		s.mu.Unlock()
		select {
		case s.exit <- code:
		default:
		}
		return
	}
	h, ok := notifications[method]
	if !ok {
		if !strings.HasPrefix(method, "$/") {
			s.logf("ignoring unknown notification %s", method)
		}
		return
	}
	s.mu.Lock()
	ready := s.initialized && !s.shutdown
	s.mu.Unlock()
	if !ready && method != "$/cancelRequest" {
		s.logf("ignoring %s outside an initialized session", method)
		return
	}
	if s.beforeNote != nil {
		s.beforeNote(method)
	}
	if err := h(ctx, s, params); err != nil {
		s.logf("%s: %v", method, err)
	}
}

// decode reads params into a protocol type, answering -32602 when they do not fit.
func decode[T any](params []byte) (*T, error) {
	var v T
	if len(params) == 0 {
		return nil, jsonrpc2.NewError(jsonrpc2.InvalidParams, "missing params")
	}
	if err := protocol.Unmarshal(params, &v); err != nil {
		return nil, jsonrpc2.Errorf(jsonrpc2.InvalidParams, "invalid params: %v", err)
	}
	return &v, nil
}

func cancelRequest(_ context.Context, s *Server, params []byte) error {
	p, err := decode[protocol.CancelParams](params)
	if err != nil {
		return err
	}
	var id jsonrpc2.ID
	switch v := p.ID.(type) {
	case protocol.Integer:
		id = jsonrpc2.NewNumberID(int64(v))
	case protocol.String:
		id = jsonrpc2.NewStringID(string(v))
	default:
		return fmt.Errorf("cancel: unexpected id %v", p.ID)
	}
	s.mu.Lock()
	cancel := s.inflight[id]
	s.mu.Unlock()
	if cancel != nil {
		cancel()
	}
	return nil
}
