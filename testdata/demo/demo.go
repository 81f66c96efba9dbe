// Package demo ships the demo's claims manifest inside the command, so that
// 'avoidcert demo' runs from any folder.
package demo

import _ "embed"

// Manuscript is manuscript.toml: the claimed table of a fictional
// manuscript, with right and wrong entries and their sources.
//
//go:embed manuscript.toml
var Manuscript []byte

// ManuscriptName is the manifest's path in the repository, for messages.
const ManuscriptName = "testdata/demo/manuscript.toml"
