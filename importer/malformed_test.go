package importer

import (
	"context"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// malformation is one malformed workbook: the parts changed from a valid
// fuel log, and what Annotate must do with it.
type malformation struct {
	name  string
	parts func(t testing.TB, p bookParts) bookParts
	want  string // "" when it is annotated; else the refusal's message holds it (the part it names)
}

const (
	partWB     = "xl/workbook.xml"
	partSheet  = "xl/worksheets/sheet1.xml"
	partSST    = "xl/sharedStrings.xml"
	partStyles = "xl/styles.xml"
	partCT     = "[Content_Types].xml"
)

func malformations() []malformation {
	sheetCell := `<c r="A2" t="s"><v>3</v></c>`
	return []malformation{
		{"styles missing", func(t testing.TB, p bookParts) bookParts { return p.with(partStyles, nil) }, "styles part (xl/styles.xml)"},
		{"styles empty", func(t testing.TB, p bookParts) bookParts { return p.with(partStyles, []byte{}) }, "styles part (xl/styles.xml) is malformed"},
		{"styles partial", func(t testing.TB, p bookParts) bookParts {
			return p.with(partStyles, p[partStyles][:len(p[partStyles])/2])
		}, "styles part (xl/styles.xml) is malformed"},
		{"styles garbage", func(t testing.TB, p bookParts) bookParts { return p.with(partStyles, []byte("\x00\x01garbage<<")) }, "styles part (xl/styles.xml) is malformed"},
		{"styles other root", func(t testing.TB, p bookParts) bookParts {
			return p.with(partStyles, []byte(`<?xml version="1.0"?><html><body/></html>`))
		}, "styles part (xl/styles.xml) is malformed"},
		{"sheet name with slash", func(t testing.TB, p bookParts) bookParts {
			return p.replace(t, partWB, `name="Log"`, `name="Fuel/Log"`)
		}, ""},
		{"sheet name with brackets", func(t testing.TB, p bookParts) bookParts {
			return p.replace(t, partWB, `name="Log"`, `name="[Log]:*?"`)
		}, ""},
		{"sheet name too long", func(t testing.TB, p bookParts) bookParts {
			return p.replace(t, partWB, `name="Log"`, `name="`+strings.Repeat("L", 300)+`"`)
		}, ""},
		{"sheet name empty", func(t testing.TB, p bookParts) bookParts { return p.replace(t, partWB, `name="Log"`, `name=""`) }, ""},
		{"sheet name apostrophe", func(t testing.TB, p bookParts) bookParts { return p.replace(t, partWB, `name="Log"`, `name="'Log'"`) }, ""},
		{"sheet name History", func(t testing.TB, p bookParts) bookParts { return p.replace(t, partWB, `name="Log"`, `name="History"`) }, ""},
		{"sheet name own", func(t testing.TB, p bookParts) bookParts {
			return p.replace(t, partWB, `name="Log"`, `name="Carbon columns 2"`)
		}, "annotated output"},
		{"sheet name invalid UTF-8", func(t testing.TB, p bookParts) bookParts {
			return p.replace(t, partWB, `name="Log"`, "name=\"L\xffg\"")
		}, "workbook part (xl/workbook.xml) is malformed"},
		{"sheet name NUL ref", func(t testing.TB, p bookParts) bookParts { return p.replace(t, partWB, `name="Log"`, `name="L&#0;g"`) }, "workbook part (xl/workbook.xml) is malformed"},
		{"duplicate sheet names", func(t testing.TB, p bookParts) bookParts {
			return p.replace(t, partWB, `</sheets>`, `<sheet name="Log" sheetId="2" r:id="rId1"></sheet></sheets>`)
		}, "both refer to the part xl/worksheets/sheet1.xml"},
		{"shared string invalid UTF-8", func(t testing.TB, p bookParts) bookParts {
			return p.replace(t, partSST, `<t>diesel</t>`, "<t>die\xff\xfesel</t>")
		}, "shared strings part (xl/sharedStrings.xml) is malformed"},
		{"shared string NUL ref", func(t testing.TB, p bookParts) bookParts {
			return p.replace(t, partSST, `<t>diesel</t>`, `<t>die&#0;sel</t>`)
		}, "shared strings part (xl/sharedStrings.xml) is malformed"},
		{"inline string NUL ref", func(t testing.TB, p bookParts) bookParts {
			return p.replace(t, partSheet, sheetCell, `<c r="A2" t="inlineStr"><is><t>diesel&#0;</t></is></c>`)
		}, ""},
		{"cell style out of range", func(t testing.TB, p bookParts) bookParts {
			return p.replace(t, partSheet, `<c r="B2">`, `<c r="B2" s="99999">`)
		}, ""},
		{"cell style negative", func(t testing.TB, p bookParts) bookParts {
			return p.replace(t, partSheet, `<c r="C1" t="s">`, `<c r="C1" s="-4" t="s">`)
		}, ""},
		{"xf ids out of range", func(t testing.TB, p bookParts) bookParts {
			return p.replace(t, partStyles, `<cellXfs count="1"><xf numFmtId="0" fontId="0" fillId="0" borderId="0" xfId="0"></xf></cellXfs>`,
				`<cellXfs count="2"><xf numFmtId="0" fontId="0" fillId="0" borderId="0" xfId="0"></xf><xf numFmtId="9999" fontId="77" fillId="88" borderId="99" xfId="55"></xf></cellXfs>`).
				replace(t, partSheet, `<c r="C1" t="s">`, `<c r="C1" s="1" t="s">`)
		}, ""},
		{"column width negative", func(t testing.TB, p bookParts) bookParts {
			return p.replace(t, partSheet, `<sheetData>`, `<cols><col min="0" max="0" width="-5" customWidth="1"/><col min="9" max="3" width="NaN"/><col min="1" max="99999" width="1e308"/></cols><sheetData>`)
		}, ""},
		{"column width text", func(t testing.TB, p bookParts) bookParts {
			return p.replace(t, partSheet, `<sheetData>`, `<cols><col min="a" max="b" width="wide"/></cols><sheetData>`)
		}, ""},
		{"content types garbage", func(t testing.TB, p bookParts) bookParts { return p.with(partCT, []byte("\xff\xfegarbage")) }, "content types part ([Content_Types].xml) is malformed"},
		{"content types missing", func(t testing.TB, p bookParts) bookParts { return p.with(partCT, nil) }, ""},
		{"content types empty", func(t testing.TB, p bookParts) bookParts { return p.with(partCT, []byte{}) }, "content types part ([Content_Types].xml) is malformed"},
		{"content types wrong", func(t testing.TB, p bookParts) bookParts {
			return p.replace(t, partCT, `spreadsheetml.worksheet+xml`, `spreadsheetml.chartsheet+xml`)
		}, ""},
		{"row number zero", func(t testing.TB, p bookParts) bookParts { return p.replace(t, partSheet, `<row r="3"`, `<row r="0"`) }, "xl/worksheets/sheet1.xml"},
		{"cell ref beyond the grid", func(t testing.TB, p bookParts) bookParts {
			return p.replace(t, partSheet, `<c r="B2">`, `<c r="XFZ2">`)
		}, "xl/worksheets/sheet1.xml"},
		{"merge beyond the grid", func(t testing.TB, p bookParts) bookParts {
			return p.replace(t, partSheet, `</sheetData>`, `</sheetData><mergeCells count="1"><mergeCell ref="D1:XFZ9999999"/></mergeCells>`)
		}, ""},
		{"merge garbage", func(t testing.TB, p bookParts) bookParts {
			return p.replace(t, partSheet, `</sheetData>`, `</sheetData><mergeCells count="2"><mergeCell ref="::"/><mergeCell ref="E5"/></mergeCells>`)
		}, ""},
		{"workbook rels garbage", func(t testing.TB, p bookParts) bookParts { return p.with("xl/_rels/workbook.xml.rels", []byte("<<<")) }, "xl/_rels/workbook.xml.rels"},
		{"sheet dimension garbage", func(t testing.TB, p bookParts) bookParts {
			return p.replace(t, partSheet, `<dimension ref="A1">`, `<dimension ref="ZZZZZZ0:-1">`)
		}, ""},
	}
}

// TestMalformedWorkbooks: each malformed workbook is either annotated,
// with an output that reads back, or refused by Scan, Inspect and Annotate
// with an input error naming the malformed part; never a panic, an internal
// or I/O error, or a stack in a message. Before the package check and the
// recovery, 13 of them failed: a panic in excelize (styles part missing or
// empty) or an excelize error reported as an I/O failure (5xx).
func TestMalformedWorkbooks(t *testing.T) {
	e := testEngine(t)
	base := logParts(t)
	dir := t.TempDir()
	for _, m := range malformations() {
		t.Run(m.name, func(t *testing.T) {
			path := m.parts(t, base).write(t, dir, strings.ReplaceAll(m.name, " ", "-")+".xlsx")
			err := annotateHostile(t, e, path, Options{})
			switch {
			case m.want == "" && err != nil:
				t.Fatalf("refused: %v; want it annotated", err)
			case m.want != "" && err == nil:
				t.Fatalf("annotated; want a refusal naming %q", m.want)
			case err != nil && !strings.Contains(err.Error(), m.want):
				t.Fatalf("refusal %q does not name %q", err, m.want)
			case err != nil:
				return
			}
			out := strings.TrimSuffix(path, ".xlsx") + ".out.xlsx"
			if _, err := Scan(context.Background(), e, out, Options{}); err != nil {
				t.Errorf("the output does not read back: %v", err)
			}
			f, err := excelize.OpenFile(out)
			if err != nil {
				t.Fatalf("excelize cannot open the output: %v", err)
			}
			f.Close()
		})
	}
}

// TestSheetsSharingAPart: a workbook part listing the same worksheet part
// under thousands of sheet names would have it read once per name (a small
// file, hours of work); two sheets never share a part in a valid
// workbook, so it is refused, naming both sheets and the part.
func TestSheetsSharingAPart(t *testing.T) {
	p := logParts(t)
	var b strings.Builder
	for i := 2; i < 3000; i++ {
		b.WriteString(`<sheet name="Copy ` + itoaT(i) + `" sheetId="` + itoaT(i) + `" r:id="rId1"></sheet>`)
	}
	path := p.replace(t, partWB, `</sheets>`, b.String()+`</sheets>`).write(t, t.TempDir(), "shared.xlsx")
	_, err := Scan(context.Background(), testEngine(t), path, Options{})
	checkRefusal(t, err, ErrCorrupt, `sheets "Log" and "Copy 2" both refer to the part xl/worksheets/sheet1.xml`)
	annotateHostile(t, testEngine(t), path, Options{})
}
