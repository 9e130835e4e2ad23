package funcs

import (
	"path"
	"slices"
	"sort"
	"strconv"
	"strings"

	"github.com/fluecell/fluecell/funcs/units"
)

// Grid sets are factor packs whose rows are all grid quantities (electricity,
// losses, purchased heat). They are loaded like any pack (data/grid_*.csv, a
// user's --factors file, a workbook's factor sheet) but are not fuel packs: the
// pack parameter of the fuel functions never lists them. A set's data year is
// the four digits that end its name (egrid2022, eea2014, uk2023); a user set
// without them is undated and serves any year.
//
// Quantities, per unit of delivered energy (no heating-value basis):
//
//	grid_co2, grid_ch4, grid_n2o      location-based rate of one gas (lb CO2/MWh, g CO2/kWh ...)
//	grid_co2e                         location-based total as the source states it
//	grid_ch4_co2e, grid_n2o_co2e      a gas stated as CO2e (the set's source_gwp100 rows give the GWP used)
//	market_co2, market_ch4, market_n2o, market_co2e   a supplier's or a residual-mix rate (market-based)
//	td_co2, td_co2e, td_ch4_co2e ...  transmission and distribution losses per unit consumed
//	grid_loss_rate                    share of electricity lost in transmission and distribution (unit 1)
//	heat_co2, heat_ch4, heat_n2o, heat_co2e ...   purchased steam, heat or cooling
//	boiler_efficiency                 the efficiency a heat row assumes (unit 1)
//	source_gwp100                     id ch4 or n2o: the GWP-100 a set used to state a gas as CO2e

// gridQuantities declares the quantities of grid sets for specFor.
func gridQuantities() map[string]quantitySpec {
	m := map[string]quantitySpec{}
	for _, s := range []string{"grid", "market", "td", "heat"} {
		for _, gas := range []struct{ q, species string }{{"co2", "CO2"}, {"ch4", "CH4"}, {"n2o", "N2O"}, {"co2e", "CO2e"}, {"ch4_co2e", "CO2e"}, {"n2o_co2e", "CO2e"}} {
			m[s+"_"+gas.q] = quantitySpec{numDim: units.Mass, species: gas.species, den: []units.Dimension{units.Energy}, perOutput: true,
				doc: s + " " + strings.ReplaceAll(gas.q, "_", " as ") + " per unit of delivered energy, e.g. kg " + gas.species + "/kWh"}
		}
	}
	m["grid_loss_rate"] = quantitySpec{fraction: true, doc: "share of electricity lost in transmission and distribution (unit 1)"}
	m["boiler_efficiency"] = quantitySpec{fraction: true, doc: "efficiency a heat factor assumes (unit 1)"}
	m["source_gwp100"] = quantitySpec{doc: "GWP-100 a set used to state a gas as CO2e (unit 1)"}
	return m
}

// isGridQuantity reports whether q belongs to grid sets (the names of
// gridQuantities, without building the map).
func isGridQuantity(q string) bool {
	switch q {
	case "grid_loss_rate", "boiler_efficiency", "source_gwp100":
		return true
	}
	stream, gas, ok := strings.Cut(q, "_")
	if !ok {
		return false
	}
	switch stream {
	case "grid", "market", "td", "heat":
	default:
		return false
	}
	switch gas {
	case "co2", "ch4", "n2o", "co2e", "ch4_co2e", "n2o_co2e":
		return true
	}
	return false
}

// gridOnly reports whether a pack is a grid set: every row is a grid quantity.
// Rows a user file adds to every pack (empty pack column) are ignored for an
// embedded pack, so that they do not turn a grid set into a fuel pack.
func (p *pack) gridOnly() bool {
	embedded := false
	for _, f := range p.rows {
		if strings.HasPrefix(f.File, "embedded:") {
			embedded = true
			break
		}
	}
	n := 0
	for _, f := range p.rows {
		if embedded && !strings.HasPrefix(f.File, "embedded:") {
			continue
		}
		if !isGridQuantity(f.Quantity) {
			return false
		}
		n++
	}
	return n > 0
}

// gridEdition is the rows one set gives for one grid (or one heat carrier).
type gridEdition struct {
	set  string // pack name, or the user file for rows given to every pack
	year int    // data year, 0 when undated
	rows map[string]*Factor
	gwp  map[string]*Factor // source_gwp100 rows of the set, by gas
}

// has reports whether the edition has any row of the stream (grid, market, td, heat).
func (ed *gridEdition) has(stream string) bool {
	for q := range ed.rows {
		if strings.HasPrefix(q, stream+"_") && q != "grid_loss_rate" {
			return true
		}
	}
	return false
}

