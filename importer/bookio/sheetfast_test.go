package bookio

import (
	"archive/zip"
	"bytes"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"strconv"
	"strings"
	"testing"
	"unsafe"
)

// sheetOf wraps the rows of a test in a worksheet part.
func sheetOf(rows string) []byte {
	return []byte(`<?xml version="1.0" encoding="UTF-8" standalone="yes"?>` + "\n" +
		`<worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><sheetData>` + rows +
		`</sheetData><mergeCells count="1"><mergeCell ref="A1:B1"/></mergeCells></worksheet>`)
}

// readSheet reads every row of a worksheet part through a tokenizer buffer
// of size bytes, the general way only or with the short cuts; the error
// text is "" when the rows ended cleanly.
func readSheet(xml []byte, sst []string, size int, general bool) ([]Row, string) {
	rd := &SheetReader{part: "sheet1.xml", t: NewTokSize(bytes.NewReader(xml), size), rc: io.NopCloser(nil), sst: sst, general: general}
	var out []Row
	for {
		r, ok := rd.Next()
		if !ok {
			break
		}
		out = append(out, Row{Num: r.Num, Cells: append([]Cell(nil), r.Cells...)})
	}
	if rd.Err() != nil {
		return out, rd.Err().Error()
	}
	return out, ""
}

// sameBothWays reads xml the general way and with the short cuts, through
// buffers of several sizes (so that a cell crosses the end of the buffer
// somewhere), and fails unless every reading gives the same rows and the
// same error. It returns the rows.
func sameBothWays(t *testing.T, xml []byte, sst []string) ([]Row, string) {
	t.Helper()
	want, werr := readSheet(xml, sst, 1<<16, true)
	for _, size := range []int{16, 17, 29, 64, 101, 1 << 16} {
		for _, general := range []bool{false, true} {
			got, gerr := readSheet(xml, sst, size, general)
			if gerr != werr || !reflect.DeepEqual(got, want) {
				t.Fatalf("buffer %d, general %v:\n got %+v %q\nwant %+v %q\nsheet %s", size, general, got, gerr, want, werr, xml)
			}
		}
	}
	return want, werr
}

