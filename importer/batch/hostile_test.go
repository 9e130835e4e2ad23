package batch

import (
	"context"
	"encoding/csv"
	"io"
	"math"
	"os"
	"path/filepath"
	"strings"
	"sync/atomic"
	"testing"

	"github.com/fluecell/fluecell/importer/atomicfile"
)

// readSummary writes s as the summary CSV and reads it back.
func readSummary(t *testing.T, s *Summary) [][]string {
	t.Helper()
	p := filepath.Join(t.TempDir(), "summary.csv")
	if err := WriteSummaryCSV(p, s); err != nil {
		t.Fatal(err)
	}
	f, err := os.Open(p)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	return recs
}

// TestSummaryNeutralisesFormulas: file names, errors and sheet names that a
// spreadsheet would read as a formula get a leading quote in the summary
// (OWASP "CSV Injection": = + - @ tab carriage return); numbers, negative
// ones included, stay numbers.
func TestSummaryNeutralisesFormulas(t *testing.T) {
	names := []string{`=HYPERLINK("http://example.invalid","x").xlsx`, "@SUM(A1).xlsx", "+cmd.xlsx", "-1+2.xlsx", "\t=1+1.csv", "\r=2+2.csv", "plain.xlsx"}
	s := &Summary{}
	for _, n := range names {
		s.Files = append(s.Files, FileResult{File: n, Output: n, Status: StatusOK,
			Outcome: Outcome{Rows: 2, Computed: 2, TCO2: -1.5, TCO2e: 2.5, Sheets: "=cmd|' /C calc'!A0: ok"}})
	}
	s.Files = append(s.Files, FileResult{File: "bad.xlsx", Output: "bad.xlsx", Status: StatusFailed, Error: "-2+3 is not a workbook"})
	recs := readSummary(t, s)
	for i, n := range names {
		r := recs[i+1]
		want := "'" + n
		if n == "plain.xlsx" {
			want = n
		}
		if r[0] != want || r[9] != want {
			t.Errorf("file %q written as %q, output as %q; want %q", n, r[0], r[9], want)
		}
		if r[4] != "-1.5" || r[5] != "2.5" || r[2] != "2" {
			t.Errorf("numbers changed: %q", r)
		}
		if r[10] != "'=cmd|' /C calc'!A0: ok" {
			t.Errorf("sheets %q", r[10])
		}
	}
	if r := recs[len(recs)-1]; r[7] != "'-2+3 is not a workbook" {
		t.Errorf("error %q", r[7])
	}
}

// TestOutputThroughSymlink: an output folder named through a symbolic link
// that leads into the input folder is recognised by its real path, passed
// over when walking, and said so; a re-run takes no output as input.
func TestOutputThroughSymlink(t *testing.T) {
	in := tree(t, map[string]string{"a.xlsx": "a", "north/b.xlsx": "b"})
	os.MkdirAll(filepath.Join(in, "results"), 0o755)
	link := filepath.Join(t.TempDir(), "results-link")
	if err := os.Symlink(filepath.Join(in, "results"), link); err != nil {
		t.Skip(err)
	}
	var calls atomic.Int64
	cfg := Config{InDir: in, OutDir: link, Fingerprint: "v1", Annotate: copyAnnotate(&calls)}
	for run := 1; run <= 3; run++ {
		s, err := Run(context.Background(), cfg)
		if err != nil {
			t.Fatal(err)
		}
		if len(s.Files) != 2 {
			t.Fatalf("run %d took %d files (%+v): its own outputs were read as inputs", run, len(s.Files), s.Files)
		}
		if len(s.Notes) != 1 || !strings.Contains(s.Notes[0], "passed over the output folder results") {
			t.Errorf("run %d notes %q", run, s.Notes)
		}
	}
	// The input folder named through a link, the output given by its real
	// path inside it: the same.
	inLink := filepath.Join(t.TempDir(), "in-link")
	os.Symlink(in, inLink)
	s, err := Run(context.Background(), Config{InDir: inLink, OutDir: filepath.Join(in, "results"), Fingerprint: "v1", Annotate: copyAnnotate(&calls)})
	if err != nil || len(s.Files) != 2 {
		t.Fatalf("%v %+v", err, s)
	}
	// An input folder that is the output folder through a link is refused.
	if _, err := Run(context.Background(), Config{InDir: in, OutDir: inLink, Annotate: copyAnnotate(&calls)}); err == nil || !strings.Contains(err.Error(), "must differ") {
		t.Errorf("same folder through a link: %v", err)
	}
	// So is an input folder inside the output folder reached through a link.
	if _, err := Run(context.Background(), Config{InDir: filepath.Join(inLink, "north"), OutDir: in, Annotate: copyAnnotate(&calls)}); err == nil || !strings.Contains(err.Error(), "lies inside the output folder") {
		t.Errorf("input inside output through a link: %v", err)
	}
}

