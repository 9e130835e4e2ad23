package importer_test

import (
	"context"
	"encoding/csv"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/fluecell/fluecell/funcs"
	"github.com/fluecell/fluecell/importer"
)

// The real-world corpus measures automatic detection against what a careful
// analyst computes from real public workbooks. testdata/realworld/expect.csv
// lists the files in the repository; devset.csv lists the development set,
// whose files are not in the repository (FLUECELL_DEVSET names their folder).
// Each reference total was computed independently of fluecell by
// testdata/realworld/reference.py from IPCC 2006 defaults; the working and
// source of every number are in the CSV files and their README.
const (
	realWorldDir     = "../testdata/realworld"
	realWorldTimeout = 3 * time.Minute // per file
)

// File kinds in expect.csv and devset.csv.
const (
	kindCompute   = "compute"   // fuel quantities an analyst turns into CO2
	kindNegative  = "negative"  // prices, factors, rates: nothing to compute
	kindNoCompute = "nocompute" // activity without a fuel quantity (capacity, generation, existing CO2): no fossil CO2
)

// expectation is one row of expect.csv or devset.csv.
type expectation struct {
	File           string
	Kind           string
	ComputableRows int
	MinShare       float64
	ReferenceTCO2  float64
	Tolerance      float64
	Working        string
	Source         string
}

// outcome is what Scan made of one file, with the verdict.
type outcome struct {
	exp      expectation
	computed int
	rows     int
	tco2     float64
	errors   int // warnings of severity error
	scanErr  error
	elapsed  time.Duration
	failures []string
	ran      bool // false when -run left the file out
}

// TestRealWorldCorpus scans every file of the corpus with the default engine
// and checks it against its expectation: compute files must compute at least
// min_share of their computable rows and land within tolerance of the
// reference total; negatives must compute nothing and raise no error-level
// warning; nocompute files must report no fossil CO2; no file may panic or
// fail with an internal error. The subtest "devset" runs the same checks on
// the development set when FLUECELL_DEVSET names its folder.
func TestRealWorldCorpus(t *testing.T) {
	e, err := funcs.New()
	if err != nil {
		t.Fatal(err)
	}
	t.Run("corpus", func(t *testing.T) {
		runCorpus(t, e, realWorldDir, filepath.Join(realWorldDir, "expect.csv"))
	})
	t.Run("devset", func(t *testing.T) {
		dir := os.Getenv("FLUECELL_DEVSET")
		if dir == "" {
			t.Skip("set FLUECELL_DEVSET to the folder of the development set (see testdata/realworld/README.md)")
		}
		runCorpus(t, e, dir, filepath.Join(realWorldDir, "devset.csv"))
	})
}

// runCorpus checks every file listed in the expectations file against the
// files in dir, one subtest per file, then logs the table and the summary.
func runCorpus(t *testing.T, e *funcs.Engine, dir, expectFile string) {
	t.Helper()
	exps := readExpectations(t, expectFile)
	var outs []*outcome
	for _, exp := range exps {
		o := &outcome{exp: exp}
		outs = append(outs, o)
		t.Run(exp.File, func(t *testing.T) {
			o.ran = true
			scanOne(t, e, filepath.Join(dir, exp.File), o)
			judge(o)
			for _, f := range o.failures {
				t.Error(f)
			}
		})
	}
	logTable(t, outs)
}

