package importer

import (
	"strings"

	"github.com/fluecell/fluecell/funcs"
	"github.com/fluecell/fluecell/funcs/units"
	"github.com/fluecell/fluecell/importer/tables"
)

// lexicon reads what a cell or header text names: a fuel (directly or
// inside a phrase), a unit, a technology, a header's name and unit, and
// the role hints of its words. It holds the engine and the vocabulary and
// caches each reading per text (up to maxCache texts of each kind). Table
// detection needs only this of a scan; one lexicon belongs to one
// goroutine.
type lexicon struct {
	e     *funcs.Engine
	vocab *tables.Vocab
	fuels map[string]fuelRes
	units map[string]unitRes
	techs map[string]techRes
	hdrs  map[string]headerInfo
	names map[string]fuelRef
	// carriers and grids cache the readings of purchased energy (carrier.go, grid.go).
	carriers map[string]carrier
	grids    map[string]string
	gases    map[string]string // fugitive gas names (fugitive.go)
	modes    map[string]string // road modes by fuel id (fleet.go)
	vehicles map[string]string // vehicle types of distance-based rows (distance.go)
}

// newLexicon returns an empty lexicon over the engine; an error means the
// embedded vocabulary is malformed (a build defect caught by the tables
// tests).
func newLexicon(e *funcs.Engine) (*lexicon, error) {
	vocab, err := tables.NewVocab()
	if err != nil {
		return nil, err
	}
	return &lexicon{e: e, vocab: vocab, fuels: map[string]fuelRes{}, units: map[string]unitRes{}, techs: map[string]techRes{},
		hdrs: map[string]headerInfo{}, names: map[string]fuelRef{}, carriers: map[string]carrier{}, grids: map[string]string{}, gases: map[string]string{}, modes: map[string]string{}, vehicles: map[string]string{}}, nil
}

// fuel resolves a fuel name through the engine, cached.
func (lx *lexicon) fuel(s string) fuelRes {
	if longName(s) {
		return fuelRes{err: errNotAFuel} // not looked up, not cached (names.go)
	}
	if r, ok := lx.fuels[s]; ok {
		return r
	}
	var r fuelRes
	if m, ok := lx.e.LookupFuel(s); ok {
		r = fuelRes{id: m.Fuel.ID, alias: m.Alias, bio: m.Fuel.Biogenic, nonEnergy: m.Fuel.NonEnergy}
	} else {
		r.err = errNotAFuel // the message is built only for a cell that reports it (fuelMessage)
	}
	if len(lx.fuels) < maxCache {
		lx.fuels[s] = r
	}
	return r
}

// fuelMessage explains why s names no fuel (with a suggestion where one is
// close), for a finding at the cell.
func (lx *lexicon) fuelMessage(s string) string {
	if strings.TrimSpace(s) == "" {
		return "no fuel given: write the fuel, e.g. natural_gas or diesel"
	}
	if longName(s) {
		return longNameMessage(s)
	}
	_, _, err := lx.e.ResolveFuel(s)
	fe, ok := funcs.AsError(err)
	if ok && !strings.Contains(fe.Msg, "did you mean") {
		// "Natral Gas Deliveries": a suggestion for the name without its
		// usage words.
		if core := strings.Join(lx.vocab.Strip(words(s), tables.HintQty|tables.HintTotal), " "); core != "" && core != strings.ToLower(s) {
			if _, _, err2 := lx.e.ResolveFuel(core); err2 != nil {
				if fe2, ok2 := funcs.AsError(err2); ok2 && strings.Contains(fe2.Msg, "did you mean") {
					return strings.Replace(fe2.Msg, quoteText(core), quoteText(s), 1)
				}
			}
		}
	}
	if ok {
		return fe.Msg
	}
	return "unknown fuel " + quoteText(s)
}

// unit parses a unit string (any dimension), cached.
func (lx *lexicon) unit(s string) unitRes {
	if r, ok := lx.units[s]; ok {
		return r
	}
	var r unitRes
	u, err := units.Lookup(s) // most texts counted are no units: no suggestion work here (see unitMessage)
	if err != nil {
		ue, ok := err.(*units.Error)
		if !ok {
			ue = &units.Error{Input: s, Code: units.CodeUnknown, Msg: err.Error()}
		}
		r.err = ue
	} else {
		r.u = u
	}
	r.notAmount = tables.NotAmountUnit(s)
	if len(lx.units) < maxCache {
		lx.units[s] = r
	}
	return r
}

// notAmount says why a unit cell names no amount of fuel (a price or rate,
// a count), cached with the unit.
func (lx *lexicon) notAmount(s string) string { return lx.unit(s).notAmount }

