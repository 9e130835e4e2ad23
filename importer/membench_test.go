//go:build linux

package importer

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"
)

// TestMembench measures whole processes under /usr/bin/time -v (Debian
// package "time"): wall time, CPU time (user + system) and peak resident
// memory of
//
//   - the physical floor (physicalFloor, bench_floor_test.go, run in a child
//     of this test binary),
//   - the built `fluecell annotate`,
//   - openpyxl doing the same job (testdata/bench/openpyxl_append.py),
//   - `fluecell batch --jobs 1` and `--jobs 2` on a folder of three copies
//     of the 100k workbook,
//
// on the generated 100 000-row fuel log, and on the 1 000 000-row one with
// FLUECELL_BENCH_1M=1. Every figure is printed with its ratio to the floor
// of the same run, so that the figures of a loaded machine can still be
// compared. Opt-in, because it takes minutes:
//
//	FLUECELL_MEMBENCH=1 go test ./importer -run TestMembench -v -timeout 60m
//
// FLUECELL_MEMBENCH_BIN=path uses a fluecell binary built elsewhere (e.g.
// from another branch) instead of building this module's, and
// FLUECELL_MEMBENCH_BIN=before=path1,after=path2 measures two against the
// same floor;
// FLUECELL_MEMBENCH_RUNS=n runs each Go program n times (default 3; the
// best time and the largest peak are kept); FLUECELL_MEMBENCH_OPENPYXL=0
// leaves openpyxl out (it runs once, and only on the 100k workbook unless
// FLUECELL_MEMBENCH_OPENPYXL=all).
func TestMembench(t *testing.T) {
	if os.Getenv("FLUECELL_MEMBENCH") != "1" {
		t.Skip("set FLUECELL_MEMBENCH=1 to measure time and peak memory of whole processes")
	}
	if _, err := os.Stat(timeBin); err != nil {
		t.Fatalf("%s is missing: apt-get install -y time", timeBin)
	}
	dir := t.TempDir()
	bins := membenchBins(t, dir)
	runs := 3
	if s := os.Getenv("FLUECELL_MEMBENCH_RUNS"); s != "" {
		n, err := strconv.Atoi(s)
		if err != nil || n < 1 {
			t.Fatalf("FLUECELL_MEMBENCH_RUNS=%q: want a whole number >= 1", s)
		}
		runs = n
	}
	sizes := []int{100_000}
	if os.Getenv("FLUECELL_BENCH_1M") == "1" {
		sizes = append(sizes, 1_000_000)
	}
	pyMode := os.Getenv("FLUECELL_MEMBENCH_OPENPYXL")
	script, err := filepath.Abs(filepath.Join("testdata", "bench", "openpyxl_append.py"))
	must(t, err)

	// The floor runs in a child of this test binary; the binary's own
	// peak, doing nothing, is the part of the floor's that is not the
	// floor's work.
	idle := measure(t, 1, "idle", os.Args[0], []string{"-test.run=^TestMembenchFloor$"}, "", nil)
	table := []string{fmt.Sprintf("| test binary, idle (part of the floor's figures) | %.2f s | %.2f s | %d MB | | | | |",
		idle.wall.Seconds(), idle.cpu.Seconds(), idle.rssKB/1024)}
	for _, n := range sizes {
		in := fuelLogN(t, n)
		label := strconv.Itoa(n/1000) + "k"
		floor := measure(t, runs, "floor", os.Args[0], []string{"-test.run=^TestMembenchFloor$"},
			"FLUECELL_MEMBENCH_FLOOR="+in+"|"+filepath.Join(dir, "floor.xlsx"), nil)
		table = append(table, floor.row(label+" physical floor", floor, ""))

		for _, bin := range bins {
			rep := filepath.Join(dir, "report-"+label+".json")
			ann := measure(t, runs, "annotate", bin.path, []string{"annotate", in, "-o", filepath.Join(dir, "annotated-"+label+".xlsx"), "--report", rep}, "", nil)
			layout, computed := reportLayout(t, rep)
			if computed != n {
				t.Errorf("%s: annotate computed %d rows, want %d", label, computed, n)
			}
			table = append(table, ann.row(label+" fluecell"+bin.label+" annotate", floor, "layout "+layout))
		}

		if pyMode != "0" && (n == 100_000 || pyMode == "all") {
			py := measure(t, 1, "openpyxl", "/usr/bin/python3", []string{script, in, filepath.Join(dir, "openpyxl-"+label+".xlsx")}, "", nil)
			table = append(table, py.row(label+" openpyxl (load, 3 columns, save)", floor, "inline; not the carbon computation"))
		}
		if n == 100_000 {
			batchIn := filepath.Join(dir, "batch-in")
			must(t, os.MkdirAll(batchIn, 0o755))
			for i := 1; i <= 3; i++ {
				copyFile(t, in, filepath.Join(batchIn, "depot-"+strconv.Itoa(i)+".xlsx"))
			}
			for _, bin := range bins {
				for _, jobs := range []string{"1", "2"} {
					out := filepath.Join(dir, "batch-out-"+jobs)
					// A fresh output folder for each run: batch would
					// skip the outputs already there.
					b := measure(t, runs, "batch", bin.path, []string{"batch", batchIn, out, "--jobs", jobs}, "",
						func() { must(t, os.RemoveAll(out)) })
					if got, _ := filepath.Glob(filepath.Join(out, "*.xlsx")); len(got) != 3 {
						t.Errorf("batch --jobs %s wrote %d workbooks, want 3", jobs, len(got))
					}
					table = append(table, b.row("3 x 100k fluecell"+bin.label+" batch --jobs "+jobs, floor, ""))
				}
			}
		}
	}
	t.Logf("\n| program | wall | CPU | peak RSS | wall / floor | CPU / floor | RSS / floor | note |\n|---|---|---|---|---|---|---|---|\n%s",
		strings.Join(table, "\n"))
}

