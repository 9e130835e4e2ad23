package importer

import (
	"math"
	"strings"
	"time"
)

// A flow is an amount per unit of time: "(Thousand Barrels per Day)" in a
// weekly or monthly statistics table. It is an amount only over a period,
// so it is computed only in a table whose rows carry dates: each row's
// amount is the flow times the days from its date to the next (the days of
// its week or month). Without dates it stays a rate and is not computed.

// periodDaysIdent is the variable the rules of a table with flows read: the
// days each row covers.
const periodDaysIdent = "period_days"

// rowDate reads the date of a row from its date column: an Excel date
// serial, YYYYMM, or a text such as "Jan 2023", "Nov 09, 1990", "2023-01".
func rowDate(v cellVal) (time.Time, bool) {
	switch v.kind {
	case kNumber:
		x := v.num
		switch {
		case x >= 190001 && x <= 210012 && x == math.Trunc(x) && int(x)%100 >= 1 && int(x)%100 <= 12:
			return time.Date(int(x)/100, time.Month(int(x)%100), 1, 0, 0, 0, 0, time.UTC), true
		case x > 1 && x < 200000:
			// Excel's 1900 date system (serial 1 = 1900-01-01, with its
			// phantom 1900-02-29).
			return time.Date(1899, 12, 30, 0, 0, 0, 0, time.UTC).Add(time.Duration(math.Round(x)) * 24 * time.Hour), true
		}
	case kText:
		s := strings.TrimSpace(v.text)
		for _, layout := range []string{"Jan 2006", "January 2006", "Jan 02, 2006", "Jan-2006", "Jan-06", "2006-01-02", "2006-01", "01/02/2006", "1/2/2006", "2006/01/02"} {
			if t, err := time.Parse(layout, s); err == nil {
				return t, true
			}
		}
	}
	return time.Time{}, false
}

// periodDays returns, per row, the days from its date to the next date of
// the table (rows may run either way in time); the last row takes the
// spacing before it. NaN where a row has no date.
func (t *table) periodDays() *paged[float64] {
	c := t.spec.when
	n := t.n()
	out := newFixed(t.ps, n, math.NaN())
	date := func(i int) (time.Time, bool) {
		if i < 0 || i >= n {
			return time.Time{}, false
		}
		return rowDate(t.val(i, t.slotOf[c.col]))
	}
	// A window of three rows' dates walks down the table.
	prev, hasPrev := time.Time{}, false
	cur, hasCur := date(0)
	for i := 0; i < n; i++ {
		next, hasNext := date(i + 1)
		if hasCur {
			var d float64
			if hasNext {
				d = math.Abs(next.Sub(cur).Hours() / 24)
			} else if hasPrev {
				d = math.Abs(cur.Sub(prev).Hours() / 24)
			}
			switch {
			case d >= 28 && d <= 31:
				// Monthly rows: the row's own month, whatever the spacing
				// to its neighbour.
				out.set(i, float64(time.Date(cur.Year(), cur.Month()+1, 0, 0, 0, 0, 0, time.UTC).Day()))
			case d >= 365 && d <= 366:
				out.set(i, float64(time.Date(cur.Year(), 12, 31, 0, 0, 0, 0, time.UTC).YearDay()))
			case d >= 1 && d <= 366:
				out.set(i, math.Round(d))
			}
		}
		prev, hasPrev, cur, hasCur = cur, hasCur, next, hasNext
	}
	return out
}
