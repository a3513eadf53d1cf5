// Package editors holds the editor integrations for .loop files (VS Code,
// Neovim, Emacs, Helix, Kakoune) in its sub-folders. It has no Go code of its
// own: its tests build and drive each integration headless, so that
// `go test ./...` checks them with the rest of circa.
package editors
