package importer

import (
	"context"
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"testing"

	"github.com/xuri/excelize/v2"
)

// writeBrindle writes the fuel log of an invented haulier, Brindle Haulage:
// a title, the header on row 3 (Date | Depot | Product | Litres | Notes),
// product names as the fuel cards print them, and a notes sheet without a
// table. header replaces "Litres" and at moves the header down, for
// workbooks of the same template that changed.
func writeBrindle(t testing.TB, path, header string, at int, products ...string) string {
	t.Helper()
	f := newBook(t, "Fuel log")
	rows := [][]any{{"Brindle Haulage - fuel cards 2025"}}
	for len(rows) < at-1 {
		rows = append(rows, []any{})
	}
	rows = append(rows, []any{"Date", "Depot", "Product", header, "Notes"})
	if len(products) == 0 {
		products = []string{"Diesel", "Gas oil", "Petrol", "Diesel", "Diesel", "Petrol"}
	}
	for i, p := range products {
		rows = append(rows, []any{45658 + i, []string{"Ashby Cross", "Wendle Quay"}[i%2], p, 100 * (i + 1), nil})
	}
	setRows(t, f, "Fuel log", 1, rows)
	addSheet(t, f, "Notes")
	setRows(t, f, "Notes", 1, [][]any{{"Litres as printed on the monthly card statement."}})
	return save(t, f, path)
}

// writeMappingJSON writes a mapping document and loads it.
func loadMappingText(t *testing.T, dir, doc string) (*Mapping, string) {
	t.Helper()
	p := filepath.Join(dir, "m.json")
	must(t, os.WriteFile(p, []byte(doc), 0o644))
	m, err := LoadMapping(testEngine(t), p)
	if err != nil {
		t.Fatalf("LoadMapping: %v", err)
	}
	return m, p
}

// inspectToMapping inspects in, writes its mapping next to it and loads it.
func inspectToMapping(t *testing.T, in string) (*Inspection, *Mapping, string) {
	t.Helper()
	e := testEngine(t)
	ins, err := Inspect(context.Background(), e, in, Options{})
	if err != nil {
		t.Fatal(err)
	}
	mf := ins.MappingFile()
	p := filepath.Join(filepath.Dir(in), "template.mapping.json")
	must(t, mf.Write(p))
	m, err := LoadMapping(e, p)
	if err != nil {
		data, _ := os.ReadFile(p)
		t.Fatalf("LoadMapping of the written mapping: %v\n%s", err, data)
	}
	return ins, m, p
}

// TestMappingRoundTrip inspects a workbook, writes its mapping and
// annotates with it: the same tables, rules and totals as without, and the
// mapping recorded in the report and the Carbon sources sheet.
func TestMappingRoundTrip(t *testing.T) {
	dir := t.TempDir()
	e := testEngine(t)
	for _, in := range []string{writeBrindle(t, filepath.Join(dir, "brindle.xlsx"), "Litres", 3), writeMessyFixed(t, dir)} {
		t.Run(filepath.Base(in), func(t *testing.T) {
			plain, err := Annotate(context.Background(), e, in, filepath.Join(dir, "plain.xlsx"), Options{})
			if err != nil {
				t.Fatal(err)
			}
			_, m, mpath := inspectToMapping(t, in)
			out := filepath.Join(dir, "mapped.xlsx")
			mapped, err := Annotate(context.Background(), e, in, out, Options{Mapping: m})
			if err != nil {
				t.Fatal(err)
			}
			if mapped.Totals != plain.Totals || mapped.Rows != plain.Rows || mapped.Computed != plain.Computed {
				t.Errorf("with the mapping %+v %d/%d, without %+v %d/%d", mapped.Totals, mapped.Computed, mapped.Rows, plain.Totals, plain.Computed, plain.Rows)
			}
			if len(mapped.Tables) != len(plain.Tables) {
				t.Fatalf("%d tables with the mapping, %d without", len(mapped.Tables), len(plain.Tables))
			}
			for i, a := range mapped.Tables {
				b := plain.Tables[i]
				if a.Sheet != b.Sheet || a.Range != b.Range || a.Kind != b.Kind || strings.Join(a.Rules, ";") != strings.Join(b.Rules, ";") {
					t.Errorf("table %d: %s!%s %s %v, without the mapping %s!%s %s %v", i, a.Sheet, a.Range, a.Kind, a.Rules, b.Sheet, b.Range, b.Kind, b.Rules)
				}
				for j := range a.Columns {
					if a.Columns[j].Role != b.Columns[j].Role {
						t.Errorf("%s: role %q, without the mapping %q", a.Columns[j].Cell, a.Columns[j].Role, b.Columns[j].Role)
					}
				}
			}
			if mapped.Mapping == nil || mapped.Mapping.Path != mpath || len(mapped.Mapping.SHA256) != 64 {
				t.Errorf("report mapping %+v", mapped.Mapping)
			}
			if !sheetHas(t, out, SheetSources, "tables read with the mapping "+mpath+" (sha256 "+mapped.Mapping.SHA256+")") {
				t.Errorf("no mapping line in %s", SheetSources)
			}
		})
	}
}

