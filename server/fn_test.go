package server

import (
	"encoding/json"
	"encoding/xml"
	"math"
	"net/http"
	"net/url"
	"strconv"
	"strings"
	"testing"
)

// Published values the answers are checked against.
const (
	// IPCC 2006 Guidelines Vol 2 Ch 1 Table 1.4: natural gas 56,100 kg CO2/TJ, so 1000 GJ = 56.1 t CO2.
	gas1000GJ = "56.1"
	// NIST SP 811 Appendix B: 1 Btu (IT) = 1055.05585262 J, so 1 MMBtu = 1.05505585262 GJ.
	mmbtuInGJ = "1.05505585262"
)

func TestFnFormats(t *testing.T) {
	ts := startServer(t, Config{})
	base := ts.URL + "/v1/fn/fuel_co2?fuel=natural_gas&amount=1000&unit=GJ"

	r := get(t, base)
	if r.Status != 200 || r.Body != gas1000GJ || r.Header.Get("Content-Type") != ctText {
		t.Fatalf("text: %d %q %q, want 200 %q text/plain (IPCC 2006 Vol 2 Ch 1 Table 1.4)", r.Status, r.Header.Get("Content-Type"), r.Body, gas1000GJ)
	}

	r = get(t, base+"&format=json")
	var res struct {
		Value   float64 `json:"value"`
		Unit    string  `json:"unit"`
		Sources []struct {
			Factor string  `json:"factor"`
			Value  float64 `json:"value"`
			Source string  `json:"source"`
		} `json:"sources"`
		Notes []string `json:"notes"`
	}
	if err := json.Unmarshal([]byte(r.Body), &res); err != nil || r.Status != 200 {
		t.Fatalf("json: %d %v: %s", r.Status, err, r.Body)
	}
	if res.Value != 56.1 || res.Unit != "t CO2" || len(res.Sources) != 1 ||
		res.Sources[0].Factor != "ipcc2006/natural_gas/co2_ef" || res.Sources[0].Value != 56100 ||
		!strings.Contains(res.Sources[0].Source, "Table 1.4") {
		t.Errorf("json: %+v; want 56.1 t CO2 from ipcc2006/natural_gas/co2_ef = 56100 (IPCC 2006 Vol 2 Ch 1 Table 1.4)", res)
	}

	r = get(t, base+"&format=csv")
	if want := "value,unit,sources\n56.1,t CO2,ipcc2006/natural_gas/co2_ef\n"; r.Body != want || r.Header.Get("Content-Type") != ctCSV {
		t.Errorf("csv: %q %q, want %q", r.Header.Get("Content-Type"), r.Body, want)
	}

	r = get(t, base+"&format=xml")
	var doc struct {
		Value   string `xml:"value"`
		Unit    string `xml:"unit"`
		Sources []struct {
			Factor string `xml:"factor,attr"`
			Text   string `xml:",chardata"`
		} `xml:"sources>source"`
	}
	if err := xml.Unmarshal([]byte(r.Body), &doc); err != nil {
		t.Fatalf("xml: %v: %s", err, r.Body)
	}
	if doc.Value != gas1000GJ || doc.Unit != "t CO2" || len(doc.Sources) != 1 || !strings.Contains(doc.Sources[0].Text, "56100 kg CO2/TJ") {
		t.Errorf("xml: %+v", doc)
	}

	// a unit with a space, as ENCODEURL writes it (%20) and as forms write it (+)
	for _, u := range []string{"MMBtu%20HHV", "MMBtu+HHV"} {
		r = get(t, ts.URL+"/v1/fn/to_unit?value=1&from=MMBtu&to=GJ")
		if r.Body != mmbtuInGJ {
			t.Errorf("to_unit 1 MMBtu in GJ = %q, want %s (NIST SP 811 Appendix B)", r.Body, mmbtuInGJ)
		}
		r = get(t, ts.URL+"/v1/fn/fuel_energy?fuel=natural_gas&amount=1&unit="+u+"&to_unit=MMBtu%20HHV")
		if r.Status != 200 {
			t.Errorf("unit=%s: %d %s", u, r.Status, r.Body)
		} else if v, _ := strconv.ParseFloat(r.Body, 64); math.Abs(v-1) > 1e-12 {
			t.Errorf("fuel_energy 1 MMBtu HHV in MMBtu HHV = %s, want 1", r.Body)
		}
	}
}

