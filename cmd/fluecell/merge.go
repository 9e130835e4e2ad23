package main

import (
	"context"
	"fmt"
	"os"
	"path/filepath"
	"strings"

	"github.com/fluecell/fluecell/importer/batch"
)

// cmdBatchMerge combines the summary CSVs of a sharded batch into one.
func cmdBatchMerge(ctx context.Context, s stdio, args []string) int {
	fs := newFlags("batch-merge", "batch-merge OUT.csv SHARD.csv... [--shards N] (the summaries that fluecell batch --shard I/N --summary wrote)", s.err, false)
	shards := fs.Int("shards", 0, "check that the summaries are those of shards 1..`N` of one run: one per shard, none missing")
	pos, code, ok := parseArgs(fs, args)
	if !ok {
		return code
	}
	if len(pos) < 2 {
		fmt.Fprintln(s.err, "fluecell batch-merge: give the merged file first, then the shards' summaries, e.g. fluecell batch-merge out/summary.csv out/summary-*.csv")
		return 2
	}
	out, sums := pos[0], pos[1:]
	for _, p := range sums {
		if sameFile(out, p) {
			fmt.Fprintf(s.err, "fluecell batch-merge: %s is both the merged file and one of the summaries to merge; name a new file first (e.g. %s)\n", out, filepath.Join(filepath.Dir(out), "summary-all.csv"))
			return 2
		}
	}
	if _, err := os.Lstat(out); err == nil && !batch.IsMergedSummary(out) {
		fmt.Fprintf(s.err, "fluecell batch-merge: %s exists and is not a merged summary; the merged file comes first (fluecell batch-merge OUT.csv SHARD.csv...): name a new file, or remove this one\n", out)
		return 2
	}
	m, err := batch.MergeSummaries(sums)
	if err != nil {
		return fail(s, "batch-merge", err)
	}
	if *shards != 0 {
		if err := batch.CheckShards(m, *shards); err != nil {
			return fail(s, "batch-merge", err)
		}
	}
	if err := batch.WriteMergedCSV(out, m); err != nil {
		return fail(s, "batch-merge", err)
	}
	all := m.Totals[0]
	line := fmt.Sprintf("%s from %s:", plural(all.Files, "workbook"), plural(len(m.Summaries), "summary"))
	for i, t := range m.Totals[1:] {
		switch {
		case t.Status == "unreadable":
			if t.Files == 1 {
				line += "; 1 unreadable folder (its workbooks were not seen)"
			} else if t.Files > 1 {
				line += fmt.Sprintf("; %d unreadable folders (their workbooks were not seen)", t.Files)
			}
		case i == 0:
			line += fmt.Sprintf(" %d %s", t.Files, t.Status)
		default:
			line += fmt.Sprintf(", %d %s", t.Files, t.Status)
		}
	}
	fmt.Fprintln(s.out, line)
	fmt.Fprintf(s.out, "total: %.3f tCO2, %.3f tCO2e (Scope 1, fossil; kept apart: tCO2e already includes the CO2)\n", all.TCO2, all.TCO2e)
	if all.NoKinds {
		fmt.Fprintln(s.out, "by kind: unknown (a summary without kind columns, of an older version, is among them)")
	} else if l := batchKindsLine(all.ByKind); l != "" {
		fmt.Fprintln(s.out, l)
	}
	fmt.Fprintf(s.out, "merged summary: %s\n", out)
	return 0
}

// sameFile reports whether a and b name the same file: the same existing
// file, or the same absolute path when either does not exist.
func sameFile(a, b string) bool {
	ia, errA := os.Stat(a)
	ib, errB := os.Stat(b)
	if errA == nil && errB == nil {
		return os.SameFile(ia, ib)
	}
	pa, errA := filepath.Abs(a)
	pb, errB := filepath.Abs(b)
	return errA == nil && errB == nil && pa == pb
}

// plural writes n and the noun, in the plural unless n is 1.
func plural(n int, noun string) string {
	if n == 1 {
		return "1 " + noun
	}
	if strings.HasSuffix(noun, "y") {
		return fmt.Sprintf("%d %sies", n, strings.TrimSuffix(noun, "y"))
	}
	return fmt.Sprintf("%d %ss", n, noun)
}
