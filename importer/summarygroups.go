package importer

import (
	"sort"
	"strings"
)

// Totals by a grouping column (site, facility, department, building,
// account: the header words of vocab.csv's group role) and by fuel, with the
// workbook's own words for each fuel next to fluecell's id.

// Bounds of the group and fuel breakdowns.
const (
	// maxGroups is the number of distinct values a grouping column may
	// hold for a summary by it; more are read as labels of single rows.
	maxGroups = 60
	// maxFuelWords is the number of the workbook's spellings listed for
	// one fuel; more are counted.
	maxFuelWords = 4
)

// groupShares adds t's rows up by its grouping column, one set of lines per
// kind. why is set, and the lines nil, when the column's values do not
// group rows: more than maxGroups distinct values, or fewer than two rows
// per value on average (a label per row, such as a name or an invoice
// number, not a site).
func (t *table) groupShares() (ks *keyedShares, why string) {
	g := t.spec.group
	if g == nil || t.rowState == nil {
		return nil, ""
	}
	s, ok := t.slotOf[g.col]
	if !ok {
		return nil, ""
	}
	distinct := map[string]bool{}
	rows := 0
	for i := range t.rowState.len() {
		st := t.rowState.at(i)
		if st == rowBlank {
			continue
		}
		rows++
		if len(distinct) <= maxGroups {
			distinct[cellText(t.val(i, s))] = true
		}
	}
	switch {
	case rows == 0:
		return nil, ""
	case len(distinct) > maxGroups:
		return nil, "no totals by " + quoteText(g.hdr.Text) + ": more than " + itoa(maxGroups) + " distinct values in " + plural(rows, "row") + " (a label of single rows, not a grouping)"
	case 2*len(distinct) > rows && rows > 3:
		return nil, "no totals by " + quoteText(g.hdr.Text) + ": " + itoa(len(distinct)) + " distinct values in " + plural(rows, "row") + " (values that do not repeat do not group rows)"
	}
	ks = newKeyedShares(maxGroups+1, "(other)")
	main, scope2 := t.baseKinds()
	var buf [2]rowShare
	for i := range t.rowState.len() {
		n, data := t.rowShares(i, main, scope2, &buf)
		if !data {
			continue
		}
		key := cellText(t.val(i, s))
		for j := 0; j < n; j++ {
			ks.add(&buf[j], key, t.rowState.at(i) == rowComputed)
		}
	}
	return ks, ""
}

// fuelWords gathers, per kind and fluecell fuel id (or technology, vehicle,
// gas), the workbook's own words for it: the spellings of rows with a
// number first, those of rows without one only for a fuel with none.
type fuelWords struct {
	words   map[string][]string // kind + "|" + id -> spellings of rows with a number, up to maxFuelWords
	more    map[string]int      // such spellings past maxFuelWords
	idle    map[string][]string // spellings of rows without a number, up to maxFuelWords
	unknown map[string]bool     // kind + "|" + key: a text read as no fuel
}

// id is the fluecell id shown for key: the key, or a mark for a text that
// names no fuel fluecell knows.
func (fw *fuelWords) id(kind, key string) string {
	if fw.unknown[kind+"|"+key] {
		return "(unknown name)"
	}
	return key
}

func (fw *fuelWords) add(kind, id, word string, computed bool) {
	word = strings.TrimSpace(word)
	if word == "" {
		return
	}
	k := kind + "|" + id
	m := fw.words
	if !computed {
		m = fw.idle
	}
	for _, w := range m[k] {
		if w == word {
			return
		}
	}
	if len(m[k]) >= maxFuelWords {
		if computed && fw.more[k] < 1000 {
			fw.more[k]++ // a count past the bound, not the words: bounded state
		}
		return
	}
	m[k] = append(m[k], word)
}

// text lists the spellings of id under kind: "Natural gas; Natral gas".
func (fw *fuelWords) text(kind, id string) string {
	k := kind + "|" + id
	ws := fw.words[k]
	if len(ws) == 0 {
		ws = fw.idle[k]
	}
	s := strings.Join(ws, "; ")
	if n := fw.more[k]; n > 0 {
		s += "; and " + plural(n, "other spelling")
	}
	return s
}

