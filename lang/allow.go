// Silencing: "# allow: RULE" comments that suppress a rule on a line.

package lang

import "strings"

// allows collects "# allow: RULE" silencers from every file's comments.
func (r *resolver) allows() {
	for _, path := range r.m.Order {
		f := r.m.Files[path]
		for _, c := range f.Comments {
			body := strings.TrimSpace(strings.TrimPrefix(c.Text, "#"))
			if !strings.HasPrefix(body, "allow:") {
				continue
			}
			off := c.Span.Start + strings.Index(c.Text, "allow:") + len("allow:")
			line := f.Mapper.OffsetLine(c.Span.Start)
			// A list of rule names separated by commas; anything after the
			// list (a reason) is free text: "# allow: rule-a, rule-b because …".
			text := f.Src[:c.Span.End]
			p := off
			for {
				for p < len(text) && (text[p] == ' ' || text[p] == '\t') {
					p++
				}
				st := p
				for p < len(text) && isRuleChar(text[p]) {
					p++
				}
				if p == st {
					break
				}
				r.m.Allows = append(r.m.Allows, &Allow{File: path, Line: line, Rule: string(text[st:p]), Span: Span{st, p}})
				q := p
				for q < len(text) && (text[q] == ' ' || text[q] == '\t') {
					q++
				}
				if q >= len(text) || text[q] != ',' {
					break
				}
				p = q + 1
			}
		}
	}
}

func isRuleChar(c byte) bool {
	return c == '-' || c == '_' || (c >= '0' && c <= '9') || (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z')
}
