// Package demo writes the workbooks of fluecell's demo: the week of an
// invented dairy co-operative, Kestrel Vale, in the invented region of
// Marrowdale. The figures are made up; the mistakes in them are the ones real
// workbooks have (title rows above the header, numbers stored as text,
// ambiguous and mixed units, a power where an energy was meant, a credit
// note, a misspelt fuel, an extra zero, a stale reported figure).
package demo

import (
	"fmt"
	"io"
	"os"
	"path/filepath"
	"time"

	"github.com/xuri/excelize/v2"

	"github.com/fluecell/fluecell/importer/atomicfile"
)

// Files are the names Write creates, in order.
var files = []string{"kestrel-fuel-log-2026-w14.xlsx", "kestrel-monthly-energy-2025.xlsx", "marrowdale-build-plan-2030.xlsx"}

// Names returns the file names Write creates.
func Names() []string { return append([]string(nil), files...) }

// Write creates the demo workbooks in dir (created if needed) and returns
// their paths. Existing files of the same names are replaced atomically.
func Write(dir string) ([]string, error) {
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return nil, fmt.Errorf("demo: %w", err)
	}
	builders := []func() (*excelize.File, error){fuelLog, monthlyEnergy, buildPlan}
	var out []string
	for i, build := range builders {
		f, err := build()
		if err != nil {
			return nil, fmt.Errorf("demo: %s: %w", files[i], err)
		}
		path := filepath.Join(dir, files[i])
		if err := saveAtomic(f, path); err != nil {
			return nil, fmt.Errorf("demo: %w", err)
		}
		out = append(out, path)
	}
	return out, nil
}

func saveAtomic(f *excelize.File, path string) error {
	defer f.Close()
	return atomicfile.Write(path, func(w io.Writer) error { return f.Write(w) })
}

type styles struct {
	title, header, date, number, text int
}

func newStyles(f *excelize.File) (styles, error) {
	var s styles
	var err error
	if s.title, err = f.NewStyle(&excelize.Style{Font: &excelize.Font{Bold: true, Size: 14, Color: "1F4E5A"}}); err != nil {
		return s, err
	}
	if s.header, err = f.NewStyle(&excelize.Style{Font: &excelize.Font{Bold: true, Color: "FFFFFF"},
		Fill:      excelize.Fill{Type: "pattern", Pattern: 1, Color: []string{"2E7D6B"}},
		Alignment: &excelize.Alignment{WrapText: true, Vertical: "center"}}); err != nil {
		return s, err
	}
	if s.date, err = f.NewStyle(&excelize.Style{NumFmt: 14}); err != nil {
		return s, err
	}
	if s.number, err = f.NewStyle(&excelize.Style{NumFmt: 4}); err != nil {
		return s, err
	}
	s.text, err = f.NewStyle(&excelize.Style{NumFmt: 49})
	return s, err
}

func cell(col, row int) string {
	name, _ := excelize.CoordinatesToCellName(col, row)
	return name
}

