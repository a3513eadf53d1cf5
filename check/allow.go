package check

import (
	"sort"
	"strings"

	"circa/lang"
)

// Silencer rules: "# allow: RULE" comments that do nothing.

func init() {
	Register(&Rule{ID: "unused-allow", Category: CategoryAllow, Severity: lang.Warning,
		Summary:   "an allow comment that silenced nothing",
		Rationale: "A silencer outlives the finding it was written for; left in place it would hide the next, unrelated finding of that rule on the line.",
		Example:   "pipe p from a to b { length 1 m; bore 8 mm }   # allow: rough-wall",
		Fix:       "Delete the comment (the suggested fix does). Language errors (syntax, units, names) cannot be silenced.",
	})
	Register(&Rule{ID: "unknown-rule", Category: CategoryAllow, Severity: lang.Warning,
		Summary:   "an allow comment naming no known rule",
		Rationale: "A misspelt rule name silences nothing, so the finding it was meant for still shows, or a later one is not silenced as intended.",
		Example:   "pipe p from a to b { length 1 m; bore 8 mm }   # allow: duplicate-branches",
		Fix:       "Use a rule identifier from \"circa explain\"; the suggested fix picks the closest one.",
	})
	Register(&Rule{ID: "internal", Category: CategoryInternal, Severity: lang.Error,
		Summary:   "the checker failed on this input",
		Rationale: "A rule stopped with an internal error; the other rules still ran. This is a defect of the checker, not of the file.",
		Example:   "(none: any input that makes a rule fail)",
		Fix:       "Report the file that causes it.",
	})
}

// allowFindings reports the silencers that silenced nothing. ran says which
// rules ran: a silencer for a disabled or skipped rule is left alone.
func allowFindings(m *lang.Model, opts Options, ran map[string]bool) []lang.Diagnostic {
	var ids []string
	for _, r := range Rules() {
		ids = append(ids, r.ID)
	}
	sort.Strings(ids)
	var out []lang.Diagnostic
	for _, a := range m.Allows {
		if a.Used {
			continue
		}
		loc := lang.Location{File: a.File, Span: a.Span}
		r, known := Lookup(a.Rule)
		switch {
		case !known:
			if !ran["unknown-rule"] {
				continue
			}
			d := lang.Diagnostic{Rule: "unknown-rule", Severity: lang.Warning, Loc: loc, Format: "no rule is called %q", Args: []any{a.Rule}}
			if s := lang.Closest(a.Rule, ids); s != "" {
				d.Format, d.Args = "no rule is called %q: did you mean %s?", []any{a.Rule, s}
				d.Fixes = []lang.Fix{{Title: "use " + s, Edits: []lang.Edit{{Loc: loc, NewText: s}}}}
			}
			out = append(out, sev(d, opts))
		case !ran["unused-allow"]:
		case r.Category == CategoryLanguage:
			d := lang.Diagnostic{Rule: "unused-allow", Severity: lang.Warning, Loc: loc, Format: "%s is a language error and cannot be silenced", Args: []any{a.Rule}}
			d.Fixes = removeAllow(m, a)
			out = append(out, sev(d, opts))
		case ran[a.Rule]:
			d := lang.Diagnostic{Rule: "unused-allow", Severity: lang.Warning, Loc: loc, Format: "allow: %s silences nothing on this line", Args: []any{a.Rule}}
			d.Fixes = removeAllow(m, a)
			out = append(out, sev(d, opts))
		}
	}
	return out
}

func sev(d lang.Diagnostic, opts Options) lang.Diagnostic {
	if s, ok := opts.Severity[d.Rule]; ok {
		d.Severity = s
	}
	return d
}

// removeAllow returns a fix that deletes a silencer: the whole comment when
// it names one rule, else the rule's name and its comma.
func removeAllow(m *lang.Model, a *lang.Allow) []lang.Fix {
	f := m.Files[a.File]
	if f == nil {
		return nil
	}
	var com *lang.Comment
	for i := range f.Comments {
		if c := &f.Comments[i]; c.Span.Start <= a.Span.Start && a.Span.End <= c.Span.End {
			com = c
			break
		}
	}
	if com == nil {
		return nil
	}
	n := 0
	for _, b := range m.Allows {
		if b.File == a.File && com.Span.Start <= b.Span.Start && b.Span.End <= com.Span.End {
			n++
		}
	}
	src := f.Src
	var span lang.Span
	if n == 1 {
		// The comment and the blanks before it.
		s := com.Span.Start
		for s > 0 && (src[s-1] == ' ' || src[s-1] == '\t') {
			s--
		}
		span = lang.Span{Start: s, End: com.Span.End}
	} else {
		s, e := a.Span.Start, a.Span.End
		// "a, b": drop the name and the following comma and blanks; for the
		// last name drop the comma before it.
		j := e
		for j < com.Span.End && (src[j] == ' ' || src[j] == '\t') {
			j++
		}
		if j < com.Span.End && src[j] == ',' {
			j++
			for j < com.Span.End && (src[j] == ' ' || src[j] == '\t') {
				j++
			}
			span = lang.Span{Start: s, End: j}
		} else {
			i := s
			for i > com.Span.Start && (src[i-1] == ' ' || src[i-1] == '\t') {
				i--
			}
			if i > com.Span.Start && src[i-1] == ',' {
				i--
			}
			span = lang.Span{Start: i, End: e}
		}
	}
	if strings.TrimSpace(string(src[span.Start:span.End])) == "" {
		return nil
	}
	return []lang.Fix{{Title: "remove the silencer for " + a.Rule, Edits: []lang.Edit{{Loc: lang.Location{File: a.File, Span: span}}}}}
}

