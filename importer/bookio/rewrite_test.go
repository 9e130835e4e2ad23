package bookio

import (
	"bytes"
	"encoding/xml"
	"errors"
	"io"
	"strings"
	"testing"
)

// rowList is a RowSource over a slice.
type rowList struct {
	rows []rowCells
	i    int
	buf  []NewCell
}

type rowCells struct {
	row   int
	cells []NewCell
}

func (l *rowList) Next() (int, []NewCell, bool) {
	if l.i >= len(l.rows) {
		return 0, nil, false
	}
	r := l.rows[l.i]
	l.i++
	l.buf = append(l.buf[:0], r.cells...) // reused, as a source may
	return r.row, l.buf, true
}

func num(col int, v float64) NewCell      { return NewCell{Col: col, Kind: NewNumber, Num: v} }
func str(col int, s string) NewCell       { return NewCell{Col: col, Kind: NewInline, Text: s} }
func styled(c NewCell, style int) NewCell { c.Style = style; return c }

const wsOpen = `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>` + "\n" +
	`<worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main" xmlns:r="http://schemas.openxmlformats.org/officeDocument/2006/relationships">`

func rewrite(t *testing.T, src string, e *SheetEdit) string {
	t.Helper()
	var out bytes.Buffer
	if err := RewriteSheet(&out, strings.NewReader(src), e); err != nil {
		t.Fatalf("RewriteSheet: %v", err)
	}
	wellFormed(t, out.Bytes())
	return out.String()
}

func wellFormed(t testing.TB, b []byte) {
	t.Helper()
	d := xml.NewDecoder(bytes.NewReader(b))
	for {
		_, err := d.Token()
		if err == io.EOF {
			return
		}
		if err != nil {
			t.Fatalf("output is not well-formed XML: %v\n%s", err, b)
		}
	}
}

func mustContain(t *testing.T, got string, wants ...string) {
	t.Helper()
	for _, w := range wants {
		if !strings.Contains(got, w) {
			t.Errorf("output lacks %s\n%s", w, got)
		}
	}
}

// TestRewriteNoEdit: with nothing to change, the sheet is copied byte for
// byte, declaration, comments and white space included.
func TestRewriteNoEdit(t *testing.T) {
	src := wsOpen + "\n  <!-- kept -->\n<dimension ref=\"A1:B2\"/><sheetViews><sheetView workbookViewId=\"0\"/></sheetViews>" +
		`<sheetData><row r="1" spans="1:2"><c r="A1" t="s"><v>0</v></c><c r="B1"><f t="shared" ref="B1:B2" si="0">A1*2</f><v>2</v></c></row>` +
		`<row r="2"><c r="B2"><f t="shared" si="0"/><v>4</v></c></row></sheetData><mergeCells count="1"><mergeCell ref="A1:B1"/></mergeCells>` +
		`<extLst><ext uri="{x}"><x14:y xmlns:x14="urn:x14">&amp;</x14:y></ext></extLst></worksheet>`
	if got := rewrite(t, src, &SheetEdit{}); got != src {
		t.Fatalf("changed:\n got %s\nwant %s", got, src)
	}
}

// TestRewriteAppend: cells are appended to the rows they belong to, rows
// the sheet lacks are created in order (between rows and after the last),
// the dimension is widened, the widths added, and everything else of the
// rows is as it was, formulas (shared and array) included.
func TestRewriteAppend(t *testing.T) {
	rows := []string{
		`<row r="1" spans="1:2"><c r="A1" t="s"><v>0</v></c><c r="B1"><f t="shared" ref="B1:B3" si="0">A1*2</f><v>2</v></c></row>`,
		`<row r="2" spans="1:2"><c r="B2"><f t="shared" si="0"/><v>4</v></c></row>`,
		`<row r="4"><c r="A4"><f t="array" ref="A4:A5">{1;2}</f><v>1</v></c></row>`,
	}
	src := wsOpen + `<dimension ref="A1:B4"/><sheetData>` + strings.Join(rows, "") + `</sheetData><pageMargins left="0.7"/></worksheet>`
	e := &SheetEdit{
		Rows: &rowList{rows: []rowCells{
			{1, []NewCell{str(4, "tCO2"), str(5, "source")}},
			{2, []NewCell{num(4, 0.5)}},
			{3, []NewCell{num(4, 1e-7), styled(str(5, "created"), 7)}},
			{4, []NewCell{num(4, 12345678.25)}},
			{6, []NewCell{{Col: 4, Kind: NewShared, SST: 3}}},
		}},
		Extent: Range{4, 1, 5, 6},
		Cols:   []ColWidth{{4, 4, 12}, {5, 5, 48}},
	}
	got := rewrite(t, src, e)
	mustContain(t, got,
		`<dimension ref="A1:E6"/>`,
		`<cols><col min="4" max="4" width="12" customWidth="1"/><col min="5" max="5" width="48" customWidth="1"/></cols><sheetData>`,
		`<row r="1" spans="1:5"><c r="A1" t="s"><v>0</v></c><c r="B1"><f t="shared" ref="B1:B3" si="0">A1*2</f><v>2</v></c>`+
			`<c r="D1" t="inlineStr"><is><t>tCO2</t></is></c><c r="E1" t="inlineStr"><is><t>source</t></is></c></row>`,
		`<row r="2" spans="1:4"><c r="B2"><f t="shared" si="0"/><v>4</v></c><c r="D2"><v>0.5</v></c></row>`,
		`<row r="3"><c r="D3"><v>1E-07</v></c><c r="E3" s="7" t="inlineStr"><is><t>created</t></is></c></row><row r="4">`,
		`<c r="A4"><f t="array" ref="A4:A5">{1;2}</f><v>1</v></c><c r="D4"><v>12345678.25</v></c></row>`,
		`<row r="6"><c r="D6" t="s"><v>3</v></c></row></sheetData><pageMargins left="0.7"/>`)
}