// writeMessyFixed is the messy workbook with its misspelt fuel corrected,
// so that its mapping loads as written.
func writeMessyFixed(t *testing.T, dir string) string {
	in := writeMessy(t, dir)
	f, err := excelize.OpenFile(in)
	must(t, err)
	must(t, f.SetCellValue("Fuel log", "C16", "Diesel"))
	p := filepath.Join(dir, "messy-fixed.xlsx")
	return save(t, f, p)
}

func sheetHas(t *testing.T, path, sheet, prefix string) bool {
	t.Helper()
	f, err := excelize.OpenFile(path)
	must(t, err)
	defer f.Close()
	rows, err := f.GetRows(sheet)
	must(t, err)
	for _, r := range rows {
		for _, c := range r {
			if strings.HasPrefix(c, prefix) {
				return true
			}
		}
	}
	return false
}

// TestMappingNames: a product code the engine does not know is written
// with an empty id, which the mapping refuses until a person gives the
// fuel; then the rows are computed as that fuel.
func TestMappingNames(t *testing.T) {
	dir := t.TempDir()
	e := testEngine(t)
	in := writeBrindle(t, filepath.Join(dir, "codes.xlsx"), "Litres", 3, "Diesel", "BX-7", "Diesel", "BX-7")
	ins, err := Inspect(context.Background(), e, in, Options{})
	must(t, err)
	var read []string
	for _, n := range ins.Names {
		read = append(read, n.Text+"="+n.Fuel+"/"+n.Read)
	}
	if got := strings.Join(read, " "); got != "Diesel=gas_diesel_oil/alias BX-7=/unknown" {
		t.Errorf("names %s", got)
	}
	mf := ins.MappingFile()
	p := filepath.Join(dir, "m.json")
	must(t, mf.Write(p))
	_, err = LoadMapping(e, p)
	want := "mapping " + p + `: names["BX-7"]: no fuel id: write the fuel this text means, e.g. "motor_gasoline" (fluecell factors lists them), or remove the entry to leave such rows uncomputed`
	if err == nil || err.Error() != want {
		t.Fatalf("error %v\nwant %s", err, want)
	}
	mf.Names["BX-7"] = "gas_diesel_oil"
	must(t, mf.Write(p))
	m, err := LoadMapping(e, p)
	must(t, err)
	plain := scanFile(t, in, Options{})
	mapped := scanFile(t, in, Options{Mapping: m})
	if plain.Computed != 2 || mapped.Computed != 4 {
		t.Fatalf("computed %d without the mapping, %d with it", plain.Computed, mapped.Computed)
	}
	// 100 + 300 L of diesel without; 100 + 200 + 300 + 400 L with the code read as diesel.
	if r := mapped.ByFuel["gas_diesel_oil"].TCO2 / plain.ByFuel["gas_diesel_oil"].TCO2; math.Abs(r-2.5) > 1e-12 {
		t.Errorf("diesel with the names / without = %v, want 2.5", r)
	}
}

