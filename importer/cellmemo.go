package importer

// A long table repeats a few fuel names and units over many rows. What a
// fuel or unit cell gives when it is good (a fuel to compute, a unit of
// the right dimension) is worked out once per column and text, with its
// findings, and reused for the rows after: those rows would only repeat
// findings recorded once (warnSink.addOnce) and make the same value. A cell
// that is not good takes the whole path every time, since its finding is at
// its own cell.

// valueMemo is a table's good fuel and unit cells by column and text.
type valueMemo struct {
	fuels map[memoKey]string
	units map[memoKey]unitMemo
}

// memoKey is a column and the text of a cell in it; delivered is the row's
// energy delivered flag (scanCtx.delivered), which changes the unit's
// basis finding.
type memoKey struct {
	col       int
	text      string
	delivered bool
}

// unitMemo is what a good unit cell gives: the unit text the rules read
// (bare gallons made imperial when the mapping says so) and the unit's
// symbol for the mixed-unit check (noteUnitSym).
type unitMemo struct {
	out string
	sym string
}

// fuelMemo returns the fuel name a good fuel cell of column col with text
// gave before.
func (t *table) fuelMemo(col int, text string) (string, bool) {
	if t.memo == nil {
		return "", false
	}
	s, ok := t.memo.fuels[memoKey{col: col, text: text}]
	return s, ok
}

// keepFuel records name as what a good fuel cell of column col with text
// gives; the memo stops growing at maxCache texts per kind.
func (t *table) keepFuel(col int, text, name string) {
	m := t.valueMemo()
	if len(m.fuels) < maxCache {
		m.fuels[memoKey{col: col, text: text}] = name
	}
}

// unitMemo returns what a good unit cell of column col with text gave
// before, for a row with delivered as given.
func (t *table) unitMemo(col int, text string, delivered bool) (unitMemo, bool) {
	if t.memo == nil {
		return unitMemo{}, false
	}
	u, ok := t.memo.units[memoKey{col, text, delivered}]
	return u, ok
}

// keepUnit records what a good unit cell gives.
func (t *table) keepUnit(col int, text string, delivered bool, u unitMemo) {
	m := t.valueMemo()
	if len(m.units) < maxCache {
		m.units[memoKey{col, text, delivered}] = u
	}
}

func (t *table) valueMemo() *valueMemo {
	if t.memo == nil {
		t.memo = &valueMemo{fuels: map[memoKey]string{}, units: map[memoKey]unitMemo{}}
	}
	return t.memo
}

// lastTexts keeps a value for each of the last texts seen, one text per
// length class: the few texts a long table repeats on every row (the
// notes of its results) are found by one comparison, often of the very
// same string, without hashing them.
type lastTexts[V any] [16]struct {
	s  string
	v  V
	ok bool
}

// get returns the value kept for s.
func (c *lastTexts[V]) get(s string) (V, bool) {
	e := &c[len(s)%len(c)]
	if e.ok && e.s == s {
		return e.v, true
	}
	var zero V
	return zero, false
}

// put keeps v for s, in place of the text of its length class.
func (c *lastTexts[V]) put(s string, v V) {
	e := &c[len(s)%len(c)]
	e.s, e.v, e.ok = s, v, true
}