// TestRewriteImplicitRefs: rows and cells without r are numbered by their
// position; an original cell without r after an inserted one gets its r,
// and empty or self-closing rows take cells.
func TestRewriteImplicitRefs(t *testing.T) {
	src := wsOpen + `<sheetData><row><c><v>1</v></c><c><v>2</v></c></row>` +
		`<row><c r="A2"><v>1</v></c><c r="D2"><v>2</v></c><c><v>3</v></c></row>` +
		`<row r="3"></row><row r="4"/><row/></sheetData></worksheet>`
	e := &SheetEdit{Rows: &rowList{rows: []rowCells{
		{1, []NewCell{num(3, 10)}},
		{2, []NewCell{num(2, 20), num(6, 21)}},
		{3, []NewCell{num(1, 30)}},
		{4, []NewCell{num(2, 40)}},
		{5, []NewCell{num(1, 50)}},
	}}}
	got := rewrite(t, src, e)
	mustContain(t, got,
		`<row><c><v>1</v></c><c><v>2</v></c><c r="C1"><v>10</v></c></row>`,
		`<row><c r="A2"><v>1</v></c><c r="B2"><v>20</v></c><c r="D2"><v>2</v></c><c r="E2"><v>3</v></c><c r="F2"><v>21</v></c></row>`,
		`<row r="3"><c r="A3"><v>30</v></c></row>`,
		`<row r="4"><c r="B4"><v>40</v></c></row>`,
		`<row><c r="A5"><v>50</v></c></row></sheetData>`)
}

// TestRewriteCols: new widths go only where no existing range is, sorted
// among the existing ones, which stay as written.
func TestRewriteCols(t *testing.T) {
	src := wsOpen + `<cols>` + "\n" + `<col min="1" max="3" width="9" customWidth="1"/><col min="6" max="6" width="20" style="3"/>` +
		`<col min="9" max="1024" width="11"/></cols><sheetData/></worksheet>`
	e := &SheetEdit{Cols: []ColWidth{{2, 7, 12}, {8, 9, 48}}}
	got := rewrite(t, src, e)
	mustContain(t, got, `<cols>`+"\n"+`<col min="1" max="3" width="9" customWidth="1"/><col min="4" max="5" width="12" customWidth="1"/>`+
		`<col min="6" max="6" width="20" style="3"/><col min="7" max="7" width="12" customWidth="1"/><col min="8" max="8" width="48" customWidth="1"/>`+
		`<col min="9" max="1024" width="11"/></cols><sheetData/>`)
	// An empty sheet keeps its empty cell data when nothing is added.
	if got := rewrite(t, wsOpen+`<cols/><sheetData/></worksheet>`, &SheetEdit{}); got != wsOpen+`<cols/><sheetData/></worksheet>` {
		t.Errorf("empty sheet changed: %s", got)
	}
}

