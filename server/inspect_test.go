package server

import (
	"bytes"
	"encoding/json"
	"mime/multipart"
	"net/http"
	"net/textproto"
	"strings"
	"testing"
)

// demoMapping is a mapping file for the demo's fuel log (importer/demo): its columns as
// fluecell reads them, column G read as no role, and the misspelt "Natral gas" of C11 mapped
// to natural_gas.
const demoMapping = `{"fluecell_mapping": 1,
 "tables": [{"sheet": "Fuel log", "header_row": 4, "kind": "fuel-log", "columns": [
   {"column": "A", "header": "Date", "role": "date"}, {"column": "B", "header": "Site", "role": "group"},
   {"column": "C", "header": "Fuel", "role": "fuel"}, {"column": "D", "header": "Quantity", "role": "quantity"},
   {"column": "E", "header": "Unit", "role": "unit"}, {"column": "F", "header": "Supplier", "role": "none"},
   {"column": "G", "header": "Reported tCO2", "role": "none"}]}],
 "names": {"Natral gas": "natural_gas"}}`

// multipartParts builds a multipart form of parts {name, file name ("" for a field), content}.
func multipartParts(t testing.TB, parts [][3]string) (body, contentType string) {
	t.Helper()
	var buf bytes.Buffer
	w := multipart.NewWriter(&buf)
	for _, p := range parts {
		h := textproto.MIMEHeader{}
		if p[1] != "" {
			h.Set("Content-Disposition", `form-data; name="`+p[0]+`"; filename="`+p[1]+`"`)
			h.Set("Content-Type", "application/octet-stream")
		} else {
			h.Set("Content-Disposition", `form-data; name="`+p[0]+`"`)
			h.Set("Content-Type", "application/json")
		}
		pw, err := w.CreatePart(h)
		if err != nil {
			t.Fatal(err)
		}
		pw.Write([]byte(p[2]))
	}
	w.Close()
	return buf.String(), w.FormDataContentType()
}

// inspectAnswer is the part of POST /v1/inspect's answer the tests read.
type inspectAnswer struct {
	Path   string
	Report struct {
		Rows, Computed int
		Mapping        *struct{ Path string }
		Warnings       []struct{ Sheet, Cell, Severity, Code string }
	}
	Names []struct {
		Text, Fuel, Read, Cell string
		Rows                   int
	}
	Preview []struct {
		Sheet, Range string
		Columns      []string
		Rows         []struct {
			Row   int
			Cells []string
		}
		More int `json:"more_rows"`
	}
	MappingFile struct {
		Tables []struct {
			Sheet     string
			HeaderRow int `json:"header_row"`
		}
		Names map[string]string
	} `json:"mapping_file"`
	Roles   []string
	Caution []string
}

