package importer

import (
	"math"
	"strconv"
	"strings"
)

// Kinds of emission a total is kept by. Totals of different kinds are never
// added together: Scope 1 combustion and fugitive releases, Scope 2 purchased
// energy and the embodied emissions of a build plan answer different
// questions (GHG Protocol Corporate Standard, ch. 4: scopes are reported
// separately).
const (
	KindStationary = "stationary_combustion" // Scope 1: fuel burned in boilers, furnaces, generators
	KindMobile     = "mobile_combustion"     // Scope 1: fuel burned in vehicles and machinery
	KindFugitive   = "fugitive"              // Scope 1: refrigerants and other gases released
	KindScope2     = "electricity_heat"      // Scope 2: purchased electricity, heat, steam, cooling
	KindEmbodied   = "embodied"              // building a plan's plants: life-cycle, in no scope of the year's inventory
	KindOther      = "other"                 // a table computed with the user's own rules
)

// kindOrder is the order kinds are reported in.
func kindOrder() []string {
	return []string{KindStationary, KindMobile, KindFugitive, KindScope2, KindEmbodied, KindOther}
}

// KindScope names the scope of a kind, for labels.
func KindScope(kind string) string {
	switch kind {
	case KindStationary, KindMobile, KindFugitive:
		return "Scope 1"
	case KindScope2:
		return "Scope 2"
	case KindEmbodied:
		return "embodied (life-cycle, not Scope 1 or 2)"
	}
	return "user rules"
}

// KindLabel is a kind as a person reads it: "stationary combustion (Scope 1)".
func KindLabel(kind string) string {
	switch kind {
	case KindEmbodied:
		return KindScope(kind)
	case KindScope2:
		return "purchased electricity and heat (" + KindScope(kind) + ")"
	}
	return strings.ReplaceAll(kind, "_", " ") + " (" + KindScope(kind) + ")"
}

// maxLeftOut is how many left-out rows a kind's total names.
const maxLeftOut = 5

// KindTotal is the total of one kind of emission, with how complete it is.
type KindTotal struct {
	Kind  string  `json:"kind"`  // KindStationary ... KindOther
	Scope string  `json:"scope"` // Scope 1, Scope 2, embodied (KindScope)
	TCO2  float64 `json:"tCO2"`  // fossil CO2, t
	TCO2e float64 `json:"tCO2e"` // CO2e, t; biogenic CO2 is not in it
	// Biogenic is the biogenic CO2 (wood, biogas, a blend's bio share), t:
	// a memo item, in neither TCO2 nor TCO2e.
	Biogenic float64 `json:"tCO2_biogenic"`
	// Rows found of this kind; Computed of them got a number from every
	// rule. Incomplete when fewer were computed than found: the total then
	// misses rows, the first of which LeftOut names by the cell of each
	// row's first error (else finding; else its first cell): "Fuel log!C11".
	Rows          int      `json:"rows"`
	Computed      int      `json:"computed"`
	Incomplete    bool     `json:"incomplete"`
	LeftOut       []string `json:"left_out"`
	NotComputable string   `json:"not_computable,omitempty"` // the sum is past the float64 range
	// Low and High are the 95 % interval of TCO2e by Approach (uncertainty.go);
	// absent when there is none, and IntervalNote then says why.
	TotalInterval
}

// Completeness is "13 of 16 rows computed", with ": incomplete" when rows
// are missing.
func (k *KindTotal) Completeness() string {
	s := strconv.Itoa(k.Computed) + " of " + plural(k.Rows, "row") + " computed"
	if k.Incomplete {
		s += ": incomplete"
	}
	return s
}

// Row kinds of table.rowKind.
const (
	rowBlank      int8  = -1 // not a data row
	rowFound      int8  = 0  // a data row, not computed
	rowComputed   int8  = 1  // a data row with a number from every rule
	rowDefault    uint8 = 0  // the table's kinds
	rowScope2     uint8 = 1  // purchased energy in a fuel log
	rowStationary uint8 = 2  // a fuel of a fleet burned on site
)

// baseKinds are the kinds of a table's rows: the combustion (or other) kind
// of its tCO2 and tCO2e rules, and Scope 2 when it has a Scope 2 column.
func (t *table) baseKinds() (main string, scope2 bool) {
	spec := t.spec
	main = KindStationary
	switch spec.kind {
	case kindCharge:
		return "", false // charges held are no emission: in no total
	case kindRefrigerant:
		main = KindFugitive
	case kindBuildPlan:
		main = KindEmbodied
	case kindDistance:
		main = KindMobile
	case kindCustom:
		main = KindOther
	default:
		if spec.mobile != "" {
			main = KindMobile
		}
	}
	comb := len(t.rules) == 0
	for _, r := range t.rules {
		switch r.total {
		case 3:
			scope2 = true
		default:
			comb = true
		}
	}
	if !comb && scope2 {
		main = ""
	}
	return main, scope2
}