// TestRewriteEscapes: inline strings are escaped for XML; characters XML
// does not allow are written as Excel writes them (_xHHHH_), a literal
// _xHHHH_ is protected, bad UTF-8 becomes U+FFFD, and edge spaces are kept.
func TestRewriteEscapes(t *testing.T) {
	src := wsOpen + `<sheetData/></worksheet>`
	e := &SheetEdit{Rows: &rowList{rows: []rowCells{{1, []NewCell{
		str(1, `a<b & "c" > d`), str(2, "bell\x07 nul\x00"), str(3, "_x0041_ stays"), str(4, "bad \xff"), str(5, " padded "), str(6, "tab\tline\nend")}}}}}
	got := rewrite(t, src, e)
	mustContain(t, got, `<sheetData><row r="1">`,
		`<is><t>a&lt;b &amp; "c" &gt; d</t></is>`,
		`<is><t>bell_x0007_ nul_x0000_</t></is>`,
		`<is><t>_x005F_x0041_ stays</t></is>`,
		"<is><t>bad \uFFFD</t></is>",
		`<is><t xml:space="preserve"> padded </t></is>`,
		"<is><t>tab\tline\nend</t></is>", `</row></sheetData>`)
}

// TestRewriteOccupied: an appended cell where the sheet has a value,
// formula or inline string is refused, naming the cell; a cell with only a
// style is replaced, keeping its style.
func TestRewriteOccupied(t *testing.T) {
	for _, c := range []string{`<c r="C2"><v>1</v></c>`, `<c r="C2"><f>A1</f></c>`, `<c r="C2" t="inlineStr"><is><t>x</t></is></c>`, `<c><v>1</v></c><c><v>2</v></c><c/>`} {
		src := wsOpen + `<sheetData><row r="2">` + c + `</row></sheetData></worksheet>`
		var out bytes.Buffer
		err := RewriteSheet(&out, strings.NewReader(src), &SheetEdit{Rows: &rowList{rows: []rowCells{{2, []NewCell{num(3, 1)}}}}})
		if c == `<c><v>1</v></c><c><v>2</v></c><c/>` {
			if err != nil {
				t.Errorf("%s: %v", c, err)
			}
			mustContain(t, out.String(), `<c><v>2</v></c><c r="C2"><v>1</v></c></row>`)
			continue
		}
		if !errors.Is(err, ErrOccupied) || !strings.Contains(err.Error(), "cell C2") {
			t.Errorf("%s: err = %v, want C2 occupied", c, err)
		}
	}
	src := wsOpen + `<sheetData><row r="2"><c r="C2" s="5"/><c r="D2" s="6"></c></row></sheetData></worksheet>`
	got := rewrite(t, src, &SheetEdit{Rows: &rowList{rows: []rowCells{{2, []NewCell{num(3, 1), styled(num(4, 2), 9)}}}}})
	mustContain(t, got, `<row r="2"><c r="C2" s="5"><v>1</v></c><c r="D2" s="9"><v>2</v></c></row>`)
}

// TestRewriteMarks: a marked cell gets the style Restyle gives for its
// own; a marked cell the sheet lacks is created with it.
func TestRewriteMarks(t *testing.T) {
	src := wsOpen + `<sheetData><row r="1"><c r="A1" s="4" t="s"><v>0</v></c><c r="B1"><v>3</v></c></row><row r="3"><c r="A3"/></row></sheetData></worksheet>`
	restyle := func(old int, code uint8) int { return 100 + 10*old + int(code) }
	e := &SheetEdit{Marks: []Mark{{1, 1, 1}, {1, 2, 2}, {1, 3, 1}, {2, 2, 3}, {3, 1, 2}}, Restyle: restyle,
		Rows: &rowList{rows: []rowCells{{1, []NewCell{num(5, 1)}}}}}
	got := rewrite(t, src, e)
	mustContain(t, got, `<row r="1"><c r="A1" s="141" t="s"><v>0</v></c><c r="B1" s="102"><v>3</v></c><c r="C1" s="101"/><c r="E1"><v>1</v></c></row>`,
		`<row r="2"><c r="B2" s="103"/></row><row r="3"><c r="A3" s="102"/></row>`)
}

