package main

import (
	"archive/zip"
	"encoding/csv"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
)

// TestBatchHostileNames: file names that a spreadsheet reads as formulas
// are neutralised in the summary; names with line breaks or escape
// sequences are quoted in messages and kept exactly in the summary.
func TestBatchHostileNames(t *testing.T) {
	in := t.TempDir()
	formula := `=HYPERLINK("example.invalid","x").xlsx`
	for _, n := range []string{formula, "@SUM(1+1).xlsx", "+cmd.xlsx", "-1+2.xlsx"} {
		fuelLog(t, filepath.Join(in, n), 3)
	}
	broken := "two\nlines\x1b[2J.xlsx"
	os.WriteFile(filepath.Join(in, broken), []byte("PK\x03\x04 truncated"), 0o644)
	out := filepath.Join(t.TempDir(), "out")
	sum := filepath.Join(t.TempDir(), "summary.csv")
	code, stdout, stderr := runCLI(t, "batch", in, out, "--summary", sum)
	if code != 1 {
		t.Fatalf("exit %d\n%s\n%s", code, stdout, stderr)
	}
	if !strings.Contains(stderr, `fluecell batch: "two\nlines\x1b[2J.xlsx": `) || strings.ContainsAny(stderr, "\x1b") || strings.Count(stderr, "\n") != 1 {
		t.Errorf("stderr does not quote the name on one line:\n%q", stderr)
	}
	f, err := os.Open(sum)
	if err != nil {
		t.Fatal(err)
	}
	recs, err := csv.NewReader(f).ReadAll()
	f.Close()
	if err != nil {
		t.Fatal(err)
	}
	names := map[string]bool{}
	for _, r := range recs[1:] {
		names[r[0]] = true
		if r[1] == "ok" && (r[4] == "" || r[4][0] == '\'') {
			t.Errorf("tCO2 of %q is %q", r[0], r[4])
		}
	}
	for _, want := range []string{"'" + formula, "'@SUM(1+1).xlsx", "'+cmd.xlsx", "'-1+2.xlsx", broken} {
		if !names[want] {
			t.Errorf("summary lacks %q: %q", want, recs)
		}
	}
	// Opened by LibreOffice Calc, the summary holds no formula.
	if _, err := exec.LookPath("soffice"); err != nil && os.Getenv("FLUECELL_REQUIRE_CALC") != "1" {
		t.Log("soffice not found: the LibreOffice reading of the summary is not checked")
		return
	}
	sheet := calcReading(t, sum)
	if strings.Contains(sheet, "<f") {
		t.Errorf("LibreOffice reads a formula in the summary:\n%s", sheet)
	}
}

// calcReading converts a CSV to .xlsx with LibreOffice (as a person opening
// it would read it) and returns the first sheet's XML.
func calcReading(t *testing.T, csvPath string) string {
	t.Helper()
	requireSoffice(t)
	dir := t.TempDir()
	cmd := exec.Command("soffice", "--headless", "--norestore", "--nolockcheck", "--nologo", "--nodefault",
		"-env:UserInstallation=file://"+filepath.ToSlash(filepath.Join(dir, "profile")), "--convert-to", "xlsx", "--outdir", dir, csvPath)
	cmd.Env = append(os.Environ(), "HOME="+dir)
	if b, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("soffice: %v\n%s", err, b)
	}
	name := strings.TrimSuffix(filepath.Base(csvPath), filepath.Ext(csvPath)) + ".xlsx"
	z, err := zip.OpenReader(filepath.Join(dir, name))
	if err != nil {
		t.Fatal(err)
	}
	defer z.Close()
	for _, f := range z.File {
		if f.Name == "xl/worksheets/sheet1.xml" {
			rc, _ := f.Open()
			b, _ := io.ReadAll(rc)
			rc.Close()
			return string(b)
		}
	}
	t.Fatal("no sheet in LibreOffice's conversion")
	return ""
}

