package bookio

import (
	"archive/zip"
	"bytes"
	"encoding/xml"
	"fmt"
	"io"
	"strings"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"
)

// FuzzRewriteSheet rewrites arbitrary worksheet XML with cells appended
// to rows 1 to 3 and a mark: it never panics, and when the input is
// well-formed XML and the rewrite succeeds, the output is well-formed and
// excelize reads the appended cell back from a workbook holding it.
func FuzzRewriteSheet(f *testing.F) {
	for _, s := range []string{
		wsOpen + `<dimension ref="A1"/><sheetData><row r="1"><c r="A1"><v>1</v></c></row></sheetData></worksheet>`,
		wsOpen + `<cols><col min="1" max="40" width="3"/></cols><sheetData><row><c><f>A2</f></c></row><row r="3"/></sheetData><tableParts count="0"/></worksheet>`,
		wsOpen + `<sheetData/></worksheet>`,
		`<x:worksheet xmlns:x="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><x:sheetData><x:row r="2" spans="1:1"><x:c r="AD2" s="1"/></x:row></x:sheetData></x:worksheet>`,
		wsOpen + `<sheetData><row r="1"><c r="AD1"><v>1</v></c></row></sheetData></worksheet>`,
		wsOpen + `<sheetData><row r="4"><c r="A4" t="inlineStr"><is><t>&lt;</t></is></c></row></sheetData><!-- c --><extLst/></worksheet>`,
	} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, src []byte) {
		if len(src) > 1<<16 {
			return
		}
		tm := time.AfterFunc(10*time.Second, func() { panic(fmt.Sprintf("stuck on %q", src)) })
		defer tm.Stop()
		e := &SheetEdit{
			Rows: &rowList{rows: []rowCells{
				{1, []NewCell{num(30, 1.5), str(31, "a & b")}},
				{2, []NewCell{num(30, 2)}},
				{3, []NewCell{{Col: 30, Kind: NewNumber, Num: 3, Style: 1}}},
			}},
			Marks:   []Mark{{2, 1, 1}},
			Restyle: func(int, uint8) int { return 0 },
			Extent:  Range{1, 1, 31, 3},
			Cols:    []ColWidth{{30, 31, 12}},
		}
		var out bytes.Buffer
		if err := RewriteSheet(&out, bytes.NewReader(src), e); err != nil {
			return
		}
		if !isWellFormed(src) {
			return
		}
		if !isWellFormed(out.Bytes()) {
			t.Fatalf("well-formed input, malformed output:\n in %s\nout %s", src, out.Bytes())
		}
		if !bytes.Contains(src, []byte("spreadsheetml/2006/main")) || !bytes.Contains(src, []byte("worksheet")) {
			return
		}
		wb, err := excelize.OpenReader(bytes.NewReader(withSheet(t, out.Bytes())))
		if err != nil {
			return // excelize refuses the input's own oddities as well
		}
		defer wb.Close()
		if v, err := wb.GetCellValue("Sheet1", "AD1"); err == nil && v != "1.5" && !strings.Contains(string(src), "AD1") {
			t.Fatalf("AD1 = %q, want 1.5\n%s", v, out.Bytes())
		}
	})
}

func isWellFormed(b []byte) bool {
	d := xml.NewDecoder(bytes.NewReader(b))
	root := false
	for {
		tok, err := d.Token()
		if err == io.EOF {
			return root
		}
		if err != nil {
			return false
		}
		if _, ok := tok.(xml.StartElement); ok {
			root = true
		}
	}
}

// withSheet is a new excelize workbook with its first sheet's XML replaced
// by sheet.
func withSheet(t *testing.T, sheet []byte) []byte {
	t.Helper()
	nf := excelize.NewFile()
	buf, err := nf.WriteToBuffer()
	if err != nil {
		t.Fatal(err)
	}
	zr, err := zip.NewReader(bytes.NewReader(buf.Bytes()), int64(buf.Len()))
	if err != nil {
		t.Fatal(err)
	}
	var out bytes.Buffer
	zw := zip.NewWriter(&out)
	for _, f := range zr.File {
		w, _ := zw.Create(f.Name)
		if f.Name == "xl/worksheets/sheet1.xml" {
			w.Write(sheet)
			continue
		}
		rc, _ := f.Open()
		io.Copy(w, rc)
		rc.Close()
	}
	zw.Close()
	return out.Bytes()
}