// markRow records row i's state and, for a row of its own rules, its kind.
func (t *table) markRow(i int, state int8, rs *ruleSet) {
	if t.rowState == nil {
		n := t.n()
		t.rowState, t.rowKind = newFixed(t.ps, n, int8(rowBlank)), newFixed(t.ps, n, uint8(0))
	}
	t.rowState.set(i, state)
	switch {
	case rs == nil:
	case rs.key != "":
		t.rowKind.set(i, rowScope2)
	case t.spec.mobile != "" && len(rs.rules) > 0 && strings.Contains(rs.rules[0].src, "= fuel_co2"):
		t.rowKind.set(i, rowStationary)
	}
}

// biogenicSplit moves the biogenic CO2 of row i out of its tCO2 result: a
// biogenic fuel's CO2 (fuel_co2 returns it whole, with a note) or a blend's
// bio share (fuel_co2 leaves it out and states it in a memo note) goes to
// t.bio, and tCO2 keeps the fossil CO2 only.
func (sc *scanCtx) biogenicSplit(t *table, i int, vars map[string]any, notes []string) {
	ri := -1
	for k, r := range t.rules {
		if r.total == 1 {
			ri = k
		}
	}
	if ri < 0 || math.IsNaN(t.res[ri].at(i)) {
		return
	}
	if t.bio == nil {
		t.bio = newFixed(t.ps, t.n(), math.NaN())
	}
	bio := 0.0
	name := t.spec.ctxFuel
	if f := t.spec.fuel; f != nil {
		name, _ = vars[f.ident].(string)
	}
	if name != "" && sc.fuel(name).bio {
		bio = t.res[ri].at(i)
		t.res[ri].set(i, 0)
		col := t.spec.firstCol
		if t.spec.fuel != nil {
			col = t.spec.fuel.col
		}
		sc.warn.addOnce("biogenic|"+t.spec.sheet+"|"+itoa(t.spec.headerRow), t.spec.sheet, col, t.rowNum(i), SevInfo, CodeNotComputed,
			quoteText(name)+" is a biogenic fuel: its CO2 is a memo item, in the column "+BiogenicColumn+" and its own total, not in tCO2 or tCO2e (fossil only; here and in every row of a biogenic fuel)")
	} else {
		for _, n := range notes {
			co2, ok := sc.memoNotes.get(n)
			if !ok {
				co2 = memoCO2(n)
				sc.memoNotes.put(n, co2)
			}
			bio += co2
		}
	}
	t.bio.set(i, bio)
	if bio != 0 {
		t.hasBio = true
	}
}

// memoCO2 reads the tonnes of biogenic CO2 a blend's memo note states
// ("...is biogenic, its CO2 (0.4886616 t) is a memo item..."); 0 for other notes.
func memoCO2(note string) float64 {
	const pre, post = "is biogenic, its CO2 (", " t) is a memo item"
	a := strings.Index(note, pre)
	if a < 0 {
		return 0
	}
	rest := note[a+len(pre):]
	b := strings.Index(rest, post)
	if b < 0 {
		return 0
	}
	v, err := strconv.ParseFloat(rest[:b], 64)
	if err != nil || !isFinite(v) {
		return 0
	}
	return v
}

// kindTotals adds the table's rows to the totals by kind.
func (t *table) kindTotals(m map[string]*KindTotal) {
	if t.rowState == nil || t.copyOf != nil {
		return
	}
	main, scope2 := t.baseKinds()
	get := func(k string) *KindTotal {
		kt := m[k]
		if kt == nil {
			kt = &KindTotal{Kind: k, Scope: KindScope(k), LeftOut: []string{}}
			m[k] = kt
		}
		return kt
	}
	for i := range t.rowState.len() {
		st := t.rowState.at(i)
		if st == rowBlank {
			continue
		}
		comb, s2 := main, scope2
		switch t.rowKind.at(i) {
		case rowScope2:
			comb, s2 = KindScope2, false
		case rowStationary:
			comb = KindStationary
		}
		for _, k := range [2]string{comb, KindScope2} {
			if k == "" || k == KindScope2 && !s2 && comb != KindScope2 {
				continue
			}
			kt := get(k)
			kt.Rows++
			if st == rowComputed {
				kt.Computed++
			} else if len(kt.LeftOut) < maxLeftOut {
				kt.LeftOut = append(kt.LeftOut, t.spec.sheet+"!"+cellRef(t.spec.firstCol, t.rowNum(i)))
			}
		}
		for ri, r := range t.rules {
			v := t.res[ri].at(i)
			if math.IsNaN(v) {
				continue
			}
			switch {
			case r.total == 3:
				get(KindScope2).TCO2e += v
			case r.total == 1 && comb != "":
				get(comb).TCO2 += v
			case r.total == 2 && comb != "":
				get(comb).TCO2e += v
			}
		}
		if t.bio != nil && !math.IsNaN(t.bio.at(i)) && comb != "" {
			get(comb).Biogenic += t.bio.at(i)
		}
	}
}

