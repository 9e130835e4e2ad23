package importer

import (
	"math"
	"sort"
	"strings"

	"github.com/fluecell/fluecell/funcs"
)

// Outliers by fuel and unit, and prices per unit that point at a slip.
//
// A value typed with an extra or a missing digit, or with its decimal
// point one place off, is ten times too large or too small. Amounts of one
// fuel in one unit are often heavy-tailed (one building burns twenty times
// what another does), so the test works on the logarithm of the amounts,
// where a factor is a distance, and uses the median and the median absolute
// deviation, which the slip itself cannot move much:
//
//	M = 0.6745 (ln x − median ln x) / MAD,   MAD = median |ln x − median ln x|
//
// the modified z-score of Iglewicz and Hoaglin, who recommend |M| > 3.5 as
// the mark of a potential outlier (B. Iglewicz and D. C. Hoaglin, How to
// Detect and Handle Outliers, ASQC Basic References in Quality Control
// vol. 16, 1993; from memory). When MAD is 0 (most amounts equal) every
// other value passes this step. Three conditions of our own keep
// honest spreads quiet: the value is at least outlierFactor times above or
// below the median (a factor of 2 or 3 between months or sites is ordinary),
// and between the median and the value the sorted amounts jump at least by
// outlierGap somewhere (amounts that fill the range evenly, as a growing
// series or a campus of buildings of every size does, are not a slip);
// and three or more neighbouring rows flagged on the same side are a
// section of another kind, not a slip (dropRuns).

// Outlier thresholds.
const (
	outlierMinRows = 5    // rows of a fuel and unit before the robust test applies
	outlierZ       = 3.5  // modified z-score (Iglewicz and Hoaglin 1993, from memory)
	outlierFactor  = 5.0  // at least this many times the median, or 1/this (our choice: about halfway, on a log scale, between an ordinary 3 and a slip of 10)
	outlierGap     = 2.0  // a jump of this factor between neighbouring sorted amounts (our choice)
	outlierSmall   = 100. // groups of 3 or 4 rows: only a factor of 100 is flagged
	outlierRun     = 3    // so many neighbouring rows flagged together are a section, not a slip
)

// robustOutliers returns the median of vals (all > 0) and the indices of
// the values the robust test flags: nil when fewer than outlierMinRows.
// vals are in row order (for dropRuns) and are not changed.
func robustOutliers(vals []float64) (med float64, out []int) {
	n := len(vals)
	if n == 0 {
		return 0, nil
	}
	s := append([]float64(nil), vals...)
	sort.Float64s(s)
	med = median(s)
	if n < outlierMinRows {
		return med, nil
	}
	logs := make([]float64, n)
	for i, v := range s {
		logs[i] = math.Log(v)
	}
	lm := median(logs)
	dev := make([]float64, n)
	for i, l := range logs {
		dev[i] = math.Abs(l - lm)
	}
	sort.Float64s(dev)
	mad := median(dev)

	// gapUp[k]: the sorted values jump by outlierGap somewhere between the
	// median and s[k] (k at or above the median); gapDown likewise below.
	up, down := n/2, (n-1)/2
	gap := make([]bool, n)
	for k := up + 1; k < n; k++ {
		gap[k] = gap[k-1] || s[k] >= outlierGap*s[k-1]
	}
	for k := down - 1; k >= 0; k-- {
		gap[k] = gap[k+1] || s[k+1] >= outlierGap*s[k]
	}
	for i, v := range vals {
		r := v / med
		if r < outlierFactor && r > 1/outlierFactor {
			continue
		}
		d := math.Abs(math.Log(v) - lm)
		if mad > 0 && 0.6745*d/mad <= outlierZ {
			continue
		}
		var k int
		if v > med {
			k = sort.SearchFloat64s(s, v)
		} else {
			k = sort.Search(n, func(j int) bool { return s[j] > v }) - 1
		}
		if gap[k] {
			out = append(out, i)
		}
	}
	return med, dropRuns(vals, med, out)
}

// dropRuns removes from flagged (indices into vals, ascending) every run of
// outlierRun or more neighbouring values on the same side of the median: a
// block of rows far from the rest is a section of another kind (annual rows
// above monthly ones, another site's meter), not a slip, which touches one
// row or two.
func dropRuns(vals []float64, med float64, flagged []int) []int {
	out := flagged[:0:0]
	for a := 0; a < len(flagged); {
		b := a + 1
		for b < len(flagged) && flagged[b] == flagged[b-1]+1 && (vals[flagged[b]] > med) == (vals[flagged[a]] > med) {
			b++
		}
		if b-a < outlierRun {
			out = append(out, flagged[a:b]...)
		}
		a = b
	}
	return out
}

// median of sorted values.
func median(s []float64) float64 {
	n := len(s)
	if n%2 == 1 {
		return s[n/2]
	}
	return (s[n/2-1] + s[n/2]) / 2
}

// outlierFinding is one flagged cell before it becomes a warning.
type outlierFinding struct {
	row, col int
	code     string
	msg      string
}

