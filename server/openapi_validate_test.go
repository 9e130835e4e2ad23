package server

import (
	"bytes"
	"context"
	"encoding/xml"
	"errors"
	"io"
	"net/http"
	"net/url"
	"sort"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/getkin/kin-openapi/openapi3"
	"github.com/getkin/kin-openapi/openapi3filter"
	"github.com/getkin/kin-openapi/routers/gorillamux"
)

// registerXMLDecoder teaches kin-openapi to read application/xml answers: it checks that the
// document is well formed and hands the text to the schema (a pattern).
var registerXMLDecoder = sync.OnceFunc(func() {
	for _, ct := range []string{"text/html", "text/css", "text/javascript"} {
		openapi3filter.RegisterBodyDecoder(ct, func(body io.Reader, _ http.Header, _ *openapi3.SchemaRef, _ openapi3filter.EncodingFn) (any, error) {
			b, err := io.ReadAll(body)
			return string(b), err
		})
	}
	openapi3filter.RegisterBodyDecoder("application/xml", func(body io.Reader, _ http.Header, _ *openapi3.SchemaRef, _ openapi3filter.EncodingFn) (any, error) {
		b, err := io.ReadAll(body)
		if err != nil {
			return nil, err
		}
		dec := xml.NewDecoder(bytes.NewReader(b))
		for {
			if _, err := dec.Token(); errors.Is(err, io.EOF) {
				break
			} else if err != nil {
				return nil, &openapi3filter.ParseError{Kind: openapi3filter.KindInvalidFormat, Cause: err}
			}
		}
		return string(b), nil
	})
})

// apiCase is one real request whose answer is validated against openapi.yaml.
type apiCase struct {
	name    string
	base    string // server URL
	method  string
	target  string // path and query
	header  map[string]string
	body    string
	status  int
	request bool // the request itself conforms to the contract (checked too)
}

