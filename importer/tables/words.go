package tables

import (
	"strings"
	"unicode"
)

// Clean folds the white space of a header (line breaks, tabs, non-breaking
// and thin spaces), the subscript two of "CO₂", superscript footnote digits
// ("Coal¹"), dagger and asterisk footnote marks, the plural marker "(s)"
// ("Vehicle(s)") and a trailing colon ("Total consumption (GWh):").
func Clean(s string) string {
	if s == "" {
		return s
	}
	var b strings.Builder
	b.Grow(len(s))
	for _, r := range s {
		switch r {
		case '₂':
			b.WriteByte('2')
		case '\u00a0', '\u2007', '\u202f', '\u2009', '\t', '\n', '\r':
			b.WriteByte(' ')
		case '¹', '²', '³', '⁴', '⁵', '⁶', '⁷', '⁸', '⁹', '⁰', '†', '‡', '*':
			// footnote marks
		default:
			b.WriteRune(r)
		}
	}
	out := strings.Join(strings.Fields(b.String()), " ")
	for prev := ""; prev != out; {
		prev = out
		out = strings.ReplaceAll(strings.ReplaceAll(out, "(s)", ""), "(S)", "")
	}
	out = strings.TrimRight(out, ": ")
	return strings.Join(strings.Fields(out), " ")
}

// Words lower-cases s and splits it into words of letters and digits,
// also at snake_case underscores and at CamelCase boundaries ("NaturalGasUse"
// gives natural, gas, use; "kWh" and "MMBtu" stay whole because a single
// lower-case letter or an all-capital run is not a word boundary). A
// footnote digit glued to a word of three or more letters ("Coal3") is
// dropped; codes such as E10, B20 and CO2 keep their digits.
func Words(s string) []string {
	var out []string
	var cur []rune
	flush := func() {
		if len(cur) == 0 {
			return
		}
		out = append(out, footless(strings.ToLower(string(cur))))
		cur = cur[:0]
	}
	rs := []rune(s)
	lowerRun := 0
	for i, r := range rs {
		if !unicode.IsLetter(r) && !unicode.IsDigit(r) {
			flush()
			lowerRun = 0
			continue
		}
		if unicode.IsUpper(r) && lowerRun >= 1 && (lowerRun >= 2 || len(cur) >= 2 && i+2 < len(rs) && unicode.IsLower(rs[i+1]) && unicode.IsLower(rs[i+2])) {
			flush()
		} else if unicode.IsUpper(r) && i+1 < len(rs) && unicode.IsLower(rs[i+1]) && len(cur) >= 3 && allUpper(cur) {
			// "ABCWord": the capital before a lower-case letter starts a word.
			flush()
		}
		cur = append(cur, r)
		if unicode.IsLower(r) {
			lowerRun++
		} else {
			lowerRun = 0
		}
	}
	flush()
	return out
}

func allUpper(rs []rune) bool {
	for _, r := range rs {
		if !unicode.IsUpper(r) {
			return false
		}
	}
	return true
}

// footless drops trailing footnote digits from a word of at least three
// letters: "coal3" gives "coal", "gas12" gives "gas"; "co2", "e10", "b20",
// "no2", "2024" are kept.
func footless(w string) string {
	i := len(w)
	for i > 0 && w[i-1] >= '0' && w[i-1] <= '9' {
		i--
	}
	if i == len(w) || i < 3 || len(w)-i > 2 {
		return w
	}
	for _, r := range w[:i] {
		if !unicode.IsLetter(r) {
			return w
		}
	}
	return w[:i]
}

// Phrase is the words of s joined by single spaces: "Natural_Gas-Use"
// gives "natural gas use".
func Phrase(s string) string { return strings.Join(Words(s), " ") }

// Has reports whether ws contains any of the words.
func Has(ws []string, any ...string) bool {
	for _, w := range ws {
		for _, a := range any {
			if w == a {
				return true
			}
		}
	}
	return false
}

// HasPhrase reports whether the words contain one of the phrases
// (space-separated words).
func HasPhrase(ws []string, phrases ...string) bool {
	joined := " " + strings.Join(ws, " ") + " "
	for _, p := range phrases {
		if strings.Contains(joined, " "+p+" ") {
			return true
		}
	}
	return false
}
