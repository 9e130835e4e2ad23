package importer

import (
	"archive/zip"
	"bytes"
	"context"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// smallLog is a valid three-row fuel log.
func smallLog(t testing.TB, path string) string {
	t.Helper()
	f := newBook(t, "Log")
	setRows(t, f, "Log", 1, [][]any{{"Fuel", "Quantity", "Unit"}, {"diesel", 1000, "L"}, {"natural_gas", 50, "MWh"}})
	return save(t, f, path)
}

func copyFile(t testing.TB, from, to string) string {
	t.Helper()
	b, err := os.ReadFile(from)
	must(t, err)
	must(t, os.WriteFile(to, b, 0o644))
	return to
}

// zipWith writes a zip whose parts are the given names and contents.
func zipWith(t testing.TB, path string, parts map[string][]byte) string {
	t.Helper()
	var buf bytes.Buffer
	zw := zip.NewWriter(&buf)
	for name, data := range parts {
		w, err := zw.Create(name)
		must(t, err)
		_, err = w.Write(data)
		must(t, err)
	}
	must(t, zw.Close())
	must(t, os.WriteFile(path, buf.Bytes(), 0o644))
	return path
}

// TestRefusals checks that inputs fluecell cannot read are refused with an
// *Error of the right code and a message saying what to do, without a
// panic and without writing an output.
func TestRefusals(t *testing.T) {
	dir := t.TempDir()
	good := smallLog(t, filepath.Join(dir, "good.xlsx"))
	goodBytes, err := os.ReadFile(good)
	must(t, err)

	encrypted := filepath.Join(dir, "locked.xlsx")
	f := newBook(t, "Log")
	setRows(t, f, "Log", 1, [][]any{{"Fuel", "Quantity", "Unit"}, {"diesel", 1000, "L"}})
	must(t, f.SaveAs(encrypted, excelize.Options{Password: "s3cret"}))

	truncated := filepath.Join(dir, "truncated.xlsx")
	must(t, os.WriteFile(truncated, goodBytes[:len(goodBytes)/2], 0o644))

	// Damage the deflate stream of the sheet part: the CRC or the inflater
	// catches it.
	damaged := filepath.Join(dir, "damaged.xlsx")
	bad := append([]byte(nil), goodBytes...)
	if i := bytes.Index(bad, []byte("xl/worksheets/sheet1.xml")); i > 0 {
		for j := i + 40; j < i+140 && j < len(bad); j++ {
			bad[j] ^= 0x5a
		}
	}
	must(t, os.WriteFile(damaged, bad, 0o644))

	// 64 MB of zeros packs into about 64 kB: far beyond any real workbook.
	bomb := zipWith(t, filepath.Join(dir, "bomb.xlsx"), map[string][]byte{
		"[Content_Types].xml":      []byte("<Types/>"),
		"xl/workbook.xml":          []byte("<workbook/>"),
		"xl/worksheets/sheet1.xml": make([]byte, 64<<20),
	})
	notWorkbook := zipWith(t, filepath.Join(dir, "photos.xlsx"), map[string][]byte{"a.txt": []byte("hello")})
	empty := filepath.Join(dir, "empty.xlsx")
	must(t, os.WriteFile(empty, nil, 0o644))
	text := filepath.Join(dir, "notes.xlsx")
	must(t, os.WriteFile(text, []byte("this is not a workbook\n"), 0o644))
	xlsb := copyFile(t, good, filepath.Join(dir, "book.xlsb"))
	pdf := filepath.Join(dir, "invoice.pdf")
	must(t, os.WriteFile(pdf, []byte("%PDF-1.4"), 0o644))
	badXML := zipWith(t, filepath.Join(dir, "badxml.xlsx"), map[string][]byte{
		"[Content_Types].xml":        []byte("<Types/>"),
		"xl/workbook.xml":            []byte(`<workbook><sheets><sheet name="Log" sheetId="1" r:id="rId1"/></sheets></workbook>`),
		"xl/_rels/workbook.xml.rels": []byte(`<Relationships><Relationship Id="rId1" Type="x/worksheet" Target="worksheets/sheet1.xml"/></Relationships>`),
		"xl/worksheets/sheet1.xml":   []byte(`<worksheet><sheetData><row r="1"><c r="A1" t="s"><v>7</v></c></row></sheetData></worksheet>`),
	})

	cases := []struct {
		name, path, code, msg string
		opt                   Options
	}{
		{"encrypted", encrypted, ErrEncrypted, "password-protected", Options{}},
		{"truncated zip", truncated, ErrCorrupt, "damaged or truncated zip", Options{}},
		{"damaged part", damaged, ErrCorrupt, "corrupt", Options{}},
		{"zip bomb (ratio)", bomb, ErrTooLarge, "zip-bomb", Options{}},
		{"zip bomb (size limit)", good, ErrTooLarge, "zip-bomb", Options{MaxUnzippedBytes: 1000}},
		{"zip without workbook", notWorkbook, ErrCorrupt, "not an Excel workbook", Options{}},
		{"empty file", empty, ErrCorrupt, "empty (0 bytes)", Options{}},
		{"text named xlsx", text, ErrCorrupt, "not a zip", Options{}},
		{"binary workbook", xlsb, ErrFormat, ".xlsb", Options{}},
		{"other file", pdf, ErrFormat, "fluecell reads .xlsx, .xlsm, .xls and .csv", Options{}},
		{"bad shared string", badXML, ErrCorrupt, "shared string", Options{}},
		{"missing file", filepath.Join(dir, "nope.xlsx"), ErrIO, "cannot open", Options{}},
		{"unknown sheet", good, ErrInput, `no sheet "Fuel": the sheets are "Log"`, Options{Sheet: "Fuel"}},
		{"bad rule", good, ErrRule, "write COLUMN = EXPR", Options{Rules: []string{"fuel_co2(fuel, quantity, unit)"}}},
		{"rule with unknown function", good, ErrRule, "unknown function", Options{Rules: []string{"x = fuel_c02(fuel, quantity, unit)"}}},
		{"rule variables not in any table", good, ErrNoTable, "qty", Options{Rules: []string{"tCO2 = fuel_co2(fuel, qty, unit)"}}},
		{"unknown pack", good, ErrInput, "unknown pack", Options{Pack: "ipcc2019"}},
	}
	e := testEngine(t)
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := Scan(context.Background(), e, c.path, c.opt)
			checkRefusal(t, err, c.code, c.msg)
			out := filepath.Join(dir, "out-"+strings.ReplaceAll(c.name, " ", "-")+filepath.Ext(c.path))
			_, err = Annotate(context.Background(), e, c.path, out, c.opt)
			if c.code != ErrIO {
				checkRefusal(t, err, c.code, c.msg)
			}
			if _, serr := os.Stat(out); serr == nil {
				t.Errorf("an output was written despite: %v", err)
			}
		})
	}
	assertNoTemp(t, dir)
}

