package server

import (
	"bytes"
	"context"
	"flag"
	"os"
	"path/filepath"
	"slices"
	"testing"

	"github.com/getkin/kin-openapi/openapi3"

	"github.com/fluecell/fluecell/funcs"
)

var update = flag.Bool("update", false, "regenerate the function section of ../openapi.yaml from the catalog and copy the file to server/openapi.yaml")

// rootSpec is the repository's openapi.yaml, the one source of the contract.
const rootSpec = "../openapi.yaml"

func newEngine(t testing.TB) *funcs.Engine {
	t.Helper()
	e, err := funcs.New()
	if err != nil {
		t.Fatal(err)
	}
	return e
}

// TestOpenAPIFiles keeps the served copy equal to the root file, and the root file's function
// section equal to what the catalog generates.
func TestOpenAPIFiles(t *testing.T) {
	root, err := os.ReadFile(rootSpec)
	if err != nil {
		t.Fatal(err)
	}
	block, err := functionPaths(newEngine(t))
	if err != nil {
		t.Fatal(err)
	}
	want, err := spliceFunctions(root, block)
	if err != nil {
		t.Fatal(err)
	}
	if *update {
		if !bytes.Equal(root, want) {
			if err := os.WriteFile(rootSpec, want, 0o644); err != nil {
				t.Fatal(err)
			}
		}
		if err := os.WriteFile("openapi.yaml", want, 0o644); err != nil {
			t.Fatal(err)
		}
		t.Logf("wrote %s and server/openapi.yaml", rootSpec)
		return
	}
	if !bytes.Equal(root, want) {
		t.Errorf("%s: the function section is not what the catalog generates; run go generate ./server", rootSpec)
	}
	if openapiYAML != string(root) {
		t.Errorf("server/openapi.yaml (served at /openapi.yaml) differs from %s; run go generate ./server", rootSpec)
	}
}

// loadSpec parses and validates the root openapi.yaml, servers cleared (tests use random ports).
func loadSpec(t testing.TB) *openapi3.T {
	t.Helper()
	abs, err := filepath.Abs(rootSpec)
	if err != nil {
		t.Fatal(err)
	}
	doc, err := openapi3.NewLoader().LoadFromFile(abs)
	if err != nil {
		t.Fatalf("%s: %v", rootSpec, err)
	}
	if err := doc.Validate(context.Background()); err != nil {
		t.Fatalf("%s is not a valid OpenAPI document: %v", rootSpec, err)
	}
	doc.Servers = nil
	return doc
}

// TestOpenAPIListsCatalog reads openapi.yaml as a client would and checks that every catalog
// function has its path with exactly its parameters (name, required, type, accepted values)
// plus format and errors, and that no other function is listed.
func TestOpenAPIListsCatalog(t *testing.T) {
	doc := loadSpec(t)
	e := newEngine(t)
	listed := map[string]bool{}
	for path := range doc.Paths.Map() {
		if name, ok := cutPrefix(path, "/v1/fn/"); ok && name != "{name}" {
			listed[name] = true
		}
	}
	for _, f := range e.Functions() {
		path := "/v1/fn/" + f.Name
		if !listed[f.Name] {
			t.Errorf("openapi.yaml lacks %s", path)
			continue
		}
		delete(listed, f.Name)
		op := doc.Paths.Value(path).Get
		if op == nil {
			t.Errorf("%s: no GET operation", path)
			continue
		}
		got := map[string]*openapi3.Parameter{}
		for _, pr := range op.Parameters {
			got[pr.Value.Name] = pr.Value
		}
		for _, p := range f.Params {
			sp := got[p.Name]
			if sp == nil {
				t.Errorf("%s: parameter %s missing", path, p.Name)
				continue
			}
			delete(got, p.Name)
			if sp.In != "query" || sp.Required == p.Optional {
				t.Errorf("%s: parameter %s: in %s, required %v; want in query, required %v", path, p.Name, sp.In, sp.Required, !p.Optional)
			}
			if !sp.Schema.Value.Type.Is(p.Type) {
				t.Errorf("%s: parameter %s: type %v, want %s", path, p.Name, sp.Schema.Value.Type, p.Type)
			}
			var enum []string
			for _, v := range sp.Schema.Value.Enum {
				s, _ := v.(string)
				enum = append(enum, s)
			}
			if !slices.Equal(enum, p.Allowed) {
				t.Errorf("%s: parameter %s: enum %v, want the catalog's %v", path, p.Name, enum, p.Allowed)
			}
		}
		for _, reserved := range []string{paramFormat, paramErrors} {
			if got[reserved] == nil {
				t.Errorf("%s: parameter %s missing", path, reserved)
			}
			delete(got, reserved)
		}
		for name := range got {
			t.Errorf("%s: parameter %s is not in the catalog", path, name)
		}
	}
	for name := range listed {
		t.Errorf("openapi.yaml lists /v1/fn/%s, which is not in the catalog", name)
	}
}

// TestReservedNames: no catalog parameter may be called like a reserved query parameter.
func TestReservedNames(t *testing.T) {
	for _, f := range newEngine(t).Functions() {
		for _, p := range f.Params {
			switch p.Name {
			case paramFormat, paramErrors, paramToken:
				t.Errorf("%s: parameter %s clashes with a reserved query parameter of GET /v1/fn", f.Name, p.Name)
			}
		}
	}
}

func cutPrefix(s, prefix string) (string, bool) {
	if len(s) >= len(prefix) && s[:len(prefix)] == prefix {
		return s[len(prefix):], true
	}
	return "", false
}