// TestMappingEdited: a unit and a role changed in the mapping change the
// result as they say.
func TestMappingEdited(t *testing.T) {
	dir := t.TempDir()
	in := writeBrindle(t, filepath.Join(dir, "brindle.xlsx"), "Litres", 3)
	ins, _, _ := inspectToMapping(t, in)
	plain := ins.Report
	edit := func(change func(*MappedTable)) *Report {
		t.Helper()
		mf := ins.MappingFile()
		change(&mf.Tables[0])
		p := filepath.Join(dir, "edited.json")
		must(t, mf.Write(p))
		m, err := LoadMapping(testEngine(t), p)
		must(t, err)
		return scanFile(t, in, Options{Mapping: m})
	}
	col := func(mt *MappedTable, letter string) *MappedColumn {
		for i := range mt.Columns {
			if mt.Columns[i].Column == letter {
				return &mt.Columns[i]
			}
		}
		t.Fatalf("no column %s in the mapping", letter)
		return nil
	}
	// The amounts were US gallons: 3.785411784 L each (NIST SP 811).
	gal := edit(func(mt *MappedTable) { col(mt, "D").Unit = "gal" })
	if r := gal.Totals.TCO2 / plain.Totals.TCO2; math.Abs(r-3.785411784) > 1e-9 {
		t.Errorf("tCO2 in gal / in L = %v, want 3.785411784", r)
	}
	if got := gal.Tables[0].Columns[3].HeaderUnit; got != "gal" {
		t.Errorf("header unit %q, want gal", got)
	}
	// Inspected with the edited mapping, the mapping written keeps the edit.
	mf := ins.MappingFile()
	mf.Tables[0].Columns[3].Unit, mf.Tables[0].Columns[3].Basis = "MMBtu", "HHV"
	p := filepath.Join(dir, "energy.json")
	must(t, mf.Write(p))
	m, err := LoadMapping(testEngine(t), p)
	must(t, err)
	again, err := Inspect(context.Background(), testEngine(t), in, Options{Mapping: m})
	must(t, err)
	if c := again.MappingFile().Tables[0].Columns[3]; c.Unit != "MMBtu" || c.Basis != "HHV" || again.Report.Tables[0].Columns[3].HeaderUnit != "MMBtu HHV" {
		t.Errorf("rewritten column %+v, unit read %q", c, again.Report.Tables[0].Columns[3].HeaderUnit)
	}
	// The depot is no longer a group: the same totals, no depot column role.
	nogroup := edit(func(mt *MappedTable) { col(mt, "B").Role = "none" })
	if nogroup.Totals != plain.Totals || nogroup.Tables[0].Columns[1].Role != "" {
		t.Errorf("without the group: %+v, role %q", nogroup.Totals, nogroup.Tables[0].Columns[1].Role)
	}
	// One fuel for every row, the product column left out: all 2100 L as petrol.
	petrol := edit(func(mt *MappedTable) {
		col(mt, "C").Role = "none"
		mt.Fuel = "motor_gasoline"
	})
	if petrol.Computed != 6 || len(petrol.ByFuel) != 1 || petrol.ByFuel["motor_gasoline"].TCO2 == 0 {
		t.Errorf("one fuel: %d computed, by fuel %v", petrol.Computed, petrol.ByFuel)
	}
}

// TestMappingMoved: a workbook whose layout no longer fits the mapping is
// refused with a message naming what moved.
func TestMappingMoved(t *testing.T) {
	dir := t.TempDir()
	_, m, mpath := inspectToMapping(t, writeBrindle(t, filepath.Join(dir, "jan.xlsx"), "Litres", 3))
	renamed := newBook(t, "Fuel 2026")
	setRows(t, renamed, "Fuel 2026", 1, [][]any{{"Date", "Depot", "Product", "Litres"}, {45658, "Ashby Cross", "Diesel", 10}})
	tests := []struct{ name, path, want string }{
		{"header", writeBrindle(t, filepath.Join(dir, "feb.xlsx"), "Quantity", 3),
			`mapping MAP: sheet "Fuel log" D3: expected header "Litres", found "Quantity"`},
		{"row", writeBrindle(t, filepath.Join(dir, "mar.xlsx"), "Litres", 5),
			`mapping MAP: sheet "Fuel log" row 3 (tables[0]): the header row is empty`},
		{"sheet", save(t, renamed, filepath.Join(dir, "apr.xlsx")),
			`mapping MAP: sheet "Fuel log" is missing (tables[0]): the workbook's sheets are "Fuel 2026"`},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := Annotate(context.Background(), testEngine(t), tc.path, filepath.Join(dir, "out.xlsx"), Options{Mapping: m})
			want := tc.path + ": " + strings.ReplaceAll(tc.want, "MAP", mpath)
			checkRefusal(t, err, ErrMapping, want)
			if err.Error() != want {
				t.Errorf("error\n%v\nwant\n%s", err, want)
			}
		})
	}
	assertNoTemp(t, dir)
}

