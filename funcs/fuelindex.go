package funcs

import (
	"sort"
	"strings"
)

// fuelIndex resolves fuel names: canonical ids, built-in aliases and the vocabulary
// (data/fuel_names.csv). It is built once per Engine and never written afterwards, so it is
// safe for concurrent use.
type fuelIndex struct {
	byID    map[string]*Fuel
	exact   map[string]*nameEntry // ids and names exactly as listed
	codes   map[string]*nameEntry // statistics codes, upper-cased
	folded  map[string]*nameEntry // fuelKey of every id and name
	quals   map[string]bool       // qualifier words (fuelKey form)
	ordered []*Fuel
	keys    []string             // folded keys of fuels, sorted: the suggestion candidates
	family  map[string]familySet // families of the fuels whose names use a word
}

// nameEntry is what a name means. fuel is nil for a fuel without an id or for something
// that is not a fuel.
type nameEntry struct {
	fuel *Fuel
	kind string // "id", "alias", or a vocabulary kind
	row  *fuelName
}

// fuelMatch is a resolved name with the words that were ignored.
type fuelMatch struct {
	entry   *nameEntry
	alias   bool
	dropped []string
}

// familySet is a set of fuel families, one bit each (see familyBit).
type familySet uint8

// familyBit is the bit of a fuel's family: its Family, "biomass" for biogenic fuels without
// one, else a family of its own (peat).
func familyBit(f *Fuel) familySet {
	switch {
	case f.Family == "coal":
		return 1
	case f.Family == "oil":
		return 2
	case f.Family == "gas":
		return 4
	case f.Biogenic:
		return 8
	}
	return 16
}

// maxLookupBytes bounds the names that get qualifier stripping and suggestions: no fuel name
// is longer, and a paragraph in a fuel column must fail fast.
const maxLookupBytes = 128

// newFuelIndex indexes fuels and the vocabulary rows. A vocabulary row naming a fuel id
// that does not exist, or a name given two meanings, is an error.
func newFuelIndex(fuels []Fuel, vocab []fuelName) (*fuelIndex, error) {
	ix := &fuelIndex{byID: map[string]*Fuel{}, exact: map[string]*nameEntry{}, codes: map[string]*nameEntry{},
		folded: map[string]*nameEntry{}, quals: map[string]bool{}, family: map[string]familySet{}}
	for i := range fuels {
		f := &fuels[i]
		ix.byID[f.ID] = f
		ix.ordered = append(ix.ordered, f)
	}
	add := func(name string, en *nameEntry) error {
		k := fuelKey(name)
		if prev, ok := ix.folded[k]; ok {
			if prev.fuel != en.fuel || (prev.kind == nameBlend) != (en.kind == nameBlend) {
				return &PackFileError{File: "embedded:" + vocabularyFile, Line: lineOf(en), Reason: "name " + quote(name) + " has two meanings"}
			}
		} else {
			ix.folded[k] = en
		}
		if _, ok := ix.exact[name]; !ok {
			ix.exact[name] = en
		}
		return nil
	}
	for _, f := range ix.ordered {
		if err := add(f.ID, &nameEntry{fuel: f, kind: "id"}); err != nil {
			return nil, err
		}
		for _, a := range f.Aliases {
			if err := add(a, &nameEntry{fuel: f, kind: nameAlias}); err != nil {
				return nil, err
			}
		}
	}
	for i := range vocab {
		row := &vocab[i]
		en := &nameEntry{kind: row.kind, row: row}
		if row.fuelID != "" {
			if en.fuel = ix.byID[row.fuelID]; en.fuel == nil {
				return nil, &PackFileError{File: "embedded:" + vocabularyFile, Line: row.line, Column: "fuel_id", Reason: "unknown fuel id " + quote(row.fuelID)}
			}
		}
		if row.bioID != "" && ix.byID[row.bioID] == nil {
			return nil, &PackFileError{File: "embedded:" + vocabularyFile, Line: row.line, Column: "bio_fuel_id", Reason: "unknown fuel id " + quote(row.bioID)}
		}
		switch row.kind {
		case nameQualifier:
			ix.quals[fuelKey(row.name)] = true
		case nameCode:
			ix.codes[strings.ToUpper(row.name)] = en
		default:
			if (row.kind == nameUnmapped || row.kind == nameNotFuel) && len(row.name) <= 4 && strings.ToUpper(row.name) == row.name {
				ix.codes[row.name] = en // codes of what is no fuel here (SUN, RC): exact only
				continue
			}
			if err := add(row.name, en); err != nil {
				return nil, err
			}
		}
	}
	for k, en := range ix.folded {
		if en.fuel == nil || en.kind == nameBlend {
			continue
		}
		ix.keys = append(ix.keys, k)
		for _, w := range strings.Fields(k) {
			if len(w) >= 3 && !isDigits(w) && !ix.quals[w] {
				ix.family[w] |= familyBit(en.fuel)
			}
		}
	}
	sort.Strings(ix.keys)
	sort.Slice(ix.ordered, func(i, j int) bool { return ix.ordered[i].ID < ix.ordered[j].ID })
	return ix, nil
}

func lineOf(en *nameEntry) int {
	if en.row != nil {
		return en.row.line
	}
	return 0
}

