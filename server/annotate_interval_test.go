package server

import (
	"encoding/json"
	"net/http"
	"strings"
	"testing"
)

// /v1/annotate?uncertainty=approach2&seed=N gives the totals' intervals by Monte Carlo, the same
// for the same seed, and says so in the report; a bad value is a 400 naming the parameter.
func TestAnnotateUncertaintyParameter(t *testing.T) {
	e := newEngine(t)
	srv := startServer(t, Config{Annotate: AnnotateHandler(e, AnnotateConfig{TempDir: t.TempDir()})})
	xlsx := string(demoWorkbook(t))
	type report struct {
		Totals struct {
			TCO2e    float64  `json:"tCO2e"`
			Low      *float64 `json:"tCO2e_low"`
			High     *float64 `json:"tCO2e_high"`
			Approach string   `json:"approach"`
		}
		Uncertainty struct {
			Approach string
			Seed     uint64
			Draws    int
		}
	}
	get := func(query string) (int, report, string) {
		t.Helper()
		r := do(t, http.MethodPost, srv.URL+"/v1/annotate?report=json"+query, map[string]string{"Content-Type": typeXLSX}, xlsx)
		var rep report
		if r.Status == 200 {
			if err := json.Unmarshal([]byte(r.Body), &rep); err != nil {
				t.Fatalf("%v: %.300s", err, r.Body)
			}
		}
		return r.Status, rep, r.Body
	}
	status, a, body := get("&uncertainty=approach2&seed=5&draws=2000")
	if status != 200 || a.Totals.Low == nil || a.Totals.Approach != "approach2" || a.Uncertainty.Seed != 5 || a.Uncertainty.Draws != 2000 {
		t.Fatalf("approach2: %d %+v: %.300s", status, a, body)
	}
	if !(*a.Totals.Low < a.Totals.TCO2e && a.Totals.TCO2e < *a.Totals.High) {
		t.Errorf("interval %g..%g does not hold the total %g", *a.Totals.Low, *a.Totals.High, a.Totals.TCO2e)
	}
	_, b, _ := get("&uncertainty=approach2&seed=5&draws=2000")
	if *a.Totals.Low != *b.Totals.Low || *a.Totals.High != *b.Totals.High {
		t.Errorf("same seed, different intervals: %+v %+v", a.Totals, b.Totals)
	}
	for q, param := range map[string]string{"&uncertainty=approach9": "uncertainty", "&uncertainty=approach2&draws=0": "draws", "&seed=-1": "seed"} {
		status, _, body := get(q)
		if status != 400 || !strings.Contains(body, param) {
			t.Errorf("%s: %d %.200s", q, status, body)
		}
	}
}
