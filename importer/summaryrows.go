package importer

import (
	"math"
	"strings"
)

// The summary's breakdowns (by period, by grouping column, by fuel in the
// workbook's words) read each table's stored results row by row and keep
// only sums keyed by kind and by period, group or fuel: the state grows with
// the number of keys, never with the rows.

// share is one kind's part of a breakdown line: fossil tCO2, tCO2e and the
// biogenic CO2 memo, t, and the rows found and computed.
type share struct {
	co2, co2e, bio  float64
	found, computed int
	has             bool // some row gave a number
}

// rowShare is what one row adds to the line of one kind.
type rowShare struct {
	kind           string
	co2, co2e, bio float64
	has            bool
	scope2Col      bool // the row's purchased energy in a column of its own (a wide table's Scope 2)
}

// rowShares splits row i of t into the kinds its numbers count in, exactly
// as the totals by kind do (kinds.go, kindTotals): the row's combustion (or
// embodied, fugitive) kind, and Scope 2 for its purchased energy. It returns
// the number of shares written into buf (at most 2), and whether the row is
// a data row at all.
func (t *table) rowShares(i int, main string, scope2 bool, buf *[2]rowShare) (n int, data bool) {
	if t.rowState == nil || t.rowState.at(i) == rowBlank {
		return 0, false
	}
	comb, s2 := main, scope2
	switch t.rowKind.at(i) {
	case rowScope2:
		comb, s2 = KindScope2, false
	case rowStationary:
		comb = KindStationary
	}
	get := func(k string, col bool) *rowShare {
		for j := 0; j < n; j++ {
			if buf[j].kind == k {
				return &buf[j]
			}
		}
		buf[n] = rowShare{kind: k, scope2Col: col}
		n++
		return &buf[n-1]
	}
	if comb != "" {
		get(comb, false)
	}
	if s2 && comb != KindScope2 {
		get(KindScope2, true)
	}
	for ri, r := range t.rules {
		v := t.res[ri].at(i)
		if math.IsNaN(v) {
			continue
		}
		switch {
		case r.total == 3:
			s := get(KindScope2, comb != KindScope2)
			s.co2e += v
			s.has = true
		case r.total == 1 && comb != "":
			s := get(comb, false)
			s.co2 += v
			s.has = true
		case r.total == 2 && comb != "":
			s := get(comb, false)
			s.co2e += v
			s.has = true
		}
	}
	if t.bio != nil && !math.IsNaN(t.bio.at(i)) && comb != "" {
		s := get(comb, false)
		s.bio += t.bio.at(i)
		s.has = s.has || t.bio.at(i) != 0
	}
	return n, true
}

// add adds one row's share to s.
func (s *share) add(r *rowShare, computed bool) {
	s.co2 += r.co2
	s.co2e += r.co2e
	s.bio += r.bio
	s.found++
	if computed {
		s.computed++
	}
	s.has = s.has || r.has
}

// keyedShares are breakdown lines by kind, then by key, in the order keys
// were first seen. maxKeys bounds the keys of one kind; past it, rows go to
// the line named overflow.
type keyedShares struct {
	byKind   map[string]map[string]*share
	order    map[string][]string
	maxKeys  int
	overflow string
	over     bool // some row went to the overflow line
}

func newKeyedShares(maxKeys int, overflow string) *keyedShares {
	return &keyedShares{byKind: map[string]map[string]*share{}, order: map[string][]string{}, maxKeys: maxKeys, overflow: overflow}
}

// add adds row share r under key.
func (k *keyedShares) add(r *rowShare, key string, computed bool) {
	m := k.byKind[r.kind]
	if m == nil {
		m = map[string]*share{}
		k.byKind[r.kind] = m
	}
	s := m[key]
	if s == nil {
		if len(m) >= k.maxKeys {
			key, k.over = k.overflow, true
			s = m[key]
		}
		if s == nil {
			s = &share{}
			m[key] = s
			k.order[r.kind] = append(k.order[r.kind], key)
		}
	}
	s.add(r, computed)
}

// kinds lists the kinds that have lines, in kindOrder.
func (k *keyedShares) kinds() []string {
	var out []string
	for _, kind := range kindOrder() {
		if len(k.byKind[kind]) > 0 {
			out = append(out, kind)
		}
	}
	return out
}

// cellText is a stored cell as a key: its text trimmed, a number as written
// by FormatNumber, "(blank)" for an empty cell.
func cellText(v cellVal) string {
	if v.kind == kEmpty && !v.noCache {
		return "(blank)"
	}
	s := strings.TrimSpace(cell{kind: v.kind, num: v.num, text: v.text, noCache: v.noCache}.display())
	if s == "" {
		return "(blank)"
	}
	return s
}
