package main

import (
	"archive/zip"
	"encoding/csv"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"

	"github.com/fluecell/fluecell/importer/demo"
)

// TestMain lets a test run this binary as the fluecell command itself
// (FLUECELL_TEST_MAIN=1), so that it can be killed like a real process.
func TestMain(m *testing.M) {
	if os.Getenv("FLUECELL_TEST_MAIN") == "1" {
		os.Exit(runMain(os.Args[1:]))
	}
	os.Exit(m.Run())
}

// fuelLog writes an invented fuel log of n rows.
func fuelLog(t *testing.T, path string, n int) {
	t.Helper()
	f := excelize.NewFile()
	sw, err := f.NewStreamWriter("Sheet1")
	if err != nil {
		t.Fatal(err)
	}
	sw.SetRow("A1", []any{"Site", "Fuel", "Quantity", "Unit"})
	fuels := []string{"natural_gas", "diesel", "lpg"}
	unitsOf := []string{"GJ", "L", "kg"}
	for i := 0; i < n; i++ {
		cell, _ := excelize.CoordinatesToCellName(1, i+2)
		sw.SetRow(cell, []any{fmt.Sprintf("Depot %d", i%9), fuels[i%3], float64(100 + i%50), unitsOf[i%3]})
	}
	if err := sw.Flush(); err != nil {
		t.Fatal(err)
	}
	if err := f.SaveAs(path); err != nil {
		t.Fatal(err)
	}
}

func batchInputs(t *testing.T, copies, rows int) string {
	t.Helper()
	in := t.TempDir()
	if _, err := demo.Write(filepath.Join(in, "kestrel")); err != nil {
		t.Fatal(err)
	}
	for i := 0; i < copies; i++ {
		dir := filepath.Join(in, fmt.Sprintf("region-%d", i%4))
		os.MkdirAll(dir, 0o755)
		fuelLog(t, filepath.Join(dir, fmt.Sprintf("log-%02d.xlsx", i)), rows)
	}
	os.WriteFile(filepath.Join(in, "README.txt"), []byte("not a workbook"), 0o644)
	os.WriteFile(filepath.Join(in, "broken.xlsx"), []byte("PK\x03\x04 truncated"), 0o644)
	return in
}

func TestBatchCommand(t *testing.T) {
	in := batchInputs(t, 6, 50)
	out := filepath.Join(t.TempDir(), "out")
	sum := filepath.Join(t.TempDir(), "summary.csv")
	code, stdout, stderr := runCLI(t, "batch", in, out, "--jobs", "2", "--summary", sum)
	if code != 1 {
		t.Fatalf("exit %d (want 1: one broken file)\n%s\n%s", code, stdout, stderr)
	}
	if !strings.Contains(stdout, "10 workbooks: 9 written, 0 up to date, 1 failed; 2 partial (rows not computed, each with its finding), 0 with nothing computed (see the summary's sheets column); 1 other files skipped") {
		t.Errorf("stdout:\n%s", stdout)
	}
	if !strings.Contains(stderr, "broken.xlsx") {
		t.Errorf("stderr does not name the broken file:\n%s", stderr)
	}
	f, err := os.Open(sum)
	if err != nil {
		t.Fatal(err)
	}
	recs, _ := csv.NewReader(f).ReadAll()
	f.Close()
	if len(recs) != 11 || strings.Join(recs[0], ",") != "file,status,rows,computed,tCO2,tCO2e,warnings,error,seconds,output,sheets,"+
		"stationary_combustion tCO2e,mobile_combustion tCO2e,fugitive tCO2e,electricity_heat tCO2e,embodied tCO2e,other tCO2e,tCO2 biogenic" {
		t.Fatalf("summary: %v", recs)
	}
	// Each kind in its own column: the build plan's embodied tonnes are
	// never in tCO2e (Scope 1), the demo fuel log's wood is biogenic.
	for _, r := range recs[1:] {
		switch r[0] {
		case "kestrel/marrowdale-build-plan-2030.xlsx":
			if r[5] != "0" || r[15] != "719696.196" {
				t.Errorf("build plan row: tCO2e %q, embodied %q; want 0 and 719696.196", r[5], r[15])
			}
		case "kestrel/kestrel-fuel-log-2026-w14.xlsx":
			// 2.4 t wood x 15.6 GJ/t (IPCC 2006 Vol 2 Ch 1 Table 1.2) x 112 kg CO2/GJ (Table 1.4).
			if r[17] != "4.19328" || r[5] != r[11] {
				t.Errorf("fuel log row: biogenic %q (want 4.19328), stationary %q = tCO2e %q", r[17], r[11], r[5])
			}
		}
	}
	for _, r := range recs[1:] {
		if r[0] == "broken.xlsx" {
			if r[1] != "failed" || r[7] == "" {
				t.Errorf("broken row %v", r)
			}
			continue
		}
		// The demo's fuel log and build plan hold rows that cannot be
		// computed (each with its finding): they are partial, and say so.
		want := "ok"
		if strings.Contains(r[0], "fuel-log") || strings.Contains(r[0], "build-plan") {
			want = "partial"
		}
		if r[1] != want || r[10] == "" || (want == "partial") != strings.Contains(r[10], "partial (computed") {
			t.Errorf("row %v: want status %s and the sheets said", r, want)
		}
		if _, err := excelize.OpenFile(filepath.Join(out, filepath.FromSlash(r[9]))); err != nil {
			t.Errorf("%s: %v", r[0], err)
		}
	}
	// The second run finds everything up to date but the broken file.
	code, stdout, _ = runCLI(t, "batch", in, out)
	if code != 1 || !strings.Contains(stdout, "10 workbooks: 0 written, 9 up to date, 1 failed") {
		t.Errorf("re-run: exit %d\n%s", code, stdout)
	}
	// Shards split the files between them.
	total := 0
	for i := 1; i <= 3; i++ {
		o := filepath.Join(t.TempDir(), "o")
		code, stdout, _ = runCLI(t, "batch", in, o, "--shard", fmt.Sprintf("%d/3", i))
		var n, w, u, fl int
		fmt.Sscanf(stdout, "%d workbooks: %d written, %d up to date, %d failed", &n, &w, &u, &fl)
		total += n
	}
	if total != 10 {
		t.Errorf("shards took %d workbooks in all, want 10", total)
	}
	if code, _, stderr := runCLI(t, "batch", in, out, "--shard", "0/3"); code != 2 || !strings.Contains(stderr, "numbered from 1") {
		t.Errorf("--shard 0/3: %d %s", code, stderr)
	}
}

