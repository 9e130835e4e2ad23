package batch_test

import (
	"context"
	"encoding/csv"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/fluecell/fluecell/funcs"
	"github.com/fluecell/fluecell/importer"
	"github.com/fluecell/fluecell/importer/batch"
	"github.com/fluecell/fluecell/importer/demo"
)

// demoFolder writes the demo workbooks into three regions, one copy
// under a name a spreadsheet would read as a formula, and one broken
// workbook: 11 workbooks in all.
func demoFolder(t *testing.T) string {
	t.Helper()
	in := t.TempDir()
	for _, region := range []string{"north", "south", "west"} {
		if _, err := demo.Write(filepath.Join(in, region)); err != nil {
			t.Fatal(err)
		}
	}
	b, err := os.ReadFile(filepath.Join(in, "north", demo.Names()[1]))
	if err != nil {
		t.Fatal(err)
	}
	os.WriteFile(filepath.Join(in, "=HYPERLINK(1).xlsx"), b, 0o644)
	os.WriteFile(filepath.Join(in, "broken.xlsx"), []byte("PK\x03\x04 truncated"), 0o644)
	return in
}

// runShard annotates shard (zero: every file) of in into out with the real
// annotator and writes its summary CSV to sum.
func runShard(t *testing.T, in, out, sum string, shard batch.Shard) *batch.Summary {
	t.Helper()
	e, err := funcs.New()
	if err != nil {
		t.Fatal(err)
	}
	s, err := batch.Run(context.Background(), batch.Config{InDir: in, OutDir: out, Jobs: 2, Shard: shard, Fingerprint: "merge test",
		Annotate: func(ctx context.Context, src, dst string) (batch.Outcome, error) {
			rep, err := importer.Annotate(ctx, e, src, dst, importer.Options{})
			if err != nil {
				return batch.Outcome{}, err
			}
			return batch.Outcome{Rows: rep.Rows, Computed: rep.Computed, TCO2: rep.Totals.TCO2, TCO2e: rep.Totals.TCO2e, Warnings: len(rep.Warnings)}, nil
		}})
	if err != nil {
		t.Fatal(err)
	}
	if err := batch.WriteSummaryCSV(sum, s); err != nil {
		t.Fatal(err)
	}
	return s
}

