package server

import (
	"bytes"
	"mime/multipart"
	"net/http"
	"net/textproto"
	"sort"
	"strings"
	"testing"
	"unicode"
)

// mixedCase writes s with the case of its letters alternating (Application/VnD.Ms-ExCeL...).
func mixedCase(s string) string {
	out := []rune(s)
	for i, r := range out {
		if i%2 == 0 {
			out[i] = unicode.ToUpper(r)
		} else {
			out[i] = unicode.ToLower(r)
		}
	}
	return string(out)
}

// TestDeclaredContentTypesAccepted sends a body of every Content-Type openapi.yaml declares
// for a request, written in mixed case (media types are case-insensitive, RFC 9110 8.3.1),
// as the whole body and as a multipart part's type: none is refused.
func TestDeclaredContentTypesAccepted(t *testing.T) {
	doc := loadSpec(t)
	e := newEngine(t)
	ts := startServer(t, Config{Annotate: AnnotateHandler(e, AnnotateConfig{TempDir: t.TempDir()})})
	xlsx := string(demoWorkbook(t))
	csvBody := "Site,Fuel,Quantity,Unit\nDepot,diesel,1200,L\n"
	bodies := map[string]map[string]string{ // route, content type: target and body
		"/v1/eval": {
			"application/json": `{"expr": "co2_from_carbon(12)"}`,
			"text/csv":         "c\n12\n",
		},
		"/v1/annotate": {
			typeXLSX:                   xlsx,
			typeXLSM:                   xlsx,
			"text/csv":                 csvBody,
			"application/octet-stream": xlsx,
		},
		"/v1/inspect": {
			typeXLSX:                   xlsx,
			typeXLSM:                   xlsx,
			"text/csv":                 csvBody,
			"application/octet-stream": xlsx,
		},
	}
	var tried []string
	for path, item := range doc.Paths.Map() {
		op := item.Post
		if op == nil || op.RequestBody == nil {
			continue
		}
		for ctype := range op.RequestBody.Value.Content {
			target := path
			if path == "/v1/eval" && ctype == "text/csv" {
				target += "?expr=co2_from_carbon(c)"
			}
			if ctype == "multipart/form-data" {
				for part, body := range bodies[path] {
					var buf bytes.Buffer
					w := multipart.NewWriter(&buf)
					h := textproto.MIMEHeader{}
					h.Set("Content-Disposition", `form-data; name="file"; filename="upload"`)
					h.Set("Content-Type", mixedCase(part))
					pw, _ := w.CreatePart(h)
					pw.Write([]byte(body))
					w.Close()
					ct := mixedCase("multipart/form-data") + "; boundary=" + w.Boundary()
					r := do(t, http.MethodPost, ts.URL+target, map[string]string{"Content-Type": ct}, buf.String())
					if r.Status != 200 {
						t.Errorf("POST %s, part of type %s: %d %.300s", path, mixedCase(part), r.Status, r.Body)
					}
					if path == routeAnnotate && part == typeXLSM && r.Header.Get("Content-Type") != typeXLSM {
						t.Errorf("an .xlsm part answered as %q", r.Header.Get("Content-Type"))
					}
					tried = append(tried, path+" multipart "+part)
				}
				continue
			}
			body, ok := bodies[path][ctype]
			if !ok {
				t.Errorf("POST %s declares %s: add a body for it to this test", path, ctype)
				continue
			}
			r := do(t, http.MethodPost, ts.URL+target, map[string]string{"Content-Type": mixedCase(ctype)}, body)
			if r.Status != 200 {
				t.Errorf("POST %s with Content-Type %s: %d %.300s", path, mixedCase(ctype), r.Status, r.Body)
			}
			if path == routeAnnotate && strings.EqualFold(ctype, typeXLSM) && r.Header.Get("Content-Type") != typeXLSM {
				t.Errorf("an .xlsm upload answered as %q", r.Header.Get("Content-Type"))
			}
			tried = append(tried, path+" "+ctype)
		}
	}
	sort.Strings(tried)
	if len(tried) < 10 {
		t.Errorf("only %d content types tried: %v", len(tried), tried)
	}
}
