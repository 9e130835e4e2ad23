package importer

import (
	"math"
	"path/filepath"
	"strings"

	"github.com/fluecell/fluecell/funcs"
)

// unitSeen counts the rows of one unit in a unit column (for unit-mixed).
type unitSeen struct {
	sym   string
	rows  int
	first int
}

// sample is a quantity kept for the outlier check.
type sample struct {
	row, col int
	v        float64
	// word is the workbook's own fuel name of the row, folded (lower case,
	// spaces collapsed); "" where the table gives none per row.
	word string
	// q is the amount a unit price was computed from (price samples only).
	q float64
}

// evaluate runs the table's rules over its rows and makes the checks that
// need whole columns: outliers, mixed units, existing carbon figures.
func (sc *scanCtx) evaluate(t *table) error {
	spec := t.spec
	sheet := spec.sheet
	n := t.n()
	t.res = make([]*paged[float64], len(t.rules))
	for i := range t.res {
		t.res[i] = newFixed(t.ps, n, math.NaN())
	}
	t.src = newFixed(t.ps, n, int32(-1))
	t.byFuel, t.byGroup = map[string]*sum{}, map[string]*sum{}
	t.decideStyles()
	sc.headerWarnings(t)
	sc.scope2Findings(t)
	sc.fleetFindings(t)
	sc.gallonHeaders(t)
	if spec.ctxFuel != "" && spec.fuel == nil && spec.qty != nil {
		// No fuel column: every row is the fuel the title, sheet or file
		// name gives. A title is the table's own word; a sheet or file
		// name is weaker, so it is a warning to check.
		sev, from := SevInfo, "the title "+quoteText(spec.ctxFrom)
		switch {
		case spec.ctxCol > 0:
			sev, from = SevWarning, "the header "+quoteText(spec.ctxFrom)+" ("+cellRef(spec.ctxCol, spec.headerRow)+")"
		case spec.ctxFrom == spec.sheet:
			sev, from = SevWarning, "the sheet name "+quoteText(spec.ctxFrom)
		case strings.HasPrefix(filepath.Base(sc.path), spec.ctxFrom):
			sev, from = SevWarning, "the file name "+quoteText(spec.ctxFrom)
		}
		sc.warn.add(sheet, spec.qty.col, spec.headerRow, sev, CodeFuelAlias, "no fuel column: every row of "+quoteText(spec.qty.hdr.Text)+
			" is read as "+spec.ctxFuel+", named by "+from+"; if that is not the fuel, name it in a mapping (fluecell inspect --write-mapping)")
	}
	for _, sl := range t.sections {
		sc.warn.add(sheet, sl.col, sl.row, SevInfo, CodeNotComputed, "a section label inside the table: not a data row")
	}
	for _, r := range t.totalRows {
		sc.warn.add(sheet, spec.firstCol, r, SevInfo, CodeNotComputed, "a total row: not computed, so its parts are not counted twice")
	}

	// The variables rows give, each once.
	main := t.mainRules()
	good := make(map[string]bool, len(main.binds))
	vars := make(map[string]any, len(main.binds))
	samples := newSampleSet(t.ps)
	st := &evalState{t: t, main: main, srcIndex: newSrcIndex(), samples: samples, wideK: sc.wideFactors(t)}
	annual := t.annualRows()
	again := t.sameAgain()
	forest := sc.sumForest(t)

	cumulative := t.cumulativeWhy()
	if cumulative != "" {
		sc.warn.add(sheet, spec.qty.col, spec.headerRow, SevWarning, CodeNotComputed, cumulative+
			"; rows not computed: give the amounts used (the differences) in a column of their own")
	}
	pipe := sc.newEvalPipe(st, vars, forest)
	defer pipe.stop()
	for i := 0; i < n; i++ {
		if i&4095 == 0 {
			if err := sc.cancelled(); err != nil {
				return err
			}
		}
		// t.res and t.src start as NaN and -1 (newFixed above).
		rs := sc.pickRules(t, i, main, again, annual, cumulative)
		if rs == nil {
			pipe.skipRow(i)
			continue
		}
		if rs != main {
			clear(vars)
			clear(good)
		}
		// Energy delivered (electricity, steam) has no heating-value basis.
		sc.delivered = rs.key != ""
		for _, b := range rs.binds {
			if t.omitted(i, b) {
				vars[b.name], good[b.name] = nil, false
				continue
			}
			v, ok := sc.value(t, i, b)
			vars[b.name], good[b.name] = v, ok
		}
		if forest != nil {
			t.maskRow(i, forest, vars)
		}
		pipe.ruleRow(i, rs, vars)
		for k, r := range rs.rules {
			pipe.tag(k)
			r = sc.variantFor(t, r, i, good)
			ok := true
			for _, b := range r.vars {
				if !good[b.name] {
					ok = false
					break
				}
			}
			pipe.job(r, rs.at[k], ok)
		}
		pipe.endRow()
	}
	pipe.flush()
	st.srcIndex.add(&sc.provenance)
	sc.checkOutliers(sheet, samples)
	sc.checkMixed(t)
	return nil
}

