package bookio

import (
	"archive/zip"
	"bytes"
	"io"
	"strconv"
	"testing"
)

// The benchmark workbook: a fuel log of the invented carrier "Tern Haulage",
// written here as the two common kinds of writer write a sheet: Excel's
// shared strings (t="s", styled cells, formulas with cached results) and
// a streaming writer's inline strings (t="inlineStr"), one column of each
// kind in every row, with merged ranges after the cell data.

var benchWords = []string{"Diesel", "Petrol", "Gas oil", "Natural gas", "LPG", "L", "kWh", "kg",
	"Larkfield depot", "Wexcombe yard", "Pellow Fuels", "Crannock Energy", "fuel & oil"}

// benchSheetXML is a worksheet of rows rows of ten cells.
func benchSheetXML(rows int) []byte {
	var b bytes.Buffer
	b.WriteString(`<?xml version="1.0" encoding="UTF-8" standalone="yes"?>` + "\n" +
		`<worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main" xmlns:r="http://schemas.openxmlformats.org/officeDocument/2006/relationships">` +
		`<dimension ref="A1:J` + strconv.Itoa(rows) + `"/><sheetData>`)
	for i := 1; i <= rows; i++ {
		r := strconv.Itoa(i)
		w := func(k int) string { return strconv.Itoa((i*7 + k) % len(benchWords)) }
		b.WriteString(`<row r="` + r + `" spans="1:10">`)
		b.WriteString(`<c r="A` + r + `" s="1"><v>` + strconv.Itoa(45658+i/300) + `</v></c>`)
		b.WriteString(`<c r="B` + r + `" t="s"><v>` + w(0) + `</v></c>`)
		b.WriteString(`<c r="C` + r + `" t="inlineStr"><is><t>TH-` + strconv.Itoa(100+i%400) + `</t></is></c>`)
		b.WriteString(`<c r="D` + r + `" s="2" t="s"><v>` + w(1) + `</v></c>`)
		b.WriteString(`<c r="E` + r + `" s="3"><v>` + strconv.FormatFloat(float64(i%800)+0.25, 'f', -1, 64) + `</v></c>`)
		b.WriteString(`<c r="F` + r + `" t="s"><v>` + w(2) + `</v></c>`)
		b.WriteString(`<c r="G` + r + `" t="inlineStr"><is><t>` + escapeText(benchWords[(i*3)%len(benchWords)]) + `</t></is></c>`)
		b.WriteString(`<c r="H` + r + `" t="inlineStr"><is><t>INV-` + strconv.Itoa(500000+i) + `</t></is></c>`)
		b.WriteString(`<c r="I` + r + `"><v>` + strconv.FormatFloat(float64(i%20000)/100, 'f', -1, 64) + `</v></c>`)
		b.WriteString(`<c r="J` + r + `" s="3"><f>E` + r + `*2.68</f><v>` + strconv.FormatFloat(float64(i%800)*2.68, 'f', -1, 64) + `</v></c>`)
		b.WriteString(`</row>`)
	}
	b.WriteString(`</sheetData><mergeCells count="2"><mergeCell ref="A1:B1"/><mergeCell ref="C2:D3"/></mergeCells></worksheet>`)
	return b.Bytes()
}

func escapeText(s string) string { return string(appendEscaped(nil, s, false)) }

