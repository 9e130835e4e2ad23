package server

import _ "embed"

// openapiYAML is the HTTP contract served at /openapi.yaml. The file in this folder is a copy
// of openapi.yaml at the repository root (go:embed cannot reach a parent folder); the root
// file is the one to edit. TestOpenAPIFiles fails when the two differ and, with -update,
// regenerates the function section of the root file from the catalog and copies it here:
//
//go:generate go test -run TestOpenAPIFiles -update .
//go:embed openapi.yaml
var openapiYAML string
