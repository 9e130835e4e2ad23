package main

import (
	"encoding/csv"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestBatchMergeCommand runs three shards of batch into one output folder
// and merges their summaries.
func TestBatchMergeCommand(t *testing.T) {
	in := batchInputs(t, 6, 50) // 10 workbooks, one of them broken
	out := filepath.Join(t.TempDir(), "out")
	var shards []string
	for i := 1; i <= 3; i++ {
		sum := filepath.Join(out, fmt.Sprintf("summary-%d.csv", i))
		if code, _, stderr := runCLI(t, "batch", in, out, "--shard", fmt.Sprintf("%d/3", i), "--summary", sum); code > 1 {
			t.Fatalf("shard %d: exit %d: %s", i, code, stderr)
		}
		shards = append(shards, sum)
	}
	merged := filepath.Join(out, "summary-all.csv")
	code, stdout, stderr := runCLI(t, append([]string{"batch-merge", merged, "--shards", "3"}, shards...)...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	if !strings.Contains(stdout, "10 workbooks from 3 summaries: 7 ok, 2 partial, 0 nothing computed, 0 up-to-date, 1 failed") {
		t.Errorf("stdout:\n%s", stdout)
	}
	f, err := os.Open(merged)
	if err != nil {
		t.Fatal(err)
	}
	recs, err := csv.NewReader(f).ReadAll()
	f.Close()
	if err != nil || len(recs) != 1+10+7 {
		t.Fatalf("merged summary: %d lines (want 18), %v", len(recs), err)
	}
	seen := map[string]bool{}
	for _, r := range recs[1:11] {
		if seen[r[0]] {
			t.Errorf("%s listed twice", r[0])
		}
		seen[r[0]] = true
	}
	if !seen["broken.xlsx"] || !seen["kestrel/kestrel-fuel-log-2026-w14.xlsx"] || recs[11][1] != "total" || recs[11][18] != "10" || recs[11][15] != "719696.196" {
		t.Errorf("merged summary:\n%v", recs)
	}

	// The glob of the next run takes in the merged file too: it is refused
	// as both output and input, and nothing is written.
	before, _ := os.ReadFile(merged)
	if code, _, stderr := runCLI(t, append([]string{"batch-merge", merged, merged}, shards...)...); code != 2 || !strings.Contains(stderr, "is both the merged file and one of the summaries") {
		t.Errorf("output among the inputs: exit %d, %s", code, stderr)
	}
	// Arguments in the wrong order would overwrite a shard's summary.
	if code, _, stderr := runCLI(t, "batch-merge", shards[0], shards[1], shards[2]); code != 2 || !strings.Contains(stderr, "exists and is not a merged summary") {
		t.Errorf("a shard summary as output: exit %d, %s", code, stderr)
	}
	// Overlapping shards: the merge fails and leaves the last merge as it was.
	if code, _, stderr := runCLI(t, "batch-merge", merged, shards[0], shards[1], shards[0]); code != 1 || !strings.Contains(stderr, "listed twice") {
		t.Errorf("overlapping shards: exit %d, %s", code, stderr)
	}
	if after, _ := os.ReadFile(merged); string(after) != string(before) {
		t.Error("a failed merge changed the merged file")
	}
	// A task that wrote no summary: its files would be missing.
	if code, _, stderr := runCLI(t, "batch-merge", merged, shards[0], shards[2], "--shards", "3"); code != 1 || !strings.Contains(stderr, "2 summaries for 3 shards") {
		t.Errorf("a missing shard: exit %d, %s", code, stderr)
	}
	if code, _, _ := runCLI(t, "batch-merge", merged); code != 2 {
		t.Errorf("no shard summaries: exit %d, want 2", code)
	}
}

// TestBatchMergeUnreadableFolder merges a summary that reports a folder
// it could not list: the folder is counted apart from the workbooks.
func TestBatchMergeUnreadableFolder(t *testing.T) {
	dir := t.TempDir()
	sum := filepath.Join(dir, "summary-1.csv")
	os.WriteFile(sum, []byte("file,status,rows,computed,tCO2,tCO2e,warnings,error,seconds,output,sheets\n"+
		"north/a.xlsx,ok,4,4,1.5,1.75,0,,0.2,north/a.xlsx,Sheet1: ok\n"+
		"south/locked/,unreadable,,,,,,permission denied,0,,\n"), 0o644)
	code, stdout, stderr := runCLI(t, "batch-merge", filepath.Join(dir, "all.csv"), sum)
	if code != 0 || !strings.Contains(stdout, "1 workbook from 1 summary: 1 ok, 0 partial, 0 nothing computed, 0 up-to-date, 0 failed; 1 unreadable folder (its workbooks were not seen)") ||
		!strings.Contains(stdout, "total: 1.500 tCO2, 1.750 tCO2e") {
		t.Errorf("exit %d\n%s\n%s", code, stdout, stderr)
	}
}
