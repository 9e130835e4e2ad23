package importer

import (
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"
)

// numStyle is how a column writes numbers stored as text: which mark is the
// decimal separator and which groups thousands. Spaces (also no-break,
// narrow no-break and thin spaces) and apostrophes group thousands in
// either style.
type numStyle uint8

const (
	// styleUnknown: the column's values do not tell (or contradict each
	// other). textNumberIn then reads only what needs no style.
	styleUnknown numStyle = iota
	// styleDotDecimal: 1,234,567.89 (commas group thousands, also in the
	// Indian way 12,34,567).
	styleDotDecimal
	// styleCommaDecimal: 1.234.567,89 (dots group thousands).
	styleCommaDecimal
)

// String names the style for messages.
func (s numStyle) String() string {
	switch s {
	case styleDotDecimal:
		return "decimal point, comma thousands (1,234.5)"
	case styleCommaDecimal:
		return "decimal comma, dot thousands (1.234,5)"
	}
	return "unknown"
}

// decideNumStyle decides the number style of a column from all its text
// values (cells holding real numbers say nothing and are not passed).
// Each value that can be read in one style only is a vote for it:
//
//   - two or more of the same mark (1,234,567 or 1.234.567): thousands;
//   - both marks (1,234.5 or 1.234,5): the last one is the decimal mark;
//   - one mark followed by 1, 2 or 4+ digits (12,5 or 3.25): a decimal mark;
//   - one mark after a leading 0 (0,250 or 0.250): a decimal mark;
//   - one mark in a number grouped with spaces (1 234,5): a decimal mark.
//
// A single mark followed by exactly three digits (14,938 or 1.250) is no
// vote: that is the ambiguous case the column decides. Texts that are not
// numbers ("No gas", "n/a") are no vote. The result is the style with votes
// when all votes agree, else styleUnknown: a column that mixes both styles
// is never guessed. See numStyleVotes.likely for the weaker reading.
func decideNumStyle(texts []string) numStyle {
	return countNumStyle(texts).decide()
}

// numStyleVotes counts the evidence of a column's text values: Dot and
// Comma are the votes of decideNumStyle; DotWeak counts values such as
// 20,523 (one comma before exactly three digits, which reads as thousands
// in most files), CommaWeak values such as 20.523.
type numStyleVotes struct {
	Dot, Comma, DotWeak, CommaWeak int
}

// countNumStyle counts the votes of texts (see decideNumStyle).
func countNumStyle(texts []string) numStyleVotes {
	var v numStyleVotes
	for _, s := range texts {
		p, ok := splitNumber(s)
		if !ok {
			continue
		}
		switch styleOf(p.body) {
		case styleDotDecimal:
			v.Dot++
		case styleCommaDecimal:
			v.Comma++
		default:
			switch {
			case singleGroup(p.body, ','):
				v.DotWeak++
			case singleGroup(p.body, '.'):
				v.CommaWeak++
			}
		}
	}
	return v
}

// decide is the style of the strong votes when they agree, else
// styleUnknown.
func (v numStyleVotes) decide() numStyle {
	switch {
	case v.Dot > 0 && v.Comma == 0:
		return styleDotDecimal
	case v.Comma > 0 && v.Dot == 0:
		return styleCommaDecimal
	}
	return styleUnknown
}

// likely is decide, or, without strong votes, the style of the weak votes
// when there are at least two and all agree (20,523 and 7,193: comma
// thousands). It is a reading to propose to the person, with the values
// that led to it, not to apply silently: a column of 20,523 and 7,193 may
// also be tonnes with three decimals written with a decimal comma.
func (v numStyleVotes) likely() numStyle {
	if st := v.decide(); st != styleUnknown || v.Dot+v.Comma > 0 {
		return st
	}
	switch {
	case v.DotWeak >= 2 && v.CommaWeak == 0:
		return styleDotDecimal
	case v.CommaWeak >= 2 && v.DotWeak == 0:
		return styleCommaDecimal
	}
	return styleUnknown
}

// singleGroup reports a body of 1 to 3 digits (not a lone 0), one mark sep
// and exactly three digits: 20,523 for sep ','.
func singleGroup(body string, sep byte) bool {
	i := strings.IndexByte(body, sep)
	if i < 1 || i > 3 || len(body) != i+4 || body[:i] == "0" {
		return false
	}
	return strings.Trim(body[:i], "0123456789") == "" && strings.Trim(body[i+1:], "0123456789") == ""
}

