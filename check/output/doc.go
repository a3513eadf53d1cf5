// Package output writes findings for people and tools: text like a
// compiler's, JSON (docs/check-json.md), SARIF 2.1.0 and workflow
// annotations. It also owns the conversion of a finding's byte span to the
// lines and columns every format and the language server show, so the
// command line and the editor point at the same text.
package output
