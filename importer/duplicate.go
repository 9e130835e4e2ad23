package importer

import (
	"fmt"
	"hash/fnv"
	"math"
	"strings"
)

// Workbooks often hold the same data twice: a sheet copied to try
// something ("Data (2)"), an annual extract beside the full monthly table,
// a summary beside the detail it sums. A table whose rows (fuel, unit,
// amounts, date) all appear in a larger table, or whose totals by fuel all
// equal a larger table's, is not computed, so nothing is counted twice,
// and a finding at its header names the table it repeats.

// rowSigs returns a signature per data row of t from the columns that make
// its emissions: fuel, unit, amounts, technology, capacity, date. Rows of
// two tables with equal signatures say the same thing.
func (t *table) rowSigs() *paged[uint64] {
	var cols []int
	for s, c := range t.slots {
		switch c.role {
		case roleFuel, roleUnit, roleQuantity, roleWideFuel, rolePeriod, roleTech, roleCapacity, roleWhen, roleCarrier:
			cols = append(cols, s)
		}
	}
	out := newFixed(t.ps, t.n(), uint64(0))
	var b [8]byte
	for i := range t.n() {
		h := fnv.New64a()
		for _, s := range cols {
			v := t.val(i, s)
			switch v.kind {
			case kNumber:
				u := math.Float64bits(v.num)
				for k := range b {
					b[k] = byte(u >> (8 * k))
				}
				h.Write(b[:])
			case kText:
				h.Write([]byte(strings.ToLower(strings.TrimSpace(v.text))))
			}
			h.Write([]byte{0})
		}
		out.set(i, h.Sum64())
	}
	return out
}

// dropCopies finds tables whose rows all repeat a larger (or, when as
// large, earlier) table's rows and takes their results out of the totals.
func (sc *scanCtx) dropCopies() {
	if len(sc.tables) < 2 {
		return
	}
	// Each table's signatures stay in pages; a set is made only of a
	// table that is to be looked for in a larger one, so one long table
	// beside a few short ones costs a set of the short ones' rows.
	lists := make([]*paged[uint64], len(sc.tables))
	for i, t := range sc.tables {
		lists[i] = t.rowSigs()
	}
	for i, t := range sc.tables {
		n := lists[i].len()
		if t.computed == 0 || n < 3 {
			continue
		}
		var want map[uint64]bool
		for j, u := range sc.tables {
			m := lists[j].len()
			if i == j || u.copyOf != nil || m < n || m == n && j > i {
				continue
			}
			if want == nil {
				want = make(map[uint64]bool, n)
				for k := range n {
					want[lists[i].at(k)] = true
				}
			}
			found := make(map[uint64]bool, len(want))
			for k := 0; k < m && len(found) < len(want); k++ {
				if s := lists[j].at(k); want[s] {
					found[s] = true
				}
			}
			if len(found) == len(want) {
				t.dropAsCopy(sc, u, "every row of this table repeats the table at %s (a copy or an extract of it)")
				break
			}
		}
	}
}

// dropSummaries finds tables whose totals by fuel all equal a larger
// table's (a regional summary beside the per-plant table it sums, within
// 1 %) and takes their results out: the same fuel is not counted twice.
func (sc *scanCtx) dropSummaries() {
	for _, t := range sc.tables {
		if t.copyOf != nil || t.computed == 0 || len(t.byFuel) == 0 {
			continue
		}
		for _, u := range sc.tables {
			if u == t || u.copyOf != nil || u.computed == 0 || u.n() <= t.n() || len(u.byFuel) != len(t.byFuel) {
				continue
			}
			same := true
			for k, a := range t.byFuel {
				b, ok := u.byFuel[k]
				if !ok || math.Abs(a.TCO2-b.TCO2) > 0.01*math.Max(math.Abs(a.TCO2), math.Abs(b.TCO2)) {
					same = false
					break
				}
			}
			if same {
				t.dropAsCopy(sc, u, "its totals by fuel equal those of the table at %s (a summary of it)")
				break
			}
		}
	}
}

// dropAsCopy takes t's results out: its rows repeat u's.
func (t *table) dropAsCopy(sc *scanCtx, u *table, why string) {
	t.copyOf = u
	for ri := range t.res {
		for k := range t.res[ri].len() {
			t.res[ri].set(k, math.NaN())
		}
	}
	t.computed = 0
	t.byFuel, t.byGroup, t.fuelOrd, t.groupOrd = map[string]*sum{}, map[string]*sum{}, nil, nil
	sc.warn.add(t.spec.sheet, t.spec.firstCol, t.spec.headerRow, SevInfo, CodeNotComputed,
		fmt.Sprintf(why, u.spec.sheet+"!"+cellRef(u.spec.firstCol, u.spec.headerRow))+": not computed, so nothing is counted twice")
}
