package server

import (
	"encoding/csv"
	"encoding/json"
	"net/http"
	"strconv"
	"strings"
	"testing"
	"time"
)

type rowsAnswer struct {
	Results []struct {
		Value *float64 `json:"value"`
		Unit  string   `json:"unit"`
		Error string   `json:"error"`
		Code  string   `json:"code"`
	} `json:"results"`
	Sources []struct {
		Factor string `json:"factor"`
	} `json:"sources"`
	Notes []string `json:"notes"`
}

func TestEvalOne(t *testing.T) {
	ts := startServer(t, Config{})
	r := postJSON(t, ts.URL+"/v1/eval", `{"expr": "fuel_co2(fuel, q, \"GJ\") + 0", "vars": {"fuel": "natural_gas", "q": 1000}}`)
	var res struct {
		Value   float64 `json:"value"`
		Unit    string  `json:"unit"`
		Sources []any   `json:"sources"`
	}
	if err := json.Unmarshal([]byte(r.Body), &res); err != nil || r.Status != 200 {
		t.Fatalf("%d %s", r.Status, r.Body)
	}
	// IPCC 2006 Guidelines Vol 2 Ch 1 Table 1.4: 56,100 kg CO2/TJ
	if res.Value != 56.1 || len(res.Sources) != 1 {
		t.Errorf("%+v, want 56.1 with one source", res)
	}
	// the same expression again comes from the program cache and gives the same answer
	if again := postJSON(t, ts.URL+"/v1/eval", `{"expr": "fuel_co2(fuel, q, \"GJ\") + 0", "vars": {"fuel": "natural_gas", "q": 1000}}`); again.Body != r.Body {
		t.Errorf("second call %s, first %s", again.Body, r.Body)
	}
	// a constant expression needs no vars
	if r := postJSON(t, ts.URL+"/v1/eval", `{"expr": "co2_from_carbon(12)"}`); r.Status != 200 || !strings.HasPrefix(r.Body, `{"value":44,`) {
		t.Errorf("constant: %d %s", r.Status, r.Body)
	}
}

func TestEvalRows(t *testing.T) {
	ts := startServer(t, Config{})
	body := `{"expr": "fuel_co2(fuel, q, unit)", "vars": {"unit": "GJ"}, "rows": [
		{"fuel": "natural_gas", "q": 1000},
		{"fuel": "natural_gas", "q": 1, "unit": "ton"},
		{"fuel": "gas", "q": "1000"},
		7,
		{"fuel": "natural_gas", "q": [1]},
		{"fuel": "natural_gas"},
		{"fuel": "natural_gas", "q": 1e999}
	]}`
	r := postJSON(t, ts.URL+"/v1/eval", body)
	var ans rowsAnswer
	if err := json.Unmarshal([]byte(r.Body), &ans); err != nil || r.Status != 200 {
		t.Fatalf("%d %s", r.Status, r.Body)
	}
	if len(ans.Results) != 7 {
		t.Fatalf("%d results, want 7: %s", len(ans.Results), r.Body)
	}
	want := []struct {
		value float64
		code  string
		msg   string
	}{
		{56.1, "", ""}, // IPCC 2006 Vol 2 Ch 1 Table 1.4
		{0, "unit", "ambiguous unit"},
		{56.1, "", ""}, // the alias gas, a number given as a string
		{0, codeBadRequest, "row 3 is not an object"},
		{0, codeBadRequest, "rows[4].q is an array"},
		{0, "unknown-variable", `variable "q" has no value`},
		{0, codeBadRequest, "out of range"},
	}
	for i, w := range want {
		got := ans.Results[i]
		if w.code == "" {
			if got.Value == nil || *got.Value != w.value || got.Unit != "t CO2" || got.Error != "" {
				t.Errorf("row %d: %+v, want %v t CO2", i, got, w.value)
			}
			continue
		}
		if got.Value != nil || got.Code != w.code || !strings.Contains(got.Error, w.msg) {
			t.Errorf("row %d: %+v, want code %s and %q", i, got, w.code, w.msg)
		}
	}
	if len(ans.Sources) != 1 || ans.Sources[0].Factor != "ipcc2006/natural_gas/co2_ef" {
		t.Errorf("sources %+v, want the one factor once", ans.Sources)
	}
	if len(ans.Notes) != 1 || !strings.Contains(ans.Notes[0], `"gas"`) {
		t.Errorf("notes %q, want the alias note once", ans.Notes)
	}
	if r := postJSON(t, ts.URL+"/v1/eval", `{"expr": "1", "rows": []}`); r.Body != `{"results":[],"sources":[],"notes":[]}` {
		t.Errorf("no rows: %s", r.Body)
	}
}

