package importer

import (
	"math"
	"strings"

	"github.com/fluecell/fluecell/funcs/units"
	"github.com/fluecell/fluecell/importer/tables"
)

// colStats is the evidence of a column's sampled values: how many are
// numbers, fuel or technology names, units; how many numbers look like
// years, 0/1 flags or negatives.
type colStats struct {
	nonEmpty, num, text   int
	fuel, notFuel, tech   int
	unitLike, power, rate int
	years, flags, neg     int
	distinct              map[string]bool // distinct texts, up to a bound
	numTexts              []string        // numbers stored as text, for the column's number style
	hint                  tables.Hint     // the roles the header's words suggest
}

// fill is the share of sampled rows with a value in this column.
func (s *colStats) fill(rows int) float64 { return frac(s.nonEmpty, rows) }

// numShare is the share of non-empty values that are numbers.
func (s *colStats) numShare() float64 { return frac(s.num, s.nonEmpty) }

// count adds one sampled cell to the column's evidence.
func (d *detector) count(col *column, c cell) {
	st := &col.st
	if c.isBlank() && !c.noCache {
		return
	}
	if c.kind == kText && tables.Missing(c.text) {
		return // "Not Available", "NA", "--": no value, not text
	}
	st.nonEmpty++
	switch c.kind {
	case kNumber:
		st.num++
		d.countNumber(st, c.num)
		return
	case kEmpty:
		if c.noCache {
			st.num++ // a formula: most likely a number
		}
		return
	case kText:
	default:
		return
	}
	if f, ok, amb := textNumber(c.text); ok || amb {
		st.num++
		d.countNumber(st, f)
		if len(st.numTexts) < 200 {
			st.numTexts = append(st.numTexts, c.text)
		}
		return
	}
	st.text++
	sc := d.sc
	if st.distinct == nil {
		st.distinct = map[string]bool{}
	}
	if len(st.distinct) < 64 {
		st.distinct[strings.ToLower(strings.TrimSpace(c.text))] = true
	}
	switch fr := sc.fuelName(c.text); fr.kind {
	case nameFuel:
		st.fuel++
	case nameNotFuel, nameAggregate:
		st.notFuel++
	}
	if u := sc.unit(c.text); u.err == nil || u.err.Code != units.CodeUnknown {
		st.unitLike++
		if u.err == nil && u.u.Dim == units.Power {
			st.power++
		}
	} else if tables.RateText(c.text) || sc.vocab.Hints(words(c.text)).Any(tables.HintCount) {
		st.rate++ // "$ per Gallon", "Consumers": a unit column's other values
	}
	if sc.tech(c.text).err == nil {
		st.tech++
	}
}

func (d *detector) countNumber(st *colStats, x float64) {
	switch {
	case x < 0:
		st.neg++
	case x == 0 || x == 1:
		st.flags++
	}
	if x == math.Trunc(x) && (x >= 1900 && x <= 2100 || x >= 190001 && x <= 210013) {
		st.years++
	}
}

// nameKind says what a cell's text names.
type nameKind uint8

const (
	nameUnknown   nameKind = iota
	nameFuel               // a fuel (directly, or inside a phrase)
	nameNotFuel            // an energy carrier not burned on site (electricity, steam) or no combustion
	nameAggregate          // a total or aggregate ("Total fossil fuels", "Combined")
	nameRate               // a price or rate line ("Crude Oil Price")
)

// fuelRef is a fuel name read from a cell: the text passed to the rules
// (the cell itself, or the part of a phrase that names the fuel).
type fuelRef struct {
	kind  nameKind
	name  string // what the rules get
	id    string
	alias bool
	same  bool   // the text is the fuel id itself, written otherwise ("Natural Gas"): no alias note
	why   string // for nameNotFuel, nameAggregate, nameRate: the word that decided
}

// fuelName reads a fuel from a cell text: the text itself, or a fuel named
// inside a phrase ("Natural Gas Consumption (Excluding ...)", "Gas Firm",
// "Diesel fuel used by the fleet"). A phrase with a price word is a rate,
// one with a total word an aggregate, one that names electricity, steam or
// a non-combustion source is not a fuel. Cached per text.
func (sc *scanCtx) fuelName(s string) fuelRef {
	if r, ok := sc.names[s]; ok {
		return r
	}
	r := sc.readFuelName(s)
	r.same = r.kind == nameFuel && sameName(s, r.id)
	if len(sc.names) < maxCache {
		sc.names[s] = r
	}
	return r
}

