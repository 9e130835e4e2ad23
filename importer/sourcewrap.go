package importer

import (
	"math"
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/xuri/excelize/v2"
)

// wrapWriter streams a sheet of text whose long cells wrap: every text cell
// wraps at its column's width, a spanning line (a caution, a note) is merged
// across the columns, and each row gets the height its longest text needs,
// so nothing is cut off on screen or on a printed page.
type wrapWriter struct {
	sw     *excelize.StreamWriter
	widths []float64 // column widths, characters
	wrap   int       // wrapped text, top-aligned
	row    int
	err    error
}

// lineHeight is the height of one line of 11-point text, points.
const lineHeight = 15

// newWrapWriter starts the stream of sheet with the given column widths,
// printed one page wide in landscape.
func newWrapWriter(f *excelize.File, sheet string, st *styles, widths []float64) (*wrapWriter, error) {
	wrap, err := f.NewStyle(&excelize.Style{Alignment: &excelize.Alignment{WrapText: true, Vertical: "top"}})
	if err != nil {
		return nil, err
	}
	// Page setup goes on the sheet before streaming starts: the stream
	// writes the sheet's properties first.
	if err := f.SetSheetProps(sheet, &excelize.SheetPropsOptions{FitToPage: boolPtr(true)}); err != nil {
		return nil, err
	}
	if err := f.SetPageLayout(sheet, &excelize.PageLayoutOptions{Orientation: strPtr("landscape"), FitToWidth: intPtr(1), FitToHeight: intPtr(0)}); err != nil {
		return nil, err
	}
	sw, err := f.NewStreamWriter(sheet)
	if err != nil {
		return nil, err
	}
	for i, w := range widths {
		if err := sw.SetColWidth(i+1, i+1, w); err != nil {
			return nil, err
		}
	}
	return &wrapWriter{sw: sw, widths: widths, wrap: wrap, row: 1}, nil
}

// textLines is the number of lines text takes in a column width
// characters wide: a character of prose is taken as one unit of width
// (wider than most, so the estimate errs on the tall side).
func textLines(text string, width float64) int {
	per := max(1, int(width)-1)
	n := 0
	for _, line := range strings.Split(text, "\n") {
		n += max(1, int(math.Ceil(float64(utf8.RuneCountInString(line))/float64(per))))
	}
	return n
}

// put writes one row from column A; style 0 wraps text cells and aligns
// every cell to the top.
func (w *wrapWriter) put(style int, vals ...any) {
	if w.err != nil {
		return
	}
	lines := 1
	for i, v := range vals {
		s, isText := v.(string)
		switch {
		case style != 0:
			vals[i] = excelize.Cell{StyleID: style, Value: v}
		case v != nil:
			vals[i] = excelize.Cell{StyleID: w.wrap, Value: v} // numbers top-aligned beside wrapped text
		}
		if isText && i < len(w.widths) {
			lines = max(lines, textLines(s, w.widths[i]))
		}
	}
	w.write(vals, lines)
}

// span writes text across every column, merged and wrapped.
func (w *wrapWriter) span(style int, text string) {
	w.spanTo(style, text, len(w.widths), nil)
}

// note writes a note across all columns but the last, and its count of
// rows in the last.
func (w *wrapWriter) note(text string, rows int) {
	w.spanTo(0, text, len(w.widths)-1, rows)
}

func (w *wrapWriter) spanTo(style int, text string, cols int, last any) {
	if w.err != nil {
		return
	}
	if style == 0 {
		style = w.wrap
	}
	width := 0.0
	for _, x := range w.widths[:cols] {
		width += x
	}
	vals := []any{excelize.Cell{StyleID: style, Value: text}}
	if last != nil {
		for len(vals) < cols {
			vals = append(vals, nil)
		}
		vals = append(vals, excelize.Cell{StyleID: w.wrap, Value: last})
	}
	r := strconv.Itoa(w.row)
	if cols > 1 {
		if w.err = w.sw.MergeCell("A"+r, colName(cols)+r); w.err != nil {
			return
		}
	}
	w.write(vals, textLines(text, width))
}

func (w *wrapWriter) write(vals []any, lines int) {
	if w.err != nil {
		return
	}
	var opts []excelize.RowOpts
	if lines > 1 {
		opts = append(opts, excelize.RowOpts{Height: min(float64(lines*lineHeight), excelize.MaxRowHeight)})
	}
	w.err = w.sw.SetRow("A"+strconv.Itoa(w.row), vals, opts...)
	w.row++
}

// skip leaves a blank row.
func (w *wrapWriter) skip() { w.row++ }
