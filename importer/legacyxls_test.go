package importer

import (
	"bytes"
	"context"
	"crypto/sha256"
	"encoding/binary"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"
)

const legacyFixture = "testdata/legacy-fuel-log.xls"

func fileSum(t testing.TB, path string) [32]byte {
	t.Helper()
	b, err := os.ReadFile(path)
	must(t, err)
	return sha256.Sum256(b)
}

// TestLegacyXLSAnnotate converts the .xls fixture with LibreOffice, finds
// its table, writes an .xlsx copy and leaves the input and no temporary
// folder behind.
func TestLegacyXLSAnnotate(t *testing.T) {
	requireOffice(t)
	t.Setenv("TMPDIR", t.TempDir())
	before := fileSum(t, legacyFixture)
	out := filepath.Join(t.TempDir(), "log.carbon.xlsx")
	rep, err := Annotate(context.Background(), testEngine(t), legacyFixture, out, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if rep.Rows == 0 || rep.Computed != rep.Rows || rep.Totals.TCO2 <= 0 {
		t.Errorf("rows %d, computed %d, tCO2 %v: want every row computed", rep.Rows, rep.Computed, rep.Totals.TCO2)
	}
	f, err := excelize.OpenFile(out)
	if err != nil {
		t.Fatalf("the output is not an .xlsx workbook: %v", err)
	}
	defer f.Close()
	names := strings.Join(f.GetSheetList(), "|")
	for _, want := range []string{"Fuel log", SheetSummary, SheetWarnings, SheetSources} {
		if !strings.Contains(names, want) {
			t.Errorf("output sheets %s lack %q", names, want)
		}
	}
	if v, _ := f.GetCellValue("Fuel log", "A1"); v != "Fuel" {
		t.Errorf("Fuel log!A1 = %q, want the original header Fuel", v)
	}
	if fileSum(t, legacyFixture) != before {
		t.Error("the input .xls changed")
	}
	assertNoOfficeDirs(t)
}

// TestLegacyXLSScanFormat checks what a scan of an .xls reports: the
// original path and Format "xls".
func TestLegacyXLSScanFormat(t *testing.T) {
	requireOffice(t)
	res, err := scanAnyFormat(context.Background(), testEngine(t), legacyFixture, Options{}, nil)
	if err != nil {
		t.Fatal(err)
	}
	if res.Format != "xls" || res.Path != legacyFixture {
		t.Errorf("Format %q Path %q, want xls and %s", res.Format, res.Path, legacyFixture)
	}
	// An error of the copy names the original file, never the temporary one.
	_, err = scanAnyFormat(context.Background(), testEngine(t), legacyFixture, Options{Sheet: "Nope"}, nil)
	checkRefusal(t, err, ErrInput, `no sheet "Nope"`)
	if !strings.HasPrefix(err.Error(), legacyFixture+":") || strings.Contains(err.Error(), "fluecell-office-") {
		t.Errorf("error %q does not name the input alone", err)
	}
}

// TestLegacyXLSOutputName: the default output is .carbon.xlsx, and an .xls
// output is refused with the name to use.
func TestLegacyXLSOutputName(t *testing.T) {
	if got := DefaultOutput("reports/gas.xls"); got != "reports/gas.carbon.xlsx" {
		t.Errorf("DefaultOutput = %q", got)
	}
	if got := DefaultOutput("reports/gas.XLS"); got != "reports/gas.carbon.xlsx" {
		t.Errorf("DefaultOutput(.XLS) = %q", got)
	}
	out := filepath.Join(t.TempDir(), "gas.carbon.xls")
	_, err := Annotate(context.Background(), testEngine(t), legacyFixture, out, Options{})
	checkRefusal(t, err, ErrInput, "name the output with .xlsx (e.g. testdata/legacy-fuel-log.carbon.xlsx)")
	if _, serr := os.Stat(out); serr == nil {
		t.Error("an output was written")
	}
}

// TestLegacyXLSWithoutOffice: without LibreOffice the refusal says what to
// install and what to do instead.
func TestLegacyXLSWithoutOffice(t *testing.T) {
	none := func() (office, bool) { return office{}, false }
	_, err := openLegacyWith(context.Background(), legacyFixture, (&Options{}).limits(), none)
	checkRefusal(t, err, ErrFormat, "legacy Excel 97-2003 workbook (.xls)")
	for _, want := range []string{"install LibreOffice (Debian: libreoffice-calc-nogui)", "save it as .xlsx"} {
		if !strings.Contains(err.Error(), want) {
			t.Errorf("%q lacks %q", err, want)
		}
	}
	// The same through Annotate, with soffice off the PATH.
	t.Setenv("PATH", t.TempDir())
	_, err = Annotate(context.Background(), testEngine(t), legacyFixture, filepath.Join(t.TempDir(), "o.xlsx"), Options{})
	checkRefusal(t, err, ErrFormat, "Debian: libreoffice-calc-nogui")
}

// TestLegacyXLSNotConverted: other files are left to sniff, and a damaged
// .xls gets a conversion error naming the file.
func TestLegacyXLSNotConverted(t *testing.T) {
	dir := t.TempDir()
	lim := (&Options{}).limits()
	xlsx := smallLog(t, filepath.Join(dir, "log.xlsx"))
	fake := filepath.Join(dir, "page.xls")
	must(t, os.WriteFile(fake, []byte("<html><table><tr><td>1</td></tr></table></html>"), 0o644))
	for _, p := range []string{xlsx, fake, filepath.Join(dir, "missing.xls"), dir} {
		c, err := openLegacy(context.Background(), p, lim)
		if c != nil || err != nil {
			t.Errorf("%s: converted %v, err %v; want it left to sniff", p, c, err)
		}
	}
	// Too large for the limit: refused before LibreOffice runs.
	_, err := openLegacy(context.Background(), legacyFixture, (&Options{MaxUnzippedBytes: 1000}).limits())
	checkRefusal(t, err, ErrTooLarge, "over the limit")
}

// TestLegacyXLSDamaged: a compound file whose workbook stream is mostly
// garbage gets an error naming the input (never the temporary copy), or
// what LibreOffice recovered; nothing is left behind.
func TestLegacyXLSDamaged(t *testing.T) {
	requireOffice(t)
	t.Setenv("TMPDIR", t.TempDir())
	b, err := os.ReadFile(legacyFixture)
	must(t, err)
	// The fixture's Workbook stream (1783 bytes) lives in the mini stream,
	// which is the Root Entry's stream: its first sector is at offset 0x74
	// of the first directory entry. Overwrite the BIFF records after the
	// first BOF record.
	sector := 1 << binary.LittleEndian.Uint16(b[0x1e:])
	dir := sector * (int(binary.LittleEndian.Uint32(b[0x30:])) + 1)
	root := sector * (int(binary.LittleEndian.Uint32(b[dir+0x74:])) + 1)
	bad := append([]byte(nil), b...)
	for i := root + 20; i < root+1700 && i < len(bad); i++ {
		bad[i] = 0xff
	}
	in := filepath.Join(t.TempDir(), "damaged.xls")
	must(t, os.WriteFile(in, bad, 0o644))
	if !isLegacyXLS(in) {
		t.Fatal("the damaged copy is no longer a compound file with a Workbook stream")
	}
	out := filepath.Join(t.TempDir(), "o.xlsx")
	_, err = Annotate(context.Background(), testEngine(t), in, out, Options{})
	if err == nil {
		// LibreOffice recovered what it could and a table was found in it.
		if _, serr := os.Stat(out); serr != nil {
			t.Errorf("no error and no output: %v", serr)
		}
		t.Log("LibreOffice recovered the damaged .xls")
	} else {
		var ie *Error
		if !errors.As(err, &ie) || ie.Path != in || strings.Contains(err.Error(), "fluecell-office-") {
			t.Fatalf("error %v: want an *Error naming %s only", err, in)
		}
		t.Logf("damaged .xls: [%s] %v", ie.Code, err)
	}
	assertNoOfficeDirs(t)
}

// TestLegacyXLSCancel: a cancelled context stops the conversion and kills
// soffice; nothing is left behind.
func TestLegacyXLSCancel(t *testing.T) {
	requireOffice(t)
	t.Setenv("TMPDIR", t.TempDir())
	ctx, cancel := context.WithTimeout(context.Background(), 150*time.Millisecond)
	defer cancel()
	start := time.Now()
	out := filepath.Join(t.TempDir(), "o.xlsx")
	_, err := Annotate(ctx, testEngine(t), legacyFixture, out, Options{})
	checkRefusal(t, err, ErrCancelled, "stopped")
	if d := time.Since(start); d > 10*time.Second {
		t.Errorf("cancelling took %v", d)
	}
	if _, serr := os.Stat(out); serr == nil {
		t.Error("an output was written")
	}
	assertNoOfficeDirs(t)
}

// TestLegacyXLSConcurrent converts at the same time in several goroutines:
// each conversion has its own LibreOffice profile and process, so none
// waits for or hands its work to another. It logs the time of each.
func TestLegacyXLSConcurrent(t *testing.T) {
	o := requireOffice(t)
	const n = 4
	var wg sync.WaitGroup
	errs := make([]error, n)
	took := make([]time.Duration, n)
	sums := make([][]byte, n)
	start := time.Now()
	for i := 0; i < n; i++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			c, err := o.toXLSX(context.Background(), legacyFixture)
			if err != nil {
				errs[i] = err
				return
			}
			defer c.remove()
			took[i] = c.Took
			f, err := excelize.OpenFile(c.Path)
			if err != nil {
				errs[i] = err
				return
			}
			defer f.Close()
			rows, err := f.GetRows("Fuel log")
			if err != nil {
				errs[i] = err
				return
			}
			var buf bytes.Buffer
			for _, r := range rows {
				buf.WriteString(strings.Join(r, ",") + "\n")
			}
			sums[i] = buf.Bytes()
		}()
	}
	wg.Wait()
	for i := 0; i < n; i++ {
		if errs[i] != nil {
			t.Fatalf("conversion %d: %v", i, errs[i])
		}
		if !bytes.Equal(sums[i], sums[0]) {
			t.Errorf("conversion %d read %q, conversion 0 %q", i, sums[i], sums[0])
		}
	}
	t.Logf("%d conversions at once: %v wall, each %v", n, time.Since(start).Round(time.Millisecond), took)
}

