package importer

import (
	"archive/zip"
	"bytes"
	"context"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// inlineOnlyBook is a fuel log whose texts are all inline strings: the
// package has no shared strings part, no relationship to one and no
// content type for one (only a minimal styles part beside the sheet).
func inlineOnlyBook(t *testing.T, dir string) string {
	t.Helper()
	is := func(ref, s string) string { return `<c r="` + ref + `" t="inlineStr"><is><t>` + s + `</t></is></c>` }
	var sheet strings.Builder
	sheet.WriteString(`<?xml version="1.0" encoding="UTF-8"?><worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><sheetData>`)
	sheet.WriteString(`<row r="1">` + is("A1", "Fuel") + is("B1", "Quantity") + is("C1", "Unit") + `</row>`)
	for r := 2; r <= 9; r++ {
		fuel, qty := "gas_diesel_oil", 1000+10*r
		if r%3 == 0 {
			fuel = "motor_gasoline"
		}
		n := strconv.Itoa(r)
		fmt.Fprintf(&sheet, `<row r="%d">%s<c r="B%d"><v>%d</v></c>%s</row>`, r, is("A"+n, fuel), r, qty, is("C"+n, "L"))
	}
	sheet.WriteString(`</sheetData></worksheet>`)
	parts := []struct{ name, data string }{
		{"[Content_Types].xml", `<?xml version="1.0" encoding="UTF-8"?><Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types"><Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/><Default Extension="xml" ContentType="application/xml"/><Override PartName="/xl/workbook.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml"/><Override PartName="/xl/worksheets/sheet1.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml"/><Override PartName="/xl/styles.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.styles+xml"/></Types>`},
		{"_rels/.rels", `<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships"><Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/officeDocument" Target="xl/workbook.xml"/></Relationships>`},
		{"xl/workbook.xml", `<?xml version="1.0" encoding="UTF-8"?><workbook xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main" xmlns:r="http://schemas.openxmlformats.org/officeDocument/2006/relationships"><sheets><sheet name="Fuel log" sheetId="1" r:id="rId1"/></sheets></workbook>`},
		{"xl/_rels/workbook.xml.rels", `<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships"><Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/worksheet" Target="worksheets/sheet1.xml"/><Relationship Id="rId2" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/styles" Target="styles.xml"/></Relationships>`},
		{"xl/styles.xml", `<?xml version="1.0" encoding="UTF-8"?><styleSheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><fonts count="1"><font><sz val="11"/><name val="Calibri"/></font></fonts><fills count="2"><fill><patternFill patternType="none"/></fill><fill><patternFill patternType="gray125"/></fill></fills><borders count="1"><border><left/><right/><top/><bottom/><diagonal/></border></borders><cellStyleXfs count="1"><xf numFmtId="0" fontId="0" fillId="0" borderId="0"/></cellStyleXfs><cellXfs count="1"><xf numFmtId="0" fontId="0" fillId="0" borderId="0" xfId="0"/></cellXfs><cellStyles count="1"><cellStyle name="Normal" xfId="0" builtinId="0"/></cellStyles></styleSheet>`},
		{"xl/worksheets/sheet1.xml", sheet.String()},
	}
	var buf bytes.Buffer
	zw := zip.NewWriter(&buf)
	for _, p := range parts {
		w, err := zw.Create(p.name)
		must(t, err)
		_, err = w.Write([]byte(p.data))
		must(t, err)
	}
	must(t, zw.Close())
	path := filepath.Join(dir, "inline-only.xlsx")
	must(t, os.WriteFile(path, buf.Bytes(), 0o644))
	return path
}

// TestSourcesShared annotates in place a workbook with shared strings and
// one without, and checks the source column: each of its data cells is a
// shared-string cell (t="s"); the workbook's own strings are the first
// ones of the output, unchanged, with count and uniqueCount matching; and
// the texts that excelize and openpyxl read back are those the side-sheet
// layout writes for the same rows (there as fluecell's own sheet, spliced
// in as inline strings).
func TestSourcesShared(t *testing.T) {
	dir := t.TempDir()
	e := testEngine(t)
	books := map[string]string{"with-sst": writeNotesBook(t, dir), "without-sst": inlineOnlyBook(t, dir)}
	for name, in := range books {
		t.Run(name, func(t *testing.T) {
			out := filepath.Join(dir, name+".inline.xlsx")
			rep, err := Annotate(context.Background(), e, in, out, Options{})
			must(t, err)
			side := filepath.Join(dir, name+".side.xlsx")
			srep, err := Annotate(context.Background(), e, in, side, Options{InlineMaxCells: -1})
			must(t, err)
			if rep.Layout != LayoutInline || srep.Layout != LayoutSideSheet {
				t.Fatalf("layouts %s and %s", rep.Layout, srep.Layout)
			}
			sheet, cells, _ := strings.Cut(rep.Tables[0].Output, "!")
			rr, ok := parseRange(cells)
			if !ok {
				t.Fatalf("output %q", rep.Tables[0].Output)
			}
			ssheet, scells, _ := strings.Cut(srep.Tables[0].Output, "!")
			sr, _ := parseRange(scells)
			sf, err := excelize.OpenFile(side)
			must(t, err)
			defer sf.Close()
			want := map[int]string{}
			for r := rr.r1 + 1; r <= rr.r2; r++ {
				v, err := sf.GetCellValue(ssheet, cellRef(sr.c2, r))
				must(t, err)
				if v != "" {
					want[r] = v
				}
			}
			if len(want) < 2 {
				t.Fatalf("the side sheet has %d source texts: %v", len(want), want)
			}

			parts := partsOf(t, out)
			inParts := partsOf(t, in)
			sst, ok := parts["xl/sharedStrings.xml"]
			if !ok {
				t.Fatal("the output has no xl/sharedStrings.xml")
			}
			checkSSTHeader(t, string(inParts["xl/sharedStrings.xml"]), string(sst), len(want))
			if name == "without-sst" {
				if !strings.Contains(string(parts["[Content_Types].xml"]), `PartName="/xl/sharedStrings.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.sharedStrings+xml"`) {
					t.Errorf("no content type for the shared strings: %s", parts["[Content_Types].xml"])
				}
				if !strings.Contains(string(parts["xl/_rels/workbook.xml.rels"]), `relationships/sharedStrings" Target="sharedStrings.xml"`) {
					t.Errorf("no workbook relationship to the shared strings: %s", parts["xl/_rels/workbook.xml.rels"])
				}
			}
			sheetXML := string(parts["xl/worksheets/sheet1.xml"])
			for r := range want {
				ref := cellRef(rr.c2, r)
				if !regexp.MustCompile(`<c r="` + ref + `"[^>]* t="s"><v>\d+</v></c>`).MatchString(sheetXML) {
					t.Errorf("%s is not a shared-string cell", ref)
				}
			}

			f, err := excelize.OpenFile(out)
			must(t, err)
			defer f.Close()
			py := requireOpenpyxl(t)
			script := `import sys, openpyxl
ws = openpyxl.load_workbook(sys.argv[1])[sys.argv[2]]
for r in range(int(sys.argv[4]), int(sys.argv[5]) + 1):
    v = ws.cell(row=r, column=int(sys.argv[3])).value
    if v is not None:
        print(r, v)
`
			cmd := exec.Command(py, "-c", script, out, sheet, strconv.Itoa(rr.c2), strconv.Itoa(rr.r1+1), strconv.Itoa(rr.r2))
			cmd.Env = noPythonEnv()
			got, err := cmd.CombinedOutput()
			if err != nil {
				t.Fatalf("openpyxl: %v: %s", err, got)
			}
			var wantPy strings.Builder
			for r := rr.r1 + 1; r <= rr.r2; r++ {
				if w, ok := want[r]; ok {
					fmt.Fprintf(&wantPy, "%d %s\n", r, w)
				}
				if v, err := f.GetCellValue(sheet, cellRef(rr.c2, r)); err != nil || v != want[r] {
					t.Errorf("excelize reads %s as %q (%v), want %q", cellRef(rr.c2, r), v, err, want[r])
				}
			}
			if string(got) != wantPy.String() {
				t.Errorf("openpyxl reads\n%s\nwant\n%s", got, wantPy.String())
			}
		})
	}
}

// checkSSTHeader checks that the shared strings of in (none when "") are
// the first ones of out, unchanged, and that out's count and uniqueCount
// attributes hold: uniqueCount the number of strings, count grown by
// refs when in has one.
func checkSSTHeader(t *testing.T, in, out string, refs int) {
	t.Helper()
	si := regexp.MustCompile(`(?s)<si>.*?</si>|<si/>`)
	sa, sb := si.FindAllString(in, -1), si.FindAllString(out, -1)
	if len(sb) <= len(sa) {
		t.Fatalf("%d shared strings in the output, %d in the input", len(sb), len(sa))
	}
	for i := range sa {
		if sa[i] != sb[i] {
			t.Errorf("shared string %d is %q, was %q", i, sb[i], sa[i])
		}
	}
	attr := func(s, name string) (int, bool) {
		m := regexp.MustCompile(`<sst\b[^>]*\s` + name + `="(\d+)"`).FindStringSubmatch(s)
		if m == nil {
			return 0, false
		}
		n, _ := strconv.Atoi(m[1])
		return n, true
	}
	if u, ok := attr(out, "uniqueCount"); ok && u != len(sb) {
		t.Errorf("uniqueCount %d, %d strings", u, len(sb))
	}
	cin, okIn := attr(in, "count")
	if cout, ok := attr(out, "count"); in == "" || okIn {
		if !ok || cout != cin+refs {
			t.Errorf("count %d (present %v), want %d + %d", cout, ok, cin, refs)
		}
	}
}
