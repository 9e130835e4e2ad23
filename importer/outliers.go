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
	if len(vals) == 0 {
		return 0, nil
	}
	s := append([]float64(nil), vals...)
	sort.Float64s(s)
	st := newGroupStats(s)
	if len(vals) < outlierMinRows {
		return st.med, nil
	}
	for i, v := range vals {
		if st.flag(v) {
			out = append(out, i)
		}
	}
	return st.med, dropRuns(out, func(i int) float64 { return vals[i] }, st.med)
}

// groupStats is what the robust test needs of a group of amounts: its
// values sorted, their median, the median and the median absolute
// deviation of their logarithms, and where the sorted values first jump by
// outlierGap above and below the median. It holds no more than the sorted
// values.
type groupStats struct {
	s                  []float64
	med, lm, mad       float64
	firstUp, firstDown int // the first index above the median whose value jumps from its neighbour below (len(s) for none), and below it (-1 for none)
}

// newGroupStats computes the statistics of sorted (ascending, all > 0),
// which it keeps.
func newGroupStats(sorted []float64) groupStats {
	s := sorted
	n := len(s)
	st := groupStats{s: s, med: median(s), firstUp: n, firstDown: -1}
	if n == 0 {
		return st
	}
	// The logarithms are in the order of the values, so their median is
	// that of the middle values'.
	if n%2 == 1 {
		st.lm = math.Log(s[n/2])
	} else {
		st.lm = (math.Log(s[n/2-1]) + math.Log(s[n/2])) / 2
	}
	st.mad = st.medianDeviation()
	up, down := n/2, (n-1)/2
	for k := up + 1; k < n; k++ {
		if s[k] >= outlierGap*s[k-1] {
			st.firstUp = k
			break
		}
	}
	for k := down - 1; k >= 0; k-- {
		if s[k+1] >= outlierGap*s[k] {
			st.firstDown = k
			break
		}
	}
	return st
}

// medianDeviation is the median of |ln s[i] − lm|. The deviations fall
// from the first value to the one nearest lm and rise after it, so they are
// taken in ascending order by walking outwards from there, without sorting.
func (st *groupStats) medianDeviation() float64 {
	s, n := st.s, len(st.s)
	dev := func(i int) float64 { return math.Abs(math.Log(s[i]) - st.lm) }
	hi := sort.Search(n, func(i int) bool { return math.Log(s[i]) >= st.lm })
	lo := hi - 1
	var prev, cur float64
	for k := 0; k <= n/2; k++ {
		prev = cur
		if lo >= 0 && (hi >= n || dev(lo) <= dev(hi)) {
			cur = dev(lo)
			lo--
		} else {
			cur = dev(hi)
			hi++
		}
	}
	if n%2 == 1 {
		return cur
	}
	return (prev + cur) / 2
}

// flag reports whether v fails the robust test: at least outlierFactor
// from the median, a modified z-score over outlierZ (or a zero MAD), and a
// jump of outlierGap in the sorted values between the median and v.
func (st *groupStats) flag(v float64) bool {
	r := v / st.med
	if r < outlierFactor && r > 1/outlierFactor {
		return false
	}
	d := math.Abs(math.Log(v) - st.lm)
	if st.mad > 0 && 0.6745*d/st.mad <= outlierZ {
		return false
	}
	s, n := st.s, len(st.s)
	var k int
	if v > st.med {
		k = sort.SearchFloat64s(s, v)
	} else {
		k = sort.Search(n, func(j int) bool { return s[j] > v }) - 1
	}
	return k >= st.firstUp || k <= st.firstDown
}