// styleOf is the style a number body can only be read in (see
// decideNumStyle), or styleUnknown when it reads in both or neither.
func styleOf(body string) numStyle {
	_, dotOK := parseBody(body, styleDotDecimal)
	_, commaOK := parseBody(body, styleCommaDecimal)
	switch {
	case dotOK && !commaOK:
		return styleDotDecimal
	case commaOK && !dotOK:
		return styleCommaDecimal
	case dotOK && commaOK:
		// A single mark after a leading zero: 0,250 is no thousands group.
		if len(body) > 2 && body[0] == '0' && (body[1] == '.' || body[1] == ',') {
			if body[1] == '.' {
				return styleDotDecimal
			}
			return styleCommaDecimal
		}
	}
	return styleUnknown
}

// textNumberIn reads a number stored as text in the column style st:
// thousands separators of the style or spaces (no-break and thin spaces
// too) or apostrophes, a decimal mark, a sign (-, U+2212 minus, +, or a
// trailing minus as some accounting exports write), accounting negatives
// in parentheses, a trailing percent sign (35 % gives 0.35) and a currency
// symbol before or after the number ($, US$, €, £, ¥, ₹ ...). Thousands
// groups must have three digits (two in the Indian grouping 12,34,567).
//
// With styleUnknown only a value that reads the same in both styles, or in
// one style only, is read: 12,5 and 1,234,567 are, 14,938 is not (ok is
// false; textNumber says it is ambiguous). A value with a single dot and no
// other mark (1.234) reads as a decimal point, as in textNumber.
// ok is false for anything else, including NaN and infinities.
func textNumberIn(s string, st numStyle) (v float64, ok bool) {
	p, ok := splitNumber(s)
	if !ok {
		return 0, false
	}
	switch st {
	case styleDotDecimal, styleCommaDecimal:
		v, ok = parseBody(p.body, st)
	default:
		if strings.Count(p.body, ".") == 1 && !strings.ContainsAny(p.body, ", ") {
			v, ok = parseBody(p.body, styleDotDecimal)
			break
		}
		d, dOK := parseBody(p.body, styleDotDecimal)
		c, cOK := parseBody(p.body, styleCommaDecimal)
		ok = false
		switch {
		case dOK && cOK:
			v, ok = d, d == c
		case dOK:
			v, ok = d, true
		case cOK:
			v, ok = c, true
		}
	}
	if !ok {
		return 0, false
	}
	if p.pct {
		v /= 100
	}
	if p.neg {
		v = -v
	}
	return v, true
}

// numParts is a number text split into its sign, percent sign and body:
// digits, '.', ',' and ' ' (any space-like or apostrophe separator), with
// an optional exponent (e+3).
type numParts struct {
	neg, pct bool
	body     string
}

// splitNumber takes the sign, parentheses, percent sign and currency off a
// number text and normalises its group separators; ok is false when what
// remains is not digits and separators.
func splitNumber(s string) (numParts, bool) {
	var p numParts
	s = strings.TrimFunc(s, isNumSpace)
	if s == "" || len(s) > 64 {
		return p, false
	}
	if strings.HasPrefix(s, "(") && strings.HasSuffix(s, ")") {
		p.neg, s = true, strings.TrimFunc(s[1:len(s)-1], isNumSpace)
	}
	if t, ok := cutSuffix(s, "%"); ok {
		p.pct, s = true, t
	}
	s = trimCurrency(s)
	for _, m := range []string{"-", "\u2212", "+"} {
		neg := m != "+"
		if t, ok := cutPrefix(s, m); ok {
			if p.neg && neg {
				return p, false
			}
			p.neg = p.neg || neg
			s = trimCurrency(t) // -$1,234 as well as $-1,234
			break
		}
		if t, ok := cutSuffix(s, m); ok && neg {
			if p.neg {
				return p, false
			}
			p.neg, s = true, t
			break
		}
	}
	if !p.pct {
		if t, ok := cutSuffix(s, "%"); ok {
			p.pct, s = true, t
		}
	}
	var b strings.Builder
	digits, exp := 0, false
	for i, r := range s {
		switch {
		case r >= '0' && r <= '9':
			digits++
			b.WriteRune(r)
		case r == '.' || r == ',':
			if exp {
				return p, false
			}
			b.WriteRune(r)
		case r == '\'' || r == '\u2019' || isNumSpace(r):
			if exp {
				return p, false
			}
			b.WriteByte(' ')
		case (r == 'e' || r == 'E') && digits > 0 && !exp && i+1 < len(s):
			exp = true
			b.WriteByte('e')
		case (r == '+' || r == '-') && exp && i > 0 && (s[i-1] == 'e' || s[i-1] == 'E'):
			b.WriteRune(r)
		default:
			return p, false
		}
	}
	p.body = b.String()
	return p, digits > 0
}