// TestMappingValidation: a malformed mapping is refused on load with the
// JSON path of the mistake and what is accepted.
func TestMappingValidation(t *testing.T) {
	table := func(cols string) string {
		return `{"fluecell_mapping": 1, "tables": [{"sheet": "Fuel log", "header_row": 3, "columns": [` + cols + `]}]}`
	}
	tests := []struct{ name, doc, want string }{
		{"not json", `{"fluecell_mapping": 1,`, `not JSON: unexpected EOF`},
		{"no version", `{"tables": []}`, `not a fluecell mapping: the key "fluecell_mapping": 1 is missing`},
		{"version", `{"fluecell_mapping": 2}`, `fluecell_mapping: version 2 is not known: this fluecell reads version 1`},
		{"unknown key", `{"fluecell_mapping": 1, "tables": [{"sheet": "A", "header_row": 1, "colums": []}]}`,
			`tables[0].colums: unknown key "colums": accepted are sheet, header_row, kind, fuel, unit, grid, sector, gallons, activity_uncertainty, columns`},
		{"role", table(`{"column": "C", "header": "Fuel", "role": "amount"}`),
			`tables[0].columns[0].role: unknown role "amount": accepted are none, fuel, quantity, unit, fuel-column, technology, capacity, capacity-factor, lifetime, existing-carbon, group, period, date, grid, purchased-energy, gas, sector, vehicle`},
		{"column letter", table(`{"column": "C4", "header": "Fuel", "role": "fuel"}`),
			`tables[0].columns[0].column: "C4" is not a column: write its letters, A to XFD`},
		{"column too far", table(`{"column": "XFE", "header": "Fuel", "role": "fuel"}`),
			`tables[0].columns[0].column: "XFE" is not a column: write its letters, A to XFD`},
		{"same column", table(`{"column": "C", "header": "Fuel", "role": "fuel"}, {"column": "c", "header": "Fuel", "role": "none"}`),
			`tables[0].columns[1].column: column C is mapped twice (first at tables[0].columns[0]): keep one`},
		{"two quantities", table(`{"column": "C", "header": "A", "role": "quantity"}, {"column": "D", "header": "B", "role": "quantity"}`),
			`tables[0].columns[1].role: a second "quantity" column (the first is C): a table has one`},
		{"duplicate table", `{"fluecell_mapping": 1, "tables": [{"sheet": "Fuel log", "header_row": 3}, {"sheet": "Fuel log", "header_row": 3}]}`,
			`tables[1]: the same table as tables[0] (sheet "Fuel log", header row 3): keep one`},
		{"header row", `{"fluecell_mapping": 1, "tables": [{"sheet": "Fuel log", "header_row": 0}]}`,
			`tables[0].header_row: 0 is not a row: rows are 1 to 1048576`},
		{"header row text", `{"fluecell_mapping": 1, "tables": [{"sheet": "Fuel log", "header_row": "3"}]}`,
			`tables[0].header_row: expected a whole number, found text "3"`},
		{"kind", `{"fluecell_mapping": 1, "tables": [{"sheet": "Fuel log", "header_row": 3, "kind": "log"}]}`,
			`tables[0].kind: unknown kind "log": accepted are fuel-log, wide, fuel-by-period, build-plan, refrigerant, refrigerant-charge, vehicle-distance and custom`},
		{"unit", table(`{"column": "D", "header": "Litres", "role": "quantity", "unit": "ton"}`),
			`tables[0].columns[0].unit: `},
		{"unit on a fuel", table(`{"column": "C", "header": "Fuel", "role": "fuel", "unit": "L"}`),
			`tables[0].columns[0].unit: a unit applies to a quantity, fuel-column or capacity column, not to role "fuel"`},
		{"basis", table(`{"column": "D", "header": "Gas", "role": "quantity", "basis": "gross-ish"}`),
			`tables[0].columns[0].basis: unknown basis "gross-ish": accepted are HHV (GCV, gross) and NCV (LHV, net)`},
		{"fuel-column without fuel", table(`{"column": "D", "header": "Diesel (L)", "role": "fuel-column"}`),
			`tables[0].columns[0]: role fuel-column needs "fuel": the fuel of every amount in the column, e.g. "gas_diesel_oil"`},
		{"fuel id", table(`{"column": "D", "header": "Diesel (L)", "role": "fuel-column", "fuel": "motor_gas"}`),
			`tables[0].columns[0].fuel: unknown fuel "motor_gas": accepted fuel ids are `},
		{"table fuel and fuel column", `{"fluecell_mapping": 1, "tables": [{"sheet": "S", "header_row": 1, "fuel": "propane", "columns": [{"column": "A", "header": "Fuel", "role": "fuel"}]}]}`,
			`tables[0].fuel: the table has a fuel column (A): give either "fuel" or a column of role fuel`},
		{"name", `{"fluecell_mapping": 1, "names": {"Unl 87": "motor_gas"}}`,
			`names["Unl 87"]: unknown fuel "motor_gas": accepted fuel ids are `},
		{"name type", `{"fluecell_mapping": 1, "names": {"Unl 87": 87}}`,
			`names["Unl 87"]: expected text, found the number 87`},
	}
	dir := t.TempDir()
	p := filepath.Join(dir, "m.json")
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			must(t, os.WriteFile(p, []byte(tc.doc), 0o644))
			_, err := LoadMapping(testEngine(t), p)
			want := "mapping " + p + ": " + tc.want
			if err == nil || !strings.HasPrefix(err.Error(), want) {
				t.Fatalf("error %v\nwant %s", err, want)
			}
			if !strings.HasSuffix(tc.want, ": ") && !strings.HasSuffix(tc.want, "are ") && err.Error() != want {
				t.Errorf("error %v\nwant %s", err, want)
			}
			checkRefusal(t, err, ErrMapping, want)
		})
	}
	_, err := LoadMapping(testEngine(t), filepath.Join(dir, "absent.json"))
	checkRefusal(t, err, ErrIO, "mapping "+filepath.Join(dir, "absent.json")+": cannot read it")
}

