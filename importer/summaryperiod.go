package importer

import (
	"math"
	"slices"
	"strconv"
	"strings"
	"time"

	"github.com/fluecell/fluecell/importer/tables"
)

// Summary by period: a table whose rows carry a date (an Excel date, a date
// text, YYYYMM, a year or a quarter) gets its tCO2e by day, week, month,
// quarter or year, one section per kind.

// grain is the length of the periods a summary adds rows up by.
type grain uint8

const (
	grainDay grain = iota
	grainWeek
	grainMonth
	grainQuarter
	grainYear
)

func (g grain) String() string {
	return [...]string{"day", "week", "month", "quarter", "year"}[g]
}

// maxPeriods is the number of periods a summary by period shows at most
// (two years of months): the grain is the finest that fits, else the year.
const maxPeriods = 24

// periodColumn reports a column that may hold the date of each row: the
// table's date column, or another whose header names a date, month, year or
// period. Its values decide (readDates).
func periodColumn(spec *tableSpec, c *column) bool {
	return c == spec.when || c.role == roleNone && c.st.hint.Any(tables.HintPeriod) && c.st.nonEmpty > 0
}

// rowPeriod is the date of one row, read from one cell, and the finest
// grain its writing gives: a date is a day, YYYYMM or "Jan 2025" a month,
// "2025 Q1" a quarter, 2025 or "FY2025" a year.
type rowPeriod struct {
	at     time.Time
	res    grain
	fiscal bool // "FY2025": a fiscal year, labelled as written
}

// readPeriod reads the period of a cell; ok is false for a cell that holds
// none.
func readPeriod(v cellVal) (rowPeriod, bool) {
	switch v.kind {
	case kNumber:
		x := v.num
		if x != math.Trunc(x) && (x < 1 || x >= 200000) {
			return rowPeriod{}, false
		}
		switch {
		case x >= 1900 && x <= 2100:
			// A year: as an Excel date serial it would be in 1905, which no
			// record of fuel or energy is.
			return rowPeriod{at: time.Date(int(x), 1, 1, 0, 0, 0, 0, time.UTC), res: grainYear}, true
		case x >= 190001 && x <= 210012:
			if m := int(x) % 100; m >= 1 && m <= 12 {
				return rowPeriod{at: time.Date(int(x)/100, time.Month(m), 1, 0, 0, 0, 0, time.UTC), res: grainMonth}, true
			}
			return rowPeriod{}, false // YYYY13: an annual total among monthly rows
		case x > 1 && x < 200000:
			d, ok := rowDate(v)
			if !ok {
				return rowPeriod{}, false
			}
			return rowPeriod{at: d, res: dayRes(d)}, true
		}
		return rowPeriod{}, false
	case kText:
		s := strings.TrimSpace(v.text)
		if p, ok := textPeriod(s); ok {
			return p, true
		}
		if d, ok := rowDate(v); ok {
			res := dayRes(d)
			for _, layout := range []string{"Jan 2006", "January 2006", "Jan-2006", "Jan-06", "2006-01"} {
				if _, err := time.Parse(layout, s); err == nil {
					res = grainMonth
				}
			}
			return rowPeriod{at: d, res: res}, true
		}
	}
	return rowPeriod{}, false
}

// dayRes is the grain of a date read from an Excel serial: a day, or a
// month when it is the first of one (a monthly record dated on the 1st is
// read with dayRes over all rows: see readDates).
func dayRes(d time.Time) grain {
	if d.Day() == 1 {
		return grainMonth
	}
	return grainDay
}

// textPeriod reads a year ("2025"), a fiscal year ("FY2025", "FY 25") or a
// quarter ("2025 Q1", "Q1 2025", "2025-Q1").
func textPeriod(s string) (rowPeriod, bool) {
	u := strings.ToUpper(strings.TrimSpace(s))
	year := func(w string) (int, bool) {
		if !tables.AllDigits(w) {
			return 0, false
		}
		n, _ := strconv.Atoi(w)
		switch {
		case len(w) == 4 && n >= 1900 && n <= 2100:
			return n, true
		case len(w) == 2:
			return 2000 + n, true
		}
		return 0, false
	}
	if len(u) == 4 {
		if y, ok := year(u); ok {
			return rowPeriod{at: time.Date(y, 1, 1, 0, 0, 0, 0, time.UTC), res: grainYear}, true
		}
	}
	if rest, ok := strings.CutPrefix(u, "FY"); ok {
		rest = strings.TrimLeft(rest, " -")
		if y, ok := year(rest); ok {
			return rowPeriod{at: time.Date(y, 1, 1, 0, 0, 0, 0, time.UTC), res: grainYear, fiscal: true}, true
		}
	}
	ws := strings.FieldsFunc(u, func(r rune) bool { return r == ' ' || r == '-' || r == '/' })
	if len(ws) == 2 {
		a, b := ws[0], ws[1]
		if len(a) == 2 && a[0] == 'Q' {
			a, b = b, a
		}
		if len(b) == 2 && b[0] == 'Q' && b[1] >= '1' && b[1] <= '4' && len(a) == 4 {
			if y, ok := year(a); ok {
				return rowPeriod{at: time.Date(y, time.Month(3*int(b[1]-'1')+1), 1, 0, 0, 0, 0, time.UTC), res: grainQuarter}, true
			}
		}
	}
	return rowPeriod{}, false
}

