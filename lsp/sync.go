package lsp

import (
	"context"
	"maps"

	"go.lsp.dev/protocol"

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
	text := applyChanges(old, p.ContentChanges, s.enc)
	docs := maps.Clone(s.snap.docs)
	docs[path] = newDocument(old.uri, path, p.TextDocument.Version, text)
	s.changeLocked(docs, []string{path}, false)
	return nil
}

// applyChanges applies content changes in order; each range is read in the
// text as left by the changes before it.
func applyChanges(d *document, changes []protocol.TextDocumentContentChangeEvent, enc lang.Encoding) []byte {
	text := d.text
	m := d.mapper
	for _, c := range changes {
		switch c := c.(type) {
		case *protocol.TextDocumentContentChangeWholeDocument:
			text = []byte(c.Text)
		case *protocol.TextDocumentContentChangePartial:
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
	return text
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
