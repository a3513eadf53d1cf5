package lsp

import (
	"context"
	"encoding/json"
	"strings"

	"go.lsp.dev/jsonrpc2"
	"go.lsp.dev/protocol"
)

// settingsSection is the section the server asks the client for.
const settingsSection = "circa"

// pullSettings asks a client that answers workspace/configuration for the
// "circa" section and merges the answer over the current settings, as a
// pushed didChangeConfiguration would. It returns at once: the call runs
// on its own goroutine, since a call back to the client must not wait on
// the read loop that runs the notification asking for it. Only the latest
// pull's answer is applied.
func (s *Server) pullSettings(ctx context.Context) {
	s.mu.Lock()
	if !s.caps.configPull {
		s.mu.Unlock()
		return
	}
	s.pullSeq++
	seq := s.pullSeq
	s.mu.Unlock()
	section := settingsSection
	params := &protocol.ConfigurationParams{Items: []protocol.ConfigurationItem{{Section: &section}}}
	cctx := jsonrpc2.DetachContext(ctx)
	go func() {
		var raw jsonrpc2.RawMessage
		if _, err := s.conn.Call(cctx, "workspace/configuration", params, &raw); err != nil {
			s.logf("asking for the settings: %v", err)
			return
		}
		set, ok := s.pulledSettings(raw)
		if !ok {
			return
		}
		s.mu.Lock()
		defer s.mu.Unlock()
		if seq != s.pullSeq || s.shutdown {
			return // a newer pull is on its way, or the session is ending
		}
		merged, err := parseSettings(set, s.settings)
		if err != nil {
			s.logf("workspace/configuration: %v", err)
		}
		if merged.key() == s.settings.key() {
			return
		}
		s.settings = merged
		s.changeLocked(s.snap.docs, nil, true)
	}()
}

// pulledSettings picks the one section out of a workspace/configuration
// answer; an absent or null section leaves the settings as they are.
func (s *Server) pulledSettings(raw []byte) ([]byte, bool) {
	var items []json.RawMessage
	if err := json.Unmarshal(raw, &items); err != nil {
		s.logf("workspace/configuration: the answer is not a list: %v", err)
		return nil, false
	}
	if len(items) == 0 || emptySettings(items[0]) {
		return nil, false
	}
	return items[0], true
}

// emptySettings reports whether pushed or pulled settings carry nothing:
// missing, null or an empty object.
func emptySettings(raw []byte) bool {
	t := strings.TrimSpace(string(raw))
	if t == "" || t == "null" {
		return true
	}
	var obj map[string]json.RawMessage
	return json.Unmarshal(raw, &obj) == nil && len(obj) == 0
}
