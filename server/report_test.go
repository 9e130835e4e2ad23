package server

import (
	"encoding/json"
	"math"
	"net/http"
	"net/http/httptest"
	"net/url"
	"strings"
	"testing"

	"github.com/fluecell/fluecell/importer"
)

// TestReportNeverEmpty200: report=json is never a 200 with an empty body. Rows whose finite
// values sum past the float64 range gave totals of +Inf, which JSON cannot hold: the answer
// is either the report or a JSON error, never 200 and nothing.
func TestReportNeverEmpty200(t *testing.T) {
	e := newEngine(t)
	ts := startServer(t, Config{Annotate: AnnotateHandler(e, AnnotateConfig{TempDir: t.TempDir()})})
	r := do(t, http.MethodPost, ts.URL+"/v1/annotate?report=json&rule="+url.QueryEscape("tCO2 = quantity"),
		map[string]string{"Content-Type": "text/csv"}, "Fuel,Quantity\ndiesel,1e308\ndiesel,1e308\n")
	var v map[string]any
	if err := json.Unmarshal([]byte(r.Body), &v); err != nil {
		t.Fatalf("%d with a body that is not JSON (%v): %q", r.Status, err, r.Body)
	}
	if r.Status == 200 && v["totals"] == nil || r.Status != 200 && v["error"] == nil {
		t.Errorf("%d %s", r.Status, r.Body)
	}
	if r.Header.Get("Content-Length") != strconvItoa(len(r.Body)) {
		t.Errorf("Content-Length %q for %d bytes", r.Header.Get("Content-Length"), len(r.Body))
	}
}

// TestWriteReportInf: a report holding +Inf (whatever produced it) is a 500 with a JSON
// message and the cause for the log, never a 200.
func TestWriteReportInf(t *testing.T) {
	h := AnnotateHandler(newEngine(t), AnnotateConfig{TempDir: t.TempDir()}).(*annotateHandler)
	rep := &importer.Report{Rules: []string{"tCO2 = quantity"}, Totals: importer.Totals{TCO2: math.Inf(1)}}
	req := httptest.NewRequest(http.MethodPost, "/v1/annotate?report=json", nil)
	req, outcome := withOutcome(req)
	w := httptest.NewRecorder()
	h.writeReport(w, req, rep)
	if w.Code != 500 || !strings.Contains(w.Body.String(), `"code":"internal"`) || outcome.err == nil || outcome.err.cause == nil {
		t.Errorf("%d %q (outcome %+v)", w.Code, w.Body.String(), outcome.err)
	}
	rep.Totals.TCO2 = 1
	w = httptest.NewRecorder()
	h.writeReport(w, req, rep)
	if w.Code != 200 || !strings.Contains(w.Body.String(), `"rules":["tCO2 = quantity"]`) {
		t.Errorf("a finite report: %d %q", w.Code, w.Body.String())
	}
}

func strconvItoa(n int) string { b, _ := json.Marshal(n); return string(b) }