// TestQuickCells reads each shape of cell both ways. The expected values
// follow ECMA-376 Part 1 (5th ed., 2021): §18.3.1.4 c (the t attribute:
// s shared string index, inlineStr, str formula string, b boolean 0/1,
// e error, n number, the default), §18.3.1.96 v, §18.3.1.40 f, §18.3.1.53
// is with its t and r runs and rPh phonetic runs, §18.4.12 t (xml:space);
// entities and CDATA follow XML 1.0 (5th ed.) §4.6 (the five predefined
// entities), §4.1 (character references) and §2.7 (CDATA sections).
func TestQuickCells(t *testing.T) {
	sst := []string{"Diesel", "m3", "fuel & oil"}
	for _, c := range []struct {
		name, row string
		want      []Cell
	}{
		{"shared string", `<c r="A1" s="3" t="s"><v>2</v></c>`, []Cell{{Col: 1, Kind: Text, Text: "fuel & oil", Style: 3}}},
		{"number", `<c r="B1"><v>1.5</v></c>`, []Cell{{Col: 2, Kind: Number, Num: 1.5}}},
		{"number with exponent", `<c r="B1"><v>-1.25E-3</v></c>`, []Cell{{Col: 2, Kind: Number, Num: -0.00125}}},
		{"number t=n", `<c r="B1" t="n"><v>45658</v></c>`, []Cell{{Col: 2, Kind: Number, Num: 45658}}},
		{"number padded", `<c r="B1"><v> 2.5 </v></c>`, []Cell{{Col: 2, Kind: Number, Num: 2.5}}},
		{"cells without r", `<c t="s"><v>0</v></c><c><v>7</v></c><c r="E1"><v>8</v></c><c><v>9</v></c>`,
			[]Cell{{Col: 1, Kind: Text, Text: "Diesel"}, {Col: 2, Kind: Number, Num: 7}, {Col: 5, Kind: Number, Num: 8}, {Col: 6, Kind: Number, Num: 9}}},
		{"self-closing cells", `<c r="A1"/><c r="B1" s="4"/><c r="C1"><v>1</v></c>`, []Cell{{Col: 3, Kind: Number, Num: 1}}},
		{"inline string", `<c r="D1" t="inlineStr"><is><t>kg</t></is></c>`, []Cell{{Col: 4, Kind: Text, Text: "kg"}}},
		{"inline string preserved space", `<c r="D1" t="inlineStr"><is><t xml:space="preserve"> gas oil </t></is></c>`, []Cell{{Col: 4, Kind: Text, Text: " gas oil "}}},
		{"inline string entities", `<c r="D1" t="inlineStr"><is><t>A&amp;B &lt;1&gt; &quot;x&quot; &apos;y&apos; &#65;&#x42;</t></is></c>`,
			[]Cell{{Col: 4, Kind: Text, Text: `A&B <1> "x" 'y' AB`}}},
		{"inline string empty", `<c r="D1" t="inlineStr"><is><t></t></is></c><c r="E1" t="inlineStr"><is><t/></is></c>`,
			[]Cell{{Col: 4, Kind: Text}, {Col: 5, Kind: Text}}},
		{"inline rich text", `<c r="D1" t="inlineStr"><is><r><rPr><b/></rPr><t>Nat</t></r><r><t xml:space="preserve">ural gas</t></r><rPh sb="0" eb="1"><t>x</t></rPh></is></c>`,
			[]Cell{{Col: 4, Kind: Text, Text: "Natural gas"}}},
		{"inline string CDATA", `<c r="D1" t="inlineStr"><is><t><![CDATA[a<b & c]]></t></is></c>`, []Cell{{Col: 4, Kind: Text, Text: "a<b & c"}}},
		{"inline string in v", `<c r="D1" t="inlineStr"><v>m&amp;s</v></c>`, []Cell{{Col: 4, Kind: Text, Text: "m&s"}}},
		{"inline string with a style", `<c r="D1" s="2" t="inlineStr"><is><t>L</t></is></c>`, []Cell{{Col: 4, Kind: Text, Text: "L", Style: 2}}},
		{"value in CDATA", `<c r="B1"><v><![CDATA[3.5]]></v></c>`, []Cell{{Col: 2, Kind: Number, Num: 3.5}}},
		{"formula and number", `<c r="C1" s="2"><f>B1*2</f><v>3</v></c>`, []Cell{{Col: 3, Kind: Number, Num: 3, Formula: true, Style: 2}}},
		{"formula with entities", `<c r="C1" t="str"><f>IF(B1&lt;2,"a&amp;b","")</f><v>a&amp;b</v></c>`, []Cell{{Col: 3, Kind: Text, Text: "a&b", Formula: true}}},
		{"formula string", `<c r="C1" t="str"><f>"a"&amp;"b"</f><v>a&amp;b</v></c>`, []Cell{{Col: 3, Kind: Text, Text: "a&b", Formula: true}}},
		{"formula empty string", `<c r="C1" t="str"><f>""</f><v></v></c>`, []Cell{{Col: 3, Kind: Text, Formula: true}}},
		{"formula without result", `<c r="C1"><f>1+1</f></c>`, []Cell{{Col: 3, Formula: true, NoCache: true}}},
		{"formula empty result", `<c r="C1"><f>2*300</f><v></v></c>`, []Cell{{Col: 3, Formula: true, NoCache: true}}},
		{"shared formula", `<c r="C1"><f t="shared" ref="C1:C9" si="0">B1*2</f><v>4</v></c><c r="D1"><f t="shared" si="0"/><v>6</v></c>`,
			[]Cell{{Col: 3, Kind: Number, Num: 4, Formula: true}, {Col: 4, Kind: Number, Num: 6, Formula: true}}},
		{"boolean", `<c r="A1" t="b"><v>1</v></c><c r="B1" t="b"><v>0</v></c>`, []Cell{{Col: 1, Kind: Bool, Text: "TRUE"}, {Col: 2, Kind: Bool, Text: "FALSE"}}},
		{"error", `<c r="A1" t="e"><v>#DIV/0!</v></c>`, []Cell{{Col: 1, Kind: Error, Text: "#DIV/0!"}}},
		{"date as text", `<c r="A1" t="d"><v>2025-03-01T00:00:00Z</v></c>`, []Cell{{Col: 1, Kind: Text, Text: "2025-03-01T00:00:00Z"}}},
		{"prefixed", `<x:c r="A1" t="s" xmlns:x="urn:x"><x:v>1</x:v></x:c>`, []Cell{{Col: 1, Kind: Text, Text: "m3"}}},
		{"white space between elements", "<c r=\"A1\" t=\"s\">\n  <v>1</v>\n</c><c r=\"B1\"><f>1</f>\n<v>2</v></c>",
			[]Cell{{Col: 1, Kind: Text, Text: "m3"}, {Col: 2, Kind: Number, Num: 2, Formula: true}}},
		{"attributes spaced and single-quoted", `<c  r = 'A1'  t = 's' s='5'><v>1</v></c>`, []Cell{{Col: 1, Kind: Text, Text: "m3", Style: 5}}},
		{"start tags with other spacing", "<c\nr=\"A1\"\tt=\"s\"><v>1</v></c ><c r=\"B1\"s=\"2\" ><v>2</v></c><c r=\"C1\" cm=\"1\" vm='1'><v>3</v></c>",
			[]Cell{{Col: 1, Kind: Text, Text: "m3"}, {Col: 2, Kind: Number, Num: 2, Style: 2}, {Col: 3, Kind: Number, Num: 3}}},
		{"other elements in the row", `<cx r="A1"/><ext><c r="Z1"><v>1</v></c></ext><c r="B1" t="b"><v>1</v></c>`, []Cell{{Col: 2, Kind: Bool, Text: "TRUE"}}},
		{"attributes after a broken one unread", `<c r="A1" foo t="s"><v>1</v></c>`, []Cell{{Col: 1, Kind: Number, Num: 1}}},
		{"lower-case and absolute references", `<c r="$a$1"><v>1</v></c><c r="b1"><v>2</v></c>`, []Cell{{Col: 1, Kind: Number, Num: 1}, {Col: 2, Kind: Number, Num: 2}}},
		{"other children skipped", `<c r="A1"><extLst><ext uri="x"><y>1</y></ext></extLst><v>4</v></c>`, []Cell{{Col: 1, Kind: Number, Num: 4}}},
		{"empty value", `<c r="A1"><v/></c><c r="B1" t="s"><v></v></c>`, nil},
		{"invalid UTF-8", "<c r=\"A1\" t=\"inlineStr\"><is><t>a\xffb</t></is></c>", []Cell{{Col: 1, Kind: Text, Text: "a\uFFFDb"}}},
		{"non-ASCII", `<c r="A1" t="inlineStr"><is><t>Erdgas – m³</t></is></c>`, []Cell{{Col: 1, Kind: Text, Text: "Erdgas – m³"}}},
	} {
		t.Run(c.name, func(t *testing.T) {
			rows, err := sameBothWays(t, sheetOf(`<row r="1">`+c.row+`</row>`), sst)
			if err != "" {
				t.Fatal(err)
			}
			var got []Cell
			if len(rows) == 1 {
				got = rows[0].Cells
			}
			if !reflect.DeepEqual(got, c.want) {
				t.Fatalf("got  %+v\nwant %+v", got, c.want)
			}
		})
	}
}

