package funcs

import (
	"encoding/csv"
	"fmt"
	"io"
	"math/big"
	"strings"
	"unicode"

	"github.com/fluecell/fluecell/funcs/units"
)

// The fuel vocabulary, data/fuel_names.csv, lists fuel names as records write them: retail
// grades, blends, statistics codes, words to ignore. Each row names its source. It is loaded
// into every Engine's fuel index beside the built-in aliases.

// Kinds of vocabulary rows.
const (
	nameAlias     = "alias"     // another name of fuel_id
	nameCode      = "code"      // a statistics code: matched only exactly (case-insensitive)
	nameBlend     = "blend"     // fossil_share of fuel_id, the rest bio_fuel_id (by volume)
	nameQualifier = "qualifier" // a word dropped when the rest of the name resolves
	nameUnmapped  = "unmapped"  // a fuel fluecell has no id for
	nameNotFuel   = "not_fuel"  // an energy source that is not burned
)

// fuelName is one vocabulary row.
type fuelName struct {
	name, kind, fuelID, bioID string
	share                     *big.Rat          // fossil share of a blend; nil otherwise
	shareText                 string            // as written, for notes
	dims                      []units.Dimension // amount dimensions allowed; nil = any
	desc, source              string
	fromMemory                bool
	line                      int
}

// vocabularyFile and techVocabularyFile are the embedded vocabularies; they are not factor
// packs.
const (
	vocabularyFile     = "fuel_names.csv"
	techVocabularyFile = "tech_names.csv"
)

// parseFuelNames reads the vocabulary CSV: columns name, kind, fuel_id, fossil_share,
// bio_fuel_id, dims, description, source, from_memory. Lines starting with # are comments.
// A malformed row fails with a *PackFileError naming file and line.
func parseFuelNames(data []byte, file string) ([]fuelName, error) {
	r := csv.NewReader(strings.NewReader(string(data)))
	r.Comment = '#'
	header, err := r.Read()
	if err != nil {
		return nil, csvErr(file, err)
	}
	want := []string{"name", "kind", "fuel_id", "fossil_share", "bio_fuel_id", "dims", "description", "source", "from_memory"}
	if strings.Join(header, ",") != strings.Join(want, ",") {
		return nil, &PackFileError{File: file, Line: 1, Reason: "header must be " + strings.Join(want, ",")}
	}
	var out []fuelName
	for {
		rec, err := r.Read()
		if err == io.EOF {
			return out, nil
		}
		if err != nil {
			return nil, csvErr(file, err)
		}
		line, _ := r.FieldPos(0)
		bad := func(col, format string, args ...any) error {
			return &PackFileError{File: file, Line: line, Column: col, Reason: fmt.Sprintf(format, args...)}
		}
		n := fuelName{name: strings.TrimSpace(rec[0]), kind: rec[1], fuelID: rec[2], bioID: rec[4],
			desc: rec[6], source: rec[7], fromMemory: rec[8] == "true", line: line}
		switch {
		case n.name == "" || fuelKey(n.name) == "":
			return nil, bad("name", "empty name")
		case n.source == "":
			return nil, bad("source", "empty source: every row names its publication and table, or says common practice")
		case n.fromMemory != strings.Contains(n.source, "from memory"):
			return nil, bad("from_memory", "from_memory is %q: a source says \"from memory\" exactly when from_memory is true", rec[8])
		case rec[8] != "true" && rec[8] != "false":
			return nil, bad("from_memory", "from_memory %q: accepted are true or false", rec[8])
		}
		switch n.kind {
		case nameAlias, nameCode:
			if n.fuelID == "" {
				return nil, bad("fuel_id", "a %s needs a fuel_id", n.kind)
			}
		case nameBlend:
			share, ok := new(big.Rat).SetString(rec[3])
			if !ok || share.Sign() <= 0 || share.Cmp(big.NewRat(1, 1)) >= 0 || n.fuelID == "" || n.bioID == "" {
				return nil, bad("fossil_share", "a blend needs fuel_id, bio_fuel_id and a fossil_share in (0, 1), got %q", rec[3])
			}
			n.share, n.shareText = share, rec[3]
		case nameQualifier, nameUnmapped, nameNotFuel:
			if n.fuelID != "" {
				return nil, bad("fuel_id", "a %s names no fuel_id", n.kind)
			}
		default:
			return nil, bad("kind", "kind %q: accepted are alias, code, blend, qualifier, unmapped, not_fuel", n.kind)
		}
		if n.kind == nameQualifier && strings.Contains(fuelKey(n.name), " ") {
			return nil, bad("name", "a qualifier is one word, got %q", n.name)
		}
		if rec[5] != "" {
			for _, d := range strings.Split(rec[5], "|") {
				dim, ok := map[string]units.Dimension{"energy": units.Energy, "mass": units.Mass, "volume": units.Volume}[d]
				if !ok {
					return nil, bad("dims", "dims %q: accepted are energy, mass, volume joined by |", rec[5])
				}
				n.dims = append(n.dims, dim)
			}
		}
		out = append(out, n)
	}
}