// TestLegacyXLSRealFiles converts the real public .xls files of the
// development set (FLUECELL_DEVSET=/work/shared/realworld) and logs the
// conversion time of each.
func TestLegacyXLSRealFiles(t *testing.T) {
	dev := os.Getenv("FLUECELL_DEVSET")
	if dev == "" {
		t.Skip("FLUECELL_DEVSET is not set (the folder of real public workbooks)")
	}
	o := requireOffice(t)
	e := testEngine(t)
	for _, c := range []struct{ file, sheet string }{
		{"eia_NG_CONS_SUM_DCU_NUS_M.xls", "Data 1"},
		{"masssave_2022_Geographic_Report_Truro.xls", ""},
	} {
		t.Run(c.file, func(t *testing.T) {
			in := filepath.Join(dev, c.file)
			before := fileSum(t, in)
			conv, err := o.toXLSX(context.Background(), in)
			if err != nil {
				t.Fatal(err)
			}
			took := conv.Took
			conv.remove()
			start := time.Now()
			res, err := scanAnyFormat(context.Background(), e, in, Options{}, nil)
			scanTook := time.Since(start)
			var ie *Error
			if err != nil && (!errors.As(err, &ie) || ie.Code != ErrNoTable) {
				t.Fatalf("scan: %v", err)
			}
			if res != nil {
				if res.Format != "xls" {
					t.Errorf("Format %q", res.Format)
				}
				if c.sheet != "" && !strings.Contains(strings.Join(res.sheets, "|"), c.sheet) {
					t.Errorf("sheets %v lack %q", res.sheets, c.sheet)
				}
			}
			if fileSum(t, in) != before {
				t.Error("the input changed")
			}
			t.Logf("%s: conversion %v; conversion and scan %v (err: %v)", c.file, took.Round(time.Millisecond), scanTook.Round(time.Millisecond), err)
		})
	}
}

// assertNoOfficeDirs fails when a conversion folder is left in TMPDIR.
func assertNoOfficeDirs(t *testing.T) {
	t.Helper()
	left, _ := filepath.Glob(filepath.Join(os.TempDir(), "fluecell-office-*"))
	if len(left) > 0 {
		t.Errorf("conversion folders left behind: %v", left)
	}
}