// TestMappingApplyErrors: roles that make no table, or a basis without an
// energy unit, are refused at the table.
func TestMappingApplyErrors(t *testing.T) {
	dir := t.TempDir()
	in := writeBrindle(t, filepath.Join(dir, "brindle.xlsx"), "Litres", 3)
	cols := `{"column": "C", "header": "Product", "role": "fuel"}, {"column": "D", "header": "Litres", "role": "quantity"`
	tests := []struct{ name, doc, want string }{
		{"kind", `{"fluecell_mapping": 1, "tables": [{"sheet": "Fuel log", "header_row": 3, "kind": "wide", "columns": [` + cols + `}]}]}`,
			`sheet "Fuel log" A3 (tables[0]): the mapped roles make a fuel-log table, not wide: a wide table needs columns of role fuel-column, each with its fuel`},
		{"no quantity", `{"fluecell_mapping": 1, "tables": [{"sheet": "Fuel log", "header_row": 3, "columns": [{"column": "C", "header": "Product", "role": "fuel"}]}]}`,
			`sheet "Fuel log" A3 (tables[0]): the mapped roles make no table fluecell computes: a fuel-log needs a quantity column and a fuel column (or the table's "fuel"), or pass --rule`},
		{"basis", `{"fluecell_mapping": 1, "tables": [{"sheet": "Fuel log", "header_row": 3, "columns": [` + cols + `, "basis": "HHV"}]}]}`,
			`sheet "Fuel log" D3 (tables[0].columns[1]): basis HHV applies to an energy unit without a basis, and the column's unit is "Litres"; give the unit with its basis in "unit" instead`},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			m, mpath := loadMappingText(t, dir, tc.doc)
			_, err := Scan(context.Background(), testEngine(t), in, Options{Mapping: m})
			want := in + ": mapping " + mpath + ": " + tc.want
			if err == nil || err.Error() != want {
				t.Fatalf("error %v\nwant %s", err, want)
			}
		})
	}
}

