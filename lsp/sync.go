package lsp

import (
	"context"
	"encoding/json"
	"fmt"
	"maps"

	"go.lsp.dev/protocol"
	"go.lsp.dev/uri"

	"circa/lang"
)

func didOpen(_ context.Context, s *Server, params []byte) error {
	p, err := decode[protocol.DidOpenTextDocumentParams](params)
	if err != nil {
		return err
	}
	path := pathOf(p.TextDocument.URI)
	d := newDocument(p.TextDocument.URI, path, p.TextDocument.Version, []byte(p.TextDocument.Text))
	s.mu.Lock()
	defer s.mu.Unlock()
	docs := maps.Clone(s.snap.docs)
	docs[path] = d
	s.changeLocked(docs, []string{path}, false)
	return nil
}

func didChange(_ context.Context, s *Server, params []byte) error {
	p, err := decode[protocol.DidChangeTextDocumentParams](params)
	if err != nil {
		return err
	}
	path := pathOf(p.TextDocument.URI)
	s.mu.Lock()
	defer s.mu.Unlock()
	old, ok := s.snap.docs[path]
	if !ok {
		s.logf("change to %s, which is not open; ignored", path)
		return nil
	}
	text, inSync := applyChanges(old, p.ContentChanges, s.enc)
	d := newDocument(old.uri, path, p.TextDocument.Version, text)
	d.editedFrom(old)
	if !inSync {
		s.logf("%s is out of sync: ignoring an edit until the editor sends the whole text", path)
		d.version, d.outOfSync, d.clientVersion = old.version, true, p.TextDocument.Version
	}
	docs := maps.Clone(s.snap.docs)
	docs[path] = d
	s.changeLocked(docs, []string{path}, false)
	return nil
}

// applyChanges applies content changes in order; each range is read in the
// text as left by the changes before it. A document out of sync takes no
// incremental change until a whole-text change brings it back; inSync says
// whether the result matches the client's text.
func applyChanges(d *document, changes []protocol.TextDocumentContentChangeEvent, enc lang.Encoding) (text []byte, inSync bool) {
	text, inSync = d.text, !d.outOfSync
	m := d.mapper
	for _, c := range changes {
		switch c := c.(type) {
		case *protocol.TextDocumentContentChangeWholeDocument:
			text, inSync = []byte(c.Text), true
		case *protocol.TextDocumentContentChangePartial:
			if !inSync {
				continue
			}
			sp := m.RangeOffsets(toPos(c.Range.Start), toPos(c.Range.End), enc)
			out := make([]byte, 0, len(text)-(sp.End-sp.Start)+len(c.Text))
			out = append(out, text[:sp.Start]...)
			out = append(out, c.Text...)
			out = append(out, text[sp.End:]...)
			text = out
		default:
			continue
		}
		if len(changes) > 1 {
			m = lang.NewMapper(text)
		}
	}
	return text, inSync
}

// didSave compares the saved text, which the server asks clients to
// include, with the server's copy: a document out of sync, or one that
// differs, takes the saved text.
func didSave(_ context.Context, s *Server, params []byte) error {
	p, err := decode[protocol.DidSaveTextDocumentParams](params)
	if err != nil || p.Text == nil {
		return err
	}
	path := pathOf(p.TextDocument.URI)
	s.mu.Lock()
	defer s.mu.Unlock()
	old, ok := s.snap.docs[path]
	if !ok || (!old.outOfSync && string(old.text) == *p.Text) {
		return nil
	}
	version := old.version
	if old.outOfSync {
		version = old.clientVersion
		s.logf("%s: in sync again with the saved text", path)
	} else {
		s.logf("%s: the saved text differs from the server's copy; taking the saved text", path)
		s.clientLog(protocol.MessageTypeWarning, fmt.Sprintf("circa: the server's copy of %s differed from the editor's; it now has the saved text", path))
	}
	docs := maps.Clone(s.snap.docs)
	saved := newDocument(old.uri, path, version, []byte(*p.Text))
	saved.editedFrom(old)
	docs[path] = saved
	s.changeLocked(docs, []string{path}, false)
	return nil
}

// notificationPanicked logs a panic recovered in a notification handler,
// to standard error and to the client. When the notification opened or
// changed a document, the document is marked out of sync: the server no
// longer knows the editor's text, so it publishes one finding saying so
// instead of findings about a text the editor does not show, refuses
// requests that would edit it, and takes the text again from the next
// didOpen, whole-text change or didSave.
func (s *Server) notificationPanicked(method string, params []byte, r any, stack []byte) {
	s.logf("%s panicked: %v\n%s", method, r, stack)
	msg := fmt.Sprintf("circa: internal error in %s: %v", method, r)
	if method == "textDocument/didOpen" || method == "textDocument/didChange" {
		var p struct {
			TextDocument struct {
				URI     uri.URI `json:"uri"`
				Version int32   `json:"version"`
			} `json:"textDocument"`
		}
		if json.Unmarshal(params, &p) == nil && p.TextDocument.URI != "" {
			path := s.markOutOfSync(p.TextDocument.URI, p.TextDocument.Version)
			msg += fmt.Sprintf("; the server's copy of %s may differ from the editor's until the file is saved or reopened", path)
		}
	}
	s.clientLog(protocol.MessageTypeError, msg)
}