// checkOutliers flags amounts far from the median of their fuel and unit
// (robustOutliers; groups of 3 or 4 rows only at a factor of 100), and
// rows whose unit price is far from the others' (checkPrices). A row
// flagged by both gets one finding that gives both figures.
func (sc *scanCtx) checkOutliers(sheet string, samples *sampleSet) {
	var found []*outlierFinding
	at := map[[2]int]*outlierFinding{}
	for _, k := range samples.sortedKeys() {
		if strings.HasPrefix(k, pricePrefix) {
			continue
		}
		for _, g := range outlierGroups(k, samples.group(k)) {
			for _, f := range testGroup(g) {
				found = append(found, f)
				at[[2]int{f.row, f.col}] = f
			}
		}
	}
	found = sc.checkPrices(samples, found, at)
	for _, f := range found {
		sc.warn.add(sheet, f.col, f.row, SevWarning, f.code, f.msg+": computed, check it")
	}
}

// sampleGroup is a set of amounts tested together, with its name in the
// findings.
type sampleGroup struct {
	name string // "gas_diesel_oil in L", or "\"diesel\" (gas_diesel_oil in L)"
	ss   []sample
	// only, when set, lists the indices of ss this group judges; the
	// others are judged in their own name's group.
	only []int
}

// outlierGroups splits the amounts of one fuel and unit (key k) for the
// test. A workbook's own fuel name with outlierMinRows rows or more is a
// group of its own: two names that read as one fuel (diesel for the
// vehicles, heating oil for a boiler; both gas_diesel_oil) are used apart,
// and the spread between them would hide a slip within either. The rows of
// names with fewer rows are tested with the whole fuel, as are tables
// without a name per row.
func outlierGroups(k string, ss []sample) []sampleGroup {
	byWord := map[string]int{}
	for _, s := range ss {
		if s.word != "" {
			byWord[s.word]++
		}
	}
	big := 0
	for _, n := range byWord {
		if n >= outlierMinRows {
			big++
		}
	}
	if big == 0 || big == 1 && byWord[ss[0].word] == len(ss) {
		return []sampleGroup{{name: groupName(k), ss: ss}}
	}
	words := make([]string, 0, len(byWord))
	for w, n := range byWord {
		if n >= outlierMinRows {
			words = append(words, w)
		}
	}
	sort.Strings(words)
	var out []sampleGroup
	for _, w := range words {
		g := sampleGroup{name: quoteText(w) + " (" + groupName(k) + ")"}
		for _, s := range ss {
			if s.word == w {
				g.ss = append(g.ss, s)
			}
		}
		out = append(out, g)
	}
	// The rows of the other names, tested against the whole fuel.
	whole := sampleGroup{name: groupName(k), ss: ss}
	var rest []int
	for i, s := range ss {
		if byWord[s.word] < outlierMinRows {
			rest = append(rest, i)
		}
	}
	if len(rest) > 0 {
		whole.only = rest
		out = append(out, whole)
	}
	return out
}

// testGroup runs the robust test (robustOutliers; groups of 3 or 4 rows
// only at a factor of 100) over a group and returns its findings.
func testGroup(g sampleGroup) []*outlierFinding {
	ss := g.ss
	if len(ss) < 3 {
		return nil
	}
	vals := make([]float64, len(ss))
	for i, s := range ss {
		vals[i] = s.v
	}
	med, flagged := robustOutliers(vals)
	if len(ss) < outlierMinRows {
		for i, v := range vals {
			if v > outlierSmall*med || v < med/outlierSmall {
				flagged = append(flagged, i)
			}
		}
	}
	var out []*outlierFinding
	for _, i := range flagged {
		if g.only != nil && !containsInt(g.only, i) {
			continue // tested in its own name's group
		}
		s := ss[i]
		out = append(out, &outlierFinding{row: s.row, col: s.col, code: CodeValueOutlier,
			msg: funcs.FormatNumber(s.v) + " is " + timesText(s.v/med) + " the median " + funcs.FormatNumber(roundSig(med)) +
				" of the " + plural(len(ss), "row") + " of " + g.name + " (" + slipText(s.v, s.v/med) + ")"})
	}
	return out
}

func containsInt(xs []int, x int) bool {
	for _, y := range xs {
		if y == x {
			return true
		}
	}
	return false
}

// foldWord folds a workbook's fuel name for grouping: lower case, inner
// spaces collapsed, ends trimmed.
func foldWord(s string) string { return strings.ToLower(strings.Join(strings.Fields(s), " ")) }

// groupName says a sample group: "gas_diesel_oil in L".
func groupName(k string) string {
	parts := strings.SplitN(k, "|", 4)
	if len(parts) < 3 {
		return k
	}
	what := parts[2]
	if len(parts) == 4 {
		what += " in " + parts[3]
	}
	return what
}

// timesText says a ratio: "10.2 times", "112 times", "1/10".
func timesText(r float64) string {
	inv := r < 1
	if inv {
		r = 1 / r
	}
	if r < 20 {
		r = math.Round(r*10) / 10
	} else {
		r = math.Round(r)
	}
	if inv {
		return "1/" + funcs.FormatNumber(r)
	}
	return funcs.FormatNumber(r) + " times"
}

// slipText suggests the slip behind a value v that is r times its median:
// a decimal point one place off (with the value it would then be) near a
// factor of 10, a unit slip or a typo otherwise.
func slipText(v, r float64) string {
	p := math.Round(math.Log10(r))
	switch p {
	case 1:
		return "an extra digit or the decimal point one place to the right? " + funcs.FormatNumber(roundSig(v/10)) + " would fit"
	case -1:
		return "a missing digit or the decimal point one place to the left? " + funcs.FormatNumber(roundSig(v*10)) + " would fit"
	}
	return "a unit slip or a typo?"
}
