package importer

import (
	"encoding/binary"
	"math"
	"strings"
)

// The rows of a table that repeat others: annual totals among monthly rows,
// and a fuel given again in another unit or as a part of another row.

// annualRows marks the rows whose period is a whole year (YYYYMM with
// month 13, the statistics' annual code) in a year that also has monthly
// rows. nil when there are none.
func (t *table) annualRows() *paged[int8] {
	c := t.spec.when
	if c == nil {
		return nil
	}
	s := t.slotOf[c.col]
	n := t.n()
	// code reads row i's period: 1 monthly, 2 annual, 0 neither.
	code := func(i int) (kind uint8, year int) {
		v := t.val(i, s)
		x := v.num
		if v.kind == kText {
			f, ok, _ := textNumber(v.text)
			if !ok {
				return 0, 0
			}
			x = f
		} else if v.kind != kNumber {
			return 0, 0
		}
		if x != math.Trunc(x) {
			return 0, 0
		}
		switch {
		case x >= 190001 && x <= 210013 && int(x)%100 == 13:
			return 2, int(x) / 100
		case x >= 190001 && x <= 210012 && int(x)%100 >= 1:
			return 1, int(x) / 100
		}
		return 0, 0
	}
	monthsOf := map[int]bool{} // years with monthly rows
	monthly, yearly := false, false
	for i := 0; i < n; i++ {
		switch k, y := code(i); k {
		case 2:
			yearly = true
		case 1:
			monthly = true
			monthsOf[y] = true
		}
	}
	if !monthly || !yearly {
		return nil
	}
	// An annual row stands for its year where no monthly rows do (the
	// early years of a series often have annual figures only).
	out := newFixed(t.ps, n, int8(0))
	for i := 0; i < n; i++ {
		if k, y := code(i); k == 2 && monthsOf[y] {
			out.set(i, 1)
		}
	}
	return out
}

// sameAgain marks the rows of a long table that repeat an earlier row's
// fuel in another unit (statistics print "Distillate fuel oil consumed by
// the industrial sector" once in billion Btu and once in thousand
// barrels), or that are a part of another row ("... industrial sector
// excluding refinery fuel"). The value of a row is that other row's number,
// negative for a part, 0 elsewhere. Rows agree when their fuel text, group
// and date agree. nil when there are none.
//
// State is kept per distinct key, not per row: a map from the key's hash to
// the key and its first row; a hash met again is checked against the key,
// so a collision never joins two rows.
func (t *table) sameAgain() *paged[int32] {
	spec := t.spec
	// Only a table of series (one per period column, or rows dated by a
	// period) repeats a series; a log repeats fuels on purpose.
	if spec.fuel == nil || spec.unit == nil || spec.kind != kindPeriods && (spec.kind != kindFuelLog || spec.when == nil) {
		return nil
	}
	type first struct {
		key  string // the key itself: a hash met again is checked against it
		unit string
		row  int32 // stored row index
	}
	k := repeatKeys{t: t, norm: map[string]normText{}, units: map[string]string{}, groups: map[string]string{}}
	whole := map[uint64][]first{} // rows that are no part, by their key's hash: the first row of each key
	var buf []byte
	find := func(h uint64, key []byte) (first, bool) {
		for _, f := range whole[h] {
			if f.key == string(key) {
				return f, true
			}
		}
		return first{}, false
	}
	n := t.n()
	var rows *paged[int32]
	mark := func(i int, w first, part bool) {
		if rows == nil {
			rows = newFixed(t.ps, n, int32(0))
		}
		v := int32(t.rowNum(int(w.row)))
		if part {
			v = -v
		}
		rows.set(i, v)
	}
	// One pass decides every row that is no part: its key's first row is
	// known by then. A part may come before the row it is a part of, so
	// parts are decided in a second pass, made only when there are parts.
	parts := false
	for i := 0; i < n; i++ {
		key, unit, part, ok := k.key(i, buf[:0])
		buf = key
		if !ok {
			continue
		}
		if part {
			parts = true
			continue
		}
		h := hashKey(key)
		w, found := find(h, key)
		if !found {
			whole[h] = append(whole[h], first{string(key), unit, int32(i)})
			continue
		}
		if w.unit != unit {
			mark(i, w, false)
		}
	}
	for i := 0; parts && i < n; i++ {
		key, _, part, ok := k.key(i, buf[:0])
		buf = key
		if !ok || !part {
			continue
		}
		if w, found := find(hashKey(key), key); found {
			mark(i, w, true)
		}
	}
	return rows
}

// normText is a fuel text folded for sameAgain, and whether it names a
// part of another row.
type normText struct {
	text string
	part bool
}

// repeatKeys builds the keys sameAgain compares: the fuel text folded, the
// group and the date, and the unit lower-cased. Texts repeat, so each is
// folded once (up to maxFoldCache of them).
type repeatKeys struct {
	t      *table
	norm   map[string]normText
	units  map[string]string
	groups map[string]string // group texts folded
}

// key appends row i's key to buf; ok is false for a row without a fuel and
// a unit text.
func (k *repeatKeys) key(i int, buf []byte) (key []byte, unit string, part, ok bool) {
	t, spec := k.t, k.t.spec
	f := t.val(i, t.slotOf[spec.fuel.col])
	u := t.val(i, t.slotOf[spec.unit.col])
	if f.kind != kText || u.kind != kText {
		return buf, "", false, false
	}
	nt, found := k.norm[f.text]
	if !found {
		nt.text = strings.ToLower(strings.Join(strings.Fields(f.text), " "))
		for _, w := range []string{" excluding ", " except ", " excl. "} {
			if j := strings.Index(nt.text, w); j > 0 {
				nt.text, nt.part = nt.text[:j], true
				break
			}
		}
		if len(k.norm) < maxFoldCache {
			k.norm[f.text] = nt
		}
	}
	buf = append(buf, nt.text...)
	if spec.group != nil {
		g := t.val(i, t.slotOf[spec.group.col])
		if g.kind == kText {
			folded, found := k.groups[g.text]
			if !found {
				folded = strings.ToLower(strings.TrimSpace(g.text))
				if len(k.groups) < maxFoldCache {
					k.groups[g.text] = folded
				}
			}
			buf = append(append(append(buf, 0), 2), folded...)
		} else {
			buf = appendKeyCell(append(buf, 0), g, true)
		}
	}
	if spec.when != nil {
		buf = appendKeyCell(append(buf, 0), t.val(i, t.slotOf[spec.when.col]), false)
	}
	unit, found = k.units[u.text]
	if !found {
		unit = strings.ToLower(strings.TrimSpace(u.text))
		if len(k.units) < maxFoldCache {
			k.units[u.text] = unit
		}
	}
	return buf, unit, nt.part, true
}

// appendKeyCell appends a cell to a key: a number as its 8 bytes (equal
// numbers, equal keys), anything else as it displays, trimmed and lower-cased
// with fold.
func appendKeyCell(buf []byte, v cellVal, fold bool) []byte {
	if v.kind == kNumber {
		return binary.LittleEndian.AppendUint64(append(buf, 1), math.Float64bits(v.num))
	}
	d := cell{kind: v.kind, num: v.num, text: v.text}.display()
	if fold {
		d = strings.ToLower(strings.TrimSpace(d))
	}
	return append(append(buf, 2), d...)
}

// hashKey is the 64-bit FNV-1a hash of key.
func hashKey(key []byte) uint64 {
	h := uint64(14695981039346656037)
	for _, c := range key {
		h ^= uint64(c)
		h *= 1099511628211
	}
	return h
}
