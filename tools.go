//go:build tools

// Package tools pins the modules the project builds on until every one is imported by real code.
package tools

import (
	_ "github.com/alecthomas/participle/v2"
	_ "github.com/santhosh-tekuri/jsonschema/v6"
	_ "go.lsp.dev/jsonrpc2"
	_ "go.lsp.dev/protocol"
	_ "golang.org/x/tools/txtar"
	_ "gonum.org/v1/gonum/interp"
	_ "gonum.org/v1/gonum/mat"
	_ "gonum.org/v1/gonum/unit"
	_ "gonum.org/v1/plot"
)