// periodIndex numbers the period of d at grain g (consecutive periods have
// consecutive numbers); weeks are ISO 8601 weeks, from Monday.
func periodIndex(d time.Time, g grain) int {
	switch g {
	case grainDay:
		return int(d.Unix() / 86400)
	case grainWeek:
		// 1970-01-01 was a Thursday: shift so that weeks start on Monday.
		return int(math.Floor(float64(d.Unix()/86400+3) / 7))
	case grainMonth:
		return d.Year()*12 + int(d.Month()) - 1
	case grainQuarter:
		return d.Year()*4 + (int(d.Month())-1)/3
	}
	return d.Year()
}

// periodStart is the first day of period index n at grain g.
func periodStart(n int, g grain) time.Time {
	switch g {
	case grainDay:
		return time.Unix(int64(n)*86400, 0).UTC()
	case grainWeek:
		return time.Unix((int64(n)*7-3)*86400, 0).UTC()
	case grainMonth:
		return time.Date(n/12, time.Month(n%12+1), 1, 0, 0, 0, 0, time.UTC)
	case grainQuarter:
		return time.Date(n/4, time.Month(3*(n%4)+1), 1, 0, 0, 0, 0, time.UTC)
	}
	return time.Date(n, 1, 1, 0, 0, 0, 0, time.UTC)
}

// periodLabel names period n at grain g: 2026-03-30, 2026-W14, Jan 2025,
// 2025 Q1, 2025 (FY2025 for fiscal years).
func periodLabel(n int, g grain, fiscal bool) string {
	d := periodStart(n, g)
	switch g {
	case grainDay:
		return d.Format("2006-01-02")
	case grainWeek:
		y, w := d.ISOWeek()
		return strconv.Itoa(y) + "-W" + pad2(w)
	case grainMonth:
		return d.Format("Jan 2006")
	case grainQuarter:
		return strconv.Itoa(d.Year()) + " Q" + strconv.Itoa(n%4+1)
	}
	if fiscal {
		return "FY" + strconv.Itoa(d.Year())
	}
	return strconv.Itoa(d.Year())
}

func pad2(n int) string {
	if n < 10 {
		return "0" + strconv.Itoa(n)
	}
	return strconv.Itoa(n)
}

// periodPlan is how one table's rows are added up by period.
type periodPlan struct {
	col      *column
	slot     int
	grain    grain
	first    int // period index of the first and last period
	last     int
	fiscal   bool
	from, to time.Time
	dated    int // data rows with a date
	rows     int // data rows
	// days holds the distinct dates seen (as days since 1970), up to
	// maxSpacingDays of them, for spacingGrain.
	days map[int64]struct{}
}

// maxSpacingDays bounds the distinct dates kept to judge their spacing: more
// distinct dates than this are spaced finely enough for any grain.
const maxSpacingDays = 4096

// spacingGrain is the finest grain the spacing of the distinct dates
// allows: dates a year or more apart (annual rows written as year-end
// dates, "2011-12-31", "2012-12-31") are summed by year, never spread over
// quarters that hold nothing; a quarter or more apart by quarter; a month
// (28 days) or more by month; a week or more by week. grainDay for one date
// or too many to judge.
func (p *periodPlan) spacingGrain() grain {
	if len(p.days) < 2 || len(p.days) > maxSpacingDays {
		return grainDay
	}
	ds := make([]int64, 0, len(p.days))
	for d := range p.days {
		ds = append(ds, d)
	}
	slices.Sort(ds)
	gap := ds[1] - ds[0]
	for i := 2; i < len(ds); i++ {
		gap = min(gap, ds[i]-ds[i-1])
	}
	switch {
	case gap >= 365:
		return grainYear
	case gap >= 89:
		return grainQuarter
	case gap >= 28:
		return grainMonth
	case gap >= 7:
		return grainWeek
	}
	return grainDay
}

