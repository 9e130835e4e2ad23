package server

import (
	"bytes"
	"encoding/json"
	"mime/multipart"
	"net/http"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"

	"github.com/fluecell/fluecell/importer/demo"
)

// demoWorkbook is the demo's fuel log as bytes.
func demoWorkbook(t testing.TB) []byte {
	t.Helper()
	paths, err := demo.Write(t.TempDir())
	if err != nil {
		t.Fatal(err)
	}
	b, err := os.ReadFile(paths[0])
	if err != nil {
		t.Fatal(err)
	}
	return b
}

// multipartFile is a form with the workbook in part "file", after the
// given plain fields.
func multipartFile(t testing.TB, name, content string, fields ...string) (body, contentType string) {
	t.Helper()
	var buf bytes.Buffer
	w := multipart.NewWriter(&buf)
	for i := 0; i+1 < len(fields); i += 2 {
		w.WriteField(fields[i], fields[i+1])
	}
	fw, err := w.CreateFormFile("file", name)
	if err != nil {
		t.Fatal(err)
	}
	fw.Write([]byte(content))
	w.Close()
	return buf.String(), w.FormDataContentType()
}

// TestAnnotateRoute posts workbooks over real HTTP and reads the answers
// back as a client would.
func TestAnnotateRoute(t *testing.T) {
	e := newEngine(t)
	tmp := t.TempDir()
	srv := startServer(t, Config{Annotate: AnnotateHandler(e, AnnotateConfig{TempDir: tmp})})
	xlsx := demoWorkbook(t)

	// The annotated workbook comes back, named after the upload.
	r := do(t, http.MethodPost, srv.URL+"/v1/annotate?name=kestrel%20week%2014.xlsx", map[string]string{"Content-Type": typeXLSX}, string(xlsx))
	if r.Status != 200 || r.Header.Get("Content-Disposition") != `attachment; filename="kestrel week 14.carbon.xlsx"` {
		t.Fatalf("%d %q: %.200s", r.Status, r.Header.Get("Content-Disposition"), r.Body)
	}
	f, err := excelize.OpenReader(strings.NewReader(r.Body))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	for _, sheet := range []string{"Fuel log", "Notes", "Carbon summary", "Carbon warnings", "Carbon sources"} {
		if idx, _ := f.GetSheetIndex(sheet); idx < 0 {
			t.Errorf("no sheet %q in %v", sheet, f.GetSheetList())
		}
	}
	// Natural gas, 18 500 kWh = 66.6 GJ x 56 100 kg CO2/TJ (IPCC 2006 Vol 2 Ch 1 Table 1.4) = 3.73626 t
	if v, _ := f.GetCellValue("Fuel log", "H5", excelize.Options{RawCellValue: true}); v != "3.73626" {
		t.Errorf("Fuel log!H5 = %q, want 3.73626 (tCO2 of the first row)", v)
	}

	// The report: the same JSON as fluecell annotate --report, via multipart.
	form, formType := multipartFile(t, "log.xlsx", string(xlsx), "note", "week 14")
	r = do(t, http.MethodPost, srv.URL+"/v1/annotate?report=json", map[string]string{"Content-Type": formType}, form)
	var rep struct {
		Rules  []string
		Totals struct {
			TCO2 float64  `json:"tCO2"`
			Low  *float64 `json:"tCO2e_low"`
		}
		Layout   string
		Output   string
		Warnings []struct{ Sheet, Cell, Severity, Code, Message string }
	}
	if r.Status != 200 || json.Unmarshal([]byte(r.Body), &rep) != nil {
		t.Fatalf("%d: %.300s", r.Status, r.Body)
	}
	if len(rep.Rules) != 2 || rep.Layout != "inline" || rep.Output != "" || rep.Totals.TCO2 <= 0 || rep.Totals.Low == nil {
		t.Errorf("report %+v", rep)
	}
	found := false
	for _, w := range rep.Warnings {
		if w.Cell == "E16" && w.Code == "unit-ambiguous" {
			found = true
		}
		if strings.Contains(w.Message, tmp) {
			t.Errorf("a message shows the server's temporary path: %s", w.Message)
		}
	}
	if !found {
		t.Errorf("no unit-ambiguous warning at E16: %+v", rep.Warnings)
	}

	// curl --data-binary sends application/x-www-form-urlencoded: the body decides.
	r = do(t, http.MethodPost, srv.URL+"/v1/annotate", map[string]string{"Content-Type": "application/x-www-form-urlencoded"}, string(xlsx))
	if r.Status != 200 || r.Header.Get("Content-Type") != typeXLSX {
		t.Errorf("form-encoded xlsx: %d %s", r.Status, r.Header.Get("Content-Type"))
	}
	// A legacy .xls is refused by name with the importer's message.
	r = do(t, http.MethodPost, srv.URL+"/v1/annotate", map[string]string{"Content-Type": "application/octet-stream"}, "\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1rest of an old workbook")
	if r.Status != 400 || !strings.Contains(r.Body, ".xls") {
		t.Errorf("xls: %d %s", r.Status, r.Body)
	}
	// A rule's compile error keeps its caret in detail.
	r = do(t, http.MethodPost, srv.URL+"/v1/annotate?rule=tCO2%3Dfuel_co2(fuel%2C%20quantity%2C%20%22ton%22)", map[string]string{"Content-Type": "text/csv"}, "Fuel,Quantity\ndiesel,5\n")
	var eb errorBody
	json.Unmarshal([]byte(r.Body), &eb)
	if r.Status != 400 || !strings.Contains(eb.Error, `ambiguous unit "ton"`) || !strings.Contains(eb.Detail, "^") || strings.Contains(eb.Error, "\n") {
		t.Errorf("rule error: %d %+v", r.Status, eb)
	}
	// Nothing is left in the temporary folder but this server's empty spool folder.
	if entries, _ := os.ReadDir(tmp); len(entries) != 1 || entries[0].Name() != spoolDirName {
		t.Errorf("left behind: %v", entries)
	}
	if entries, _ := filepath.Glob(filepath.Join(tmp, spoolDirName, "*", "*")); len(entries) != 0 {
		t.Errorf("left behind: %v", entries)
	}
}