// TestMappingCSV: a CSV file has one sheet, named after the file, so a
// mapping made from one export fits the next, whatever its name.
func TestMappingCSV(t *testing.T) {
	dir := t.TempDir()
	doc := "Brindle Haulage - card export\nDate,Depot,Product,Litres\n2025-01-02,Ashby Cross,Diesel,120\n2025-01-03,Wendle Quay,BX-7,80\n"
	jan := filepath.Join(dir, "jan.csv")
	feb := filepath.Join(dir, "feb.csv")
	must(t, os.WriteFile(jan, []byte(doc), 0o644))
	must(t, os.WriteFile(feb, []byte(strings.Replace(doc, "120", "240", 1)), 0o644))
	ins, err := Inspect(context.Background(), testEngine(t), jan, Options{})
	must(t, err)
	mf := ins.MappingFile()
	if len(mf.Tables) != 1 || mf.Tables[0].Sheet != "jan.csv" || mf.Tables[0].HeaderRow != 2 {
		t.Fatalf("mapping %+v", mf)
	}
	mf.Names["BX-7"] = "gas_diesel_oil"
	p := filepath.Join(dir, "export.json")
	must(t, mf.Write(p))
	m, err := LoadMapping(testEngine(t), p)
	must(t, err)
	rep := scanFile(t, feb, Options{Mapping: m})
	if rep.Computed != 2 || rep.Rows != 2 {
		t.Errorf("feb.csv: %d of %d computed", rep.Computed, rep.Rows)
	}
}

// TestMappingConcurrent shares one mapping between concurrent scans.
func TestMappingConcurrent(t *testing.T) {
	dir := t.TempDir()
	in := writeBrindle(t, filepath.Join(dir, "brindle.xlsx"), "Litres", 3)
	_, m, _ := inspectToMapping(t, in)
	e := testEngine(t)
	var wg sync.WaitGroup
	tot := make([]Totals, 4)
	for i := range tot {
		wg.Add(1)
		go func(i int) {
			defer wg.Done()
			res, err := Scan(context.Background(), e, in, Options{Mapping: m})
			if err != nil {
				t.Error(err)
				return
			}
			tot[i] = res.Report.Totals
		}(i)
	}
	wg.Wait()
	for i := range tot {
		if tot[i] != tot[0] || tot[i].TCO2 == 0 {
			t.Errorf("scan %d: %+v, scan 0: %+v", i, tot[i], tot[0])
		}
	}
}

// TestInspectExplains: the inspection says why each column has its role,
// which sheet has no table, and writes the mapping a person reads.
func TestInspectExplains(t *testing.T) {
	dir := t.TempDir()
	in := writeBrindle(t, filepath.Join(dir, "brindle.xlsx"), "Litres", 3)
	ins, err := Inspect(context.Background(), testEngine(t), in, Options{})
	must(t, err)
	var why []string
	for _, c := range ins.Report.Tables[0].Columns {
		why = append(why, c.Cell+" "+c.Role+": "+c.Why)
	}
	want := []string{"A3 date: the header names the date or period of the row", "B3 group: the header names a site, region or other group",
		"C3 fuel: 6 of 6 sampled texts name fuels; the header says fuel",
		"D3 quantity: numbers in Litres", "E3 : "}
	if strings.Join(why, "\n") != strings.Join(want, "\n") {
		t.Errorf("why:\n%s\nwant:\n%s", strings.Join(why, "\n"), strings.Join(want, "\n"))
	}
	mf := ins.MappingFile()
	p := filepath.Join(dir, "m.json")
	must(t, mf.Write(p))
	data, err := os.ReadFile(p)
	must(t, err)
	wantDoc := `{
  "fluecell_mapping": 1,
  "tables": [
    {"sheet": "Fuel log", "header_row": 3, "kind": "fuel-log",
     "columns": [
       {"column": "A", "header": "Date", "role": "date"},
       {"column": "B", "header": "Depot", "role": "group"},
       {"column": "C", "header": "Product", "role": "fuel"},
       {"column": "D", "header": "Litres", "role": "quantity"},
       {"column": "E", "header": "Notes", "role": "none"}
     ]}
  ],
  "names": {
    "Diesel": "gas_diesel_oil",
    "Gas oil": "gas_diesel_oil",
    "Petrol": "motor_gasoline"
  }
}
`
	if string(data) != wantDoc {
		t.Errorf("mapping file:\n%s\nwant:\n%s", data, wantDoc)
	}
	var back MappingFile
	must(t, json.Unmarshal(data, &back))
	if len(back.Tables) != 1 || len(back.Tables[0].Columns) != 5 {
		t.Errorf("the file does not read back: %+v", back)
	}
}

