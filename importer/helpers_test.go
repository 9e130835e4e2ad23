package importer

import (
	"context"
	"path/filepath"
	"strconv"
	"testing"

	"github.com/fluecell/fluecell/funcs"
	"github.com/xuri/excelize/v2"
)

// testEngine is the engine with the embedded packs.
func testEngine(t testing.TB) *funcs.Engine {
	t.Helper()
	e, err := funcs.New()
	if err != nil {
		t.Fatal(err)
	}
	return e
}

// setRows writes rows from row first down, column A onward. A string that
// starts with "=" is written as a formula (excelize stores no cached value,
// like many generated workbooks); nil leaves the cell empty.
func setRows(t testing.TB, f *excelize.File, sheet string, first int, rows [][]any) {
	t.Helper()
	for i, r := range rows {
		for j, v := range r {
			ref := cellRef(j+1, first+i)
			var err error
			switch x := v.(type) {
			case nil:
				continue
			case formula:
				err = f.SetCellFormula(sheet, ref, string(x))
			default:
				err = f.SetCellValue(sheet, ref, v)
			}
			if err != nil {
				t.Fatal(err)
			}
		}
	}
}

// formula is a cell formula for setRows (without "=").
type formula string

// newBook returns a workbook whose first sheet is named first.
func newBook(t testing.TB, first string) *excelize.File {
	t.Helper()
	f := excelize.NewFile()
	if err := f.SetSheetName("Sheet1", first); err != nil {
		t.Fatal(err)
	}
	return f
}

func addSheet(t testing.TB, f *excelize.File, name string) {
	t.Helper()
	if _, err := f.NewSheet(name); err != nil {
		t.Fatal(err)
	}
}

func save(t testing.TB, f *excelize.File, path string) string {
	t.Helper()
	if err := f.SaveAs(path); err != nil {
		t.Fatal(err)
	}
	f.Close()
	return path
}

// scanFile scans path with default options and fails the test on error.
func scanFile(t testing.TB, path string, opt Options) *Report {
	t.Helper()
	res, err := Scan(context.Background(), testEngine(t), path, opt)
	if err != nil {
		t.Fatalf("Scan(%s): %v", filepath.Base(path), err)
	}
	return res.Report
}

// warnKeyOf is a warning without its message, for comparisons.
type wkey struct{ sheet, cell, code, sev string }

func keysOf(ws []Warning) map[wkey]Warning {
	out := map[wkey]Warning{}
	for _, w := range ws {
		out[wkey{w.Sheet, w.Cell, w.Code, w.Severity}] = w
	}
	return out
}

func itoaT(n int) string { return strconv.Itoa(n) }