// tech resolves a technology name through lifecycle_intensity, cached.
func (lx *lexicon) tech(s string) techRes {
	if longName(s) {
		return techRes{err: longTechError(s)} // not looked up, not cached (names.go)
	}
	if r, ok := lx.techs[s]; ok {
		return r
	}
	var r techRes
	res, err := lx.e.CallValues("lifecycle_intensity", s)
	if err != nil {
		r.err = err
	} else if len(res.Sources) > 0 {
		r.id = res.Sources[0].ID
	} else {
		r.id = s
	}
	if len(lx.techs) < maxCache {
		lx.techs[s] = r
	}
	return r
}

// header is parseHeader, cached.
func (lx *lexicon) header(s string) headerInfo {
	if h, ok := lx.hdrs[s]; ok {
		return h
	}
	h := parseHeader(s)
	if len(lx.hdrs) < maxCache {
		lx.hdrs[s] = h
	}
	return h
}

// unitLike reports a text that parses as a unit (or a known ambiguous one).
func (lx *lexicon) unitLike(s string) bool {
	u := lx.unit(s)
	return u.err == nil || u.err.Code != units.CodeUnknown
}

// unitMessage is the message for a unit that cannot be used, with the
// spelling suggestion that the cached lookup leaves out.
func (lx *lexicon) unitMessage(s string, e *units.Error) string {
	if e.Code == units.CodeUnknown {
		if _, err := units.Parse(s); err != nil {
			if ue, ok := err.(*units.Error); ok {
				return ue.Msg
			}
		}
	}
	return e.Msg
}

// fuelName reads a fuel from a cell text: the text itself, or a fuel named
// inside a phrase ("Natural Gas Consumption (Excluding ...)", "Gas Firm",
// "Diesel fuel used by the fleet"). A phrase with a price word is a rate,
// one with a total word an aggregate, one that names electricity, steam or
// a non-combustion source is not a fuel. Cached per text.
func (lx *lexicon) fuelName(s string) fuelRef {
	if r, ok := lx.names[s]; ok {
		return r
	}
	r := lx.readFuelName(s)
	if r.kind == nameFuel && lx.fuel(r.id).nonEnergy {
		// "Asphalt and road oil", "Lubricants": consumption of a material.
		r = fuelRef{kind: nameNotFuel, nonEnergy: true, why: r.id + ", a product used as a material, not burned (IPCC 2006 Vol 3 Ch 5, non-energy products)"}
	}
	r.same = r.kind == nameFuel && sameName(s, r.id)
	if len(lx.names) < maxCache {
		lx.names[s] = r
	}
	return r
}

func (lx *lexicon) readFuelName(s string) fuelRef {
	t := strings.TrimSpace(s)
	if t == "" || len(t) > 200 {
		return fuelRef{}
	}
	if f := lx.fuel(t); f.err == nil {
		return fuelRef{kind: nameFuel, name: t, id: f.id, alias: f.alias}
	}
	if desc, ok := lx.e.NotFuelName(t); ok {
		// "SUN", "WND", "Electricity": listed as no fuel burned.
		return fuelRef{kind: nameNotFuel, why: desc + ", not a fuel burned on site"}
	}
	// Brackets hold qualifiers: "(Excluding Supplemental Gaseous Fuels)",
	// "(bulk)"; the words after them still count ("... (other than
	// propane) price").
	if i := strings.IndexAny(t, "(["); i > 0 {
		if f := lx.fuel(strings.TrimSpace(t[:i])); f.err == nil {
			return fuelRef{kind: nameFuel, name: strings.TrimSpace(t[:i]), id: f.id, alias: true}
		}
		t = strings.TrimSpace(reAnyParen.ReplaceAllString(t, " "))
	}
	ws := words(t)
	if len(ws) == 0 {
		return fuelRef{}
	}
	h := lx.vocab.Hints(ws)
	if h.Any(tables.HintRate) || tables.RateText(t) {
		return fuelRef{kind: nameRate, why: "a price or rate"}
	}
	if h.Any(tables.HintTotal) {
		return fuelRef{kind: nameAggregate, why: "a total or aggregate"}
	}
	if h.Any(tables.HintSupply) {
		return fuelRef{kind: nameNotFuel, why: "production, trade or stocks, not fuel burned"}
	}
	// A word broken over a line with a hyphen: "Gas-oline", "Elec-tricity".
	if j := tables.Dehyphen(t); j != t {
		if f := lx.fuel(j); f.err == nil {
			return fuelRef{kind: nameFuel, name: j, id: f.id, alias: true}
		}
		ws = words(j)
	}
	// A footnote letter glued to a word ("Oila", "Coalc": superscripts
	// flattened): the word without it, where that names a fuel.
	for i, w := range ws {
		if len(w) >= 4 && w[len(w)-1] >= 'a' && w[len(w)-1] <= 'f' {
			if _, ok := lx.e.LookupFuel(w); !ok {
				if _, ok := lx.e.LookupFuel(w[:len(w)-1]); ok {
					ws = append(append([]string(nil), ws[:i]...), append([]string{w[:len(w)-1]}, ws[i+1:]...)...)
				}
			}
		}
	}
	// The longest run of words that names a fuel, unless another word of
	// the phrase is a misspelling of that fuel's name ("Natral gas" is a
	// typo to report, not gas).
	for n := min(len(ws), 4); n >= 1; n-- {
		for i := 0; i+n <= len(ws); i++ {
			cand := strings.Join(ws[i:i+n], " ")
			if n == 1 && len(cand) < 3 {
				continue // "no", "of": never a fuel on its own inside a phrase
			}
			if f := lx.fuel(cand); f.err == nil {
				if tables.Misspells(ws[:i], f.id) || tables.Misspells(ws[i+n:], f.id) {
					return fuelRef{}
				}
				if n == 1 && genericFuelWord[cand] && (lx.unknownWord(ws, i-1) || lx.unknownWord(ws, i+1)) {
					continue // "still gas", "hydrocarbon gas liquids": another product named with gas
				}
				if other := lx.otherFuelIn(ws, i, n, f.id); other != "" {
					return fuelRef{kind: nameAggregate, why: "several fuels together (" + cand + ", " + other + ")"}
				}
				return fuelRef{kind: nameFuel, name: cand, id: f.id, alias: true}
			}
		}
	}
	if h.Any(tables.HintNotFuel) && lx.fewUnknown(ws) {
		return fuelRef{kind: nameNotFuel, why: "not a fuel burned on site"}
	}
	return fuelRef{}
}

