package server

import (
	"encoding/json"
	"net/http"
	"os"
	"strings"
	"testing"
)

func TestCatalogRoutes(t *testing.T) {
	ts := startServer(t, Config{Version: "9.9.9"})
	e := newEngine(t)

	r := get(t, ts.URL+"/v1/functions")
	var list struct {
		Functions []struct {
			Name       string `json:"name"`
			ExampleURL string `json:"example_url"`
			Params     []struct {
				Name string `json:"name"`
			} `json:"params"`
		} `json:"functions"`
	}
	if err := json.Unmarshal([]byte(r.Body), &list); err != nil || r.Status != 200 {
		t.Fatalf("%d %v", r.Status, err)
	}
	if len(list.Functions) != len(e.Functions()) {
		t.Errorf("%d functions, the catalog has %d", len(list.Functions), len(e.Functions()))
	}
	if list.Functions[0].ExampleURL != "/v1/fn/fuel_co2?fuel=natural_gas&amount=1000&unit=GJ" {
		t.Errorf("example_url %q", list.Functions[0].ExampleURL)
	}
	if r := get(t, ts.URL+"/v1/functions/gwp"); r.Status != 200 || !strings.Contains(r.Body, `"name":"gwp"`) {
		t.Errorf("gwp: %d %s", r.Status, r.Body)
	}
	if r := get(t, ts.URL+"/v1/functions/gwq"); r.Status != 404 || !strings.Contains(r.Body, "did you mean gwp?") {
		t.Errorf("gwq: %d %s", r.Status, r.Body)
	}
	if r := get(t, ts.URL+"/v1/functions?name=gwp"); r.Status != 400 || !strings.Contains(r.Body, "this route takes none") {
		t.Errorf("query on /v1/functions: %d %s", r.Status, r.Body)
	}

	r = get(t, ts.URL+"/v1/factors?pack=epa2025&fuel=diesel")
	var fl struct {
		Pack    string              `json:"pack"`
		Fuel    struct{ ID string } `json:"fuel"`
		Factors []struct {
			Pack, ID, Quantity, Source string
		} `json:"factors"`
		Caution string `json:"caution"`
	}
	if err := json.Unmarshal([]byte(r.Body), &fl); err != nil || r.Status != 200 {
		t.Fatalf("%d %s", r.Status, r.Body)
	}
	if fl.Pack != "epa2025" || fl.Fuel.ID != "gas_diesel_oil" || len(fl.Factors) == 0 || !strings.Contains(fl.Caution, "Tier 1") {
		t.Errorf("%+v", fl)
	}
	for _, f := range fl.Factors {
		if f.Source == "" {
			t.Errorf("factor %s/%s/%s without a source", f.Pack, f.ID, f.Quantity)
		}
	}
	for q, want := range map[string]string{
		"?pack=ipcc1996":   "unknown pack",
		"?fuel=kryptonite": "unknown fuel",
		"?fule=diesel":     "accepted are pack, fuel",
		"?pack=a&pack=b":   "more than once",
		"?a=%zz":           "malformed %-escape",
	} {
		if r := get(t, ts.URL+"/v1/factors"+q); r.Status != 400 || !strings.Contains(r.Body, want) {
			t.Errorf("factors%s: %d %s, want 400 with %q", q, r.Status, r.Body, want)
		}
	}

	r = get(t, ts.URL+"/v1/units")
	if r.Status != 200 || !strings.Contains(r.Body, `"symbol":"MMBtu"`) || !strings.Contains(r.Body, `"si_factor":"1055055852.62"`) {
		t.Errorf("units: %d %.300s", r.Status, r.Body)
	}

	root, err := os.ReadFile(rootSpec)
	if err != nil {
		t.Fatal(err)
	}
	if r := get(t, ts.URL+"/openapi.yaml"); r.Status != 200 || r.Body != string(root) || r.Header.Get("Content-Type") != ctYAML {
		t.Errorf("/openapi.yaml: %d %s, not the root openapi.yaml", r.Status, r.Header.Get("Content-Type"))
	}

	r = get(t, ts.URL+"/healthz")
	if r.Status != 200 || !strings.Contains(r.Body, `"status":"ok"`) || !strings.Contains(r.Body, `"version":"9.9.9"`) ||
		!strings.Contains(r.Body, `"factors_version":"`+e.Version()+`"`) {
		t.Errorf("healthz: %d %s", r.Status, r.Body)
	}
	if r := do(t, http.MethodGet, ts.URL+"/v1/functions", map[string]string{"If-None-Match": get(t, ts.URL+"/v1/functions").Header.Get("ETag")}, ""); r.Status != 304 {
		t.Errorf("functions with If-None-Match: %d", r.Status)
	}
}

