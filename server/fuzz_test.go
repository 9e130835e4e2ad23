package server

import (
	"encoding/json"
	"net/http"
	"net/http/httptest"
	"net/url"
	"strings"
	"testing"

	"github.com/fluecell/fluecell/funcs"
)

// fuzzServer is a Server whose handler the fuzz targets call in-process.
func fuzzServer(f *testing.F) (*Server, []string) {
	e, err := funcs.New()
	if err != nil {
		f.Fatal(err)
	}
	s, err := New(Config{}, e, nil)
	if err != nil {
		f.Fatal(err)
	}
	var names []string
	for _, fn := range e.Functions() {
		names = append(names, fn.Name)
	}
	return s, append(names, "nope", "")
}

// FuzzFnQuery sends arbitrary query strings to GET /v1/fn/{name}: never a panic, never a 5xx,
// a 200 text answer is a number or an inline error, and any error names what went wrong.
func FuzzFnQuery(f *testing.F) {
	s, names := fuzzServer(f)
	for _, seed := range []string{
		"fuel=natural_gas&amount=1000&unit=GJ",
		"fuel=diesel&amount=1e3&unit=L&format=json",
		"fuel=natural+gas&amount=-1&unit=MMBtu%20HHV&pack=epa2025&errors=inline",
		"tech=wind_onshore&capacity_factor=0.3&lifetime_years=25&format=xml",
		"value=1&from=MMBtu&to=GJ&format=csv",
		"mass=%zz", "=1", "&&&", "a=1&a=2", "format=json&format=xml", "errors=inline&unit=ton",
		"amount=1e999&fuel=gas&unit=GJ", "amount=NaN&fuel=gas&unit=GJ", "amount=0x10&fuel=gas&unit=GJ",
		"fuel=%00%ff&amount=1&unit=\xff", "gtc=1&airborne_fraction=0", "ppm=-1", "gas=ch4&gwp_set=ar7",
		"token=x&token=y",
	} {
		for i := range names {
			f.Add(uint8(i), seed)
		}
	}
	h := s.Handler()
	f.Fuzz(func(t *testing.T, fn uint8, raw string) {
		name := names[int(fn)%len(names)]
		q, _ := parseFnQuery(raw)
		req := &http.Request{Method: http.MethodGet, URL: &url.URL{Path: "/v1/fn/" + name, RawQuery: raw},
			Header: http.Header{}, Body: http.NoBody, Host: "127.0.0.1"}
		req = req.WithContext(t.Context())
		rec := httptest.NewRecorder()
		h.ServeHTTP(rec, req)
		body := rec.Body.String()
		if rec.Code >= 500 {
			t.Fatalf("GET /v1/fn/%s?%s: %d %s", name, raw, rec.Code, body)
		}
		if rec.Code == 200 && q.format == formatText && name != "" {
			if _, isNum := funcs.ParseNumber(body); !isNum && !strings.HasPrefix(body, inlinePrefix) {
				t.Fatalf("GET /v1/fn/%s?%s: 200 %q is neither a number nor an inline error", name, raw, body)
			}
		}
		if rec.Code >= 400 && strings.TrimSpace(body) == "" {
			t.Fatalf("GET /v1/fn/%s?%s: %d without a message", name, raw, rec.Code)
		}
	})
}

// FuzzEvalJSON posts arbitrary bodies to POST /v1/eval as JSON: never a panic, never a 5xx,
// and every answer is valid JSON.
func FuzzEvalJSON(f *testing.F) {
	s, _ := fuzzServer(f)
	for _, seed := range []string{
		`{"expr": "fuel_co2(fuel, q, \"GJ\")", "vars": {"fuel": "natural_gas", "q": 1000}}`,
		`{"expr": "fuel_co2(fuel, q, unit)", "rows": [{"fuel": "gas", "q": 1, "unit": "GJ"}, {"fuel": 1}, 3, null, []]}`,
		`{"expr": "x / y", "vars": {"x": 1, "y": 0}}`,
		`{"expr": "a ** b", "vars": {"a": 1e308, "b": 1e308}}`,
		`{"expr": "map([1], #)"}`, `{"expr": "let x = 1; x"}`, `{"expr": "\"a\" + 1"}`,
		`{"expr": 1}`, `{"expr": null}`, `{}`, `[]`, `null`, `"x"`, `{"expr": "1"} x`,
		`{"expr": "1", "vars": {"x": {"y": 1}}}`, `{"expr": "__run"}`, `{"expr": "x", "vars": {"__run": 1, "x": 2}}`,
		`{"expr": "` + strings.Repeat("(", 500) + `"}`, `{"expr": "1", "rows": {}}`, `{"expr": "x", "rows": [{"x": 1e999}]}`,
		"{\"expr\": \"\xff\"}", `{"expr": "1", "expr": "2"}`,
	} {
		f.Add([]byte(seed))
	}
	h := s.Handler()
	f.Fuzz(func(t *testing.T, body []byte) {
		req := httptest.NewRequestWithContext(t.Context(), http.MethodPost, "/v1/eval", strings.NewReader(string(body)))
		req.Header.Set("Content-Type", "application/json")
		rec := httptest.NewRecorder()
		h.ServeHTTP(rec, req)
		if rec.Code >= 500 {
			t.Fatalf("%q: %d %s", body, rec.Code, rec.Body.String())
		}
		if !json.Valid(rec.Body.Bytes()) {
			t.Fatalf("%q: answer is not JSON: %q", body, rec.Body.String())
		}
	})
}

// FuzzEvalCSV posts arbitrary expressions and CSV bodies: never a panic, never a 5xx.
func FuzzEvalCSV(f *testing.F) {
	s, _ := fuzzServer(f)
	f.Add("fuel_co2(fuel, q, unit)", "fuel,q,unit\nnatural_gas,1000,GJ\ndiesel,,L\n")
	f.Add("a / b", "a,b\n1,0\n2,x\n")
	f.Add("a", "\ufeffa\n\"1\n")
	f.Add("a", "a,a\n1,2\n")
	f.Add("co2_from_carbon(c)", "c\r\n12\r\n")
	h := s.Handler()
	f.Fuzz(func(t *testing.T, expr, body string) {
		req := httptest.NewRequestWithContext(t.Context(), http.MethodPost, "/v1/eval?expr="+url.QueryEscape(expr)+"&as=out", strings.NewReader(body))
		req.Header.Set("Content-Type", "text/csv")
		rec := httptest.NewRecorder()
		h.ServeHTTP(rec, req)
		if rec.Code >= 500 {
			t.Fatalf("expr %q body %q: %d %s", expr, body, rec.Code, rec.Body.String())
		}
	})
}
