package slurmtest

import (
	"archive/zip"
	"context"
	"encoding/csv"
	"fmt"
	"io/fs"
	"os"
	"os/exec"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"

	"github.com/fluecell/fluecell/importer/batch"
	"github.com/fluecell/fluecell/importer/demo"
)

// tasks is the size of the job array; regions*3 demo workbooks are spread
// over it.
const (
	tasks   = 4
	regions = 4
)

// TestSlurmJobArray runs fluecell batch as a Slurm job array of 4 shards
// over one input folder into one shared output folder, then merges the
// shards' summaries, and checks that every workbook was converted exactly
// once, by the shard that owns it, with no partial file left.
func TestSlurmJobArray(t *testing.T) {
	if testing.Short() && os.Getenv(requireEnv) != "1" {
		t.Skip("the Slurm cluster test starts daemons: not in -short mode")
	}
	tools := slurmTools(t)
	start := time.Now()
	bin := buildFluecell(t)
	built := time.Now()

	// Inputs: the demo's three workbooks in each of four regions.
	work := t.TempDir()
	in, out, sums := filepath.Join(work, "in"), filepath.Join(work, "out"), filepath.Join(work, "summaries")
	var inputs []string
	for r := 1; r <= regions; r++ {
		region := fmt.Sprintf("region-%d", r)
		if _, err := demo.Write(filepath.Join(in, region)); err != nil {
			t.Fatal(err)
		}
		for _, name := range demo.Names() {
			inputs = append(inputs, region+"/"+name)
		}
	}
	sort.Strings(inputs)
	if err := os.MkdirAll(sums, 0o755); err != nil {
		t.Fatal(err)
	}

	c := startCluster(t, tools)
	up := time.Now()

	// Each task takes shard $SLURM_ARRAY_TASK_ID of 4 (shards count from 1,
	// as Slurm's array indices 1-4 do). The summaries go beside the output
	// folder, not into it: every shard cleans the output folder of other
	// runs' temporary files when it starts.
	script := filepath.Join(work, "shard.sh")
	body := fmt.Sprintf("#!/bin/sh\nexec %s batch %s %s --jobs 1 --shard \"$SLURM_ARRAY_TASK_ID/%d\" --summary %s/summary-\"$SLURM_ARRAY_TASK_ID\".csv\n",
		shellQuote(bin), shellQuote(in), shellQuote(out), tasks, shellQuote(sums))
	if err := os.WriteFile(script, []byte(body), 0o755); err != nil {
		t.Fatal(err)
	}
	ctx, cancel := context.WithTimeout(context.Background(), 5*time.Minute)
	defer cancel()
	jobOut := filepath.Join(c.dir, "work", "slurm-%A_%a.out")
	sbOut, err := c.sbatch(ctx, "--wait", fmt.Sprintf("--array=1-%d", tasks), "--ntasks=1", "--cpus-per-task=1",
		"-J", "fluecell-shards", "-o", jobOut, script)
	ran := time.Now()
	taskOut := c.taskOutputs(t)
	if err != nil {
		t.Fatalf("sbatch --wait: %v\n%s\n%s\n%s", err, sbOut, taskOut, c.logs())
	}
	t.Logf("times: build %.1fs, cluster up %.1fs, job array %.1fs", built.Sub(start).Seconds(), up.Sub(built).Seconds(), ran.Sub(up).Seconds())

	// Every task ran, wrote only what it owns, and converted all of it.
	written := map[string]int{}
	for i := 1; i <= tasks; i++ {
		p := filepath.Join(sums, fmt.Sprintf("summary-%d.csv", i))
		recs := readCSV(t, p)
		for _, r := range recs[1:] {
			if r[1] == batch.StatusFailed || r[1] == batch.StatusUpToDate {
				t.Errorf("task %d: %s has status %s (%s), want converted\n%s", i, r[0], r[1], r[7], taskOut)
			}
			if !(batch.Shard{Index: i, Count: tasks}).Takes(r[0]) {
				t.Errorf("task %d converted %s, which belongs to another shard", i, r[0])
			}
			written[r[0]]++
		}
	}
	for _, f := range inputs {
		if written[f] != 1 {
			t.Errorf("%s converted %d times by the array, want once", f, written[f])
		}
	}
	if len(written) != len(inputs) {
		t.Errorf("the summaries list %d files, the input folder has %d", len(written), len(inputs))
	}
	checkOutputFolder(t, out, inputs)

	// One merged summary lists every input once, with the totals.
	merged := filepath.Join(work, "summary-all.csv")
	shardSums, _ := filepath.Glob(filepath.Join(sums, "summary-*.csv"))
	mergeOut, err := exec.Command(bin, append([]string{"batch-merge", merged, "--shards", strconv.Itoa(tasks)}, shardSums...)...).CombinedOutput()
	if err != nil {
		t.Fatalf("batch-merge: %v\n%s", err, mergeOut)
	}
	if want := fmt.Sprintf("%d workbooks from %d summaries:", len(inputs), tasks); !strings.Contains(string(mergeOut), want) {
		t.Errorf("batch-merge said:\n%s\nwant %q", mergeOut, want)
	}
	checkMerged(t, merged, inputs)
}

// shellQuote quotes s for sh: in single quotes, each ' written as '\”.
func shellQuote(s string) string { return "'" + strings.ReplaceAll(s, "'", `'\''`) + "'" }