// fuelLog is a week of fuel purchases at three sites, as site accounts
// keyed them in.
func fuelLog() (*excelize.File, error) {
	f := excelize.NewFile()
	const sh = "Fuel log"
	if err := f.SetSheetName("Sheet1", sh); err != nil {
		return nil, err
	}
	st, err := newStyles(f)
	if err != nil {
		return nil, err
	}
	f.SetCellValue(sh, "A1", "Kestrel Vale Dairy Co-operative - fuel purchases, week 14 2026")
	f.MergeCell(sh, "A1", "G1")
	f.SetCellStyle(sh, "A1", "A1", st.title)
	f.SetCellValue(sh, "A2", "Keyed by site accounts from supplier invoices (draft, not reviewed)")
	header := []any{"Date", "Site", "Fuel", "Quantity", "Unit", "Supplier", "Reported tCO2"}
	f.SetSheetRow(sh, "A4", &header)
	f.SetCellStyle(sh, "A4", "G4", st.header)
	day := func(d int) time.Time { return time.Date(2026, 3, 30+d, 0, 0, 0, 0, time.UTC) }
	type entry struct {
		day            int
		site, fuel     string
		qty            any // number, text or formula
		unit, supplier string
		reported       any
	}
	rows := []entry{
		{0, "Creamery", "Natural gas", 18500.0, "kWh", "Hollinsmere Gas", 3.74},
		{0, "Creamery", "Gas oil", 2400.0, "litres", "Fenbridge Fuels", 6.41},
		{0, "Depot", "Diesel", "1,250.5", "L", "Fenbridge Fuels", 3.34},
		{1, "Depot", "Diesel", 1150.0, "L", "Fenbridge Fuels", 3.07},
		{1, "Farm shop", "LPG", 410.0, "kg", "Marrowdale Bottled Gas", 1.22},
		{1, "Creamery", "Natural gas", 64.0, "MMBtu HHV", "Hollinsmere Gas", 3.41},
		{2, "Creamery", "Natral gas", 12000.0, "kWh", "Hollinsmere Gas", nil},
		{2, "Depot", "Diesel", -150.0, "L", "Fenbridge Fuels (credit note)", -0.40},
		{2, "Depot", "Diesel", 1090.0, "L", "Fenbridge Fuels", 3.20},
		{3, "Farm shop", "Wood pellets", 2.4, "t", "Marrowdale Biomass", nil},
		{3, "Creamery", "Natural gas", 250.0, "kW", "Hollinsmere Gas", nil},
		{3, "Depot", "Diesel", 3.2, "ton", "Fenbridge Fuels", nil},
		{4, "Depot", "Diesel", 118000.0, "L", "Fenbridge Fuels", 3.15},
		{4, "Farm shop", "Heating oil", 600.0, "L", "Fenbridge Fuels", 1.60},
		{4, "Creamery", "Natural gas", 21.3, "MWh", "Hollinsmere Gas", 4.30},
		{5, "Depot", "Diesel", "=D8*0.5", "L", "Fenbridge Fuels (half of Tuesday's load)", nil},
		// An extra zero: 11,900 L keyed for the invoice's 1,190 L (the
		// reported tCO2 is the invoice's); the outlier check must catch it.
		{5, "Depot", "Diesel", 11900.0, "L", "Fenbridge Fuels", 3.18},
	}
	for i, r := range rows {
		row := 5 + i
		f.SetCellValue(sh, cell(1, row), day(r.day))
		f.SetCellStyle(sh, cell(1, row), cell(1, row), st.date)
		f.SetCellStr(sh, cell(2, row), r.site)
		f.SetCellStr(sh, cell(3, row), r.fuel)
		switch q := r.qty.(type) {
		case float64:
			f.SetCellValue(sh, cell(4, row), q)
			f.SetCellStyle(sh, cell(4, row), cell(4, row), st.number)
		case string:
			if len(q) > 0 && q[0] == '=' {
				f.SetCellFormula(sh, cell(4, row), q[1:])
			} else {
				f.SetCellStr(sh, cell(4, row), q)
				f.SetCellStyle(sh, cell(4, row), cell(4, row), st.text)
			}
		}
		f.SetCellStr(sh, cell(5, row), r.unit)
		f.SetCellStr(sh, cell(6, row), r.supplier)
		if r.reported != nil {
			f.SetCellValue(sh, cell(7, row), r.reported)
			f.SetCellStyle(sh, cell(7, row), cell(7, row), st.number)
		}
	}
	f.SetColWidth(sh, "A", "A", 12)
	f.SetColWidth(sh, "B", "C", 14)
	f.SetColWidth(sh, "D", "E", 11)
	f.SetColWidth(sh, "F", "F", 34)
	f.SetColWidth(sh, "G", "G", 13)
	// A second sheet the annotation must leave alone.
	if _, err := f.NewSheet("Notes"); err != nil {
		return nil, err
	}
	f.SetCellValue("Notes", "A1", "Invoices for week 14 are filed under KV-ACC-2026-14.")
	f.SetCellValue("Notes", "A2", "=Fuel log cost centre 4410")
	return f, nil
}

