package main

import (
	"context"
	"fmt"
	"math"
	"os"
	"strings"

	"golang.org/x/term"

	"github.com/fluecell/fluecell/importer"
	"github.com/fluecell/fluecell/importer/batch"
	"github.com/fluecell/fluecell/importer/safetext"
)

func cmdBatch(ctx context.Context, s stdio, args []string) int {
	fs := newFlags("batch", "batch IN_DIR OUT_DIR [--jobs N] [--shard I/N] [--summary FILE.csv] [--rule 'COLUMN = EXPR']... [--sheet S] [--pack P] [--grid G] [--gwp-set SET] [--factors FILE]... [--uncertainty approach1|approach2 [--seed N] [--draws N]]", s.err, true)
	jobs := fs.Int("jobs", 0, "annotate `N` workbooks at a time (default: the number of CPUs)")
	shardFlag := fs.String("shard", "", "take only shard `I/N` of the files (1 <= I <= N), chosen by relative path, for job arrays")
	summary := fs.String("summary", "", "write one CSV row per workbook to `FILE.csv`: file, status, rows, tCO2, tCO2e, warnings, error, seconds, output (a legacy .xls gives an .xlsx output)")
	var af annotateFlags
	af.register(fs)
	var uf uncertaintyFlags
	uf.register(fs)
	pos, code, ok := parseArgs(fs, args)
	if !ok {
		return code
	}
	ivOpt, ivErr := uf.options()
	if ivErr != nil {
		fmt.Fprintf(s.err, "fluecell batch: %v\n", ivErr)
		return 2
	}
	if len(pos) != 2 {
		fmt.Fprintln(s.err, "fluecell batch: give the input and the output folder, e.g. fluecell batch reviews/2026 reviews/2026-carbon")
		return 2
	}
	if *jobs < 0 {
		fmt.Fprintf(s.err, "fluecell batch: --jobs %d: give a positive number of workers (0 = the number of CPUs)\n", *jobs)
		return 2
	}
	var shard batch.Shard
	if *shardFlag != "" {
		var err error
		if shard, err = batch.ParseShard(*shardFlag); err != nil {
			fmt.Fprintf(s.err, "fluecell batch: --%v\n", err)
			return 2
		}
	}
	e, err := af.engine()
	if err != nil {
		return fail(s, "batch", err)
	}
	opt := af.options()
	opt.Uncertainty = ivOpt
	cfg := batch.Config{
		InDir: pos[0], OutDir: pos[1], Jobs: *jobs, Shard: shard,
		Fingerprint: strings.Join(append(append([]string{"fluecell " + version, "packs " + e.Version(), "pack " + af.pack, "sheet " + af.sheet, "grid " + af.grid, "gwp_set " + af.gwpSet}, af.rules...), append(af.fingerprint(), uf.fingerprint())...), "\n"),
		Annotate: func(ctx context.Context, in, out string) (batch.Outcome, error) {
			rep, err := importer.Annotate(ctx, e, in, out, opt)
			if err != nil {
				return batch.Outcome{}, err
			}
			return batch.Outcome{Rows: rep.Rows, Computed: rep.Computed, TCO2: rep.Totals.TCO2, TCO2e: rep.Totals.TCO2e, NotComputable: rep.Totals.NotComputable,
				ByKind: outcomeKinds(rep), Warnings: rep.Count(importer.SevError) + rep.Count(importer.SevWarning), Sheets: sheetsLine(rep)}, nil
		},
	}
	if *summary != "" {
		cfg.Exclude = []string{*summary}
	}
	if f, isFile := s.err.(*os.File); isFile && term.IsTerminal(int(f.Fd())) {
		cfg.Progress = s.err
	}
	sum, runErr := batch.Run(ctx, cfg)
	if sum == nil {
		return fail(s, "batch", runErr)
	}
	if *summary != "" {
		if err := batch.WriteSummaryCSV(*summary, sum); err != nil {
			fmt.Fprintf(s.err, "fluecell batch: --summary %s: %s\n", safetext.Name(*summary), safetext.Line(err.Error()))
			return 1
		}
	}
	var t2, t2e float64
	var kinds [batch.NumKinds]float64
	var partial, none int
	for _, f := range sum.Files {
		t2 += f.Outcome.TCO2
		t2e += f.Outcome.TCO2e
		for k, v := range f.Outcome.ByKind {
			kinds[k] += v
		}
		switch f.Status {
		case batch.StatusFailed, batch.StatusUnreadable:
			fmt.Fprintf(s.err, "fluecell batch: %s: %s\n", safetext.Name(f.File), safetext.Line(f.Error))
		case batch.StatusPartial:
			partial++
		case batch.StatusNone:
			none++
		}
	}
	for _, n := range sum.Notes {
		fmt.Fprintf(s.err, "fluecell batch: %s\n", safetext.Line(n))
	}
	line := fmt.Sprintf("%d workbooks: %d written, %d up to date, %d failed", len(sum.Files)-sum.Unreadable, sum.Written, sum.UpToDate, sum.Failed)
	if partial+none > 0 {
		line += fmt.Sprintf("; %d partial (rows not computed, each with its finding), %d with nothing computed (see the summary's sheets column)", partial, none)
	}
	if sum.Unreadable > 0 {
		line += "; " + count(sum.Unreadable, "unreadable folder") + " (its workbooks not seen; see standard error)"
	}
	if sum.Skipped > 0 {
		line += fmt.Sprintf("; %d other files skipped", sum.Skipped)
	}
	if shard.Count > 1 {
		line += fmt.Sprintf("; shard %s (%d workbooks left to other shards)", shard, sum.Others)
	}
	fmt.Fprintln(s.out, line)
	fmt.Fprintf(s.out, "total: %s tCO2, %s tCO2e (Scope 1, fossil); outputs in %s\n", totalText(t2, fmtTonnes), totalText(t2e, fmtTonnes), safetext.Name(pos[1]))
	if l := batchKindsLine(kinds); l != "" {
		fmt.Fprintln(s.out, l)
	}
	if partial+none > 0 {
		fmt.Fprintln(s.out, "incomplete: rows of the partial workbooks are missing from these totals (see the summary's sheets column)")
	}
	if *summary != "" {
		fmt.Fprintf(s.out, "summary: %s\n", safetext.Name(*summary))
	}
	totalErr := totalsError(importer.Totals{TCO2: t2, TCO2e: t2e})
	if totalErr != nil {
		fmt.Fprintf(s.err, "fluecell batch: the %v\n", totalErr)
	}
	if runErr != nil {
		return fail(s, "batch", runErr)
	}
	if sum.Failed > 0 || sum.Unreadable > 0 || totalErr != nil {
		return 1
	}
	return 0
}

// fmtTonnes formats tonnes with three decimals (a total too large for
// that, beyond 1e15 t, in exponent form).
func fmtTonnes(v float64) string {
	if math.Abs(v) >= 1e15 {
		return fmt.Sprintf("%.6g", v)
	}
	return fmt.Sprintf("%.3f", round3(v))
}

// sheetsLine says in one line what happened to each sheet of a workbook.
func sheetsLine(rep *importer.Report) string {
	parts := make([]string, 0, len(rep.Sheets))
	for _, sh := range rep.Sheets {
		parts = append(parts, sh.Name+": "+sh.Status+" ("+sh.Reason+")")
	}
	return strings.Join(parts, "; ")
}
