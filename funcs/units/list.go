package units

import "slices"

// Entry is one unit of the table with its accepted spellings, as listed by List.
type Entry struct {
	Unit
	Spellings []string // other accepted spellings, e.g. "tonne", "tonnes", "metric ton"
	// Exact is the exact SI factor as a decimal string, e.g. "1055.05585262" (J),
	// "0.003785411784" (m3), or as a reduced fraction where it has no finite decimal:
	// "1921/1821" (Nm3, 288.15/273.15 m3).
	Exact string
}

// List returns every unit (canonical symbols, sorted by dimension then SI factor), each with
// its accepted spellings; used by `fluecell units` and GET /v1/units. The result is a fresh
// slice the caller may modify.
func List() []Entry {
	out := make([]Entry, len(table.order))
	for i, id := range table.order {
		out[i] = Entry{Unit: table.units[id], Spellings: slices.Clone(table.spell[id]), Exact: table.exact[id]}
	}
	return out
}
