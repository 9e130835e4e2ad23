package batch

import (
	"context"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"runtime"
	"sort"
	"strings"
	"sync"
	"time"

	"github.com/fluecell/fluecell/importer/safetext"
)

// Outcome is what one annotation reports back.
type Outcome struct {
	Rows     int     `json:"rows"`
	Computed int     `json:"computed"` // rows with a number from every rule
	TCO2     float64 `json:"tCO2"`
	TCO2e    float64 `json:"tCO2e"`
	Warnings int     `json:"warnings"`
	// NotComputable says why the workbook's total is no number (its rows add
	// up past the float64 range); TCO2 and TCO2e are then 0.
	NotComputable string `json:"not_computable,omitempty"`
	// Sheets says what happened to each sheet: "Fuel log: computed 6,504 of
	// 6,570 rows; Prices: skipped: a table of prices...".
	Sheets string `json:"sheets,omitempty"`
	// ByKind are the workbook's totals by kind, in the order of KindNames
	// (t CO2e per kind, then t of biogenic CO2): never added together.
	// TCO2 and TCO2e are Scope 1 (stationary, mobile, fugitive) only.
	ByKind [NumKinds]float64 `json:"by_kind"`
}

// AnnotateFunc annotates the workbook at in into out. It must write out
// atomically (a temporary file in out's folder, then a rename) and leave no
// partial output when it fails or ctx is cancelled.
type AnnotateFunc func(ctx context.Context, in, out string) (Outcome, error)

// Config is one batch run.
type Config struct {
	InDir, OutDir string
	Jobs          int   // parallel workers; 0 means the number of CPUs
	Shard         Shard // zero: every file
	// Fingerprint identifies everything besides the input that decides an
	// output: program version, factor packs, rules, options. An output is
	// up to date when its input and fingerprint are unchanged.
	Fingerprint string
	Annotate    AnnotateFunc
	// Progress, when not nil, receives a one-line progress display
	// (rewritten with \r); pass it only when it is a terminal.
	Progress io.Writer
	// Exclude names files that are never inputs, such as the summary CSV
	// the caller writes, which a later run would otherwise find in the
	// input folder and annotate. Paths are compared after resolving
	// symbolic links.
	Exclude []string
}

// Status of one file.
const (
	StatusOK         = "ok"               // every data row computed
	StatusPartial    = "partial"          // some rows computed; the others have findings at their rows
	StatusNone       = "nothing computed" // the file was read, but no row could be computed (see its sheets)
	StatusFailed     = "failed"           // the file could not be annotated (Error says why)
	StatusUpToDate   = "up-to-date"       // its output is newer than the input and the settings: not redone
	StatusUnreadable = "unreadable"       // a folder that could not be listed (Error says why); its files were not seen
)

// statusOf names the status of an annotated file from its rows.
func statusOf(o Outcome) string {
	switch {
	case o.Rows > 0 && o.Computed == o.Rows:
		return StatusOK
	case o.Computed > 0:
		return StatusPartial
	}
	return StatusNone
}

// FileResult is one row of the summary.
type FileResult struct {
	File    string // path relative to InDir, slash-separated
	Output  string // path of its output relative to OutDir (see OutputName)
	Status  string
	Outcome Outcome
	Error   string
	Seconds float64
}

// Summary is the result of Run.
type Summary struct {
	// Files are the workbooks of this shard and the folders of this shard
	// that could not be listed (StatusUnreadable), sorted by path.
	Files    []FileResult
	Skipped  int // files below InDir that are not workbooks
	Others   int // workbooks left to other shards
	Failed   int
	UpToDate int
	Written  int
	// Unreadable counts the rows of Files with StatusUnreadable: folders
	// whose files were not seen.
	Unreadable int
	// Notes say what the run passed over besides files that are not
	// workbooks: the output folder when it lies inside the input folder,
	// excluded files, unreadable folders that another shard reports.
	Notes []string
}