// TestQuickCellRefusals: corrupt cells give the same error both ways.
func TestQuickCellRefusals(t *testing.T) {
	for _, c := range []struct{ row, want string }{
		{`<c r="A1" t="s"><v>3</v></c>`, `refers to shared string "3"`},
		{`<c r="A1" t="s"><v>-1</v></c>`, `refers to shared string "-1"`},
		{`<c r="A1"><v>1,5</v></c>`, `holds "1,5", which is not a number`},
		{`<c r="A1"><v>1e999</v></c>`, `holds "1e999", which is not a number`},
		{`<c r="A2"><v>1</v></c>`, `cell reference "A2" in row 1 is not valid`},
		{`<c r="B1"><v>1</v></c><c r="A1"><v>1</v></c>`, `cell A1 comes after a cell to its right`},
		{`<c r="A1"><v>1<x/></v></c>`, `unexpected content in <v>`},
		{`<c r="A1"><v>1</v>`, `the sheet ends inside cell A1`},
		{`<c r="A1" t="inlineStr"><is><t>a</is></c>`, `malformed XML`},
	} {
		_, err := sameBothWays(t, sheetOf(`<row r="1">`+c.row+`</row>`), []string{"a", "b"})
		if !strings.Contains(err, c.want) {
			t.Errorf("%s: error %q, want one saying %q", c.row, err, c.want)
		}
	}
}

