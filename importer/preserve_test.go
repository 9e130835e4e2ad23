package importer

import (
	"archive/zip"
	"bytes"
	"context"
	"crypto/sha256"
	"io"
	"os"
	"path/filepath"
	"reflect"
	"slices"
	"strings"
	"testing"

	"github.com/fluecell/fluecell/importer/calctest"
	"github.com/xuri/excelize/v2"
)

// richWorkbook is the messy workbook plus the things a real one carries: a
// comment, a data validation, a row height, a frozen pane and a hidden
// column.
func richWorkbook(t *testing.T, dir string) string {
	t.Helper()
	in := writeMessy(t, dir)
	f, err := excelize.OpenFile(in)
	must(t, err)
	must(t, f.AddComment("Fuel log", excelize.Comment{Cell: "D6", Author: "finance", Paragraph: []excelize.RichTextRun{{Text: "typed from the PDF invoice"}}}))
	dv := excelize.NewDataValidation(true)
	dv.Sqref = "E5:E19"
	must(t, dv.SetDropList([]string{"L", "kWh", "MWh", "GJ", "t"}))
	must(t, f.AddDataValidation("Fuel log", dv))
	must(t, f.SetRowHeight("Fuel log", 4, 30))
	must(t, f.SetPanes("Fuel log", &excelize.Panes{Freeze: true, YSplit: 4, TopLeftCell: "A5", ActivePane: "bottomLeft"}))
	must(t, f.SetColVisible("Build plan", "F", false))
	must(t, f.Save())
	must(t, f.Close())
	return in
}

func fileHash(t *testing.T, path string) [32]byte {
	t.Helper()
	b, err := os.ReadFile(path)
	must(t, err)
	return sha256.Sum256(b)
}

// TestPreservation annotates a rich workbook both ways (beside the tables,
// and with side sheets) and checks that every original cell reads back
// identical - value, formula, type and style - with excelize, that merged
// cells, column widths, row heights, comments, validations and defined
// names are kept, and that openpyxl and LibreOffice Calc see the same
// original cells in the input and the output. The input file is never
// modified.
func TestPreservation(t *testing.T) {
	dir := t.TempDir()
	in := richWorkbook(t, dir)
	before := fileHash(t, in)
	e := testEngine(t)
	outs := map[string]string{}
	for _, c := range []struct {
		name   string
		inline int
	}{{"inline", 0}, {"side", -1}} {
		out := filepath.Join(dir, "out-"+c.name+".xlsx")
		rep, err := Annotate(context.Background(), e, in, out, Options{InlineMaxCells: c.inline})
		if err != nil {
			t.Fatal(err)
		}
		want := LayoutInline
		if c.inline < 0 {
			want = LayoutSideSheet
		}
		if rep.Layout != want {
			t.Fatalf("%s: layout %s", c.name, rep.Layout)
		}
		outs[c.name] = out
		t.Run("excelize/"+c.name, func(t *testing.T) { compareExcelize(t, in, out, c.inline < 0) })
	}
	if fileHash(t, in) != before {
		t.Fatal("the input file changed")
	}
	t.Run("openpyxl", func(t *testing.T) {
		src := calctest.Openpyxl(t, in)
		for name, out := range outs {
			compareSheets(t, "openpyxl "+name, src, calctest.Openpyxl(t, out))
		}
	})
	t.Run("calc", func(t *testing.T) {
		calc := calctest.Start(t, dir)
		src, err := calc.Dump(in)
		if err != nil {
			t.Fatal(err)
		}
		for name, out := range outs {
			got, err := calc.Dump(out)
			if err != nil {
				t.Fatal(err)
			}
			compareSheets(t, "calc "+name, src, got)
		}
	})
}

