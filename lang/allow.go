// Silencing: "# allow: RULE" comments that suppress a rule on a line.

package lang

import "strings"

// allows collects "# allow: RULE" silencers from every file's comments.
func (r *resolver) allows() {
	for _, path := range r.m.Order {
		f := r.m.Files[path]
		for _, c := range f.Comments {
			if !isAllowComment(c.Text) {
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

// isAllowComment reports whether the comment text (with its '#') is a
// silencer.
func isAllowComment(text string) bool {
	return strings.HasPrefix(strings.TrimSpace(strings.TrimPrefix(text, "#")), "allow:")
}

// allowComments returns the silencers of cs: cs itself when all are, else
// a copy holding them alone (nil for none).
func allowComments(cs []Comment) []Comment {
	n := 0
	for _, c := range cs {
		if isAllowComment(c.Text) {
			n++
		}
	}
	if n == len(cs) {
		return cs
	}
	if n == 0 {
		return nil
	}
	out := make([]Comment, 0, n)
	for _, c := range cs {
		if isAllowComment(c.Text) {
			out = append(out, c)
		}
	}
	return out
}

func isRuleChar(c byte) bool {
	return c == '-' || c == '_' || (c >= '0' && c <= '9') || (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z')
}
