package output

import (
	"encoding/json"
	"fmt"
	"io"
	"net/url"
	"os"
	"path/filepath"
	"strings"

	"circa/check"
	"circa/lang"
)

type sarifText struct {
	Text string `json:"text"`
}

type sarifRegion struct {
	StartLine   int `json:"startLine"`
	StartColumn int `json:"startColumn"`
	EndLine     int `json:"endLine"`
	EndColumn   int `json:"endColumn"`
}

type sarifArtifact struct {
	URI string `json:"uri"`
}

type sarifPhysical struct {
	ArtifactLocation sarifArtifact `json:"artifactLocation"`
	Region           *sarifRegion  `json:"region,omitempty"`
}

type sarifLocation struct {
	ID               *int          `json:"id,omitempty"`
	PhysicalLocation sarifPhysical `json:"physicalLocation"`
	Message          *sarifText    `json:"message,omitempty"`
}

type sarifReplacement struct {
	DeletedRegion   sarifRegion `json:"deletedRegion"`
	InsertedContent *sarifText  `json:"insertedContent,omitempty"`
}

type sarifChange struct {
	ArtifactLocation sarifArtifact      `json:"artifactLocation"`
	Replacements     []sarifReplacement `json:"replacements"`
}

type sarifFix struct {
	Description     sarifText     `json:"description"`
	ArtifactChanges []sarifChange `json:"artifactChanges"`
}

type sarifResult struct {
	RuleID           string          `json:"ruleId"`
	RuleIndex        int             `json:"ruleIndex"`
	Level            string          `json:"level"`
	Message          sarifText       `json:"message"`
	Locations        []sarifLocation `json:"locations"`
	RelatedLocations []sarifLocation `json:"relatedLocations,omitempty"`
	Fixes            []sarifFix      `json:"fixes,omitempty"`
}

type sarifRule struct {
	ID                   string    `json:"id"`
	ShortDescription     sarifText `json:"shortDescription"`
	FullDescription      sarifText `json:"fullDescription"`
	Help                 sarifText `json:"help"`
	DefaultConfiguration struct {
		Level string `json:"level"`
	} `json:"defaultConfiguration"`
	Properties struct {
		Category string `json:"category"`
	} `json:"properties"`
}

func sarifLevel(s lang.Severity) string {
	switch s {
	case lang.Error:
		return "error"
	case lang.Warning:
		return "warning"
	}
	return "note"
}

// sarifURI is a path relative to the working directory, as a URI reference.
func sarifURI(path string) string {
	if path == "<stdin>" {
		return "stdin"
	}
	p := path
	if abs, err := filepath.Abs(path); err == nil {
		if wd, err := os.Getwd(); err == nil {
			if rel, err := filepath.Rel(wd, abs); err == nil && !strings.HasPrefix(rel, "..") {
				p = rel
			} else {
				p = abs
			}
		}
	}
	u := url.URL{Path: filepath.ToSlash(p)}
	if filepath.IsAbs(p) {
		u.Scheme = "file"
	}
	return u.String()
}

func sregion(m *lang.Model, loc lang.Location) *sarifRegion {
	s, e, ok := Span(m, loc)
	if !ok {
		return nil
	}
	return &sarifRegion{s.Line, s.UTF16, e.Line, e.UTF16}
}

// sarifNotification is a tool execution notification: a path that could
// not be read.
type sarifNotification struct {
	Level     string          `json:"level"`
	Message   sarifText       `json:"message"`
	Locations []sarifLocation `json:"locations,omitempty"`
}

type sarifInvocation struct {
	ExecutionSuccessful        bool                `json:"executionSuccessful"`
	ToolExecutionNotifications []sarifNotification `json:"toolExecutionNotifications"`
}

// SARIF writes the findings as a SARIF 2.1.0 log with the rule registry as
// the driver's rules; columns count UTF-16 code units. The run's invocation
// says whether every path could be read, each one that could not being a
// tool execution notification.
func SARIF(w io.Writer, fs []Finding, problems ...Problem) error {
	rules := check.Rules()
	index := map[string]int{}
	srules := make([]sarifRule, 0, len(rules))
	for i, r := range rules {
		index[r.ID] = i
		sr := sarifRule{ID: r.ID, ShortDescription: sarifText{r.Summary}, FullDescription: sarifText{r.Rationale},
			Help: sarifText{fmt.Sprintf("%s\n\nExample:\n%s\n\nFix: %s", r.Rationale, r.Example, r.Fix)}}
		sr.DefaultConfiguration.Level = sarifLevel(r.Severity)
		sr.Properties.Category = r.Category
		srules = append(srules, sr)
	}
	results := []sarifResult{}
	for _, f := range fs {
		d := f.Diagnostic
		i, ok := index[d.Rule]
		if !ok {
			i = -1 // SARIF's "no rule of the driver's": index 0 would name another rule
		}
		res := sarifResult{RuleID: d.Rule, RuleIndex: i, Level: sarifLevel(d.Severity), Message: sarifText{d.Message()},
			Locations: []sarifLocation{{PhysicalLocation: sarifPhysical{sarifArtifact{sarifURI(d.Loc.File)}, sregion(f.Model, d.Loc)}}}}
		for k, r := range d.Related {
			id := k + 1
			res.RelatedLocations = append(res.RelatedLocations, sarifLocation{ID: &id,
				PhysicalLocation: sarifPhysical{sarifArtifact{sarifURI(r.Loc.File)}, sregion(f.Model, r.Loc)}, Message: &sarifText{r.Message}})
		}
		for _, fx := range d.Fixes {
			byFile := map[string][]sarifReplacement{}
			var order []string
			for _, e := range fx.Edits {
				reg := sregion(f.Model, e.Loc)
				if reg == nil {
					continue
				}
				if _, seen := byFile[e.Loc.File]; !seen {
					order = append(order, e.Loc.File)
				}
				rep := sarifReplacement{DeletedRegion: *reg}
				if e.NewText != "" {
					rep.InsertedContent = &sarifText{e.NewText}
				}
				byFile[e.Loc.File] = append(byFile[e.Loc.File], rep)
			}
			sf := sarifFix{Description: sarifText{fx.Title}}
			for _, file := range order {
				sf.ArtifactChanges = append(sf.ArtifactChanges, sarifChange{sarifArtifact{sarifURI(file)}, byFile[file]})
			}
			if len(sf.ArtifactChanges) > 0 {
				res.Fixes = append(res.Fixes, sf)
			}
		}
		results = append(results, res)
	}
	inv := sarifInvocation{ExecutionSuccessful: len(problems) == 0, ToolExecutionNotifications: []sarifNotification{}}
	for _, p := range problems {
		n := sarifNotification{Level: "error", Message: sarifText{p.Message}}
		if p.File != "" && p.File != "standard input" {
			n.Locations = []sarifLocation{{PhysicalLocation: sarifPhysical{ArtifactLocation: sarifArtifact{sarifURI(p.File)}}}}
		}
		inv.ToolExecutionNotifications = append(inv.ToolExecutionNotifications, n)
	}
	doc := map[string]any{
		"$schema": "https://docs.oasis-open.org/sarif/sarif/v2.1.0/errata01/os/schemas/sarif-schema-2.1.0.json",
		"version": "2.1.0",
		"runs": []any{map[string]any{
			"tool": map[string]any{"driver": map[string]any{
				"name":  "circa",
				"rules": srules,
			}},
			"columnKind":  "utf16CodeUnits",
			"invocations": []sarifInvocation{inv},
			"results":     results,
		}},
	}
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(doc)
}