func (sc *scanCtx) readFuelName(s string) fuelRef {
	t := strings.TrimSpace(s)
	if t == "" || len(t) > 200 {
		return fuelRef{}
	}
	if f := sc.fuel(t); f.err == nil {
		return fuelRef{kind: nameFuel, name: t, id: f.id, alias: f.alias}
	}
	// Brackets hold qualifiers: "(Excluding Supplemental Gaseous Fuels)",
	// "(bulk)"; the words after them still count ("... (other than
	// propane) price").
	if i := strings.IndexAny(t, "(["); i > 0 {
		if f := sc.fuel(strings.TrimSpace(t[:i])); f.err == nil {
			return fuelRef{kind: nameFuel, name: strings.TrimSpace(t[:i]), id: f.id, alias: true}
		}
		t = strings.TrimSpace(reAnyParen.ReplaceAllString(t, " "))
	}
	ws := words(t)
	if len(ws) == 0 {
		return fuelRef{}
	}
	h := sc.vocab.Hints(ws)
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
		if f := sc.fuel(j); f.err == nil {
			return fuelRef{kind: nameFuel, name: j, id: f.id, alias: true}
		}
		ws = words(j)
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
			if f := sc.fuel(cand); f.err == nil {
				if tables.Misspells(ws[:i], f.id) || tables.Misspells(ws[i+n:], f.id) {
					return fuelRef{}
				}
				if n == 1 && genericFuelWord[cand] && (sc.unknownWord(ws, i-1) || sc.unknownWord(ws, i+1)) {
					continue // "still gas", "hydrocarbon gas liquids": another product named with gas
				}
				if other := sc.otherFuelIn(ws, i, n, f.id); other != "" {
					return fuelRef{kind: nameAggregate, why: "several fuels together (" + cand + ", " + other + ")"}
				}
				return fuelRef{kind: nameFuel, name: cand, id: f.id, alias: true}
			}
		}
	}
	if h.Any(tables.HintNotFuel) {
		return fuelRef{kind: nameNotFuel, why: "not a fuel burned on site"}
	}
	return fuelRef{}
}

// decideStyle sets the column's number style from its numbers stored as
// text: the strict decision, or failing that the likely one (every
// "20,523" read the same way), which is then said in a finding at the
// header.
func (c *column) decideStyle() {
	v := countNumStyle(c.st.numTexts)
	c.numStyle = v.decide()
	if c.numStyle == styleUnknown {
		if c.numStyle = v.likely(); c.numStyle != styleUnknown {
			c.styleGuess = true
		}
	}
}

// headerFuel reads the fuel a column header names. Unlike a cell, a header
// may say total and still be one fuel's column ("U.S. Natural Gas Total
// Consumption"): the fuel is then looked for in the phrase.
func (sc *scanCtx) headerFuel(s string) fuelRef {
	fr := sc.fuelName(s)
	if fr.kind != nameAggregate {
		return fr
	}
	if id := sc.phraseFuel(s); id != "" {
		return fuelRef{kind: nameFuel, name: id, id: id, alias: true}
	}
	return fr
}

// genericFuelWord lists words that name a fuel alone but also belong to
// other products' names (still gas, gas liquids, road oil, lubricating oil).
var genericFuelWord = map[string]bool{"gas": true, "gases": true, "oil": true, "oils": true, "fuel": true}

// unknownWord reports whether ws[i] is a word that is neither in the
// header vocabulary, nor a number, nor a small joining word: the word that
// turns "gas" into another product ("still gas").
func (sc *scanCtx) unknownWord(ws []string, i int) bool {
	if i < 0 || i >= len(ws) {
		return false
	}
	w := ws[i]
	if tables.AllDigits(w) || sc.vocab.Hints(ws[i:i+1]) != 0 {
		return false
	}
	switch w {
	case "by", "the", "of", "to", "in", "for", "and", "at", "as", "from", "on", "a", "an", "use", "used":
		return false
	}
	if f := sc.fuel(w); f.err == nil {
		return false
	}
	return true
}

// otherFuelIn returns another fuel named by the words outside ws[i:i+n]
// (a list of products: "asphalt and road oil, kerosene, petroleum coke"),
// or "".
func (sc *scanCtx) otherFuelIn(ws []string, i, n int, id string) string {
	for k, w := range ws {
		if k >= i && k < i+n || len(w) < 4 || genericFuelWord[w] {
			continue
		}
		if f := sc.fuel(w); f.err == nil && f.id != id {
			return w
		}
	}
	return ""
}
