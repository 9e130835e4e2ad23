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
	if st.distinct == nil {
		st.distinct = map[string]bool{}
	}
	if len(st.distinct) < 64 {
		st.distinct[strings.ToLower(strings.TrimSpace(c.text))] = true
	}
	switch fr := d.lx.fuelName(c.text); fr.kind {
	case nameFuel:
		st.fuel++
	case nameNotFuel, nameAggregate:
		st.notFuel++
	}
	if u := d.lx.unit(c.text); unitSymbolish(c.text) && (u.err == nil || u.err.Code != units.CodeUnknown) {
		st.unitLike++
		if u.err == nil && u.u.Dim == units.Power {
			st.power++
		}
	} else if tables.RateText(c.text) || d.lx.vocab.Hints(words(c.text)).Any(tables.HintCount) {
		st.rate++ // "$ per Gallon", "Consumers": a unit column's other values
	}
	if d.lx.tech(c.text).err == nil {
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
	// nonEnergy: a fuel id whose use is mostly as a material (see funcs.Fuel.NonEnergy)
	nonEnergy bool
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

// genericFuelWord lists words that name a fuel alone but also belong to
// other products' names (still gas, gas liquids, road oil, lubricating oil).
var genericFuelWord = map[string]bool{"gas": true, "gases": true, "oil": true, "oils": true, "fuel": true}

// unitSymbolish reports a text that may be a unit: one letter only when it
// is written as the symbol (L, t, g, J), since a lone capital is more
// often a code ("G" for generator, "B" for boiler) than grams.
func unitSymbolish(s string) bool {
	s = strings.TrimSpace(s)
	if len(s) != 1 {
		return true
	}
	return strings.Contains("LltgJ", s)
}