// readExpectations parses an expectations file and checks its values, so
// that a typo cannot make a check pass.
func readExpectations(t *testing.T, path string) []expectation {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatalf("%s: %v", path, err)
	}
	if len(recs) < 2 {
		t.Fatalf("%s: no expectations", path)
	}
	col := map[string]int{}
	for i, h := range recs[0] {
		col[h] = i
	}
	for _, h := range []string{"file", "kind", "computable_rows", "min_share", "reference_tco2", "tolerance", "working", "source"} {
		if _, ok := col[h]; !ok {
			t.Fatalf("%s: no column %q", path, h)
		}
	}
	var exps []expectation
	for n, r := range recs[1:] {
		line := n + 2
		get := func(h string) string { return strings.TrimSpace(r[col[h]]) }
		exp := expectation{File: get("file"), Kind: get("kind"), Working: get("working"), Source: get("source")}
		switch exp.Kind {
		case kindCompute:
			var errs []error
			exp.ComputableRows, errs = atoiErr(get("computable_rows"), errs)
			exp.MinShare, errs = atofErr(get("min_share"), errs)
			exp.ReferenceTCO2, errs = atofErr(get("reference_tco2"), errs)
			exp.Tolerance, errs = atofErr(get("tolerance"), errs)
			if err := errors.Join(errs...); err != nil {
				t.Fatalf("%s:%d: %v", path, line, err)
			}
			if exp.ComputableRows <= 0 || exp.ReferenceTCO2 <= 0 || exp.MinShare <= 0 || exp.MinShare > 1 || exp.Tolerance <= 0 {
				t.Fatalf("%s:%d: a compute file needs computable_rows > 0, reference_tco2 > 0, 0 < min_share <= 1 and tolerance > 0", path, line)
			}
			if exp.Source == "" || exp.Working == "" {
				t.Fatalf("%s:%d: a reference needs its working and its source", path, line)
			}
		case kindNegative, kindNoCompute:
			if exp.Working == "" {
				t.Fatalf("%s:%d: say why %s computes nothing", path, line, exp.File)
			}
		default:
			t.Fatalf("%s:%d: kind %q: want %s, %s or %s", path, line, exp.Kind, kindCompute, kindNegative, kindNoCompute)
		}
		exps = append(exps, exp)
	}
	return exps
}

func atoiErr(s string, errs []error) (int, []error) {
	v, err := strconv.Atoi(s)
	if err != nil {
		errs = append(errs, err)
	}
	return v, errs
}

func atofErr(s string, errs []error) (float64, []error) {
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		errs = append(errs, err)
	}
	return v, errs
}

// scanOne scans path with default options and records the result in o. A
// panic is recorded as a failure rather than ending the whole run.
func scanOne(t *testing.T, e *funcs.Engine, path string, o *outcome) {
	t.Helper()
	if _, err := os.Stat(path); err != nil {
		o.scanErr = err
		return
	}
	ctx, cancel := context.WithTimeout(t.Context(), realWorldTimeout)
	defer cancel()
	start := time.Now()
	defer func() {
		o.elapsed = time.Since(start)
		if r := recover(); r != nil {
			o.scanErr = fmt.Errorf("panic: %v", r)
		}
	}()
	res, err := importer.Scan(ctx, e, path, importer.Options{})
	if err != nil {
		o.scanErr = err
		return
	}
	rep := res.Report
	o.computed, o.rows, o.tco2 = rep.Computed, rep.Rows, rep.Totals.TCO2
	o.errors = rep.Count(importer.SevError)
}

