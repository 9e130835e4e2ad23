package server

import (
	"encoding/json"
	"strings"
	"testing"
)

// TestGridsRoute: GET /v1/grids lists the grids; ?grid= reads a name as analysts write it
// and lists that grid's rows (US EPA eGRID2022, CAMX CO2 total output rate 497.443 lb/MWh, in EPA's
// data file USEPA/ggcapdthemes data-raw/CO2_total_output_emission_rate_by_eGRID_subregion_2022.csv).
func TestGridsRoute(t *testing.T) {
	ts := startServer(t, Config{})
	r := get(t, ts.URL+"/v1/grids")
	var all struct {
		Grids []struct {
			ID    string `json:"id"`
			Years []int  `json:"years"`
		} `json:"grids"`
	}
	if r.Status != 200 || json.Unmarshal([]byte(r.Body), &all) != nil || len(all.Grids) < 50 {
		t.Fatalf("grids: %d %.300s", r.Status, r.Body)
	}
	r = get(t, ts.URL+"/v1/grids?grid=eGRID%20CAMX")
	if r.Status != 200 || !strings.Contains(r.Body, `"id":"us_camx"`) || !strings.Contains(r.Body, `"factor":"egrid2022/us_camx/grid_co2","pack":"egrid2022","id":"us_camx","quantity":"grid_co2","value":497.443`) {
		t.Errorf("grids CAMX: %d %.600s", r.Status, r.Body)
	}
	r = get(t, ts.URL+"/v1/grids?grid=atlantis")
	if r.Status != 400 || !strings.Contains(r.Body, `unknown grid \"atlantis\"`) {
		t.Errorf("grids atlantis: %d %.300s", r.Status, r.Body)
	}
	r = get(t, ts.URL+"/v1/grids?country=de")
	if r.Status != 400 || !strings.Contains(r.Body, "accepted are grid") {
		t.Errorf("grids country: %d %.300s", r.Status, r.Body)
	}
}