// headerFuel reads the fuel a column header names. Unlike a cell, a header
// may say total and still be one fuel's column ("U.S. Natural Gas Total
// Consumption"): the fuel is then looked for in the phrase.
func (lx *lexicon) headerFuel(s string) fuelRef {
	fr := lx.fuelName(s)
	if fr.kind != nameAggregate {
		return fr
	}
	if id := lx.phraseFuel(s); id != "" {
		return fuelRef{kind: nameFuel, name: id, id: id, alias: true}
	}
	return fr
}

// unknownWord reports whether ws[i] is a word that is neither in the
// header vocabulary, nor a number, nor a small joining word: the word that
// turns "gas" into another product ("still gas").
func (lx *lexicon) unknownWord(ws []string, i int) bool {
	if i < 0 || i >= len(ws) {
		return false
	}
	w := ws[i]
	if tables.AllDigits(w) || lx.vocab.Hints(ws[i:i+1]) != 0 {
		return false
	}
	switch w {
	case "by", "the", "of", "to", "in", "for", "and", "at", "as", "from", "on", "a", "an", "use", "used":
		return false
	}
	if f := lx.fuel(w); f.err == nil {
		return false
	}
	return true
}

// otherFuelIn returns another fuel named by the words outside ws[i:i+n]
// (a list of products: "asphalt and road oil, kerosene, petroleum coke"),
// or "".
func (lx *lexicon) otherFuelIn(ws []string, i, n int, id string) string {
	for k, w := range ws {
		if k >= i && k < i+n || len(w) < 4 || genericFuelWord[w] {
			continue
		}
		if f := lx.fuel(w); f.err == nil && f.id != id {
			return w
		}
	}
	return ""
}

// phraseFuel finds a fuel named anywhere in a phrase (longest run of words
// first), without the total and rate vetoes of fuelName: a title
// "Combined diesel purchases" still names diesel. "" when none.
func (lx *lexicon) phraseFuel(s string) string {
	ws := words(s)
	ws = lx.vocab.Strip(ws, tables.HintQty|tables.HintTotal)
	for n := min(len(ws), 4); n >= 1; n-- {
		for i := 0; i+n <= len(ws); i++ {
			cand := strings.Join(ws[i:i+n], " ")
			if n == 1 && len(cand) < 3 {
				continue
			}
			if f := lx.fuel(cand); f.err == nil {
				return f.id
			}
		}
	}
	return ""
}

// fewUnknown reports a phrase with at most one word outside the
// vocabulary ("Chilled Water", "Electric"): an energy carrier, not the name
// of a firm that has "Power" in it ("Alaska Power & Telephone").
func (lx *lexicon) fewUnknown(ws []string) bool {
	n := 0
	for i := range ws {
		if lx.unknownWord(ws, i) {
			n++
		}
	}
	return n <= 1
}
