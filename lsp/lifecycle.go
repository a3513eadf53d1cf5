package lsp

import (
	"context"
	"runtime/debug"
	"slices"

	"go.lsp.dev/jsonrpc2"
	"go.lsp.dev/protocol"

	"circa/lang"
)

func (s *Server) initialize(params []byte) (any, error) {
	p, err := decode[protocol.InitializeParams](params)
	if err != nil {
		return nil, err
	}
	s.mu.Lock()
	defer s.mu.Unlock()
	if s.initialized {
		return nil, jsonrpc2.NewError(jsonrpc2.InvalidRequest, "initialize was already sent")
	}
	var offered []protocol.PositionEncodingKind
	if g := p.Capabilities.General; g != nil {
		offered = g.PositionEncodings
	}
	enc, kind := negotiateEncoding(offered)
	s.enc = enc
	if w := p.Capabilities.Workspace; w != nil {
		if w.DidChangeWatchedFiles != nil && w.DidChangeWatchedFiles.DynamicRegistration != nil {
			s.caps.watchDynamic = *w.DidChangeWatchedFiles.DynamicRegistration
		}
		if w.Configuration != nil {
			s.caps.configPull = *w.Configuration
		}
		if w.InlayHint != nil && w.InlayHint.RefreshSupport != nil {
			s.caps.inlayRefresh = *w.InlayHint.RefreshSupport
		}
	}
	if t := p.Capabilities.TextDocument; t != nil && t.DocumentSymbol != nil && t.DocumentSymbol.HierarchicalDocumentSymbolSupport != nil {
		s.caps.hierarchicalDS = *t.DocumentSymbol.HierarchicalDocumentSymbolSupport
	}
	if t := p.Capabilities.TextDocument; t != nil && t.Hover != nil && len(t.Hover.ContentFormat) > 0 {
		s.caps.hoverPlain = !slices.Contains(t.Hover.ContentFormat, protocol.MarkupKindMarkdown)
	}
	if len(p.InitializationOptions) > 0 {
		set, err := parseSettings(p.InitializationOptions, s.settings)
		if err != nil {
			s.logf("initializationOptions: %v", err)
		}
		s.settings = set
	}
	s.initialized = true
	s.snap.settings = s.settings
	s.snap.enc = s.enc
	return &protocol.InitializeResult{Capabilities: capabilities(kind), ServerInfo: protocol.ServerInfo{Name: "circa", Version: protocol.NewOptional(version())}}, nil
}

// negotiateEncoding picks the position encoding among those the client
// offers: UTF-8 (the text's own), else UTF-32, else the protocol's default
// UTF-16, which every client supports.
func negotiateEncoding(offered []protocol.PositionEncodingKind) (lang.Encoding, protocol.PositionEncodingKind) {
	for _, want := range []struct {
		kind protocol.PositionEncodingKind
		enc  lang.Encoding
	}{{protocol.PositionEncodingKindUTF8, lang.UTF8}, {protocol.PositionEncodingKindUTF32, lang.UTF32}} {
		for _, e := range offered {
			if e == want.kind {
				return want.enc, want.kind
			}
		}
	}
	return lang.UTF16, protocol.PositionEncodingKindUTF16
}

func version() string {
	if bi, ok := debug.ReadBuildInfo(); ok && bi.Main.Version != "" {
		return bi.Main.Version
	}
	return "(devel)"
}

func capabilities(enc protocol.PositionEncodingKind) protocol.ServerCapabilities {
	yes := true
	incr := protocol.TextDocumentSyncKindIncremental
	return protocol.ServerCapabilities{
		PositionEncoding: enc,
		// The text on save lets the server check its copy against the
		// editor's and take the editor's when they differ.
		TextDocumentSync: &protocol.TextDocumentSyncOptions{OpenClose: &yes, Change: &incr, Save: &protocol.SaveOptions{IncludeText: &yes}},
		CompletionProvider: &protocol.CompletionOptions{
			TriggerCharacters: []string{" ", "(", ","},
		},
		HoverProvider:                   protocol.Boolean(true),
		DefinitionProvider:              protocol.Boolean(true),
		ReferencesProvider:              protocol.Boolean(true),
		DocumentSymbolProvider:          protocol.Boolean(true),
		WorkspaceSymbolProvider:         protocol.Boolean(true),
		DocumentFormattingProvider:      protocol.Boolean(true),
		DocumentRangeFormattingProvider: protocol.Boolean(true),
		RenameProvider:                  &protocol.RenameOptions{PrepareProvider: &yes},
		CodeActionProvider:              &protocol.CodeActionOptions{CodeActionKinds: []protocol.CodeActionKind{protocol.CodeActionKindQuickFix}},
		FoldingRangeProvider:            protocol.Boolean(true),
		InlayHintProvider:               protocol.Boolean(true),
		SemanticTokensProvider: &protocol.SemanticTokensOptions{
			Legend: protocol.SemanticTokensLegend{TokenTypes: tokenTypes, TokenModifiers: tokenModifiers},
			Full:   protocol.Boolean(true),
		},
	}
}

// initializedNotification asks for the settings when the client answers
// workspace/configuration, and registers the file watcher for included
// files when the client can take a dynamic registration.
func initializedNotification(ctx context.Context, s *Server, _ []byte) error {
	s.pullSettings(ctx)
	s.mu.Lock()
	dyn := s.caps.watchDynamic
	s.mu.Unlock()
	if !dyn {
		return nil
	}
	opts, err := protocol.Marshal(protocol.DidChangeWatchedFilesRegistrationOptions{
		Watchers: []protocol.FileSystemWatcher{{GlobPattern: protocol.Pattern("**/*.loop")}, {GlobPattern: protocol.Pattern("**/*.csv")}},
	})
	if err != nil {
		return err
	}
	params := &protocol.RegistrationParams{Registrations: []protocol.Registration{{
		ID: "circa-watch", Method: "workspace/didChangeWatchedFiles", RegisterOptions: opts,
	}}}
	// A call back to the client must not wait on the read loop that runs
	// this notification.
	cctx := jsonrpc2.DetachContext(ctx)
	go func() {
		if _, err := s.conn.Call(cctx, "client/registerCapability", params, nil); err != nil {
			s.logf("registering the file watcher: %v", err)
		}
	}()
	return nil
}