// TestOverflowingTotal: a file whose rows are finite but whose total is
// beyond the float64 range fails with that said, and the summary never
// holds Inf.
func TestOverflowingTotal(t *testing.T) {
	in := tree(t, map[string]string{"big.xlsx": "b", "small.xlsx": "s"})
	annotate := func(ctx context.Context, src, dst string) (Outcome, error) {
		if err := os.WriteFile(dst, []byte("x"), 0o644); err != nil {
			return Outcome{}, err
		}
		if strings.Contains(src, "big") {
			return Outcome{Rows: 3, Computed: 3, TCO2: 1, TCO2e: math.Inf(1)}, nil
		}
		return Outcome{Rows: 1, Computed: 1, TCO2: 2, TCO2e: 2}, nil
	}
	s, err := Run(context.Background(), Config{InDir: in, OutDir: t.TempDir(), Annotate: annotate})
	if err != nil {
		t.Fatal(err)
	}
	big := s.Files[0]
	if big.Status != StatusFailed || !strings.Contains(big.Error, "total exceeds the float64 range") || s.Failed != 1 {
		t.Errorf("%+v", big)
	}
	for _, r := range readSummary(t, s) {
		if strings.Contains(strings.Join(r, ","), "Inf") {
			t.Errorf("summary row %q", r)
		}
	}
}

// TestControlCharactersInNames: messages name files with control
// characters quoted, on one line; the summary keeps the name exactly.
func TestControlCharactersInNames(t *testing.T) {
	in := tree(t, map[string]string{"two\nlines.xlsx": "a", "two\nlines.xls": "b", "esc\x1b[2J.xlsx": "corrupt"})
	var calls atomic.Int64
	s, err := Run(context.Background(), Config{InDir: in, OutDir: t.TempDir(), Annotate: copyAnnotate(&calls)})
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range s.Files {
		if strings.ContainsAny(f.Error, "\n\x1b") {
			t.Errorf("raw control character in %q", f.Error)
		}
	}
	var collided bool
	for _, f := range s.Files {
		collided = collided || f.File == "two\nlines.xls" && strings.Contains(f.Error, `"two\nlines.xlsx"`)
	}
	if !collided {
		t.Errorf("collision message does not quote the names: %+v", s.Files)
	}
	names := map[string]bool{}
	for _, r := range readSummary(t, s)[1:] {
		names[r[0]] = true
	}
	if !names["two\nlines.xlsx"] || !names["esc\x1b[2J.xlsx"] {
		t.Errorf("summary names %v", names)
	}
}

// TestExcludedFiles: a file the run writes itself (the summary CSV) in the
// input folder is never taken as an input, however its path is spelled.
func TestExcludedFiles(t *testing.T) {
	in := tree(t, map[string]string{"a.xlsx": "a", "reports/summary.csv": "file,status\n"})
	link := filepath.Join(t.TempDir(), "in-link")
	if err := os.Symlink(in, link); err != nil {
		t.Skip(err)
	}
	var calls atomic.Int64
	s, err := Run(context.Background(), Config{InDir: in, OutDir: t.TempDir(), Annotate: copyAnnotate(&calls),
		Exclude: []string{filepath.Join(link, "reports", "summary.csv")}})
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Files) != 1 || s.Files[0].File != "a.xlsx" || len(s.Notes) != 1 || !strings.Contains(s.Notes[0], "passed over reports/summary.csv") {
		t.Errorf("%+v %q", s.Files, s.Notes)
	}
}

// atomicAnnotate copies the input with atomicfile.Write, as the importer
// writes its outputs.
func atomicAnnotate(calls *atomic.Int64) AnnotateFunc {
	return func(ctx context.Context, in, out string) (Outcome, error) {
		calls.Add(1)
		b, err := os.ReadFile(in)
		if err != nil {
			return Outcome{}, err
		}
		err = atomicfile.Write(out, func(w io.Writer) error { _, err := w.Write(b); return err })
		return Outcome{Rows: 1, Computed: 1, TCO2: 1, TCO2e: 1}, err
	}
}

// TestLongNames: inputs whose names are near the 255-byte limit are
// annotated and stamped (a re-run finds them up to date), and the
// temporary files a killed run left for them are removed.
func TestLongNames(t *testing.T) {
	long := strings.Repeat("L", 245) + ".xlsx"    // 250 bytes
	longer := strings.Repeat("é", 123) + "Z.xlsx" // 252 bytes
	in := tree(t, map[string]string{long: "a", "north/" + longer: "b", "short.xlsx": "c"})
	out := t.TempDir()
	os.MkdirAll(filepath.Join(out, "north"), 0o755)
	var stale []string
	for _, p := range []string{filepath.Join(out, long), filepath.Join(out, "north", longer), filepath.Join(out, stampDir, filepath.FromSlash(stampRel("north/"+longer)))} {
		os.MkdirAll(filepath.Dir(p), 0o755)
		f, err := os.CreateTemp(filepath.Dir(p), atomicfile.TempPattern(filepath.Base(p)))
		if err != nil {
			t.Fatal(err)
		}
		f.Close()
		stale = append(stale, f.Name())
	}
	var calls atomic.Int64
	for run := 0; run < 2; run++ {
		s, err := Run(context.Background(), Config{InDir: in, OutDir: out, Fingerprint: "v1", Annotate: atomicAnnotate(&calls)})
		if err != nil {
			t.Fatal(err)
		}
		if len(s.Files) != 3 || s.Failed != 0 {
			t.Fatalf("run %d: %+v", run, s.Files)
		}
		for _, f := range s.Files {
			if f.Error != "" || (run == 1) != (f.Status == StatusUpToDate) {
				t.Errorf("run %d: %+v", run, f)
			}
		}
	}
	for _, p := range stale {
		if _, err := os.Stat(p); !os.IsNotExist(err) {
			t.Errorf("stale temporary %s left in place", filepath.Base(p))
		}
	}
}
