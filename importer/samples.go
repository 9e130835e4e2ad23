package importer

import (
	"sort"

	"github.com/fluecell/fluecell/funcs/units"
)

// sampleSet holds the amounts (and unit prices) of one table that the
// outlier checks test, grouped by key (sheet, column, fuel and unit). The
// samples live in paged columns (pages.go), so a table of a million rows
// keeps them within the page budget; a group is gathered into memory only
// while it is tested. Keys and the workbook's fuel words are few and kept
// once each.
type sampleSet struct {
	keys   []string
	keyOf  map[string]int32
	words  []string // folded fuel words; index 0 is ""
	wordOf map[string]int32
	folded map[string]int32            // a fuel text as written → its word, for texts seen before
	memo   map[rawSampleKey]sampleKeys // a fuel log's fuel and unit as written → their keys (checks.go)

	key, word, row, col *paged[int32]
	v, q                *paged[float64]

	// byKey lists the samples of each key (indices, in the order added),
	// made at the first test so that a group is read without passing over
	// every other key's samples.
	byKey   []*paged[int32]
	indexed int // samples when byKey was made
	ps      *pageSet
}

// maxFoldCache bounds the fuel texts remembered with their folded word.
const maxFoldCache = 50_000

func newSampleSet(ps *pageSet) *sampleSet {
	return &sampleSet{
		ps: ps, keyOf: map[string]int32{}, memo: map[rawSampleKey]sampleKeys{}, words: []string{""}, wordOf: map[string]int32{"": 0}, folded: map[string]int32{},
		key: newFixed(ps, 0, int32(0)), word: newFixed(ps, 0, int32(0)), row: newFixed(ps, 0, int32(0)), col: newFixed(ps, 0, int32(0)),
		v: newFixed(ps, 0, 0.0), q: newFixed(ps, 0, 0.0),
	}
}

// rawSampleKey is a fuel log's quantity column with a fuel and a unit as
// the workbook writes them.
type rawSampleKey struct {
	col        int
	fuel, unit string
}

// sampleKeys are the keys a rawSampleKey's rows go under, with the fuel id
// and unit they were read as.
type sampleKeys struct {
	amount, price int32 // key indices; -1 for none
	fuelID        string
	unit          units.Unit
}

// keyIndex returns the index of key k, adding it.
func (s *sampleSet) keyIndex(k string) int32 {
	ki, ok := s.keyOf[k]
	if !ok {
		ki = int32(len(s.keys))
		s.keys = append(s.keys, k)
		s.keyOf[k] = ki
	}
	return ki
}

// add keeps one sample under key k. fuel is the row's fuel as the
// workbook writes it ("" for none); q is the amount a unit price was
// computed from (0 for an amount).
func (s *sampleSet) add(k string, row, col int, v float64, fuel string, q float64) {
	s.addAt(s.keyIndex(k), row, col, v, fuel, q)
}

// addAt is add with the key's index.
func (s *sampleSet) addAt(ki int32, row, col int, v float64, fuel string, q float64) {
	s.key.push(ki)
	s.word.push(s.wordIndex(fuel))
	s.row.push(int32(row))
	s.col.push(int32(col))
	s.v.push(v)
	s.q.push(q)
}

// wordIndex returns the index of fuel's folded word.
func (s *sampleSet) wordIndex(fuel string) int32 {
	if fuel == "" {
		return 0
	}
	if w, ok := s.folded[fuel]; ok {
		return w
	}
	f := foldWord(fuel)
	w, ok := s.wordOf[f]
	if !ok {
		w = int32(len(s.words))
		s.words = append(s.words, f)
		s.wordOf[f] = w
	}
	if len(s.folded) < maxFoldCache {
		s.folded[fuel] = w
	}
	return w
}

// sortedKeys returns the keys in order.
func (s *sampleSet) sortedKeys() []string {
	out := append([]string(nil), s.keys...)
	sort.Strings(out)
	return out
}

// keyed returns the indices of key ki's samples.
func (s *sampleSet) keyed(ki int32) *paged[int32] {
	if s.byKey == nil || s.indexed != s.key.len() {
		s.indexed = s.key.len()
		s.byKey = make([]*paged[int32], len(s.keys))
		for k := range s.byKey {
			s.byKey[k] = newFixed(s.ps, 0, int32(0))
		}
		for i := range s.key.len() {
			s.byKey[s.key.at(i)].push(int32(i))
		}
	}
	return s.byKey[ki]
}