// TestFnEveryExample calls every catalog function over HTTP with its example and expects the
// number the catalog declares.
func TestFnEveryExample(t *testing.T) {
	ts := startServer(t, Config{})
	e := newEngine(t)
	for _, f := range e.Functions() {
		u, err := exampleURL(f)
		if err != nil {
			t.Fatal(err)
		}
		r := get(t, ts.URL+u)
		v, err := strconv.ParseFloat(r.Body, 64)
		if r.Status != 200 || err != nil {
			t.Errorf("%s: %d %q", u, r.Status, r.Body)
			continue
		}
		if math.Abs(v-f.ExampleResult) > 1e-9*math.Max(1, math.Abs(f.ExampleResult)) {
			t.Errorf("%s = %v, want the catalog's example result %v", u, v, f.ExampleResult)
		}
	}
}

func TestFnErrors(t *testing.T) {
	ts := startServer(t, Config{})
	fn := ts.URL + "/v1/fn/fuel_co2?"
	long := strings.Repeat("x", maxValueLen+1)
	cases := []struct {
		name, url  string
		status     int
		param      string // the parameter the message must name
		msgContain string
	}{
		{"missing amount", fn + "fuel=natural_gas&unit=GJ", 400, "amount", "missing required parameter amount"},
		{"unknown parameter", fn + "fuel=natural_gas&amount=1&unit=GJ&amuont=2", 400, "amuont", "takes fuel, amount, unit, pack"},
		{"decimal comma", fn + "fuel=natural_gas&amount=1,5&unit=GJ", 400, "amount", `"." as decimal separator`},
		{"ambiguous unit", fn + "fuel=natural_gas&amount=1&unit=ton", 400, "unit", "short_ton"},
		{"unknown fuel", fn + "fuel=unobtainium&amount=1&unit=GJ", 400, "fuel", "unknown fuel"},
		{"unknown pack", fn + "fuel=natural_gas&amount=1&unit=GJ&pack=ipcc1996", 400, "pack", "accepted are epa2025, ipcc2006"},
		{"given twice", fn + "fuel=natural_gas&amount=1&amount=2&unit=GJ", 400, "amount", "more than once"},
		{"bad escape", fn + "fuel=natural_gas&amount=1&unit=G%zzJ", 400, "unit", "%-escape"},
		{"no name", fn + "=3&fuel=natural_gas&amount=1&unit=GJ", 400, "query", "without a name"},
		{"long value", fn + "fuel=" + long + "&amount=1&unit=GJ", 400, "fuel", "limit is 256"},
		{"too many", fn + manyParams(maxQueryParams+1), 400, "query", "more than 32"},
		{"unknown function", ts.URL + "/v1/fn/fuel_co3?fuel=natural_gas&amount=1&unit=GJ", 404, "", "did you mean fuel_co2?"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			r := get(t, c.url+"&format=json")
			var body errorBody
			if err := json.Unmarshal([]byte(r.Body), &body); err != nil {
				t.Fatalf("%d %s: %v", r.Status, r.Body, err)
			}
			if r.Status != c.status || body.Param != c.param || !strings.Contains(body.Error, c.msgContain) {
				t.Errorf("got %d param %q %q; want %d param %q, message with %q", r.Status, body.Param, body.Error, c.status, c.param, c.msgContain)
			}
			if cc := r.Header.Get("Cache-Control"); cc != "no-store" {
				t.Errorf("Cache-Control %q, want no-store on an error", cc)
			}
			// the same mistake inline: 200 and "#ERROR: " + the same message, in text and csv
			r = get(t, c.url+"&errors=inline")
			if r.Status != 200 || r.Body != inlinePrefix+body.Error {
				t.Errorf("inline: %d %q, want 200 %q", r.Status, r.Body, inlinePrefix+body.Error)
			}
			r = get(t, c.url+"&errors=inline&format=csv")
			if r.Status != 200 || !strings.HasPrefix(r.Body, "error,code\n") || !strings.Contains(r.Body, inlinePrefix) {
				t.Errorf("inline csv: %d %q", r.Status, r.Body)
			}
			// and as a status in text: the message alone
			r = get(t, c.url)
			if r.Status != c.status || r.Body != body.Error {
				t.Errorf("text: %d %q, want %d %q", r.Status, r.Body, c.status, body.Error)
			}
		})
	}
}

