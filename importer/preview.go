package importer

import (
	"bytes"
	"context"
	"encoding/csv"
	"errors"
	"io"

	"github.com/fluecell/fluecell/funcs"
	"github.com/fluecell/fluecell/importer/regfile"
)

// TablePreview is the first rows of one table as they are in the file: the
// header row and the data rows after it, each cell's text as read (a number
// in the engine's short form, a formula's stored result).
type TablePreview struct {
	Sheet string `json:"sheet"`
	Range string `json:"range"` // the table's range, as in TableInfo
	// Columns are the letters of the columns shown, left to right.
	Columns []string     `json:"columns"`
	Rows    []PreviewRow `json:"rows"`
	// More is how many rows of the table's range come after the last row
	// shown.
	More int `json:"more_rows"`
}

// PreviewRow is one row of a TablePreview: its 1-based number in the sheet
// and the texts of its cells, one per column of the preview ("" for an
// empty cell).
type PreviewRow struct {
	Row   int      `json:"row"`
	Cells []string `json:"cells"`
}

// Bounds of a preview.
const (
	maxPreviewCols = 40 // columns shown of a wide table
	maxPreviewText = 200
)

// RoleNames returns the role names a mapping file accepts for a column,
// "none" first.
func RoleNames() []string { return append([]string{"none"}, roleNames()...) }

// Preview reads the header row and the first rows data rows of each table
// of a report (Report.Tables of a Scan or Inspect of the same file) from the
// workbook or CSV file at path; it writes nothing. A legacy .xls is converted
// as by Scan. Errors are *Error, as for Scan.
func Preview(ctx context.Context, path string, tables []TableInfo, rows int, opt Options) (out []TablePreview, err error) {
	defer recoverInternal(&err, path)
	out = make([]TablePreview, len(tables))
	want := map[string][]int{} // sheet -> indexes into tables
	for i, t := range tables {
		out[i] = TablePreview{Sheet: t.Sheet, Range: t.Range, Columns: []string{}, Rows: []PreviewRow{}}
		if _, ok := parseRange(t.Range); ok {
			want[t.Sheet] = append(want[t.Sheet], i)
		}
	}
	if len(want) == 0 {
		return out, nil
	}
	lim := opt.limits()
	conv, err := openLegacy(ctx, path, lim)
	if err != nil {
		return nil, err
	}
	readPath := path
	if conv != nil {
		defer conv.remove()
		readPath = conv.Path
	}
	f, err := regfile.Open(readPath)
	if err != nil {
		return nil, &Error{Code: ErrIO, Path: path, Msg: "cannot open the file: " + err.Error(), Err: err}
	}
	defer f.Close()
	st, err := f.Stat()
	if err != nil {
		return nil, &Error{Code: ErrIO, Path: path, Msg: err.Error(), Err: err}
	}
	kind, err := sniff(readPath, f, st.Size())
	if err != nil {
		return nil, err
	}
	take := func(i int, r *row) {
		p := &out[i]
		rr, _ := parseRange(tables[i].Range)
		if r.num < rr.r1 || r.num > rr.r2 {
			return
		}
		if len(p.Rows) > rows {
			return
		}
		last := min(rr.c2, rr.c1+maxPreviewCols-1)
		if len(p.Columns) == 0 {
			for c := rr.c1; c <= last; c++ {
				p.Columns = append(p.Columns, colName(c))
			}
		}
		pr := PreviewRow{Row: r.num, Cells: make([]string, 0, last-rr.c1+1)}
		for c := rr.c1; c <= last; c++ {
			pr.Cells = append(pr.Cells, previewText(r.at(c)))
		}
		p.Rows = append(p.Rows, pr)
	}
	if kind == fmtCSV {
		in, err := readCSV(readPath, f, st.Size(), lim)
		if err != nil {
			return nil, err
		}
		r := csv.NewReader(bytes.NewReader(in.data))
		r.Comma, r.LazyQuotes, r.FieldsPerRecord, r.ReuseRecord = in.comma, true, -1, true
		for num := 1; ; num++ {
			rec, err := r.Read()
			if err == io.EOF {
				break
			}
			if err != nil {
				var pe *csv.ParseError
				if errors.As(err, &pe) {
					return nil, newErr(ErrCorrupt, path, "CSV line %d: %v", pe.Line, pe.Err)
				}
				return nil, newErr(ErrCorrupt, path, "CSV: %v", err)
			}
			cr := row{num: num}
			for j, v := range rec {
				cr.cells = append(cr.cells, cell{col: j + 1, kind: kText, text: v})
			}
			for _, idx := range want {
				for _, i := range idx {
					take(i, &cr)
				}
			}
		}
		countMore(out, tables)
		return out, nil
	}
	zr, err := openZip(readPath, f, st.Size(), lim)
	if err != nil {
		return nil, err
	}
	b, err := openBook(zr, lim.maxUnzipped)
	if err != nil {
		return nil, bookError(path, err)
	}
	for sheet, idx := range want {
		if err := ctx.Err(); err != nil {
			return nil, &Error{Code: ErrCancelled, Path: path, Msg: "stopped: " + err.Error(), Err: err}
		}
		s, ok := b.sheet(sheet)
		if !ok {
			continue
		}
		last := 0
		for _, i := range idx {
			rr, _ := parseRange(tables[i].Range)
			last = max(last, rr.r2)
		}
		sr, err := b.openSheet(s)
		if err != nil {
			return nil, bookError(path, err)
		}
		for {
			r, ok := sr.next()
			if !ok || r.num > last {
				break
			}
			full := true
			for _, i := range idx {
				take(i, &r)
				rr, _ := parseRange(tables[i].Range)
				full = full && (len(out[i].Rows) > rows || r.num >= rr.r2)
			}
			if full {
				break
			}
		}
		err = sr.err
		sr.close()
		if err != nil {
			return nil, bookError(path, err)
		}
	}
	countMore(out, tables)
	return out, nil
}

// countMore sets each preview's More: the rows of its range after the last
// row shown.
func countMore(out []TablePreview, tables []TableInfo) {
	for i := range out {
		rr, ok := parseRange(tables[i].Range)
		if !ok {
			continue
		}
		shown := rr.r1 - 1
		if n := len(out[i].Rows); n > 0 {
			shown = out[i].Rows[n-1].Row
		}
		out[i].More = max(rr.r2-shown, 0)
	}
}

// previewText is a cell's text for a preview, cut to maxPreviewText
// characters.
func previewText(c cell) string {
	s := c.text
	switch c.kind {
	case kNumber:
		s = funcs.FormatNumber(c.num)
	case kEmpty:
		s = ""
		if c.noCache {
			s = "(formula without a stored result)"
		}
	}
	if r := []rune(s); len(r) > maxPreviewText {
		s = string(r[:maxPreviewText]) + "…"
	}
	return s
}
