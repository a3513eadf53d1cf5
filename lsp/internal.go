package lsp

import (
	"fmt"
	"runtime/debug"

	"go.lsp.dev/protocol"

	"circa/check"
	"circa/lang"
)

// ruleInternal identifies the finding that stands in for the results of an
// analysis stage that failed with an internal error.
const ruleInternal = "internal-error"

// internalFinding is the one finding published, at the start of the file,
// for a stage of the analysis that panicked, so the editor shows that the
// findings are incomplete instead of keeping stale ones.
func internalFinding(root, stage string, r any) lang.Diagnostic {
	return lang.Diagnostic{
		Rule:     ruleInternal,
		Severity: lang.Error,
		Loc:      lang.Location{File: root},
		Format:   "circa hit an internal error while %s (logged): %v; the findings for this file are incomplete until the next edit",
		Args:     []any{stage, r},
	}
}

// recovered logs a panic recovered in an analysis stage, to standard error
// and to the client, and returns the finding that stands in for the stage's
// results.
func (s *Server) recovered(root, stage string, r any) lang.Diagnostic {
	if s == nil {
		return internalFinding(root, stage, r)
	}
	s.logf("%s: %s panicked: %v\n%s", root, stage, r, debug.Stack())
	s.clientLog(protocol.MessageTypeError, fmt.Sprintf("circa: internal error while %s for %s: %v", stage, root, r))
	return internalFinding(root, stage, r)
}

// failedModel is the model of a file whose loading panicked: no
// declarations, one finding.
func failedModel(root string, d lang.Diagnostic) *lang.Model {
	return &lang.Model{Root: root, Files: map[string]*lang.File{}, Diags: []lang.Diagnostic{d}}
}

// failedChecks are the checks' results when the checker or the estimate
// panicked: one finding, and an estimate that says it failed.
func failedChecks(d lang.Diagnostic, mode marginMode) ([]lang.Diagnostic, *estimates) {
	ds := []lang.Diagnostic{d}
	return ds, &estimates{
		report:  &check.Report{Diagnostics: ds},
		flowErr: fmt.Errorf("%s", d.Message()),
		tilt:    mode == marginsFull,
	}
}