// TestOpenAPIValidatesAnswers sends real requests, successes and mistakes, to servers on random
// ports and validates every answer (status included) against openapi.yaml with kin-openapi. It
// then checks that every documented path, method and status but 500 (a fault) and the
// workbook route (served by the importer's handler) was exercised.
func TestOpenAPIValidatesAnswers(t *testing.T) {
	registerXMLDecoder()
	doc := loadSpec(t)
	router, err := gorillamux.NewRouter(doc)
	if err != nil {
		t.Fatal(err)
	}
	plain := startServer(t, Config{})
	tok := startServer(t, Config{Token: "tk"})
	small := startServer(t, Config{MaxBodyBytes: 256, MaxRows: 2})
	slow := startServer(t, Config{EvalTimeout: time.Nanosecond})
	faulty := startServer(t, Config{Annotate: http.HandlerFunc(func(http.ResponseWriter, *http.Request) { panic("a fault") })})
	e := newEngine(t)
	wb := startServer(t, Config{Annotate: AnnotateHandler(e, AnnotateConfig{})})
	wbTok := startServer(t, Config{Token: "tk", Annotate: AnnotateHandler(e, AnnotateConfig{})})
	wbSmall := startServer(t, Config{MaxUploadBytes: 512, Annotate: AnnotateHandler(e, AnnotateConfig{})})
	wbSlow := startServer(t, Config{Annotate: AnnotateHandler(e, AnnotateConfig{Timeout: time.Nanosecond})})
	wbPace := startServer(t, Config{Annotate: AnnotateHandler(e, AnnotateConfig{UploadGrace: time.Nanosecond, MinUploadRate: 1 << 40})})

	var cases []apiCase
	add := func(c apiCase) {
		if c.method == "" {
			c.method = http.MethodGet
		}
		cases = append(cases, c)
	}
	for _, f := range e.Functions() {
		ex, err := exampleURL(f)
		if err != nil {
			t.Fatal(err)
		}
		etag := get(t, plain.URL+ex).Header.Get("ETag")
		add(apiCase{name: f.Name + " example", base: plain.URL, target: ex, status: 200, request: true})
		add(apiCase{name: f.Name + " json", base: plain.URL, target: ex + "&format=json", status: 200, request: true})
		add(apiCase{name: f.Name + " 304", base: plain.URL, target: ex, header: map[string]string{"If-None-Match": etag}, status: 304, request: true})
		add(apiCase{name: f.Name + " no arguments", base: plain.URL, target: "/v1/fn/" + f.Name, status: 400})
		add(apiCase{name: f.Name + " no arguments inline", base: plain.URL, target: "/v1/fn/" + f.Name + "?errors=inline", status: 200})
		add(apiCase{name: f.Name + " no token", base: tok.URL, target: ex, status: 401})
		add(apiCase{name: f.Name + " token", base: tok.URL, target: ex + "&token=tk", status: 200, request: true})
	}
	gas := "/v1/fn/fuel_co2?fuel=natural_gas&amount=1000&unit=GJ"
	bad := "/v1/fn/fuel_co2?fuel=natural_gas&amount=1000&unit=ton"
	for _, f := range []string{"text", "json", "csv", "xml"} {
		add(apiCase{name: "ok " + f, base: plain.URL, target: gas + "&format=" + f, status: 200, request: true})
		add(apiCase{name: "400 " + f, base: plain.URL, target: bad + "&format=" + f, status: 400, request: true})
		add(apiCase{name: "inline " + f, base: plain.URL, target: bad + "&errors=inline&format=" + f, status: 200, request: true})
		add(apiCase{name: "401 " + f, base: tok.URL, target: gas + "&format=" + f, status: 401})
		add(apiCase{name: "401 inline " + f, base: tok.URL, target: gas + "&errors=inline&format=" + f, status: 200})
		add(apiCase{name: "404 " + f, base: plain.URL, target: "/v1/fn/fuel_co3?format=" + f, status: 404, request: true})
		add(apiCase{name: "404 inline " + f, base: plain.URL, target: "/v1/fn/fuel_co3?errors=inline&format=" + f, status: 200, request: true})
	}
	add(apiCase{name: "unknown fn 304-free 400", base: plain.URL, target: "/v1/fn/fuel_co3?format=html", status: 400})
	add(apiCase{name: "token on unknown fn", base: tok.URL, target: "/v1/fn/nope", status: 401})
	add(apiCase{name: "bad escape", base: plain.URL, target: "/v1/fn/fuel_co2?unit=%zz", status: 400})
	add(apiCase{name: "control characters", base: plain.URL, target: "/v1/fn/fuel_co2?fuel=a%0Db%0A%FF&amount=1&unit=GJ", status: 400})
	add(apiCase{name: "control characters inline", base: plain.URL, target: "/v1/fn/fuel_co2?fuel=a%0Db%0A%FF&amount=1&unit=GJ&errors=inline", status: 200})

	ev := func(name, base, target, ctype, body string, status int, valid bool) {
		h := map[string]string{}
		if ctype != "" {
			h["Content-Type"] = ctype
		}
		add(apiCase{name: "eval " + name, base: base, method: http.MethodPost, target: target, header: h, body: body, status: status, request: valid})
	}
	ev("one", plain.URL, "/v1/eval", "application/json", `{"expr": "fuel_co2e(fuel, q, \"L\")", "vars": {"fuel": "diesel", "q": 1000}}`, 200, true)
	ev("rows", plain.URL, "/v1/eval", "application/json", `{"expr": "fuel_co2(fuel, q, unit)", "rows": [{"fuel": "natural_gas", "q": 1000, "unit": "GJ"}, {"fuel": "coal", "q": 2, "unit": "ton"}, {"fuel": "peat", "q": 1, "unit": "t"}]}`, 200, true)
	ev("csv", plain.URL, "/v1/eval?expr="+url.QueryEscape("fuel_co2(fuel, quantity, unit)")+"&as=tCO2", "text/csv", "fuel,quantity,unit\nnatural_gas,1000,GJ\ndiesel,500,L\ncoal,1,ton\n", 200, true)
	ev("interval", plain.URL, "/v1/eval", "application/json", `{"expr": "fuel_co2e(fuel, q, \"L\")", "vars": {"fuel": "diesel", "q": 1000}, "interval": true}`, 200, true)
	ev("interval approach2", plain.URL, "/v1/eval", "application/json", `{"expr": "fuel_co2(\"natural_gas\", q, \"GJ\")", "vars": {"q": 1000}, "interval": {"approach": "approach2", "seed": 7, "draws": 1000}}`, 200, true)
	ev("interval rows", plain.URL, "/v1/eval", "application/json", `{"expr": "fuel_co2(fuel, q, unit)", "rows": [{"fuel": "natural_gas", "q": 1000, "unit": "GJ"}, {"fuel": "coal", "q": 2, "unit": "ton"}], "interval": true}`, 200, true)
	ev("interval bad", plain.URL, "/v1/eval", "application/json", `{"expr": "1", "interval": {"approach": "approach3"}}`, 400, false)
	ev("bad json", plain.URL, "/v1/eval", "application/json", `{"expr": `, 400, false)
	ev("compile", plain.URL, "/v1/eval", "application/json", `{"expr": "fuel_co2(\"natural_gas\", 1, \"tons\")"}`, 400, true)
	ev("unknown field", plain.URL, "/v1/eval", "application/json", `{"expr": "1", "var": 1}`, 400, false)
	ev("csv ragged", plain.URL, "/v1/eval?expr=a", "text/csv", "a,b\n1\n", 400, false)
	ev("media type", plain.URL, "/v1/eval", "application/xml", "<a/>", 415, false)
	ev("too large", small.URL, "/v1/eval", "application/json", `{"expr": "`+strings.Repeat("1+", 200)+`1"}`, 413, true)
	ev("too many rows", small.URL, "/v1/eval", "application/json", `{"expr": "1", "rows": [{}, {}, {}]}`, 413, true)
	ev("timeout", slow.URL, "/v1/eval", "application/json", `{"expr": "1", "rows": [`+strings.TrimSuffix(strings.Repeat(`{},`, 600), ",")+`]}`, 503, true)
	ev("no token", tok.URL, "/v1/eval", "application/json", `{"expr": "1"}`, 401, false)
	// a fault: the 500 answer of the server itself (the handler panics)
	add(apiCase{name: "500", base: faulty.URL, method: http.MethodPost, target: "/v1/annotate",
		header: map[string]string{"Content-Type": "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet"}, body: "PK", status: 500, request: true})

	// workbooks
	xlsx := string(demoWorkbook(t))
	typeX := map[string]string{"Content-Type": typeXLSX}
	form, formType := multipartFile(t, "fuel-log.xlsx", xlsx)
	csvBody := "Site,Fuel,Quantity,Unit\nDepot,diesel,1200,L\nCreamery,natural_gas,40,MWh\n"
	mapForm, mapFormType := multipartParts(t, [][3]string{{"mapping", "", demoMapping}, {"file", "fuel-log.xlsx", xlsx}})
	badMapForm, badMapFormType := multipartParts(t, [][3]string{{"mapping", "", `{"fluecell_mapping": 1, "tables": [{"sheet": "Fuel log", "header_row": 4, "columns": [{"column": "B", "header": "Site", "role": "amount"}]}], "names": {}}`}, {"file", "fuel-log.xlsx", xlsx}})
	for _, c := range []apiCase{
		{name: "annotate xlsx", base: wb.URL, method: http.MethodPost, target: "/v1/annotate", header: typeX, body: xlsx, status: 200, request: true},
		{name: "annotate report", base: wb.URL, method: http.MethodPost, target: "/v1/annotate?report=json", header: typeX, body: xlsx, status: 200, request: true},
		{name: "annotate multipart", base: wb.URL, method: http.MethodPost, target: "/v1/annotate?report=json&sheet=Fuel%20log", header: map[string]string{"Content-Type": formType}, body: form, status: 200, request: true},
		{name: "annotate csv", base: wb.URL, method: http.MethodPost, target: "/v1/annotate?rule=" + url.QueryEscape("tCO2 = fuel_co2(fuel, quantity, unit)"), header: map[string]string{"Content-Type": "text/csv"}, body: csvBody, status: 200, request: true},
		{name: "annotate corrupt", base: wb.URL, method: http.MethodPost, target: "/v1/annotate", header: typeX, body: "PK\x03\x04 truncated", status: 400, request: true},
		// A file without a table is annotated, not refused: the report lists the sheet as skipped, with why.
		{name: "annotate no table", base: wb.URL, method: http.MethodPost, target: "/v1/annotate?name=notes.csv&report=json", header: map[string]string{"Content-Type": "application/octet-stream"}, body: "a,b\n1,2\n", status: 200, request: true},
		{name: "annotate rules fit no table", base: wb.URL, method: http.MethodPost, target: "/v1/annotate?name=notes.csv&rule=" + url.QueryEscape("tCO2 = fuel_co2(fuel, quantity, unit)"), header: map[string]string{"Content-Type": "application/octet-stream"}, body: "a,b\n1,2\n", status: 400, request: true},
		{name: "annotate bad rule", base: wb.URL, method: http.MethodPost, target: "/v1/annotate?rule=x%3D1%2F", header: map[string]string{"Content-Type": "text/csv"}, body: csvBody, status: 400, request: true},
		{name: "annotate unknown parameter", base: wb.URL, method: http.MethodPost, target: "/v1/annotate?colour=red", header: typeX, body: xlsx, status: 400},
		{name: "annotate 401", base: wbTok.URL, method: http.MethodPost, target: "/v1/annotate", header: typeX, body: xlsx, status: 401, request: true},
		{name: "annotate 413", base: wbSmall.URL, method: http.MethodPost, target: "/v1/annotate", header: typeX, body: xlsx, status: 413, request: true},
		{name: "annotate 415", base: wb.URL, method: http.MethodPost, target: "/v1/annotate", header: map[string]string{"Content-Type": "image/png"}, body: "\x89PNG", status: 415},
		{name: "annotate 408", base: wbPace.URL, method: http.MethodPost, target: "/v1/annotate", header: typeX, body: xlsx, status: 408, request: true},
		{name: "annotate 503", base: wbSlow.URL, method: http.MethodPost, target: "/v1/annotate", header: typeX, body: xlsx, status: 503, request: true},
		{name: "annotate with a mapping", base: wb.URL, method: http.MethodPost, target: "/v1/annotate?report=json", header: map[string]string{"Content-Type": mapFormType}, body: mapForm, status: 200, request: true},
		{name: "inspect xlsx", base: wb.URL, method: http.MethodPost, target: "/v1/inspect?rows=3", header: typeX, body: xlsx, status: 200, request: true},
		{name: "inspect multipart", base: wb.URL, method: http.MethodPost, target: "/v1/inspect?sheet=Fuel%20log", header: map[string]string{"Content-Type": formType}, body: form, status: 200, request: true},
		{name: "inspect with a mapping", base: wb.URL, method: http.MethodPost, target: "/v1/inspect", header: map[string]string{"Content-Type": mapFormType}, body: mapForm, status: 200, request: true},
		{name: "inspect csv", base: wb.URL, method: http.MethodPost, target: "/v1/inspect", header: map[string]string{"Content-Type": "text/csv"}, body: csvBody, status: 200, request: true},
		{name: "inspect bad mapping", base: wb.URL, method: http.MethodPost, target: "/v1/inspect", header: map[string]string{"Content-Type": badMapFormType}, body: badMapForm, status: 400, request: true},
		{name: "inspect rows 0", base: wb.URL, method: http.MethodPost, target: "/v1/inspect?rows=0", header: typeX, body: xlsx, status: 400},
		{name: "inspect report", base: wb.URL, method: http.MethodPost, target: "/v1/inspect?report=json", header: typeX, body: xlsx, status: 400},
		{name: "inspect 401", base: wbTok.URL, method: http.MethodPost, target: "/v1/inspect", header: typeX, body: xlsx, status: 401, request: true},
		{name: "inspect 413", base: wbSmall.URL, method: http.MethodPost, target: "/v1/inspect", header: typeX, body: xlsx, status: 413, request: true},
		{name: "inspect 415", base: wb.URL, method: http.MethodPost, target: "/v1/inspect", header: map[string]string{"Content-Type": "image/png"}, body: "\x89PNG", status: 415},
		{name: "inspect 408", base: wbPace.URL, method: http.MethodPost, target: "/v1/inspect", header: typeX, body: xlsx, status: 408, request: true},
		{name: "inspect 503", base: wbSlow.URL, method: http.MethodPost, target: "/v1/inspect", header: typeX, body: xlsx, status: 503, request: true},
		{name: "page", base: tok.URL, target: "/", status: 200, request: true},
		{name: "page 304", base: plain.URL, target: "/", header: map[string]string{"If-None-Match": get(t, plain.URL+"/").Header.Get("ETag")}, status: 304, request: true},
		{name: "page script", base: tok.URL, target: "/page/page.js", status: 200, request: true},
		{name: "page style", base: plain.URL, target: "/page/page.css", status: 200, request: true},
		{name: "page 404", base: plain.URL, target: "/page/other.js", status: 404, request: true},
	} {
		add(c)
	}

	for _, c := range []apiCase{
		{name: "functions", base: plain.URL, target: "/v1/functions", status: 200, request: true},
		{name: "functions 400", base: plain.URL, target: "/v1/functions?x=1", status: 400},
		{name: "functions 401", base: tok.URL, target: "/v1/functions", status: 401},
		{name: "function", base: plain.URL, target: "/v1/functions/embodied", status: 200, request: true},
		{name: "function 400", base: plain.URL, target: "/v1/functions/embodied?x=1", status: 400},
		{name: "function 401", base: tok.URL, target: "/v1/functions/embodied", status: 401},
		{name: "function 404", base: plain.URL, target: "/v1/functions/embodyed", status: 404, request: true},
		{name: "factors", base: plain.URL, target: "/v1/factors", status: 200, request: true},
		{name: "factors epa diesel", base: plain.URL, target: "/v1/factors?pack=epa2025&fuel=diesel", status: 200, request: true},
		{name: "factors 400", base: plain.URL, target: "/v1/factors?pack=nope", status: 400, request: true},
		{name: "factors 401", base: tok.URL, target: "/v1/factors", status: 401},
		{name: "grids", base: plain.URL, target: "/v1/grids", status: 200, request: true},
		{name: "grids one", base: plain.URL, target: "/v1/grids?grid=eGRID%20CAMX", status: 200, request: true},
		{name: "grids 400", base: plain.URL, target: "/v1/grids?grid=atlantis", status: 400, request: true},
		{name: "grids 401", base: tok.URL, target: "/v1/grids", status: 401},
		{name: "units", base: plain.URL, target: "/v1/units", status: 200, request: true},
		{name: "units 400", base: plain.URL, target: "/v1/units?dim=energy", status: 400},
		{name: "units 401", base: tok.URL, target: "/v1/units", status: 401},
		{name: "openapi", base: plain.URL, target: "/openapi.yaml", status: 200, request: true},
		{name: "openapi 401", base: tok.URL, target: "/openapi.yaml", status: 401},
		{name: "healthz", base: plain.URL, target: "/healthz", status: 200, request: true},
		{name: "healthz behind a token", base: tok.URL, target: "/healthz", status: 200, request: true},
		{name: "metrics", base: plain.URL, target: "/metrics", status: 200, request: true},
		{name: "metrics 401", base: tok.URL, target: "/metrics", status: 401},
	} {
		add(c)
	}
	// conditional GETs of the pages
	for _, p := range []string{"/v1/functions", "/v1/functions/gwp", "/v1/factors", "/v1/grids", "/v1/units", "/openapi.yaml", "/healthz"} {
		add(apiCase{name: p + " 304", base: plain.URL, target: p, header: map[string]string{"If-None-Match": get(t, plain.URL+p).Header.Get("ETag")}, status: 304, request: true})
	}

	opts := &openapi3filter.Options{IncludeResponseStatus: true, SkipSettingDefaults: true, AuthenticationFunc: openapi3filter.NoopAuthenticationFunc}
	exercised := map[string]bool{}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			r := do(t, c.method, c.base+c.target, c.header, c.body)
			if r.Status != c.status {
				t.Fatalf("%s %s: status %d, want %d: %.300s", c.method, c.target, r.Status, c.status, r.Body)
			}
			// a request as kin-openapi reads it (its own body reader)
			vreq, err := http.NewRequest(c.method, c.base+c.target, strings.NewReader(c.body))
			if err != nil {
				t.Fatal(err)
			}
			for k, v := range c.header {
				vreq.Header.Set(k, v)
			}
			route, params, err := router.FindRoute(vreq)
			if err != nil {
				t.Fatalf("openapi.yaml has no route for %s %s: %v", c.method, c.target, err)
			}
			exercised[route.Path+" "+c.method+" "+strconv.Itoa(r.Status)] = true
			in := &openapi3filter.RequestValidationInput{Request: vreq, PathParams: params, Route: route, Options: opts}
			if c.request {
				if err := openapi3filter.ValidateRequest(context.Background(), in); err != nil {
					t.Errorf("the request does not conform to openapi.yaml: %v", err)
				}
			}
			out := &openapi3filter.ResponseValidationInput{RequestValidationInput: in, Status: r.Status, Header: r.Header,
				Body: io.NopCloser(strings.NewReader(r.Body)), Options: opts}
			if err := openapi3filter.ValidateResponse(context.Background(), out); err != nil {
				t.Errorf("answer %d %s does not conform to openapi.yaml: %v\n%.500s", r.Status, r.Header.Get("Content-Type"), err, r.Body)
			}
		})
	}

	var missed []string
	for path, item := range doc.Paths.Map() {
		for method, op := range item.Operations() {
			for status := range op.Responses.Map() {
				if status == "500" {
					continue // only a real fault answers 500 (TestPanicIsA500)
				}
				if !exercised[path+" "+method+" "+status] {
					missed = append(missed, method+" "+path+" "+status)
				}
			}
		}
	}
	sort.Strings(missed)
	for _, m := range missed {
		t.Errorf("documented but not exercised: %s", m)
	}
	t.Logf("%d answers validated", len(cases))
}