// compareSheets checks that each sheet of src is in got with the same
// cells in src's rectangle (got may have more columns and sheets).
func compareSheets(t *testing.T, who string, src, got []calctest.Sheet) {
	t.Helper()
	byName := map[string]calctest.Sheet{}
	for _, s := range got {
		byName[s.Name] = s
	}
	for i, s := range src {
		if i >= len(got) || got[i].Name != s.Name {
			t.Errorf("%s: sheet %d is not %q", who, i, s.Name)
		}
		g, ok := byName[s.Name]
		if !ok {
			t.Errorf("%s: sheet %q missing", who, s.Name)
			continue
		}
		for r, row := range s.Rows {
			for c, cell := range row {
				var gc calctest.Cell
				if r < len(g.Rows) && c < len(g.Rows[r]) {
					gc = g.Rows[r][c]
				}
				if gc != cell {
					t.Errorf("%s: %s!%s = %+v, want %+v", who, s.Name, cellRef(c+1, r+1), gc, cell)
				}
			}
		}
	}
	for _, name := range []string{SheetSummary, SheetWarnings, SheetSources} {
		if _, ok := byName[name]; !ok {
			t.Errorf("%s: no sheet %q", who, name)
		}
	}
}

func compareExcelize(t *testing.T, in, out string, side bool) {
	a, err := excelize.OpenFile(in)
	must(t, err)
	defer a.Close()
	b, err := excelize.OpenFile(out)
	must(t, err)
	defer b.Close()
	sheets := a.GetSheetList()
	if got := b.GetSheetList(); len(got) < len(sheets) || !reflect.DeepEqual(got[:len(sheets)], sheets) {
		t.Fatalf("sheets %v, want %v first", got, sheets)
	}
	for _, s := range sheets {
		rows, err := a.GetRows(s, excelize.Options{RawCellValue: true})
		must(t, err)
		for r, row := range rows {
			for c := range row {
				ref := cellRef(c+1, r+1)
				for _, get := range []func(*excelize.File) (string, error){
					func(f *excelize.File) (string, error) {
						return f.GetCellValue(s, ref, excelize.Options{RawCellValue: true})
					},
					func(f *excelize.File) (string, error) { return f.GetCellFormula(s, ref) },
					func(f *excelize.File) (string, error) {
						ty, err := f.GetCellType(s, ref)
						return string(rune('0' + ty)), err
					},
				} {
					va, err1 := get(a)
					vb, err2 := get(b)
					if err1 != nil || err2 != nil || va != vb {
						t.Errorf("%s!%s: %q in the output, %q in the input (%v %v)", s, ref, vb, va, err1, err2)
					}
				}
				sa, _ := a.GetCellStyle(s, ref)
				sb, _ := b.GetCellStyle(s, ref)
				da, _ := a.GetStyle(sa)
				db, _ := b.GetStyle(sb)
				if !side && db != nil && da != nil && len(db.Fill.Color) == 1 && ownFill(db.Fill.Color[0]) {
					db.Fill = da.Fill // a finding's fill (cellnotes.go) is the one change allowed
				}
				if !reflect.DeepEqual(da, db) {
					t.Errorf("%s!%s: style %+v, want %+v", s, ref, db, da)
				}
			}
			ha, _ := a.GetRowHeight(s, r+1)
			hb, _ := b.GetRowHeight(s, r+1)
			if ha != hb {
				t.Errorf("%s row %d: height %v, want %v", s, r+1, hb, ha)
			}
		}
		width := 0
		for _, row := range rows {
			width = max(width, len(row))
		}
		for c := 1; c <= width; c++ {
			wa, _ := a.GetColWidth(s, colName(c))
			wb, _ := b.GetColWidth(s, colName(c))
			va, _ := a.GetColVisible(s, colName(c))
			vb, _ := b.GetColVisible(s, colName(c))
			if wa != wb || va != vb {
				t.Errorf("%s column %s: width %v visible %v, want %v %v", s, colName(c), wb, vb, wa, va)
			}
		}
		ma, _ := a.GetMergeCells(s)
		mb, _ := b.GetMergeCells(s)
		if !reflect.DeepEqual(ma, mb) {
			t.Errorf("%s: merged cells %v, want %v", s, mb, ma)
		}
		va, _ := a.GetDataValidations(s)
		vb, _ := b.GetDataValidations(s)
		if !reflect.DeepEqual(va, vb) {
			t.Errorf("%s: data validations %+v, want %+v", s, vb, va)
		}
		pa, _ := a.GetPanes(s)
		pb, _ := b.GetPanes(s)
		if !reflect.DeepEqual(pa, pb) {
			t.Errorf("%s: panes %+v, want %+v", s, pb, pa)
		}
	}
	ca, _ := a.GetComments("Fuel log")
	cb, _ := b.GetComments("Fuel log")
	if !side { // findings add fluecell's comments; the user's stay as they were
		cb = slices.DeleteFunc(cb, func(c excelize.Comment) bool { return c.Author == noteAuthor })
	}
	if !reflect.DeepEqual(ca, cb) {
		t.Errorf("comments %+v, want %+v", cb, ca)
	}
	if !reflect.DeepEqual(a.GetDefinedName(), b.GetDefinedName()) {
		t.Errorf("defined names %+v, want %+v", b.GetDefinedName(), a.GetDefinedName())
	}
	if side {
		// The tables' sheets are not rewritten at all: their parts are the
		// input's bytes (the shared strings only grow).
		for _, part := range []string{"xl/worksheets/sheet1.xml", "xl/worksheets/sheet2.xml", "xl/worksheets/sheet3.xml"} {
			if pa, pb := zipPart(t, in, part), zipPart(t, out, part); !bytes.Equal(pa, pb) {
				t.Errorf("part %s differs from the input's (%d vs %d bytes)", part, len(pb), len(pa))
			}
		}
	}
}