// membenchBin is one fluecell binary to measure; label ("" or " NAME")
// goes into the table.
type membenchBin struct{ label, path string }

// membenchBins reads FLUECELL_MEMBENCH_BIN: "" builds this module's
// cmd/fluecell into dir; "PATH" is one binary; "NAME=PATH,NAME=PATH" are
// several, measured one after the other against the same floor (e.g. a
// branch before and after a change).
func membenchBins(t *testing.T, dir string) []membenchBin {
	t.Helper()
	env := os.Getenv("FLUECELL_MEMBENCH_BIN")
	if env == "" {
		bin := filepath.Join(dir, "fluecell")
		cmd := exec.Command("go", "build", "-o", bin, "github.com/fluecell/fluecell/cmd/fluecell")
		if out, err := cmd.CombinedOutput(); err != nil {
			t.Fatalf("go build: %v\n%s", err, out)
		}
		return []membenchBin{{"", bin}}
	}
	if !strings.Contains(env, "=") {
		return []membenchBin{{"", env}}
	}
	var bins []membenchBin
	for _, item := range strings.Split(env, ",") {
		name, path, ok := strings.Cut(item, "=")
		if !ok || name == "" || path == "" {
			t.Fatalf("FLUECELL_MEMBENCH_BIN: %q: want PATH or NAME=PATH,NAME=PATH", item)
		}
		bins = append(bins, membenchBin{" " + name, path})
	}
	return bins
}

// TestMembenchFloor is the floor's child process of TestMembench.
func TestMembenchFloor(t *testing.T) {
	arg := os.Getenv("FLUECELL_MEMBENCH_FLOOR")
	if arg == "" {
		t.Skip("run by TestMembench")
	}
	in, out, _ := strings.Cut(arg, "|")
	if _, err := physicalFloor(in, out, floorSheet); err != nil {
		t.Fatal(err)
	}
}

// timeBin is GNU time, which reports a child's peak RSS.
const timeBin = "/usr/bin/time"

// usage is what /usr/bin/time -v reported for a program: the best wall
// and CPU times and the largest peak RSS over its runs.
type usage struct {
	wall, cpu time.Duration
	rssKB     int64
}

// row formats u as a table row with its ratios to floor.
func (u usage) row(name string, floor usage, note string) string {
	return fmt.Sprintf("| %s | %.2f s | %.2f s | %d MB | %.2f | %.2f | %.1f | %s |", name,
		u.wall.Seconds(), u.cpu.Seconds(), u.rssKB/1024,
		u.wall.Seconds()/floor.wall.Seconds(), u.cpu.Seconds()/floor.cpu.Seconds(),
		float64(u.rssKB)/float64(floor.rssKB), note)
}