// fuelKey folds a fuel name for matching: lower case; spaces, underscores, hyphens, '#',
// brackets and punctuation become one space; dots vanish; "no"/"nr"/"number" before a
// number is dropped. "Fuel Oil No. 2", "fuel oil #2" and "Fuel-Oil (2)" are all "fuel oil 2".
func fuelKey(s string) string {
	var b strings.Builder
	b.Grow(len(s))
	space := false
	rs := []rune(strings.ToLower(strings.TrimSpace(s)))
	for i, r := range rs {
		switch {
		case r == '.' && i > 0 && i+1 < len(rs) && unicode.IsLetter(rs[i-1]) && unicode.IsDigit(rs[i+1]):
			space = true // "No.2"
			continue
		case r == '.' || r == '\'' || r == '’':
			continue
		case r == '/' || unicode.IsLetter(r) || unicode.IsDigit(r):
		default: // separators: space, _, -, #, brackets, commas, ...
			space = true
			continue
		}
		if space && b.Len() > 0 {
			b.WriteByte(' ')
		}
		space = false
		b.WriteRune(r)
	}
	k := b.String()
	if !strings.Contains(k, "n") {
		return k
	}
	toks := strings.Fields(k)
	out := toks[:0]
	for i, t := range toks {
		if (t == "no" || t == "nr" || t == "number") && i+1 < len(toks) && isDigits(toks[i+1]) {
			continue
		}
		out = append(out, t)
	}
	return strings.Join(out, " ")
}

func isDigits(s string) bool {
	for _, r := range s {
		if r < '0' || r > '9' {
			return false
		}
	}
	return s != ""
}

// footnote splits a trailing footnote mark off a name: superscript digits ("Natural Gas²"),
// a bracketed number or letter ("Coal (3)", "Oil [a]") or asterisks ("Propane*").
func footnote(s string) (rest, mark string, ok bool) {
	s = strings.TrimSpace(s)
	t := strings.TrimRightFunc(s, func(r rune) bool { return strings.ContainsRune("¹²³⁴⁵⁶⁷⁸⁹⁰*†", r) })
	if t != s && strings.TrimSpace(t) != "" {
		return strings.TrimSpace(t), s[len(t):], true
	}
	if n := len(s); n >= 3 && (s[n-1] == ')' || s[n-1] == ']') {
		open := strings.LastIndexAny(s, "([")
		inner := s[open+1 : n-1]
		if open > 0 && len(inner) <= 2 && (isDigits(inner) || len(inner) == 1 && inner[0] >= 'a' && inner[0] <= 'z') {
			if rest := strings.TrimSpace(s[:open]); rest != "" {
				return rest, s[open:], true
			}
		}
	}
	return s, "", false
}