func manyParams(n int) string {
	var b strings.Builder
	for i := 0; i < n; i++ {
		b.WriteString("p" + strconv.Itoa(i) + "=1&")
	}
	return b.String()
}

// TestFnReservedErrors: mistakes in format and errors themselves.
func TestFnReservedErrors(t *testing.T) {
	ts := startServer(t, Config{})
	fn := ts.URL + "/v1/fn/fuel_co2?fuel=natural_gas&amount=1&unit=GJ"
	cases := []struct {
		query, want string
		status      int
	}{
		{"&format=html", `format "html" is not known: accepted are text (the default), json, csv, xml`, 400},
		{"&format=html&errors=inline", `#ERROR: format "html" is not known: accepted are text (the default), json, csv, xml`, 200},
		{"&errors=loud", `errors "loud" is not known: accepted are status (the default: an error is a 4xx answer) and inline (a 200 answer reading #ERROR: message)`, 400},
		{"&format=json&format=csv", `{"error":"query parameter format is given more than once; give it once","code":"bad-request","param":"format"}`, 400},
		{"&errors=inline&errors=status", `#ERROR: query parameter errors is given more than once; give it once`, 200},
		{"&format=JSON", `{"value":0.0561,`, 200},
	}
	for _, c := range cases {
		r := get(t, fn+c.query)
		if r.Status != c.status || !strings.HasPrefix(r.Body, c.want) {
			t.Errorf("%s: %d %q, want %d %q", c.query, r.Status, r.Body, c.status, c.want)
		}
	}
}

func TestFnCacheAndETag(t *testing.T) {
	ts := startServer(t, Config{})
	u := ts.URL + "/v1/fn/fuel_co2e?fuel=diesel&amount=1000&unit=L"
	first := get(t, u)
	second := get(t, u)
	if first.Status != 200 || first.Body != second.Body {
		t.Fatalf("%d %q then %q", first.Status, first.Body, second.Body)
	}
	etag := first.Header.Get("ETag")
	if etag == "" || etag != second.Header.Get("ETag") {
		t.Fatalf("ETag %q then %q", etag, second.Header.Get("ETag"))
	}
	if cc := first.Header.Get("Cache-Control"); cc != "public, max-age="+fnMaxAge {
		t.Errorf("Cache-Control %q", cc)
	}
	_, fm := ts.srv.metrics.fn("fuel_co2e")
	if hits := counterValue(t, fm.hit); hits != 1 {
		t.Errorf("cache hits %v, want 1 after two identical calls", hits)
	}
	r := do(t, http.MethodGet, u, map[string]string{"If-None-Match": `"other", ` + etag}, "")
	if r.Status != http.StatusNotModified || r.Body != "" {
		t.Errorf("If-None-Match: %d %q, want 304 and no body", r.Status, r.Body)
	}
	// another format is another representation
	if j := get(t, u+"&format=json"); j.Header.Get("ETag") == etag {
		t.Errorf("json answer has the ETag of the text answer")
	}
	// the cache stays bounded
	small := startServer(t, Config{CacheEntries: 8})
	for i := 0; i < 100; i++ {
		get(t, small.URL+"/v1/fn/co2_from_carbon?mass="+strconv.Itoa(i))
	}
	if n := small.srv.answers.len(); n > 8 {
		t.Errorf("cache holds %d answers, limit 8", n)
	}
	// and can be turned off
	off := startServer(t, Config{CacheEntries: -1})
	get(t, off.URL+"/v1/fn/co2_from_carbon?mass=12")
	if r := get(t, off.URL+"/v1/fn/co2_from_carbon?mass=12"); r.Body != "44" || off.srv.answers.len() != 0 {
		t.Errorf("cache off: %q, %d entries", r.Body, off.srv.answers.len())
	}
}

