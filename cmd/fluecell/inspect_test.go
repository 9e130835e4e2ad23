package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// quarryLog writes the fuel log of an invented quarry, Tollgate Stone: a
// title, the header on row 2, a product column with an in-house code, and
// a sheet of notes. amount is the header of the litres column.
func quarryLog(t *testing.T, path, amount string) string {
	t.Helper()
	f := excelize.NewFile()
	defer f.Close()
	must := func(err error) {
		t.Helper()
		if err != nil {
			t.Fatal(err)
		}
	}
	must(f.SetSheetName("Sheet1", "Plant fuel"))
	rows := [][]any{
		{"Tollgate Stone - plant fuel 2025"},
		{"Date", "Plant", "Product", amount},
		{45658, "Crusher 2", "Diesel", 420},
		{45659, "Loader 7", "TS-RED", 380},
		{45660, "Crusher 2", "Diesel", 510},
		{45661, "Loader 7", "Gas oil", 300},
	}
	for i, r := range rows {
		cell, _ := excelize.CoordinatesToCellName(1, i+1)
		must(f.SetSheetRow("Plant fuel", cell, &r))
	}
	_, err := f.NewSheet("Read me")
	must(err)
	must(f.SetCellValue("Read me", "A1", "Volumes from the site bowser meter."))
	must(f.SaveAs(path))
	return path
}

func TestInspectCommand(t *testing.T) {
	dir := t.TempDir()
	in := quarryLog(t, filepath.Join(dir, "tollgate.xlsx"), "Litres")
	code, out, errs := runCLI(t, "inspect", in)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	for _, want := range []string{
		"tollgate.xlsx: 1 table on 2 sheets; 3 of 4 rows computed; ",
		`table 1: sheet "Plant fuel" A2:D6, header row 2, fuel-log; 3 of 4 rows computed`,
		"  cell  header   role      unit    why\n",
		"  C2    Product  fuel              3 of 4 sampled texts name fuels; the header says fuel\n",
		"  D2    Litres   quantity  Litres  numbers in Litres\n",
		"  rules: tCO2 = fuel_co2(product, litres, litres_unit)\n",
		"sheets without a table:\n  Read me  ",
		"fuel names read (the mapping's \"names\" can set them):\n" +
			"  \"Diesel\"   gas_diesel_oil  alias    Plant fuel!C3, 2 rows\n" +
			"  \"TS-RED\"   -               unknown  Plant fuel!C4, 1 row\n" +
			"  \"Gas oil\"  gas_diesel_oil  alias    Plant fuel!C6, 1 row\n",
		"mapping: none (--write-mapping M.json writes this reading for checking and editing)\n",
		"\n" + caution + "\n",
	} {
		if !strings.Contains(out, want) {
			t.Errorf("output lacks %q:\n%s", want, out)
		}
	}

	// Write the mapping, give the code its fuel, annotate with it.
	m := filepath.Join(dir, "tollgate.mapping.json")
	if code, out, errs := runCLI(t, "inspect", in, "--write-mapping", m); code != 0 || !strings.Contains(out, "mapping: wrote "+m+"; check and edit it, then: fluecell annotate "+in+" --mapping "+m+"\n") {
		t.Fatalf("exit %d: %s\n%s", code, out, errs)
	}
	code, _, errs = runCLI(t, "annotate", in, "--mapping", m, "-o", filepath.Join(dir, "out.xlsx"))
	want := "fluecell annotate: mapping " + m + `: names["TS-RED"]: no fuel id: write the fuel this text means, e.g. "motor_gasoline" (fluecell factors lists them), or remove the entry to leave such rows uncomputed` + "\n"
	if code != 1 || errs != want {
		t.Fatalf("exit %d, stderr %q\nwant %q", code, errs, want)
	}
	data, err := os.ReadFile(m)
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(m, []byte(strings.Replace(string(data), `"TS-RED": ""`, `"TS-RED": "gas_diesel_oil"`, 1)), 0o644); err != nil {
		t.Fatal(err)
	}
	report := filepath.Join(dir, "r.json")
	code, out, errs = runCLI(t, "annotate", in, "--mapping", m, "-o", filepath.Join(dir, "out.xlsx"), "--report", report)
	if code != 0 || !strings.Contains(out, "4 of 4 rows computed") {
		t.Fatalf("exit %d: %s\n%s", code, out, errs)
	}
	var rep struct {
		Mapping struct{ Path, SHA256 string }
	}
	data, _ = os.ReadFile(report)
	if err := json.Unmarshal(data, &rep); err != nil || rep.Mapping.Path != m || len(rep.Mapping.SHA256) != 64 {
		t.Errorf("report mapping %+v (%v)", rep.Mapping, err)
	}

	// --json with the mapping: the same reading, for machines.
	code, out, errs = runCLI(t, "inspect", "--json", "--mapping", m, in)
	var ins struct {
		Report struct {
			Computed int
			Tables   []struct {
				Columns []struct{ Cell, Role, Why string }
			}
		}
		Names   []struct{ Text, Fuel, Read string }
		Caution []string
	}
	if err := json.Unmarshal([]byte(out), &ins); code != 0 || err != nil {
		t.Fatalf("exit %d, %v: %s\n%s", code, err, out, errs)
	}
	if ins.Report.Computed != 4 || ins.Report.Tables[0].Columns[2].Why != "mapping tables[0].columns[2]" || len(ins.Caution) != 2 {
		t.Errorf("json: %+v", ins)
	}

	// A workbook of the same template whose header changed.
	moved := quarryLog(t, filepath.Join(dir, "tollgate-feb.xlsx"), "Volume")
	code, _, errs = runCLI(t, "annotate", moved, "--mapping", m)
	want = "fluecell annotate: " + moved + ": mapping " + m + `: sheet "Plant fuel" D2: expected header "Litres", found "Volume"` + "\n"
	if code != 1 || errs != want {
		t.Errorf("exit %d, stderr %q\nwant %q", code, errs, want)
	}
	if code, _, errs := runCLI(t, "inspect", in, "--write-mapping", in); code != 2 || !strings.Contains(errs, "is the input") {
		t.Errorf("exit %d: %s", code, errs)
	}
}

