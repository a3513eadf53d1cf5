package lsp

import (
	"context"

	"circa/lang"
)

// estimates are the checker's results for one analysis that hover and inlay
// hints show.
type estimates struct {
}

// checkModel runs the same checks as the command line.
func checkModel(ctx context.Context, m *lang.Model) ([]lang.Diagnostic, *estimates) {
	if ctx.Err() != nil {
		return nil, nil
	}
	return nil, &estimates{}
}

// componentEstimate renders a component's estimated state in the nominal case.
func (s *Server) componentEstimate(c *cursor, comp *lang.Component) string { return "" }

// caseEstimate renders a case's worst margin.
func (s *Server) caseEstimate(c *cursor, cs *lang.Case) string { return "" }

func estimatedSaturation(c *cursor, l *lang.Loop) (float64, bool) { return 0, false }

func ruleText(id string) (string, bool) { return "", false }

// estimatesFor returns the finished estimates of an analysis, else the
// latest finished ones for the same root.
func (s *Server) estimatesFor(sn *snapshot, a *analysis) *estimates {
	if _, est, ok := a.checks(); ok {
		return est
	}
	s.mu.Lock()
	defer s.mu.Unlock()
	if prev := s.lastEst[a.root]; prev != nil {
		_, est, _ := prev.checks()
		return est
	}
	return nil
}

func componentHint(est *estimates, c *lang.Component) string { return "" }