// blankRoles reports a row with nothing in the columns the rules or roles
// read (a note row inside the table): it is skipped without warnings.
// pickRules decides what row i is: nil for a row whose rules do not run
// (blank, a count of items, a repeat, an annual total, a meter reading, a
// row that cannot be computed), with its finding; else the rules it runs.
func (sc *scanCtx) pickRules(t *table, i int, main *ruleSet, again *paged[int32], annual *paged[int8], cumulative string) *ruleSet {
	spec := t.spec
	sheet := spec.sheet
	if t.blankRoles(i) {
		return nil
	}
	if sc.countRow(t, i) {
		return nil // a fuel card's merchandise or service line: no record of fuel
	}
	t.dataRows++
	t.markRow(i, rowFound, nil)
	rowNum := t.rowNum(i)
	if len(t.rules) == 0 && spec.headerErr != nil {
		// No rule could be written (no unit anywhere): each row says so
		// at its own cell, pointing at the header finding.
		c := t.slots[0]
		if spec.qty != nil {
			c = spec.qty
		}
		sc.warn.add(sheet, c.col, rowNum, SevInfo, CodeNotComputed, "not computed: "+spec.headerErr.Message[:strings.IndexByte(spec.headerErr.Message+";", ';')]+
			" (the error at "+spec.headerErr.Cell+")")
		return nil
	}
	if cumulative != "" {
		sc.warn.add(sheet, spec.qty.col, rowNum, SevInfo, CodeNotComputed, "a meter reading, not an amount used (see "+sheet+"!"+cellRef(spec.qty.col, spec.headerRow)+"); row not computed")
		return nil
	}
	if spec.kind == kindCharge {
		msg, col := chargeReason(spec)
		sc.warn.add(sheet, col, rowNum, SevInfo, CodeNotComputed, msg)
		return nil
	}
	if len(t.rules) == 0 && len(spec.scope2) > 0 {
		// Only purchased energy that cannot be computed: each row says so.
		c := spec.scope2[0]
		sc.warn.add(sheet, c.col, rowNum, SevInfo, CodeNotComputed, "not computed: "+quoteText(c.hdr.Text)+" is purchased "+c.carrier.String()+
			" (Scope 2) and no factor applies (see the findings at its header, "+cellRef(c.col, spec.headerRow)+")")
		return nil
	}
	if again != nil && again.at(i) != 0 {
		c := t.spec.fuel
		first := int(again.at(i))
		msg := "the same " + quoteText(t.val(i, t.slotOf[c.col]).text) + " again, in another unit: counted once, from row " + itoa(first)
		if first < 0 {
			msg = quoteText(t.val(i, t.slotOf[c.col]).text) + " is a part of row " + itoa(-first) + ", which is counted: not added twice"
		}
		sc.warn.add(sheet, c.col, rowNum, SevInfo, CodeNotComputed, msg)
		return nil
	}
	if annual != nil && annual.at(i) != 0 {
		c := t.spec.when
		v := t.val(i, t.slotOf[c.col])
		sc.warn.add(sheet, c.col, rowNum, SevInfo, CodeNotComputed, "an annual total among monthly rows ("+
			quoteText(cell{kind: v.kind, num: v.num, text: v.text}.display())+"): not computed, so the year is not counted twice")
		return nil
	}
	rs, skip := sc.rowRules(t, main, i)
	if skip {
		t.rowKind.set(i, rowScope2) // purchased energy that cannot be computed
		return nil
	}
	return rs
}

func (t *table) blankRoles(i int) bool {
	for s, c := range t.slots {
		if c.role == roleGroup || c.role == roleExisting || c.role == roleNone {
			continue
		}
		v := t.val(i, s)
		if v.kind != kEmpty || v.formula {
			if v.kind == kText && strings.TrimSpace(v.text) == "" {
				continue
			}
			return false
		}
	}
	return true
}

