package importer

import (
	"strings"

	"github.com/fluecell/fluecell/importer/tables"
)

// countRow reports, with a note at its unit cell, a row whose unit is a
// count of items rather than an amount ("EA", "each", "pcs"), as a fuel
// card export gives for merchandise, services and discounts beside its fuel
// lines: no amount of fuel was bought, so the row is no record of fuel and
// is not counted among the rows a total could miss.
func (sc *scanCtx) countRow(t *table, i int) bool {
	u := t.spec.unit
	if u == nil || t.spec.kind != kindFuelLog {
		return false
	}
	slot := -1
	for s, c := range t.slots {
		if c == u {
			slot = s
		}
	}
	if slot < 0 {
		return false
	}
	v := t.val(i, slot)
	if v.kind != kText || !tables.CountUnit(strings.TrimSpace(v.text)) {
		return false
	}
	sc.warn.add(t.spec.sheet, u.col, t.rowNum(i), SevInfo, CodeNotComputed, quoteText(strings.TrimSpace(v.text))+
		" counts items, not an amount of fuel: a line of goods or services, not a purchase of fuel; left out and not counted among the rows")
	return true
}
