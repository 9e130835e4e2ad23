package server

import (
	"strings"
	"testing"

	"github.com/prometheus/client_golang/prometheus"
	dto "github.com/prometheus/client_model/go"
)

func counterValue(t testing.TB, c prometheus.Counter) float64 {
	t.Helper()
	var m dto.Metric
	if err := c.Write(&m); err != nil {
		t.Fatal(err)
	}
	return m.GetCounter().GetValue()
}

func TestMetrics(t *testing.T) {
	ts := startServer(t, Config{})
	get(t, ts.URL+"/v1/fn/fuel_co2?fuel=natural_gas&amount=1000&unit=GJ")
	get(t, ts.URL+"/v1/fn/fuel_co2?fuel=natural_gas&amount=1000&unit=GJ")
	get(t, ts.URL+"/v1/fn/fuel_co2?fuel=natural_gas&amount=1000&unit=ton")
	get(t, ts.URL+"/v1/fn/nope")
	get(t, ts.URL+"/no/such/route")
	postJSON(t, ts.URL+"/v1/eval", `{"expr": "co2_from_carbon(c)", "rows": [{"c": 12}, {"c": "x"}]}`)
	r := get(t, ts.URL+"/metrics")
	if r.Status != 200 {
		t.Fatalf("%d %s", r.Status, r.Body)
	}
	for _, want := range []string{
		`fluecell_http_requests_total{method="GET",route="/v1/fn/:name",status="200"} 2`,
		`fluecell_http_requests_total{method="GET",route="/v1/fn/:name",status="400"} 1`,
		`fluecell_http_requests_total{method="GET",route="unmatched",status="404"} 1`,
		`fluecell_http_errors_total{class="client",route="/v1/fn/:name"} 2`,
		`fluecell_function_calls_total{cache="hit",function="fuel_co2"} 1`,
		`fluecell_function_calls_total{cache="miss",function="fuel_co2"} 2`,
		`fluecell_function_calls_total{cache="miss",function="unknown"} 1`,
		`fluecell_function_errors_total{code="unit",function="fuel_co2"} 1`,
		`fluecell_function_errors_total{code="unknown-function",function="unknown"} 1`,
		`fluecell_eval_rows_total{outcome="ok"} 1`,
		`fluecell_eval_rows_total{outcome="error"} 1`,
		`fluecell_http_request_duration_seconds_bucket{route="/v1/eval",le="+Inf"} 1`,
		`fluecell_cache_entries 2`,
		"go_goroutines",
	} {
		if !strings.Contains(r.Body, want) {
			t.Errorf("/metrics lacks %s", want)
		}
	}
}
