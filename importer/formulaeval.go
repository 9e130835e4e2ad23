package importer

import (
	"archive/zip"
	"context"

	"github.com/xuri/excelize/v2"
)

// formulaEval evaluates formulas that a workbook holds without a stored
// result (files written by openpyxl and other libraries that save formulas
// but do not calculate them). It implements formulaCalc and does nothing
// until the first such formula asks for a value; a workbook whose formulas
// all have stored results never pays for it.
//
// Two evaluators, picked per sheet by measurement (2 cores, openpyxl files
// of 4 columns, two of them formulas):
//
//   - excelize's CalcCellValue, in this process, for sheets whose XML part
//     is at most sheetBytesPerCell x max(Options.InlineMaxCells,
//     DefaultInlineMaxCells) bytes (6 MB by default). Opening costs about
//     1 ms; each cell about 30 µs. But excelize loads the whole sheet to
//     evaluate one cell, about 1.3 kB a cell (264 MB for 200 000 cells), so
//     bigger sheets are not given to it; below the bound Annotate loads the
//     sheet into excelize anyway to write beside the table, and reuses the
//     file (takeExcelize).
//   - LibreOffice, for bigger sheets and for cells excelize cannot evaluate
//     (functions it lacks, errors): one recalculated copy of the whole
//     workbook, made on first need (about 1 s for a small workbook, 3 s for
//     200 000 cells, in a separate soffice process of about 210 MB), then
//     read sheet by sheet with the streaming reader. Skipped when soffice is
//     not installed.
//
// A cell neither can evaluate gives ok == false; the caller reports it. It
// belongs to one goroutine (one Scan or Annotate).
type formulaEval struct {
	ctx  context.Context
	path string // the workbook as read (a converted .xls: the converted copy)
	lim  limits

	parts    map[string]uint64 // sheet name -> uncompressed size of its part; read on first use
	partsErr bool
	exMax    uint64 // largest sheet part given to excelize, in bytes

	ex       *excelize.File
	exFailed bool

	office   func() (office, bool)
	lo       *recalcCopy
	loFailed bool
}

// sheetBytesPerCell converts Options.InlineMaxCells into a bound on a
// sheet part's size: about 30 bytes of XML per cell in files written by
// Excel, LibreOffice and openpyxl.
const sheetBytesPerCell = 30

// newFormulaEval returns an evaluator for the workbook at path; ctx bounds
// any LibreOffice run it starts. Call close when the scan is done.
func newFormulaEval(ctx context.Context, path string, lim limits) *formulaEval {
	return &formulaEval{ctx: ctx, path: path, lim: lim, office: findOffice,
		exMax: uint64(max(lim.inlineCells, DefaultInlineMaxCells)) * sheetBytesPerCell}
}

// calc evaluates the formula in cell ref ("B7") of sheet and returns its
// result as text: numbers in shortest decimal form, TRUE/FALSE, strings as
// they are. ok is false when neither evaluator can give a value (an error
// value such as #DIV/0! included).
func (fe *formulaEval) calc(sheet, ref string) (string, bool) {
	if fe.ctx.Err() != nil {
		return "", false
	}
	if fe.small(sheet) {
		if v, ok := fe.excelize(sheet, ref); ok {
			return v, true
		}
	}
	return fe.libreOffice(sheet, ref)
}

// small reports whether excelize may evaluate the sheet (see formulaEval).
func (fe *formulaEval) small(sheet string) bool {
	if fe.parts == nil && !fe.partsErr {
		fe.readParts()
	}
	size, ok := fe.parts[sheet]
	return ok && size <= fe.exMax
}

// readParts reads the sizes of the sheet parts from the zip's directory.
func (fe *formulaEval) readParts() {
	fe.partsErr = true
	zr, err := zip.OpenReader(fe.path)
	if err != nil {
		return
	}
	defer zr.Close()
	b, _, err := openPackage(&zr.Reader, fe.lim.maxUnzipped)
	if err != nil {
		return
	}
	fe.parts = map[string]uint64{}
	for _, s := range b.sheets {
		if zf := b.file(s.Part); zf != nil {
			fe.parts[s.Name] = zf.UncompressedSize64
		}
	}
	fe.partsErr = false
}

func (fe *formulaEval) excelize(sheet, ref string) (string, bool) {
	if fe.exFailed {
		return "", false
	}
	if fe.ex == nil {
		f, err := openChecked(fe.path, fe.lim, nil, false)
		if err != nil {
			fe.exFailed = true
			return "", false
		}
		fe.ex = f
	}
	return calcCell(fe.ex, sheet, ref)
}

func (fe *formulaEval) libreOffice(sheet, ref string) (string, bool) {
	if fe.loFailed {
		return "", false
	}
	if fe.lo == nil {
		o, ok := fe.office()
		if !ok {
			fe.loFailed = true
			return "", false
		}
		lo, err := newRecalcCopy(fe.ctx, o, fe.path, fe.lim)
		if err != nil {
			fe.loFailed = true
			return "", false
		}
		fe.lo = lo
	}
	return fe.lo.value(sheet, ref)
}

// takeExcelize hands over the excelize file opened for evaluation (nil when
// none was), so that Annotate writes through it instead of opening the
// workbook again; the caller closes it.
func (fe *formulaEval) takeExcelize() *excelize.File {
	f := fe.ex
	fe.ex = nil
	return f
}

// close releases the excelize file and LibreOffice's copy.
func (fe *formulaEval) close() {
	if fe.ex != nil {
		fe.ex.Close()
		fe.ex = nil
	}
	fe.lo.close()
	fe.lo = nil
}
