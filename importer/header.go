package importer

import (
	"regexp"
	"strconv"
	"strings"
	"unicode"

	"github.com/fluecell/fluecell/funcs/units"
	"github.com/fluecell/fluecell/importer/tables"
)

// headerInfo is a header as the tables stage reads it (tables.Header).
type headerInfo = tables.Header

// parseHeader splits a header into name and unit (tables.ParseHeader).
func parseHeader(raw string) headerInfo { return tables.ParseHeader(raw) }

// cleanHeader folds white space, footnote marks, plural markers and the
// subscript two of "CO₂" (tables.Clean).
func cleanHeader(s string) string { return tables.Clean(s) }

// reAnyParen finds each bracketed part of a text (tables.AnyParen).
var reAnyParen = tables.AnyParen

// exprWords may not be identifiers of an expression.
var exprWords = map[string]bool{"in": true, "not": true, "and": true, "or": true, "true": true, "false": true,
	"nil": true, "let": true, "matches": true, "contains": true, "startswith": true, "endswith": true,
	"if": true, "else": true, "has": true}

// identFor turns a header into a snake_case identifier: lower-case letters,
// digits and underscores; an empty or numeric-leading name gets a prefix.
func identFor(s string, col int) string {
	var b strings.Builder
	under := false
	for _, r := range strings.ToLower(s) {
		switch {
		case r < 128 && (r >= 'a' && r <= 'z' || r >= '0' && r <= '9'):
			if under && b.Len() > 0 {
				b.WriteByte('_')
			}
			under = false
			b.WriteRune(r)
		case r >= 128 && (unicode.IsLetter(r) || unicode.IsDigit(r)):
			if under && b.Len() > 0 {
				b.WriteByte('_')
			}
			under = false
			b.WriteRune(foldAccent(r))
		default:
			under = true
		}
	}
	id := b.String()
	if len(id) > 60 {
		id = strings.TrimRight(id[:60], "_")
	}
	switch {
	case id == "":
		return "col_" + strings.ToLower(colName(col))
	case id[0] >= '0' && id[0] <= '9':
		return "c_" + id
	case exprWords[id]:
		return id + "_col"
	}
	return id
}

// foldAccent maps common Latin letters with accents to ASCII so that
// "Énergie" and "Energie" give one identifier.
func foldAccent(r rune) rune {
	const from, to = "àáâãäåçèéêëìíîïñòóôõöùúûüýÿ", "aaaaaaceeeeiiiinooooouuuuyy"
	fr, tr := []rune(from), []rune(to)
	for i, c := range fr {
		if c == r {
			return tr[i]
		}
	}
	return r
}

// words lower-cases s and splits it into words (tables.Words: also at
// snake_case and CamelCase boundaries, footnote digits dropped).
func words(s string) []string { return tables.Words(s) }

// hasWord reports whether ws contains any of the words (tables.Has).
func hasWord(ws []string, any ...string) bool { return tables.Has(ws, any...) }

// hasPhrase reports whether the words contain one of the phrases
// (tables.HasPhrase).
func hasPhrase(ws []string, phrases ...string) bool { return tables.HasPhrase(ws, phrases...) }

var (
	qtyWords = []string{"quantity", "qty", "amount", "volume", "consumption", "consumed", "usage", "use", "used",
		"purchased", "purchase", "purchases", "delivered", "delivery", "deliveries", "burned", "burnt", "combusted",
		"throughput", "energy", "mass", "weight", "litres", "liters", "gallons", "input", "reading", "fuel_use", "volumes", "quantities"}
	moneyWords = []string{"cost", "costs", "price", "spend", "spent", "invoice", "invoiced", "usd", "eur", "gbp", "chf",
		"jpy", "aud", "cad", "paid", "charge", "charges", "tax", "vat"}
	groupWords = []string{"site", "facility", "plant", "location", "region", "department", "entity", "country", "depot",
		"branch", "office", "building", "subsidiary", "division", "asset", "vehicle", "fleet", "project", "store",
		"warehouse", "operation", "station", "company", "segment", "area", "business", "premises", "installation", "mine", "farm"}
)