func TestEvalErrors(t *testing.T) {
	ts := startServer(t, Config{MaxBodyBytes: 4096, MaxRows: 3})
	cases := []struct {
		name, ctype, query, body string
		status                   int
		param, msg               string
	}{
		{"empty body", "application/json", "", "", 400, "body", "empty"},
		{"not JSON", "application/json", "", "{expr: 1}", 400, "body", "not valid JSON at byte 2"},
		{"cut short", "application/json", "", `{"expr": "1"`, 400, "body", "ends in the middle"},
		{"array", "application/json", "", `[1]`, 400, "body", "not an object"},
		{"expr a number", "application/json", "", `{"expr": 1}`, 400, "expr", "must be a string"},
		{"vars an array", "application/json", "", `{"expr": "1", "vars": [1]}`, 400, "vars", "must be an object"},
		{"rows an object", "application/json", "", `{"expr": "1", "rows": {}}`, 400, "rows", "must be an array"},
		{"unknown field", "application/json", "", `{"expr": "1", "var": {}}`, 400, "var", "accepted are expr, vars, rows"},
		{"no expr", "application/json", "", `{"vars": {}}`, 400, "expr", "missing"},
		{"two values", "application/json", "", `{"expr": "1"} {}`, 400, "body", "more than one JSON value"},
		{"null var", "application/json", "", `{"expr": "x", "vars": {"x": null}}`, 400, "vars.x", "null"},
		{"compile", "application/json", "", `{"expr": "fuel_co2(\"natural_gas\", 1, \"tons\") +"}`, 400, "expr", "character"},
		{"unknown variable", "application/json", "", `{"expr": "qty * 2", "vars": {"qty2": 1}}`, 400, "expr", `unknown variable "qty"`},
		{"not allowed", "application/json", "", `{"expr": "map([1], #)"}`, 400, "expr", "map() is not available"},
		{"division by zero", "application/json", "", `{"expr": "x / 0", "vars": {"x": 1}}`, 400, "expr", "division by zero"},
		{"expr in query", "application/json", "?expr=1", `{"expr": "1"}`, 400, "expr", "text/csv"},
		{"too many rows", "application/json", "", `{"expr": "1", "rows": [{}, {}, {}, {}]}`, 413, "rows", "limit of 3 rows"},
		{"too large", "application/json", "", `{"expr": "1", "vars": {"s": "` + strings.Repeat("x", 5000) + `"}}`, 413, "body", "limit of 4096 bytes"},
		{"media type", "application/xml", "", `<expr/>`, 415, "Content-Type", "application/json"},
		{"bad media type", "text/", "", `{}`, 415, "Content-Type", "malformed"},
		{"csv without expr", "text/csv", "", "a\n1\n", 400, "expr", "missing"},
		{"csv unknown param", "text/csv", "?expr=a&az=x", "a\n1\n", 400, "az", "accepted are expr, as"},
		{"csv empty", "text/csv", "?expr=a", "", 400, "body", "empty"},
		{"csv empty header", "text/csv", "?expr=a", "a,\n1,2\n", 400, "body", "column 2 has no name"},
		{"csv duplicate header", "text/csv", "?expr=a", "a,a\n1,2\n", 400, "body", `"a" twice`},
		{"csv as clash", "text/csv", "?expr=a&as=a", "a\n1\n", 400, "as", "already has a column"},
		{"csv as empty", "text/csv", "?expr=a&as=", "a\n1\n", 400, "as", "empty"},
		{"csv ragged", "text/csv", "?expr=a", "a,b\n1,2\n3\n", 400, "body", "line 3"},
		{"csv bad quote", "text/csv", "?expr=a", "a\n\"1\n", 400, "body", "line"},
		{"csv unknown variable", "text/csv", "?expr=qty*2", "quantity\n1\n", 400, "expr", "known variables: quantity"},
		{"csv too many rows", "text/csv", "?expr=a", "a\n1\n2\n3\n4\n", 413, "rows", "limit of 3 rows"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			r := do(t, http.MethodPost, ts.URL+"/v1/eval"+c.query, map[string]string{"Content-Type": c.ctype}, c.body)
			var e errorBody
			if err := json.Unmarshal([]byte(r.Body), &e); err != nil {
				t.Fatalf("%d %q: %v", r.Status, r.Body, err)
			}
			if r.Status != c.status || e.Param != c.param || !strings.Contains(e.Error, c.msg) {
				t.Errorf("got %d param %q %q; want %d param %q with %q", r.Status, e.Param, e.Error, c.status, c.param, c.msg)
			}
		})
	}
}

