package safetext

import "strings"

// CSVField returns s made safe as a text field of a CSV file that may be
// opened in a spreadsheet. A field that starts with = + - @, a tab, a
// carriage return or a line feed (after any spaces) is read as a formula by
// Excel, LibreOffice and Google Sheets, so a file named
// =HYPERLINK("http://x","y").xlsx would become a live link; such a field
// gets a leading single quote ('), which a spreadsheet shows as text and a
// person reads past. A plain decimal number ("-1.5", "+2", "-3.2e+300")
// is left as it is, so numeric columns stay numeric. Every other field is
// returned unchanged.
func CSVField(s string) string {
	t := strings.TrimLeft(s, " ")
	if t == "" || !strings.ContainsRune("=+-@\t\r\n", rune(t[0])) || IsPlainNumber(s) {
		return s
	}
	return "'" + s
}

// CSVRecord applies CSVField to every field of rec, in place, and returns
// rec.
func CSVRecord(rec []string) []string {
	for i, f := range rec {
		rec[i] = CSVField(f)
	}
	return rec
}

// IsPlainNumber reports whether s is a decimal number as a spreadsheet
// reads one: an optional sign, digits with at most one decimal point, and
// an optional exponent; no spaces, no thousands separators, no Inf or NaN.
func IsPlainNumber(s string) bool {
	i := 0
	if i < len(s) && (s[i] == '+' || s[i] == '-') {
		i++
	}
	digits := 0
	for ; i < len(s) && s[i] >= '0' && s[i] <= '9'; i++ {
		digits++
	}
	if i < len(s) && s[i] == '.' {
		i++
		for ; i < len(s) && s[i] >= '0' && s[i] <= '9'; i++ {
			digits++
		}
	}
	if digits == 0 {
		return false
	}
	if i < len(s) && (s[i] == 'e' || s[i] == 'E') {
		i++
		if i < len(s) && (s[i] == '+' || s[i] == '-') {
			i++
		}
		exp := 0
		for ; i < len(s) && s[i] >= '0' && s[i] <= '9'; i++ {
			exp++
		}
		if exp == 0 {
			return false
		}
	}
	return i == len(s)
}
