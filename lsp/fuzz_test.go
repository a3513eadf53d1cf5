package lsp

import (
	"context"
	"encoding/json"
	"io"
	"reflect"
	"strings"
	"testing"

	"go.lsp.dev/protocol"

	"circa/lang"
)

// fuzzInput reads decisions from fuzz data; past its end every byte is 0.
type fuzzInput struct {
	data []byte
}

func (in *fuzzInput) more() bool { return len(in.data) > 0 }

func (in *fuzzInput) byte() byte {
	if len(in.data) == 0 {
		return 0
	}
	b := in.data[0]
	in.data = in.data[1:]
	return b
}

// intn returns a number below n (n > 0), from up to two bytes.
func (in *fuzzInput) intn(n int) int {
	v := int(in.byte())
	if n > 256 {
		v = v<<8 | int(in.byte())
	}
	return v % n
}

// text returns up to n pieces: mostly the pieces of the property tests,
// sometimes a few raw bytes made valid UTF-8 (a client's text always is).
func (in *fuzzInput) text(n int) string {
	var b strings.Builder
	for range in.intn(n + 1) {
		c := in.byte()
		if c < 224 {
			b.WriteString(editPieces[int(c)%len(editPieces)])
			continue
		}
		raw := make([]byte, 1+int(c%4))
		for i := range raw {
			raw[i] = in.byte()
		}
		b.WriteString(strings.ToValidUTF8(string(raw), "\uFFFD"))
	}
	return b.String()
}

// position picks a position worth editing at in the shadow text, or now and
// then any line and column.
func (in *fuzzInput) position(ps []protocol.Position) protocol.Position {
	if in.byte()%8 == 0 {
		return protocol.Position{Line: uint32(in.byte() % 8), Character: uint32(in.byte())}
	}
	return ps[in.intn(len(ps))]
}

// newSyncServer is a server ready for document notifications, with the
// encoding set as initialize would, and no connection or workers: the
// notifications are handled by calling the dispatcher directly.
func newSyncServer(enc lang.Encoding) *Server {
	s := newServer(Options{Log: io.Discard, Debounce: -1})
	s.enc = enc
	s.initialized = true
	ctx, cancel := context.WithCancel(context.Background())
	s.snap = &snapshot{ctx: ctx, cancel: cancel, docs: map[string]*document{}, roots: map[string]*analysis{}, settings: s.settings, srv: s, enc: enc}
	return s
}

// FuzzDocumentSync sends a didOpen and a sequence of didChange
// notifications with random ranges and texts, in the encoding the first
// byte picks, through the server's notification dispatcher, and checks
// after each that the server's copy equals the text a client computes (the
// shadow, kept by clientText) and that nothing was recovered from a panic.
func FuzzDocumentSync(f *testing.F) {
	f.Add([]byte{1, 4, 0, 1, 2, 3})
	f.Add([]byte("\x01\x08typing at the end\x00\x00\xff\xff\x01"))
	f.Add([]byte{2, 6, 13, 14, 11, 12, 0, 3, 1, 2, 200, 7, 9})
	f.Add([]byte{0, 3, 11, 14, 11, 1, 1, 7, 0, 1, 2, 3, 4, 5, 6, 7, 8})
	f.Fuzz(func(t *testing.T, data []byte) {
		in := &fuzzInput{data: data}
		enc := allEncodings[in.byte()%3]
		s := newSyncServer(enc)
		const uri = "file:///fuzz/doc.loop"
		path := pathOf(uri)
		shadow := newClientText(in.text(24))
		params, _ := json.Marshal(map[string]any{"textDocument": map[string]any{"uri": uri, "languageId": "loop", "version": 1, "text": shadow.String()}})
		s.notify(context.Background(), "textDocument/didOpen", params)
		check := func(version int32, what string) {
			t.Helper()
			d := s.snap.docs[path]
			switch {
			case d == nil:
				t.Fatalf("%s: the document is not open", what)
			case d.outOfSync:
				t.Fatalf("%s: the document fell out of sync", what)
			case string(d.text) != shadow.String():
				t.Fatalf("enc %d, %s: the server holds %q, the client %q", enc, what, d.text, shadow.String())
			case d.version != version:
				t.Fatalf("%s: version %d, want %d", what, d.version, version)
			}
			last := shadow.lines[len(shadow.lines)-1]
			eof := lang.Position{Line: len(shadow.lines) - 1}
			for _, w := range charUnits(last.runes, enc) {
				eof.Col += w
			}
			if got := d.mapper.OffsetPosition(len(d.text), enc); got != eof {
				t.Fatalf("enc %d, %s: the end of the text is at %v, the client has it at %v", enc, what, got, eof)
			}
			// The tree parsed from the last version's is the text's.
			full := lang.Parse(path, d.text)
			if errs, ok := d.syntaxErrors(); !ok || !reflect.DeepEqual(errs, full.Errors) {
				t.Fatalf("%s: syntax errors %v, a full parse gives %v", what, errs, full.Errors)
			}
			if f := d.File(); f == nil || !reflect.DeepEqual(f.Stmts, full.Stmts) || !reflect.DeepEqual(f.Errors, full.Errors) || !reflect.DeepEqual(f.Comments, full.Comments) {
				t.Fatalf("%s: the document's tree differs from a full parse of %q", what, d.text)
			}
		}
		check(1, "didOpen")
		for ev := 0; ev < 16 && in.more(); ev++ {
			var changes []any
			for range 1 + in.intn(3) {
				if in.byte()%16 == 0 {
					text := in.text(12)
					changes = append(changes, map[string]any{"text": text})
					shadow = newClientText(text)
					continue
				}
				ps := shadow.positions(enc)
				rg := protocol.Range{Start: in.position(ps), End: in.position(ps)}
				reversed := rg.End.Line < rg.Start.Line || (rg.End.Line == rg.Start.Line && rg.End.Character < rg.Start.Character)
				if reversed && in.byte()%4 != 0 {
					rg.Start, rg.End = rg.End, rg.Start // mostly in order, as clients send them
				}
				text := in.text(4)
				changes = append(changes, map[string]any{"range": rg, "text": text})
				shadow.apply(rg, text, enc)
			}
			params, _ := json.Marshal(map[string]any{"textDocument": map[string]any{"uri": uri, "version": ev + 2}, "contentChanges": changes})
			s.notify(context.Background(), "textDocument/didChange", params)
			check(int32(ev+2), "didChange "+string(params))
		}
	})
}
