package importer

import (
	"fmt"
	"strings"

	"github.com/fluecell/fluecell/funcs/units"
)

// mappingRun is what one scan did with Options.Mapping: which mapped header
// rows the header search reached, which tables the mapping set, and the
// first place where the workbook did not fit.
type mappingRun struct {
	m       *Mapping
	seen    []bool             // per mapped table: its header row was a candidate
	applied map[*tableSpec]int // tables read through the mapping, with their entry
	err     error
}

// mapping returns the scan's mapping state, nil without a mapping. On first
// use it puts the mapping's names into the fuel-name cache, so that
// detection and the rules read those cells through them.
func (sc *scanCtx) mapping() *mappingRun {
	if sc.opt.Mapping == nil {
		return nil
	}
	if sc.mapRun == nil {
		m := sc.opt.Mapping
		sc.mapRun = &mappingRun{m: m, seen: make([]bool, len(m.tables)), applied: map[*tableSpec]int{}}
		for text, id := range m.names {
			sc.names[text] = fuelRef{kind: nameFuel, name: id, id: id, alias: true}
		}
	}
	return sc.mapRun
}

// onSheet reports whether mapped table t is on sheet; a CSV file has one
// sheet, named after the file, so its name is not compared.
func (sc *scanCtx) onSheet(t *mapTable, sheet string) bool {
	return sc.csv || t.sheet == sheet
}

// mappedHeader says whether the mapping names header rows on the detector's
// sheet (named) and whether r is one of them (mapped). On such a sheet only
// the mapped rows are header candidates, whatever they look like.
func (d *detector) mappedHeader(r *row) (named, mapped bool) {
	run := d.sc.mapping()
	if run == nil {
		return false, false
	}
	for i := range run.m.tables {
		mt := &run.m.tables[i]
		if !d.sc.onSheet(mt, d.sheet) {
			continue
		}
		named = true
		if mt.headerRow == r.num {
			run.seen[i], mapped = true, true
		}
	}
	return named, mapped
}

// applyMapping sets the roles, units and fuels of t as the mapping says,
// when it maps t's header row, after checking that the header still reads
// as mapped. A mismatch is kept for the end of the scan, and t is left
// without roles.
func (d *detector) applyMapping(t *tableSpec) {
	run := d.sc.mapping()
	if run == nil {
		return
	}
	for i := range run.m.tables {
		mt := &run.m.tables[i]
		if !d.sc.onSheet(mt, t.sheet) || mt.headerRow != t.headerRow {
			continue
		}
		if err := run.apply(d, t, mt); err != nil {
			clearRoles(t)
			if run.err == nil {
				run.err = err
			}
			return
		}
		run.applied[t] = i
		return
	}
}

// where is "sheet "Fuel log" C4" for a message: a cell of t's header row.
func where(t *tableSpec, col int) string {
	return fmt.Sprintf("sheet %q %s", t.sheet, cellRef(col, t.headerRow))
}

func (run *mappingRun) errorf(path string, format string, args ...any) error {
	return &Error{Code: ErrMapping, Path: path, Msg: "mapping " + run.m.ref.Path + ": " + fmt.Sprintf(format, args...)}
}