// lookup resolves a name without building any message: exactly as written, as a statistics
// code, folded (fuelKey), then without a footnote mark and qualifier words.
func (ix *fuelIndex) lookup(name string) (fuelMatch, bool) {
	if en, ok := ix.exact[name]; ok {
		return fuelMatch{entry: en, alias: en.fuel == nil || name != en.fuel.ID}, true
	}
	trimmed := strings.TrimSpace(name)
	if len(trimmed) <= 4 {
		if en, ok := ix.codes[strings.ToUpper(trimmed)]; ok {
			return fuelMatch{entry: en, alias: true}, true
		}
	}
	if len(trimmed) > maxLookupBytes {
		return fuelMatch{}, false
	}
	key := fuelKey(trimmed)
	if en, ok := ix.folded[key]; ok {
		return fuelMatch{entry: en, alias: en.fuel == nil || trimmed != en.fuel.ID}, true
	}
	var dropped []string
	if rest, mark, ok := footnote(trimmed); ok {
		dropped = append(dropped, mark)
		key = fuelKey(rest)
		if en, ok := ix.folded[key]; ok {
			return fuelMatch{entry: en, alias: true, dropped: dropped}, true
		}
	}
	words := strings.Fields(key)
	kept := words[:0:0]
	for _, w := range words {
		if ix.quals[w] {
			dropped = append(dropped, w)
		} else {
			kept = append(kept, w)
		}
	}
	if len(kept) == 0 || len(kept) == len(words) {
		return fuelMatch{}, false
	}
	if en, ok := ix.folded[strings.Join(kept, " ")]; ok {
		return fuelMatch{entry: en, alias: true, dropped: dropped}, true
	}
	return fuelMatch{}, false
}

// resolve maps a user's fuel name to a fuel; see lookup. Its errors are *Error values: code
// CodeUnknownFuel naming what the name means (not a fuel, no fuel id) or, for an unknown name,
// a suggestion or the accepted ids.
func (ix *fuelIndex) resolve(name string) (fuelMatch, error) {
	m, ok := ix.lookup(name)
	switch {
	case ok && m.entry.fuel != nil:
		return m, nil
	case ok && m.entry.kind == nameNotFuel:
		return fuelMatch{}, &Error{Code: CodeUnknownFuel, Param: "fuel", Msg: quote(name) + " (" + m.entry.row.desc +
			") is not a fuel: fuel functions cover fuels burned on site; accepted fuel ids are " + ix.idList()}
	case ok:
		return fuelMatch{}, &Error{Code: CodeUnknownFuel, Param: "fuel", Msg: quote(name) + " (" + m.entry.row.desc +
			") is a fuel fluecell has no id for: add its factors under an id of your own with --factors, or choose one of " + ix.idList()}
	case strings.TrimSpace(name) == "":
		return fuelMatch{}, &Error{Code: CodeBadArgument, Param: "fuel", Msg: "empty fuel: give a fuel id such as natural_gas or gas_diesel_oil (list: fluecell factors, or GET /v1/factors)"}
	}
	return fuelMatch{}, &Error{Code: CodeUnknownFuel, Param: "fuel", Msg: ix.unknownMessage(name)}
}

func (ix *fuelIndex) idList() string {
	ids := make([]string, 0, len(ix.ordered))
	for _, f := range ix.ordered {
		ids = append(ids, f.ID)
	}
	return strings.Join(ids, ", ")
}

func (ix *fuelIndex) unknownMessage(name string) string {
	if s := ix.suggest(name); s != "" {
		return "unknown fuel " + quote(name) + ": did you mean " + s + "?"
	}
	return "unknown fuel " + quote(name) + ": accepted fuel ids are " + ix.idList() + " (aliases: fluecell factors, or GET /v1/factors)"
}

// suggest returns the fuel id whose name is closest to name by edit distance, or "" when
// nothing is close enough to be a plausible typo. Names of four characters or fewer get no
// suggestion (codes such as DFO or LIG resolve only exactly), nor do names over 64 bytes.
// A suggestion never crosses fuel families: when name's words belong to known fuel names
// ("oil", "diesel", "coal"), only fuels of the families of all those words are candidates.
func (ix *fuelIndex) suggest(name string) string {
	if len(name) > maxLookupBytes {
		return ""
	}
	n := fuelKey(name)
	runes := len([]rune(n))
	if runes <= 4 || len(n) > 64 {
		return ""
	}
	allowed := ^familySet(0)
	for _, w := range strings.Fields(n) {
		if fs, ok := ix.family[w]; ok {
			allowed &= fs
		}
	}
	if allowed == 0 {
		return ""
	}
	limit := max(1, min(4, runes/3))
	best, bestD := "", limit+1
	for _, key := range ix.keys {
		if d := len(key) - len(n); d > limit || -d > limit {
			continue
		}
		f := ix.folded[key].fuel
		if familyBit(f)&allowed == 0 {
			continue
		}
		if d := editDistance(n, key); d < bestD || d == bestD && f.ID < best {
			best, bestD = f.ID, d
		}
	}
	return best
}

// public turns a match into the exported FuelMatch.
func (m fuelMatch) public() FuelMatch {
	en := m.entry
	out := FuelMatch{Fuel: *en.fuel, Alias: m.alias, Kind: en.kind, FossilShare: 1, Dropped: m.dropped}
	if r := en.row; r != nil {
		out.Description, out.Source = r.desc, r.source
		if r.share != nil {
			out.FossilShare, _ = r.share.Float64()
			out.BioFuel = r.bioID
		}
	}
	return out
}