// headerWarnings records the problems of the header row: units in headers
// that cannot be used, fuel names read as aliases, per-fuel columns left out.
func (sc *scanCtx) headerWarnings(t *table) {
	spec := t.spec
	sheet, hr := spec.sheet, spec.headerRow
	if spec.headerErr != nil {
		w := spec.headerErr
		c, r, _ := parseRef(w.Cell)
		sc.warn.add(sheet, c, r, w.Severity, w.Code, w.Message)
	}
	used := map[*column]bool{}
	for _, r := range t.rules {
		for _, b := range r.vars {
			if b.unitOf != nil {
				used[b.unitOf] = true
			}
		}
	}
	for _, c := range spec.cols {
		if c.hdr.UnitErr != nil && (used[c] || c.role == roleWideFuel || c.role == roleCarrier || c.role == roleQuantity || c.role == roleCapacity) {
			msg := c.hdr.UnitErr.Msg + " (in the header " + quoteText(c.hdr.Text) + ")"
			if c.role == roleWideFuel || c.role == roleCarrier {
				msg += "; the column is left out of the totals"
			} else {
				msg += "; no row is computed from it"
			}
			sc.warn.add(sheet, c.col, hr, SevError, c.hdr.UnitErr.Code, msg)
			continue
		}
		if used[c] && c.hdr.UnitText != "" {
			power := c.role == roleCapacity
			sc.delivered = c.role == roleCarrier
			if _, ok := sc.checkUnit(t, c, c.hdr.UnitText, c.col, hr, power); !ok {
				c.unitBad = true
			}
			sc.delivered = false
		}
		if c.role == roleWideFuel && c.fromUnit {
			sc.warn.add(sheet, c.col, hr, SevInfo, CodeReadAs, unitFuelNote(c))
		} else if c.role == roleWideFuel && c.fuelAlias && !sameName(c.hdr.Base, c.fuelID) {
			sc.warn.add(sheet, c.col, hr, SevInfo, CodeFuelAlias, quoteText(c.hdr.Base)+" read as "+c.fuelID)
		}
		if c.role == roleWideFuel && c.hdr.UnitErr == nil && c.unitIdent != "" {
			sc.gasKWh(sheet, c.col, hr, c.fuelID, c.hdr.Unit)
		}
		if c.styleGuess && (c.role == roleQuantity || c.perColumn() || c.role == roleCapacity) {
			sc.warn.add(sheet, c.col, hr, SevInfo, CodeValueTextNumber, "numbers stored as text in "+quoteText(c.hdr.Text)+" read with "+c.numStyle.String()+
				": every such value there reads that way (\"20,523\" as 20523); set the column's number style in a mapping if they are decimals")
		}
		if c.biogenic {
			msg := quoteText(c.hdr.Text) + " is a biogenic fuel: its CO2 is a memo item, reported apart from fossil CO2, so the column is left out of the totals"
			if wideBiogenic(spec, c) {
				msg = quoteText(c.hdr.Text) + " is a biogenic fuel: its CO2 is a memo item, in the column " + BiogenicColumn + " and the biogenic total, not in tCO2 or tCO2e (fossil only)"
			}
			sc.warn.add(sheet, c.col, hr, SevInfo, CodeNotComputed, msg)
		}
		if c.sameAs != nil {
			what := c.sameAs.fuelID
			if what == "" {
				what = "purchased " + c.sameAs.carrier.String()
			}
			sc.warn.add(sheet, c.col, hr, SevInfo, CodeNotComputed, quoteText(c.hdr.Text)+" gives "+what+" again, in "+c.hdr.UnitText+
				": counted once, from "+quoteText(c.sameAs.hdr.Text)+" ("+colName(c.sameAs.col)+")")
		}

		if c.role == roleWideFuel && c.unitIdent == "" && c.hdr.UnitErr == nil {
			sc.warn.add(sheet, c.col, hr, SevError, CodeUnitUnknown, "no unit for "+quoteText(c.hdr.Text)+": write it in the header, e.g. "+quoteText(c.hdr.Base+" (L)")+"; the column is left out of the totals")
		}
	}
	if spec.kind == kindWide {
		sc.wideColumnNotes(t)
	}
}