// TestSheetReaderAllocs: the short cuts allocate nothing per row for
// shared strings, numbers, formulas and inline strings seen before.
func TestSheetReaderAllocs(t *testing.T) {
	var rows strings.Builder
	for i := 1; i <= 200; i++ {
		r := strconv.Itoa(i)
		rows.WriteString(`<row r="` + r + `" spans="1:5"><c r="A` + r + `" s="3" t="s"><v>1</v></c><c r="B` + r + `"><v>1.5</v></c>` +
			`<c r="C` + r + `" s="2"><f>B` + r + `*2</f><v>3</v></c><c r="D` + r + `" t="inlineStr"><is><t>kg</t></is></c>` +
			`<c r="E` + r + `" t="inlineStr"><is><t xml:space="preserve">Pellow Fuels </t></is></c></row>`)
	}
	xml := sheetOf(rows.String())
	rd := &SheetReader{part: "sheet1.xml", t: NewTok(bytes.NewReader(xml)), rc: io.NopCloser(nil), sst: []string{"a", "b"}}
	if _, ok := rd.Next(); !ok {
		t.Fatal(rd.Err())
	}
	n := 0
	allocs := testing.AllocsPerRun(150, func() {
		r, ok := rd.Next()
		if !ok || len(r.Cells) != 5 || r.Cells[3].Text != "kg" {
			t.Fatalf("row %+v %v", r, rd.Err())
		}
		n++
	})
	if allocs != 0 {
		t.Errorf("%v allocations per row, want 0", allocs)
	}
}

// TestTextTable: one string per distinct text, decoded as Unescape
// decodes, and a bounded table.
func TestTextTable(t *testing.T) {
	var x textTable
	a := x.get([]byte("Natural gas"))
	b := x.get([]byte("Natural gas"))
	if a != "Natural gas" || b != a || unsafe.StringData(a) != unsafe.StringData(b) {
		t.Fatalf("%q %q", a, b)
	}
	if got := x.get([]byte("a &amp; b")); got != "a & b" {
		t.Errorf("entities: %q", got)
	}
	if got := x.get([]byte("a &amp; b")); got != "a & b" {
		t.Errorf("entities again: %q", got)
	}
	if got := x.get([]byte("\xff\xff\xff")); got != "\uFFFD" {
		t.Errorf("invalid UTF-8: %q", got)
	}
	long := strings.Repeat("x", textTableLen+1) + "&lt;"
	if got := x.get([]byte(long)); got != strings.Repeat("x", textTableLen+1)+"<" {
		t.Errorf("long: %q", got)
	}
	for i := range 3 * textTableSize {
		s := fmt.Sprint("INV-", i)
		if got := x.get([]byte(s)); got != s {
			t.Fatalf("%q gave %q", s, got)
		}
		if len(x.m) > textTableSize {
			t.Fatalf("the table holds %d texts", len(x.m))
		}
	}
}

// TestParseNumber: the short cut gives ParseFloat's value, bit for bit,
// on decimals whose exact values are known, and the same refusals.
func TestParseNumber(t *testing.T) {
	for _, c := range []struct {
		in   string
		want float64
	}{
		{"0", 0}, {"45658", 45658}, {"1.5", 1.5}, {"-12.25", -12.25}, {".5", 0.5}, {"5.", 5},
		{"0.1", 0.1}, {"2.68", 2.68}, {"123456789012345", 123456789012345}, {"0.000000000000001", 1e-15},
		{"9007199254740993", 9007199254740992}, {"1e3", 1000}, {"1.7976931348623157e308", math.MaxFloat64},
	} {
		got, err := parseNumber([]byte(c.in))
		if err != nil || math.Float64bits(got) != math.Float64bits(c.want) {
			t.Errorf("parseNumber(%q) = %v, %v; want %v", c.in, got, err, c.want)
		}
	}
	if got, _ := parseNumber([]byte("-0")); !math.Signbit(got) || got != 0 {
		t.Errorf("-0 gave %v", got)
	}
	for _, in := range []string{"", "-", ".", "-.", "1.2.3", "1,5", "12a", "--1", "1 2"} {
		if _, err := parseNumber([]byte(in)); err == nil {
			t.Errorf("parseNumber(%q): no error", in)
		}
	}
}

func FuzzParseNumber(f *testing.F) {
	for _, s := range []string{"0", "1.5", "-12.25", ".5", "5.", "123456789012345", "1234567890123456", "1e5", "0x1p3", "-", "inf", "1_0"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		got, gerr := parseNumber([]byte(s))
		want, werr := strconv.ParseFloat(s, 64)
		if (gerr == nil) != (werr == nil) || math.Float64bits(got) != math.Float64bits(want) && !(math.IsNaN(got) && math.IsNaN(want)) {
			t.Fatalf("parseNumber(%q) = %v, %v; ParseFloat %v, %v", s, got, gerr, want, werr)
		}
	})
}