func checkRefusal(t *testing.T, err error, code, msg string) {
	t.Helper()
	var ie *Error
	if !errors.As(err, &ie) {
		t.Fatalf("error %v (%T), want an *importer.Error", err, err)
	}
	if ie.Code != code || !strings.Contains(err.Error(), msg) {
		t.Fatalf("error [%s] %v\nwant [%s] containing %q", ie.Code, err, code, msg)
	}
	if strings.Contains(err.Error(), "goroutine ") {
		t.Fatalf("the message holds a stack trace: %v", err)
	}
}

// assertNoTemp fails when a temporary output file was left in dir.
func assertNoTemp(t *testing.T, dir string) {
	t.Helper()
	entries, err := os.ReadDir(dir)
	must(t, err)
	for _, e := range entries {
		if strings.HasSuffix(e.Name(), ".tmp") {
			t.Errorf("temporary file %s left behind", e.Name())
		}
	}
}

// TestNoTable: a workbook without a table is reported, not refused: the
// sheet is listed as skipped with what fluecell looks for.
func TestNoTable(t *testing.T) {
	f := newBook(t, "Notes")
	setRows(t, f, "Notes", 1, [][]any{{"Minutes of the site meeting"}, {"Agenda", "Owner"}, {"Budget", "Finance"}})
	path := save(t, f, filepath.Join(t.TempDir(), "notes.xlsx"))
	res, err := Scan(context.Background(), testEngine(t), path, Options{})
	must(t, err)
	got := res.Report.Sheets
	if len(got) != 1 || got[0].Name != "Notes" || got[0].Status != StatusSkipped || !strings.Contains(got[0].Reason, "Fuel | Quantity | Unit") {
		t.Fatalf("sheets = %+v, want Notes skipped with what fluecell looks for", got)
	}
	if res.Report.Computed != 0 || len(res.Report.Tables) != 0 {
		t.Errorf("computed %d rows in %d tables, want none", res.Report.Computed, len(res.Report.Tables))
	}
}