func (run *mappingRun) apply(d *detector, t *tableSpec, mt *mapTable) error {
	path := d.sc.path
	for _, mc := range mt.cols {
		found := ""
		if c := t.colAt(mc.col); c != nil {
			found = c.hdr.Text
		}
		if !strings.EqualFold(cleanHeader(found), cleanHeader(mc.header)) {
			want, what := "header "+quoteText(mc.header), "an empty cell"
			if mc.header == "" {
				want = "an empty header cell"
			}
			if found != "" {
				what = quoteText(found)
			}
			return run.errorf(path, "%s: expected %s, found %s", where(t, mc.col), want, what)
		}
	}
	clearRoles(t)
	for _, mc := range mt.cols {
		if mc.role == roleNone {
			continue
		}
		c := t.colAt(mc.col)
		if c == nil {
			return run.errorf(path, "%s (%s): role %q for a column outside the table %s:%s, which has no header there",
				where(t, mc.col), mc.at, roleLabel(mc.role), cellRef(t.firstCol, t.headerRow), cellRef(t.lastCol, t.headerRow))
		}
		if err := run.setRole(d.lx, path, t, c, mt, &mc); err != nil {
			return err
		}
	}
	t.ctxFuel, t.ctxFrom, t.ctxUnit = mt.fuel, "mapping "+run.m.ref.Path, mt.unit
	if t.gas != nil && t.qty == nil {
		d.findCharge(t) // an inventory of charges: the column of what is held
	}
	ok := d.decideKind(t)
	switch {
	case mt.kind != "" && t.kind != mt.kind:
		return run.errorf(path, "%s (%s): the mapped roles make a %s table, not %s: %s",
			where(t, t.firstCol), mt.at, t.kind, mt.kind, kindNeeds(mt.kind))
	case !ok && len(d.sc.userRules) > 0:
		return run.errorf(path, "%s (%s): the table lacks a variable the rules use; it has %s",
			where(t, t.firstCol), mt.at, strings.Join(identList(t), ", "))
	case !ok:
		return run.errorf(path, "%s (%s): the mapped roles make no table fluecell computes: %s, or pass --rule",
			where(t, t.firstCol), mt.at, kindNeeds(kindFuelLog))
	}
	return nil
}

// setRole gives column c the mapped role, unit and fuel (lx reads a
// purchased-energy header); path is the
// workbook's, for errors.
func (run *mappingRun) setRole(lx *lexicon, path string, t *tableSpec, c *column, mt *mapTable, mc *mapCol) error {
	c.role = mc.role
	switch mc.role {
	case roleFuel:
		t.fuel = c
	case roleQuantity:
		t.qty = c
	case roleUnit:
		t.unit = c
	case roleWideFuel:
		c.fuelID, c.fuelAlias = mc.fuel, true
		t.wide = append(t.wide, c)
	case roleTech:
		t.tech = c
	case roleCapacity:
		t.capacity = c
	case roleCF:
		t.cf = c
	case roleLifetime:
		t.life = c
	case roleExisting:
		cc, ok := parseCarbonHeader(c.hdr.Text)
		if !ok {
			return run.errorf(path, "%s (%s): role existing-carbon needs a header naming a carbon figure and its unit, e.g. \"CO2 (kg)\" or \"tCO2e\"",
				where(t, c.col), mc.at)
		}
		c.carbon = cc
		t.existing = append(t.existing, c)
	case roleGroup:
		t.group = c
	case rolePeriod:
		t.periods = append(t.periods, c)
	case roleWhen:
		t.when = c
	case roleGrid:
		t.gridCol = c
	case roleGas:
		t.gas = c
	case roleSector:
		t.sector = c
	case roleVehicle:
		t.vehicle = c
	case roleCarrier:
		if c.carrier = lx.carrierOf(c.hdr.Base); c.carrier == carrierNone {
			c.carrier = carrierElectricity // the mapping says it is bought energy; a header naming no carrier is electricity
		}
		t.scope2 = append(t.scope2, c)
	default:
		return run.errorf(path, "%s (%s): role %q cannot be given by a mapping", where(t, c.col), mc.at, roleLabel(mc.role))
	}
	if mc.role != roleQuantity && mc.role != roleWideFuel && mc.role != roleCapacity && mc.role != roleCarrier {
		return nil
	}
	switch {
	case mc.unit != "":
		setHeaderUnit(c, mc.unit)
	case mt.unit != "" && c.hdr.UnitText == "" && c.hdr.UnitErr == nil:
		setHeaderUnit(c, mt.unit)
	}
	if mc.basis != units.NoBasis {
		if c.hdr.UnitText == "" || c.hdr.UnitErr != nil || c.hdr.Unit.Dim != units.Energy || c.hdr.Unit.Basis != units.NoBasis {
			return run.errorf(path, "%s (%s): basis %s applies to an energy unit without a basis, and the column's unit is %s; give the unit with its basis in \"unit\" instead",
				where(t, c.col), mc.at, mc.basis, unitDesc(c))
		}
		scale := c.hdr.Scale
		setHeaderUnit(c, c.hdr.UnitText+" "+mc.basis.String())
		c.hdr.Scale = scale
	}
	if c.hdr.UnitText != "" && c.unitIdent == "" {
		id := c.ident + "_unit"
		if tableIdents(t)[id] {
			return run.errorf(path, "%s (%s): the unit cannot be named %s, a column of that name exists: map that column to role none or give the table's unit",
				where(t, c.col), mc.at, id)
		}
		c.unitIdent = id
	}
	return nil
}

