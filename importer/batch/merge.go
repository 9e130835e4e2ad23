package batch

import (
	"encoding/csv"
	"errors"
	"fmt"
	"github.com/fluecell/fluecell/importer/safetext"
	"io"
	"math"
	"os"
	"sort"
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/fluecell/fluecell/importer/atomicfile"
)

// summaryColumns returns the columns of a summary CSV, in order (see
// WriteSummaryCSV). A merged summary has one more column, "files".
func summaryColumns() []string {
	return append([]string{"file", "status", "rows", "computed", "tCO2", "tCO2e", "warnings", "error", "seconds", "output", "sheets"}, kindColumns()...)
}

// Column positions in a summary row.
const (
	fieldFile = iota
	fieldStatus
	fieldRows
	fieldComputed
	fieldTCO2
	fieldTCO2e
	fieldWarnings
	fieldError
	fieldSeconds
	fieldOutput
	fieldSheets
	fieldKinds                         // the first kind column (KindNames)
	fieldFiles = fieldKinds + NumKinds // merged summaries only
)

// totalStatuses returns the statuses a merged summary totals, in the
// order of its total rows.
func totalStatuses() []string {
	return []string{StatusOK, StatusPartial, StatusNone, StatusUpToDate, StatusFailed, StatusUnreadable}
}

// noOutcome reports whether rows of this status have empty counts.
func noOutcome(status string) bool { return status == StatusFailed || status == StatusUnreadable }

// MergedFile is one file's row in a merged summary.
type MergedFile struct {
	File    string // relative path, as the shard summary has it
	Status  string
	Outcome Outcome // zero for a failed file
	Error   string
	Seconds float64
	Output  string
	// NoKinds: the row came from a summary without kind columns; its
	// totals by kind are unknown.
	NoKinds bool
	// From is the shard summary the row came from, Line its line there.
	From string
	Line int
}

// Total adds up the files of one status, or of every status when Status
// is empty. The two kinds, tCO2 and tCO2e, are kept apart: a tCO2e figure
// already contains the CO2, and adding the two would count it twice.
type Total struct {
	Status   string
	Files    int
	Rows     int
	Computed int
	Warnings int
	TCO2     float64 // t CO2, Scope 1
	TCO2e    float64 // t CO2e, Scope 1
	// ByKind sums each kind apart (KindNames); kinds are never added together.
	ByKind  [NumKinds]float64
	NoKinds bool    // a file counted has no totals by kind: ByKind is unknown
	Seconds float64 // summed over files, not wall-clock time
}

// Merged is the combination of the summaries of a sharded batch.
type Merged struct {
	Files     []MergedFile // sorted by File
	Totals    []Total      // every workbook first, then one per status (ok, partial, nothing computed, up-to-date, failed, unreadable)
	Summaries []string     // the summary CSVs read, in the order given
}

// MergeSummaries reads the summary CSVs that the shards of a batch wrote
// (fluecell batch --shard I/N --summary FILE) and combines them. Every
// file must appear exactly once across all of them: a file listed twice
// is an error naming both summaries (the shards overlap, for instance
// runs with different N, or a summary of an older run among them).
// A path that is not a summary CSV, a row with an unknown status or a
// number that is not finite is an error naming the path and line. A
// merged summary (see WriteMergedCSV) is accepted as input too; its total
// rows are recomputed.
func MergeSummaries(paths []string) (*Merged, error) {
	if len(paths) == 0 {
		return nil, errors.New("batch merge: no summary CSV given")
	}
	m := &Merged{Summaries: append([]string(nil), paths...)}
	seen := map[string]int{}
	for _, p := range paths {
		rows, err := readShardSummary(p)
		if err != nil {
			return nil, err
		}
		for _, r := range rows {
			if i, dup := seen[r.File]; dup {
				prev := m.Files[i]
				return nil, fmt.Errorf("batch merge: %s is listed twice, in %s line %d and in %s line %d: merge the summaries of one run with one shard count (every file exactly once)",
					mergeQuote(r.File), prev.From, prev.Line, r.From, r.Line)
			}
			seen[r.File] = len(m.Files)
			m.Files = append(m.Files, r)
		}
	}
	sort.Slice(m.Files, func(i, j int) bool { return m.Files[i].File < m.Files[j].File })
	m.Totals = make([]Total, 1+len(totalStatuses()))
	for i, s := range totalStatuses() {
		m.Totals[1+i].Status = s
	}
	for _, f := range m.Files {
		for i := range m.Totals {
			t := &m.Totals[i]
			if (t.Status == "" && f.Status == StatusUnreadable) || (t.Status != "" && t.Status != f.Status) {
				continue
			}
			t.Files++
			t.Rows += f.Outcome.Rows
			t.Computed += f.Outcome.Computed
			t.Warnings += f.Outcome.Warnings
			t.TCO2 += f.Outcome.TCO2
			t.TCO2e += f.Outcome.TCO2e
			for k, v := range f.Outcome.ByKind {
				t.ByKind[k] += v
			}
			t.NoKinds = t.NoKinds || f.NoKinds && !noOutcome(f.Status)
			t.Seconds += f.Seconds
		}
	}
	for _, t := range m.Totals {
		sums := []struct {
			name string
			v    float64
		}{{"tCO2", t.TCO2}, {"tCO2e", t.TCO2e}, {"seconds", t.Seconds}}
		for k, v := range t.ByKind {
			sums = append(sums, struct {
				name string
				v    float64
			}{kindColumns()[k], v})
		}
		for _, k := range sums {
			if math.IsInf(k.v, 0) || math.IsNaN(k.v) {
				return nil, fmt.Errorf("batch merge: the %s total of %d files (%s) is beyond the float64 range (%g): check the files with the largest %s",
					k.name, t.Files, strings.TrimSpace("total "+t.Status), k.v, k.name)
			}
		}
	}
	return m, nil
}

