package importer

import (
	"archive/zip"
	"bytes"
	"context"
	"errors"
	"os"
	"path/filepath"
	"testing"
	"time"

	"github.com/fluecell/fluecell/funcs"
)

// packageSheet wraps a worksheet part (and shared strings) in a minimal
// .xlsx package.
func packageSheet(sheetXML, sstXML []byte) []byte {
	parts := []struct {
		name string
		data []byte
	}{
		{"[Content_Types].xml", []byte(`<?xml version="1.0" encoding="UTF-8"?><Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types"><Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/><Default Extension="xml" ContentType="application/xml"/><Override PartName="/xl/workbook.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml"/><Override PartName="/xl/worksheets/sheet1.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml"/><Override PartName="/xl/sharedStrings.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.sharedStrings+xml"/></Types>`)},
		{"_rels/.rels", []byte(`<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships"><Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/officeDocument" Target="xl/workbook.xml"/></Relationships>`)},
		{"xl/workbook.xml", []byte(`<?xml version="1.0" encoding="UTF-8"?><workbook xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main" xmlns:r="http://schemas.openxmlformats.org/officeDocument/2006/relationships"><sheets><sheet name="Log" sheetId="1" r:id="rId1"/></sheets></workbook>`)},
		{"xl/_rels/workbook.xml.rels", []byte(`<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships"><Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/worksheet" Target="worksheets/sheet1.xml"/><Relationship Id="rId2" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/sharedStrings" Target="sharedStrings.xml"/></Relationships>`)},
		{"xl/worksheets/sheet1.xml", sheetXML},
		{"xl/sharedStrings.xml", sstXML},
	}
	var buf bytes.Buffer
	zw := zip.NewWriter(&buf)
	for _, p := range parts {
		w, _ := zw.Create(p.name)
		w.Write(p.data)
	}
	zw.Close()
	return buf.Bytes()
}

const seedSheet = `<?xml version="1.0" encoding="UTF-8"?>
<worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><sheetData>
<row r="1"><c r="A1" t="s"><v>0</v></c><c r="B1" t="s"><v>1</v></c><c r="C1" t="s"><v>2</v></c></row>
<row r="2"><c r="A2" t="s"><v>3</v></c><c r="B2"><v>1000</v></c><c r="C2" t="inlineStr"><is><t>L</t></is></c></row>
<row r="3"><c r="A3" t="inlineStr"><is><r><t>natural</t></r><r><t xml:space="preserve"> gas</t></r></is></c><c r="B3"><f>B2/20</f></c><c r="C3" t="str"><f>"MWh"</f><v>MWh</v></c></row>
<row r="4"><c r="A4" t="s"><v>3</v></c><c r="B4" t="s"><v>4</v></c><c r="C4"><v>7</v></c></row>
</sheetData><mergeCells count="1"><mergeCell ref="A4:A5"/></mergeCells></worksheet>`

const seedSST = `<?xml version="1.0" encoding="UTF-8"?>
<sst xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><si><t>Fuel</t></si><si><t>Quantity</t></si><si><t>Unit</t></si><si><t>diesel</t></si><si><t>1,250.5</t><rPh><t>x</t></rPh></si></sst>`

// scanBytes writes data to a file named name and scans it; a panic caught
// inside Scan (ErrInternal) or a hang fails the test.
func scanBytes(t *testing.T, e *funcs.Engine, dir, name string, data []byte) {
	path := filepath.Join(dir, name)
	if err := os.WriteFile(path, data, 0o644); err != nil {
		t.Fatal(err)
	}
	ctx, cancel := context.WithTimeout(context.Background(), 20*time.Second)
	defer cancel()
	_, err := Scan(ctx, e, path, Options{MaxUnzippedBytes: 8 << 20})
	var ie *Error
	if err != nil && !errors.As(err, &ie) {
		t.Fatalf("error of type %T: %v", err, err)
	}
	if ie != nil && ie.Code == ErrInternal {
		t.Fatalf("internal error: %v", err)
	}
	if ctx.Err() != nil {
		t.Fatalf("Scan did not finish in 20 s")
	}
}

// FuzzScan feeds arbitrary bytes to Scan as a workbook or a CSV file.
func FuzzScan(f *testing.F) {
	dir := f.TempDir()
	good, err := os.ReadFile(smallLog(f, filepath.Join(dir, "seed.xlsx")))
	if err != nil {
		f.Fatal(err)
	}
	f.Add(good, false)
	f.Add(good[:len(good)/3], false)
	f.Add(packageSheet([]byte(seedSheet), []byte(seedSST)), false)
	f.Add([]byte("Fuel,Quantity,Unit\ndiesel,1000,L\n\"natural gas\",\"1,250.5\",GJ\n"), true)
	f.Add([]byte("Month;Diesel (L);Gas (kWh)\nJan;12,5;100\n"), true)
	e := testEngine(f)
	f.Fuzz(func(t *testing.T, data []byte, csv bool) {
		name := "in.xlsx"
		if csv {
			name = "in.csv"
		}
		scanBytes(t, e, t.TempDir(), name, data)
	})
}

// FuzzSheetXML feeds arbitrary worksheet and shared-string parts, inside a
// valid package, to Scan: the streaming reader must refuse bad XML with an
// error, never crash or hang.
func FuzzSheetXML(f *testing.F) {
	f.Add([]byte(seedSheet), []byte(seedSST))
	f.Add([]byte(`<worksheet><sheetData><row><c><v>1</v></c><c t="s"><v>99</v></c></row></sheetData></worksheet>`), []byte(seedSST))
	f.Add([]byte(`<x:worksheet xmlns:x="urn:x"><x:sheetData><x:row r="2"><x:c r="B2" t="inlineStr"><x:is><x:t>Fuel</x:t></x:is></x:c></x:row></x:sheetData></x:worksheet>`), []byte(`<sst/>`))
	f.Add([]byte(`<worksheet><sheetData><row r="1"><c r="A1"><v><![CDATA[12]]></v></c></row><!-- c --></sheetData></worksheet>`), []byte(`<sst><si><t>&amp;&#65;&#x42;&bogus;</t></si></sst>`))
	e := testEngine(f)
	f.Fuzz(func(t *testing.T, sheet, sst []byte) {
		scanBytes(t, e, t.TempDir(), "in.xlsx", packageSheet(sheet, sst))
	})
}
