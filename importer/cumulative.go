package importer

import (
	"sort"
	"strings"

	"github.com/fluecell/fluecell/funcs"
)

// Meter readings. A column of register readings ("Gas meter reading (m3)",
// "Index", "Register") holds the meter's running count: consumption is the
// difference between two readings, and summing the readings counts the
// whole history of the meter again on every row (a log of six monthly
// readings near 50,000 m3 would give 300,000 m3 for 4,400 burned). Such a
// column is recognised from its header AND its values, and its rows are not
// computed, each with the reason.

// readingWords are the header words of a register column (common practice
// of meter logs).
var readingWords = []string{"reading", "readings", "register", "index"}

// cumulativeMinRows is how many readings the values test needs.
const cumulativeMinRows = 4

// cumulativeWhy says why t's amount column holds cumulative meter readings
// rather than amounts used, or "" when it does not: the header names a
// reading, and the values (in row order, per meter where a group column
// says which) never fall, and the median step is under a fifth of the
// readings' level.
func (t *table) cumulativeWhy() string {
	q := t.spec.qty
	if q == nil || t.spec.kind != kindFuelLog || !hasWord(words(q.hdr.Text), readingWords...) {
		return ""
	}
	qs, ok := t.slotOf[q.col]
	if !ok {
		return ""
	}
	gs := -1
	if g := t.spec.group; g != nil {
		if s, ok := t.slotOf[g.col]; ok {
			gs = s
		}
	}
	last := map[string]float64{}
	var steps []float64
	n := 0
	level := 0.0
	for i := range t.n() {
		v := t.val(i, qs)
		if v.kind != kNumber {
			continue
		}
		key := ""
		if gs >= 0 {
			key = strings.TrimSpace(t.val(i, gs).text)
		}
		n++
		level = max(level, v.num)
		if prev, ok := last[key]; ok {
			if v.num < prev {
				return "" // a reading never falls: these are amounts
			} else {
				steps = append(steps, v.num-prev)
			}
		}
		last[key] = v.num
	}
	if n < cumulativeMinRows || len(steps) < cumulativeMinRows-1 {
		return ""
	}
	sort.Float64s(steps)
	med := steps[len(steps)/2]
	if !(med > 0) || med*5 > level {
		return ""
	}
	return quoteText(q.hdr.Text) + " holds meter readings (a running count: " + itoa(n) + " readings that never fall, rising by about " +
		funcs.FormatNumber(roundSig(med)) + " a step to " + funcs.FormatNumber(level) + "): the amount used is the difference between two readings, and summing readings would count the meter's history again on every row"
}