// markOutOfSync marks an open document out of sync, or opens an empty one
// marked so when the document did not open.
func (s *Server) markOutOfSync(u uri.URI, clientVersion int32) string {
	path := pathOf(u)
	defer func() {
		if r := recover(); r != nil {
			s.logf("marking %s out of sync panicked: %v", path, r)
		}
	}()
	s.mu.Lock()
	defer s.mu.Unlock()
	d := newDocument(u, path, clientVersion, nil)
	if old, ok := s.snap.docs[path]; ok {
		d = newDocument(u, path, old.version, old.text)
	}
	d.outOfSync, d.clientVersion = true, clientVersion
	docs := maps.Clone(s.snap.docs)
	docs[path] = d
	s.changeLocked(docs, []string{path}, false)
	return path
}

// outOfSyncDiag is the one finding published for a document out of sync.
func outOfSyncDiag(d *document) protocol.Diagnostic {
	return protocol.Diagnostic{
		Severity: protocol.DiagnosticSeverityError,
		Code:     protocol.String("out-of-sync"),
		Source:   protocol.NewOptional("circa"),
		Message: protocol.String(fmt.Sprintf("circa lost track of the edits to this file after version %d (an internal error, logged), "+
			"so it shows no findings for it: save the file, or close and reopen it, to send the text again", d.version)),
	}
}

// editsText names the requests whose answers edit documents; they are
// refused while a document is out of sync, as their edits would be
// computed on a text the editor does not have.
var editsText = map[string]bool{
	"textDocument/formatting":      true,
	"textDocument/rangeFormatting": true,
	"textDocument/rename":          true,
	"textDocument/codeAction":      true,
	"textDocument/completion":      true,
}

// outOfSyncDoc returns an open document that is out of sync, if any.
func (sn *snapshot) outOfSyncDoc() *document {
	for _, d := range sn.docs {
		if d.outOfSync {
			return d
		}
	}
	return nil
}

// clientLog sends a window/logMessage without waiting on the client.
func (s *Server) clientLog(typ protocol.MessageType, msg string) {
	if s.conn == nil {
		return // a server driven without a connection, in tests
	}
	go func() {
		if err := s.conn.Notify(context.Background(), "window/logMessage", &protocol.LogMessageParams{Type: typ, Message: msg}); err != nil {
			s.logf("logging to the client: %v", err)
		}
	}()
}

func didClose(_ context.Context, s *Server, params []byte) error {
	p, err := decode[protocol.DidCloseTextDocumentParams](params)
	if err != nil {
		return err
	}
	path := pathOf(p.TextDocument.URI)
	s.mu.Lock()
	defer s.mu.Unlock()
	if _, ok := s.snap.docs[path]; !ok {
		return nil
	}
	docs := maps.Clone(s.snap.docs)
	delete(docs, path)
	s.disk.forget(path)
	s.changeLocked(docs, []string{path}, false)
	return nil
}

func didChangeWatchedFiles(_ context.Context, s *Server, params []byte) error {
	p, err := decode[protocol.DidChangeWatchedFilesParams](params)
	if err != nil {
		return err
	}
	var changed []string
	for _, ev := range p.Changes {
		path := pathOf(ev.URI)
		s.disk.forget(path)
		changed = append(changed, path)
	}
	if len(changed) == 0 {
		return nil
	}
	s.mu.Lock()
	defer s.mu.Unlock()
	s.changeLocked(s.snap.docs, changed, false)
	return nil
}

func didChangeConfiguration(ctx context.Context, s *Server, params []byte) error {
	p, err := decode[protocol.DidChangeConfigurationParams](params)
	if err != nil {
		return err
	}
	if emptySettings(p.Settings) {
		// A client that answers workspace/configuration often sends no
		// settings with the notification: ask for them.
		s.pullSettings(ctx)
		return nil
	}
	s.mu.Lock()
	defer s.mu.Unlock()
	s.pullSeq++ // an answer to an earlier pull is older than these settings
	set, err := parseSettings(p.Settings, s.settings)
	s.settings = set
	s.changeLocked(s.snap.docs, nil, true)
	return err
}

func toPos(p protocol.Position) lang.Position {
	return lang.Position{Line: int(p.Line), Col: int(p.Character)}
}