// fuelShares adds every table's rows up by kind and fuel (technology for
// build plans, vehicle type, gas; a wide table's per-fuel columns), with
// the workbook's words for each fuel.
func (res *ScanResult) fuelShares() (*keyedShares, *fuelWords) {
	ks := newKeyedShares(1000, "(other fuels)")
	fw := &fuelWords{words: map[string][]string{}, more: map[string]int{}, idle: map[string][]string{}, unknown: map[string]bool{}}
	var buf [2]rowShare
	for _, t := range res.sc.tables {
		if t.rowState == nil || t.copyOf != nil {
			continue
		}
		spec := t.spec
		main, scope2 := t.baseKinds()
		if spec.kind == kindWide {
			res.wideFuelShares(t, main, ks, fw)
			continue
		}
		var named *column
		var lookup func(string) string
		switch {
		case spec.fuel != nil:
			named = spec.fuel
			lookup = func(s string) string {
				if fr := res.sc.fuelName(s); fr.kind == nameFuel {
					return fr.id // also a fuel named inside a longer text
				}
				return ""
			}
		case spec.vehicle != nil:
			named, lookup = spec.vehicle, res.sc.vehicleName
		case spec.gas != nil:
			named, lookup = spec.gas, res.sc.gasName
		case spec.tech != nil:
			named = spec.tech
			lookup = func(s string) string {
				if r := res.sc.tech(s); r.err == nil {
					return r.id
				}
				return ""
			}
		}
		for i := range t.rowState.len() {
			n, data := t.rowShares(i, main, scope2, &buf)
			if !data {
				continue
			}
			key, word, unknown := "(all rows)", "", false
			if spec.ctxFuel != "" {
				key, word = spec.ctxFuel, spec.ctxFrom
			}
			if named != nil {
				if s, ok := t.slotOf[named.col]; ok {
					word = cellText(t.val(i, s))
					key = word
					if id := lookup(word); id != "" {
						key = id
					} else if len(fw.unknown) < maxGroups {
						unknown = true
					}
				}
			}
			if t.rowKind.at(i) == rowScope2 {
				// Purchased energy named in the fuel column: its carrier,
				// as in the totals by fuel ("Scope 2: steam").
				if c := res.sc.rowCarrier(t, i); c != carrierNone {
					key, unknown = c.byTotal(), false
				}
			}
			for j := 0; j < n; j++ {
				k := key
				if buf[j].scope2Col {
					k = scope2Key(spec)
				}
				ks.add(&buf[j], k, t.rowState.at(i) == rowComputed)
				if !buf[j].scope2Col {
					fw.add(buf[j].kind, k, word, buf[j].has)
					if unknown {
						fw.unknown[buf[j].kind+"|"+k] = true
					}
				}
			}
		}
	}
	return ks, fw
}

// wideFuelShares adds a table of one column per fuel: its totals by fuel
// (evaluate.go keeps them per column), its Scope 2 columns, and its
// biogenic CO2 under the biogenic column's fuel. Rows are counted per fuel
// with a number.
func (res *ScanResult) wideFuelShares(t *table, main string, ks *keyedShares, fw *fuelWords) {
	s2 := scope2Key(t.spec)
	for _, k := range t.fuelOrd {
		s := t.byFuel[k]
		kind := main
		if k == s2 && len(t.spec.scope2) > 0 {
			kind = KindScope2
		}
		if kind == "" {
			continue
		}
		r := rowShare{kind: kind, co2: s.TCO2, co2e: s.TCO2e, has: true}
		ks.add(&r, k, true)
		// Rows with a number for this fuel: counted per column, so a fuel
		// of several columns counts no more than the table's rows.
		sh := ks.byKind[kind][k]
		n := min(s.rows, t.computed)
		sh.found += n - 1
		sh.computed += n - 1
	}
	for _, c := range t.spec.wide {
		fw.add(main, c.fuelID, c.hdr.Base, true)
	}
	bio, bioRows := 0.0, 0
	for i := range t.rowState.len() {
		if t.bio != nil && t.rowState.at(i) != rowBlank && isFinite(t.bio.at(i)) && t.bio.at(i) != 0 {
			bio += t.bio.at(i)
			bioRows++
		}
	}
	if bio == 0 || main == "" {
		return
	}
	key, word := "(biogenic columns)", ""
	var ids []string
	for _, c := range t.spec.cols {
		if wideBiogenic(t.spec, c) {
			f := res.sc.headerFuel(c.hdr.Base)
			ids = append(ids, f.id)
			word = c.hdr.Base
		}
	}
	sort.Strings(ids)
	if len(ids) == 1 {
		key = ids[0]
		fw.add(main, key, word, true)
	}
	r := rowShare{kind: main, bio: bio, has: true}
	ks.add(&r, key, true)
	sh := ks.byKind[main][key]
	sh.found += bioRows - 1
	sh.computed += bioRows - 1
}