func TestNoRouteAndMethod(t *testing.T) {
	ts := startServer(t, Config{})
	r := get(t, ts.URL+"/v2/fn/fuel_co2")
	if r.Status != 404 || !strings.Contains(r.Body, "/openapi.yaml") || !strings.Contains(r.Header.Get("Content-Type"), "json") {
		t.Errorf("no route: %d %s", r.Status, r.Body)
	}
	r = get(t, ts.URL+"/v1/eval")
	if r.Status != 405 || r.Header.Get("Allow") != "POST" || !strings.Contains(r.Body, "use POST") {
		t.Errorf("GET /v1/eval: %d %v %s", r.Status, r.Header, r.Body)
	}
	r = do(t, http.MethodDelete, ts.URL+"/v1/fn/fuel_co2", nil, "")
	if r.Status != 405 || r.Header.Get("Allow") != "GET" {
		t.Errorf("DELETE /v1/fn: %d %s", r.Status, r.Body)
	}
	if r := postJSON(t, ts.URL+"/v1/annotate", "{}"); r.Status != 404 {
		t.Errorf("annotate without a handler: %d %s", r.Status, r.Body)
	}
}

func TestCORS(t *testing.T) {
	ts := startServer(t, Config{CORSOrigins: []string{"https://sheets.example.org"}})
	pre := do(t, http.MethodOptions, ts.URL+"/v1/eval", map[string]string{
		"Origin": "https://sheets.example.org", "Access-Control-Request-Method": "POST", "Access-Control-Request-Headers": "content-type"}, "")
	if pre.Status != 204 || pre.Header.Get("Access-Control-Allow-Origin") != "https://sheets.example.org" ||
		!strings.Contains(pre.Header.Get("Access-Control-Allow-Methods"), "POST") ||
		!strings.Contains(pre.Header.Get("Access-Control-Allow-Headers"), "Authorization") {
		t.Errorf("preflight: %d %v", pre.Status, pre.Header)
	}
	r := do(t, http.MethodGet, ts.URL+"/v1/fn/co2_from_carbon?mass=12", map[string]string{"Origin": "https://sheets.example.org"}, "")
	if r.Body != "44" || r.Header.Get("Access-Control-Allow-Origin") != "https://sheets.example.org" || r.Header.Get("Vary") != "Origin" {
		t.Errorf("simple request: %q %v", r.Body, r.Header)
	}
	r = do(t, http.MethodGet, ts.URL+"/v1/fn/co2_from_carbon?mass=12", map[string]string{"Origin": "https://elsewhere.example.net"}, "")
	if r.Header.Get("Access-Control-Allow-Origin") != "" {
		t.Errorf("another origin allowed: %v", r.Header)
	}
	// with a token as well, both headers vary the answer
	both := startServer(t, Config{CORSOrigins: []string{"https://sheets.example.org"}, Token: "t"})
	r = do(t, http.MethodGet, both.URL+"/v1/fn/co2_from_carbon?mass=12&token=t", map[string]string{"Origin": "https://sheets.example.org"}, "")
	if v := strings.Join(r.Header.Values("Vary"), ","); r.Body != "44" || !strings.Contains(v, "Origin") || !strings.Contains(v, "Authorization") {
		t.Errorf("Vary %q", v)
	}
	// a preflight needs no token: browsers send none
	tok := startServer(t, Config{CORSOrigins: []string{"*"}, Token: "t"})
	pre = do(t, http.MethodOptions, tok.URL+"/v1/fn/gwp", map[string]string{"Origin": "https://a.example", "Access-Control-Request-Method": "GET"}, "")
	if pre.Status != 204 || pre.Header.Get("Access-Control-Allow-Origin") != "*" {
		t.Errorf("preflight behind a token: %d %v", pre.Status, pre.Header)
	}
}

func TestConfigErrors(t *testing.T) {
	e := newEngine(t)
	for _, cfg := range []Config{{MaxBodyBytes: -1}, {MaxRows: -5}, {EvalTimeout: -1}, {CORSOrigins: []string{""}}} {
		if _, err := New(cfg, e, nil); err == nil {
			t.Errorf("New(%+v) accepted", cfg)
		}
	}
	if _, err := New(Config{}, nil, nil); err == nil {
		t.Error("New without an engine accepted")
	}
}

func TestLogLines(t *testing.T) {
	ts := startServer(t, Config{})
	get(t, ts.URL+"/v1/fn/co2_from_carbon?mass=12")
	get(t, ts.URL+"/v1/fn/co2_from_carbon?mass=x")
	var lines []map[string]any
	for _, l := range strings.Split(strings.TrimSpace(ts.logs.String()), "\n") {
		var m map[string]any
		if err := json.Unmarshal([]byte(l), &m); err != nil {
			t.Fatalf("log line %q: %v", l, err)
		}
		if m["msg"] == "request" {
			lines = append(lines, m)
		}
	}
	if len(lines) != 2 {
		t.Fatalf("%d request lines, want 2:\n%s", len(lines), ts.logs.String())
	}
	if lines[0]["status"] != 200.0 || lines[0]["path"] != "/v1/fn/co2_from_carbon" || lines[0]["query"] != "mass=12" {
		t.Errorf("line 1: %v", lines[0])
	}
	if lines[1]["status"] != 400.0 || !strings.Contains(lines[1]["error"].(string), "mass must be a number") {
		t.Errorf("line 2: %v", lines[1])
	}
}