// TestRewritePrefixedAndLegacy: a sheet written with a prefix gets
// prefixed cells; the legacy drawing goes before the table parts, with the
// root's prefix for the relationships namespace.
func TestRewritePrefixedAndLegacy(t *testing.T) {
	src := `<x:worksheet xmlns:x="http://schemas.openxmlformats.org/spreadsheetml/2006/main" xmlns:rel="` + nsRel + `">` +
		`<x:sheetData><x:row r="1"><x:c r="A1"><x:v>1</x:v></x:c></x:row></x:sheetData><x:tableParts count="1"><x:tablePart rel:id="rId1"/></x:tableParts></x:worksheet>`
	e := &SheetEdit{Rows: &rowList{rows: []rowCells{{1, []NewCell{str(2, "s")}}}}, LegacyDrawing: "rId9", Cols: []ColWidth{{2, 2, 10}}}
	got := rewrite(t, src, e)
	mustContain(t, got, `<x:cols><x:col min="2" max="2" width="10" customWidth="1"/></x:cols><x:sheetData>`,
		`<x:c r="B1" t="inlineStr"><x:is><x:t>s</x:t></x:is></x:c></x:row>`,
		`</x:sheetData><x:legacyDrawing rel:id="rId9"/><x:tableParts`)
	// Without tableParts and without a prefix for the namespace, it goes
	// last and declares the namespace itself.
	got = rewrite(t, `<worksheet xmlns="urn:main"><sheetData/></worksheet>`, &SheetEdit{LegacyDrawing: "rId2"})
	mustContain(t, got, `<sheetData/><legacyDrawing xmlns:r="`+nsRel+`" r:id="rId2"/></worksheet>`)
	// A sheet that has one already is refused.
	var out bytes.Buffer
	if err := RewriteSheet(&out, strings.NewReader(`<worksheet><sheetData/><legacyDrawing r:id="rId1"/></worksheet>`), &SheetEdit{LegacyDrawing: "rId2"}); err == nil {
		t.Error("a second legacy drawing was accepted")
	}
}

// TestRewriteRefusals: corrupt sheets and bad edits are clean errors.
func TestRewriteRefusals(t *testing.T) {
	one := func() RowSource { return &rowList{rows: []rowCells{{2, []NewCell{num(3, 1)}}}} }
	for name, c := range map[string]struct {
		src string
		e   *SheetEdit
	}{
		"truncated":       {wsOpen + `<sheetData><row r="2"><c r="A2"><v>1</v>`, &SheetEdit{Rows: one()}},
		"rows backwards":  {wsOpen + `<sheetData><row r="3"/><row r="2"/></sheetData></worksheet>`, &SheetEdit{}},
		"cells backwards": {wsOpen + `<sheetData><row r="2"><c r="D2"/><c r="B2"/></row></sheetData></worksheet>`, &SheetEdit{Rows: one()}},
		"bad row number":  {wsOpen + `<sheetData><row r="x"/></sheetData></worksheet>`, &SheetEdit{}},
		"no sheetData":    {wsOpen + `</worksheet>`, &SheetEdit{Rows: one()}},
		"NaN":             {wsOpen + `<sheetData/></worksheet>`, &SheetEdit{Rows: &rowList{rows: []rowCells{{1, []NewCell{num(1, nan())}}}}}},
		"edit unsorted":   {wsOpen + `<sheetData/></worksheet>`, &SheetEdit{Rows: &rowList{rows: []rowCells{{2, []NewCell{num(1, 1)}}, {1, []NewCell{num(1, 1)}}}}}},
		"cols unsorted":   {wsOpen + `<sheetData/></worksheet>`, &SheetEdit{Rows: &rowList{rows: []rowCells{{2, []NewCell{num(2, 1), num(1, 1)}}}}}},
		"doctype":         {`<!DOCTYPE x><worksheet><sheetData/></worksheet>`, &SheetEdit{}},
	} {
		var out bytes.Buffer
		if err := RewriteSheet(&out, strings.NewReader(c.src), c.e); err == nil {
			t.Errorf("%s: no error\n%s", name, out.String())
		}
	}
}

func nan() float64 { var z float64; return z / z }

// TestRewriteStyleFrom: a new cell takes the style of a cell of its row
// when the workbook defines that style, else its own.
func TestRewriteStyleFrom(t *testing.T) {
	src := wsOpen + `<sheetData><row r="1"><c r="B1" s="5" t="s"><v>0</v></c></row><row r="2"><c r="B2" s="12"><v>1</v></c></row></sheetData></worksheet>`
	from := func(row int) []NewCell {
		return []NewCell{{Col: 3, Kind: NewInline, Text: "tCO2", Style: 9, StyleFrom: 2}, {Col: 4, Kind: NewInline, Text: "source", Style: 9, StyleFrom: 1}}
	}
	e := &SheetEdit{MaxStyle: 10, Rows: &rowList{rows: []rowCells{{1, from(1)}, {2, from(2)}, {3, from(3)}}}}
	got := rewrite(t, src, e)
	mustContain(t, got, `<c r="C1" s="5" t="inlineStr">`, `<c r="D1" s="9" t="inlineStr">`, // column A has no cell
		`<c r="C2" s="9" t="inlineStr">`, // style 12 is past the workbook's 10
		`<row r="3"><c r="C3" s="9" t="inlineStr">`)
}