func readCSV(t *testing.T, path string) [][]string {
	t.Helper()
	f, err := os.Open(path)
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

// TestMergeShardsOfDemo merges the summaries of three shards and checks
// the result against one unsharded run of the same folder: the same files,
// each once, and the same totals and counts by status.
func TestMergeShardsOfDemo(t *testing.T) {
	in := demoFolder(t)
	out := filepath.Join(t.TempDir(), "out")
	var shards []string
	for i := 1; i <= 3; i++ {
		p := filepath.Join(t.TempDir(), fmt.Sprintf("summary-%d.csv", i))
		runShard(t, in, out, p, batch.Shard{Index: i, Count: 3})
		shards = append(shards, p)
	}
	whole := runShard(t, in, filepath.Join(t.TempDir(), "whole"), filepath.Join(t.TempDir(), "whole.csv"), batch.Shard{})
	if len(whole.Files) != 11 {
		t.Fatalf("the unsharded run saw %d workbooks, want 11", len(whole.Files))
	}

	m, err := batch.MergeSummaries(shards)
	if err != nil {
		t.Fatal(err)
	}
	if err := batch.CheckShards(m, 3); err != nil {
		t.Errorf("the summaries of shards 1/3, 2/3 and 3/3: %v", err)
	}
	merged := filepath.Join(t.TempDir(), "all.csv")
	if err := batch.WriteMergedCSV(merged, m); err != nil {
		t.Fatal(err)
	}
	recs := readCSV(t, merged)
	if got, want := strings.Join(recs[0], ","), "file,status,rows,computed,tCO2,tCO2e,warnings,error,seconds,output,sheets,"+kindHeader+",files"; got != want {
		t.Fatalf("header %q, want %q", got, want)
	}
	if got, want := len(recs), 1+11+7; got != want {
		t.Fatalf("%d lines, want %d (header, 11 files, 7 totals)", got, want)
	}
	files, totals := recs[1:12], recs[12:]
	var want2, want2e float64
	status := map[string]int{}
	for i, f := range whole.Files {
		name := f.File
		if strings.HasPrefix(name, "=") {
			name = "'" + name // neutralised: a spreadsheet shows it as text
		}
		if files[i][0] != name || files[i][1] != f.Status || files[i][18] != "1" {
			t.Errorf("merged row %d = %v, want file %q status %q (as the unsharded run)", i, files[i], name, f.Status)
		}
		if f.Status != batch.StatusFailed && files[i][4] != strconv.FormatFloat(f.Outcome.TCO2, 'f', -1, 64) {
			t.Errorf("%s: tCO2 %s, the unsharded run %v", f.File, files[i][4], f.Outcome.TCO2)
		}
		want2 += f.Outcome.TCO2
		want2e += f.Outcome.TCO2e
		status[f.Status]++
	}
	if files[0][0] != "'=HYPERLINK(1).xlsx" {
		t.Errorf("first file %q: the formula-like name is not neutralised", files[0][0])
	}
	all := totals[0]
	if all[0] != "" || all[1] != "total" || all[18] != "11" {
		t.Fatalf("total row %v", all)
	}
	for col, want := range map[int]float64{4: want2, 5: want2e} {
		got, err := strconv.ParseFloat(all[col], 64)
		if err != nil || math.Abs(got-want) > 1e-6 {
			t.Errorf("total %s = %q, the unsharded run gives %v", recs[0][col], all[col], want)
		}
	}
	if want2 == 0 || want2e <= want2 {
		t.Errorf("demo totals %v tCO2, %v tCO2e: expected tCO2e above tCO2 (other gases count in tCO2e only)", want2, want2e)
	}
	for i, s := range []string{"ok", "partial", "nothing computed", "up-to-date", "failed", "unreadable"} {
		row := totals[1+i]
		if row[1] != "total "+s || row[18] != strconv.Itoa(status[s]) {
			t.Errorf("total row for %s = %v, want %d files", s, row, status[s])
		}
	}
	if status["failed"] != 1 || totals[5][4] != "" {
		t.Errorf("failed: %d files, total row %v (want 1 file and no tonnes)", status["failed"], totals[5])
	}

	// A merged summary merges again to the same content.
	again, err := batch.MergeSummaries([]string{merged})
	if err != nil {
		t.Fatal(err)
	}
	merged2 := filepath.Join(t.TempDir(), "again.csv")
	if err := batch.WriteMergedCSV(merged2, again); err != nil {
		t.Fatal(err)
	}
	a, _ := os.ReadFile(merged)
	b, _ := os.ReadFile(merged2)
	if string(a) != string(b) {
		t.Errorf("re-merging the merged summary changed it:\n%s\n---\n%s", a, b)
	}

	// Shards that overlap are refused, naming both summaries.
	_, err = batch.MergeSummaries(append(shards, filepath.Join(filepath.Dir(shards[0]), "..", filepath.Base(filepath.Dir(shards[0])), "summary-1.csv")))
	if err == nil || !strings.Contains(err.Error(), "listed twice") || strings.Count(err.Error(), "summary-1.csv") != 2 {
		t.Errorf("a summary given twice: %v", err)
	}
}

func writeFile(t *testing.T, name, content string) string {
	t.Helper()
	p := filepath.Join(t.TempDir(), name)
	if err := os.WriteFile(p, []byte(content), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

const header = "file,status,rows,computed,tCO2,tCO2e,warnings,error,seconds,output,sheets\n"

func TestMergeRefusesWhatIsNotASummary(t *testing.T) {
	for _, c := range []struct{ name, content, want string }{
		{"empty", "", "is empty; a summary has at least its header line file,status,rows"},
		{"other CSV", "site,fuel,quantity\nA,diesel,3\n", `is not a batch summary: its first line is "site,fuel,quantity"`},
		{"a workbook", "PK\x03\x04\x14\x00\x06\x00\x08\x00\x00\x00!\x00", "is not a batch summary"},
		{"unknown status", header + "a.xlsx,done,1,1,0.5,0.5,0,,0.1,a.xlsx,\n", `line 2: status "done": want one of ok, partial, nothing computed, up-to-date, failed, unreadable`},
		{"infinite tCO2", header + "a.xlsx,ok,1,1,+Inf,1,0,,0.1,a.xlsx,\n", `line 2: tCO2 "+Inf": want a finite decimal number`},
		{"NaN tCO2e", header + "a.xlsx,ok,1,1,1,NaN,0,,0.1,a.xlsx,\n", `line 2: tCO2e "NaN": want a finite decimal number`},
		{"negative rows", header + "a.xlsx,ok,-1,1,1,1,0,,0.1,a.xlsx,\n", `line 2: rows "-1": want a whole number from 0 to`},
		{"negative seconds", header + "a.xlsx,failed,,,,,,boom,-3,a.xlsx,\n", `line 2: seconds "-3": want a finite decimal number >= 0`},
		{"short row", header + "a.xlsx,ok,1\n", "wrong number of fields"},
		{"no file name", header + ",ok,1,1,1,1,0,,0.1,a.xlsx,\n", "line 2: the file column is empty"},
		{"same file twice", header + "a.xlsx,ok,1,1,1,1,0,,0.1,a.xlsx,\nb.xlsx,ok,1,1,1,1,0,,0.1,b.xlsx,\na.xlsx,ok,1,1,1,1,0,,0.1,a.xlsx,\n", `"a.xlsx" is listed twice`},
	} {
		t.Run(c.name, func(t *testing.T) {
			p := writeFile(t, "shard.csv", c.content)
			_, err := batch.MergeSummaries([]string{p})
			if err == nil || !strings.Contains(err.Error(), c.want) || !strings.Contains(err.Error(), p) {
				t.Errorf("got %v, want an error naming %s and saying %q", err, p, c.want)
			}
		})
	}
	if _, err := batch.MergeSummaries(nil); err == nil {
		t.Error("no summaries: no error")
	}
	if _, err := batch.MergeSummaries([]string{t.TempDir()}); err == nil || !strings.Contains(err.Error(), "not a regular file") {
		t.Errorf("a folder: %v", err)
	}
}

// TestMergeTotals checks the arithmetic of the total rows on rows written
// by hand: tCO2 and tCO2e are summed apart, failed files count but add no
// tonnes, an unreadable folder is counted apart from the workbooks, and a
// summary saved by a spreadsheet (BOM, quoted negative
// number) still reads.
func TestMergeTotals(t *testing.T) {
	a := writeFile(t, "a.csv", "\uFEFF"+header+
		"x/one.xlsx,ok,10,10,1.1,1.2,0,,0.5,x/one.xlsx,S: computed\n"+
		"x/two.xlsx,partial,10,4,2.2,2.4,3,,0.25,x/two.xlsx,S: partial\n")
	b := writeFile(t, "b.csv", header+
		"y/credit.csv,ok,2,2,'-0.3,-0.3,0,,0.125,y/credit.csv,\n"+
		"y/bad.xlsx,failed,,,,,,not a zip file,0.5,y/bad.xlsx,\n"+
		"@SUM(A1).xlsx,up-to-date,5,5,4,4.5,0,,0,@SUM(A1).xlsx,-S: x\n"+
		"y/locked/,unreadable,,,,,,permission denied,0,,\n"+
		" =cmd.csv,ok,0,0,0,0,0,,0, =cmd.csv,\n")
	m, err := batch.MergeSummaries([]string{a, b})
	if err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(t.TempDir(), "m.csv")
	if err := batch.WriteMergedCSV(out, m); err != nil {
		t.Fatal(err)
	}
	got := readCSV(t, out)
	want := [][]string{
		{"file", "status", "rows", "computed", "tCO2", "tCO2e", "warnings", "error", "seconds", "output", "sheets", "files"},
		{"' =cmd.csv", "ok", "0", "0", "0", "0", "0", "", "0.000", "' =cmd.csv", "", "1"},
		{"'@SUM(A1).xlsx", "up-to-date", "5", "5", "4", "4.5", "0", "", "0.000", "'@SUM(A1).xlsx", "'-S: x", "1"},
		{"x/one.xlsx", "ok", "10", "10", "1.1", "1.2", "0", "", "0.500", "x/one.xlsx", "S: computed", "1"},
		{"x/two.xlsx", "partial", "10", "4", "2.2", "2.4", "3", "", "0.250", "x/two.xlsx", "S: partial", "1"},
		{"y/bad.xlsx", "failed", "", "", "", "", "", "not a zip file", "0.500", "y/bad.xlsx", "", "1"},
		{"y/credit.csv", "ok", "2", "2", "-0.3", "-0.3", "0", "", "0.125", "y/credit.csv", "", "1"},
		{"y/locked/", "unreadable", "", "", "", "", "", "permission denied", "0.000", "", "", ""},
		// 1.1+2.2-0.3+4 = 7 tCO2; 1.2+2.4-0.3+4.5 = 7.8 tCO2e
		{"", "total", "27", "21", "7", "7.8", "3", "", "1.375", "", "", "6"},
		{"", "total ok", "12", "12", "0.8", "0.9", "0", "", "0.625", "", "", "3"},
		{"", "total partial", "10", "4", "2.2", "2.4", "3", "", "0.250", "", "", "1"},
		{"", "total nothing computed", "0", "0", "0", "0", "0", "", "0.000", "", "", "0"},
		{"", "total up-to-date", "5", "5", "4", "4.5", "0", "", "0.000", "", "", "1"},
		{"", "total failed", "", "", "", "", "", "", "0.500", "", "", "1"},
		{"", "total unreadable", "", "", "", "", "", "", "0.000", "", "", "1"},
	}
	// These summaries have no kind columns: the kinds are unknown, written
	// empty, except for a total that counts no file.
	for i, r := range want {
		fill := ""
		if r[1] == "total nothing computed" {
			fill = "0"
		}
		kinds := strings.Split(strings.Repeat(","+fill, batch.NumKinds)[1:], ",")
		if i == 0 {
			kinds = strings.Split(kindHeader, ",")
		}
		want[i] = append(append(r[:len(r)-1:len(r)-1], kinds...), r[len(r)-1])
	}
	if fmt.Sprint(got) != fmt.Sprint(want) {
		t.Errorf("merged:\n%q\nwant:\n%q", got, want)
	}
}

// kindHeader are the kind columns of a summary.
const kindHeader = "stationary_combustion tCO2e,mobile_combustion tCO2e,fugitive tCO2e,electricity_heat tCO2e,embodied tCO2e,other tCO2e,tCO2 biogenic"

// TestMergeKinds: each kind is summed apart over the files, and no total
// adds one kind to another; Scope 1 (tCO2, tCO2e) holds no embodied tonnes.
func TestMergeKinds(t *testing.T) {
	a := writeFile(t, "a.csv", strings.TrimSuffix(header, "\n")+","+kindHeader+"\n"+
		"fuel.xlsx,partial,16,13,343.04,344.21,3,,0.1,fuel.xlsx,,344.21,0,0,0,0,0,4.19328\n"+
		"plan.xlsx,partial,6,5,0,0,1,,0.1,plan.xlsx,,0,0,0,0,719696.196,0,0\n"+
		"power.xlsx,ok,2,2,0,0,0,,0.1,power.xlsx,,0,0,0,1.2747,0,0,0\n")
	m, err := batch.MergeSummaries([]string{a})
	if err != nil {
		t.Fatal(err)
	}
	tot := m.Totals[0]
	if tot.NoKinds || tot.TCO2e != 344.21 || tot.ByKind[0] != 344.21 || tot.ByKind[3] != 1.2747 || tot.ByKind[4] != 719696.196 || tot.ByKind[6] != 4.19328 {
		t.Errorf("total %+v: want Scope 1 344.21 t CO2e, electricity 1.2747, embodied 719696.196 and biogenic 4.19328 apart", tot)
	}
	out := filepath.Join(t.TempDir(), "m.csv")
	if err := batch.WriteMergedCSV(out, m); err != nil {
		t.Fatal(err)
	}
	recs := readCSV(t, out)
	last := recs[4] // the total over every workbook
	if got := strings.Join(last[11:18], ","); last[1] != "total" || got != "344.21,0,0,1.2747,719696.196,0,4.19328" {
		t.Errorf("total row %q", last)
	}
}

func TestMergeOverflow(t *testing.T) {
	p := writeFile(t, "big.csv", header+
		"a.xlsx,ok,1,1,1e308,1,0,,0,a.xlsx,\n"+
		"b.xlsx,ok,1,1,1e308,1,0,,0,b.xlsx,\n")
	if _, err := batch.MergeSummaries([]string{p}); err == nil || !strings.Contains(err.Error(), "tCO2 total of 2 files (total) is beyond the float64 range") {
		t.Errorf("overflowing total: %v", err)
	}
}

func TestMergeWriteIsAtomic(t *testing.T) {
	p := writeFile(t, "a.csv", header+"a.xlsx,ok,1,1,1,1,0,,0,a.xlsx,\n")
	m, err := batch.MergeSummaries([]string{p})
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	if err := batch.WriteMergedCSV(filepath.Join(dir, "missing", "m.csv"), m); err == nil {
		t.Error("writing into a missing folder: no error")
	}
	if err := batch.WriteMergedCSV(filepath.Join(dir, "m.csv"), m); err != nil {
		t.Fatal(err)
	}
	ents, _ := os.ReadDir(dir)
	if len(ents) != 1 || ents[0].Name() != "m.csv" {
		t.Errorf("folder holds %v, want m.csv alone", ents)
	}
}

// TestCheckShards writes the summaries of three shards by hand, each file
// in the summary of the shard that takes it, then breaks that in the ways a
// job array can.
func TestCheckShards(t *testing.T) {
	var groups [3][]string
	for c := 'a'; c <= 'r'; c++ {
		name := string(c) + ".xlsx"
		for i := 1; i <= 3; i++ {
			if (batch.Shard{Index: i, Count: 3}).Takes(name) {
				groups[i-1] = append(groups[i-1], name)
			}
		}
	}
	for i, g := range groups {
		if len(g) < 2 {
			t.Fatalf("shard %d/3 takes %v: too few names for this test", i+1, g)
		}
	}
	summary := func(files ...string) string {
		var b strings.Builder
		b.WriteString(header)
		for _, f := range files {
			fmt.Fprintf(&b, "%s,ok,1,1,1,1,0,,0,%s,\n", f, f)
		}
		return writeFile(t, "s.csv", b.String())
	}
	s1, s2, s3 := summary(groups[0]...), summary(groups[1]...), summary(groups[2]...)
	check := func(n int, paths ...string) error {
		t.Helper()
		m, err := batch.MergeSummaries(paths)
		if err != nil {
			t.Fatal(err)
		}
		return batch.CheckShards(m, n)
	}
	if err := check(3, s3, s1, s2); err != nil {
		t.Errorf("the three shards: %v", err)
	}
	if err := check(3, s1, s3); err == nil || !strings.Contains(err.Error(), "2 summaries for 3 shards") {
		t.Errorf("a missing shard: %v", err)
	}
	// A file in the summary of a shard that does not take it: the run had
	// another N.
	moved := summary(append(groups[0][1:], groups[1][0])...)
	rest := summary(groups[1][1:]...)
	if err := check(3, moved, rest, s3); err == nil || !strings.Contains(err.Error(), "holds files of shard") || !strings.Contains(err.Error(), groups[1][0]) || !strings.Contains(err.Error(), "another N than 3") {
		t.Errorf("a file in the wrong shard: %v", err)
	}
	// One shard's files in two summaries, another shard's in none.
	half1, half2 := summary(groups[0][:1]...), summary(groups[0][1:]...)
	if err := check(3, half1, half2, s2); err == nil || !strings.Contains(err.Error(), "both hold files of shard 1/3") {
		t.Errorf("one shard twice: %v", err)
	}
	if err := check(0, s1); err == nil || !strings.Contains(err.Error(), "shards 0") {
		t.Errorf("0 shards: %v", err)
	}
}