// CheckShards checks that the summaries merged into m are those of shards
// 1 to n of one run: n summaries, the files of each belonging to a single
// shard (Shard.Takes), no two summaries holding the same shard. It catches
// a task that wrote no summary (its files would be silently missing) and a
// summary of a run with another shard count. A summary with no file (a
// shard that took none) cannot be told apart and passes.
func CheckShards(m *Merged, n int) error {
	if n < 1 || n > 1_000_000 {
		return fmt.Errorf("batch merge: shards %d: give the N of --shard I/N, between 1 and 1000000", n)
	}
	if len(m.Summaries) != n {
		return fmt.Errorf("batch merge: %d summaries for %d shards: every task I of 1..%d must have written its summary (a task that wrote none did not finish; run it again)", len(m.Summaries), n, n)
	}
	type owner struct {
		shard Shard
		file  string // the first file seen of that summary
	}
	first := map[string]owner{} // summary path -> its shard
	for _, f := range m.Files {
		name := f.File
		if len(name) > 1 && name[0] == '\'' && safetext.CSVField(name[1:]) != name[1:] {
			name = name[1:] // neutralised by the writer of the summary
		}
		var sh Shard
		for i := 1; i <= n; i++ {
			if (Shard{Index: i, Count: n}).Takes(name) {
				sh = Shard{Index: i, Count: n}
				break
			}
		}
		o, seen := first[f.From]
		if !seen {
			first[f.From] = owner{sh, f.File}
			continue
		}
		if o.shard != sh {
			return fmt.Errorf("batch merge: %s holds files of shard %s (%s) and of shard %s (%s, line %d): was it written by a run with another N than %d?",
				f.From, o.shard, mergeQuote(o.file), sh, mergeQuote(f.File), f.Line, n)
		}
	}
	holder := map[Shard]string{}
	for _, p := range m.Summaries {
		o, ok := first[p]
		if !ok {
			continue // no file: any shard
		}
		if other, taken := holder[o.shard]; taken {
			return fmt.Errorf("batch merge: %s and %s both hold files of shard %s: the same task twice, or summaries of different runs", other, p, o.shard)
		}
		holder[o.shard] = p
	}
	return nil
}