// yearText is "2024", or "undated".
func (ed *gridEdition) yearText() string {
	if ed.year == 0 {
		return "undated"
	}
	return strconv.Itoa(ed.year)
}

// gridEntry is one grid with its editions, newest first.
type gridEntry struct {
	id, name string
	editions []*gridEdition
}

// gridIndex is built once per Engine from the loaded sets and the vocabulary,
// and never written afterwards.
type gridIndex struct {
	grids  map[string]*gridEntry
	ids    []string                           // sorted
	heat   map[string]map[string]*gridEdition // set -> carrier row id -> edition
	names  map[string]string                  // gridKey of a vocabulary name -> grid id
	titles map[string]string                  // set -> title
}

// GridInfo describes one grid the electricity functions accept.
type GridInfo struct {
	ID      string   `json:"id"`
	Name    string   `json:"name"`
	Sources []string `json:"sources"` // titles of the sets with rows for it
	Years   []int    `json:"years"`   // data years available, ascending (undated sets are not listed)
	Methods []string `json:"methods"` // "location" and/or "market"
	Losses  bool     `json:"losses"`  // transmission and distribution losses available
}

// builtinSetTitle describes the embedded grid sets.
func builtinSetTitle(set string) string {
	switch set {
	case "egrid2022":
		return "US EPA eGRID2022, CO2 total output emission rates by subregion"
	case "eea2014":
		return "European Environment Agency, CO2 emission intensity of electricity generation (2017 data set), 2014"
	case "eea2018":
		return "European Environment Agency, GHG emission intensity of electricity generation (assessment of 2020), 2018"
	case "uk2023":
		return "UK Government GHG Conversion Factors for Company Reporting 2023"
	case "canir2021_2017", "canir2021_2018", "canir2021_2019":
		return "Environment and Climate Change Canada, National Inventory Report 1990-2019 (2021) Annex 13, " + set[len(set)-4:]
	case "nga2024":
		return "Australian National Greenhouse Accounts Factors 2024"
	case "epahub2025":
		return "US EPA GHG Emission Factors Hub (2025)"
	}
	return ""
}

// setYear reads the data year that ends a set name ("egrid2024" is 2024).
func setYear(name string) int {
	if len(name) < 5 {
		return 0
	}
	y, err := strconv.Atoi(name[len(name)-4:])
	if err != nil || y < 1900 || y > 2200 || name[len(name)-5] >= '0' && name[len(name)-5] <= '9' {
		return 0
	}
	return y
}

// newGridIndex collects the grid rows of every pack. Rows a user file gave to
// every pack (empty pack column) are copies of one row: they form one undated
// edition named after the file.
func newGridIndex(ps *packSet, vocab []gridName) (*gridIndex, error) {
	ix := &gridIndex{grids: map[string]*gridEntry{}, heat: map[string]map[string]*gridEdition{}, names: map[string]string{}, titles: map[string]string{}}
	names := make([]string, 0, len(ps.packs))
	for n := range ps.packs {
		names = append(names, n)
	}
	sort.Strings(names)
	// A row a user file gave to every pack (empty pack column) is copied into
	// each: it appears under the same file and line more than once.
	copies := map[string]int{}
	for _, pn := range names {
		for k, f := range ps.packs[pn].rows {
			if isGridQuantity(k.quantity) {
				copies[f.File+":"+strconv.Itoa(f.Line)]++
			}
		}
	}
	type groupKey struct{ set, id string }
	groups := map[groupKey]*gridEdition{}
	var order []groupKey
	for _, pn := range names {
		p := ps.packs[pn]
		gridSet := p.gridOnly()
		gwp := map[string]*Factor{}
		for k, f := range p.rows {
			if k.quantity == "source_gwp100" && copies[f.File+":"+strconv.Itoa(f.Line)] == 1 {
				gwp[k.id] = f
			}
		}
		for k, f := range p.rows {
			if !isGridQuantity(k.quantity) || k.quantity == "source_gwp100" {
				continue
			}
			key, year, setGWP := groupKey{pn, k.id}, setYear(pn), gwp
			if copies[f.File+":"+strconv.Itoa(f.Line)] > 1 && pn != CommonPack {
				continue // one copy is enough: the common pack's, so that its key names no fuel or grid set
			}
			if copies[f.File+":"+strconv.Itoa(f.Line)] > 1 || !gridSet { // name them by their file
				key, year, setGWP = groupKey{f.File, k.id}, 0, nil
			}
			ed := groups[key]
			if ed == nil {
				ed = &gridEdition{set: key.set, year: year, rows: map[string]*Factor{}, gwp: setGWP}
				groups[key] = ed
				order = append(order, key)
			}
			ed.rows[k.quantity] = f
		}
	}
	for _, key := range order {
		ed, id := groups[key], key.id
		if ed.gwp == nil {
			ed.gwp = map[string]*Factor{}
		}
		ix.titles[ed.set] = builtinSetTitle(ed.set)
		if ix.titles[ed.set] == "" {
			ix.titles[ed.set] = "user set " + ed.set
		}
		if ed.has("heat") {
			if ix.heat[ed.set] == nil {
				ix.heat[ed.set] = map[string]*gridEdition{}
			}
			ix.heat[ed.set][id] = ed
			continue
		}
		g := ix.grids[id]
		if g == nil {
			g = &gridEntry{id: id, name: id}
			ix.grids[id] = g
			ix.ids = append(ix.ids, id)
		}
		g.editions = append(g.editions, ed)
	}
	sort.Strings(ix.ids)
	for _, g := range ix.grids {
		sort.SliceStable(g.editions, func(i, j int) bool {
			if g.editions[i].year != g.editions[j].year {
				return g.editions[i].year > g.editions[j].year
			}
			return g.editions[i].set < g.editions[j].set
		})
	}
	for _, n := range vocab {
		k := gridKey(n.name)
		if prev, dup := ix.names[k]; dup && prev != n.grid {
			return nil, &PackFileError{File: "embedded:" + gridVocabularyFile, Line: n.line, Reason: "name " + quote(n.name) + " is given to both " + prev + " and " + n.grid}
		}
		ix.names[k] = n.grid
		if g := ix.grids[n.grid]; g != nil && n.kind == "name" {
			g.name = n.name
		}
	}
	return ix, nil
}