// dropRuns removes from flagged (indices into vals, ascending) every run of
// outlierRun or more neighbouring values on the same side of the median: a
// block of rows far from the rest is a section of another kind (annual rows
// above monthly ones, another site's meter), not a slip, which touches one
// row or two.
func dropRuns(flagged []int, val func(i int) float64, med float64) []int {
	out := flagged[:0:0]
	for a := 0; a < len(flagged); {
		b := a + 1
		for b < len(flagged) && flagged[b] == flagged[b-1]+1 && (val(flagged[b]) > med) == (val(flagged[a]) > med) {
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
		for _, g := range samples.outlierGroups(k) {
			for _, f := range samples.testGroup(g) {
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
// findings: the samples of one key, of one fuel word or of every word.
type sampleGroup struct {
	name string // "gas_diesel_oil in L", or "\"diesel\" (gas_diesel_oil in L)"
	key  int32
	word int32 // the fuel word of the group; -1 for every word of the key
	// own, when set, holds the words judged in a group of their own: the
	// whole fuel's group flags no row of theirs.
	own map[int32]bool
}

// outlierGroups splits the amounts of one fuel and unit (key k) for the
// test. A workbook's own fuel name with outlierMinRows rows or more is a
// group of its own: two names that read as one fuel (diesel for the
// vehicles, heating oil for a boiler; both gas_diesel_oil) are used apart,
// and the spread between them would hide a slip within either. The rows of
// names with fewer rows are tested with the whole fuel, as are tables
// without a name per row.
func (s *sampleSet) outlierGroups(k string) []sampleGroup {
	ki, ok := s.keyOf[k]
	if !ok {
		return nil
	}
	byWord := map[int32]int{}
	n, first := 0, int32(-1)
	idx := s.keyed(ki)
	for j := range idx.len() {
		w := s.word.at(int(idx.at(j)))
		if n == 0 {
			first = w
		}
		n++
		if w != 0 {
			byWord[w]++
		}
	}
	own := map[int32]bool{}
	for w, c := range byWord {
		if c >= outlierMinRows {
			own[w] = true
		}
	}
	if len(own) == 0 || len(own) == 1 && byWord[first] == n {
		return []sampleGroup{{name: groupName(k), key: ki, word: -1}}
	}
	words := make([]int32, 0, len(own))
	for w := range own {
		words = append(words, w)
	}
	sort.Slice(words, func(a, b int) bool { return s.words[words[a]] < s.words[words[b]] })
	var out []sampleGroup
	for _, w := range words {
		out = append(out, sampleGroup{name: quoteText(s.words[w]) + " (" + groupName(k) + ")", key: ki, word: w})
	}
	// The rows of the other names, tested against the whole fuel.
	if rest := n - sumOwn(byWord, own); rest > 0 {
		out = append(out, sampleGroup{name: groupName(k), key: ki, word: -1, own: own})
	}
	return out
}

func sumOwn(byWord map[int32]int, own map[int32]bool) int {
	n := 0
	for w := range own {
		n += byWord[w]
	}
	return n
}

// members calls f with each sample index of group g, in the order added.
func (s *sampleSet) members(g sampleGroup, f func(i int)) {
	idx := s.keyed(g.key)
	for j := range idx.len() {
		if i := int(idx.at(j)); g.word < 0 || s.word.at(i) == g.word {
			f(i)
		}
	}
}

// sorted returns the values of group g, sorted.
func (s *sampleSet) sorted(g sampleGroup) []float64 {
	n := 0
	s.members(g, func(int) { n++ })
	vals := make([]float64, 0, n) // counted first: a group of a million rows is allocated once
	s.members(g, func(i int) { vals = append(vals, s.v.at(i)) })
	sort.Float64s(vals)
	return vals
}

// sampleHit is a sample a test flagged: its index in the set and value.
type sampleHit struct {
	i int
	v float64
}

// flagged runs the robust test (groupStats, then dropRuns) over group g
// and returns the group's median and size and the samples it flags. With
// small, groups of 3 or 4 rows are tested too, at a factor of outlierSmall.
// The group's values are held sorted while it is tested; its rows are read
// twice.
func (s *sampleSet) flagged(g sampleGroup, small bool) (med float64, n int, hits []sampleHit) {
	sorted := s.sorted(g)
	n = len(sorted)
	if n == 0 {
		return 0, 0, nil
	}
	if n < 3 || n < outlierMinRows && !small {
		return median(sorted), n, nil
	}
	st := newGroupStats(sorted)
	var at []int
	pos := 0
	s.members(g, func(i int) {
		v := s.v.at(i)
		if n >= outlierMinRows && st.flag(v) || n < outlierMinRows && (v > outlierSmall*st.med || v < st.med/outlierSmall) {
			hits = append(hits, sampleHit{i, v})
			at = append(at, pos)
		}
		pos++
	})
	if n < outlierMinRows {
		return st.med, n, hits
	}
	// Runs of neighbouring rows flagged together are a section, not slips.
	val := make(map[int]float64, len(hits))
	for k, p := range at {
		val[p] = hits[k].v
	}
	keep := map[int]bool{}
	for _, p := range dropRuns(at, func(p int) float64 { return val[p] }, st.med) {
		keep[p] = true
	}
	kept := hits[:0]
	for k, h := range hits {
		if keep[at[k]] {
			kept = append(kept, h)
		}
	}
	return st.med, n, kept
}

// testGroup runs the robust test over a group of amounts (groups of 3 or
// 4 rows only at a factor of 100) and returns its findings.
func (s *sampleSet) testGroup(g sampleGroup) []*outlierFinding {
	med, n, hits := s.flagged(g, true)
	var out []*outlierFinding
	for _, h := range hits {
		if g.own != nil && g.own[s.word.at(h.i)] {
			continue // tested in its own name's group
		}
		row, col := int(s.row.at(h.i)), int(s.col.at(h.i))
		out = append(out, &outlierFinding{row: row, col: col, code: CodeValueOutlier,
			msg: funcs.FormatNumber(h.v) + " is " + timesText(h.v/med) + " the median " + funcs.FormatNumber(roundSig(med)) +
				" of the " + plural(n, "row") + " of " + g.name + " (" + slipText(h.v, h.v/med) + ")"})
	}
	return out
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
