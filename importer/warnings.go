package importer

import (
	"sort"
	"strconv"
)

// warnSink collects warnings. Per sheet, column and code only the first max
// are kept one by one; the rest are counted and summed up in one warning at
// the first cell left out, so that a column of 100 000 bad cells gives a
// readable list.
type warnSink struct {
	max   int
	list  []posWarning
	count map[warnKey]int
	over  map[warnKey]*overflow
	seen  map[posKey]bool
	once  map[string]bool
	// rec, when set, takes the warnings instead, to be added later in row
	// order (evaluate's rows whose rules run in another goroutine: evalpipe.go).
	rec *warnRec
}

// warnRec is warnings recorded in order. tag is stored with each: the part
// of its row it came from (0 before the row's rules, k+1 with rule k).
type warnRec struct {
	ops []warnOp
	tag int
}

type warnOp struct {
	tag            int
	once           bool
	key, sheet     string
	col, row       int
	sev, code, msg string
}

// replay adds recorded warnings as add or addOnce would have.
func (w *warnSink) replay(ops []warnOp) {
	for i := range ops {
		o := &ops[i]
		if o.once {
			w.addOnce(o.key, o.sheet, o.col, o.row, o.sev, o.code, o.msg)
		} else {
			w.add(o.sheet, o.col, o.row, o.sev, o.code, o.msg)
		}
	}
}

type posWarning struct {
	Warning
	col, row int
}

type warnKey struct {
	sheet string
	col   int
	code  string
}

type posKey struct {
	sheet    string
	col, row int
	code     string
}

type overflow struct {
	first posWarning
	n     int
	last  int // last row
}

func newWarnSink(max int) *warnSink {
	return &warnSink{max: max, count: map[warnKey]int{}, over: map[warnKey]*overflow{}, seen: map[posKey]bool{}, once: map[string]bool{}}
}

// add records a warning at (col, row) of sheet; a second warning with the
// same code at the same cell is dropped.
func (w *warnSink) add(sheet string, col, row int, sev, code, msg string) {
	if w.rec != nil {
		w.rec.ops = append(w.rec.ops, warnOp{tag: w.rec.tag, sheet: sheet, col: col, row: row, sev: sev, code: code, msg: msg})
		return
	}
	pk := posKey{sheet, col, row, code}
	if w.seen[pk] {
		return
	}
	w.seen[pk] = true
	pw := posWarning{Warning: Warning{Sheet: sheet, Cell: cellRef(col, row), Severity: sev, Code: code, Message: msg}, col: col, row: row}
	k := warnKey{sheet, col, code}
	w.count[k]++
	if w.max < 0 || w.count[k] <= w.max {
		w.list = append(w.list, pw)
		return
	}
	if o := w.over[k]; o != nil {
		o.n++
		o.last = row
	} else {
		w.over[k] = &overflow{first: pw, n: 1, last: row}
	}
}

// addOnce records a warning only the first time key is seen.
func (w *warnSink) addOnce(key string, sheet string, col, row int, sev, code, msg string) {
	if w.rec != nil && !w.once[key] { // a key seen before stays seen: nothing to record
		w.rec.ops = append(w.rec.ops, warnOp{tag: w.rec.tag, once: true, key: key, sheet: sheet, col: col, row: row, sev: sev, code: code, msg: msg})
		return
	}
	if w.once[key] {
		return
	}
	w.once[key] = true
	w.add(sheet, col, row, sev, code, msg)
}

// has reports whether a warning with code was recorded at the cell.
func (w *warnSink) has(sheet string, col, row int, code string) bool {
	return w.seen[posKey{sheet, col, row, code}]
}

// finish returns the warnings sorted by sheet (in workbook order), row and
// column, with one summary per overflowing column and code.
func (w *warnSink) finish(sheetOrder map[string]int) []Warning {
	all := append([]posWarning(nil), w.list...)
	for _, o := range w.over {
		s := o.first
		s.Message = "and " + strconv.Itoa(o.n) + " more cells in column " + colName(s.col) + " (rows " + strconv.Itoa(s.row) + " to " +
			strconv.Itoa(o.last) + ") with the same problem (" + s.Code + "), starting with: " + s.Message
		all = append(all, s)
	}
	sort.SliceStable(all, func(i, j int) bool {
		a, b := all[i], all[j]
		if a.Sheet != b.Sheet {
			return sheetOrder[a.Sheet] < sheetOrder[b.Sheet]
		}
		if a.row != b.row {
			return a.row < b.row
		}
		if a.col != b.col {
			return a.col < b.col
		}
		return a.Code < b.Code
	})
	out := make([]Warning, len(all))
	for i, p := range all {
		out[i] = p.Warning
	}
	return out
}