func unitDesc(c *column) string {
	if c.hdr.UnitText == "" {
		return "not given"
	}
	return quoteText(c.hdr.UnitText)
}

// setHeaderUnit replaces the unit a column's header states.
func setHeaderUnit(c *column, unit string) {
	h := parseHeader("x (" + unit + ")")
	c.hdr.UnitText, c.hdr.Unit, c.hdr.UnitErr, c.hdr.Percent, c.hdr.Scale = h.UnitText, h.Unit, h.UnitErr, h.Percent, h.Scale
	c.unitBad = false
}

// clearRoles takes every role off t's columns.
func clearRoles(t *tableSpec) {
	for _, c := range t.cols {
		c.role, c.fuelID, c.fuelAlias, c.partOf, c.carbon, c.carrier = roleNone, "", false, nil, carbonCol{}, carrierNone
	}
	t.fuel, t.qty, t.unit, t.group = nil, nil, nil, nil
	t.tech, t.capacity, t.cf, t.life = nil, nil, nil, nil
	t.wide, t.periods, t.existing, t.when = nil, nil, nil, nil
	t.gridCol, t.scope2, t.gas, t.charge, t.sector, t.vehicle = nil, nil, nil, nil, nil, nil
	t.headerErr = nil
}

// kindNeeds says which roles make a kind of table.
func kindNeeds(kind string) string {
	switch kind {
	case kindFuelLog:
		return "a fuel-log needs a quantity column and a fuel column (or the table's \"fuel\")"
	case kindWide:
		return "a wide table needs columns of role fuel-column, each with its fuel"
	case kindPeriods:
		return "a fuel-by-period table needs a fuel column and period columns"
	case kindBuildPlan:
		return "a build-plan needs a technology column and a capacity column"
	case kindRefrigerant:
		return "a refrigerant table needs a gas column and a quantity column of the mass released"
	case kindCharge:
		return "a refrigerant-charge table needs a gas column and no quantity column"
	case kindDistance:
		return "a vehicle-distance table needs a vehicle column and a quantity column of distances"
	}
	return "a custom table is read only with --rule"
}

// checkMapping ends the scan's use of the mapping: it records the mapping
// in the report and returns the first place where the workbook does not
// fit it (a header that moved, a mapped sheet or header row that is
// missing), as an *Error of code ErrMapping.
func (res *ScanResult) checkMapping() error {
	sc := res.sc
	run := sc.mapping()
	if run == nil {
		return nil
	}
	ref := run.m.Ref()
	res.Report.Mapping = &ref
	if run.err != nil {
		return run.err
	}
	found := map[int]*table{}
	for _, t := range sc.tables {
		if i, ok := run.applied[t.spec]; ok {
			found[i] = t
		}
	}
	for i := range run.m.tables {
		mt := &run.m.tables[i]
		if found[i] != nil || !sc.csv && sc.opt.Sheet != "" && mt.sheet != sc.opt.Sheet {
			continue
		}
		if !sc.csv && !contains(res.sheets, mt.sheet) {
			return run.errorf(res.Path, "sheet %q is missing (%s): the workbook's sheets are %s", mt.sheet, mt.at, quoteList(res.sheets))
		}
		at := fmt.Sprintf("sheet %q row %d (%s)", mt.sheet, mt.headerRow, mt.at)
		if run.seen[i] {
			return run.errorf(res.Path, "%s: no table under the header row: the rows below it are empty, or read as another header", at)
		}
		for _, t := range sc.tables {
			if t.spec.sheet == mt.sheet && t.spec.headerRow < mt.headerRow && mt.headerRow <= t.lastRow {
				return run.errorf(res.Path, "%s: the row was read as data of the table with its header at row %d; leave a blank row above the header", at, t.spec.headerRow)
			}
		}
		return run.errorf(res.Path, "%s: the header row is empty", at)
	}
	return nil
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}
