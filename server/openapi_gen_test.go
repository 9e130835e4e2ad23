package server

import (
	"bytes"
	"errors"
	"strconv"
	"strings"

	"github.com/fluecell/fluecell/funcs"
)

// The function section of openapi.yaml lies between these lines, under paths.
const (
	beginFunctions = "  # BEGIN functions: generated from the catalog by `go generate ./server`; do not edit by hand\n"
	endFunctions   = "  # END functions\n"
)

// functionPaths writes the paths /v1/fn/{name} of every catalog function, with its
// parameters as query parameters, in catalog order.
func functionPaths(e *funcs.Engine) (string, error) {
	var b strings.Builder
	q := func(s string) string {
		out, err := marshalJSON(s)
		if err != nil {
			panic(err) // a string always marshals
		}
		return string(out)
	}
	for _, f := range e.Functions() {
		ex, err := exampleURL(f)
		if err != nil {
			return "", err
		}
		unit := f.ResultUnit
		if unit == "" {
			unit = "dimensionless"
		}
		desc := "Result unit: " + unit + ".\n\nExample: " + f.Example + " = " + funcs.FormatNumber(f.ExampleResult) +
			", as GET " + ex + "\n\nSources: " + strings.Join(f.Sources, "; ") + "."
		b.WriteString("  /v1/fn/" + f.Name + ":\n")
		b.WriteString("    get:\n")
		b.WriteString("      operationId: " + f.Name + "\n")
		b.WriteString("      tags: [functions]\n")
		b.WriteString("      summary: " + q(f.Doc) + "\n")
		b.WriteString("      description: " + q(desc) + "\n")
		b.WriteString("      parameters:\n")
		for _, p := range f.Params {
			b.WriteString("        - name: " + p.Name + "\n")
			b.WriteString("          in: query\n")
			b.WriteString("          required: " + strconv.FormatBool(!p.Optional) + "\n")
			d := p.Doc
			if p.Unit != "" {
				d += " (" + p.Unit + ")"
			}
			if p.Optional {
				d += "; default " + p.Default
			}
			b.WriteString("          description: " + q(d) + "\n")
			b.WriteString("          schema:\n")
			b.WriteString("            type: " + p.Type + "\n")
			if p.Type == "string" {
				b.WriteString("            maxLength: " + strconv.Itoa(maxValueLen) + "\n")
			}
			if len(p.Allowed) > 0 {
				b.WriteString("            enum: [")
				for i, a := range p.Allowed {
					if i > 0 {
						b.WriteString(", ")
					}
					b.WriteString(q(a))
				}
				b.WriteString("]\n")
			}
			if p.Optional {
				if p.Type == "number" {
					if _, ok := funcs.ParseNumber(p.Default); ok {
						b.WriteString("            default: " + p.Default + "\n")
					}
				} else if len(p.Allowed) == 0 || contains(p.Allowed, p.Default) {
					b.WriteString("            default: " + q(p.Default) + "\n")
				}
			}
		}
		b.WriteString("        - $ref: '#/components/parameters/format'\n")
		b.WriteString("        - $ref: '#/components/parameters/errors'\n")
		b.WriteString("      responses:\n")
		b.WriteString("        '200': {$ref: '#/components/responses/FnResult'}\n")
		b.WriteString("        '304': {$ref: '#/components/responses/NotModified'}\n")
		b.WriteString("        '400': {$ref: '#/components/responses/FnBadRequest'}\n")
		b.WriteString("        '401': {$ref: '#/components/responses/FnUnauthorized'}\n")
		b.WriteString("        '500': {$ref: '#/components/responses/FnInternal'}\n")
	}
	return b.String(), nil
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}

// spliceFunctions returns doc with the function section replaced by block.
func spliceFunctions(doc []byte, block string) ([]byte, error) {
	i := bytes.Index(doc, []byte(beginFunctions))
	j := bytes.Index(doc, []byte(endFunctions))
	if i < 0 || j < i {
		return nil, errors.New("openapi.yaml: the lines " + strconv.Quote(beginFunctions) + " and " + strconv.Quote(endFunctions) + " are missing")
	}
	var out bytes.Buffer
	out.Write(doc[:i+len(beginFunctions)])
	out.WriteString(block)
	out.Write(doc[j:])
	return out.Bytes(), nil
}