// isWorkbook lists the extensions treated as workbooks. Legacy .xls files
// count: the annotator converts them, or refuses them with a clear error.
func isWorkbook(name string) bool {
	switch strings.ToLower(filepath.Ext(name)) {
	case ".xlsx", ".xlsm", ".xls", ".csv":
		return true
	}
	return false
}

// OutputName is the output path, relative to OutDir, of the input at rel
// (relative to InDir, slash-separated): the same path, except that a
// legacy .xls is annotated into an .xlsx workbook of the same name.
func OutputName(rel string) string {
	switch ext := filepath.Ext(rel); ext {
	case ".xls":
		return rel + "x"
	case ".XLS":
		return rel + "X"
	default:
		if strings.EqualFold(ext, ".xls") {
			return strings.TrimSuffix(rel, ext) + ".xlsx"
		}
	}
	return rel
}

// collisions maps each input whose output would be another input's output
// (north/gas.xls and north/gas.xlsx both give north/gas.xlsx) to the
// other input.
func collisions(files []string) map[string]string {
	owner := map[string]string{}
	out := map[string]string{}
	for _, f := range files {
		key := OutputName(f)
		if prev, ok := owner[key]; ok {
			// The one whose output keeps its own name wins; files are sorted,
			// so the choice does not depend on the shard.
			loser, winner := f, prev
			if OutputName(f) == f && OutputName(prev) != prev {
				loser, winner = prev, f
				owner[key] = f
			}
			out[loser] = winner
			continue
		}
		owner[key] = f
	}
	return out
}

// Run annotates every workbook below InDir of this shard into the same
// relative path below OutDir. One file's failure never stops the others;
// cancelling ctx stops dispatching new files and lets running ones end.
// The error is for the run as a whole (bad folders, cancellation); per-file
// failures are in the Summary.
func Run(ctx context.Context, cfg Config) (*Summary, error) {
	if cfg.Annotate == nil {
		return nil, errors.New("batch: no annotate function")
	}
	in, out, err := folders(cfg.InDir, cfg.OutDir)
	if err != nil {
		return nil, err
	}
	if err := os.MkdirAll(out, 0o755); err != nil {
		return nil, fmt.Errorf("batch: output folder: %w", err)
	}
	var exclude []string
	for _, x := range cfg.Exclude {
		if r, err := realPath(x); err == nil {
			exclude = append(exclude, r)
		}
	}
	lw, err := listWorkbooks(in, out, exclude...)
	if err != nil {
		return nil, err
	}
	files, skipped := lw.files, lw.skipped
	sum := &Summary{Skipped: skipped, Notes: lw.notes}
	for _, u := range lw.unreadable {
		if cfg.Shard.Takes(u.File) {
			sum.Unreadable++
			sum.Files = append(sum.Files, u)
		} else {
			sum.Notes = append(sum.Notes, fmt.Sprintf("folder %s: %s (shard %s does not list it; another shard's summary does)", safetext.Name(u.File), u.Error, cfg.Shard))
		}
	}
	clash := collisions(files)
	var mine []string
	for _, f := range files {
		if cfg.Shard.Takes(f) {
			mine = append(mine, f)
		} else {
			sum.Others++
		}
	}
	removeStaleTemps(out, cfg.Shard, files)
	st := stamps{dir: filepath.Join(out, stampDir)}
	jobs := cfg.Jobs
	if jobs <= 0 {
		jobs = runtime.NumCPU()
	}
	results := make([]FileResult, len(mine))
	prog := newProgress(cfg.Progress, len(mine))
	work := make(chan int)
	var wg sync.WaitGroup
	for w := 0; w < jobs; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range work {
				if other, ok := clash[mine[i]]; ok {
					results[i] = FileResult{File: mine[i], Output: OutputName(mine[i]), Status: StatusFailed,
						Error: fmt.Sprintf("not annotated: its output %s would overwrite the output of %s; rename one of the two inputs", safetext.Name(OutputName(mine[i])), safetext.Name(other))}
				} else {
					results[i] = one(ctx, cfg, st, in, out, mine[i])
				}
				prog.done(results[i].Status == StatusFailed)
			}
		}()
	}
