// Package importer reads workbooks (.xlsx, .xlsm) and CSV files, finds their
// tables, runs carbon rules over their rows and writes annotated copies.
//
// Reading (Scan) streams each worksheet part with a small tokenizer of its
// own, because excelize's Rows iterator does not tell a number from a number
// stored as text, nor a formula without a cached value. Legacy .xls files,
// encrypted workbooks, corrupt or truncated zips and zip bombs (limits on
// the declared uncompressed size, the number of parts and the packing ratio)
// are refused with an *Error that says what to do; a panic anywhere inside
// becomes an *Error of code ErrInternal.
//
// A table is found by its header row, which need not be row 1: title rows,
// banners merged over the header, a row of units under it and total rows
// are recognised. Columns get roles from their headers and values (fuel,
// quantity, unit, one column per fuel, build-plan technology, capacity,
// capacity factor, lifetime, existing carbon figures, a grouping column),
// and identifiers (snake_case; a unit in the header gives <ident>_unit).
//
// Rules are "COLUMN = EXPR" over the identifiers, given in Options.Rules or
// proposed from the roles; each is compiled once with funcs and run per row.
// The checks record warnings (Warning, codes in report.go) at the cell that
// holds the problem. A row that cannot be computed gets no number.
//
// Writing (Annotate) keeps the original workbook cell for cell. Computed
// columns go beside each table when its sheet has at most
// Options.InlineMaxCells cells; a larger sheet is left untouched (excelize's
// per-cell API would load it whole, about 800 bytes a cell) and its columns
// are streamed into a side sheet "Carbon columns", row for row. The sheets
// "Carbon summary", "Carbon warnings" and "Carbon sources" are added. The
// output goes to a temporary file in its folder and is renamed; the input is
// only read.
//
// Scan and Annotate keep no shared state: they are safe to call from many
// goroutines, with one engine.
package importer
