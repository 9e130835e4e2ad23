package bookio

import (
	"archive/zip"
	"bytes"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// testEdit appends a number and a text to rows 1 to rows and marks a
// cell of row 2, as the importer's annotation does.
func testEdit(rows int) *SheetEdit {
	var rs []rowCells
	for r := 1; r <= rows; r++ {
		rs = append(rs, rowCells{r, []NewCell{num(30, float64(r)/4), str(31, "fuel & oil")}})
	}
	return &SheetEdit{
		Rows:    &rowList{rows: rs},
		Marks:   []Mark{{2, 1, 1}},
		Restyle: func(int, uint8) int { return 7 },
		Extent:  Range{1, 1, 31, max(rows, 2)},
		Cols:    []ColWidth{{30, 31, 12}},
	}
}

// rewriteBothWays rewrites src with cells copied in one piece and token
// by token, and fails unless the outputs and errors are the same.
func rewriteBothWays(t *testing.T, src []byte, rows int) []byte {
	t.Helper()
	var quick, general bytes.Buffer
	qerr := rewriteSheet(&quick, bytes.NewReader(src), testEdit(rows), false)
	gerr := rewriteSheet(&general, bytes.NewReader(src), testEdit(rows), true)
	if fmt.Sprint(qerr) != fmt.Sprint(gerr) || !bytes.Equal(quick.Bytes(), general.Bytes()) {
		t.Fatalf("the two ways differ: errors %v, %v\nquick   %.400s\ngeneral %.400s", qerr, gerr, quick.Bytes(), general.Bytes())
	}
	return quick.Bytes()
}

// TestRewriteQuickCells: cells of the usual shapes and of others, copied
// the same both ways, and the generated benchmark sheet.
func TestRewriteQuickCells(t *testing.T) {
	rows := `<row r="1"><c r="A1" s="3" t="s"><v>2</v></c><c r="B1"><v>1.5</v></c><c r="C1" s="2"><f>B1*2</f><v>3</v></c>` +
		`<c r="D1" t="inlineStr"><is><t>kg</t></is></c><c r="E1" t="inlineStr"><is><t xml:space="preserve"> a &amp; b </t></is></c><c r="F1"><f>1+1</f></c></row>` +
		`<row r="2"><c r="A2" t="s"><v>0</v></c><c r="B2"><v><![CDATA[7]]></v></c><c r="C2"><f t="shared" si="0" ref="C2:C3">B2</f><v>7</v></c>` +
		`<c r="D2" t="inlineStr"><is><r><t>Nat</t></r><r><t>ural gas</t></r></is></c><c r="E2"><!-- note --><v>4</v></c></row>` +
		"<row r=\"3\"><c r=\"A3\">\n<v>1</v>\n</c><c r=\"B3\"><v>2</v></c ><c r=\"C3\"/><c><v>9</v></c></row>"
	out := rewriteBothWays(t, sheetOf(rows), 3)
	wellFormed(t, out)
	mustContain(t, string(out), `<c r="D1" t="inlineStr"><is><t>kg</t></is></c>`, `<c r="AD1"><v>0.25</v></c>`, `<c r="AE3" t="inlineStr"><is><t>fuel &amp; oil</t></is></c>`)
	rewriteBothWays(t, benchSheetXML(2000), 2000)
}

// TestRewriteQuickCellsRealWorkbooks rewrites every sheet of the real
// workbooks in testdata/realworld (and FLUECELL_DEVSET's, when set) both
// ways.
func TestRewriteQuickCellsRealWorkbooks(t *testing.T) {
	dirs := []string{filepath.Join("..", "..", "testdata", "realworld")}
	if d := os.Getenv("FLUECELL_DEVSET"); d != "" {
		dirs = append(dirs, d)
	}
	for _, dir := range dirs {
		files, _ := filepath.Glob(filepath.Join(dir, "*.xls[xm]"))
		for _, path := range files {
			zr, err := zip.OpenReader(path)
			if err != nil {
				t.Fatal(err)
			}
			for _, f := range zr.File {
				if !strings.HasPrefix(f.Name, "xl/worksheets/") || !strings.HasSuffix(f.Name, ".xml") {
					continue
				}
				rc, err := f.Open()
				if err != nil {
					t.Fatal(err)
				}
				src, err := io.ReadAll(rc)
				rc.Close()
				if err != nil {
					t.Fatal(err)
				}
				t.Run(filepath.Base(path)+"/"+f.Name, func(t *testing.T) { rewriteBothWays(t, src, 3) })
			}
			zr.Close()
		}
	}
}

// FuzzRewriteQuickCells: whatever the sheet holds, both ways write the
// same bytes and give the same error.
func FuzzRewriteQuickCells(f *testing.F) {
	for _, s := range []string{
		`<row r="1"><c r="A1" s="3" t="s"><v>1</v></c><c r="B1"><v>1.5</v></c><c r="C1"><f>B1</f><v>3</v></c></row>`,
		`<row><c t="inlineStr"><is><t>kg</t></is></c><c t="inlineStr"><is><t xml:space="preserve"> a&amp;b </t></is></c></row>`,
		`<row r="2"><c r="A2"><f>1</f></c><c r="B2" t="str"><f>x</f><v></v></c></row><row r="3"><c r="AD3"><v>1</v></c></row>`,
	} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, rows string) {
		if len(rows) > 1<<14 {
			return
		}
		rewriteBothWays(t, sheetOf(rows), 3)
	})
}
