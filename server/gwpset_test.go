package server

import (
	"encoding/json"
	"math"
	"net/http"
	"strings"
	"testing"
)

// TestWorkbookGWPSet: ?gwp_set= weights CH4 and N2O of every call naming no
// set, on /v1/annotate and /v1/inspect; a bad set is a 400 naming gwp_set
// and the accepted sets, as is a mapping naming another set. 1 TJ natural
// gas: CO2 56 100 kg (IPCC 2006 Vol 2 Ch 1 Table 1.4), CH4 1 kg and N2O
// 0.1 kg (Vol 2 Ch 2 Table 2.2); AR6 fossil CH4 29.8, N2O 273 (AR6 WG1 Ch 7
// Table 7.15) give 56.1571 t CO2e, AR5 CH4 28, N2O 265 (AR5 WG1 Ch 8 Table
// 8.7) 56.1545 t.
func TestWorkbookGWPSet(t *testing.T) {
	e := newEngine(t)
	srv := startServer(t, Config{Annotate: AnnotateHandler(e, AnnotateConfig{TempDir: t.TempDir()})})
	csv := "Fuel,Quantity,Unit\nnatural gas,1,TJ\n"
	type report struct {
		GWPSet string `json:"gwp_set"`
		Rules  []string
		Totals struct {
			TCO2e float64 `json:"tCO2e"`
		}
	}
	for _, c := range []struct {
		query, set string
		want       float64
	}{
		{"&gwp_set=ar6", "ar6", (56100 + 29.8 + 0.1*273) / 1000},
		{"&gwp_set=AR5", "ar5", (56100 + 28 + 0.1*265) / 1000},
		{"", "ar5", (56100 + 28 + 0.1*265) / 1000},
	} {
		r := postCSV(t, srv.URL+"/v1/annotate?report=json"+c.query, csv)
		var rep report
		if r.Status != 200 || json.Unmarshal([]byte(r.Body), &rep) != nil {
			t.Fatalf("%q: %d %.300s", c.query, r.Status, r.Body)
		}
		if rep.GWPSet != c.set || math.Abs(rep.Totals.TCO2e-c.want) > 1e-9 {
			t.Errorf("%q: gwp_set %q, %.9g t CO2e; want %s, %.9g", c.query, rep.GWPSet, rep.Totals.TCO2e, c.set, c.want)
		}
		if named := strings.Contains(strings.Join(rep.Rules, "\n"), "(GWP set "+c.set+")"); named != (c.query != "") {
			t.Errorf("%q: rules %q", c.query, rep.Rules)
		}
	}

	r := postCSV(t, srv.URL+"/v1/inspect?gwp_set=ar6", csv)
	var ins struct {
		Report      report `json:"report"`
		MappingFile struct {
			GWPSet string `json:"gwp_set"`
		} `json:"mapping_file"`
	}
	if r.Status != 200 || json.Unmarshal([]byte(r.Body), &ins) != nil || ins.Report.GWPSet != "ar6" || ins.MappingFile.GWPSet != "ar6" {
		t.Errorf("inspect gwp_set=ar6: %d %+v %.300s", r.Status, ins, r.Body)
	}

	for _, route := range []string{"/v1/annotate", "/v1/inspect"} {
		r := postCSV(t, srv.URL+route+"?gwp_set=ar7", csv)
		var eb errorBody
		json.Unmarshal([]byte(r.Body), &eb)
		if r.Status != 400 || eb.Param != "gwp_set" || !strings.Contains(eb.Error, "ar4, ar5, ar6") {
			t.Errorf("%s gwp_set=ar7: %d %s", route, r.Status, r.Body)
		}
	}

	mapping := `{"fluecell_mapping": 1, "tables": [], "names": {}, "gwp_set": "ar5"}`
	form, ftype := multipartParts(t, [][3]string{{"mapping", "", mapping}, {"file", "gas.csv", csv}})
	r = do(t, http.MethodPost, srv.URL+"/v1/annotate?report=json&gwp_set=ar6", map[string]string{"Content-Type": ftype}, form)
	if r.Status != 400 || !strings.Contains(r.Body, "gwp_set ar5") {
		t.Errorf("mapping ar5 with gwp_set=ar6: %d %s", r.Status, r.Body)
	}
	form, ftype = multipartParts(t, [][3]string{{"mapping", "", strings.Replace(mapping, "ar5", "ar9", 1)}, {"file", "gas.csv", csv}})
	r = do(t, http.MethodPost, srv.URL+"/v1/annotate?report=json", map[string]string{"Content-Type": ftype}, form)
	if r.Status != 400 || !strings.Contains(r.Body, "gwp_set") || !strings.Contains(r.Body, "ar4, ar5, ar6") {
		t.Errorf("mapping gwp_set ar9: %d %s", r.Status, r.Body)
	}
}
