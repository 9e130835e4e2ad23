// Package importer reads workbooks (.xlsx, .xlsm, legacy .xls through a
// headless LibreOffice conversion) and CSV files, finds their tables, runs
// carbon rules over their rows and writes annotated copies.
//
// Reading (Scan) streams each worksheet part with a small tokenizer of its
// own, because excelize's Rows iterator does not tell a number from a number
// stored as text, nor a formula without a cached value. Encrypted
// workbooks, corrupt or truncated zips and zip bombs (limits on the
// declared uncompressed size, the number of parts and the packing ratio),
// and .xls files where LibreOffice is not installed, are refused with an
// *Error that says what to do; a panic anywhere inside becomes an *Error of
// code ErrInternal.
//
// Tables are read from evidence, because real workbooks are written by
// others: a header row anywhere (title rows above it may give the unit or
// the fuel; it may be printed over several rows; notes and sources under a
// table end it), and column roles from header words (importer/tables) and
// the values together (evidence.go, roles.go): fuel, quantity, unit, one
// column per fuel, one column per period, build-plan technology and
// capacity, existing carbon figures, a date, a grouping column. Totals,
// annual rows among monthly ones, a fuel given in two units and copied
// sheets are never added to their parts (subtotals.go, duplicate.go);
// flows per day are computed over dated periods (flow.go). Every sheet is
// reported with its status and reason (Report.Sheets); a workbook without a
// table is not an error. A mapping file (mappingfile.go) records a reading
// that a person can check, edit and reuse.
//
// Rules are "COLUMN = EXPR" over the identifiers, given in Options.Rules or
// proposed from the roles; each is compiled once with funcs and run per row.
// The checks record warnings (Warning, codes in report.go) at the cell that
// holds the problem. A row that cannot be computed gets no number.
//
// Writing (Annotate) keeps the original workbook cell for cell. Computed
// columns go beside each table, at any size: the table's sheet is
// rewritten as a stream with the cells appended to its rows (bookio), the
// other parts copied as they are. With Options.Layout "side-sheet" (or a
// table whose rows reach the sheet's last columns) they are streamed into
// a side sheet "Carbon columns", row for row, and the table's sheet is
// left untouched. The sheets "Carbon summary", "Carbon warnings" and
// "Carbon sources" are added. The output goes to a temporary file in its
// folder and is renamed; the input is only read.
//
// Scan and Annotate keep no shared state: they are safe to call from many
// goroutines, with one engine.
package importer