func zipPart(t *testing.T, path, name string) []byte {
	t.Helper()
	zr, err := zip.OpenReader(path)
	must(t, err)
	defer zr.Close()
	for _, f := range zr.File {
		if f.Name == name {
			rc, err := f.Open()
			must(t, err)
			b, err := io.ReadAll(rc)
			rc.Close()
			must(t, err)
			return b
		}
	}
	t.Fatalf("%s has no part %s", filepath.Base(path), name)
	return nil
}

// TestTextStaysText checks that input text that looks like a formula is
// written back as text, in the computed columns' neighbours and in the
// warnings sheet that quotes it.
func TestTextStaysText(t *testing.T) {
	dir := t.TempDir()
	f := newBook(t, "Log")
	setRows(t, f, "Log", 1, [][]any{
		{"Fuel", "Quantity", "Unit"},
		{"=HYPERLINK(\"http://example.invalid\",\"x\")", 10, "GJ"},
		{"natural_gas", 10, "=1+1"},
	})
	in := save(t, f, filepath.Join(dir, "inject.xlsx"))
	out := filepath.Join(dir, "inject.carbon.xlsx")
	rep, err := Annotate(context.Background(), testEngine(t), in, out, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(rep.Warnings) < 2 {
		t.Fatalf("warnings %+v", rep.Warnings)
	}
	g, err := excelize.OpenFile(out)
	must(t, err)
	defer g.Close()
	rows, err := g.GetRows(SheetWarnings)
	must(t, err)
	for r := range rows {
		for c := range rows[r] {
			ref := cellRef(c+1, r+1)
			if fo, _ := g.GetCellFormula(SheetWarnings, ref); fo != "" {
				t.Errorf("%s!%s holds the formula %q", SheetWarnings, ref, fo)
			}
		}
	}
	found := false
	for _, row := range rows {
		if len(row) == 5 && strings.Contains(row[4], "=HYPERLINK") {
			found = true
		}
	}
	if !found {
		t.Errorf("the warnings do not quote the text: %v", rows)
	}
}