// TestBatchKill kills a running batch with SIGKILL and checks that the
// output folder holds only complete outputs (workbooks and annotated CSV
// files; temporary files are hidden), then that a second run completes
// the rest and leaves no temporary file.
func TestBatchKill(t *testing.T) {
	if testing.Short() {
		t.Skip("kill test in -short mode")
	}
	const copies, csvs, csvRows = 16, 4, 40000
	in := batchInputs(t, copies, 2000)
	for i := 0; i < csvs; i++ {
		var b strings.Builder
		b.WriteString("Site,Fuel,Quantity,Unit\n")
		for r := 0; r < csvRows; r++ {
			fmt.Fprintf(&b, "Depot %d,diesel,%d,L\n", r%7, 100+r%50)
		}
		os.WriteFile(filepath.Join(in, fmt.Sprintf("csv-%d.csv", i)), []byte(b.String()), 0o644)
	}
	out := filepath.Join(t.TempDir(), "out")
	summary := filepath.Join(t.TempDir(), "summary.csv")
	// First kill: while an annotated CSV is being written. Second kill: a
	// few workbooks later.
	killWhen(t, in, out, summary, func() bool { return hasTemp(out, ".csv") })
	t.Logf("killed with a partial CSV output left behind: %v", hasTemp(out, ".csv"))
	checkVisibleComplete(t, out, csvRows)
	before := len(listOutputs(t, out))
	killWhen(t, in, out, summary, func() bool { return len(listOutputs(t, out)) >= before+3 })
	done := listOutputs(t, out)
	if len(done) == 0 || len(done) >= copies+3+csvs {
		t.Fatalf("%d outputs when killed: the kill did not land mid-run", len(done))
	}
	checkVisibleComplete(t, out, csvRows)
	if _, err := os.Stat(summary); !os.IsNotExist(err) {
		t.Errorf("a summary was written by a killed run: %v", err)
	}
	code, stdout, stderr := runCLI(t, "batch", in, out, "--jobs", "2", "--summary", summary)
	if code != 1 || !strings.Contains(stdout, fmt.Sprintf("%d workbooks:", copies+4+csvs)) || !strings.Contains(stdout, "1 failed") {
		t.Fatalf("re-run: exit %d\n%s\n%s", code, stdout, stderr)
	}
	var n, w, u int
	fmt.Sscanf(stdout, "%d workbooks: %d written, %d up to date", &n, &w, &u)
	if u < len(done)-2 || w+u != copies+3+csvs {
		t.Errorf("re-run wrote %d and skipped %d; %d were complete before", w, u, len(done))
	}
	leftovers := 0
	filepath.Walk(out, func(p string, fi os.FileInfo, err error) error {
		if err == nil && strings.HasSuffix(p, ".tmp") {
			leftovers++
		}
		return nil
	})
	if leftovers != 0 {
		t.Errorf("%d temporary files left after the re-run", leftovers)
	}
	checkVisibleComplete(t, out, csvRows)
	if got := len(listOutputs(t, out)); got != copies+3+csvs {
		t.Errorf("%d outputs after the re-run, want %d", got, copies+3+csvs)
	}
	if b, err := os.ReadFile(summary); err != nil || strings.Count(string(b), "\n") != copies+4+csvs+1 {
		t.Errorf("summary after the re-run: %v\n%s", err, b)
	}
}

