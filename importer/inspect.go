package importer

import (
	"context"
	"fmt"
	"strings"

	"github.com/fluecell/fluecell/funcs"
	"github.com/fluecell/fluecell/importer/tables"
)

// Inspection is how a workbook was read, for a person to check: its
// report (tables, columns with their roles and the reasons for them,
// sheets and why some have no table) and the texts of its fuel columns
// that are not fuel ids, with how each was read.
type Inspection struct {
	Path    string        `json:"path"`
	Format  string        `json:"format"`
	Report  *Report       `json:"report"`
	Names   []NameReading `json:"names"`
	Caution []string      `json:"caution"`

	from   []*mapTable // per table of the report: the mapping entry it was read with, or nil
	gwpSet string      // the GWP set the options or the mapping chose; "" when none
}

// NameReading is one distinct text of a fuel column and how it was read.
type NameReading struct {
	Text string `json:"text"`
	Fuel string `json:"fuel,omitempty"` // the fuel id; "" when none
	// Read is NameMapping, NameAlias, NamePhrase, NameNotFuel or NameUnknown.
	Read string `json:"read"`
	Cell string `json:"cell"` // the first cell that says so: "Fuel log!C7"
	Rows int    `json:"rows"` // how many rows say so
}

// How a fuel cell's text was read.
const (
	NameMapping = "mapping"    // through the mapping's names
	NameAlias   = "alias"      // an alias of the fuel: "Diesel" for gas_diesel_oil
	NamePhrase  = "phrase"     // a fuel named inside a longer text
	NameNotFuel = "not a fuel" // electricity, a total, a price: rows not computed on purpose
	NameUnknown = "unknown"    // no fuel: rows not computed; give it in the mapping's names
)

// Inspect reads the workbook or CSV file at path like Annotate and writes
// nothing. Errors are those of Scan, and ErrMapping when opt.Mapping does
// not fit the workbook.
func Inspect(ctx context.Context, e *funcs.Engine, path string, opt Options) (ins *Inspection, err error) {
	defer recoverInternal(&err, path)
	res, err := scanAnyFormat(ctx, e, path, opt, nil)
	if err != nil {
		return nil, err
	}
	ins = &Inspection{Path: path, Format: res.Format, Report: res.Report, Names: []NameReading{},
		Caution: []string{CautionTier1, CautionRegulated}}
	ins.from, ins.gwpSet = make([]*mapTable, len(res.sc.tables)), res.sc.opt.GWPSet
	for i, t := range res.sc.tables {
		res.explain(t.spec, &res.Report.Tables[i])
		if run := res.sc.mapRun; run != nil {
			if k, ok := run.applied[t.spec]; ok {
				ins.from[i] = &run.m.tables[k]
			}
		}
	}
	var mapped map[string]string
	if opt.Mapping != nil {
		mapped = opt.Mapping.names
	}
	index := map[string]int{}
	for _, t := range res.sc.tables {
		spec := t.spec
		if spec.fuel == nil {
			continue
		}
		slot, ok := t.slotOf[spec.fuel.col]
		if !ok {
			continue
		}
		for i := range t.n() {
			v := t.val(i, slot)
			if v.kind != kText || strings.TrimSpace(v.text) == "" {
				continue
			}
			if k, ok := index[v.text]; ok {
				ins.Names[k].Rows++
				continue
			}
			n := NameReading{Text: v.text, Cell: spec.sheet + "!" + cellRef(spec.fuel.col, t.rowNum(i)), Rows: 1}
			fr := res.sc.fuelName(v.text)
			switch {
			case mapped[v.text] != "":
				n.Fuel, n.Read = mapped[v.text], NameMapping
			case fr.kind == nameFuel && sameName(v.text, fr.id):
				continue // the fuel id itself
			case fr.kind == nameFuel && fr.name == strings.TrimSpace(v.text):
				n.Fuel, n.Read = fr.id, NameAlias
			case fr.kind == nameFuel:
				n.Fuel, n.Read = fr.id, NamePhrase
			case fr.kind != nameUnknown:
				n.Read = NameNotFuel
			default:
				n.Read = NameUnknown
			}
			index[v.text] = len(ins.Names)
			ins.Names = append(ins.Names, n)
		}
	}
	return ins, nil
}

