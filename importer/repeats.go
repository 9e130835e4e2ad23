package importer

import (
	"math"
	"strings"
)

// The rows of a table that repeat others: annual totals among monthly rows,
// and a fuel given again in another unit or as a part of another row.

// annualRows marks the rows whose period is a whole year (YYYYMM with
// month 13, the statistics' annual code) in a year that also has monthly
// rows. nil when there are none.
func (t *table) annualRows() []bool {
	c := t.spec.when
	if c == nil {
		return nil
	}
	s := t.slotOf[c.col]
	n := t.n()
	kind := make([]uint8, n) // 1 monthly, 2 annual
	year := make([]int, n)
	monthsOf := map[int]bool{} // years with monthly rows
	monthly, yearly := false, false
	for i := 0; i < n; i++ {
		v := t.val(i, s)
		x := v.num
		if v.kind == kText {
			f, ok, _ := textNumber(v.text)
			if !ok {
				continue
			}
			x = f
		} else if v.kind != kNumber {
			continue
		}
		if x != math.Trunc(x) {
			continue
		}
		year[i] = int(x) / 100
		switch {
		case x >= 190001 && x <= 210013 && int(x)%100 == 13:
			kind[i], yearly = 2, true
		case x >= 190001 && x <= 210012 && int(x)%100 >= 1:
			kind[i], monthly = 1, true
			monthsOf[year[i]] = true
		}
	}
	if !monthly || !yearly {
		return nil
	}
	// An annual row stands for its year where no monthly rows do (the
	// early years of a series often have annual figures only).
	out := make([]bool, n)
	for i, k := range kind {
		out[i] = k == 2 && monthsOf[year[i]]
	}
	return out
}

// sameAgain marks the rows of a long table that repeat an earlier row's
// fuel in another unit (statistics print "Distillate fuel oil consumed by
// the industrial sector" once in billion Btu and once in thousand
// barrels), or that are a part of another row ("... industrial sector
// excluding refinery fuel"): the value is that other row's number, 0
// elsewhere; part is set for the second kind. Rows agree when their fuel
// text, group and date agree. nil when there are none.
func (t *table) sameAgain() (rows []int, part []bool) {
	spec := t.spec
	// Only a table of series (one per period column, or rows dated by a
	// period) repeats a series; a log repeats fuels on purpose.
	if spec.fuel == nil || spec.unit == nil || spec.kind != kindPeriods && (spec.kind != kindFuelLog || spec.when == nil) {
		return nil, nil
	}
	type first struct {
		unit string
		row  int
	}
	n := t.n()
	keys := make([]string, n)
	isPart := make([]bool, n)
	units := make([]string, n)
	fs, us := t.slotOf[spec.fuel.col], t.slotOf[spec.unit.col]
	whole := map[string]first{} // rows that are no part: key -> first such row
	type normText struct {
		text string
		part bool
	}
	norm := map[string]normText{} // fuel texts repeat: each is normalised once
	for i := 0; i < n; i++ {
		f, u := t.val(i, fs), t.val(i, us)
		if f.kind != kText || u.kind != kText {
			continue
		}
		nt, ok := norm[f.text]
		if !ok {
			nt.text = strings.ToLower(strings.Join(strings.Fields(f.text), " "))
			for _, w := range []string{" excluding ", " except ", " excl. "} {
				if j := strings.Index(nt.text, w); j > 0 {
					nt.text, nt.part = nt.text[:j], true
					break
				}
			}
			norm[f.text] = nt
		}
		text := nt.text
		isPart[i] = nt.part
		if spec.group != nil {
			g := t.val(i, t.slotOf[spec.group.col])
			text += "\x00" + strings.ToLower(strings.TrimSpace(cell{kind: g.kind, num: g.num, text: g.text}.display()))
		}
		if spec.when != nil {
			w := t.val(i, t.slotOf[spec.when.col])
			text += "\x00" + cell{kind: w.kind, num: w.num, text: w.text}.display()
		}
		keys[i], units[i] = text, strings.ToLower(strings.TrimSpace(u.text))
		if _, ok := whole[text]; !ok && !isPart[i] {
			whole[text] = first{units[i], t.rowNum(i)}
		}
	}
	for i := 0; i < n; i++ {
		if keys[i] == "" {
			continue
		}
		w, ok := whole[keys[i]]
		switch {
		case !ok:
			continue
		case isPart[i]:
		case w.row != t.rowNum(i) && w.unit != units[i]:
		default:
			continue
		}
		if rows == nil {
			rows, part = make([]int, n), make([]bool, n)
		}
		rows[i], part[i] = w.row, isPart[i]
	}
	return rows, part
}