// FuzzSheetReader: whatever the rows hold, the short cuts give the rows
// and the error the general way gives, through any buffer size.
func FuzzSheetReader(f *testing.F) {
	for _, s := range []string{
		`<row r="1"><c r="A1" s="3" t="s"><v>1</v></c><c r="B1"><v>1.5</v></c></row>`,
		`<row><c t="inlineStr"><is><t>kg</t></is></c><c t="inlineStr"><is><t xml:space="preserve"> a&amp;b </t></is></c></row>`,
		`<row r="2"><c r="C2"><f>B2*2</f><v>3</v></c><c r="D2"><f>1</f></c><c r="E2" t="str"><f>x</f><v></v></c></row>`,
		`<row r="3"><c r="A3" t="inlineStr"><is><r><t>a</t></r><r><t>b</t></r></is></c><c r="B3"><v><![CDATA[2]]></v></c></row>`,
		`<row r="4"><c r="A4" t="b"><v>1</v></c><c r="B4" t="e"><v>#N/A</v></c><c r="C4"/></row>`,
	} {
		f.Add(s, uint8(0))
	}
	f.Fuzz(func(t *testing.T, rows string, size uint8) {
		xml := sheetOf(rows)
		sst := []string{"Diesel", "m3"}
		want, werr := readSheet(xml, sst, 1<<16, true)
		got, gerr := readSheet(xml, sst, 16+int(size), false)
		if gerr != werr || !reflect.DeepEqual(got, want) {
			t.Fatalf("short cuts through a %d-byte buffer:\n got %+v %q\nwant %+v %q", 16+int(size), got, gerr, want, werr)
		}
	})
}

// FuzzRefInRow: the short cut reads a reference as ParseRef does.
func FuzzRefInRow(f *testing.F) {
	for _, s := range []string{"A1", "XFD1048576", "XFE1", "AB012", "$A$1", "a1", "A0", "A", "1", "AAAA1", "A12345678", "A1048577"} {
		f.Add(s, 1)
	}
	f.Fuzz(func(t *testing.T, ref string, row int) {
		col, ok := refInRow([]byte(ref), row)
		c, r, pok := ParseRef(ref)
		if ok != (pok && r == row) || ok && col != c {
			t.Fatalf("refInRow(%q, %d) = %d %v; ParseRef %d %d %v", ref, row, col, ok, c, r, pok)
		}
	})
}

// TestQuickCellsRealWorkbooks reads every sheet of the real workbooks in
// testdata/realworld (and of those in the folder FLUECELL_DEVSET names,
// when set) both ways: the rows and errors must be the same.
func TestQuickCellsRealWorkbooks(t *testing.T) {
	dirs := []string{filepath.Join("..", "..", "testdata", "realworld")}
	if d := os.Getenv("FLUECELL_DEVSET"); d != "" {
		dirs = append(dirs, d)
	}
	cells := 0
	for _, dir := range dirs {
		files, err := filepath.Glob(filepath.Join(dir, "*.xls[xm]"))
		if err != nil || len(files) == 0 {
			t.Fatalf("no workbooks in %s: %v", dir, err)
		}
		for _, path := range files {
			zr, err := zip.OpenReader(path)
			if err != nil {
				t.Fatal(err)
			}
			b, err := Open(&zr.Reader, 1<<30)
			if err != nil {
				zr.Close()
				t.Fatalf("%s: %v", path, err)
			}
			for _, s := range b.Sheets {
				if s.Kind != "worksheet" || s.Part == "" {
					continue
				}
				var got [2][]Row
				var errs [2]string
				for i, general := range []bool{true, false} {
					rd, err := b.OpenSheet(s)
					if err != nil {
						t.Fatal(err)
					}
					rd.general, rd.KeepStyled = general, true
					for {
						r, ok := rd.Next()
						if !ok {
							break
						}
						got[i] = append(got[i], Row{Num: r.Num, Cells: append([]Cell(nil), r.Cells...)})
					}
					if rd.Err() != nil {
						errs[i] = rd.Err().Error()
					}
					rd.Close()
				}
				if errs[0] != errs[1] || !reflect.DeepEqual(got[0], got[1]) {
					t.Errorf("%s, sheet %q: the short cuts read it otherwise (errors %q, %q)", filepath.Base(path), s.Name, errs[0], errs[1])
				}
				for _, r := range got[0] {
					cells += len(r.Cells)
				}
			}
			zr.Close()
		}
	}
	t.Logf("%d cells read both ways", cells)
}