// readShardSummary reads one summary CSV (or merged summary) and checks every
// row.
func readShardSummary(path string) ([]MergedFile, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, fmt.Errorf("batch merge: %w", err)
	}
	defer f.Close()
	if fi, err := f.Stat(); err == nil && !fi.Mode().IsRegular() {
		return nil, fmt.Errorf("batch merge: %s is not a regular file; give the summary CSVs that fluecell batch --summary wrote", path)
	}
	r := csv.NewReader(f)
	r.ReuseRecord = false
	head, err := r.Read()
	if err == io.EOF {
		return nil, fmt.Errorf("batch merge: %s is empty; a summary has at least its header line %s", path, strings.Join(summaryColumns(), ","))
	}
	if err != nil {
		return nil, fmt.Errorf("batch merge: %s is not a summary CSV: %w", path, err)
	}
	if len(head) > 0 {
		head[0] = strings.TrimPrefix(head[0], "\uFEFF") // saved by a spreadsheet program
	}
	merged, kinds, ok := summaryHeader(head)
	if !ok {
		return nil, fmt.Errorf("batch merge: %s is not a batch summary: its first line is %q, where a summary starts with %s (the CSV that fluecell batch --summary writes)",
			path, mergeClip(strings.Join(head, ","), 120), strings.Join(summaryColumns(), ","))
	}
	var rows []MergedFile
	for {
		rec, err := r.Read()
		if err == io.EOF {
			return rows, nil
		}
		if err != nil {
			return nil, fmt.Errorf("batch merge: %s: %w", path, err)
		}
		line, _ := r.FieldPos(0)
		if merged && rec[fieldFile] == "" {
			continue // a total row of a merged summary
		}
		row, err := parseSummaryRow(rec, kinds)
		if err != nil {
			return nil, fmt.Errorf("batch merge: %s line %d: %w", path, line, err)
		}
		row.From, row.Line = path, line
		rows = append(rows, row)
	}
}

// summaryHeader reports whether head is the header of a summary, and
// whether of a merged one.
func summaryHeader(head []string) (merged, kinds, ok bool) {
	cols := summaryColumns()
	switch len(head) {
	case len(cols), fieldKinds:
	case len(cols) + 1, fieldKinds + 1:
		merged = true
	default:
		return false, false, false
	}
	kinds = len(head) >= len(cols)
	if !kinds {
		cols = cols[:fieldKinds] // a summary of a version without the kind columns
	}
	if merged && head[len(cols)] != "files" {
		return false, false, false
	}
	for i, c := range cols {
		if head[i] != c {
			return false, false, false
		}
	}
	return merged, kinds, true
}

// parseSummaryRow reads the fields of one file's row.
// A row without kind columns (kinds false: a summary of a version that
// had none) has its kinds unknown (MergedFile.NoKinds).
func parseSummaryRow(rec []string, kinds bool) (MergedFile, error) {
	f := MergedFile{File: rec[fieldFile], Status: rec[fieldStatus], Error: rec[fieldError], Output: rec[fieldOutput], NoKinds: !kinds}
	if f.File == "" {
		return f, errors.New("the file column is empty")
	}
	known := false
	for _, s := range totalStatuses() {
		known = known || s == f.Status
	}
	if !known {
		return f, fmt.Errorf("status %q: want one of %s", mergeClip(f.Status, 40), strings.Join(totalStatuses(), ", "))
	}
	var err error
	if f.Seconds, err = mergeNumber(rec, fieldSeconds, true); err != nil {
		return f, err
	}
	if noOutcome(f.Status) {
		return f, nil // the counts are empty
	}
	o := &f.Outcome
	o.Sheets = rec[fieldSheets]
	for _, c := range []struct {
		col int
		dst *int
	}{{fieldRows, &o.Rows}, {fieldComputed, &o.Computed}, {fieldWarnings, &o.Warnings}} {
		n, err := strconv.Atoi(unquoteNumber(rec[c.col]))
		if err != nil || n < 0 || n > maxCount {
			return f, fmt.Errorf("%s %q: want a whole number from 0 to %d", summaryColumns()[c.col], mergeClip(rec[c.col], 40), maxCount)
		}
		*c.dst = n
	}
	if o.TCO2, err = mergeNumber(rec, fieldTCO2, false); err != nil {
		return f, err
	}
	if o.TCO2e, err = mergeNumber(rec, fieldTCO2e, false); err != nil {
		return f, err
	}
	for k := range o.ByKind {
		if !kinds {
			break
		}
		if o.ByKind[k], err = mergeNumber(rec, fieldKinds+k, false); err != nil {
			return f, err
		}
	}
	return f, nil
}

// maxCount bounds the counts of one file (rows, computed, warnings), so
// that no sum over files can overflow.
const maxCount = 1_000_000_000_000

// unquoteNumber drops the quote a spreadsheet-safe writer may have put
// before a negative number ("'-1.5").
func unquoteNumber(s string) string {
	if len(s) > 1 && s[0] == '\'' {
		return s[1:]
	}
	return s
}

// mergeNumber reads a finite decimal; nonNegative refuses values below 0.
func mergeNumber(rec []string, col int, nonNegative bool) (float64, error) {
	v, err := strconv.ParseFloat(unquoteNumber(rec[col]), 64)
	if err != nil || math.IsInf(v, 0) || math.IsNaN(v) || (nonNegative && v < 0) {
		want := "a finite decimal number"
		if nonNegative {
			want = "a finite decimal number >= 0"
		}
		return 0, fmt.Errorf("%s %q: want %s", summaryColumns()[col], mergeClip(rec[col], 40), want)
	}
	return v, nil
}

