package flow

import (
	"strings"

	"circa/lang"
	"circa/units"
)

// ParamSet is a top-level parameter given another value for the run than
// its file's (lang.Model.With), so an estimate says it is a variant's.
type ParamSet struct {
	Param     string  `json:"param"`
	Dimension string  `json:"dimension"` // "length", "power", …
	Value     float64 `json:"value"`     // SI
	Written   string  `json:"written"`   // as given: "10 mm"
	// FileValue is the file's own value in SI, absent when the file's
	// expression is in error; FileWritten is that expression as written.
	FileValue   *float64 `json:"file_value,omitempty"`
	FileWritten string   `json:"file_written"`
}

// ParamsSet lists the parameters m was resolved with in place of its files'
// values, as an estimate of m reports them in Result.Set.
func ParamsSet(m *lang.Model) []ParamSet {
	var out []ParamSet
	for _, o := range m.Overrides {
		p := ParamSet{Param: o.Name, Dimension: dimension(o.Value.Dim), Value: o.Value.SI, Written: o.Written(), FileWritten: o.FileText}
		if o.File.Set {
			v := o.File.SI
			p.FileValue = &v
		}
		out = append(out, p)
	}
	return out
}

// dimension names a dimension without its article: "length".
func dimension(d units.Dim) string {
	n := units.Name(d)
	if a, rest, ok := strings.Cut(n, " "); ok && (a == "a" || a == "an") {
		return rest
	}
	return n
}
