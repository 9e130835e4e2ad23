package importer

import (
	"strings"
)

// The mapping's entries for purchased energy and combustion: the grid of
// electricity (workbook or table), the sector of a table's combustion and
// which gallon a bare "gallons" means.

// grid reads an optional "grid" of obj and checks it through the engine.
func (p *mapParser) grid(obj map[string]any, at string) (string, error) {
	g, err := p.optStr(obj, "grid", at)
	if err != nil || g == "" {
		return "", err
	}
	info, err := p.e.ResolveGrid(strings.TrimSpace(g))
	if err != nil {
		return "", p.fail(joinPath(at, "grid"), "%s", funcsMsg(err))
	}
	return info.ID, nil
}

// sectors are the sectors fuel_co2e takes (IPCC 2006 Vol 2 Ch 2 Tables 2.2
// to 2.5).
var sectors = [...]string{"energy", "manufacturing", "commercial", "residential", "agriculture"}

// sector reads an optional "sector" of obj.
func (p *mapParser) sector(obj map[string]any, at string) (string, error) {
	s, err := p.optStr(obj, "sector", at)
	if err != nil || s == "" {
		return "", err
	}
	if x, ok := sectorName(s); ok {
		return x, nil
	}
	return "", p.fail(joinPath(at, "sector"), "unknown sector %q: accepted are %s", s, strings.Join(sectors[:], ", "))
}

// sectorName reads a sector as a mapping or a sector column writes it.
func sectorName(s string) (string, bool) {
	ws := words(s)
	switch {
	case hasWord(ws, "energy", "power", "electricity", "utility", "utilities"):
		return "energy", true
	case hasWord(ws, "manufacturing", "industry", "industrial", "construction"):
		return "manufacturing", true
	case hasWord(ws, "commercial", "institutional", "public", "services", "office"):
		return "commercial", true
	case hasWord(ws, "residential", "household", "households", "domestic", "housing"):
		return "residential", true
	case hasWord(ws, "agriculture", "agricultural", "farm", "farming", "forestry", "fishing"):
		return "agriculture", true
	}
	return "", false
}

// gallons reads an optional "gallons": us or imperial.
func (p *mapParser) gallons(obj map[string]any, at string) (string, error) {
	s, err := p.optStr(obj, "gallons", at)
	if err != nil || s == "" {
		return "", err
	}
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "us", "u.s.", "usa":
		return "us", nil
	case "imperial", "uk", "imp":
		return "imperial", nil
	}
	return "", p.fail(joinPath(at, "gallons"), "unknown gallon %q: accepted are us and imperial", s)
}

// mappedGrid is the grid the mapping gives t (its table entry, then the
// workbook's), with where it was read; "" when none.
func (sc *scanCtx) mappedGrid(t *tableSpec) (grid, from string) {
	run := sc.mapping()
	if run == nil {
		return "", ""
	}
	if i, ok := run.applied[t]; ok && run.m.tables[i].grid != "" {
		return run.m.tables[i].grid, "the mapping " + run.m.ref.Path + " (" + run.m.tables[i].at + ".grid)"
	}
	if run.m.grid != "" {
		return run.m.grid, "the mapping " + run.m.ref.Path
	}
	return "", ""
}

// mappedTable is the mapping's entry for t; nil when none.
func (sc *scanCtx) mappedTable(t *tableSpec) *mapTable {
	run := sc.mapping()
	if run == nil {
		return nil
	}
	if i, ok := run.applied[t]; ok {
		return &run.m.tables[i]
	}
	return nil
}

// gallonsOf is the gallon the mapping declares for t: "imperial" or "us"
// (the default).
func (sc *scanCtx) gallonsOf(t *tableSpec) string {
	if mt := sc.mappedTable(t); mt != nil && mt.gallons != "" {
		return mt.gallons
	}
	if run := sc.mapping(); run != nil && run.m.gallons != "" {
		return run.m.gallons
	}
	return "us"
}