// readDates chooses the date column of t (the one whose values read as
// periods in most data rows; the finer on a tie) and the grain of its
// summary; nil, with why, when no column holds dates in at least half the
// data rows.
func (t *table) readDates() (*periodPlan, string) {
	if t.rowState == nil {
		return nil, ""
	}
	var best *periodPlan
	for _, c := range t.spec.cols {
		s, stored := t.slotOf[c.col]
		if !stored || !periodColumn(t.spec, c) {
			continue
		}
		p := &periodPlan{col: c, slot: s, grain: grainYear, fiscal: true}
		for i := range t.rowState.len() {
			st := t.rowState.at(i)
			if st == rowBlank {
				continue
			}
			p.rows++
			rp, ok := readPeriod(t.val(i, s))
			if !ok {
				continue
			}
			if p.dated == 0 || rp.at.Before(p.from) {
				p.from = rp.at
			}
			if p.dated == 0 || rp.at.After(p.to) {
				p.to = rp.at
			}
			p.dated++
			if p.days == nil {
				p.days = map[int64]struct{}{}
			}
			if len(p.days) <= maxSpacingDays {
				p.days[rp.at.Unix()/86400] = struct{}{}
			}
			p.grain = min(p.grain, rp.res)
			p.fiscal = p.fiscal && rp.fiscal
		}
		if p.dated == 0 {
			continue
		}
		if best == nil || p.dated > best.dated || p.dated == best.dated && p.grain < best.grain {
			best = p
		}
	}
	if best == nil {
		return nil, ""
	}
	if 2*best.dated < best.rows {
		return nil, "no summary by period: the column " + quoteText(best.col.hdr.Text) + " holds a date in " + itoa(best.dated) + " of " + plural(best.rows, "row")
	}
	if best.grain != grainYear {
		best.fiscal = false
	}
	g := chooseGrain(best.from, best.to, max(best.grain, best.spacingGrain()))
	best.grain, best.days = g, nil
	best.first, best.last = periodIndex(best.from, g), periodIndex(best.to, g)
	return best, ""
}

// chooseGrain is the grain of a summary of dates from..to written to the
// grain finest: the finest grain, no finer than the dates are written, that
// gives at most maxPeriods periods (weeks only for dates written to the
// day); the year when none does. Six days of a weekly log are six days; a
// year of months is twelve months; three years of daily fill-ups are twelve
// quarters.
func chooseGrain(from, to time.Time, finest grain) grain {
	g := finest
	for g < grainYear {
		if g == grainWeek && finest != grainDay {
			g++
			continue
		}
		if periodIndex(to, g)-periodIndex(from, g) < maxPeriods {
			break
		}
		g++
	}
	return g
}

// note says which grain was chosen and why.
func (p *periodPlan) note() string {
	span := func(g grain) int { return periodIndex(p.to, g) - periodIndex(p.from, g) + 1 }
	s := "by " + p.grain.String() + ": the dates in " + quoteText(p.col.hdr.Text) + " run from " + p.from.Format("2006-01-02") + " to " + p.to.Format("2006-01-02") +
		" (" + plural(span(grainDay), "day") + ")"
	switch {
	case p.grain == grainYear && span(grainYear) > maxPeriods:
		s += "; more than " + itoa(maxPeriods) + " years, so every year is listed"
	case p.grain > grainDay:
		s += "; the finest grain that gives at most " + itoa(maxPeriods) + " periods"
		if p.grain == grainMonth || p.grain == grainYear || p.grain == grainQuarter {
			s += " and is no finer than the dates are written and spaced"
		}
	default:
		s += "; at most " + itoa(maxPeriods) + " periods, so each day is its own"
	}
	if p.dated < p.rows {
		s += "; " + plural(p.rows-p.dated, "row") + " without a date are in the line (no date)"
	}
	return s + "."
}

// periodShares adds t's rows up by period of plan p, one set of lines per
// kind; every period from the first to the last has its line, and rows with
// no date go to "(no date)".
func (t *table) periodShares(p *periodPlan) (*keyedShares, []string) {
	labels := make([]string, 0, p.last-p.first+2)
	ks := newKeyedShares(p.last-p.first+2, "(no date)")
	for n := p.first; n <= p.last; n++ {
		labels = append(labels, periodLabel(n, p.grain, p.fiscal))
	}
	main, scope2 := t.baseKinds()
	var buf [2]rowShare
	for i := range t.rowState.len() {
		n, data := t.rowShares(i, main, scope2, &buf)
		if !data {
			continue
		}
		key := "(no date)"
		if rp, ok := readPeriod(t.val(i, p.slot)); ok {
			key = labels[periodIndex(rp.at, p.grain)-p.first]
		}
		for j := 0; j < n; j++ {
			ks.add(&buf[j], key, t.rowState.at(i) == rowComputed)
		}
	}
	return ks, labels
}