// buildFluecell builds the fluecell command into a temporary folder.
func buildFluecell(t *testing.T) string {
	t.Helper()
	goTool, err := exec.LookPath("go")
	if err != nil {
		t.Fatalf("the go command is needed to build fluecell: %v", err)
	}
	bin := filepath.Join(t.TempDir(), "fluecell")
	if out, err := exec.Command(goTool, "build", "-o", bin, "github.com/fluecell/fluecell/cmd/fluecell").CombinedOutput(); err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	return bin
}

// taskOutputs returns what each array task printed.
func (c *cluster) taskOutputs(t *testing.T) string {
	files, _ := filepath.Glob(filepath.Join(c.dir, "work", "slurm-*.out"))
	var b strings.Builder
	for _, f := range files {
		data, _ := os.ReadFile(f)
		fmt.Fprintf(&b, "---- %s\n%s", filepath.Base(f), data)
	}
	if len(files) != tasks {
		t.Errorf("%d task outputs, want %d (one per array task)\n%s", len(files), tasks, b.String())
	}
	return b.String()
}

// checkOutputFolder checks that out holds exactly one complete annotated
// workbook per input and no temporary or partial file anywhere, stamps
// included.
func checkOutputFolder(t *testing.T, out string, inputs []string) {
	t.Helper()
	var got []string
	filepath.WalkDir(out, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			t.Error(err)
			return nil
		}
		name := d.Name()
		if strings.HasSuffix(name, ".tmp") || strings.Contains(name, ".tmp.") {
			t.Errorf("temporary file left: %s", p)
		}
		if d.IsDir() {
			if name == ".fluecell-batch" {
				return filepath.SkipDir // the stamps, checked for temporaries below
			}
			return nil
		}
		rel, _ := filepath.Rel(out, p)
		got = append(got, filepath.ToSlash(rel))
		if err := completeWorkbook(p); err != nil {
			t.Errorf("%s: %v", rel, err)
		}
		return nil
	})
	sort.Strings(got)
	if strings.Join(got, "\n") != strings.Join(inputs, "\n") {
		t.Errorf("output folder holds:\n%s\nwant one output per input:\n%s", strings.Join(got, "\n"), strings.Join(inputs, "\n"))
	}
	temps, _ := filepath.Glob(filepath.Join(out, ".fluecell-batch", "*", ".*.tmp"))
	if len(temps) > 0 {
		t.Errorf("temporary stamps left: %v", temps)
	}
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

// checkMerged checks the merged summary: each input once, then total rows
// whose tCO2 and tCO2e are the sums of the file rows, kept apart.
func checkMerged(t *testing.T, path string, inputs []string) {
	t.Helper()
	recs := readCSV(t, path)
	if len(recs) != 1+len(inputs)+7 {
		t.Fatalf("merged summary has %d lines, want %d (header, %d files, 7 totals)", len(recs), 1+len(inputs)+7, len(inputs))
	}
	// Columns are found by their header, so the test follows the
	// summary's layout (kind columns came in after "sheets").
	col := map[string]int{}
	for i, h := range recs[0] {
		col[h] = i
	}
	for _, h := range []string{"file", "status", "tCO2", "tCO2e", "stationary_combustion tCO2e", "files"} {
		if _, ok := col[h]; !ok {
			t.Fatalf("merged summary has no %q column: %v", h, recs[0])
		}
	}
	var files []string
	var sum2, sum2e, sumStationary float64
	for _, r := range recs[1 : 1+len(inputs)] {
		files = append(files, r[col["file"]])
		sum2 += parse(t, r[col["tCO2"]])
		sum2e += parse(t, r[col["tCO2e"]])
		sumStationary += parse(t, r[col["stationary_combustion tCO2e"]])
	}
	if strings.Join(files, "\n") != strings.Join(inputs, "\n") {
		t.Errorf("merged summary lists:\n%s\nwant every input once:\n%s", strings.Join(files, "\n"), strings.Join(inputs, "\n"))
	}
	total := recs[1+len(inputs)]
	if total[col["file"]] != "" || total[col["status"]] != "total" || total[col["files"]] != strconv.Itoa(len(inputs)) {
		t.Fatalf("total row %v (header %v)", total, recs[0])
	}
	if got := parse(t, total[col["tCO2"]]); fmt.Sprintf("%.6f", got) != fmt.Sprintf("%.6f", sum2) || sum2 <= 0 {
		t.Errorf("total tCO2 %v, the file rows add up to %v", got, sum2)
	}
	if got := parse(t, total[col["tCO2e"]]); fmt.Sprintf("%.6f", got) != fmt.Sprintf("%.6f", sum2e) || sum2e <= sum2 {
		t.Errorf("total tCO2e %v, the file rows add up to %v (and tCO2 to %v)", got, sum2e, sum2)
	}
	if got := parse(t, total[col["stationary_combustion tCO2e"]]); fmt.Sprintf("%.6f", got) != fmt.Sprintf("%.6f", sumStationary) || sumStationary <= 0 {
		t.Errorf("total stationary combustion %v, the file rows add up to %v", got, sumStationary)
	}
}

func parse(t *testing.T, s string) float64 {
	t.Helper()
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		t.Fatalf("%q: %v", s, err)
	}
	return v
}

func readCSV(t *testing.T, path string) [][]string {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil || len(recs) == 0 {
		t.Fatalf("%s: %v", path, err)
	}
	return recs
}
