package importer

import (
	"bytes"
	"path/filepath"
	"strings"
	"testing"
)

// TestMappingGridEntries: a table's grid wins over the workbook's; an
// unknown grid or gallon is refused at its JSON path; a written mapping
// keeps the entries.
func TestMappingGridEntries(t *testing.T) {
	e := testEngine(t)
	f := newBook(t, "Sites")
	setRows(t, f, "Sites", 1, [][]any{
		{"Month", "Electricity (kWh)"},
		{"Jan", 1000},
		{"Feb", 3000},
	})
	dir := t.TempDir()
	path := save(t, f, filepath.Join(dir, "sites.xlsx"))
	doc := `{"fluecell_mapping": 1, "grid": "UK",
 "tables": [{"sheet": "Sites", "header_row": 1, "grid": "Germany",
   "columns": [{"column": "A", "header": "Month", "role": "none"}, {"column": "B", "header": "Electricity (kWh)", "role": "purchased-energy"}]}]}`
	m, err := ParseMapping(e, "m.json", []byte(doc))
	if err != nil {
		t.Fatal(err)
	}
	rep := scanFile(t, path, Options{Mapping: m, Grid: "FR"})
	if got, want := kindTotalOf(rep, KindScope2).TCO2e, 4000*deKgPerKWh/1000; !near(got, want) {
		t.Errorf("total %.9g t CO2e, want %.9g (the table's grid, Germany); rules %v", got, want, rep.Rules)
	}
	for _, c := range []struct{ doc, want string }{
		{`{"fluecell_mapping": 1, "tables": [], "grid": "Atlantis"}`, `mapping bad.json: grid: unknown grid "Atlantis"`},
		{`{"fluecell_mapping": 1, "tables": [{"sheet": "S", "header_row": 1, "grid": "Atlantis", "columns": []}]}`, `mapping bad.json: tables[0].grid: unknown grid "Atlantis"`},
		{`{"fluecell_mapping": 1, "tables": [], "gallons": "wine"}`, `mapping bad.json: gallons: unknown gallon "wine": accepted are us and imperial`},
	} {
		if _, err := ParseMapping(e, "bad.json", []byte(c.doc)); err == nil || !strings.HasPrefix(err.Error(), c.want) {
			t.Errorf("ParseMapping(%s) = %v, want %q", c.doc, err, c.want)
		}
	}
	var b bytes.Buffer
	(&MappingFile{Version: MappingVersion, Grid: "gb", Gallons: "imperial",
		Tables: []MappedTable{{Sheet: "Sites", HeaderRow: 1, Grid: "de", Sector: "commercial", Columns: []MappedColumn{}}}}).encode(&b)
	if _, err := ParseMapping(e, "written.json", b.Bytes()); err != nil {
		t.Errorf("a written mapping does not read back: %v\n%s", err, b.String())
	}
	for _, want := range []string{`"grid": "gb"`, `"gallons": "imperial"`, `"grid": "de"`, `"sector": "commercial"`} {
		if !strings.Contains(b.String(), want) {
			t.Errorf("written mapping lacks %s:\n%s", want, b.String())
		}
	}
}
