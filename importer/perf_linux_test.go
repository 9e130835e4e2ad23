//go:build linux

package importer

import (
	"context"
	"os"
	"os/exec"
	"path/filepath"
	"syscall"
	"testing"
	"time"

	"github.com/fluecell/fluecell/funcs"
)

// TestPerfTargets checks the performance targets of the annotation on the
// 100 000-row x 10-column fuel log against the excelize baseline
// (baselineExcelize) and openpyxl (testdata/openpyxl_baseline.py): at most
// 1.5 x the baseline's time, at most 2 x its peak memory, at least 4 x
// faster than openpyxl. Each program runs in its own process (this test
// binary, re-executed) so that its peak RSS can be read. Opt-in, because it
// takes a minute or two:
//
//	FLUECELL_PERF=1 go test ./importer -run TestPerfTargets -v
func TestPerfTargets(t *testing.T) {
	if os.Getenv("FLUECELL_PERF") == "" {
		t.Skip("set FLUECELL_PERF=1 to run the performance comparison")
	}
	in := fuelLog100k(t)
	dir := t.TempDir()
	run := func(mode string) (time.Duration, int64) {
		best, rss := time.Duration(0), int64(0)
		for i := 0; i < 3; i++ {
			cmd := exec.Command(os.Args[0], "-test.run=^TestPerfChild$")
			cmd.Env = append(os.Environ(), "FLUECELL_PERF_CHILD="+mode, "FLUECELL_PERF_IN="+in, "FLUECELL_PERF_OUT="+filepath.Join(dir, mode+".xlsx"))
			start := time.Now()
			if out, err := cmd.CombinedOutput(); err != nil {
				t.Fatalf("%s: %v\n%s", mode, err, out)
			}
			d := time.Since(start)
			ru := cmd.ProcessState.SysUsage().(*syscall.Rusage)
			if best == 0 || d < best {
				best = d
			}
			rss = max(rss, ru.Maxrss) // kB on Linux
		}
		return best, rss
	}
	baseT, baseRSS := run("baseline")
	annT, annRSS := run("annotate")
	t.Logf("excelize baseline: %v, peak RSS %d MB", baseT.Round(time.Millisecond), baseRSS/1024)
	t.Logf("fluecell annotate: %v, peak RSS %d MB (%.2f x time, %.2f x memory)", annT.Round(time.Millisecond), annRSS/1024,
		float64(annT)/float64(baseT), float64(annRSS)/float64(baseRSS))
	if float64(annT) > 1.5*float64(baseT) {
		t.Errorf("annotate takes %.2f x the baseline's time; the target is at most 1.5 x", float64(annT)/float64(baseT))
	}
	if float64(annRSS) > 2*float64(baseRSS) {
		t.Errorf("annotate peaks at %.2f x the baseline's memory; the target is at most 2 x", float64(annRSS)/float64(baseRSS))
	}
	py := "/usr/bin/python3"
	if err := exec.Command(py, "-c", "import openpyxl").Run(); err != nil {
		t.Logf("openpyxl comparison skipped: %s has no openpyxl (apt-get install python3-openpyxl)", py)
		return
	}
	script, _ := filepath.Abs(filepath.Join("testdata", "openpyxl_baseline.py"))
	cmd := exec.Command(py, script, in, filepath.Join(dir, "openpyxl.xlsx"))
	start := time.Now()
	if out, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("openpyxl: %v\n%s", err, out)
	}
	pyT := time.Since(start)
	pyRSS := cmd.ProcessState.SysUsage().(*syscall.Rusage).Maxrss
	t.Logf("openpyxl: %v, peak RSS %d MB; fluecell annotate is %.1f x faster", pyT.Round(time.Millisecond), pyRSS/1024, float64(pyT)/float64(annT))
	if float64(pyT) < 4*float64(annT) {
		t.Errorf("annotate is only %.1f x faster than openpyxl; the target is at least 4 x", float64(pyT)/float64(annT))
	}
}

// TestPerfChild is the child process of TestPerfTargets.
func TestPerfChild(t *testing.T) {
	mode := os.Getenv("FLUECELL_PERF_CHILD")
	if mode == "" {
		t.Skip("run by TestPerfTargets")
	}
	in, out := os.Getenv("FLUECELL_PERF_IN"), os.Getenv("FLUECELL_PERF_OUT")
	switch mode {
	case "baseline":
		if err := baselineExcelize(in, out); err != nil {
			t.Fatal(err)
		}
	case "annotate":
		e, err := funcs.New()
		if err != nil {
			t.Fatal(err)
		}
		rep, err := Annotate(context.Background(), e, in, out, Options{})
		if err != nil {
			t.Fatal(err)
		}
		if rep.Computed != 100_000 {
			t.Fatalf("computed %d rows", rep.Computed)
		}
	}
}