func TestEvalCSV(t *testing.T) {
	ts := startServer(t, Config{})
	in := "\ufeffsite,fuel,quantity,unit\n" +
		"Northgate,natural_gas,1000,GJ\n" +
		"\"Harbour, east\",diesel,1000,L\n" +
		"Ridge,coal,5,ton\n" +
		"Ridge,natural_gas,,GJ\n"
	r := postCSV(t, ts.URL+"/v1/eval?expr="+urlEscape(`fuel_co2(fuel, quantity, unit)`)+"&as=tCO2", in)
	if r.Status != 200 || r.Header.Get("Content-Type") != ctCSV {
		t.Fatalf("%d %s", r.Status, r.Body)
	}
	rows, err := csv.NewReader(strings.NewReader(r.Body)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != 5 || strings.Join(rows[0], ",") != "site,fuel,quantity,unit,tCO2" {
		t.Fatalf("%q", rows)
	}
	if rows[1][4] != gas1000GJ || rows[2][0] != "Harbour, east" {
		t.Errorf("row 1 %q row 2 %q", rows[1], rows[2])
	}
	// IPCC 2006 Vol 2 Ch 1 Tables 1.2 and 1.4: gas/diesel oil NCV 43.0 TJ/Gg, 74,100 kg CO2/TJ;
	// density 832.5 kg/m3 is the pack's value (from memory): 0.8325 t x 43 GJ/t x 0.0741 t/GJ.
	if v, _ := strconv.ParseFloat(rows[2][4], 64); mathAbs(v-0.8325*43*0.0741) > 1e-9 {
		t.Errorf("diesel 1000 L = %s t CO2, want %v", rows[2][4], 0.8325*43*0.0741)
	}
	if !strings.HasPrefix(rows[3][4], "#ERROR: ") || !strings.Contains(rows[3][4], "ambiguous unit") {
		t.Errorf("bad unit row: %q", rows[3][4])
	}
	if !strings.HasPrefix(rows[4][4], "#ERROR: ") {
		t.Errorf("empty quantity row: %q", rows[4][4])
	}
	// without as, the column is called result; without Content-Type, expr in the query means CSV
	r = do(t, http.MethodPost, ts.URL+"/v1/eval?expr=co2_from_carbon(c)", nil, "c\n12\n")
	if r.Status != 200 || r.Body != "c,result\n12,44\n" {
		t.Errorf("%d %q", r.Status, r.Body)
	}
}

func TestEvalTimeout(t *testing.T) {
	ts := startServer(t, Config{EvalTimeout: time.Nanosecond})
	var b strings.Builder
	b.WriteString(`{"expr": "co2_from_carbon(c)", "rows": [`)
	for i := 0; i < 1000; i++ {
		if i > 0 {
			b.WriteString(",")
		}
		b.WriteString(`{"c": 1}`)
	}
	b.WriteString("]}")
	r := postJSON(t, ts.URL+"/v1/eval", b.String())
	if r.Status != http.StatusServiceUnavailable || !strings.Contains(r.Body, "fewer rows") {
		t.Errorf("%d %s", r.Status, r.Body)
	}
}

func mathAbs(x float64) float64 {
	if x < 0 {
		return -x
	}
	return x
}