// gridName is one row of the grid vocabulary.
type gridName struct {
	name, grid, kind, source string
	line                     int
}

const gridVocabularyFile = "grid_names.csv"

// embeddedGridNames reads data/grid_names.csv: name, grid, kind (name, code or
// alias), source. A malformed row fails with a *PackFileError.
func embeddedGridNames() ([]gridName, error) {
	file := "embedded:" + gridVocabularyFile
	b, err := embeddedData.ReadFile(path.Join("data", gridVocabularyFile))
	if err != nil {
		return nil, &PackFileError{File: file, Reason: err.Error()}
	}
	var out []gridName
	err = eachRow(b, file, []string{"name", "grid", "kind", "source"}, func(rec []string, line int, bad func(col, format string, args ...any) error) error {
		n := gridName{name: rec[0], grid: rec[1], kind: rec[2], source: rec[3], line: line}
		if gridKey(n.name) == "" || !validIdent(n.grid) || n.source == "" || (n.kind != "name" && n.kind != "code" && n.kind != "alias") {
			return bad("", "each row needs a name, a grid id, a kind (name, code or alias) and a source")
		}
		out = append(out, n)
		return nil
	})
	return out, err
}

// gridKey folds a grid name: lower case, dots dropped ("U.S." is "us"), and
// spaces, underscores, hyphens, slashes, commas and brackets as one space.
func gridKey(s string) string {
	s = strings.ReplaceAll(strings.ToLower(s), ".", "")
	return strings.Join(strings.FieldsFunc(s, func(r rune) bool {
		return r == ' ' || r == '_' || r == '-' || r == '/' || r == ',' || r == '(' || r == ')' || r == '\t' || r == '\u00a0' || r == ':'
	}), " ")
}

// gridPrefixWord reports words analysts put before a grid name in a header or
// title ("eGRID CAMX", "grid: DE", "subregion SRVC", "eGRID2023 RFCE"); common practice.
func gridPrefixWord(w string) bool {
	switch w {
	case "grid", "subregion", "region", "country", "the", "location":
		return true
	}
	return strings.HasPrefix(w, "egrid")
}

// resolve maps a grid id, code or name to a grid id.
func (ix *gridIndex) resolve(s string) (string, bool) {
	k := gridKey(s)
	for {
		if id := strings.ReplaceAll(k, " ", "_"); ix.grids[id] != nil {
			return id, true
		}
		if id, ok := ix.names[k]; ok && ix.grids[id] != nil {
			return id, true
		}
		first, rest, ok := strings.Cut(k, " ")
		if !ok || !gridPrefixWord(first) {
			return "", false
		}
		k = rest
	}
}

