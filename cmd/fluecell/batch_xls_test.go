package main

import (
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// legacyFixture is an invented fuel log saved as Excel 97-2003 (see
// importer/testdata/README.md).
const legacyFixture = "../../importer/testdata/legacy-fuel-log.xls"

// requireSoffice skips t when LibreOffice is not installed, or fails it
// when FLUECELL_REQUIRE_CALC=1 (as CI sets).
func requireSoffice(t *testing.T) {
	t.Helper()
	if _, err := exec.LookPath("soffice"); err == nil {
		return
	}
	msg := "soffice (LibreOffice) not found on PATH; install it with: apt-get install -y --no-install-recommends libreoffice-calc-nogui"
	if os.Getenv("FLUECELL_REQUIRE_CALC") == "1" {
		t.Fatal(msg + " (FLUECELL_REQUIRE_CALC=1, so this is a failure, not a skip)")
	}
	t.Skip(msg)
}

func copyInto(t *testing.T, src, dst string) {
	t.Helper()
	b, err := os.ReadFile(src)
	if err != nil {
		t.Fatal(err)
	}
	if err := os.MkdirAll(filepath.Dir(dst), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(dst, b, 0o644); err != nil {
		t.Fatal(err)
	}
}

// TestAnnotateLegacyXLS: fluecell annotate IN.xls writes IN.carbon.xlsx and
// refuses an .xls output.
func TestAnnotateLegacyXLS(t *testing.T) {
	requireSoffice(t)
	dir := t.TempDir()
	in := filepath.Join(dir, "fuel.xls")
	copyInto(t, legacyFixture, in)
	code, stdout, stderr := runCLI(t, "annotate", in)
	if code != 0 {
		t.Fatalf("exit %d\n%s\n%s", code, stdout, stderr)
	}
	want := filepath.Join(dir, "fuel.carbon.xlsx")
	if !strings.Contains(stdout, "wrote "+want) {
		t.Errorf("stdout does not name %s:\n%s", want, stdout)
	}
	f, err := excelize.OpenFile(want)
	if err != nil {
		t.Fatal(err)
	}
	f.Close()
	code, _, stderr = runCLI(t, "annotate", in, "-o", filepath.Join(dir, "out.xls"))
	if code == 0 || !strings.Contains(stderr, "name the output with .xlsx") {
		t.Errorf("an .xls output: exit %d, %s", code, stderr)
	}
}

// TestBatchLegacyXLS: batch picks up .xls inputs and writes .xlsx outputs.
func TestBatchLegacyXLS(t *testing.T) {
	requireSoffice(t)
	in := t.TempDir()
	copyInto(t, legacyFixture, filepath.Join(in, "2019", "fuel.xls"))
	if err := os.MkdirAll(filepath.Join(in, "2020"), 0o755); err != nil {
		t.Fatal(err)
	}
	fuelLog(t, filepath.Join(in, "2020", "fuel.xlsx"), 5)
	out := filepath.Join(t.TempDir(), "out")
	code, stdout, stderr := runCLI(t, "batch", in, out, "--jobs", "2")
	if code != 0 || !strings.Contains(stdout, "2 workbooks: 2 written") {
		t.Fatalf("exit %d\n%s\n%s", code, stdout, stderr)
	}
	for _, p := range []string{"2019/fuel.xlsx", "2020/fuel.xlsx"} {
		f, err := excelize.OpenFile(filepath.Join(out, filepath.FromSlash(p)))
		if err != nil {
			t.Errorf("%s: %v", p, err)
			continue
		}
		f.Close()
	}
	if _, err := os.Stat(filepath.Join(out, "2019", "fuel.xls")); !os.IsNotExist(err) {
		t.Errorf("an .xls output exists: %v", err)
	}
}
