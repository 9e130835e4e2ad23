package importer

import (
	"bytes"
	"context"
	"encoding/xml"
	"math"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/fluecell/fluecell/importer/calctest"
	"github.com/xuri/excelize/v2"
)

// TestPreservationRich annotates the OOXML-rich macro workbook
// (richbook_test.go) in place and checks, whatever path Annotate takes:
//
//   - every original cell reads back identical (value, formula, type,
//     style; a finding's fill excepted) with excelize, and the same with
//     openpyxl and LibreOffice Calc (importer/calctest);
//   - every zip part other than the rewritten sheet (and its comments),
//     the styles, the shared strings (which may only grow), the content
//     types, xl/workbook.xml and its rels, and the added sheets' parts is
//     the input's bytes, uncompressed: the other sheets, the table, the
//     pivot table and cache, the external link, the chart and its drawing,
//     the theme, the document properties and xl/vbaProject.bin;
//   - the merged cells, data validation, conditional format, hyperlinks,
//     drawing, comments drawing and table parts of the rewritten sheet are
//     there unchanged, and so are the rewritten sheet's relationships;
//   - every original <c> element of the rewritten sheet is in the output
//     with the same bytes (its s= aside, where a finding coloured it);
//   - the computed columns are beside the table with the values of the
//     published factors.
//
// The input file is never modified.
func TestPreservationRich(t *testing.T) {
	dir := t.TempDir()
	in := writeRichBook(t, dir)
	before := fileHash(t, in)
	out := filepath.Join(dir, "rich.carbon.xlsm")
	rep, err := Annotate(context.Background(), testEngine(t), in, out, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if fileHash(t, in) != before {
		t.Fatal("the input file changed")
	}
	if rep.Layout != LayoutInline || len(rep.Tables) != 1 || rep.Computed != len(richFuelRows) {
		t.Fatalf("layout %s, %d tables, %d rows computed; want inline, 1 table, %d rows", rep.Layout, len(rep.Tables), rep.Computed, len(richFuelRows))
	}
	t.Run("excelize", func(t *testing.T) { compareExcelize(t, in, out, false) })
	t.Run("parts", func(t *testing.T) { compareRichParts(t, in, out) })
	t.Run("sheet-elements", func(t *testing.T) { compareRichSheet(t, in, out) })
	t.Run("computed", func(t *testing.T) { checkRichComputed(t, out, rep.Tables[0].Output) })
	t.Run("openpyxl", func(t *testing.T) {
		compareSheets(t, "openpyxl", calctest.Openpyxl(t, in), calctest.Openpyxl(t, out))
	})
	t.Run("calc", func(t *testing.T) {
		calc := calctest.Start(t, dir)
		src, err := calc.Dump(in)
		if err != nil {
			t.Fatal(err)
		}
		got, err := calc.Dump(out)
		if err != nil {
			t.Fatal(err)
		}
		compareSheets(t, "calc", src, got)
	})
}

// richMayChange are the parts of the rich workbook an in-place annotation
// may rewrite: the sheet that gets the computed columns and the notes of
// its findings, and the workbook-level parts that list the added sheets,
// styles and strings. The shared strings may only grow (checked apart).
var richMayChange = map[string]bool{
	richSheetPart:                         true,
	"xl/comments1.xml":                    true, // the rewritten sheet's comments: findings add notes
	"xl/drawings/vmlDrawing1.vml":         true, // their shapes
	"xl/styles.xml":                       true,
	"xl/sharedStrings.xml":                true,
	"[Content_Types].xml":                 true,
	"xl/workbook.xml":                     true,
	"xl/_rels/workbook.xml.rels":          true,
	"xl/worksheets/_rels/sheet1.xml.rels": true, // compared relationship by relationship
}

// compareRichParts checks that every part of in is in out, with the same
// uncompressed bytes unless richMayChange names it, and that the shared
// strings of in are the first ones of out, each unchanged.
func compareRichParts(t *testing.T, in, out string) {
	a, b := partsOf(t, in), partsOf(t, out)
	for name, pa := range a {
		pb, ok := b[name]
		switch {
		case !ok:
			t.Errorf("part %s is missing", name)
		case !richMayChange[name] && !bytes.Equal(pa, pb):
			t.Errorf("part %s differs from the input's (%d vs %d bytes)", name, len(pb), len(pa))
		}
	}
	if vba := b["xl/vbaProject.bin"]; !bytes.Equal(vba, richVBA()) {
		t.Errorf("xl/vbaProject.bin is not the input's (%d bytes)", len(vba))
	}
	si := regexp.MustCompile(`(?s)<si>.*?</si>|<si/>`)
	sa := si.FindAllString(string(a["xl/sharedStrings.xml"]), -1)
	sb := si.FindAllString(string(b["xl/sharedStrings.xml"]), -1)
	if len(sa) == 0 || len(sb) < len(sa) {
		t.Fatalf("%d shared strings in the output, %d in the input", len(sb), len(sa))
	}
	for i := range sa {
		if sa[i] != sb[i] {
			t.Errorf("shared string %d is %q, was %q", i, sb[i], sa[i])
		}
	}
}

// richElements match the elements of the rewritten sheet that must come
// through unchanged.
var richElements = map[string]*regexp.Regexp{
	"mergeCells":            regexp.MustCompile(`(?s)<mergeCells[ >].*?</mergeCells>`),
	"conditionalFormatting": regexp.MustCompile(`(?s)<conditionalFormatting[ >].*?</conditionalFormatting>`),
	"dataValidations":       regexp.MustCompile(`(?s)<dataValidations[ >].*?</dataValidations>`),
	"hyperlinks":            regexp.MustCompile(`(?s)<hyperlinks[ >].*?</hyperlinks>`),
	"drawing":               regexp.MustCompile(`<drawing [^>]*(?:/>|></drawing>)`),
	"legacyDrawing":         regexp.MustCompile(`<legacyDrawing [^>]*(?:/>|></legacyDrawing>)`),
	"tableParts":            regexp.MustCompile(`(?s)<tableParts[ >].*?</tableParts>`),
}

// richCell matches one cell element; its s= attribute is group 2.
var richCell = regexp.MustCompile(`<c r="([A-Z]+[0-9]+)"[^>]*?(?:/>|>.*?</c>)`)

// compareRichSheet checks the rewritten sheet element by element against
// the input's, and its relationships.
func compareRichSheet(t *testing.T, in, out string) {
	sa, sb := string(zipPart(t, in, richSheetPart)), string(zipPart(t, out, richSheetPart))
	for name, re := range richElements {
		ea := re.FindAllString(sa, -1)
		eb := re.FindAllString(sb, -1)
		if len(ea) != 1 {
			t.Fatalf("the input sheet has %d %s elements, want 1", len(ea), name)
		}
		if len(eb) != 1 || eb[0] != ea[0] {
			t.Errorf("%s: %q, want %q", name, eb, ea[0])
		}
	}
	style := regexp.MustCompile(` s="[0-9]+"`)
	outCells := map[string]string{}
	for _, m := range richCell.FindAllStringSubmatch(sb, -1) {
		outCells[m[1]] = style.ReplaceAllString(m[0], "")
	}
	cells := richCell.FindAllStringSubmatch(sa, -1)
	if len(cells) < 7*len(richFuelRows) {
		t.Fatalf("the input sheet has %d cells", len(cells))
	}
	for _, m := range cells {
		if got, want := outCells[m[1]], style.ReplaceAllString(m[0], ""); got != want {
			t.Errorf("cell %s: %q, want %q", m[1], got, want)
		}
	}
	ra := sheetRels(t, zipPart(t, in, "xl/worksheets/_rels/sheet1.xml.rels"))
	rb := sheetRels(t, zipPart(t, out, "xl/worksheets/_rels/sheet1.xml.rels"))
	for id, rel := range ra {
		if rb[id] != rel {
			t.Errorf("sheet relationship %s: %+v, want %+v", id, rb[id], rel)
		}
	}
}

// sheetRel is one relationship of a part.
type sheetRel struct {
	Type, Target, TargetMode string
}

func sheetRels(t *testing.T, b []byte) map[string]sheetRel {
	t.Helper()
	var doc struct {
		Rels []struct {
			ID         string `xml:"Id,attr"`
			Type       string `xml:"Type,attr"`
			Target     string `xml:"Target,attr"`
			TargetMode string `xml:"TargetMode,attr"`
		} `xml:"Relationship"`
	}
	must(t, xml.Unmarshal(b, &doc))
	m := map[string]sheetRel{}
	for _, r := range doc.Rels {
		m[r.ID] = sheetRel{r.Type, r.Target, r.TargetMode}
	}
	return m
}

// checkRichComputed checks the computed columns at where (the report's
// "Sheet!H3:J9"): right of the table's last column G, headers tCO2 and
// tCO2e in the header row, and the values of the published factors for
// the first diesel and gas rows:
//
//   - diesel 1000 L: 1 m3 x 832.5 kg/m3 (EN 590 midpoint, the pack's
//     density, from memory) x 43.0 TJ/Gg (IPCC 2006 Vol 2 Ch 1 Table 1.2)
//     x 74 100 kg CO2/TJ (Table 1.4) = 2.65259475 t CO2;
//   - natural gas 12 000 kWh (NCV) = 0.0432 TJ x 56 100 kg CO2/TJ (Table
//     1.4) = 2.42352 t CO2.
func checkRichComputed(t *testing.T, out, where string) {
	sheet, rng, ok := strings.Cut(where, "!")
	if !ok || sheet != richSheet || !strings.HasPrefix(rng, "H3:") {
		t.Fatalf("computed columns at %q, want %s!H3:...", where, richSheet)
	}
	f, err := excelize.OpenFile(out)
	must(t, err)
	defer f.Close()
	col := map[string]string{}
	for _, c := range []string{"H", "I", "J", "K"} {
		v, err := f.GetCellValue(richSheet, c+"3")
		must(t, err)
		col[v] = c
	}
	for _, want := range []struct {
		header string
		row    int
		value  float64
	}{
		{"tCO2", 4, 1000.0 / 1000 * dieselRho / 1e6 * dieselNCV * dieselEF / kgPerTonne},
		{"tCO2", 5, 12000 * 3.6 / 1e6 * gasEF / kgPerTonne},
	} {
		c, ok := col[want.header]
		if !ok {
			t.Fatalf("no column %q in H3:K3 (%v)", want.header, col)
		}
		ref := c + strconv.Itoa(want.row)
		v, err := f.GetCellValue(richSheet, ref, excelize.Options{RawCellValue: true})
		must(t, err)
		got, err := strconv.ParseFloat(v, 64)
		if err != nil || math.Abs(got-want.value) > 1e-9*want.value {
			t.Errorf("%s!%s = %q, want %.10g", richSheet, ref, v, want.value)
		}
	}
	for r := 4; r < 4+len(richFuelRows); r++ {
		ref := col["tCO2e"] + strconv.Itoa(r)
		v, err := f.GetCellValue(richSheet, ref, excelize.Options{RawCellValue: true})
		must(t, err)
		if x, err := strconv.ParseFloat(v, 64); err != nil || x <= 0 {
			t.Errorf("%s!%s = %q, want a positive tCO2e", richSheet, ref, v)
		}
	}
}

// TestRichBookOpens checks the fixture itself before the preservation test
// relies on it: excelize reads every feature back, and openpyxl and
// LibreOffice Calc open it and see its sheets.
func TestRichBookOpens(t *testing.T) {
	dir := t.TempDir()
	in := writeRichBook(t, dir)
	f, err := excelize.OpenFile(in)
	must(t, err)
	defer f.Close()
	if got := f.GetSheetList(); strings.Join(got, ",") != "Fuel log,Notes,Pivot" {
		t.Errorf("sheets %v", got)
	}
	checks := []struct {
		what string
		get  func() (string, error)
		want string
	}{
		{"A1 rich text", func() (string, error) {
			runs, err := f.GetCellRichText(richSheet, "A1")
			return strconv.Itoa(len(runs)), err
		}, "2"},
		{"B6 inline string", func() (string, error) { return f.GetCellValue(richSheet, "B6") }, "Harbour Street"},
		{"G6 shared formula", func() (string, error) { return f.GetCellFormula(richSheet, "G6") }, "F6/D6"},
		{"B13 array formula", func() (string, error) { return f.GetCellFormula(richSheet, "B13") }, `SUM(IF(C4:C9="Diesel",D4:D9))`},
		{"Notes!B3 external", func() (string, error) { return f.GetCellFormula("Notes", "B3") }, "[1]Sheet1!$A$1"},
		{"Notes!A2 inline rich", func() (string, error) { return f.GetCellValue("Notes", "A2") }, "Checked: quantities against the card statements"},
		{"merged", func() (string, error) {
			m, err := f.GetMergeCells(richSheet)
			if len(m) != 1 {
				return strconv.Itoa(len(m)), err
			}
			return m[0].GetStartAxis() + ":" + m[0].GetEndAxis(), err
		}, "A1:F1"},
		{"tables", func() (string, error) {
			tb, err := f.GetTables(richSheet)
			if len(tb) != 1 {
				return strconv.Itoa(len(tb)), err
			}
			return tb[0].Name + " " + tb[0].Range, err
		}, "FuelLog A3:G9"},
		{"pivot", func() (string, error) {
			p, err := f.GetPivotTables("Pivot")
			return strconv.Itoa(len(p)), err
		}, "1"},
		{"hyperlink", func() (string, error) {
			_, link, err := f.GetCellHyperLink(richSheet, "F4")
			return link, err
		}, "https://invoices.example.invalid/kestrel/2025-01/1"},
		{"comments", func() (string, error) {
			c, err := f.GetComments(richSheet)
			return strconv.Itoa(len(c)), err
		}, "1"},
		{"defined names", func() (string, error) { return strconv.Itoa(len(f.GetDefinedName())), nil }, "2"},
	}
	for _, c := range checks {
		got, err := c.get()
		if err != nil || got != c.want {
			t.Errorf("%s: %q (%v), want %q", c.what, got, err, c.want)
		}
	}
	if b := zipPart(t, in, "xl/vbaProject.bin"); !bytes.Equal(b, richVBA()) {
		t.Error("xl/vbaProject.bin is not the placeholder")
	}
	t.Run("openpyxl", func(t *testing.T) {
		if got := calctest.Openpyxl(t, in); len(got) != 3 || got[0].Rows[5][1].Text != "Harbour Street" {
			t.Errorf("openpyxl reads %+v", got)
		}
	})
	t.Run("calc", func(t *testing.T) {
		got, err := calctest.Start(t, dir).Dump(in)
		if err != nil {
			t.Fatal(err)
		}
		if len(got) != 3 || got[2].Name != "Pivot" {
			t.Fatalf("calc reads %d sheets", len(got))
		}
		// Calc computes the pivot table from its cache definition.
		if !strings.Contains(strings.ReplaceAll(dumpText(got[2]), " ", ""), "Diesel|2520") {
			t.Errorf("the pivot table reads %q in Calc", dumpText(got[2]))
		}
	})
}

// dumpText joins a sheet's cell texts, cells by "|" and rows by newlines.
func dumpText(s calctest.Sheet) string {
	var b strings.Builder
	for _, row := range s.Rows {
		for i, c := range row {
			if i > 0 {
				b.WriteByte('|')
			}
			b.WriteString(c.Text)
		}
		b.WriteByte('\n')
	}
	return b.String()
}