// measure runs exe with args runs times under /usr/bin/time -v (env, if
// not empty, added to ours) and returns the best times and largest peak;
// prep, if not nil, runs before each run. A failing run fails t with its
// output.
func measure(t *testing.T, runs int, what, exe string, args []string, env string, prep func()) usage {
	t.Helper()
	var u usage
	for i := 0; i < runs; i++ {
		if prep != nil {
			prep()
		}
		cmd := exec.Command(timeBin, append([]string{"-v", exe}, args...)...)
		cmd.Env = os.Environ()
		if env != "" {
			cmd.Env = append(cmd.Env, env)
		}
		var stderr bytes.Buffer
		cmd.Stdout, cmd.Stderr = io.Discard, &stderr
		if err := cmd.Run(); err != nil {
			t.Fatalf("%s: %v\n%s", what, err, lastBytes(stderr.String(), 3000))
		}
		got, err := parseTimeV(stderr.String())
		if err != nil {
			t.Fatalf("%s: %v\n%s", what, err, lastBytes(stderr.String(), 3000))
		}
		if i == 0 || got.wall < u.wall {
			u.wall = got.wall
		}
		if i == 0 || got.cpu < u.cpu {
			u.cpu = got.cpu
		}
		u.rssKB = max(u.rssKB, got.rssKB)
	}
	return u
}

// parseTimeV reads the wall clock, user and system times and the maximum
// resident set size from GNU time's -v report (the last lines of out).
func parseTimeV(out string) (usage, error) {
	var u usage
	var user, sys float64
	found := 0
	for _, line := range strings.Split(out, "\n") {
		line = strings.TrimSpace(line)
		key, val, ok := strings.Cut(line, ": ")
		if !ok {
			continue
		}
		var err error
		switch key {
		case "User time (seconds)":
			user, err = strconv.ParseFloat(val, 64)
			found++
		case "System time (seconds)":
			sys, err = strconv.ParseFloat(val, 64)
			found++
		case "Maximum resident set size (kbytes)":
			u.rssKB, err = strconv.ParseInt(val, 10, 64)
			found++
		case "Elapsed (wall clock) time (h:mm:ss or m:ss)":
			u.wall, err = parseClock(val)
			found++
		}
		if err != nil {
			return u, fmt.Errorf("time -v: %q: %w", line, err)
		}
	}
	if found != 4 {
		return u, fmt.Errorf("time -v: found %d of the 4 figures", found)
	}
	u.cpu = time.Duration((user + sys) * float64(time.Second))
	return u, nil
}

// parseClock reads GNU time's "h:mm:ss" or "m:ss.ss".
func parseClock(s string) (time.Duration, error) {
	var secs float64
	for _, p := range strings.Split(s, ":") {
		v, err := strconv.ParseFloat(p, 64)
		if err != nil {
			return 0, err
		}
		secs = secs*60 + v
	}
	return time.Duration(secs * float64(time.Second)), nil
}

// reportLayout reads the layout and the computed rows from an annotate
// report written with --report.
func reportLayout(t *testing.T, path string) (string, int) {
	t.Helper()
	b, err := os.ReadFile(path)
	must(t, err)
	var r struct {
		Layout   string `json:"layout"`
		Computed int    `json:"computed"`
	}
	must(t, json.Unmarshal(b, &r))
	return r.Layout, r.Computed
}

func lastBytes(s string, n int) string {
	if len(s) > n {
		return "..." + s[len(s)-n:]
	}
	return s
}

// TestParseTimeV checks the reading of GNU time's report on a sample of
// its -v output (time 1.9, Debian).
func TestParseTimeV(t *testing.T) {
	out := "\tCommand being timed: \"true\"\n\tUser time (seconds): 1.25\n\tSystem time (seconds): 0.50\n" +
		"\tPercent of CPU this job got: 99%\n\tElapsed (wall clock) time (h:mm:ss or m:ss): 1:02.50\n" +
		"\tMaximum resident set size (kbytes): 233016\n\tExit status: 0\n"
	u, err := parseTimeV(out)
	if err != nil {
		t.Fatal(err)
	}
	if u.wall != 62500*time.Millisecond || u.cpu != 1750*time.Millisecond || u.rssKB != 233016 {
		t.Errorf("%+v", u)
	}
	if d, err := parseClock("1:00:01"); err != nil || d != 3601*time.Second {
		t.Errorf("1:00:01 = %v %v", d, err)
	}
	if _, err := parseTimeV("Exit status: 0\n"); err == nil {
		t.Error("a report without figures is not an error")
	}
}