// moneyHeader reports a header about money ("Cost (USD)", "Invoice €").
func moneyHeader(text string) bool {
	if strings.ContainsAny(text, "€$£¥") {
		return true
	}
	return hasWord(words(text), moneyWords...)
}

// carbonHeader recognises a column of existing carbon figures: "tCO2",
// "Reported tCO2", "CO2 (kg)", "kgCO2e", "Emissions (t CO2e)", "Carbon (t)".
// species is CO2, CO2e or C; unit is the mass unit (unitErr when the header's
// unit is ambiguous, such as "tons CO2"). Factor columns (kg CO2/L,
// "Emission factor") are not carbon columns.
type carbonCol struct {
	species string
	unit    units.Unit
	unitTxt string
	unitErr *units.Error
	scale   float64 // values in thousands: 1000
}

var (
	reCarbonPrefix = regexp.MustCompile(`(?i)(?:^|[^a-z])((?:k|m|g)?g|t|kt|mt|gt|lbs?|tonnes?|tons?|metric tons?|short tons?)\s*(co2e|co2-?eq|co2|ghg|c)(?:$|[^a-z0-9])`)
	reSpecies      = regexp.MustCompile(`(?i)(?:^|[^a-z])(co2e|co2-?eq|co2 ?equivalent|co2|ghg|carbon dioxide|carbon)(?:$|[^a-z0-9])`)
)

func parseCarbonHeader(text string) (carbonCol, bool) {
	low := strings.ToLower(text)
	ws := words(low)
	if strings.Contains(low, "/") || hasWord(ws, "per", "factor", "ef", "intensity", "rate", "price", "cost", "tax", "%", "percent", "share", "ppm") {
		return carbonCol{}, false
	}
	c := carbonCol{scale: 1}
	species := func(s string) string {
		s = strings.ToLower(s)
		switch {
		case strings.HasPrefix(s, "co2e"), strings.HasPrefix(s, "co2-eq"), strings.HasPrefix(s, "co2eq"),
			strings.HasPrefix(s, "co2 equivalent"), s == "ghg":
			return "CO2e"
		case s == "co2", s == "carbon dioxide":
			return "CO2"
		case s == "c", s == "carbon":
			return "C"
		}
		return ""
	}
	if m := reCarbonPrefix.FindStringSubmatch(text); m != nil {
		c.species = species(m[2])
		c.unitTxt = m[1]
	} else if m := reSpecies.FindStringSubmatch(text); m != nil {
		c.species = species(m[1])
		if c.species == "C" && m[1] == "c" {
			return carbonCol{}, false
		}
		h := parseHeader(text)
		if h.UnitText == "" {
			// Look for a unit word anywhere: "CO2 emissions tonnes".
			for _, w := range ws {
				if u, err := units.ParseAs(w, units.Mass); err == nil {
					c.unitTxt, c.unit = w, u
					break
				} else if ue, ok := err.(*units.Error); ok && ue.Code == units.CodeAmbiguous {
					c.unitTxt, c.unitErr = w, ue
					break
				}
			}
		} else {
			c.unitTxt, c.scale = h.UnitText, h.Scale
		}
	} else {
		return carbonCol{}, false
	}
	if c.species == "" {
		return carbonCol{}, false
	}
	if c.species == "CO2" && (hasWord(ws, "e", "eq", "equivalent") || strings.Contains(low, "co2-e") || strings.Contains(low, "co2 e ")) {
		c.species = "CO2e"
	}
	if c.unitTxt == "" {
		return c, true // a carbon column without a unit: not compared
	}
	if c.unit.Symbol == "" && c.unitErr == nil {
		u, err := units.ParseAs(c.unitTxt, units.Mass)
		if err != nil {
			if ue, ok := err.(*units.Error); ok {
				c.unitErr = ue
			}
		} else {
			c.unit = u
		}
	}
	return c, true
}

// plural is "1 row" or "3 rows".
func plural(n int, word string) string {
	if n == 1 {
		return "1 " + word
	}
	return strconv.Itoa(n) + " " + word + "s"
}
