package importer

import (
	"archive/zip"
	"context"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

// sheetCells reads every cell of the first sheet of the workbook at path
// with the streaming reader, by reference.
func sheetCells(t testing.TB, path string) map[string]cell {
	t.Helper()
	zr, err := zip.OpenReader(path)
	must(t, err)
	defer zr.Close()
	b, err := openBook(&zr.Reader, 1<<30)
	must(t, err)
	rd, err := b.openSheet(b.sheets[0])
	must(t, err)
	defer rd.close()
	out := map[string]cell{}
	for {
		r, ok := rd.next()
		if !ok {
			break
		}
		for _, c := range r.cells {
			out[cellRef(c.col, r.num)] = c
		}
	}
	must(t, rd.err)
	return out
}

// minimalBook writes an .xlsx package with one sheet "Log" whose
// <sheetData> content is data.
func minimalBook(t testing.TB, path, data string) string {
	t.Helper()
	return zipWith(t, path, map[string][]byte{
		"[Content_Types].xml": []byte(`<Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types">` +
			`<Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/>` +
			`<Override PartName="/xl/workbook.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml"/>` +
			`<Override PartName="/xl/worksheets/sheet1.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml"/></Types>`),
		"_rels/.rels": []byte(`<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">` +
			`<Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/officeDocument" Target="xl/workbook.xml"/></Relationships>`),
		"xl/workbook.xml": []byte(`<workbook xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main" xmlns:r="http://schemas.openxmlformats.org/officeDocument/2006/relationships">` +
			`<sheets><sheet name="Log" sheetId="1" r:id="rId1"/></sheets></workbook>`),
		"xl/_rels/workbook.xml.rels": []byte(`<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">` +
			`<Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/worksheet" Target="worksheets/sheet1.xml"/></Relationships>`),
		"xl/worksheets/sheet1.xml": []byte(`<worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><sheetData>` + data + `</sheetData></worksheet>`),
	})
}

// TestFormulaWithoutResult: each way a file stores a formula without its
// result is read as such; a stored empty string is a result.
func TestFormulaWithoutResult(t *testing.T) {
	path := minimalBook(t, filepath.Join(t.TempDir(), "f.xlsx"), `<row r="1">`+
		`<c r="A1"><f>2*300</f><v></v></c>`+ // openpyxl
		`<c r="B1"><f>2*300</f><v/></c>`+
		`<c r="C1"><f>2*300</f></c>`+ // excelize, many generators
		`<c r="D1" t="b"><f>TRUE()</f><v></v></c>`+
		`<c r="E1" t="str"><f>""</f><v></v></c>`+ // Excel and LibreOffice: the result is ""
		`<c r="F1" t="str"><f>"x"</f></c>`+
		`<c r="G1" t="e"><f>1/0</f><v>#DIV/0!</v></c>`+
		`<c r="H1"><f>2*300</f><v>600</v></c>`+
		`<c r="I1"><v></v></c>`+ // no formula, no value
		`</row>`)
	cells := sheetCells(t, path)
	for _, c := range []struct {
		ref            string
		noCache, blank bool
		kind           cellKind
	}{
		{"A1", true, false, kEmpty}, {"B1", true, false, kEmpty}, {"C1", true, false, kEmpty},
		{"D1", true, false, kEmpty}, {"E1", false, true, kText}, {"F1", true, false, kEmpty},
		{"G1", false, false, kError}, {"H1", false, false, kNumber},
	} {
		got, ok := cells[c.ref]
		if !ok {
			t.Errorf("%s: not read", c.ref)
			continue
		}
		if got.noCache != c.noCache || got.isBlank() != c.blank || got.kind != c.kind || !got.formula {
			t.Errorf("%s: noCache %v blank %v kind %d formula %v; want %v %v %d true", c.ref, got.noCache, got.isBlank(), got.kind, got.formula, c.noCache, c.blank, c.kind)
		}
	}
	if c, ok := cells["I1"]; ok && !c.isBlank() {
		t.Errorf("I1 (empty <v>, no formula) is not blank: %+v", c)
	}
}

// openpyxlBook writes a fuel log with formulas and no stored results, as
// openpyxl saves them, and returns its path.
func openpyxlBook(t testing.TB, dir string, rows int) string {
	t.Helper()
	python := requireOpenpyxl(t)
	path := filepath.Join(dir, fmt.Sprintf("openpyxl-%d.xlsx", rows))
	script := `
import sys, openpyxl
wb = openpyxl.Workbook(); ws = wb.active; ws.title = "Log"
ws.append(["Fuel", "Quantity", "Unit", "Note"])
ws.append(["diesel", "=2*300", "L", '=IF(1>0,"checked","")'])
ws.append(["petrol", "=B2+100", "L", '=""'])
for i in range(4, int(sys.argv[2]) + 2):
    ws.append(["diesel", "=ROUND(%d*1.5,1)" % i, "L", "=B%d/2" % i])
wb.save(sys.argv[1])
`
	cmd := exec.Command(python, "-c", script, path, fmt.Sprint(rows))
	cmd.Env = noPythonEnv()
	if out, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("openpyxl: %v: %s", err, out)
	}
	return path
}

