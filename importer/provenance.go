package importer

import (
	"strings"

	"github.com/fluecell/fluecell/funcs"
)

// provenance collects the factor rows and notes behind the computed numbers,
// for the Carbon sources sheet: nothing is dropped between layers.
type provenance struct {
	used    map[*funcs.Factor]*factorUse
	usedOrd []*funcs.Factor
	notes   map[string]*int // the rows of each note
	noteOrd []string
	recent  lastTexts[*int] // the counts of the last notes, found without hashing
}

// factorUse is a factor row and the number of rows that used it.
type factorUse struct {
	f    *funcs.Factor
	rows int
}

const maxNotes = 1000

// countFactors counts each distinct factor of one row once.
func (p *provenance) countFactors(a, b []*funcs.Factor) { p.countFactorsN(a, b, 1) }

// countFactorsN counts each distinct factor of n rows with the same factors
// once a row.
func (p *provenance) countFactorsN(a, b []*funcs.Factor, rows int) {
	if p.used == nil {
		p.used = map[*funcs.Factor]*factorUse{}
	}
	var seen [16]*funcs.Factor
	n := 0
	for _, list := range [2][]*funcs.Factor{a, b} {
		for _, f := range list {
			if f == nil {
				continue
			}
			dup := false
			for _, s := range seen[:n] {
				if s == f {
					dup = true
					break
				}
			}
			if dup {
				continue
			}
			if n < len(seen) {
				seen[n] = f
				n++
			}
			u := p.used[f]
			if u == nil {
				u = &factorUse{f: f}
				p.used[f] = u
				p.usedOrd = append(p.usedOrd, f)
			}
			u.rows += rows
		}
	}
}

// noteCount counts a note of a result.
func (p *provenance) noteCount(note string) {
	if n, ok := p.recent.get(note); ok {
		*n++
		return
	}
	if p.notes == nil {
		p.notes = map[string]*int{}
	}
	n := p.notes[note]
	if n == nil {
		if len(p.notes) >= maxNotes {
			return
		}
		n = new(int)
		p.notes[note] = n
		p.noteOrd = append(p.noteOrd, note)
	}
	*n++
	p.recent.put(note, n)
}

// srcKey identifies the factor rows behind a row's numbers (up to sixteen:
// longer lists are joined each time).
type srcKey [16]*funcs.Factor

// srcIndex is a table's source texts by set of factors: the text's index
// and the rows after the first that used the set, counted into the
// provenance once the table is done (add), so that a row costs one lookup.
// last is the set of the row before, found without a lookup.
type srcIndex struct {
	byKey   map[srcKey]*srcUse
	lastKey srcKey
	last    *srcUse
}

type srcUse struct {
	i    int32
	more int
}

func newSrcIndex() *srcIndex { return &srcIndex{byKey: map[srcKey]*srcUse{}} }

// sourceIndex returns the index of the row's source text, building it once
// per distinct set of factors; the factors of a set's first row are counted
// at once (the order factors are first used in is the order of the
// sources sheet), the rows after by add.
func (sc *scanCtx) sourceIndex(t *table, idx *srcIndex, key srcKey, long []*funcs.Factor) int32 {
	if long == nil {
		if idx.last != nil && key == idx.lastKey {
			idx.last.more++
			return idx.last.i
		}
		if u, ok := idx.byKey[key]; ok {
			u.more++
			idx.lastKey, idx.last = key, u
			return u.i
		}
	}
	t.srcText = append(t.srcText, sourceText(append(key[:], long...)))
	i := int32(len(t.srcText) - 1)
	if long == nil {
		u := &srcUse{i: i}
		idx.byKey[key] = u
		idx.lastKey, idx.last = key, u
	}
	sc.countFactors(key[:], long)
	return i
}

// add counts the factors of the rows after each set's first.
func (idx *srcIndex) add(p *provenance) {
	for key, u := range idx.byKey {
		if u.more > 0 {
			p.countFactorsN(key[:], nil, u.more)
		}
	}
}

func slicesContains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}

// sourceText lists factor rows compactly, grouping the quantities of one
// pack and id: "ipcc2006/gas_diesel_oil: ncv, co2_ef; common/ch4/gwp100_ar5".
func sourceText(fs []*funcs.Factor) string {
	type group struct {
		head string
		qs   []string
	}
	var groups []*group
	byHead := map[string]*group{}
	dup := map[string]bool{}
	for _, f := range fs {
		if f == nil || dup[f.Key()] {
			continue
		}
		dup[f.Key()] = true
		h := f.Pack + "/" + f.ID
		g := byHead[h]
		if g == nil {
			g = &group{head: h}
			byHead[h] = g
			groups = append(groups, g)
		}
		g.qs = append(g.qs, f.Quantity)
	}
	parts := make([]string, len(groups))
	for i, g := range groups {
		if len(g.qs) == 1 {
			parts[i] = g.head + "/" + g.qs[0]
		} else {
			parts[i] = g.head + ": " + strings.Join(g.qs, ", ")
		}
	}
	return strings.Join(parts, "; ")
}
