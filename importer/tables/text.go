package tables

import (
	"strings"
	"unicode"
)

// Missing reports a cell text that statistics write for a value they
// do not give: "Not Available", "NA", "N/A", "--", "(D)" (withheld), "W",
// "(NA)", "Not Applicable", "-".
func Missing(s string) bool {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "not available", "not applicable", "na", "n/a", "(na)", "--", "-", "–", "—", "(d)", "w", "(w)", "(s)", "nm", "x", "..", "...", "*", "null", "none",
		"[]", "[r]", "[p]", "[e]", "(r)", "(p)", "(e)", "r", "p", "e", "– –", "— —", "\u0096", "\u0096 \u0096":
		return true
	}
	return false
}

// Dehyphen joins words broken with a hyphen before a lower-case letter, as
// narrow statistics columns print them: "Gas-oline" gives "Gasoline".
func Dehyphen(s string) string {
	var b strings.Builder
	rs := []rune(s)
	for i, r := range rs {
		if r == '-' && i > 0 && i+1 < len(rs) && unicode.IsLetter(rs[i-1]) && unicode.IsLower(rs[i+1]) {
			continue
		}
		b.WriteRune(r)
	}
	return b.String()
}

// Misspells reports whether one of the words is a near miss of a word of
// the fuel id (one letter off for words of five or six letters, two for
// longer ones): "natral" for natural_gas.
func Misspells(ws []string, id string) bool {
	for _, w := range ws {
		if len(w) < 5 {
			continue // "coke" beside coal is another word, not a typo
		}
		limit := 1
		if len(w) >= 7 {
			limit = 2
		}
		for _, x := range strings.Split(id, "_") {
			if len(x) >= 5 && w != x && levenshtein(w, x) <= limit {
				return true
			}
		}
	}
	return false
}

// levenshtein is the edit distance of two short words, in bytes.
func levenshtein(a, b string) int {
	prev := make([]int, len(b)+1)
	cur := make([]int, len(b)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(a); i++ {
		cur[0] = i
		for j := 1; j <= len(b); j++ {
			cost := 1
			if a[i-1] == b[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
		}
		prev, cur = cur, prev
	}
	return prev[len(b)]
}

// RateText reports a text that states a rate or a price: "$ per Gallon",
// "Cents/kWh", "kg CO2 per unit", "pence per litre".
func RateText(s string) bool {
	if strings.ContainsAny(s, "/$€£¥¢") {
		return true
	}
	ws := Words(s)
	return Has(ws, "per", "cents", "pence", "dollars", "price", "cost")
}

// RateTitle reports a title that says its numbers are prices or rates:
// "(Dollars per Million Btu)", "Retail prices, pence per litre". Unlike
// rateText it ignores slashes, which titles hold in links and dates.
func RateTitle(s string) bool {
	if strings.ContainsAny(s, "$€£¥¢") {
		return true
	}
	ws := Words(s)
	for i, w := range ws {
		// "per month", "per year": the period of amounts, not a rate.
		if w == "per" && (i+1 >= len(ws) || !Has(ws[i+1:i+2], "day", "week", "month", "quarter", "year", "annum")) {
			return true
		}
	}
	return Has(ws, "price", "prices", "cost", "costs", "dollars", "cents", "pence", "tariff", "tariffs")
}

// NotAmountUnit says why a unit cell names no amount of fuel: a price or
// rate ("$/kWh", "$/month") or a count ("EA", "each": a service or part on
// the same fuel-card export). "" for anything else.
func NotAmountUnit(s string) string {
	if RateText(s) {
		return "a price or a rate"
	}
	switch strings.ToLower(strings.Trim(strings.TrimSpace(s), ".")) {
	case "ea", "each", "pc", "pcs", "piece", "pieces", "unit", "units", "item", "items", "ct", "count", "no", "nos", "qty", "job", "hr", "hrs", "hour", "hours", "service":
		return "a count"
	}
	return ""
}

// CountUnit reports a unit cell that counts items ("EA", "each", "pcs",
// "job"): the unit a fuel card export gives its merchandise, service and
// discount lines (common practice of card statements).
func CountUnit(s string) bool {
	s = strings.Trim(strings.TrimSpace(s), ".")
	for _, w := range [...]string{"ea", "each", "pc", "pcs", "piece", "pieces", "item", "items", "ct", "job", "service"} {
		if strings.EqualFold(s, w) { // no lower-cased copy: this runs on every row of a fuel log
			return true
		}
	}
	return false
}

// PeriodHeader recognises a column per period: month names (Jan, January,
// Jan-25, 2025-01), quarters and halves (Q1, H2 2025), years (2024, FY2025)
// and dates stored as numbers (Excel serials of 1955 to 2118).
func PeriodHeader(text string) bool {
	ws := Words(text)
	if len(ws) == 0 || len(ws) > 3 {
		return false
	}
	months := []string{"jan", "feb", "mar", "apr", "may", "jun", "jul", "aug", "sep", "sept", "oct", "nov", "dec",
		"january", "february", "march", "april", "june", "july", "august", "september", "october", "november", "december"}
	for _, w := range ws {
		switch {
		case Has([]string{w}, months...):
		case len(w) == 2 && (w[0] == 'q' && w[1] >= '1' && w[1] <= '4' || w[0] == 'h' && (w[1] == '1' || w[1] == '2')):
		case strings.HasPrefix(w, "fy") && AllDigits(w[2:]) && (len(w) == 4 || len(w) == 6):
		case AllDigits(w) && (len(w) == 2 && len(ws) > 1 || len(w) == 4 && w >= "1900" && w <= "2100"):
			// "Jan 24", "2024"; "24" alone is a number, not a period
		case AllDigits(w) && len(w) == 5 && w >= "20000" && w <= "80000" && len(ws) == 1:
		default:
			return false
		}
	}
	return true
}

func AllDigits(s string) bool {
	for i := 0; i < len(s); i++ {
		if s[i] < '0' || s[i] > '9' {
			return false
		}
	}
	return s != ""
}
