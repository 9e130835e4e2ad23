package batch

import (
	"context"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"runtime"
	"sort"
	"strings"
	"sync"
	"time"
)

// Outcome is what one annotation reports back.
type Outcome struct {
	Rows     int     `json:"rows"`
	Computed int     `json:"computed"` // rows with a number from every rule
	TCO2     float64 `json:"tCO2"`
	TCO2e    float64 `json:"tCO2e"`
	Warnings int     `json:"warnings"`
	// Sheets says what happened to each sheet: "Fuel log: computed 6,504 of
	// 6,570 rows; Prices: skipped: a table of prices...".
	Sheets string `json:"sheets,omitempty"`
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
}

// Status of one file.
const (
	StatusOK       = "ok"               // every data row computed
	StatusPartial  = "partial"          // some rows computed; the others have findings at their rows
	StatusNone     = "nothing computed" // the file was read, but no row could be computed (see its sheets)
	StatusFailed   = "failed"           // the file could not be annotated (Error says why)
	StatusUpToDate = "up-to-date"       // its output is newer than the input and the settings: not redone
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
	Files    []FileResult // workbooks of this shard, sorted by path
	Skipped  int          // files below InDir that are not workbooks
	Others   int          // workbooks left to other shards
	Failed   int
	UpToDate int
	Written  int
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
	in, err := filepath.Abs(cfg.InDir)
	if err != nil {
		return nil, fmt.Errorf("batch: input folder: %w", err)
	}
	out, err := filepath.Abs(cfg.OutDir)
	if err != nil {
		return nil, fmt.Errorf("batch: output folder: %w", err)
	}
	if st, err := os.Stat(in); err != nil || !st.IsDir() {
		return nil, fmt.Errorf("batch: input folder %s is not a readable folder", cfg.InDir)
	}
	if in == out {
		return nil, fmt.Errorf("batch: the output folder must differ from the input folder %s (inputs are never overwritten)", cfg.InDir)
	}
	if rel, err := filepath.Rel(out, in); err == nil && !strings.HasPrefix(rel, "..") {
		return nil, fmt.Errorf("batch: the input folder %s lies inside the output folder %s", cfg.InDir, cfg.OutDir)
	}
	if err := os.MkdirAll(out, 0o755); err != nil {
		return nil, fmt.Errorf("batch: output folder: %w", err)
	}
	files, skipped, err := listWorkbooks(in, out)
	if err != nil {
		return nil, err
	}
	sum := &Summary{Skipped: skipped}
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
						Error: fmt.Sprintf("not annotated: its output %s would overwrite the output of %s; rename one of the two inputs", OutputName(mine[i]), other)}
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
	if err := ctx.Err(); err != nil {
		return sum, fmt.Errorf("batch: interrupted after %d of %d files: %w", len(sum.Files), len(mine), err)
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
	res.Status, res.Outcome = statusOf(o), o
	res.Seconds = time.Since(start).Seconds()
	if err := st.write(rel, dst, sum, cfg.Fingerprint, o); err != nil {
		// The output is complete; only the next run's skip check is lost.
		res.Error = "output written, but its stamp was not: " + oneLine(err.Error())
	}
	return res
}

func oneLine(s string) string { return strings.Join(strings.Fields(s), " ") }

// listWorkbooks returns the workbooks below in (relative, slash-separated,
// sorted) and how many other files it passed over. Hidden files and
// folders, office lock files (~$name.xlsx) and the output folder, when it
// lies inside in, are passed over.
func listWorkbooks(in, out string) ([]string, int, error) {
	var files []string
	skipped := 0
	err := filepath.WalkDir(in, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return fmt.Errorf("batch: reading %s: %w", p, err)
		}
		name := d.Name()
		if d.IsDir() {
			if p != in && (p == out || strings.HasPrefix(name, ".")) {
				return filepath.SkipDir
			}
			return nil
		}
		if !d.Type().IsRegular() || strings.HasPrefix(name, ".") || strings.HasPrefix(name, "~$") || !isWorkbook(name) {
			skipped++
			return nil
		}
		rel, err := filepath.Rel(in, p)
		if err != nil {
			return err
		}
		files = append(files, filepath.ToSlash(rel))
		return nil
	})
	sort.Strings(files)
	return files, skipped, err
}

// removeStaleTemps deletes the temporary files a killed run left in the
// output folder (".name.xlsx.123.tmp" beside name.xlsx), for this shard's
// files only: other shards may be writing theirs into the same folder. A
// temporary output belongs to the input that gives that output (one of
// files), else to the input of the same name.
func removeStaleTemps(out string, shard Shard, files []string) {
	input := map[string]string{}
	for _, f := range files {
		input[OutputName(f)] = f
	}
	stamps := filepath.Join(out, stampDir)
	filepath.WalkDir(out, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return nil
		}
		if d.IsDir() {
			if p == stamps {
				removeStaleStampTemps(stamps, shard)
				return filepath.SkipDir
			}
			return nil
		}
		base, ok := tempOwner(d.Name())
		if !ok || !isWorkbook(base) {
			return nil
		}
		rel, err := filepath.Rel(out, filepath.Join(filepath.Dir(p), base))
		if err != nil {
			return nil
		}
		owner := filepath.ToSlash(rel)
		if f, ok := input[owner]; ok {
			owner = f
		}
		if shard.Takes(owner) {
			os.Remove(p)
		}
		return nil
	})
}

// removeStaleStampTemps deletes the temporary stamps a killed run left
// (".rel.json.123.tmp" beside rel.json below the stamp folder), for this
// shard's inputs only.
func removeStaleStampTemps(dir string, shard Shard) {
	filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return nil
		}
		base, ok := tempOwner(d.Name())
		if !ok || !strings.HasSuffix(base, ".json") {
			return nil
		}
		rel, err := filepath.Rel(dir, filepath.Join(filepath.Dir(p), strings.TrimSuffix(base, ".json")))
		if err == nil && shard.Takes(filepath.ToSlash(rel)) {
			os.Remove(p)
		}
		return nil
	})
}

// tempOwner returns the name of the file a temporary file of
// atomicfile.Write stands for (".name.xlsx.123.tmp" gives name.xlsx); ok
// is false for any other name.
func tempOwner(name string) (string, bool) {
	if !strings.HasPrefix(name, ".") || !strings.HasSuffix(name, ".tmp") {
		return "", false
	}
	base := strings.TrimSuffix(strings.TrimPrefix(name, "."), ".tmp")
	if i := strings.LastIndexByte(base, '.'); i > 0 {
		base = base[:i] // the random part of the temporary name
	}
	return base, true
}
