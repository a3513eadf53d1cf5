package output

import (
	"bytes"
	"encoding/json"
	"testing"

	"circa/check"
	"circa/lang"
)

// TestSARIFRuleIndex: each result's ruleIndex points at the driver's rule
// of its ruleId, and a finding of a rule the registry does not hold gets
// -1, SARIF 2.1.0's value for "not among the driver's rules" (§3.27.6, from memory;
// the schema's minimum and default),
// not the index of some other rule.
func TestSARIFRuleIndex(t *testing.T) {
	m := lang.LoadSource("x.loop", []byte("loop x {\n  fluid water\n}\n"), lang.OSFS{})
	fs := []Finding{
		{Diagnostic: lang.Diagnostic{Rule: "no-such-rule", Severity: lang.Warning, Loc: lang.Location{File: "x.loop"}, Format: "odd"}, Model: m},
		{Diagnostic: lang.Diagnostic{Rule: "syntax", Severity: lang.Error, Loc: lang.Location{File: "x.loop"}, Format: "bad"}, Model: m},
	}
	var b bytes.Buffer
	if err := SARIF(&b, fs); err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Runs []struct {
			Tool struct {
				Driver struct {
					Rules []struct {
						ID string `json:"id"`
					} `json:"rules"`
				} `json:"driver"`
			} `json:"tool"`
			Results []struct {
				RuleID    string `json:"ruleId"`
				RuleIndex int    `json:"ruleIndex"`
			} `json:"results"`
		} `json:"runs"`
	}
	if err := json.Unmarshal(b.Bytes(), &doc); err != nil || len(doc.Runs) != 1 || len(doc.Runs[0].Results) != 2 {
		t.Fatalf("SARIF log %v:\n%s", err, b.String())
	}
	run := doc.Runs[0]
	if len(run.Tool.Driver.Rules) != len(check.Rules()) {
		t.Errorf("driver lists %d rules, the registry %d", len(run.Tool.Driver.Rules), len(check.Rules()))
	}
	for _, r := range run.Results {
		switch {
		case r.RuleID == "no-such-rule" && r.RuleIndex != -1:
			t.Errorf("unregistered rule: ruleIndex %d, want -1", r.RuleIndex)
		case r.RuleID != "no-such-rule" && (r.RuleIndex < 0 || r.RuleIndex >= len(run.Tool.Driver.Rules) || run.Tool.Driver.Rules[r.RuleIndex].ID != r.RuleID):
			t.Errorf("result of %s has ruleIndex %d", r.RuleID, r.RuleIndex)
		}
	}
}
