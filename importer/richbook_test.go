package importer

import (
	"archive/zip"
	"bytes"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// The OOXML-rich macro workbook of the preservation tests
// (preserve_rich_test.go): an invented bakery chain's fuel log that
// annotate computes, carrying the features a real workbook has. excelize
// writes most of it; the parts excelize cannot write (inline strings, an
// external link) are added to its zip afterwards by hand, so that every
// feature is visible here.
//
//	Fuel log  rich-text title in a merged A1:F1; a table (ListObject)
//	          "FuelLog" A3:G9 over the fuel rows; shared strings, one inline
//	          string (B6), date and number formats; a shared formula G4:G9;
//	          an array formula B13; a data validation on E4:E9; a
//	          conditional format on D4:D9; an internal (B4 -> Notes!A1) and
//	          an external (F4) hyperlink; a comment on C5; a column chart
//	          of the quantities.
//	Notes     a rich-text inline string (A2), a formula through the
//	          external link (B3), a plain text cell.
//	Pivot     a pivot table of quantity by fuel and its cache definition
//	          (saveData false, refreshed on load: no records part).
//
// Workbook-level: defined names (global and sheet-local), an external link
// part, and xl/vbaProject.bin. The vbaProject.bin is NOT a working macro
// project: it is richVBA, a placeholder binary that starts with the OLE
// compound-file signature (which excelize requires) and must survive
// byte for byte.

// richSheet is the sheet of the rich workbook whose table annotate
// computes, and richSheetPart its part.
const (
	richSheet     = "Fuel log"
	richSheetPart = "xl/worksheets/sheet1.xml"
)

// richVBA is the placeholder vbaProject.bin: the 8-byte OLE signature and
// 4 KiB of a fixed pattern (not a macro project).
func richVBA() []byte {
	b := []byte{0xD0, 0xCF, 0x11, 0xE0, 0xA1, 0xB1, 0x1A, 0xE1}
	for i := 0; len(b) < 4096; i++ {
		b = append(b, byte(i*31+7))
	}
	return b
}

// richFuelRows are the fuel rows of the rich workbook (row 4 on): date
// serial, site, fuel, quantity, unit, cost in EUR.
var richFuelRows = [][]any{
	{45659, "Mill Road", "Diesel", 1000, "L", 1480.5},
	{45662, "Quay Bakehouse", "Natural gas", 12000, "kWh", 960.0},
	{45667, "Harbour Street", "Diesel", 640, "L", 951.2},
	{45671, "Mill Road", "LPG", 350, "kg", 420.0},
	{45680, "Quay Bakehouse", "Diesel", 880, "L", 1302.4},
	{45688, "Harbour Street", "Natural gas", 9800, "kWh", 784.0},
}

// writeRichBook writes the rich workbook to dir/rich.xlsm and returns its
// path.
func writeRichBook(t testing.TB, dir string) string {
	t.Helper()
	f := excelize.NewFile()
	defer f.Close()
	must(t, f.SetSheetName("Sheet1", richSheet))
	for _, s := range []string{"Notes", "Pivot"} {
		_, err := f.NewSheet(s)
		must(t, err)
	}
	bold, err := f.NewStyle(&excelize.Style{Font: &excelize.Font{Bold: true}, Border: []excelize.Border{{Type: "bottom", Color: "000000", Style: 1}}})
	must(t, err)
	date, err := f.NewStyle(&excelize.Style{NumFmt: 14})
	must(t, err)
	money, err := f.NewStyle(&excelize.Style{NumFmt: 4})
	must(t, err)
	title, err := f.NewStyle(&excelize.Style{Alignment: &excelize.Alignment{Horizontal: "center"}})
	must(t, err)

	// Fuel log.
	must(t, f.SetCellRichText(richSheet, "A1", []excelize.RichTextRun{
		{Text: "Kestrel Mill Bakeries", Font: &excelize.Font{Bold: true, Color: "1F4E79"}},
		{Text: " - fuel purchases, January 2025", Font: &excelize.Font{Italic: true}},
	}))
	must(t, f.MergeCell(richSheet, "A1", "F1"))
	must(t, f.SetCellStyle(richSheet, "A1", "A1", title))
	must(t, f.SetSheetRow(richSheet, "A3", &[]any{"Date", "Site", "Fuel", "Quantity", "Unit", "Cost (EUR)", "EUR per unit"}))
	must(t, f.SetCellStyle(richSheet, "A3", "G3", bold))
	for i, row := range richFuelRows {
		r := i + 4
		must(t, f.SetSheetRow(richSheet, fmt.Sprintf("A%d", r), &row))
		must(t, f.SetCellFloat(richSheet, fmt.Sprintf("G%d", r), row[5].(float64)/float64(row[3].(int)), 4, 64))
	}
	must(t, f.SetCellStyle(richSheet, "A4", "A9", date))
	must(t, f.SetCellStyle(richSheet, "F4", "F9", money))
	shared, ref := "shared", "G4:G9"
	must(t, f.SetCellFormula(richSheet, "G4", "F4/D4", excelize.FormulaOpts{Type: &shared, Ref: &ref}))
	must(t, f.SetCellValue(richSheet, "A13", "Diesel (L)"))
	array, aref := "array", "B13"
	must(t, f.SetCellInt(richSheet, "B13", 2520)) // the cached result; the formula follows
	must(t, f.SetCellFormula(richSheet, "B13", `SUM(IF(C4:C9="Diesel",D4:D9))`, excelize.FormulaOpts{Type: &array, Ref: &aref}))
	must(t, f.AddTable(richSheet, &excelize.Table{Range: "A3:G9", Name: "FuelLog", StyleName: "TableStyleMedium2"}))
	dv := excelize.NewDataValidation(true)
	dv.Sqref = "E4:E9"
	must(t, dv.SetDropList([]string{"L", "kWh", "kg", "m3"}))
	must(t, f.AddDataValidation(richSheet, dv))
	red, err := f.NewConditionalStyle(&excelize.Style{Fill: excelize.Fill{Type: "pattern", Color: []string{"FFC7CE"}, Pattern: 1}})
	must(t, err)
	must(t, f.SetConditionalFormat(richSheet, "D4:D9", []excelize.ConditionalFormatOptions{{Type: "cell", Criteria: ">", Format: &red, Value: "5000"}}))
	must(t, f.SetCellHyperLink(richSheet, "B4", "Notes!A1", "Location"))
	must(t, f.SetCellHyperLink(richSheet, "F4", "https://invoices.example.invalid/kestrel/2025-01/1", "External"))
	must(t, f.AddComment(richSheet, excelize.Comment{Cell: "C5", Author: "site manager", Paragraph: []excelize.RichTextRun{{Text: "meter read by the gas supplier"}}}))
	must(t, f.AddChart(richSheet, "L16", &excelize.Chart{
		Type:   excelize.Col,
		Series: []excelize.ChartSeries{{Name: "'Fuel log'!$D$3", Categories: "'Fuel log'!$B$4:$B$9", Values: "'Fuel log'!$D$4:$D$9"}},
		Title:  excelize.ChartTitle{Paragraph: []excelize.RichTextRun{{Text: "Quantity by purchase"}}},
	}))
	must(t, f.SetColWidth(richSheet, "B", "C", 16))

	// Notes (A2 becomes a rich inline string, B3 a formula through the
	// external link; both set below in the zip).
	must(t, f.SetCellValue("Notes", "A1", "Notes on the January fuel log"))
	must(t, f.SetCellValue("Notes", "A2", "INLINE-RICH"))
	must(t, f.SetCellValue("Notes", "A3", "Depot list total"))
	must(t, f.SetCellValue("Notes", "B3", 4))

	// Pivot.
	must(t, f.AddPivotTable(&excelize.PivotTableOptions{
		DataRange:       "Fuel log!A3:F9",
		PivotTableRange: "Pivot!A3:B8",
		Rows:            []excelize.PivotTableField{{Data: "Fuel"}},
		Data:            []excelize.PivotTableField{{Data: "Quantity", Name: "Sum of Quantity", Subtotal: "Sum"}},
		RowGrandTotals:  true,
		ShowRowHeaders:  true,
	}))

	must(t, f.SetDefinedName(&excelize.DefinedName{Name: "FuelQuantity", RefersTo: "'Fuel log'!$D$4:$D$9"}))
	must(t, f.SetDefinedName(&excelize.DefinedName{Name: "NoteTitle", RefersTo: "Notes!$A$1", Scope: "Notes"}))
	must(t, f.AddVBAProject(richVBA()))
	f.SetActiveSheet(0)

	// SaveAs with .xlsm gives the macro-enabled content types.
	path := filepath.Join(dir, "rich.xlsm")
	must(t, f.SaveAs(path))
	b, err := os.ReadFile(path)
	must(t, err)
	must(t, os.WriteFile(path, addRichParts(t, b), 0o644))
	return path
}

// Hand-written additions to the excelize output.
var (
	// The external link: a workbook "depots-2024.xlsx" beside this one,
	// with the cached value of its Sheet1!A1.
	richExternalLink = `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>
<externalLink xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main" xmlns:r="http://schemas.openxmlformats.org/officeDocument/2006/relationships"><externalBook r:id="rId1"><sheetNames><sheetName val="Sheet1"/></sheetNames><sheetDataSet><sheetData sheetId="0"><row r="1"><cell r="A1"><v>4</v></cell></row></sheetData></sheetDataSet></externalBook></externalLink>`
	richExternalLinkRels = `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>
<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships"><Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/externalLinkPath" Target="depots-2024.xlsx" TargetMode="External"/></Relationships>`
	// Fuel log!B6 "Harbour Street" as an inline string.
	richInlineB6 = regexp.MustCompile(`<c r="B6"([^>]*?) t="s"><v>\d+</v></c>`)
	// Notes!A2 as an inline string with two runs.
	richInlineA2 = regexp.MustCompile(`<c r="A2"([^>]*?) t="s"><v>\d+</v></c>`)
	// Notes!B3 as a formula through the external link.
	richExternalB3 = regexp.MustCompile(`<c r="B3"([^>]*?)><v>4</v></c>`)
)

// addRichParts adds the inline strings and the external link to the zip
// excelize wrote and returns the new zip.
func addRichParts(t testing.TB, in []byte) []byte {
	t.Helper()
	zr, err := zip.NewReader(bytes.NewReader(in), int64(len(in)))
	must(t, err)
	edit := map[string]func(string) string{
		richSheetPart: func(s string) string {
			// excelize marks the cached numeric results of the formulas
			// it wrote as strings; a number carries no t.
			s = replaceString(t, s, `<c r="G4" t="str">`, `<c r="G4">`)
			s = replaceString(t, s, `<c r="B13" t="str">`, `<c r="B13">`)
			return replaceOnce(t, richInlineB6, s, `<c r="B6"${1} t="inlineStr"><is><t>Harbour Street</t></is></c>`)
		},
		"xl/worksheets/sheet2.xml": func(s string) string {
			s = replaceOnce(t, richInlineA2, s, `<c r="A2"${1} t="inlineStr"><is><r><rPr><b/></rPr><t>Checked:</t></r><r><t xml:space="preserve"> quantities against the card statements</t></r></is></c>`)
			return replaceOnce(t, richExternalB3, s, `<c r="B3"${1}><f>[1]Sheet1!$$A$$1</f><v>4</v></c>`)
		},
		"xl/workbook.xml": func(s string) string {
			return replaceString(t, s, "</sheets>", `</sheets><externalReferences><externalReference r:id="rIdExt1"/></externalReferences>`)
		},
		"xl/_rels/workbook.xml.rels": func(s string) string {
			return replaceString(t, s, "</Relationships>", `<Relationship Id="rIdExt1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/externalLink" Target="externalLinks/externalLink1.xml"/></Relationships>`)
		},
		"[Content_Types].xml": func(s string) string {
			return replaceString(t, s, "</Types>", `<Override PartName="/xl/externalLinks/externalLink1.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.externalLink+xml"/></Types>`)
		},
	}
	var out bytes.Buffer
	zw := zip.NewWriter(&out)
	for _, zf := range zr.File {
		rc, err := zf.Open()
		must(t, err)
		b, err := io.ReadAll(rc)
		rc.Close()
		must(t, err)
		if fn, ok := edit[zf.Name]; ok {
			b = []byte(fn(string(b)))
			delete(edit, zf.Name)
		}
		w, err := zw.Create(zf.Name)
		must(t, err)
		_, err = w.Write(b)
		must(t, err)
	}
	if len(edit) != 0 {
		t.Fatalf("the excelize output has no parts %v", edit)
	}
	for name, body := range map[string]string{
		"xl/externalLinks/externalLink1.xml":            richExternalLink,
		"xl/externalLinks/_rels/externalLink1.xml.rels": richExternalLinkRels,
	} {
		w, err := zw.Create(name)
		must(t, err)
		_, err = io.WriteString(w, body)
		must(t, err)
	}
	must(t, zw.Close())
	return out.Bytes()
}

func replaceOnce(t testing.TB, re *regexp.Regexp, s, repl string) string {
	t.Helper()
	if n := len(re.FindAllStringIndex(s, -1)); n != 1 {
		t.Fatalf("%s matches %d times in the excelize output", re, n)
	}
	return re.ReplaceAllString(s, repl)
}

func replaceString(t testing.TB, s, old, repl string) string {
	t.Helper()
	if strings.Count(s, old) != 1 {
		t.Fatalf("%q is not once in the excelize output", old)
	}
	return strings.Replace(s, old, repl, 1)
}
