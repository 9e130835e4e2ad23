package tables

import (
	_ "embed"
	"encoding/csv"
	"fmt"
	"strings"
)

// Hint is a bit set of the roles a header's words suggest.
type Hint uint32

// Hints, one per role column of vocab.csv.
const (
	HintQty      Hint = 1 << iota // an amount: quantity, consumption, use, value
	HintRate                      // never an amount: price, cost, per, efficiency, share
	HintCount                     // a count of things: number of meters, customers
	HintFuel                      // a fuel column: fuel, fuel type, commodity
	HintFuelWeak                  // may hold fuels: type, description, series
	HintUnit                      // a unit column: unit, UOM
	HintTech                      // a technology column
	HintCapacity                  // a capacity column
	HintTotal                     // an aggregate: total, combined, all
	HintPeriod                    // date, month, year
	HintKey                       // id, code, number
	HintGroup                     // site, building, region
	HintNotFuel                   // an energy carrier not burned on site: electricity, steam
	HintOutput                    // electricity generated, not fuel burned: generation, generated
	HintSupply                    // production, trade or stocks of a fuel, not fuel burned: production, imports
	HintArea                      // the country or grid region of a row: country, egrid subregion
	HintGas                       // a refrigerant or other fugitive gas: refrigerant, gas type
	HintFugitive                  // refrigerant added or lost: top-up, recharge, leak
	HintVehicle                   // a vehicle or fleet record: vehicle, registration, odometer
	HintDistance                  // a distance driven: distance, mileage, km driven
	HintSector                    // the sector of a combustion row: sector, end use
)

var hintNames = map[string]Hint{"qty": HintQty, "rate": HintRate, "count": HintCount, "fuel": HintFuel,
	"fuelweak": HintFuelWeak, "unit": HintUnit, "tech": HintTech, "capacity": HintCapacity, "total": HintTotal,
	"period": HintPeriod, "key": HintKey, "group": HintGroup, "notfuel": HintNotFuel, "output": HintOutput, "supply": HintSupply,
	"area": HintArea, "gas": HintGas, "fugitive": HintFugitive, "vehicle": HintVehicle, "distance": HintDistance, "sector": HintSector}

//go:embed vocab.csv
var vocabCSV string

// Vocab maps header words and phrases to role hints. It is read-only after
// NewVocab and safe for concurrent use.
type Vocab struct {
	word   map[string]Hint
	phrase map[string]Hint // two or more words
	maxLen int             // longest phrase in words
}

// NewVocab reads the embedded vocabulary; an error means vocab.csv is
// malformed (a build defect, caught by the package tests).
func NewVocab() (*Vocab, error) {
	r := csv.NewReader(strings.NewReader(vocabCSV))
	recs, err := r.ReadAll()
	if err != nil {
		return nil, fmt.Errorf("tables: vocab.csv: %w", err)
	}
	v := &Vocab{word: map[string]Hint{}, phrase: map[string]Hint{}}
	for i, rec := range recs {
		if i == 0 {
			continue
		}
		if len(rec) != 3 || rec[2] == "" {
			return nil, fmt.Errorf("tables: vocab.csv:%d: want word,role,source", i+1)
		}
		h, ok := hintNames[rec[1]]
		if !ok {
			return nil, fmt.Errorf("tables: vocab.csv:%d: unknown role %q", i+1, rec[1])
		}
		ws := Words(rec[0])
		switch len(ws) {
		case 0:
			return nil, fmt.Errorf("tables: vocab.csv:%d: empty word", i+1)
		case 1:
			v.word[ws[0]] |= h
		default:
			v.phrase[strings.Join(ws, " ")] |= h
			v.maxLen = max(v.maxLen, len(ws))
		}
	}
	return v, nil
}

// Hints returns the roles suggested by the words of a header.
func (v *Vocab) Hints(ws []string) Hint {
	var h Hint
	for i, w := range ws {
		h |= v.word[w]
		for n := 2; n <= v.maxLen && i+n <= len(ws); n++ {
			h |= v.phrase[strings.Join(ws[i:i+n], " ")]
		}
	}
	return h
}

// Strip returns the words of ws without those whose only hints are in
// mask (for example the usage words around a fuel name: "Natural Gas Use"
// gives natural gas).
func (v *Vocab) Strip(ws []string, mask Hint) []string {
	var out []string
	for _, w := range ws {
		if h := v.word[w]; h != 0 && h&^mask == 0 {
			continue
		}
		out = append(out, w)
	}
	return out
}

// Has reports whether h has every bit of x.
func (h Hint) Has(x Hint) bool { return h&x == x }

// Any reports whether h has any bit of x.
func (h Hint) Any(x Hint) bool { return h&x != 0 }