// TestBatchOverflowingTotals: rows that are each finite but add up to more
// than float64 holds are an error for that file, never +Inf; so is a grand
// total over files that overflows.
func TestBatchOverflowingTotals(t *testing.T) {
	in := t.TempDir()
	os.WriteFile(filepath.Join(in, "big.csv"), []byte("Site,Fuel,Quantity,Unit\nA,diesel,1e308,L\nB,diesel,1e308,L\n"), 0o644)
	os.WriteFile(filepath.Join(in, "half1.csv"), []byte("Site,Fuel,Quantity,Unit\nA,diesel,1e308,L\n"), 0o644)
	os.WriteFile(filepath.Join(in, "half2.csv"), []byte("Site,Fuel,Quantity,Unit\nA,diesel,1e308,L\n"), 0o644)
	sum := filepath.Join(t.TempDir(), "summary.csv")
	code, stdout, stderr := runCLI(t, "batch", in, filepath.Join(t.TempDir(), "out"), "--rule", "tCO2e = quantity", "--summary", sum)
	if code != 1 || strings.Contains(stdout+stderr, "Inf") {
		t.Errorf("exit %d\n%s\n%s", code, stdout, stderr)
	}
	if !strings.Contains(stderr, "fluecell batch: big.csv: total exceeds the float64 range") {
		t.Errorf("stderr:\n%s", stderr)
	}
	if !strings.Contains(stdout, "total: 0.000 tCO2, exceeds the float64 range tCO2e") {
		t.Errorf("stdout:\n%s", stdout)
	}
	b, _ := os.ReadFile(sum)
	if strings.Contains(string(b), "Inf") || !strings.Contains(string(b), "total exceeds the float64 range") {
		t.Errorf("summary:\n%s", b)
	}
	reportPath := filepath.Join(t.TempDir(), "r.json")
	code, stdout, stderr = runCLI(t, "annotate", filepath.Join(in, "big.csv"), "-o", filepath.Join(t.TempDir(), "big.csv"), "--rule", "tCO2e = quantity", "--report", reportPath)
	if b, err := os.ReadFile(reportPath); err != nil || !strings.Contains(string(b), `"not_computable"`) || strings.Contains(string(b), "Inf") {
		t.Errorf("report of an overflowing total: %v\n%s", err, b)
	}
	if code != 1 || strings.Contains(stdout+stderr, "Inf") || !strings.Contains(stdout, "total: "+notComputableText) ||
		!strings.Contains(stderr, "total exceeds the float64 range") {
		t.Errorf("annotate: exit %d\n%s\n%s", code, stdout, stderr)
	}
	for _, asJSON := range []bool{false, true} {
		args := []string{"inspect", filepath.Join(in, "big.csv"), "--rule", "tCO2e = quantity"}
		if asJSON {
			args = append(args, "--json")
		}
		code, stdout, stderr = runCLI(t, args...)
		if code != 1 || strings.Contains(stdout+stderr, "Inf") || !strings.Contains(stderr, "total exceeds the float64 range") {
			t.Errorf("inspect (json %v): exit %d\n%s\n%s", asJSON, code, stdout, stderr)
		}
	}
}

// TestAnnotateControlCharactersInNames: annotate's messages and report
// never print a name's line break or escape sequence raw.
func TestAnnotateControlCharactersInNames(t *testing.T) {
	dir := t.TempDir()
	broken := filepath.Join(dir, "bad\n\x1b[2J.xlsx")
	os.WriteFile(broken, []byte("PK\x03\x04 truncated"), 0o644)
	code, _, stderr := runCLI(t, "annotate", broken)
	if code != 1 || strings.Contains(stderr, "\x1b") || strings.Count(stderr, "\n") != 1 || !strings.Contains(stderr, `\x1b[2J`) {
		t.Errorf("exit %d, stderr %q", code, stderr)
	}
	good := filepath.Join(dir, "log\x1b]0;title\a.csv")
	os.WriteFile(good, []byte("Fuel,Quantity,Unit\ndiesel,10,L\n"), 0o644)
	code, stdout, stderr := runCLI(t, "annotate", good)
	if code != 0 || strings.ContainsAny(stdout+stderr, "\x1b\a") || !strings.Contains(stdout, `wrote "`) {
		t.Errorf("exit %d\n%q\n%q", code, stdout, stderr)
	}
}

// TestBatchSummaryInsideInput: a summary written into the input folder is
// not annotated as a workbook by the next run.
func TestBatchSummaryInsideInput(t *testing.T) {
	in := t.TempDir()
	fuelLog(t, filepath.Join(in, "a.xlsx"), 3)
	out := filepath.Join(t.TempDir(), "out")
	sum := filepath.Join(in, "summary.csv")
	for run := 0; run < 2; run++ {
		code, stdout, stderr := runCLI(t, "batch", in, out, "--summary", sum)
		if code != 0 || !strings.HasPrefix(stdout, "1 workbooks:") {
			t.Errorf("run %d: exit %d\n%s\n%s", run, code, stdout, stderr)
		}
	}
}