// MappingFile returns the reading as a mapping file: one entry per table
// with every column that has a header or a role (and the unit and basis
// overrides of the mapping it was read with), and the names read through
// aliases, phrases or the mapping. A name read as no fuel is written with
// an empty id, which LoadMapping refuses until a person fills it in or
// removes it. It carries the GWP set the options or the mapping chose.
func (ins *Inspection) MappingFile() MappingFile {
	f := MappingFile{Version: MappingVersion, Tables: []MappedTable{}, Names: map[string]string{}, GWPSet: ins.gwpSet}
	for i, t := range ins.Report.Tables {
		mt := MappedTable{Sheet: t.Sheet, HeaderRow: t.HeaderRow, Kind: t.Kind, Columns: []MappedColumn{}}
		hasFuel, hasUnit := false, false
		for _, c := range t.Columns {
			hasFuel = hasFuel || c.Role == roleFuel.String()
			hasUnit = hasUnit || c.Role == roleUnit.String()
		}
		if !hasFuel && t.Kind == kindFuelLog {
			mt.Fuel = t.Fuel
		}
		if !hasUnit {
			mt.Unit = t.Unit
		}
		for _, c := range t.Columns {
			if c.Header == "" && c.Role == "" {
				continue
			}
			col, _, _ := parseRef(c.Cell)
			r, _ := roleByName(c.Role)
			mc := MappedColumn{Column: colName(col), Header: c.Header, Role: roleLabel(r), Fuel: c.Fuel}
			if i < len(ins.from) && ins.from[i] != nil {
				for _, old := range ins.from[i].cols {
					if old.col == col {
						mc.Unit, mc.Basis = old.unit, old.basis.String()
					}
				}
			}
			mt.Columns = append(mt.Columns, mc)
		}
		f.Tables = append(f.Tables, mt)
	}
	for _, n := range ins.Names {
		switch n.Read {
		case NameMapping, NameAlias, NamePhrase, NameUnknown:
			f.Names[n.Text] = n.Fuel
		}
	}
	return f
}

// explain adds to a table's description (of a finished scan) what the
// columns and the table were read from: the fuel and unit of a title, and per column the fuel of
// a fuel-column and why it has its role.
func (res *ScanResult) explain(spec *tableSpec, info *TableInfo) {
	info.Fuel, info.Unit = spec.ctxFuel, spec.ctxUnit
	entry := -1
	if run := res.sc.mapRun; run != nil {
		if i, ok := run.applied[spec]; ok {
			entry = i
		}
	}
	for i, c := range spec.cols {
		if i >= len(info.Columns) {
			break
		}
		ci := &info.Columns[i]
		if c.role == roleWideFuel {
			ci.Fuel = c.fuelID
		}
		if entry >= 0 {
			ci.Why = "not in the mapping"
			for _, mc := range res.sc.mapRun.m.tables[entry].cols {
				if mc.col == c.col {
					ci.Why = "mapping " + mc.at
				}
			}
			continue
		}
		ci.Why = whyRole(c)
	}
}

// whyRole says in a few words what gave a detected column its role.
func whyRole(c *column) string {
	st := &c.st
	h := st.hint
	also := func(s string, cond bool, more string) string {
		if cond {
			return s + "; " + more
		}
		return s
	}
	switch c.role {
	case roleFuel:
		return also(fmt.Sprintf("%d of %d sampled texts name fuels", st.fuel, st.text), h.Any(tables.HintFuel), "the header says fuel")
	case roleQuantity:
		s := "numbers"
		if c.hdr.UnitText != "" {
			s += " in " + c.hdr.UnitText
		}
		return also(s, h.Any(tables.HintQty), "the header names an amount")
	case roleUnit:
		return also(fmt.Sprintf("%d of %d sampled texts are units", st.unitLike, st.text), h.Any(tables.HintUnit), "the header says unit")
	case roleWideFuel:
		return "the header names " + c.fuelID + " and a unit"
	case rolePeriod:
		return "the header is a period; numbers"
	case roleTech:
		return fmt.Sprintf("%d of %d sampled texts name technologies", st.tech, st.text)
	case roleCapacity:
		return also("numbers", c.hdr.UnitText != "", "a unit of power in the header")
	case roleCF:
		return "the header names a capacity factor"
	case roleLifetime:
		return "the header names a lifetime"
	case roleExisting:
		return "the header names a carbon figure"
	case roleGroup:
		return "the header names a site, region or other group"
	case roleWhen:
		return "the header names the date or period of the row"
	case roleGrid:
		return "the header names a country or region; its values are grids"
	case roleCarrier:
		return "the header names purchased " + c.carrier.String() + " and an energy unit"
	case roleGas:
		return "its values name refrigerants or other fugitive gases"
	case roleSector:
		return "the header says sector; its values name sectors"
	case roleVehicle:
		return "its values name vehicle types"
	}
	switch {
	case c.partOf != nil:
		return "a part of " + colName(c.partOf.col) + ", the total of its fuel"
	case h.Any(tables.HintRate) || moneyHeader(c.hdr.Text):
		return "a price or rate"
	case h.Any(tables.HintTotal):
		return "a total"
	}
	return ""
}