dispatch:
	for i := range mine {
		select {
		case work <- i:
		case <-ctx.Done():
			break dispatch
		}
	}
	close(work)
	wg.Wait()
	prog.finish()
	for i, r := range results {
		if r.File == "" {
			continue // never dispatched: the run was cancelled
		}
		switch r.Status {
		case StatusFailed:
			sum.Failed++
		case StatusUpToDate:
			sum.UpToDate++
		default:
			sum.Written++
		}
		sum.Files = append(sum.Files, results[i])
	}
	sort.SliceStable(sum.Files, func(i, j int) bool { return sum.Files[i].File < sum.Files[j].File })
	if err := ctx.Err(); err != nil {
		return sum, fmt.Errorf("batch: interrupted after %d of %d files: %w", len(sum.Files)-sum.Unreadable, len(mine), err)
	}
	return sum, nil
}

// one annotates a single file, or skips it when its output is up to date.
func one(ctx context.Context, cfg Config, st stamps, in, out, rel string) FileResult {
	start := time.Now()
	res := FileResult{File: rel, Output: OutputName(rel)}
	src := filepath.Join(in, filepath.FromSlash(rel))
	dst := filepath.Join(out, filepath.FromSlash(res.Output))
	fail := func(err error) FileResult {
		res.Status, res.Error = StatusFailed, oneLine(err.Error())
		res.Seconds = time.Since(start).Seconds()
		st.remove(rel)
		return res
	}
	sum, err := hashFile(src)
	if err != nil {
		return fail(err)
	}
	if prev, ok := st.upToDate(rel, dst, sum, cfg.Fingerprint); ok {
		res.Status, res.Outcome = StatusUpToDate, prev.Outcome
		res.Seconds = time.Since(start).Seconds()
		return res
	}
	if err := os.MkdirAll(filepath.Dir(dst), 0o755); err != nil {
		return fail(err)
	}
	o, err := cfg.Annotate(ctx, src, dst)
	if err != nil {
		return fail(err)
	}
	if err := checkTotals(o); err != nil {
		return fail(err)
	}
	res.Status, res.Outcome = statusOf(o), o
	res.Seconds = time.Since(start).Seconds()
	if err := st.write(rel, dst, sum, cfg.Fingerprint, o); err != nil {
		// The output is complete; only the next run's skip check is lost.
		res.Error = "output written, but its stamp was not: " + oneLine(err.Error())
	}
	return res
}

// oneLine puts a message on one line: runs of white space, line breaks
// included, become one space, and other control characters are escaped.
func oneLine(s string) string { return safetext.Line(strings.Join(strings.Fields(s), " ")) }

// checkTotals refuses an outcome whose totals are not finite numbers: rows
// that are each finite can add up to more than float64 holds (about
// 1.8e308), and Inf or NaN is no total.
func checkTotals(o Outcome) error {
	if o.NotComputable != "" {
		return fmt.Errorf("total exceeds the float64 range: %s; the output was written, but no total can be given", o.NotComputable)
	}
	for _, t := range []struct {
		name string
		v    float64
	}{{"tCO2", o.TCO2}, {"tCO2e", o.TCO2e}} {
		switch {
		case math.IsInf(t.v, 0):
			return fmt.Errorf("total exceeds the float64 range: the computed %s rows add up to beyond ±%.3g (check the amounts and units of the largest rows); the output was written, but no total can be given", t.name, math.MaxFloat64)
		case math.IsNaN(t.v):
			return fmt.Errorf("total %s is not a number (NaN); the output was written, but no total can be given", t.name)
		}
	}
	return nil
}
