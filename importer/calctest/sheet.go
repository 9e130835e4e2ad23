package calctest

// Sheet is one worksheet as a reader saw it. Rows starts at cell A1: Rows[r][c] is the cell in
// row r+1, column c+1, and the rectangle reaches the last used row and column.
type Sheet struct {
	Name string
	Rows [][]Cell
}

// Cell is one cell as a reader saw it.
type Cell struct {
	// Text is the cell's text: for Calc the displayed string (number format applied); for
	// openpyxl str() of the value stored in the file (the cached result for a formula cell,
	// "" when the file holds none).
	Text string
	// Formula is the formula text with its leading "=", or "" for a constant. Calc gives its
	// API syntax: English function names, ';' between arguments, no _xlfn. prefix, e.g.
	// =SUM(1;2) or =WEBSERVICE("..."), and =TRUE() for a stored boolean. openpyxl gives the text
	// stored in the file: =SUM(1,2), =_xlfn.WEBSERVICE("...").
	Formula string
	// Value is the numeric value (or numeric formula result) when IsNumber is set, else 0.
	Value float64
	// IsNumber reports a number or a formula with a numeric result.
	IsNumber bool
}
