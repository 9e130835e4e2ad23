package funcs

import (
	"fmt"
	"path"
	"sort"
	"strings"
)

// The vehicle vocabulary, data/vehicle_names.csv, reads names of road vehicles as tables and
// fleet lists write them ("Medium petrol car", "Diesel van (Class II)", "Passenger Car") as the
// vehicle ids of the distance-based rows (data/vehicle_distance.csv). A name is folded (case,
// separators, brackets) and matched in any word order, so an id needs no row of its own; the
// file holds the other words and labels, each with its source.

// vehicleVocabularyFile is the embedded vocabulary of vehicle names.
const vehicleVocabularyFile = "vehicle_names.csv"

// VehicleInfo is a vehicle of the distance-based tables, as ResolveVehicle reads a name.
type VehicleInfo struct {
	ID    string `json:"id"`    // our id, e.g. car_petrol_medium or us_passenger_car
	Set   string `json:"set"`   // the set whose table publishes it, e.g. uk2024 or epa2021
	Basis string `json:"basis"` // the distance its factors are per: "vehicle-km" or "vehicle-mile"
	Alias bool   `json:"alias"` // the name was not the id itself
	Note  string `json:"note,omitempty"`
}

// vehicleName is one vocabulary row.
type vehicleName struct {
	name, kind, vehicle, desc, source string
	line                              int
}

// vehicleIndex resolves vehicle names. It is built once per Engine and never written afterwards.
type vehicleIndex struct {
	ids     []string          // every vehicle id of every set, sorted
	setOf   map[string]string // vehicle id -> its set
	byWords map[string]string // sorted-word key of an id -> the id
	names   map[string]*vehicleName
	words   map[string][]string // a word -> the words it is read as (none: dropped)
}

// vehicleWords folds a name into words: lower case, with spaces, "_", "-", ".", "/", commas and
// brackets as separators.
func vehicleWords(s string) []string {
	return strings.FieldsFunc(strings.ToLower(s), func(r rune) bool {
		switch r {
		case ' ', '_', '-', '.', '/', ',', '(', ')', '\t', '\u00a0':
			return true
		}
		return false
	})
}

// sortedKey is the words in sorted order, "class" joined to a following number ("class 2" is
// "class2", as in the id van_diesel_class2).
func sortedKey(words []string) string {
	var out []string
	for i := 0; i < len(words); i++ {
		w := words[i]
		if w == "class" && i+1 < len(words) && isDigits(words[i+1]) {
			w += words[i+1]
			i++
		}
		out = append(out, w)
	}
	sort.Strings(out)
	return strings.Join(out, " ")
}

// parseVehicleNames reads the vocabulary: columns name, kind, vehicle, description, source,
// from_memory. A malformed row fails with a *PackFileError naming file and line.
func parseVehicleNames(data []byte, file string) ([]vehicleName, error) {
	var out []vehicleName
	err := eachRow(data, file, []string{"name", "kind", "vehicle", "description", "source", "from_memory"}, func(rec []string, line int, bad func(col, format string, args ...any) error) error {
		n := vehicleName{name: rec[0], kind: rec[1], vehicle: rec[2], desc: rec[3], source: rec[4], line: line}
		if len(vehicleWords(n.name)) == 0 {
			return bad("name", "empty name")
		}
		if err := checkSourceMemory(n.source, rec[5], bad); err != nil {
			return err
		}
		switch {
		case n.kind != "alias" && n.kind != "word" && n.kind != "ambiguous":
			return bad("kind", "kind %q: accepted are alias, word, ambiguous", n.kind)
		case n.kind == "alias" && n.vehicle == "", n.kind == "ambiguous" && n.vehicle != "":
			return bad("vehicle", "an alias names a vehicle, an ambiguous name none")
		}
		out = append(out, n)
		return nil
	})
	return out, err
}

