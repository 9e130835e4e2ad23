package batch

import (
	"context"
	"encoding/csv"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"sync/atomic"
	"testing"
)

// copyAnnotate is a test annotator: it copies the input atomically and
// reports its byte count as rows. Files whose name contains "corrupt" fail.
func copyAnnotate(calls *atomic.Int64) AnnotateFunc {
	return func(ctx context.Context, in, out string) (Outcome, error) {
		calls.Add(1)
		if strings.Contains(in, "corrupt") {
			return Outcome{}, errors.New("not a zip file:\ncorrupt or truncated")
		}
		b, err := os.ReadFile(in)
		if err != nil {
			return Outcome{}, err
		}
		tmp := out + ".tmp"
		if err := os.WriteFile(tmp, b, 0o644); err != nil {
			return Outcome{}, err
		}
		return Outcome{Rows: len(b), Computed: len(b), TCO2: 1.5, TCO2e: 1.6, Warnings: 2}, os.Rename(tmp, out)
	}
}

func tree(t *testing.T, files map[string]string) string {
	t.Helper()
	dir := t.TempDir()
	for name, content := range files {
		p := filepath.Join(dir, filepath.FromSlash(name))
		os.MkdirAll(filepath.Dir(p), 0o755)
		if err := os.WriteFile(p, []byte(content), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	return dir
}

func TestRunMirrorsAndIsolatesFailures(t *testing.T) {
	in := tree(t, map[string]string{
		"north/site-a.xlsx": "aaaa", "north/2026/q1.xlsm": "bb", "south/log.csv": "c", "south/corrupt.xlsx": "x",
		"readme.txt": "not a workbook", ".hidden.xlsx": "h", "south/~$log.xlsx": "lock", "old/legacy.xls": "legacy",
	})
	out := filepath.Join(t.TempDir(), "out")
	var calls atomic.Int64
	s, err := Run(context.Background(), Config{InDir: in, OutDir: out, Jobs: 3, Fingerprint: "v1", Annotate: copyAnnotate(&calls)})
	if err != nil {
		t.Fatal(err)
	}
	var names []string
	for _, f := range s.Files {
		names = append(names, f.File+":"+f.Status)
	}
	want := "north/2026/q1.xlsm:ok,north/site-a.xlsx:ok,old/legacy.xls:ok,south/corrupt.xlsx:failed,south/log.csv:ok"
	if strings.Join(names, ",") != want {
		t.Errorf("files %v\nwant %s", names, want)
	}
	if s.Skipped != 3 || s.Failed != 1 || s.Written != 4 {
		t.Errorf("skipped %d failed %d written %d", s.Skipped, s.Failed, s.Written)
	}
	if b, err := os.ReadFile(filepath.Join(out, "north", "2026", "q1.xlsm")); err != nil || string(b) != "bb" {
		t.Errorf("mirrored output: %q %v", b, err)
	}
	if _, err := os.Stat(filepath.Join(out, "south", "corrupt.xlsx")); !os.IsNotExist(err) {
		t.Errorf("a failed file left an output: %v", err)
	}
	if s.Files[3].Error != "not a zip file: corrupt or truncated" {
		t.Errorf("error %q", s.Files[3].Error)
	}
	// A legacy .xls is annotated into an .xlsx workbook of the same name.
	if b, err := os.ReadFile(filepath.Join(out, "old", "legacy.xlsx")); err != nil || string(b) != "legacy" || s.Files[2].Output != "old/legacy.xlsx" {
		t.Errorf("legacy output: %q %v %q", b, err, s.Files[2].Output)
	}
	if _, err := os.Stat(filepath.Join(out, "old", "legacy.xls")); !os.IsNotExist(err) {
		t.Errorf("an .xls output was written: %v", err)
	}
	// Inputs untouched.
	if b, _ := os.ReadFile(filepath.Join(in, "north", "site-a.xlsx")); string(b) != "aaaa" {
		t.Error("input changed")
	}

	// A second run with the same inputs and fingerprint redoes nothing but
	// the failed file.
	calls.Store(0)
	s2, err := Run(context.Background(), Config{InDir: in, OutDir: out, Jobs: 2, Fingerprint: "v1", Annotate: copyAnnotate(&calls)})
	if err != nil {
		t.Fatal(err)
	}
	if calls.Load() != 1 || s2.UpToDate != 4 || s2.Files[1].Outcome.Rows != 4 {
		t.Errorf("re-run: %d calls, %d up to date, %+v", calls.Load(), s2.UpToDate, s2.Files[1])
	}
	// A changed input, a changed output, or a new fingerprint is redone.
	os.WriteFile(filepath.Join(in, "north", "site-a.xlsx"), []byte("aaaaa"), 0o644)
	os.WriteFile(filepath.Join(out, "south", "log.csv"), []byte("tampered"), 0o644)
	calls.Store(0)
	Run(context.Background(), Config{InDir: in, OutDir: out, Fingerprint: "v1", Annotate: copyAnnotate(&calls)})
	if calls.Load() != 3 {
		t.Errorf("after changes: %d calls, want 3 (changed input, changed output, failed file)", calls.Load())
	}
	calls.Store(0)
	Run(context.Background(), Config{InDir: in, OutDir: out, Fingerprint: "v2", Annotate: copyAnnotate(&calls)})
	if calls.Load() != 5 {
		t.Errorf("new fingerprint: %d calls, want 5", calls.Load())
	}

	sumPath := filepath.Join(t.TempDir(), "summary.csv")
	if err := WriteSummaryCSV(sumPath, s); err != nil {
		t.Fatal(err)
	}
	f, _ := os.Open(sumPath)
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if strings.Join(recs[0], ",") != "file,status,rows,computed,tCO2,tCO2e,warnings,error,seconds,output,sheets,"+strings.Join(kindColumns(), ",") || len(recs) != 6 {
		t.Errorf("summary %v", recs)
	}
	// The fake annotator computes every row it finds: ok.
	if got := strings.Join(recs[2][:7], ","); got != "north/site-a.xlsx,ok,4,4,1.5,1.6,2" {
		t.Errorf("row %s", got)
	}
	if got := recs[4]; got[1] != "failed" || got[2] != "" || got[7] == "" {
		t.Errorf("failed row %v", got)
	}
	if got := recs[3]; got[0] != "old/legacy.xls" || got[9] != "old/legacy.xlsx" {
		t.Errorf("legacy row %v", got)
	}
}

func TestOutputName(t *testing.T) {
	for in, want := range map[string]string{
		"a/gas.xls": "a/gas.xlsx", "GAS.XLS": "GAS.XLSX", "gas.Xls": "gas.xlsx", "gas.xlsx": "gas.xlsx",
		"gas.xlsm": "gas.xlsm", "gas.csv": "gas.csv", "gas.xls.csv": "gas.xls.csv",
	} {
		if got := OutputName(in); got != want {
			t.Errorf("OutputName(%q) = %q, want %q", in, got, want)
		}
	}
}

// TestOutputCollision: north/gas.xls and north/gas.xlsx would both write
// north/gas.xlsx; the .xls fails with a message naming both, and the
// .xlsx's output is its own.
func TestOutputCollision(t *testing.T) {
	in := tree(t, map[string]string{"north/gas.xls": "old", "north/gas.xlsx": "new", "south/gas.xls": "alone"})
	out := filepath.Join(t.TempDir(), "out")
	for _, shard := range []Shard{{}, {Index: 1, Count: 2}, {Index: 2, Count: 2}} {
		var calls atomic.Int64
		s, err := Run(context.Background(), Config{InDir: in, OutDir: out, Shard: shard, Annotate: copyAnnotate(&calls)})
		if err != nil {
			t.Fatal(err)
		}
		for _, f := range s.Files {
			switch f.File {
			case "north/gas.xls":
				if f.Status != StatusFailed || !strings.Contains(f.Error, "would overwrite the output of north/gas.xlsx") {
					t.Errorf("shard %v: %+v", shard, f)
				}
			default:
				if f.Status == StatusFailed {
					t.Errorf("shard %v: %+v", shard, f)
				}
			}
		}
	}
	if b, _ := os.ReadFile(filepath.Join(out, "north", "gas.xlsx")); string(b) != "new" {
		t.Errorf("north/gas.xlsx holds %q, want the .xlsx input's output", b)
	}
	if b, _ := os.ReadFile(filepath.Join(out, "south", "gas.xlsx")); string(b) != "alone" {
		t.Errorf("south/gas.xlsx holds %q", b)
	}
}

func TestShards(t *testing.T) {
	files := map[string]string{}
	for i := 0; i < 60; i++ {
		files["d"+string(rune('a'+i%7))+"/f"+strings.Repeat("x", i%5)+string(rune('a'+i%26))+".xlsx"] = "z"
	}
	in := tree(t, files)
	l, err := listWorkbooks(in, filepath.Join(in, "nowhere"))
	if err != nil {
		t.Fatal(err)
	}
	all := l.files
	seen := map[string]int{}
	for i := 1; i <= 3; i++ {
		var calls atomic.Int64
		s, err := Run(context.Background(), Config{InDir: in, OutDir: filepath.Join(t.TempDir(), "o"), Shard: Shard{i, 3}, Annotate: copyAnnotate(&calls)})
		if err != nil {
			t.Fatal(err)
		}
		if len(s.Files) == 0 || len(s.Files)+s.Others != len(all) {
			t.Errorf("shard %d: %d files, %d others, %d in all", i, len(s.Files), s.Others, len(all))
		}
		for _, f := range s.Files {
			seen[f.File]++
		}
	}
	var keys []string
	for k, n := range seen {
		if n != 1 {
			t.Errorf("%s taken %d times", k, n)
		}
		keys = append(keys, k)
	}
	sort.Strings(keys)
	if strings.Join(keys, ",") != strings.Join(all, ",") {
		t.Error("shards do not cover every file")
	}
}

func TestParseShard(t *testing.T) {
	for in, want := range map[string]string{
		"3/8": "", "1/1": "", " 2 / 2 ": "",
		"0/4":  "shards are numbered from 1 to 4; for a 0-based index such as a Kubernetes JOB_COMPLETION_INDEX write $((JOB_COMPLETION_INDEX+1))/4",
		"5/4":  "I must be between 1 and 4",
		"a/b":  "write I/N, e.g. 3/8",
		"3":    "write I/N, e.g. 3/8",
		"1/0":  "N must be between 1 and 1000000",
		"-1/3": "I must be between 1 and 3",
	} {
		_, err := ParseShard(in)
		switch {
		case want == "" && err != nil:
			t.Errorf("%q: %v", in, err)
		case want != "" && (err == nil || !strings.Contains(err.Error(), want)):
			t.Errorf("%q: %v, want %q", in, err, want)
		}
	}
}

func TestRunRefusesBadFolders(t *testing.T) {
	in := tree(t, map[string]string{"a.xlsx": "a"})
	var calls atomic.Int64
	cfg := Config{InDir: in, OutDir: in, Annotate: copyAnnotate(&calls)}
	if _, err := Run(context.Background(), cfg); err == nil || !strings.Contains(err.Error(), "must differ from the input folder") {
		t.Errorf("same folder: %v", err)
	}
	cfg.InDir, cfg.OutDir = filepath.Join(in, "missing"), t.TempDir()
	if _, err := Run(context.Background(), cfg); err == nil || !strings.Contains(err.Error(), "is not a readable folder") {
		t.Errorf("missing folder: %v", err)
	}
	cfg.InDir, cfg.OutDir = in, filepath.Dir(in)
	if _, err := Run(context.Background(), cfg); err == nil || !strings.Contains(err.Error(), "lies inside the output folder") {
		t.Errorf("input inside output: %v", err)
	}
	// An output folder inside the input folder is passed over when walking.
	cfg.InDir, cfg.OutDir = in, filepath.Join(in, "annotated")
	s, err := Run(context.Background(), cfg)
	if err != nil || len(s.Files) != 1 {
		t.Fatalf("%v %+v", err, s)
	}
	s, _ = Run(context.Background(), cfg)
	if len(s.Files) != 1 {
		t.Errorf("second run picked up its own outputs: %+v", s.Files)
	}
}

func TestRunCancelled(t *testing.T) {
	files := map[string]string{}
	for i := 0; i < 20; i++ {
		files[strings.Repeat("f", i+1)+".xlsx"] = "x"
	}
	in := tree(t, files)
	ctx, cancel := context.WithCancel(context.Background())
	var calls atomic.Int64
	annotate := func(c context.Context, src, dst string) (Outcome, error) {
		if calls.Add(1) == 3 {
			cancel()
		}
		return copyAnnotate(&atomic.Int64{})(c, src, dst)
	}
	s, err := Run(ctx, Config{InDir: in, OutDir: t.TempDir(), Jobs: 1, Annotate: annotate})
	if err == nil || !strings.Contains(err.Error(), "interrupted after") {
		t.Fatalf("err %v", err)
	}
	if len(s.Files) >= 20 || len(s.Files) < 3 {
		t.Errorf("%d files done after cancel", len(s.Files))
	}
}

func TestStaleTempsRemoved(t *testing.T) {
	in := tree(t, map[string]string{"north/a.xlsx": "a", "b.xlsx": "b", "c.xls": "c"})
	out := t.TempDir()
	os.MkdirAll(filepath.Join(out, "north"), 0o755)
	stale := filepath.Join(out, "north", ".a.xlsx.123456.tmp")
	staleLegacy := filepath.Join(out, ".c.xlsx.42.tmp")
	os.WriteFile(staleLegacy, []byte("half a converted workbook"), 0o644)
	keep := filepath.Join(out, ".notes.txt.1.tmp")
	os.MkdirAll(filepath.Join(out, stampDir, "north"), 0o755)
	staleStamp := filepath.Join(out, stampDir, "north", ".a.xlsx.json.99.tmp")
	os.WriteFile(staleStamp, []byte("{"), 0o644)
	os.WriteFile(stale, []byte("half a workbook"), 0o644)
	os.WriteFile(keep, []byte("not ours"), 0o644)
	var calls atomic.Int64
	if _, err := Run(context.Background(), Config{InDir: in, OutDir: out, Annotate: copyAnnotate(&calls)}); err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(stale); !os.IsNotExist(err) {
		t.Error("stale temporary output left in place")
	}
	if _, err := os.Stat(staleLegacy); !os.IsNotExist(err) {
		t.Error("stale temporary output of an .xls left in place")
	}
	if _, err := os.Stat(staleStamp); !os.IsNotExist(err) {
		t.Error("stale temporary stamp (a run killed while writing it) left in place")
	}
	if _, err := os.Stat(keep); err != nil {
		t.Error("removed a file that is not a temporary workbook")
	}
}

// TestShardKeepsOtherShardsTemps: the shards of a job array share one output
// folder; a shard never removes a temporary file that is no input's output,
// such as another shard's summary being written there (a race seen in the
// Slurm job-array test).
func TestShardKeepsOtherShardsTemps(t *testing.T) {
	in := tree(t, map[string]string{"a.xlsx": "a", "b.xlsx": "b", "c.xlsx": "c", "d.xlsx": "d"})
	out := t.TempDir()
	summaries := make([]string, 0, 4)
	for i := 1; i <= 4; i++ {
		p := filepath.Join(out, fmt.Sprintf(".summary-%d.csv.%d.tmp", i, 1000+i))
		os.WriteFile(p, []byte("file,status"), 0o644)
		summaries = append(summaries, p)
	}
	for i := 1; i <= 4; i++ {
		var calls atomic.Int64
		if _, err := Run(context.Background(), Config{InDir: in, OutDir: out, Shard: Shard{Index: i, Count: 4}, Annotate: copyAnnotate(&calls)}); err != nil {
			t.Fatal(err)
		}
	}
	for _, p := range summaries {
		if _, err := os.Stat(p); err != nil {
			t.Errorf("a shard removed %s, which is no input's output", filepath.Base(p))
		}
	}
}

func TestStatusOf(t *testing.T) {
	for _, c := range []struct {
		o    Outcome
		want string
	}{
		{Outcome{Rows: 6570, Computed: 6570}, StatusOK},
		{Outcome{Rows: 6570, Computed: 6504}, StatusPartial},
		{Outcome{Rows: 12, Computed: 0}, StatusNone},
		{Outcome{}, StatusNone},
	} {
		if got := statusOf(c.o); got != c.want {
			t.Errorf("statusOf(%+v) = %q, want %q", c.o, got, c.want)
		}
	}
}