// TestOpenpyxlFormulas annotates a workbook saved by openpyxl: the formulas
// have no stored results, fluecell evaluates them, computes the rows and
// says at each cell that the value is its own.
func TestOpenpyxlFormulas(t *testing.T) {
	path := openpyxlBook(t, t.TempDir(), 3)
	cells := sheetCells(t, path)
	if c := cells["B2"]; !c.noCache || !c.formula {
		t.Fatalf("B2 of the openpyxl file is not read as a formula without a result: %+v", c)
	}
	rep, err := Annotate(context.Background(), testEngine(t), path, filepath.Join(t.TempDir(), "out.xlsx"), Options{})
	if err != nil {
		t.Fatal(err)
	}
	if rep.Rows != 3 || rep.Computed != 3 {
		t.Errorf("rows %d computed %d, want 3 and 3; findings %+v", rep.Rows, rep.Computed, rep.Warnings)
	}
	found := false
	for _, w := range rep.Warnings {
		if w.Cell == "B2" && w.Code == CodeFormulaNoCache && strings.Contains(w.Message, `evaluated it to "600"`) {
			found = true
		}
		if w.Code == CodeFormulaNoCache && w.Severity == SevError {
			t.Errorf("a formula was not evaluated: %+v", w)
		}
	}
	if !found {
		t.Errorf("no formula-no-cache warning at B2 with the value 600: %+v", rep.Warnings)
	}
}

// TestFormulaEvalBoth evaluates the same cells with excelize and with
// LibreOffice's recalculated copy: they agree.
func TestFormulaEvalBoth(t *testing.T) {
	path := openpyxlBook(t, t.TempDir(), 5)
	requireOffice(t)
	t.Setenv("TMPDIR", t.TempDir())
	lim := (&Options{}).limits()
	ex := newFormulaEval(context.Background(), path, lim)
	defer ex.close()
	ex.office = func() (office, bool) { return office{}, false } // excelize only
	lo := newFormulaEval(context.Background(), path, lim)
	lo.exMax = 0 // every sheet is "large": LibreOffice only
	want := map[string]string{"B2": "600", "B3": "700", "D2": "checked", "D3": "", "B5": "7.5", "D5": "3.75"}
	for ref, w := range want {
		for name, fe := range map[string]*formulaEval{"excelize": ex, "LibreOffice": lo} {
			if got, ok := fe.calc("Log", ref); !ok || got != w {
				t.Errorf("%s: %s = %q, %v; want %q", name, ref, got, ok, w)
			}
		}
	}
	if lo.ex != nil {
		t.Error("excelize was opened for a sheet over the bound")
	}
	if lo.lo == nil {
		t.Fatal("LibreOffice's copy was not made")
	}
	dir := lo.lo.conv.dir
	lo.close()
	if _, err := os.Stat(dir); !os.IsNotExist(err) {
		t.Errorf("the recalculated copy %s was not removed", dir)
	}
}

// TestFormulaEvalNoOffice: without LibreOffice a large sheet's formulas are
// simply not evaluated (the caller reports each one).
func TestFormulaEvalNoOffice(t *testing.T) {
	path := minimalBook(t, filepath.Join(t.TempDir(), "f.xlsx"), `<row r="1"><c r="A1"><f>2*300</f><v></v></c></row>`)
	fe := newFormulaEval(context.Background(), path, (&Options{}).limits())
	defer fe.close()
	fe.office = func() (office, bool) { return office{}, false }
	if v, ok := fe.calc("Log", "A1"); !ok || v != "600" {
		t.Errorf("small sheet: %q %v, want 600", v, ok)
	}
	fe2 := newFormulaEval(context.Background(), path, (&Options{}).limits())
	defer fe2.close()
	fe2.office, fe2.exMax = fe.office, 0
	if v, ok := fe2.calc("Log", "A1"); ok {
		t.Errorf("large sheet without LibreOffice gave %q", v)
	}
	if v, ok := fe.calc("Nope", "A1"); ok {
		t.Errorf("unknown sheet gave %q", v)
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	fe3 := newFormulaEval(ctx, path, (&Options{}).limits())
	defer fe3.close()
	if _, ok := fe3.calc("Log", "A1"); ok {
		t.Error("a cancelled evaluator gave a value")
	}
}

// TestFormulaEvalCost measures both evaluators on openpyxl files
// (FLUECELL_PERF=1): the figures behind the size bound in formulaeval.go.
func TestFormulaEvalCost(t *testing.T) {
	if os.Getenv("FLUECELL_PERF") != "1" {
		t.Skip("set FLUECELL_PERF=1 to measure")
	}
	requireOffice(t)
	dir := t.TempDir()
	for _, n := range []int{1000, 20000} {
		path := openpyxlBook(t, dir, n)
		for _, name := range []string{"excelize", "LibreOffice"} {
			fe := newFormulaEval(context.Background(), path, (&Options{}).limits())
			if name == "LibreOffice" {
				fe.exMax = 0
			}
			start := time.Now()
			for r := 4; r < n+2; r++ {
				if _, ok := fe.calc("Log", fmt.Sprintf("D%d", r)); !ok {
					t.Fatalf("%s: D%d not evaluated", name, r)
				}
			}
			d := time.Since(start)
			fe.close()
			t.Logf("%d rows, %s: %v (%.1f µs a cell)", n, name, d.Round(time.Millisecond), float64(d.Microseconds())/float64(n-2))
		}
	}
}
