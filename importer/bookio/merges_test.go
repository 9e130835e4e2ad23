package bookio

import (
	"bytes"
	"io"
	"reflect"
	"strings"
	"testing"
	"testing/iotest"
)

// The merged ranges of a worksheet follow its cell data (ECMA-376 Part 1,
// 5th ed., §18.3.1.99 worksheet: sheetData, then ... mergeCells, each
// mergeCell with its ref, §18.3.1.55); an end tag may have white space
// before its '>' (XML 1.0, 5th ed., §3.1 ETag) and an element without
// content may be written as an empty-element tag (§3.1 EmptyElemTag).
func TestReadMergesTails(t *testing.T) {
	merges := `<mergeCells count="2"><mergeCell ref="A1:B1"/><mergeCell ref="C3:D9"/></mergeCells>`
	want := []Range{{1, 1, 2, 1}, {3, 3, 4, 9}}
	row := `<row r="1"><c r="A1" t="s" s="3"><v>0</v></c></row>`
	for _, c := range []struct {
		name, xml string
		want      []Range
	}{
		{"plain", `<worksheet><sheetData>` + row + `</sheetData>` + merges + `</worksheet>`, want},
		{"prefixed", `<x:worksheet xmlns:x="urn:x"><x:sheetData>` + row + `</x:sheetData>` + strings.ReplaceAll(merges, "<merge", "<x:merge") + `</x:worksheet>`, want},
		{"space before >", `<worksheet><sheetData>` + row + "</sheetData \n>" + merges + `</worksheet>`, want},
		{"no cells", `<worksheet><sheetData/>` + merges + `</worksheet>`, want},
		{"no cells, prefixed", `<x:worksheet xmlns:x="urn:x"><x:sheetData />` + merges + `</x:worksheet>`, want},
		{"no merges", `<worksheet><sheetData>` + row + `</sheetData></worksheet>`, nil},
		{"no sheet data", `<worksheet><dimension ref="A1"/></worksheet>`, nil},
		{"the name in a value", `<worksheet><sheetData><row r="1"><c r="A1" t="inlineStr"><is><t>heetData sheetData> /sheetData></t></is></c></row></sheetData>` + merges + `</worksheet>`, want},
	} {
		for _, r := range []io.Reader{strings.NewReader(c.xml), iotest.OneByteReader(strings.NewReader(c.xml))} {
			tail, err := afterSheetData(r)
			if err != nil {
				t.Fatalf("%s: %v", c.name, err)
			}
			got, err := mergeCells(NewTok(bytes.NewReader(tail)), "sheet1.xml")
			if err != nil || !reflect.DeepEqual(got, c.want) {
				t.Errorf("%s: %v %v, want %v", c.name, got, err, c.want)
			}
		}
	}
}

// TestReadMergesAcrossReads puts the end of the sheet data at every
// offset around the ends of the first two reads and of the bytes looked
// at in each.
func TestReadMergesAcrossReads(t *testing.T) {
	merges := `<mergeCells count="1"><mergeCell ref="B2:C3"/></mergeCells>`
	head := `<x:worksheet xmlns:x="urn:x"><x:sheetData><x:row r="1"><x:c r="A1" t="inlineStr"><x:is><x:t>`
	end := `</x:t></x:is></x:c></x:row></x:s` // then heetData
	first := mergeBehind + mergeAhead + mergeRead
	for _, at := range []int{first - mergeAhead, first, first + mergeRead - mergeAhead, first + mergeRead} {
		for d := -40; d <= 40; d++ {
			pad := at + d - len(head) - len(end)
			xml := head + strings.Repeat("s", pad) + end + `heetData >` + merges + `</x:worksheet>`
			tail, err := afterSheetData(strings.NewReader(xml))
			if err != nil {
				t.Fatal(err)
			}
			got, err := mergeCells(NewTok(bytes.NewReader(tail)), "sheet1.xml")
			if err != nil || !reflect.DeepEqual(got, []Range{{2, 2, 3, 3}}) {
				t.Fatalf("name at offset %d: %v %v (tail %.60q)", at+d, got, err, tail)
			}
		}
	}
}

// TestSheetReaderMerges: the merges after the rows, read by the same
// reader, are those ReadMerges finds.
func TestSheetReaderMerges(t *testing.T) {
	book, s := openBench(t, benchBook(t, 300))
	want, err := book.ReadMerges(s)
	if err != nil || len(want) != 2 {
		t.Fatalf("ReadMerges: %v %v", want, err)
	}
	for _, rowsFirst := range []int{300, 7, 0} {
		rd, err := book.OpenSheet(s)
		if err != nil {
			t.Fatal(err)
		}
		for i := 0; i < rowsFirst; i++ {
			if _, ok := rd.Next(); !ok {
				t.Fatalf("row %d: %v", i+1, rd.Err())
			}
		}
		got, err := rd.Merges()
		rd.Close()
		if err != nil || !reflect.DeepEqual(got, want) {
			t.Errorf("after %d rows: %v %v, want %v", rowsFirst, got, err, want)
		}
	}
}