// ruleError records why a rule failed on a row, at the cell of the
// parameter that failed.
func (sc *scanCtx) ruleError(t *table, i int, r *rule, err error) {
	sheet := t.spec.sheet
	rowNum := t.rowNum(i)
	code, msg := CodeRuleError, err.Error()
	var target *binding
	if fe, ok := funcs.AsError(err); ok {
		msg = fe.Msg
		if fe.Func != "" {
			msg = fe.Func + ": " + msg
		}
		switch fe.Code {
		case funcs.CodeUnit:
			code = fe.UnitCode
			if code == "" {
				code = CodeUnitUnknown
			}
		case funcs.CodeUnknownFuel:
			code = CodeFuelUnknown
		case funcs.CodeMissingFactor:
			code = CodeFactorMissing
		case funcs.CodeBadArgument:
			switch fe.Param {
			case "tech":
				code = CodeTechUnknown
			case "grid":
				code = CodeGridUnknown // a grid name of a cell the grid sets do not know
			}
		}
		if v, ok := r.paramVar[fe.Param]; ok {
			for _, b := range r.vars {
				if b.name == v {
					target = b
				}
			}
		}
	}
	if target == nil && len(r.vars) > 0 {
		target = r.vars[0]
	}
	col, row := t.spec.firstCol, rowNum
	switch {
	case target != nil && target.col != nil:
		col = target.col.col
	case target != nil && target.unitOf != nil:
		col, row = target.unitOf.col, t.spec.headerRow
	}
	sc.warn.add(sheet, col, row, SevError, code, "rule "+r.column+": "+msg+"; row not computed")
}

// wideFactors gives, per per-fuel column, tonnes of CO2 and CO2e per unit
// amount: the same plan the rule's calls use, for the totals by fuel.
func (sc *scanCtx) wideFactors(t *table) map[*column][2]float64 {
	if t.spec.kind != kindWide || len(sc.userRules) > 0 {
		return nil
	}
	out := map[*column][2]float64{}
	for _, c := range t.spec.wide {
		if c.unitIdent == "" || c.hdr.UnitErr != nil || c.unitBad {
			continue
		}
		a, err1 := sc.e.CallValues("fuel_co2", c.fuelID, 1.0, c.hdr.UnitText)
		b, err2 := sc.e.CallValues("fuel_co2e", c.fuelID, 1.0, c.hdr.UnitText, sc.gwpSetOrDefault())
		if t.spec.mobile != "" && !t.spec.stationary[c.fuelID] {
			a, err1 = sc.e.CallValues("mobile_co2", c.fuelID, 1.0, c.hdr.UnitText, modeFor(c.fuelID))
			b, err2 = sc.e.CallValues("mobile_co2e", c.fuelID, 1.0, c.hdr.UnitText, modeFor(c.fuelID), sc.gwpSetOrDefault())
		}
		if err1 == nil && err2 == nil {
			out[c] = [2]float64{a.Value, b.Value}
		}
	}
	return out
}

