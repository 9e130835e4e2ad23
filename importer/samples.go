package importer

import "sort"

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
	folded map[string]int32 // a fuel text as written → its word, for texts seen before

	key, word, row, col *paged[int32]
	v, q                *paged[float64]
}

// maxFoldCache bounds the fuel texts remembered with their folded word.
const maxFoldCache = 50_000

func newSampleSet(ps *pageSet) *sampleSet {
	return &sampleSet{
		keyOf: map[string]int32{}, words: []string{""}, wordOf: map[string]int32{"": 0}, folded: map[string]int32{},
		key: newFixed(ps, 0, int32(0)), word: newFixed(ps, 0, int32(0)), row: newFixed(ps, 0, int32(0)), col: newFixed(ps, 0, int32(0)),
		v: newFixed(ps, 0, 0.0), q: newFixed(ps, 0, 0.0),
	}
}

// add keeps one sample under key k. fuel is the row's fuel as the
// workbook writes it ("" for none); q is the amount a unit price was
// computed from (0 for an amount).
func (s *sampleSet) add(k string, row, col int, v float64, fuel string, q float64) {
	ki, ok := s.keyOf[k]
	if !ok {
		ki = int32(len(s.keys))
		s.keys = append(s.keys, k)
		s.keyOf[k] = ki
	}
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
