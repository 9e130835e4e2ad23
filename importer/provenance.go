package importer

import "github.com/fluecell/fluecell/funcs"

// provenance collects the factor rows and notes behind the computed numbers,
// for the Carbon sources sheet: nothing is dropped between layers.
type provenance struct {
	used    map[*funcs.Factor]*factorUse
	usedOrd []*funcs.Factor
	notes   map[string]int
	noteOrd []string
}

// factorUse is a factor row and the number of rows that used it.
type factorUse struct {
	f    *funcs.Factor
	rows int
}

const maxNotes = 1000

// countFactors counts each distinct factor of one row once.
func (p *provenance) countFactors(a, b []*funcs.Factor) {
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
			u.rows++
		}
	}
}

// noteCount counts a note of a result.
func (p *provenance) noteCount(note string) {
	if p.notes == nil {
		p.notes = map[string]int{}
	}
	if _, ok := p.notes[note]; !ok {
		if len(p.notes) >= maxNotes {
			return
		}
		p.noteOrd = append(p.noteOrd, note)
	}
	p.notes[note]++
}