// byKind lists the totals of m in kindOrder, marking each incomplete one (a
// sum past the float64 range is marked by checkTotals).
func byKind(m map[string]*KindTotal) []KindTotal {
	out := []KindTotal{}
	for _, k := range kindOrder() {
		kt := m[k]
		if kt == nil {
			continue
		}
		kt.Incomplete = kt.Computed < kt.Rows
		kt.TCO2, kt.TCO2e, kt.Biogenic = cleanZero(kt.TCO2), cleanZero(kt.TCO2e), cleanZero(kt.Biogenic)
		out = append(out, *kt)
	}
	return out
}

// scope1 reports a kind whose total is in Report.Totals.
func scope1(kind string) bool {
	return kind == KindStationary || kind == KindMobile || kind == KindFugitive
}

// finiteKinds marks every total of ks past the float64 range as not
// computable, and reports whether all were finite.
func finiteKinds(ks []KindTotal) bool {
	ok := true
	for i := range ks {
		kt := &ks[i]
		if !isFinite(kt.TCO2) || !isFinite(kt.TCO2e) || !isFinite(kt.Biogenic) {
			kt.TCO2, kt.TCO2e, kt.Biogenic, kt.NotComputable = 0, 0, 0, overflowNote
			kt.TotalInterval = TotalInterval{}
			ok = false
		}
	}
	return ok
}

// wideBiogenic reports a per-fuel column of a biogenic fuel (wood pellets
// (t)) of a table with one column per fuel: its CO2 is computed into the
// biogenic column, never into tCO2 or tCO2e.
func wideBiogenic(spec *tableSpec, c *column) bool {
	return spec.kind == kindWide && c.biogenic && c.role == roleNone && c.hdr.UnitErr == nil && c.hdr.UnitText != "" && !c.hdr.Flow
}

// wideBiogenicRow adds to row i's biogenic CO2 the CO2 of the biogenic
// columns of a wide table: amount x fuel_co2 of the column's fuel per unit
// of the header's unit (a cell that is not a number adds nothing).
func (sc *scanCtx) wideBiogenicRow(t *table, i int) {
	if t.spec.kind != kindWide || len(sc.userRules) > 0 || t.res == nil {
		return
	}
	for s, c := range t.slots {
		if !wideBiogenic(t.spec, c) {
			continue
		}
		v := t.val(i, s)
		if v.kind != kNumber || v.num == 0 {
			continue
		}
		f := sc.headerFuel(c.hdr.Base)
		r, err := sc.e.CallValues("fuel_co2", f.id, 1.0, c.hdr.UnitText)
		if err != nil {
			continue
		}
		x := v.num
		if c.hdr.Scale != 0 {
			x *= c.hdr.Scale
		}
		if t.bio == nil {
			t.bio = newFixed(t.ps, t.n(), math.NaN())
		}
		if math.IsNaN(t.bio.at(i)) {
			t.bio.set(i, 0)
		}
		t.bio.set(i, t.bio.at(i)+x*r.Value)
		t.hasBio = true
	}
}

// pointLeftOut turns each left-out row ("Fuel log!A11") into the cell of the
// row's first error, else its first finding ("Fuel log!C11"): the cell that
// says why the row was left out.
func (rep *Report) pointLeftOut() {
	at := map[string]string{} // "sheet!row" -> cell
	for _, sev := range []string{SevError, SevWarning, SevInfo} {
		for _, w := range rep.Warnings {
			if w.Severity != sev {
				continue
			}
			_, row, ok := parseRef(w.Cell)
			if !ok {
				continue
			}
			k := w.Sheet + "!" + itoa(row)
			if _, seen := at[k]; !seen {
				at[k] = w.Cell
			}
		}
	}
	fix := func(ks []KindTotal) {
		for i := range ks {
			for j, ref := range ks[i].LeftOut {
				n := strings.LastIndexByte(ref, '!')
				_, row, ok := parseRef(ref[n+1:])
				if !ok {
					continue
				}
				if c, ok := at[ref[:n]+"!"+itoa(row)]; ok {
					ks[i].LeftOut[j] = ref[:n+1] + c
				}
			}
		}
	}
	fix(rep.ByKind)
	for i := range rep.Tables {
		fix(rep.Tables[i].ByKind)
	}
}
