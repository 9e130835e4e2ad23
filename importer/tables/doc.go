// Package tables holds the pure parts of reading tables from real
// workbooks: header text normalised (line breaks, non-breaking spaces,
// footnote markers, CamelCase and snake_case: words.go), a header split
// into name, unit, magnitude and flow per time (header.go), the vocabulary
// of header words that hint at a column's role (vocab.go, data in
// vocab.csv, each entry with its source or "common practice"), and the
// readings of cell texts that decide evidence (text.go: withheld values,
// prices and rates, periods, words broken by hyphens, misspellings).
//
// It knows nothing of files or of carbon factors: the importer hands it
// header strings and cell texts, and resolves fuels and technologies
// itself; units are parsed with funcs/units.
package tables