// judge fills o.failures from the outcome and the expectation.
func judge(o *outcome) {
	exp := o.exp
	fail := func(format string, args ...any) { o.failures = append(o.failures, fmt.Sprintf(format, args...)) }
	if o.scanErr != nil {
		var ie *importer.Error
		noTable := errors.As(o.scanErr, &ie) && ie.Code == importer.ErrNoTable
		if exp.Kind == kindCompute || !noTable {
			fail("%s (%s): scan failed: %v", exp.File, exp.Kind, o.scanErr)
		}
		return
	}
	if math.IsNaN(o.tco2) || math.IsInf(o.tco2, 0) {
		fail("%s: total tCO2 is %v", exp.File, o.tco2)
		return
	}
	switch exp.Kind {
	case kindCompute:
		need := int(math.Ceil(exp.MinShare * float64(exp.ComputableRows)))
		if o.computed < need {
			fail("%s: computed %d rows, want at least %d (%.0f%% of %d computable rows)",
				exp.File, o.computed, need, 100*exp.MinShare, exp.ComputableRows)
		}
		if dev := relDev(o.tco2, exp.ReferenceTCO2); dev > exp.Tolerance {
			fail("%s: total %.6g tCO2, reference %.6g tCO2 (%+.1f%%, tolerance %.0f%%); reference: %s [%s]",
				exp.File, o.tco2, exp.ReferenceTCO2, 100*(o.tco2/exp.ReferenceTCO2-1), 100*exp.Tolerance, exp.Working, exp.Source)
		}
	case kindNegative:
		if o.computed != 0 || o.tco2 != 0 {
			fail("%s: a %s (%s) computed %d rows, %.6g tCO2; want nothing", exp.File, exp.Kind, exp.Working, o.computed, o.tco2)
		}
		if o.errors != 0 {
			fail("%s: a %s (%s) got %d warnings of severity error; want none", exp.File, exp.Kind, exp.Working, o.errors)
		}
	case kindNoCompute:
		if o.tco2 != 0 {
			fail("%s: reported %.6g t of fossil CO2; want none (%s)", exp.File, o.tco2, exp.Working)
		}
	}
}

// relDev is |got-want|/want.
func relDev(got, want float64) float64 {
	return math.Abs(got-want) / want
}

// logTable logs one line per file and the summary of the run.
func logTable(t *testing.T, outs []*outcome) {
	t.Helper()
	var b strings.Builder
	fmt.Fprintf(&b, "\n%-64s %-9s %15s %13s %13s %8s %8s  %s\n", "file", "kind", "computed/rows", "tCO2", "reference", "dev", "ms", "verdict")
	var computable, computedCapped, inTol, compute, over, clean, quiet int
	for _, o := range outs {
		if !o.ran {
			continue
		}
		exp := o.exp
		verdict := "ok"
		if len(o.failures) > 0 {
			verdict = "FAIL"
		}
		if o.scanErr != nil {
			verdict += " (" + shorten(o.scanErr.Error(), 60) + ")"
		}
		rows := fmt.Sprintf("%d/%d", o.computed, exp.ComputableRows)
		ref, dev := "-", "-"
		if exp.Kind == kindCompute {
			ref = fmt.Sprintf("%.4g", exp.ReferenceTCO2)
			dev = fmt.Sprintf("%+.1f%%", 100*(o.tco2/exp.ReferenceTCO2-1))
			compute++
			computable += exp.ComputableRows
			computedCapped += min(o.computed, exp.ComputableRows)
			if o.computed > exp.ComputableRows {
				over++
			}
			if o.scanErr == nil && relDev(o.tco2, exp.ReferenceTCO2) <= exp.Tolerance {
				inTol++
			}
		} else {
			rows = fmt.Sprintf("%d/-", o.computed)
			quiet++
			if len(o.failures) == 0 {
				clean++
			}
		}
		fmt.Fprintf(&b, "%-64s %-9s %15s %13.4g %13s %8s %8d  %s\n",
			shorten(exp.File, 64), exp.Kind, rows, o.tco2, ref, dev, o.elapsed.Milliseconds(), verdict)
	}
	share := 0.0
	if computable > 0 {
		share = float64(computedCapped) / float64(computable)
	}
	fmt.Fprintf(&b, "summary: %.1f%% of computable rows computed (%d/%d, capped per file; %d files computed more rows than computable); %d/%d compute files within tolerance; %d/%d negative and nocompute files clean",
		100*share, computedCapped, computable, over, inTol, compute, clean, quiet)
	t.Logf("%s", b.String())
}

// shorten puts s on one line of at most n characters.
func shorten(s string, n int) string {
	r := []rune(strings.ReplaceAll(s, "\n", " "))
	if len(r) <= n {
		return string(r)
	}
	return string(r[:n-1]) + "…"
}