// monthlyEnergy is a wide table: one row per month, one column per fuel,
// the unit in each header.
func monthlyEnergy() (*excelize.File, error) {
	f := excelize.NewFile()
	const sh = "Monthly energy"
	if err := f.SetSheetName("Sheet1", sh); err != nil {
		return nil, err
	}
	st, err := newStyles(f)
	if err != nil {
		return nil, err
	}
	f.SetCellValue(sh, "A1", "Kestrel Vale - energy bought per month, 2025 (all sites)")
	f.SetCellStyle(sh, "A1", "A1", st.title)
	header := []any{"Month", "Natural gas (kWh)", "Gas oil [L]", "LPG (kg)", "Wood pellets (t)"}
	f.SetSheetRow(sh, "A3", &header)
	f.SetCellStyle(sh, "A3", "E3", st.header)
	months := []string{"Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"}
	// Heating load falls in summer; the depot's diesel is steady.
	gas := []float64{96400, 91200, 83000, 66100, 52300, 41800, 39900, 40500, 51700, 68800, 84100, 95300}
	oil := []float64{9800, 9400, 9900, 9600, 10100, 9700, 9500, 9300, 9900, 10200, 9800, 9600}
	lpg := []float64{1900, 1850, 1700, 1400, 1100, 900, 850, 880, 1120, 1450, 1760, 1880}
	wood := []float64{12.5, 11.8, 10.2, 7.4, 4.1, 2.0, 1.6, 1.7, 3.9, 7.8, 10.6, 12.2}
	for i, m := range months {
		row := 4 + i
		vals := []any{m + " 2025", gas[i], oil[i], lpg[i], wood[i]}
		f.SetSheetRow(sh, cell(1, row), &vals)
		f.SetCellStyle(sh, cell(2, row), cell(5, row), st.number)
	}
	f.SetCellStr(sh, "A16", "Total")
	for c := 2; c <= 5; c++ {
		col, _ := excelize.ColumnNumberToName(c)
		f.SetCellFormula(sh, cell(c, 16), fmt.Sprintf("SUM(%s4:%s15)", col, col))
	}
	f.SetColWidth(sh, "A", "A", 11)
	f.SetColWidth(sh, "B", "E", 17)
	return f, nil
}

// buildPlan is a regional partnership's capacity plan for 2030.
func buildPlan() (*excelize.File, error) {
	f := excelize.NewFile()
	const sh = "Build plan"
	if err := f.SetSheetName("Sheet1", sh); err != nil {
		return nil, err
	}
	st, err := newStyles(f)
	if err != nil {
		return nil, err
	}
	f.SetCellValue(sh, "A1", "Marrowdale Energy Partnership - new capacity to 2030 (planning case B)")
	f.SetCellStyle(sh, "A1", "A1", st.title)
	header := []any{"Project", "Technology", "Capacity", "Unit", "Capacity factor", "Lifetime (years)"}
	f.SetSheetRow(sh, "A3", &header)
	f.SetCellStyle(sh, "A3", "F3", st.header)
	rows := [][]any{
		{"Highfold Moor wind farm", "Wind onshore", 120.0, "MW", 0.34, 25.0},
		{"Brackenridge solar park", "PV utility", 85.0, "MWp", 0.11, 30.0},
		{"Kestrel Vale creamery roofs", "PV rooftop", 640.0, "kW", 0.10, 25.0},
		{"Marrow Sands offshore array", "Wind offshore", 0.4, "GW", 0.47, 25.0},
		{"Tarn Force run-of-river", "Hydropower", 6.5, "MW", nil, nil},
		{"Eastgate peaking plant", "Gas CC", 49.9, "MWh", 0.35, 30.0},
	}
	for i, r := range rows {
		row := 4 + i
		f.SetSheetRow(sh, cell(1, row), &r)
	}
	f.SetColWidth(sh, "A", "A", 30)
	f.SetColWidth(sh, "B", "B", 15)
	f.SetColWidth(sh, "C", "F", 14)
	return f, nil
}