// newVehicleIndex indexes the vehicles of the distance rows of ps and the embedded vocabulary.
// An alias of a vehicle without rows, or a name given twice, is an error.
func newVehicleIndex(ps *packSet) (*vehicleIndex, error) {
	const file = "embedded:" + vehicleVocabularyFile
	b, err := embeddedData.ReadFile(path.Join("data", vehicleVocabularyFile))
	if err != nil {
		return nil, fmt.Errorf("embedded vocabulary: %w", err)
	}
	rows, err := parseVehicleNames(b, file)
	if err != nil {
		return nil, err
	}
	ix := &vehicleIndex{setOf: map[string]string{}, byWords: map[string]string{}, names: map[string]*vehicleName{}, words: map[string][]string{}}
	if c := ps.packs[CommonPack]; c != nil {
		for k := range c.rows {
			if _, ok := distanceQuantities()[k.quantity]; !ok {
				continue
			}
			set, id, ok := strings.Cut(k.id, "_")
			if !ok || distanceSetByName(set) == nil {
				continue
			}
			if _, seen := ix.setOf[id]; !seen {
				ix.ids = append(ix.ids, id)
			}
			ix.setOf[id] = set
			ix.byWords[sortedKey(vehicleWords(id))] = id
		}
	}
	sort.Strings(ix.ids)
	for i := range rows {
		n := &rows[i]
		k := strings.Join(vehicleWords(n.name), " ")
		if n.kind == "word" {
			ix.words[k] = strings.Fields(n.vehicle)
			continue
		}
		if n.kind == "alias" && ix.setOf[n.vehicle] == "" {
			return nil, &PackFileError{File: file, Line: n.line, Column: "vehicle", Reason: "no distance rows for " + quote(n.vehicle)}
		}
		if _, dup := ix.names[k]; dup {
			return nil, &PackFileError{File: file, Line: n.line, Column: "name", Reason: "name " + quote(n.name) + " is listed twice"}
		}
		ix.names[k] = n
	}
	return ix, nil
}

// resolve reads a vehicle name: a vocabulary label, else its words (mapped by the vocabulary) in
// any order, else the same words with "average" when no size or class is given. The error is an
// *Error of code CodeBadArgument for parameter vehicle, with a suggestion where one is close.
func (ix *vehicleIndex) resolve(s string) (VehicleInfo, error) {
	fail := func(msg string) (VehicleInfo, error) {
		return VehicleInfo{}, &Error{Code: CodeBadArgument, Param: "vehicle", Msg: msg}
	}
	if len(s) > maxLookupBytes {
		return fail("unknown vehicle " + quote(s) + ": accepted are " + strings.Join(ix.ids, ", "))
	}
	words := vehicleWords(s)
	info := func(id, note string) (VehicleInfo, error) {
		set := distanceSetByName(ix.setOf[id])
		v := VehicleInfo{ID: id, Set: set.name, Basis: set.basis, Alias: id != s}
		if v.Alias {
			v.Note = "vehicle " + quote(s) + " read as " + id + note
		}
		return v, nil
	}
	if n := ix.names[strings.Join(words, " ")]; n != nil {
		if n.kind == "ambiguous" {
			return fail("ambiguous vehicle " + quote(s) + ": " + n.desc)
		}
		return info(n.vehicle, " ("+n.source+")")
	}
	var mapped []string
	for _, w := range words {
		if m, ok := ix.words[w]; ok {
			mapped = append(mapped, m...)
			continue
		}
		mapped = append(mapped, w)
	}
	if id := ix.byWords[sortedKey(mapped)]; id != "" {
		return info(id, "")
	}
	if id := ix.byWords[sortedKey(append(mapped, "average"))]; id != "" && len(mapped) > 0 {
		return info(id, " (no size or class given: the table's average)")
	}
	accepted := strings.Join(ix.ids, ", ")
	if sug := suggestFrom(strings.Join(words, "_"), ix.ids); sug != "" {
		return fail("unknown vehicle " + quote(s) + ": did you mean " + sug + "? (accepted: " + accepted + ")")
	}
	return fail("unknown vehicle " + quote(s) + ": accepted are " + accepted)
}

// ResolveVehicle maps a vehicle name of a distance-based table ("Medium petrol car", "Diesel van
// (Class II)", "Passenger Car", "Motorbike") to its id and set, for vehicle_co2e. The error is an
// *Error of code CodeBadArgument for parameter vehicle: an ambiguous name says what to choose, an
// unknown one lists the ids, with a suggestion where one is close. Production emissions of
// vehicles (vehicle_embodied) use other classes.
func (e *Engine) ResolveVehicle(name string) (VehicleInfo, error) {
	return e.vehNames.resolve(name)
}