// TestMappingRealFiles reads two real public files (see
// testdata/realworld/README.md) through mappings: one written by hand,
// for a file whose unit is only in the words of its header, and one
// written by inspect and then edited.
func TestMappingRealFiles(t *testing.T) {
	const dir = "../testdata/realworld"
	e := testEngine(t)
	t.Run("colorado", func(t *testing.T) {
		in := filepath.Join(dir, "eia_colorado_natural_gas_industrial.csv")
		m, _ := loadMappingText(t, t.TempDir(), `{"fluecell_mapping": 1, "tables": [{"sheet": "eia_colorado_natural_gas_industrial.csv", "header_row": 5, "fuel": "natural_gas",
		  "columns": [{"column": "A", "header": "Month", "role": "date"},
		              {"column": "B", "header": "Colorado Natural Gas Industrial Consumption Million Cubic Feet", "role": "quantity", "unit": "MMcf"}]}]}`)
		rep := scanFile(t, in, Options{Mapping: m})
		// 265 months, newest first, 2001-2023 (the file's data rows).
		if rep.Rows != 265 || rep.Computed != 265 || len(rep.ByFuel) != 1 || rep.ByFuel["natural_gas"].TCO2 <= 0 {
			t.Errorf("computed %d of %d, by fuel %v", rep.Computed, rep.Rows, rep.ByFuel)
		}
	})
	t.Run("farm", func(t *testing.T) {
		in := filepath.Join(dir, "farm_energy_use_miranowski.xlsx")
		ins, err := Inspect(context.Background(), e, in, Options{})
		must(t, err)
		if len(ins.Report.Tables) == 0 {
			t.Fatalf("no table read in %s: %+v", in, ins.Report.Sheets)
		}
		read := func(change func(*MappedColumn)) *Report {
			t.Helper()
			mf := ins.MappingFile()
			for i := range mf.Tables[0].Columns {
				change(&mf.Tables[0].Columns[i])
			}
			p := filepath.Join(t.TempDir(), "m.json")
			must(t, mf.Write(p))
			m, err := LoadMapping(e, p)
			must(t, err)
			return scanFile(t, in, Options{Mapping: m})
		}
		same := read(func(*MappedColumn) {})
		if same.Totals != ins.Report.Totals || same.Computed != ins.Report.Computed {
			t.Errorf("as written: %+v, %d rows; as inspected: %+v, %d rows", same.Totals, same.Computed, ins.Report.Totals, ins.Report.Computed)
		}
		// An analyst who knows the farm LP gas is propane says so.
		propane := read(func(c *MappedColumn) {
			if c.Role == "fuel-column" && c.Fuel == "lpg" {
				c.Fuel = "propane"
			}
		})
		if propane.ByFuel["propane"].TCO2 <= 0 || propane.ByFuel["lpg"].TCO2 != 0 || ins.Report.ByFuel["lpg"].TCO2 <= 0 {
			t.Errorf("by fuel with propane %v, as inspected %v", propane.ByFuel, ins.Report.ByFuel)
		}
	})
}