// rowTotals adds a row's numbers to the table's totals by fuel and group;
// key names the row's share in the totals by fuel when it is not its
// fuel's (purchased energy).
func (sc *scanCtx) rowTotals(t *table, i int, vars map[string]any, wideK map[*column][2]float64, key string) {
	var co2, co2e, scope2 float64
	has1, has2, has3 := false, false, false
	for ri, r := range t.rules {
		v := t.res[ri].at(i)
		if math.IsNaN(v) {
			continue
		}
		switch r.total {
		case 1:
			co2, has1 = v, true
		case 2:
			co2e, has2 = v, true
		case 3:
			scope2, has3 = v, true
		}
	}
	if !has1 && !has2 && !has3 {
		return
	}
	add := func(m map[string]*sum, ord *[]string, key string, a, b float64, hasA, hasB bool) {
		s := m[key]
		if s == nil {
			s = &sum{}
			m[key] = s
			*ord = append(*ord, key)
		}
		if hasA {
			s.TCO2 += a
		}
		if hasB {
			s.TCO2e += b
		}
		s.rows++
	}
	spec := t.spec
	switch {
	case !has1 && !has2:
	case spec.kind == kindWide && wideK != nil:
		for _, c := range spec.wide {
			k, ok := wideK[c]
			x, isNum := vars[c.ident].(float64)
			if !ok || !isNum || x == 0 {
				continue
			}
			if c.hdr.Scale != 0 {
				x *= c.hdr.Scale // "'000 L", "Million Cubic Feet": the rule scales it too
			}
			if c.hdr.Flow && c.hdr.FlowDays > 0 {
				d, _ := vars[periodDaysIdent].(float64)
				x *= d / c.hdr.FlowDays
			}
			add(t.byFuel, &t.fuelOrd, c.fuelID, x*k[0], x*k[1], has1, has2)
		}
	case key != "":
		add(t.byFuel, &t.fuelOrd, key, co2, co2e, has1, has2)
	default:
		key := "(all rows)"
		if spec.ctxFuel != "" {
			key = spec.ctxFuel
		}
		if spec.fuel != nil {
			if s, ok := vars[spec.fuel.ident].(string); ok {
				key = strings.TrimSpace(s)
				if f := sc.fuel(s); f.err == nil {
					key = f.id
				}
			}
		} else if spec.vehicle != nil {
			if s, ok := vars[spec.vehicle.ident].(string); ok {
				key = strings.TrimSpace(s)
				if id := sc.vehicleName(s); id != "" {
					key = id
				}
			}
		} else if spec.gas != nil {
			if s, ok := vars[spec.gas.ident].(string); ok {
				key = strings.TrimSpace(s)
				if id := sc.gasName(s); id != "" {
					key = id
				}
			}
		} else if spec.tech != nil {
			if s, ok := vars[spec.tech.ident].(string); ok {
				key = strings.TrimSpace(s)
				if r := sc.tech(s); r.err == nil {
					key = r.id
				}
			}
		}
		add(t.byFuel, &t.fuelOrd, key, co2, co2e, has1, has2)
	}
	if has3 {
		add(t.byFuel, &t.fuelOrd, scope2Key(spec), 0, scope2, false, true)
	}
	if g := spec.group; g != nil && key == "" && (has1 || has2) {
		// One kind per group total: the table's combustion (or embodied)
		// rows; purchased energy (Scope 2) is never added in.
		v := t.val(i, t.slotOf[g.col])
		key := strings.TrimSpace(cell{kind: v.kind, num: v.num, text: v.text}.display())
		if v.kind == kEmpty {
			key = "(blank)"
		}
		add(t.byGroup, &t.groupOrd, key, co2, co2e, has1, has2)
	}
}

// omitted reports an empty optional argument (capacity factor, lifetime)
// of a build-plan row: the technology's default applies.
func (t *table) omitted(i int, b *binding) bool {
	if b.col == nil || b.col.role != roleCF && b.col.role != roleLifetime || len(t.rules) == 0 || len(t.rules[0].optional) == 0 {
		return false
	}
	v := t.val(i, b.slot)
	return v.kind == kEmpty && !v.formula || v.kind == kText && strings.TrimSpace(v.text) == ""
}

// variantFor picks the rule variant for a row whose optional arguments are
// empty, and notes once per column that the defaults were used.
func (sc *scanCtx) variantFor(t *table, r *rule, i int, good map[string]bool) *rule {
	for k, c := range r.optional {
		if good[c.ident] || !t.omitted(i, &binding{col: c, slot: t.slotOf[c.col]}) {
			continue
		}
		rowNum := t.rowNum(i)
		msg := "empty " + strings.ToLower(c.hdr.Base) + ": the technology's default is used (see " + SheetSources + ")"
		if k+1 < len(r.optional) {
			if next := r.optional[k+1]; good[next.ident] {
				msg = "empty " + strings.ToLower(c.hdr.Base) + ": the technology's default capacity factor and lifetime are used, not the lifetime given in " + cellRef(next.col, rowNum)
			}
		}
		sc.warn.addOnce("optional|"+t.spec.sheet+"|"+colName(c.col)+"|"+itoa(rowNum), t.spec.sheet, c.col, rowNum, SevInfo, CodeValueNotNumber, msg)
		return r.variants[k]
	}
	return r
}

// decideStyles decides each amount column's number style from all its
// stored values (the sample that found the table may have held none
// written as text).
func (t *table) decideStyles() {
	for s, c := range t.slots {
		switch c.role {
		case roleQuantity, roleWideFuel, rolePeriod, roleCapacity, roleCF, roleLifetime, roleExisting, roleCarrier:
		default:
			continue
		}
		var texts []string
		for i := range t.n() {
			if v := t.val(i, s); v.kind == kText {
				if _, ok, amb := textNumber(v.text); ok || amb {
					texts = append(texts, v.text)
				}
			}
		}
		if len(texts) > len(c.st.numTexts) {
			c.st.numTexts = texts
			c.decideStyle()
		}
	}
}
