package card

import (
	_ "embed"
)

// SchemaID is the $id of the model-card JSON Schema.
const SchemaID = "https://github.com/weft-tools/weft/aniso/card/model.schema.json"

// schemaJSON is the JSON Schema (draft 2020-12) of model.json. It is
// generated from the term catalogue; the card tests check that it is up to
// date (regenerate with `go test ./aniso/card -run TestSchemaFile -update`).
//
//go:embed model.schema.json
var schemaJSON []byte

// Schema returns a copy of the JSON Schema (draft 2020-12) that describes
// model cards of format Format: the keys weft reads, with units in their
// descriptions, each catalogue term's parameters and bounds, and the
// data_range section of fitted cards. Other top-level keys are allowed, as
// readers ignore keys they do not know. Cross-references (term families
// naming a family of the card, unique family names, weight_unit equal to
// stress_unit) cannot be written in JSON Schema; weft checks them on read.
func Schema() []byte { return append([]byte(nil), schemaJSON...) }