// TestOpenAPIValidatorRejects shows that the validation above can fail: wrong answers to a
// real route are refused.
func TestOpenAPIValidatorRejects(t *testing.T) {
	registerXMLDecoder()
	doc := loadSpec(t)
	router, err := gorillamux.NewRouter(doc)
	if err != nil {
		t.Fatal(err)
	}
	opts := &openapi3filter.Options{IncludeResponseStatus: true, SkipSettingDefaults: true, AuthenticationFunc: openapi3filter.NoopAuthenticationFunc}
	wrong := []struct {
		name, ctype, body string
		status            int
	}{
		{"decimal comma", ctText, "56,1", 200},
		{"json without sources", ctJSON, `{"value": 56.1, "unit": "t CO2", "notes": []}`, 200},
		{"json with an extra field", ctJSON, `{"value": 56.1, "unit": "t CO2", "sources": [], "notes": [], "x": 1}`, 200},
		{"undocumented status", ctText, "teapot", 418},
		{"csv without header", ctCSV, "56.1,t CO2,\n", 200},
		{"xml not well formed", ctXML, "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n<result><value>1</value>", 200},
		{"error without code", ctJSON, `{"error": "x"}`, 400},
		{"undocumented type", "text/html", "<p>56.1</p>", 200},
	}
	for _, w := range wrong {
		req, _ := http.NewRequest(http.MethodGet, "http://127.0.0.1/v1/fn/fuel_co2?fuel=natural_gas&amount=1&unit=GJ", nil)
		route, params, err := router.FindRoute(req)
		if err != nil {
			t.Fatal(err)
		}
		in := &openapi3filter.RequestValidationInput{Request: req, PathParams: params, Route: route, Options: opts}
		out := &openapi3filter.ResponseValidationInput{RequestValidationInput: in, Status: w.status,
			Header: http.Header{"Content-Type": {w.ctype}}, Body: io.NopCloser(strings.NewReader(w.body)), Options: opts}
		if err := openapi3filter.ValidateResponse(context.Background(), out); err == nil {
			t.Errorf("%s: accepted", w.name)
		}
	}
}