// parseBody reads a body from splitNumber in style st (dot or comma
// decimal).
func parseBody(body string, st numStyle) (float64, bool) {
	dec, thou := byte('.'), byte(',')
	if st == styleCommaDecimal {
		dec, thou = ',', '.'
	}
	mant, exp, hasExp := strings.Cut(body, "e")
	if strings.Count(mant, string(dec)) > 1 {
		return 0, false
	}
	intPart, frac, _ := strings.Cut(mant, string(dec))
	if strings.ContainsAny(frac, ".,' ") || intPart == "" && frac == "" {
		return 0, false
	}
	hasThou, hasSpace := strings.IndexByte(intPart, thou) >= 0, strings.IndexByte(intPart, ' ') >= 0
	if hasExp && (hasThou || hasSpace || exp == "" || strings.ContainsAny(exp, ".,' ")) {
		return 0, false
	}
	switch {
	case hasThou && hasSpace:
		return 0, false
	case hasThou:
		if !groupedBy(intPart, thou, thou == ',') {
			return 0, false
		}
	case hasSpace:
		if !groupedBy(intPart, ' ', false) {
			return 0, false
		}
	}
	plain := strings.NewReplacer(string(thou), "", " ", "").Replace(intPart)
	if frac != "" || strings.IndexByte(mant, dec) >= 0 {
		plain += "." + frac
	}
	if hasExp {
		plain += "e" + exp
	}
	if plain == "." {
		return 0, false
	}
	f, err := strconv.ParseFloat(plain, 64)
	if err != nil {
		return 0, false
	}
	return f, true
}

// groupedBy reports whether s is digit groups split by sep: a first group
// of 1 to 3 digits, then groups of 3; with indian, also 2-digit groups
// before the last group of 3 (12,34,567), with a first group of 1 or 2.
func groupedBy(s string, sep byte, indian bool) bool {
	parts := strings.Split(s, string(sep))
	if len(parts) < 2 {
		return false
	}
	for _, p := range parts {
		if p == "" || strings.Trim(p, "0123456789") != "" {
			return false
		}
	}
	last := len(parts) - 1
	if len(parts[last]) != 3 {
		return false
	}
	three := len(parts[0]) <= 3
	for _, p := range parts[1:last] {
		three = three && len(p) == 3
	}
	if three {
		return true
	}
	if !indian || len(parts[0]) > 2 {
		return false
	}
	for _, p := range parts[1:last] {
		if len(p) != 2 {
			return false
		}
	}
	return true
}

// trimCurrency takes one currency symbol (with up to three capital
// letters before a dollar sign: US$, R$, NZ$) off either end of s.
func trimCurrency(s string) string {
	if r, n := utf8.DecodeRuneInString(s); isCurrency(r) {
		return strings.TrimLeftFunc(s[n:], isNumSpace)
	}
	if i := strings.IndexByte(s, '$'); i > 0 && i <= 3 && strings.Trim(s[:i], "ABCDEFGHIJKLMNOPQRSTUVWXYZ") == "" {
		return strings.TrimLeftFunc(s[i+1:], isNumSpace)
	}
	if r, n := utf8.DecodeLastRuneInString(s); isCurrency(r) {
		return strings.TrimRightFunc(s[:len(s)-n], isNumSpace)
	}
	return s
}

// isCurrency reports a currency symbol; cent and mill signs are not taken
// (50¢ is not 50).
func isCurrency(r rune) bool {
	return r != '\u00a2' && r != '\u20a5' && unicode.Is(unicode.Sc, r)
}

// isNumSpace reports a space that may group thousands or pad a number:
// ASCII space and tab, no-break, narrow no-break, thin and figure spaces.
func isNumSpace(r rune) bool {
	switch r {
	case ' ', '\t', '\u00a0', '\u202f', '\u2009', '\u2007':
		return true
	}
	return false
}

func cutPrefix(s, prefix string) (string, bool) {
	t, ok := strings.CutPrefix(s, prefix)
	return strings.TrimLeftFunc(t, isNumSpace), ok
}

func cutSuffix(s, suffix string) (string, bool) {
	t, ok := strings.CutSuffix(s, suffix)
	return strings.TrimRightFunc(t, isNumSpace), ok
}
