package importer

import "github.com/fluecell/fluecell/importer/tables"

// notOneFuel says why a wide table's column with an energy, mass or volume
// unit but no fuel name is no amount of one fuel, from the vocabulary hints
// of its header words ws (the header without its unit): "a rate, an average
// or a modelled figure" (median, normalized, EUI…), "a total" (total,
// combined…), or "an energy total over all fuels" when every word is a
// usage, group or source word ("Site Energy Use", "Source Energy Use": an
// energy-benchmarking export's sum of its fuel columns). "" when the header
// may still name a fuel the lexicon does not know, which deserves a warning.
func notOneFuel(v *tables.Vocab, ws []string) string {
	h := v.Hints(ws)
	switch {
	case h.Any(tables.HintRate):
		return "a rate, an average or a modelled figure"
	case h.Any(tables.HintTotal):
		return "a total"
	case len(ws) > 0 && len(v.Strip(ws, tables.HintQty|tables.HintGroup|tables.HintFuelWeak|tables.HintPeriod)) == 0:
		return "an energy total over all fuels"
	}
	return ""
}