func TestToken(t *testing.T) {
	const token = "s3cret-Token_value"
	ts := startServer(t, Config{Token: token})
	fn := ts.URL + "/v1/fn/co2_from_carbon?mass=12"
	cases := []struct {
		name   string
		url    string
		header map[string]string
		status int
	}{
		{"none", fn, nil, 401},
		{"wrong", fn + "&token=guess", nil, 401},
		{"wrong bearer", fn, map[string]string{"Authorization": "Bearer guess"}, 401},
		{"query", fn + "&token=" + token, nil, 200},
		{"escaped name", fn + "&%74oken=" + token, nil, 200},
		{"bearer", fn, map[string]string{"Authorization": "Bearer " + token}, 200},
		{"bearer lower case", fn, map[string]string{"Authorization": "bearer " + token}, 200},
		{"basic", fn, map[string]string{"Authorization": "Basic " + token}, 401},
		{"functions", ts.URL + "/v1/functions", nil, 401},
		{"metrics", ts.URL + "/metrics", nil, 401},
		{"openapi", ts.URL + "/openapi.yaml", nil, 401},
		{"eval", ts.URL + "/v1/eval", map[string]string{"Content-Type": "application/json"}, 401},
		{"healthz stays open", ts.URL + "/healthz", nil, 200},
	}
	for _, c := range cases {
		method := http.MethodGet
		body := ""
		if strings.HasSuffix(c.url, "/v1/eval") {
			method, body = http.MethodPost, `{"expr": "1+1"}`
		}
		r := do(t, method, c.url, c.header, body)
		if r.Status != c.status {
			t.Errorf("%s: %d %q, want %d", c.name, r.Status, r.Body, c.status)
		}
		if r.Status == 401 && (r.Header.Get("WWW-Authenticate") == "" || !strings.Contains(r.Body, "Authorization: Bearer")) {
			t.Errorf("%s: 401 without a WWW-Authenticate header or advice: %q", c.name, r.Body)
		}
		if c.status == 200 && strings.Contains(c.url, "/v1/fn/") && r.Header.Get("Cache-Control") != "private, max-age="+fnMaxAge {
			t.Errorf("%s: Cache-Control %q behind a token", c.name, r.Header.Get("Cache-Control"))
		}
	}
	// a sheet with errors=inline sees why
	if r := get(t, fn+"&errors=inline"); r.Status != 200 || !strings.HasPrefix(r.Body, "#ERROR: missing or wrong token") {
		t.Errorf("inline 401: %d %q", r.Status, r.Body)
	}
	if strings.Contains(ts.logs.String(), token) {
		t.Errorf("the token appears in the log:\n%s", ts.logs.String())
	}
	if !strings.Contains(ts.logs.String(), "token=REDACTED") {
		t.Errorf("the log does not show the redacted token parameter")
	}
}

func TestParseFnQuery(t *testing.T) {
	q, e := parseFnQuery("fuel=natural+gas&amount=1e3&unit=MMBtu%20HHV&format=JSON&errors=inline&token=x&&")
	if e != nil {
		t.Fatal(e)
	}
	want := map[string]string{"fuel": "natural gas", "amount": "1e3", "unit": "MMBtu HHV"}
	if len(q.args) != len(want) || q.format != formatJSON || !q.inline {
		t.Fatalf("%+v", q)
	}
	for k, v := range want {
		if q.args[k] != v {
			t.Errorf("%s = %q, want %q", k, q.args[k], v)
		}
	}
	// an error elsewhere still reports the format and errors mode asked for
	q, e = parseFnQuery("amount=%zz&format=xml&errors=inline")
	if e == nil || q.format != formatXML || !q.inline {
		t.Errorf("%+v %v", q, e)
	}
	if _, err := url.ParseQuery("a=1"); err != nil {
		t.Fatal(err)
	}
}
