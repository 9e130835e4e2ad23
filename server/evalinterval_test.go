package server

import (
	"encoding/json"
	"math"
	"strings"
	"testing"
)

// The 95 % interval over real HTTP. IPCC 2006 Vol 2 Ch 1 Table 1.4: natural gas 56 100 kg
// CO2/TJ, range 54 300–58 300, so 1000 GJ gives 56.1 t CO2 within 54.3–58.3 t (by hand).
func TestIntervalOverHTTP(t *testing.T) {
	ts := startServer(t, Config{})
	gas := "/v1/fn/fuel_co2?fuel=natural_gas&amount=1000&unit=GJ"
	var res struct {
		Value, Low, High float64
		Interval         struct{ Approach string }
		Notes            []string
	}
	r := get(t, ts.URL+gas+"&format=json")
	if r.Status != 200 {
		t.Fatalf("status %d: %s", r.Status, r.Body)
	}
	if err := json.Unmarshal([]byte(r.Body), &res); err != nil {
		t.Fatal(err)
	}
	if res.Value != 56.1 || res.Low != 54.3 || res.High != 58.3 || res.Interval.Approach != "approach1" {
		t.Errorf("format=json: %s", r.Body)
	}
	if r := get(t, ts.URL+gas); r.Body != "56.1" {
		t.Errorf("text/plain must stay one number, got %q", r.Body)
	}

	// POST /v1/eval: only when asked
	r = postJSON(t, ts.URL+"/v1/eval", `{"expr": "fuel_co2(\"natural_gas\", q, \"GJ\")", "vars": {"q": 1000}}`)
	if strings.HasPrefix(r.Body, `{"value":56.1,"low"`) || !strings.HasPrefix(r.Body, `{"value":56.1,"unit"`) {
		t.Errorf("interval given unasked: %s", r.Body)
	}
	body := `{"expr": "fuel_co2(\"natural_gas\", q, \"GJ\") + fuel_co2(\"natural_gas\", q, \"GJ\")", "vars": {"q": 1000}, "interval": %s}`
	r = postJSON(t, ts.URL+"/v1/eval", strings.Replace(body, "%s", "true", 1))
	res = struct {
		Value, Low, High float64
		Interval         struct{ Approach string }
		Notes            []string
	}{}
	if err := json.Unmarshal([]byte(r.Body), &res); err != nil {
		t.Fatal(err, r.Body)
	}
	// one factor row in both calls: fully correlated, the range doubled
	if math.Abs(res.Low-108.6) > 1e-9 || math.Abs(res.High-116.6) > 1e-9 {
		t.Errorf("interval true: %s", r.Body)
	}
	mc := strings.Replace(body, "%s", `{"approach": "approach2", "seed": 5, "draws": 20000}`, 1)
	a, b := postJSON(t, ts.URL+"/v1/eval", mc), postJSON(t, ts.URL+"/v1/eval", mc)
	if a.Status != 200 || a.Body != b.Body {
		t.Errorf("approach2 with a seed must repeat itself:\n%s\n%s", a.Body, b.Body)
	}
	if err := json.Unmarshal([]byte(a.Body), &res); err != nil {
		t.Fatal(err)
	}
	if res.Interval.Approach != "approach2" || math.Abs(res.Low-108.6) > 0.01*108.6 || math.Abs(res.High-116.6) > 0.01*116.6 {
		t.Errorf("approach2 far from approach1 (108.6..116.6): %s", a.Body)
	}

	// rows: low and high per row
	r = postJSON(t, ts.URL+"/v1/eval", `{"expr": "fuel_co2(fuel, q, \"GJ\")", "rows": [{"fuel": "natural_gas", "q": 1000}, {"fuel": "natural_gas", "q": 2000}], "interval": true}`)
	var rows struct {
		Results []struct{ Value, Low, High float64 }
	}
	if err := json.Unmarshal([]byte(r.Body), &rows); err != nil {
		t.Fatal(err)
	}
	if len(rows.Results) != 2 || rows.Results[1].Low != 108.6 || rows.Results[1].High != 116.6 {
		t.Errorf("rows: %s", r.Body)
	}

	for _, bad := range []struct{ iv, want string }{
		{`{"approach": "approach3"}`, "approach1"},
		{`{"draws": 0}`, "interval.draws"},
		{`"yes"`, "interval must be true, false or"},
	} {
		r := postJSON(t, ts.URL+"/v1/eval", strings.Replace(body, "%s", bad.iv, 1))
		if r.Status != 400 || !strings.Contains(r.Body, bad.want) {
			t.Errorf("interval %s: %d %s", bad.iv, r.Status, r.Body)
		}
	}
}
