package funcs

import (
	"fmt"
	"path"
	"strings"
)

// The technology vocabulary, data/tech_names.csv, lists names of generating technologies as
// capacity statistics and planning models write them ("NGCC", "Onshore Wind Class 5",
// "upv_7") for lifecycle_intensity and embodied. Each row names its source. A technology
// without a life-cycle row ("gas-CT", "battery") is listed too, so that it fails with a
// message saying so: it is never replaced by another technology.

// techName is one vocabulary row.
type techName struct {
	name, kind, techID, desc, source string
	line                             int
}

// techIndex resolves technology names. It is built once per Engine and never written
// afterwards.
type techIndex struct {
	ids      []string             // technologies with a life-cycle row, sorted
	byKey    map[string]*techName // techKey of ids ("wind onshore") and vocabulary names
	suffixes [][]string           // suffix patterns, longest first; "#" matches a number
}

// techKey folds a technology name: lower case, and spaces, underscores, hyphens and dots as
// one space. "Wind-Onshore", "wind_onshore" and "Wind  onshore" are "wind onshore".
func techKey(s string) string {
	return strings.Join(strings.FieldsFunc(strings.ToLower(s), func(r rune) bool {
		return r == ' ' || r == '_' || r == '-' || r == '.' || r == '\t' || r == '\u00a0' || r == '(' || r == ')' || r == ','
	}), " ")
}

// parseTechNames reads the vocabulary CSV: columns name, kind, tech_id, description, source,
// from_memory. A malformed row fails with a *PackFileError naming file and line.
func parseTechNames(data []byte, file string) ([]techName, error) {
	var out []techName
	err := eachRow(data, file, []string{"name", "kind", "tech_id", "description", "source", "from_memory"}, func(rec []string, line int, bad func(col, format string, args ...any) error) error {
		n := techName{name: rec[0], kind: rec[1], techID: rec[2], desc: rec[3], source: rec[4], line: line}
		if techKey(n.name) == "" {
			return bad("name", "empty name")
		}
		if err := checkSourceMemory(n.source, rec[5], bad); err != nil {
			return err
		}
		if (n.kind == "alias") != (n.techID != "") {
			return bad("tech_id", "an alias names a tech_id, other kinds none")
		}
		switch n.kind {
		case "alias", "suffix", "unmapped", "ambiguous":
		default:
			return bad("kind", "kind %q: accepted are alias, suffix, unmapped, ambiguous", n.kind)
		}
		out = append(out, n)
		return nil
	})
	return out, err
}

// newTechIndex indexes the technologies ids (those with a life-cycle row) and the
// embedded vocabulary. An alias of a technology without a life-cycle row, or a name given
// twice, is an error.
func newTechIndex(ids []string) (*techIndex, error) {
	const file = "embedded:" + techVocabularyFile
	b, err := embeddedData.ReadFile(path.Join("data", techVocabularyFile))
	if err != nil {
		return nil, fmt.Errorf("embedded vocabulary: %w", err)
	}
	rows, err := parseTechNames(b, file)
	if err != nil {
		return nil, err
	}
	ix := &techIndex{ids: ids, byKey: map[string]*techName{}}
	for _, id := range ids {
		ix.byKey[techKey(id)] = &techName{name: id, kind: "id", techID: id}
	}
	for i := range rows {
		n := &rows[i]
		if n.kind == "suffix" {
			ix.suffixes = append(ix.suffixes, strings.Fields(techKey(n.name)))
			continue
		}
		if n.kind == "alias" && ix.byKey[techKey(n.techID)] == nil {
			return nil, &PackFileError{File: file, Line: n.line, Column: "tech_id", Reason: "no life-cycle row for " + quote(n.techID)}
		}
		k := techKey(n.name)
		if prev, dup := ix.byKey[k]; dup && prev.techID == n.techID && n.techID != "" {
			continue // an id written as models write it ("gas-CC")
		} else if dup {
			return nil, &PackFileError{File: file, Line: n.line, Column: "name", Reason: "name " + quote(n.name) + " is listed twice"}
		}
		ix.byKey[k] = n
	}
	// longer patterns first: "class 3" is dropped whole, not as "3"
	for i := 1; i < len(ix.suffixes); i++ {
		for j := i; j > 0 && len(ix.suffixes[j]) > len(ix.suffixes[j-1]); j-- {
			ix.suffixes[j], ix.suffixes[j-1] = ix.suffixes[j-1], ix.suffixes[j]
		}
	}
	return ix, nil
}

// lookup finds a name, then the name without a resource-class suffix. dropped is the
// suffix that was ignored.
func (ix *techIndex) lookup(s string) (n *techName, dropped string) {
	if len(s) > maxLookupBytes {
		return nil, ""
	}
	k := techKey(s)
	if n := ix.byKey[k]; n != nil {
		return n, ""
	}
	words := strings.Fields(k)
	for _, pat := range ix.suffixes {
		if len(words) <= len(pat) {
			continue
		}
		tail := words[len(words)-len(pat):]
		match := true
		for i, p := range pat {
			if p == "#" && !isDigits(tail[i]) || p != "#" && p != tail[i] {
				match = false
				break
			}
		}
		if match {
			if n := ix.byKey[strings.Join(words[:len(words)-len(pat)], " ")]; n != nil {
				return n, strings.Join(tail, " ")
			}
		}
	}
	return nil, ""
}

// resolve maps a technology name to its id. note says how a name other than the id was
// read. The error is an *Error of code CodeBadArgument for parameter tech: a technology
// without a life-cycle row, an ambiguous name, or an unknown one (with a suggestion).
func (ix *techIndex) resolve(fn, s string) (id, note string, err error) {
	n, dropped := ix.lookup(s)
	accepted := strings.Join(ix.ids, ", ")
	fail := func(msg string) (string, string, error) {
		return "", "", &Error{Code: CodeBadArgument, Func: fn, Param: "tech", Msg: msg}
	}
	switch {
	case n == nil:
		id := strings.NewReplacer(" ", "_").Replace(techKey(s))
		if sug := suggestFrom(id, ix.ids); sug != "" && len(id) > 4 && len(s) <= maxLookupBytes {
			return fail("unknown technology " + quote(s) + ": did you mean " + sug + "? (accepted: " + accepted + ")")
		}
		return fail("unknown technology " + quote(s) + ": accepted are " + accepted)
	case n.kind == "unmapped":
		return fail("no life-cycle row for technology " + quote(s) + " (" + n.desc + "), and no other technology stands in for it: accepted are " + accepted)
	case n.kind == "ambiguous":
		return fail("ambiguous technology " + quote(s) + ": " + n.desc)
	case n.kind == "id" && dropped == "":
		return n.techID, "", nil
	}
	note = "technology " + quote(s) + " read as " + n.techID
	if dropped != "" {
		note += " (ignoring " + quote(dropped) + ")"
	}
	if n.source != "" {
		note += " (" + n.source + ")"
	}
	return n.techID, note, nil
}
