package importer

import (
	"context"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// TestPreview reads the first rows of the tables Scan found, as they are in the file: a CSV
// file (texts as written) and a workbook whose table starts below a title, with a number, a
// text, an empty cell and a formula with its stored result.
func TestPreview(t *testing.T) {
	e := testEngine(t)
	dir := t.TempDir()
	csvPath := filepath.Join(dir, "log.csv")
	if err := os.WriteFile(csvPath, []byte("Site,Fuel,Quantity,Unit\nDepot,diesel,\"1,200\",L\nCreamery,natural_gas,40,MWh\nShop,lpg,3,t\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	res, err := Scan(context.Background(), e, csvPath, Options{})
	if err != nil {
		t.Fatal(err)
	}
	p, err := Preview(context.Background(), csvPath, res.Report.Tables, 2, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(p) != 1 || strings.Join(p[0].Columns, "") != "ABCD" || len(p[0].Rows) != 3 || p[0].More != 1 ||
		strings.Join(p[0].Rows[1].Cells, "|") != "Depot|diesel|1,200|L" || p[0].Rows[2].Row != 3 {
		t.Errorf("CSV preview: %+v", p)
	}

	f := excelize.NewFile()
	rows := [][]any{{"Fuel use, week 14"}, {}, {"Fuel", "Quantity", "Unit", "Note"}, {"Diesel", 1250.5, "L", nil}, {"Natural gas", 18500, "kWh", "meter <b>"}}
	for i, r := range rows {
		cell, _ := excelize.CoordinatesToCellName(1, i+1)
		if err := f.SetSheetRow("Sheet1", cell, &r); err != nil {
			t.Fatal(err)
		}
	}
	if err := f.SetCellFormula("Sheet1", "D4", `"checked"`); err != nil {
		t.Fatal(err)
	}
	book := filepath.Join(dir, "log.xlsx")
	if err := f.SaveAs(book); err != nil {
		t.Fatal(err)
	}
	res, err = Scan(context.Background(), e, book, Options{})
	if err != nil {
		t.Fatal(err)
	}
	p, err = Preview(context.Background(), book, res.Report.Tables, 20, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(p) != 1 || p[0].Sheet != "Sheet1" || len(p[0].Rows) != 3 || p[0].Rows[0].Row != 3 || p[0].More != 0 ||
		strings.Join(p[0].Rows[1].Cells, "|") != "Diesel|1250.5|L|(formula without a stored result)" ||
		strings.Join(p[0].Rows[2].Cells, "|") != "Natural gas|18500|kWh|meter <b>" {
		t.Errorf("workbook preview: %+v (tables %+v)", p, res.Report.Tables)
	}
	if got := RoleNames(); got[0] != "none" || len(got) < 10 {
		t.Errorf("RoleNames() = %v", got)
	}
}