// killWhen starts a batch of in into out as a separate process and kills
// it with SIGKILL as soon as cond holds.
func killWhen(t *testing.T, in, out, summary string, cond func() bool) {
	t.Helper()
	cmd := exec.Command(os.Args[0], "batch", in, out, "--jobs", "2", "--summary", summary)
	cmd.Env = append(os.Environ(), "FLUECELL_TEST_MAIN=1")
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	deadline := time.Now().Add(60 * time.Second)
	for time.Now().Before(deadline) && !cond() {
		time.Sleep(5 * time.Millisecond)
	}
	if !cond() {
		t.Error("the batch never reached the state to kill it in")
	}
	if err := cmd.Process.Signal(syscall.SIGKILL); err != nil {
		t.Fatal(err)
	}
	cmd.Wait()
}

// hasTemp reports whether a temporary output for a file ending in ext
// lies below dir.
func hasTemp(dir, ext string) bool {
	found := false
	filepath.Walk(dir, func(p string, fi os.FileInfo, err error) error {
		name := filepath.Base(p)
		found = found || err == nil && strings.HasPrefix(name, ".") && strings.HasSuffix(name, ".tmp") && strings.Contains(name, ext+".")
		return nil
	})
	return found
}

// checkVisibleComplete checks every file below dir that is not hidden:
// workbooks must be complete, annotated CSV files must hold every row
// with the added columns.
func checkVisibleComplete(t *testing.T, dir string, csvRows int) {
	t.Helper()
	filepath.Walk(dir, func(p string, fi os.FileInfo, err error) error {
		if err != nil {
			return nil
		}
		if strings.HasPrefix(fi.Name(), ".") && p != dir {
			if fi.IsDir() {
				return filepath.SkipDir
			}
			return nil
		}
		if fi.IsDir() {
			return nil
		}
		switch filepath.Ext(p) {
		case ".xlsx", ".xlsm":
			if err := completeWorkbook(p); err != nil {
				t.Errorf("%s: %v", p, err)
			}
		case ".csv":
			f, err := os.Open(p)
			if err != nil {
				t.Error(err)
				return nil
			}
			recs, err := csv.NewReader(f).ReadAll()
			f.Close()
			if err != nil || len(recs) != csvRows+1 || recs[0][len(recs[0])-1] != "source" || recs[len(recs)-1][len(recs[0])-1] == "" {
				t.Errorf("%s: incomplete annotated CSV (%d records, %v)", p, len(recs), err)
			}
		default:
			t.Errorf("unexpected visible file %s", p)
		}
		return nil
	})
}

// listOutputs lists the outputs (workbooks and CSV files, not temporary
// files) below dir.
func listOutputs(t *testing.T, dir string) []string {
	var out []string
	filepath.Walk(dir, func(p string, fi os.FileInfo, err error) error {
		if err != nil || fi.IsDir() || strings.HasPrefix(fi.Name(), ".") {
			return nil
		}
		if strings.HasSuffix(p, ".xlsx") || strings.HasSuffix(p, ".xlsm") || strings.HasSuffix(p, ".csv") {
			out = append(out, p)
		}
		return nil
	})
	return out
}

// completeWorkbook checks that a file is a whole zip whose workbook opens
// and carries the annotation's summary sheet.
func completeWorkbook(p string) error {
	z, err := zip.OpenReader(p)
	if err != nil {
		return err
	}
	z.Close()
	f, err := excelize.OpenFile(p)
	if err != nil {
		return err
	}
	defer f.Close()
	if idx, _ := f.GetSheetIndex("Carbon summary"); idx < 0 {
		return fmt.Errorf("no Carbon summary sheet")
	}
	return nil
}

func TestDemoCommand(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "demo")
	code, out, errs := runCLI(t, "demo", dir)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	for _, name := range demo.Names() {
		ext := filepath.Ext(name)
		if err := completeWorkbook(filepath.Join(dir, strings.TrimSuffix(name, ext)+".carbon"+ext)); err != nil {
			t.Errorf("%s: %v", name, err)
		}
	}
	for _, want := range []string{"fuel-unknown", "unit-dimension", "Tier 1 estimates", "accredited verification"} {
		if !strings.Contains(out, want) {
			t.Errorf("demo output lacks %q:\n%s", want, out)
		}
	}
}
