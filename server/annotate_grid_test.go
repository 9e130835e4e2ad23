package server

import (
	"encoding/json"
	"math"
	"net/http"
	"strings"
	"testing"
)

// TestAnnotateGrid: ?grid= names the grid of purchased electricity rows;
// without it they are not computed and a grid-unknown finding says how to
// give one; an unknown grid is refused naming the parameter.
func TestAnnotateGrid(t *testing.T) {
	e := newEngine(t)
	srv := startServer(t, Config{Annotate: AnnotateHandler(e, AnnotateConfig{TempDir: t.TempDir()})})
	csv := "Energy,Quantity,Unit\nElectricity,10000,kWh\nDiesel,100,L\n"
	type report struct {
		Totals   struct{ TCO2, TCO2e float64 }
		ByFuel   map[string]map[string]float64 `json:"by_fuel"`
		Computed int
		Warnings []struct{ Cell, Severity, Code, Message string }
	}
	get := func(query string) (int, report, string) {
		t.Helper()
		r := do(t, http.MethodPost, srv.URL+"/v1/annotate?report=json"+query, map[string]string{"Content-Type": "text/csv"}, csv)
		var rep report
		if r.Status == 200 {
			if err := json.Unmarshal([]byte(r.Body), &rep); err != nil {
				t.Fatalf("%v: %.300s", err, r.Body)
			}
		}
		return r.Status, rep, r.Body
	}

	// Germany: 424.9 g CO2/kWh (European Environment Agency, CO2 emission
	// intensity of electricity generation by Member State, 2014 values):
	// 10 000 kWh = 4.249 t.
	status, rep, body := get("&grid=Germany")
	if status != 200 || rep.Computed != 2 {
		t.Fatalf("grid=Germany: %d, computed %d: %.300s", status, rep.Computed, body)
	}
	if got := rep.ByFuel["Scope 2: electricity"]["tCO2e"]; math.Abs(got-4.249) > 1e-9 {
		t.Errorf("electricity %.9g t CO2e, want 4.249", got)
	}

	status, rep, body = get("")
	if status != 200 || rep.Computed != 1 {
		t.Fatalf("no grid: %d, computed %d: %.300s", status, rep.Computed, body)
	}
	found := false
	for _, w := range rep.Warnings {
		if w.Code == "grid-unknown" && w.Cell == "A2" && strings.Contains(w.Message, "?grid=") {
			found = true
		}
	}
	if !found {
		t.Errorf("no grid-unknown finding at A2: %+v", rep.Warnings)
	}

	status, _, body = get("&grid=Atlantis")
	var eb errorBody
	json.Unmarshal([]byte(body), &eb)
	if status != 400 || eb.Param != "grid" || !strings.Contains(eb.Error, `"Atlantis"`) {
		t.Errorf("grid=Atlantis: %d %s", status, body)
	}
}