// benchBook is a whole package (zip bytes) around benchSheetXML.
func benchBook(tb testing.TB, rows int) []byte {
	tb.Helper()
	var sst bytes.Buffer
	sst.WriteString(`<?xml version="1.0" encoding="UTF-8" standalone="yes"?>` + "\n" +
		`<sst xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main" count="` + strconv.Itoa(len(benchWords)) + `" uniqueCount="` + strconv.Itoa(len(benchWords)) + `">`)
	for _, w := range benchWords {
		sst.WriteString(`<si><t>` + escapeText(w) + `</t></si>`)
	}
	sst.WriteString(`</sst>`)
	parts := []struct{ name, data string }{
		{"[Content_Types].xml", `<?xml version="1.0" encoding="UTF-8"?><Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types">` +
			`<Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/><Default Extension="xml" ContentType="application/xml"/>` +
			`<Override PartName="/xl/workbook.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml"/>` +
			`<Override PartName="/xl/worksheets/sheet1.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml"/>` +
			`<Override PartName="/xl/sharedStrings.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.sharedStrings+xml"/></Types>`},
		{"_rels/.rels", `<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">` +
			`<Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/officeDocument" Target="xl/workbook.xml"/></Relationships>`},
		{"xl/workbook.xml", `<?xml version="1.0" encoding="UTF-8"?><workbook xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main" xmlns:r="http://schemas.openxmlformats.org/officeDocument/2006/relationships">` +
			`<sheets><sheet name="Fuel log" sheetId="1" r:id="rId1"/></sheets></workbook>`},
		{"xl/_rels/workbook.xml.rels", `<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">` +
			`<Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/worksheet" Target="worksheets/sheet1.xml"/>` +
			`<Relationship Id="rId2" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/sharedStrings" Target="sharedStrings.xml"/></Relationships>`},
		{"xl/sharedStrings.xml", sst.String()},
		{"xl/worksheets/sheet1.xml", string(benchSheetXML(rows))},
	}
	var out bytes.Buffer
	zw := zip.NewWriter(&out)
	for _, p := range parts {
		w, err := zw.Create(p.name)
		if err != nil {
			tb.Fatal(err)
		}
		if _, err := w.Write([]byte(p.data)); err != nil {
			tb.Fatal(err)
		}
	}
	if err := zw.Close(); err != nil {
		tb.Fatal(err)
	}
	return out.Bytes()
}

// openBytes opens the package held in data (a limit of 1 GB).
func openBytes(tb testing.TB, data []byte) *Book {
	tb.Helper()
	zr, err := zip.NewReader(bytes.NewReader(data), int64(len(data)))
	if err != nil {
		tb.Fatal(err)
	}
	b, err := Open(zr, 1<<30)
	if err != nil {
		tb.Fatal(err)
	}
	return b
}

func openBench(tb testing.TB, data []byte) (*Book, SheetRef) {
	tb.Helper()
	b := openBytes(tb, data)
	s, ok := b.Sheet("Fuel log")
	if !ok {
		tb.Fatal("no sheet")
	}
	return b, s
}

const benchRows = 50_000

// BenchmarkSheetReader reads every row of a 50 000-row, ten-column sheet
// (about 24 MB of XML): inflate, tokenize, typed cells.
func BenchmarkSheetReader(b *testing.B) {
	data := benchBook(b, benchRows)
	book, s := openBench(b, data)
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		rd, err := book.OpenSheet(s)
		if err != nil {
			b.Fatal(err)
		}
		rows := 0
		for {
			r, ok := rd.Next()
			if !ok {
				break
			}
			rows += len(r.Cells)
		}
		rd.Close()
		if rd.Err() != nil || rows != 10*benchRows {
			b.Fatalf("%d cells, %v", rows, rd.Err())
		}
	}
}

// BenchmarkReadMerges finds the merged ranges after the cell data of the
// same sheet.
func BenchmarkReadMerges(b *testing.B) {
	data := benchBook(b, benchRows)
	book, s := openBench(b, data)
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		ms, err := book.ReadMerges(s)
		if err != nil || len(ms) != 2 {
			b.Fatalf("%v %v", ms, err)
		}
	}
}

// BenchmarkInflateSheet only inflates the same sheet: the least any
// reading of it costs, the baseline of the two benchmarks above.
func BenchmarkInflateSheet(b *testing.B) {
	data := benchBook(b, benchRows)
	book, s := openBench(b, data)
	buf := make([]byte, 256<<10)
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		rc, err := book.OpenPart(s.Part)
		if err != nil {
			b.Fatal(err)
		}
		n, err := io.CopyBuffer(io.Discard, struct{ io.Reader }{rc}, buf)
		rc.Close()
		if err != nil || n < 20<<20 {
			b.Fatalf("%d bytes, %v", n, err)
		}
	}
}