// ResolveGrid maps a grid as analysts write it (an id such as us_camx, an ISO
// code, a country name such as "Germany" or "UK", an eGRID acronym such as
// "CAMX" or "eGRID SRVC", a user's supplier id) to the grid. The error is an
// *Error naming the parameter grid, listing the accepted ids, with a
// suggestion when one is close.
func (e *Engine) ResolveGrid(name string) (GridInfo, error) {
	id, ok := e.grids.resolve(name)
	if !ok {
		return GridInfo{}, e.unknownGrid(name)
	}
	return e.grids.info(e.grids.grids[id]), nil
}

// LookupGrid is the cheap test of ResolveGrid: the grid id a name reads as, and
// whether it reads as one, without building an error message.
func (e *Engine) LookupGrid(name string) (string, bool) { return e.grids.resolve(name) }

// Grids describes every grid with rows loaded, sorted by id.
func (e *Engine) Grids() []GridInfo {
	out := make([]GridInfo, 0, len(e.grids.ids))
	for _, id := range e.grids.ids {
		out = append(out, e.grids.info(e.grids.grids[id]))
	}
	return out
}

func (ix *gridIndex) info(g *gridEntry) GridInfo {
	gi := GridInfo{ID: g.id, Name: g.name, Sources: []string{}, Years: []int{}, Methods: []string{}}
	years := map[int]bool{}
	methods := map[string]bool{}
	for _, ed := range g.editions {
		if !slices.Contains(gi.Sources, ix.titles[ed.set]) {
			gi.Sources = append(gi.Sources, ix.titles[ed.set])
		}
		if ed.year != 0 {
			years[ed.year] = true
		}
		if ed.has("grid") {
			methods[MethodLocation] = true
		}
		if ed.has("market") {
			methods[MethodMarket] = true
		}
		gi.Losses = gi.Losses || ed.has("td") || ed.rows["grid_loss_rate"] != nil
	}
	for y := range years {
		gi.Years = append(gi.Years, y)
	}
	sort.Ints(gi.Years)
	for _, m := range []string{MethodLocation, MethodMarket} {
		if methods[m] {
			gi.Methods = append(gi.Methods, m)
		}
	}
	return gi
}

// unknownGrid is the error for a grid no set or vocabulary row names.
func (e *Engine) unknownGrid(name string) error {
	msg := "unknown grid " + quote(name) + ": accepted are " + strings.Join(e.grids.ids, ", ") +
		", country names and eGRID acronyms (fluecell grids lists them), or the id of a factor row loaded with --factors"
	var options []string
	options = append(options, e.grids.ids...)
	for k := range e.grids.names {
		options = append(options, k)
	}
	sort.Strings(options)
	if sug := suggestFrom(gridKey(name), options); sug != "" {
		if id, ok := e.grids.names[sug]; ok && !slices.Contains(e.grids.ids, sug) {
			sug += " (" + id + ")"
		}
		msg = "unknown grid " + quote(name) + " (did you mean " + sug + "?): accepted are " + strings.Join(e.grids.ids, ", ") +
			", country names and eGRID acronyms (fluecell grids lists them), or the id of a factor row loaded with --factors"
	}
	return &Error{Code: CodeBadArgument, Param: "grid", Msg: msg}
}

// checkGrid is the compile-time check of a literal grid argument.
func checkGrid(e *Engine, s string) error {
	_, err := e.ResolveGrid(s)
	return err
}

// buildGridIndex reads the vocabulary and indexes the loaded grid sets.
func buildGridIndex(ps *packSet) (*gridIndex, error) {
	vocab, err := embeddedGridNames()
	if err != nil {
		return nil, err
	}
	return newGridIndex(ps, vocab)
}

// GridFactors resolves a grid as ResolveGrid does and lists the rows of every
// set that has it, newest data year first, with the GWP rows of sets that
// state gases as CO2e.
func (e *Engine) GridFactors(name string) (GridInfo, []*Factor, error) {
	gi, err := e.ResolveGrid(name)
	if err != nil {
		return GridInfo{}, nil, err
	}
	var out []*Factor
	for _, ed := range e.grids.grids[gi.ID].editions {
		qs := make([]string, 0, len(ed.rows))
		for q := range ed.rows {
			qs = append(qs, q)
		}
		sort.Strings(qs)
		for _, q := range qs {
			out = append(out, ed.rows[q])
		}
		for _, gas := range []string{"ch4", "n2o"} {
			if g := ed.gwp[gas]; g != nil && !slices.Contains(out, g) {
				out = append(out, g)
			}
		}
	}
	return gi, out, nil
}
