// Package tables holds the pure parts of reading tables from real
// workbooks: header text normalised (line breaks, non-breaking spaces,
// footnote markers, CamelCase and snake_case), the vocabulary of header
// words that hint at a column's role (data in vocab.csv, each entry with its
// source or "common practice"), and the scoring of a column's role from its
// header words and the evidence of its values.
//
// It knows nothing of files or of carbon factors: the importer hands it
// header strings and value statistics, and resolves fuels, units and
// technologies itself.
package tables