// WriteMergedCSV writes m atomically: the columns of a summary plus
// "files", one row per workbook (files = 1) or unreadable folder (files
// empty), then the total rows, whose file column is empty and whose status
// says what they add up ("total" over every workbook, "total ok", "total
// partial", ..., "total unreadable" counting folders). Text fields that a spreadsheet would read as
// a formula are neutralised (see safetext.CSVField).
func WriteMergedCSV(path string, m *Merged) error {
	return atomicfile.Write(path, func(out io.Writer) error {
		w := csv.NewWriter(out)
		w.Write(append(summaryColumns(), "files"))
		for _, f := range m.Files {
			rec := make([]string, len(summaryColumns())+1)
			rec[fieldFile], rec[fieldStatus] = safetext.CSVField(f.File), safetext.CSVField(f.Status)
			rec[fieldError], rec[fieldOutput] = safetext.CSVField(f.Error), safetext.CSVField(f.Output)
			rec[fieldSeconds] = strconv.FormatFloat(f.Seconds, 'f', 3, 64)
			if f.Status != StatusUnreadable {
				rec[fieldFiles] = "1"
			}
			if !noOutcome(f.Status) {
				o := f.Outcome
				rec[fieldRows], rec[fieldComputed], rec[fieldWarnings] = strconv.Itoa(o.Rows), strconv.Itoa(o.Computed), strconv.Itoa(o.Warnings)
				rec[fieldTCO2], rec[fieldTCO2e] = strconv.FormatFloat(o.TCO2, 'f', -1, 64), strconv.FormatFloat(o.TCO2e, 'f', -1, 64)
				rec[fieldSheets] = safetext.CSVField(o.Sheets)
				for k, v := range o.ByKind {
					if !f.NoKinds {
						rec[fieldKinds+k] = strconv.FormatFloat(v, 'f', -1, 64)
					}
				}
			}
			w.Write(rec)
		}
		for _, t := range m.Totals {
			rec := make([]string, len(summaryColumns())+1)
			rec[fieldStatus] = strings.TrimSpace("total " + t.Status)
			rec[fieldFiles] = strconv.Itoa(t.Files)
			rec[fieldSeconds] = strconv.FormatFloat(t.Seconds, 'f', 3, 64)
			if !noOutcome(t.Status) {
				rec[fieldRows], rec[fieldComputed], rec[fieldWarnings] = strconv.Itoa(t.Rows), strconv.Itoa(t.Computed), strconv.Itoa(t.Warnings)
				rec[fieldTCO2], rec[fieldTCO2e] = mergeTonnes(t.TCO2), mergeTonnes(t.TCO2e)
				for k, v := range t.ByKind {
					if !t.NoKinds {
						rec[fieldKinds+k] = mergeTonnes(v)
					}
				}
			}
			w.Write(rec)
		}
		w.Flush()
		return w.Error()
	})
}

// mergeTonnes formats a total to the gram (six decimals of a tonne), without
// trailing zeros, so that float sums print as 14.2 rather than
// 14.200000000000001.
func mergeTonnes(v float64) string {
	s := strconv.FormatFloat(v, 'f', 6, 64)
	s = strings.TrimRight(s, "0")
	s = strings.TrimSuffix(s, ".")
	if s == "-0" {
		s = "0"
	}
	return s
}

// mergeQuote shows a file name from an untrusted summary on one line.
func mergeQuote(s string) string { return strconv.Quote(mergeClip(s, 200)) }

// mergeClip shortens s to at most n bytes without cutting a UTF-8 character.
func mergeClip(s string, n int) string {
	if len(s) <= n {
		return s
	}
	for n > 0 && !utf8.RuneStart(s[n]) {
		n--
	}
	return s[:n] + "…"
}

// IsMergedSummary reports whether the file at path starts with the header
// of a merged summary, which a new merge may replace.
func IsMergedSummary(path string) bool {
	f, err := os.Open(path)
	if err != nil {
		return false
	}
	defer f.Close()
	head, err := csv.NewReader(io.LimitReader(f, 4096)).Read()
	if err != nil || len(head) == 0 {
		return false
	}
	head[0] = strings.TrimPrefix(head[0], "\uFEFF")
	merged, _, ok := summaryHeader(head)
	return ok && merged
}