// TestInspectRoute reads the demo's fuel log through POST /v1/inspect: the findings, the fuel
// names, the first rows as they are in the file, the reading as a mapping file; then again
// with a mapping part, which the answer and POST /v1/annotate both follow.
func TestInspectRoute(t *testing.T) {
	dir := t.TempDir()
	srv := startServer(t, Config{Annotate: AnnotateHandler(newEngine(t), AnnotateConfig{TempDir: dir})})
	xlsx := string(demoWorkbook(t))
	form, ftype := multipartParts(t, [][3]string{{"file", "kestrel.xlsx", xlsx}})
	r := do(t, http.MethodPost, srv.URL+"/v1/inspect?rows=3", map[string]string{"Content-Type": ftype}, form)
	var a inspectAnswer
	if r.Status != 200 || json.Unmarshal([]byte(r.Body), &a) != nil {
		t.Fatalf("%d: %.400s", r.Status, r.Body)
	}
	if strings.Contains(r.Body, dir) || a.Path != "kestrel.xlsx" {
		t.Errorf("the answer names the server's spool folder, or path is %q", a.Path)
	}
	if a.Report.Rows != 17 || a.Report.Computed != 14 || a.Report.Mapping != nil {
		t.Errorf("report: %d of %d rows, mapping %v; want 14 of 17 and none", a.Report.Computed, a.Report.Rows, a.Report.Mapping)
	}
	var unknown bool
	for _, n := range a.Names {
		unknown = unknown || n.Text == "Natral gas" && n.Read == "unknown" && n.Cell == "Fuel log!C11"
	}
	if !unknown {
		t.Errorf("names: %+v; want Natral gas read as unknown at Fuel log!C11", a.Names)
	}
	// header row 4 and 3 data rows; the demo's first row: 18 500 kWh of natural gas
	if len(a.Preview) != 1 || len(a.Preview[0].Rows) != 4 || a.Preview[0].Rows[0].Row != 4 || a.Preview[0].More != 14 ||
		strings.Join(a.Preview[0].Rows[0].Cells, "|") != "Date|Site|Fuel|Quantity|Unit|Supplier|Reported tCO2" ||
		strings.Join(a.Preview[0].Rows[1].Cells[2:5], "|") != "Natural gas|18500|kWh" {
		t.Errorf("preview: %+v", a.Preview)
	}
	if len(a.MappingFile.Tables) != 1 || a.MappingFile.Tables[0].HeaderRow != 4 || a.Roles[0] != "none" || len(a.Caution) != 2 {
		t.Errorf("mapping file %+v, roles %v, cautions %v", a.MappingFile, a.Roles, a.Caution)
	}

	// With the mapping (its part before the workbook's): C11 is computed, G no longer compared.
	mform, mtype := multipartParts(t, [][3]string{{"mapping", "", demoMapping}, {"file", "kestrel.xlsx", xlsx}})
	r = do(t, http.MethodPost, srv.URL+"/v1/inspect", map[string]string{"Content-Type": mtype}, mform)
	var m inspectAnswer
	if r.Status != 200 || json.Unmarshal([]byte(r.Body), &m) != nil {
		t.Fatalf("%d: %.400s", r.Status, r.Body)
	}
	if m.Report.Computed != 15 || m.Report.Mapping == nil || m.MappingFile.Names["Natral gas"] != "natural_gas" {
		t.Errorf("with the mapping: %d rows computed, mapping %v, names %v; want 15, the mapping, Natral gas as natural_gas", m.Report.Computed, m.Report.Mapping, m.MappingFile.Names)
	}
	for _, w := range m.Report.Warnings {
		if w.Code == "existing-mismatch" || w.Code == "fuel-unknown" {
			t.Errorf("finding %+v remains with the mapping", w)
		}
	}
	// the same mapping after the workbook, to /v1/annotate
	aform, atype := multipartParts(t, [][3]string{{"file", "kestrel.xlsx", xlsx}, {"mapping", "", demoMapping}})
	r = do(t, http.MethodPost, srv.URL+"/v1/annotate?report=json", map[string]string{"Content-Type": atype}, aform)
	var rep struct{ Computed int }
	if r.Status != 200 || json.Unmarshal([]byte(r.Body), &rep) != nil || rep.Computed != 15 {
		t.Errorf("annotate with the mapping: %d, %d rows computed: %.300s", r.Status, rep.Computed, r.Body)
	}

	// Mistakes: a mapping that does not parse names the part, one that does not fit the
	// workbook names the cell; one too large is 413.
	for _, c := range []struct {
		mapping string
		status  int
		want    string
	}{
		{`{"fluecell_mapping": 1, "tables": [{"sheet": "Fuel log", "header_row": 4, "columns": [{"column": "B", "header": "Site", "role": "amount"}]}], "names": {}}`, 400, `unknown role \"amount\"`},
		{`{"fluecell_mapping": 1, "tables": [{"sheet": "Fuel log", "header_row": 4, "columns": [{"column": "B", "header": "Place", "role": "group"}]}], "names": {}}`, 400, `B4: expected header \"Place\", found \"Site\"","code":"workbook-mapping"`},
		{"{" + strings.Repeat(" ", maxMappingPart) + "}", 413, `"param":"mapping"`},
	} {
		f, ct := multipartParts(t, [][3]string{{"mapping", "", c.mapping}, {"file", "kestrel.xlsx", xlsx}})
		r := do(t, http.MethodPost, srv.URL+"/v1/inspect", map[string]string{"Content-Type": ct}, f)
		if r.Status != c.status || !strings.Contains(r.Body, c.want) {
			t.Errorf("mapping %.60s: %d %s; want %d with %s", c.mapping, r.Status, r.Body, c.status, c.want)
		}
	}
	for _, q := range []string{"rows=0", "rows=201", "rows=x", "report=json", "colour=red"} {
		if r := do(t, http.MethodPost, srv.URL+"/v1/inspect?"+q, map[string]string{"Content-Type": typeXLSX}, xlsx); r.Status != 400 {
			t.Errorf("inspect?%s: %d, want 400", q, r.Status)
		}
	}
	if r := do(t, http.MethodPost, srv.URL+"/v1/annotate?rows=3", map[string]string{"Content-Type": typeXLSX}, xlsx); r.Status != 400 {
		t.Errorf("annotate?rows=3: %d, want 400 (rows is a parameter of inspect)", r.Status)
	}
}
