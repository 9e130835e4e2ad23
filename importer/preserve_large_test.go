package importer

import (
	"context"
	"math"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// TestLargeTableInPlace annotates a 25 000-row x 10-column fuel log
// (250 011 cells, above the 200 000-cell limit under which the excelize
// path writes beside the table) with the default options, and expects the
// computed columns beside the table: K and on in the header row 3 and
// every data row, every original cell unchanged, and the tCO2 of every
// gas/diesel oil row in litres equal to the published factors':
// litres / 1000 x 832.5 kg/m3 (EN 590 midpoint, the pack's density, from
// memory) x 43.0 TJ/Gg (IPCC 2006 Vol 2 Ch 1 Table 1.2) x 74 100 kg CO2/TJ
// (Table 1.4).
func TestLargeTableInPlace(t *testing.T) {
	if testing.Short() {
		t.Skip("a 25 000-row workbook")
	}
	dir := t.TempDir()
	in := filepath.Join(dir, "large.xlsx")
	const n = 25_000
	writeFuelLog(t, in, n)
	out := filepath.Join(dir, "large.carbon.xlsx")
	rep, err := Annotate(context.Background(), testEngine(t), in, out, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if rep.Layout != LayoutInline || len(rep.Tables) != 1 || rep.Computed != n {
		t.Fatalf("layout %s, %d tables, %d rows computed; want inline, 1 table, %d", rep.Layout, len(rep.Tables), rep.Computed, n)
	}
	if o := rep.Tables[0].Output; !strings.HasPrefix(o, "Fuel log!K3:") {
		t.Fatalf("computed columns at %q, want Fuel log!K3:...", o)
	}
	a, err := excelize.OpenFile(in)
	must(t, err)
	defer a.Close()
	b, err := excelize.OpenFile(out)
	must(t, err)
	defer b.Close()
	ra, err := a.GetRows("Fuel log", excelize.Options{RawCellValue: true})
	must(t, err)
	rb, err := b.GetRows("Fuel log", excelize.Options{RawCellValue: true})
	must(t, err)
	if len(rb) < len(ra) {
		t.Fatalf("%d rows in the output, %d in the input", len(rb), len(ra))
	}
	col := map[string]int{}
	for c := 10; c < len(rb[2]); c++ {
		col[rb[2][c]] = c
	}
	co2, ok1 := col["tCO2"]
	_, ok2 := col["tCO2e"]
	if !ok1 || !ok2 {
		t.Fatalf("header row 3 beyond J: %q, want tCO2 and tCO2e", rb[2][min(10, len(rb[2])):])
	}
	perLitre := 832.5 / 1e6 * dieselNCV * dieselEF / kgPerTonne / 1000 // t CO2 per L, as above
	checked, bad := 0, 0
	for r, row := range ra {
		got := rb[r]
		for c, v := range row {
			if c >= len(got) || got[c] != v {
				if bad++; bad <= 10 {
					t.Errorf("%s: %q in the output, %q in the input", cellRef(c+1, r+1), got[min(c, len(got)-1)], v)
				}
			}
		}
		if r < 3 {
			continue
		}
		if co2 >= len(got) {
			if bad++; bad <= 10 {
				t.Errorf("row %d has no tCO2", r+1)
			}
			continue
		}
		x, err := strconv.ParseFloat(got[co2], 64)
		if err != nil || x <= 0 {
			if bad++; bad <= 10 {
				t.Errorf("%s = %q, want a positive tCO2", cellRef(co2+1, r+1), got[co2])
			}
			continue
		}
		if f := strings.ToLower(row[3]); (f == "diesel" || f == "gas oil") && row[5] == "L" {
			q, err := strconv.ParseFloat(row[4], 64)
			must(t, err)
			if math.Abs(x-q*perLitre) > 1e-9*x {
				if bad++; bad <= 10 {
					t.Errorf("%s = %v for %v L of %s, want %v", cellRef(co2+1, r+1), x, q, row[3], q*perLitre)
				}
			}
			checked++
		}
	}
	if bad > 10 {
		t.Errorf("%d differences in all", bad)
	}
	if checked < n/4 {
		t.Errorf("only %d gas/diesel oil rows checked", checked)
	}
}
