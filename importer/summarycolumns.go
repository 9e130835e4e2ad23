package importer

import (
	"strconv"
	"strings"
	"time"
)

// Summary by period of a table with one period per column (Fuel | Unit |
// Jan 2024 | Feb 2024 ...): each row's results are the sum of one call per
// column with the row's fuel and unit, so a column's share of the row is
// its amount over the row's amounts (the calls are proportional to the
// amount). The columns are added up by the grain chooseGrain gives their
// dates; columns whose headers give no date ("Jan" without a year) are
// each a period of their own, as written.

// columnPeriods is how a table of period columns is summed.
type columnPeriods struct {
	labels []string // the periods, in order
	of     []int    // per period column (spec.periods), its label's index
	grain  string   // "month", ...; "column" when each column is its own
	note   string
}

// planColumns reads the dates of t's period columns from their headers.
func (t *table) planColumns() *columnPeriods {
	cols := t.spec.periods
	cp := &columnPeriods{of: make([]int, len(cols))}
	dates := make([]rowPeriod, len(cols))
	all := true
	finest := grainYear
	fiscal := true
	var from, to time.Time
	for k, c := range cols {
		p, ok := headerPeriod(c.hdr.Text)
		if !ok {
			all = false
			break
		}
		dates[k] = p
		if k == 0 || p.at.Before(from) {
			from = p.at
		}
		if k == 0 || p.at.After(to) {
			to = p.at
		}
		finest = min(finest, p.res)
		fiscal = fiscal && p.fiscal
	}
	if !all || len(cols) == 0 {
		cp.grain = "column"
		for k, c := range cols {
			cp.of[k] = k
			cp.labels = append(cp.labels, c.hdr.Text)
		}
		cp.note = "by column: each period column is its own period, as its header is written (not every header gives a date)."
		return cp
	}
	g := chooseGrain(from, to, finest)
	fiscal = fiscal && g == grainYear
	first := periodIndex(from, g)
	for n := first; n <= periodIndex(to, g); n++ {
		cp.labels = append(cp.labels, periodLabel(n, g, fiscal))
	}
	for k := range cols {
		cp.of[k] = periodIndex(dates[k].at, g) - first
	}
	cp.grain = g.String()
	cp.note = "by " + g.String() + ": the period columns run from " + cp.labels[0] + " to " + cp.labels[len(cp.labels)-1] + " (" + plural(len(cols), "column") +
		"); the finest grain that gives at most " + itoa(maxPeriods) + " periods. Each row's figures are shared among its columns in proportion to their amounts (the figures are proportional to the amounts)."
	return cp
}

// headerPeriod reads the period a column header names: "Jan 2024", "2024",
// "FY2025", "2024 Q1", or a date serial (a header cell holding a date).
func headerPeriod(text string) (rowPeriod, bool) {
	s := strings.TrimSpace(text)
	if x, err := strconv.ParseFloat(s, 64); err == nil && len(s) == 5 {
		return readPeriod(cellVal{kind: kNumber, num: x})
	}
	return readPeriod(cellVal{kind: kText, text: s})
}

// columnShares adds t's rows up by the periods of cp, one set of lines per
// kind; a row counts in each period where it has an amount.
func (t *table) columnShares(cp *columnPeriods) *keyedShares {
	ks := newKeyedShares(len(cp.labels)+1, "(other)")
	main, scope2 := t.baseKinds()
	cols := t.spec.periods
	amount := make([]float64, len(cols))
	part := make([]float64, len(cp.labels))
	var buf [2]rowShare
	for i := range t.rowState.len() {
		n, data := t.rowShares(i, main, scope2, &buf)
		if !data {
			continue
		}
		total := 0.0
		for k, c := range cols {
			amount[k] = 0
			s, ok := t.slotOf[c.col]
			if !ok {
				continue
			}
			v := t.val(i, s)
			x := 0.0
			switch v.kind {
			case kNumber:
				x = v.num
			case kText:
				if f, ok, _ := textNumber(v.text); ok {
					x = f
				}
			}
			if c.hdr.Scale != 0 {
				x *= c.hdr.Scale
			}
			amount[k] = x
			total += x
		}
		if total == 0 || !isFinite(total) {
			continue // no amount: the row's figures are zero or none
		}
		clear(part)
		for k := range cols {
			part[cp.of[k]] += amount[k] / total
		}
		for p, f := range part {
			if f == 0 {
				continue
			}
			for j := 0; j < n; j++ {
				r := buf[j]
				r.co2, r.co2e, r.bio = r.co2*f, r.co2e*f, r.bio*f
				ks.add(&r, cp.labels[p], t.rowState.at(i) == rowComputed)
			}
		}
	}
	return ks
}
