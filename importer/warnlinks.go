package importer

import "github.com/xuri/excelize/v2"

// maxWarnLinks bounds the hyperlinks of the Carbon warnings sheet (excelize
// looks through a sheet's links on each one added, and a sheet holds at most
// 65,530): past it, cells are named without a link, and the sheet says so.
const maxWarnLinks = 10_000

// warnLinks adds the hyperlinks of the Carbon warnings sheet while it is
// streamed. The links are set on the sheet before the stream is flushed:
// excelize's stream writer writes the sheet's hyperlinks after its rows.
type warnLinks struct {
	f       *excelize.File
	sheet   string
	n       int
	skipped int
	err     error
	side    map[string][]*table // per data sheet, its tables with a side sheet
}

func (res *ScanResult) newWarnLinks(f *excelize.File, sheet string) *warnLinks {
	l := &warnLinks{f: f, sheet: sheet, side: map[string][]*table{}}
	for _, t := range res.sc.tables {
		if t.layout == LayoutSideSheet && t.outSheet != "" {
			l.side[t.spec.sheet] = append(l.side[t.spec.sheet], t)
		}
	}
	return l
}

// targets are the link of w's cell ("'Fuel log'!C11") and, for a finding in
// the rows of a table whose computed columns went to a side sheet, the
// first computed cell of that row there ("Carbon columns!B11"; "" for none).
func (l *warnLinks) targets(w Warning) (cell, side string) {
	if w.Sheet == "" || w.Cell == "" {
		return "", ""
	}
	_, row, ok := parseRef(w.Cell)
	if !ok {
		return "", ""
	}
	cell = quoteSheet(w.Sheet) + "!" + w.Cell
	for _, t := range l.side[w.Sheet] {
		if row >= t.spec.headerRow && row <= max(t.lastRow, t.spec.headerRow) {
			side = t.outSheet + "!" + cellRef(t.outCol+1, row)
			break
		}
	}
	return cell, side
}

// room reports whether another link may be added; it counts the ones that
// may not.
func (l *warnLinks) room() bool {
	if l.n < maxWarnLinks {
		return true
	}
	l.skipped++
	return false
}

// add links ref of the warnings sheet to target, keeping the first error.
func (l *warnLinks) add(ref, target string) {
	if l.err != nil {
		return
	}
	l.n++
	l.err = l.f.SetCellHyperLink(l.sheet, ref, target, "Location")
}