// The language's own findings, documented for "circa explain" and SARIF.
func init() {
	for _, r := range []struct{ id, summary, rationale, example, fix string }{
		{"syntax", "text that does not parse", "A statement that does not follow the grammar cannot be read; the rest of the file is still checked.", "pipe p from a { length 1 m }", "Follow the statement's form shown in the message."},
		{"unit", "a missing, unknown or wrong-dimension unit", "Every dimensional number needs a unit of the right dimension; bare numbers are ratios only.", "bore 8 kg", "Write the value with a unit of the dimension the field needs."},
		{"unknown-name", "a name that is not declared", "A misspelt node, component, part, parameter or fluid name leaves the loop wrong.", "pipe p from a to bb { ... }", "Use the suggested name or declare it."},
		{"unknown-field", "a statement word that is not a field here", "Misspelt fields would otherwise be silently ignored.", "pipe p from a to b { lenght 1 m }", "Use the suggested field."},
		{"field-not-allowed", "a field given to a kind of component it does not apply to", "The field would have no effect on this kind.", "pipe p from a to b { conductance 10 W/K }", "Move the field to the right component or delete it."},
		{"conflicting-fields", "fields that cannot be given together", "Two fields say the same thing in different ways and may disagree.", "(see the message)", "Keep one of them."},
		{"missing-field", "a required field is missing", "The loop cannot be estimated without it (for example its working fluid).", "loop l { node a }", "Add the field named in the message."},
		{"missing-value", "a field without its value", "A field written without a value says nothing.", "length", "Write the value."},
		{"model-range", "a value far outside what the estimate is built for", "Magnitudes past 1e12 in SI units (a terawatt, a thousand kilometres) overflow the estimate's arithmetic into meaningless numbers; no passive loop comes near them.", "conductance 1e308 W/K", "Check the value and its unit."},
		{"bad-value", "a value outside its allowed range", "The value cannot be used as given.", "methods { cells 2 }", "Use a value in the range the message gives."},
		{"bad-table", "a table file that cannot be read as written", "A manoeuvre profile's CSV file names each column with its unit in the header and holds numbers only; a wrong unit or a stray cell would make every instant's attitude or acceleration wrong, so nothing is estimated from it.", "profile \"braking.csv\"   # header: time (s), pitch (m)", "Fix the line and column the message names."},
		{"duplicate-name", "a name declared twice", "References to the name would be ambiguous.", "node a\nnode a", "Rename one of them."},
		{"duplicate-nominal", "more than one case marked nominal", "Exactly one case is the nominal one.", "case a nominal { }\ncase b nominal { }", "Mark one case nominal."},
		{"wrong-kind", "a name of the wrong kind of component", "Heat goes to evaporators, sinks to condensers.", "case c { heat coil 1 kW }   # coil is a condenser", "Name a component of the right kind."},
		{"param-cycle", "a parameter defined in terms of itself", "Its value cannot be computed.", "param a = b\nparam b = a", "Break the cycle."},
		{"include-cycle", "files that include each other", "The include chain would never end.", "include \"self.loop\"", "Remove one include."},
		{"include-unreadable", "an included file that cannot be read", "Its parts and parameters are missing.", "include \"missing.loop\"", "Fix the path (relative to the including file)."},
		{"file-unreadable", "a file that cannot be read", "Nothing can be checked.", "circa check missing.loop", "Fix the path or the permissions."},
	} {
		Register(&Rule{ID: r.id, Category: CategoryLanguage, Severity: lang.Error, Summary: r.summary, Rationale: r.rationale, Example: r.example, Fix: r.fix})
	}
	Register(&Rule{ID: "unusual-value", Category: CategoryLanguage, Severity: lang.Warning,
		Summary:   "a possible value that is unusual for its field",
		Rationale: "A limit ratio below 1 makes the check weaker than the estimate it guards, which is seldom meant.",
		Example:   "limits { chf_ratio 0.8 }",
		Fix:       "Check the value; a ratio of 1.5 to 2 or more is common practice."})
}