// TestBatchMapping: batch applies the mapping to every workbook, and an
// edited mapping makes its outputs out of date.
func TestBatchMapping(t *testing.T) {
	in, out := t.TempDir(), filepath.Join(t.TempDir(), "out")
	for _, name := range []string{"jan.xlsx", "feb.xlsx"} {
		quarryLog(t, filepath.Join(in, name), "Litres")
	}
	m := filepath.Join(t.TempDir(), "m.json")
	doc := `{"fluecell_mapping": 1, "tables": [{"sheet": "Plant fuel", "header_row": 2, "columns": [
		{"column": "C", "header": "Product", "role": "fuel"}, {"column": "D", "header": "Litres", "role": "quantity"}]}],
		"names": {"TS-RED": "gas_diesel_oil"}}`
	if err := os.WriteFile(m, []byte(doc), 0o644); err != nil {
		t.Fatal(err)
	}
	code, stdout, errs := runCLI(t, "batch", in, out, "--mapping", m, "--jobs", "1")
	if code != 0 || !strings.Contains(stdout, "2 workbooks: 2 written, 0 up to date, 0 failed") {
		t.Fatalf("exit %d: %s\n%s", code, stdout, errs)
	}
	if _, stdout, _ = runCLI(t, "batch", in, out, "--mapping", m, "--jobs", "1"); !strings.Contains(stdout, "2 workbooks: 0 written, 2 up to date") {
		t.Errorf("second run: %s", stdout)
	}
	if err := os.WriteFile(m, []byte(strings.Replace(doc, `"quantity"}`, `"quantity", "unit": "gal"}`, 1)), 0o644); err != nil {
		t.Fatal(err)
	}
	if _, stdout, _ = runCLI(t, "batch", in, out, "--mapping", m, "--jobs", "1"); !strings.Contains(stdout, "2 workbooks: 2 written, 0 up to date") {
		t.Errorf("after editing the mapping: %s", stdout)
	}
}
