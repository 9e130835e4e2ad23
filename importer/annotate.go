package importer

import (
	"archive/zip"
	"context"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strings"

	"github.com/fluecell/fluecell/funcs"
	"github.com/fluecell/fluecell/importer/bookio"
)

// Annotate scans the workbook (or CSV file) at inPath like Scan and writes
// outPath: the original, unchanged cell for cell, plus the computed columns
// of each table (tCO2, tCO2e and source by default; beside the table at
// any size, or in a side sheet "Carbon columns" when Options.Layout asks
// for one) and the sheets "Carbon summary", "Carbon warnings" and "Carbon sources". A CSV
// file gives a CSV file with the computed fields appended to the table's
// records (the warnings are in the report only). A legacy .xls workbook is
// converted by LibreOffice (see openLegacy) and written as .xlsx: the
// converted workbook plus fluecell's columns and sheets.
//
// outPath is written through a temporary file in its folder and renamed, so
// it is either complete or absent; inPath is only read. outPath must differ
// from inPath and keep its extension (.xlsx, .xlsm or .csv; .xlsx for an
// .xls input). Annotate is safe for concurrent use and honours ctx until
// the output is renamed into place. Errors are *Error (see Scan).
//
// The workbook is written as an edit of its package (importer/bookio):
// each sheet that gets computed columns is rewritten as a stream, the
// cells appended to their rows and everything else of the sheet kept as it
// was written; every part that does not change is copied as its raw
// compressed bytes; fluecell's sheets are written by excelize into a small
// book of their own, on the workbook's styles, and spliced in. No sheet of
// the workbook is held in memory, whatever its size. Computed columns are
// never written over a cell of the workbook: a table whose rows reach the
// last columns of its sheet gets them in a side sheet, with a
// columns-moved finding. Before the workbook is written, every part but
// the worksheets is inflated and counted against the limit of its kind
// (partLimit), the parts decoded whole must be well-formed (checkPackage):
// over a limit is ErrTooLarge, a malformed part ErrCorrupt naming it. A
// panic inside excelize is recovered into ErrCorrupt, its stack kept out of
// the message.
func Annotate(ctx context.Context, e *funcs.Engine, inPath, outPath string, opt Options) (rep *Report, err error) {
	defer recoverInternal(&err, inPath)
	defer func() {
		if r := recover(); r != nil {
			rep, err = nil, panicError(inPath, r)
		}
	}()
	if err := checkOutPath(inPath, outPath); err != nil {
		return nil, err
	}
	if l := opt.Layout; l != "" && l != LayoutInline && l != LayoutSideSheet {
		return nil, newErr(ErrInput, inPath, "Options.Layout %q is not a layout: use %q or %q", l, LayoutInline, LayoutSideSheet)
	}
	lim := opt.limits()
	conv, err := openLegacy(ctx, inPath, lim)
	if err != nil {
		return nil, err
	}
	readPath := inPath
	if conv != nil {
		defer conv.remove()
		readPath = conv.Path
	}
	fe := newFormulaEval(ctx, readPath, lim)
	defer fe.close()
	res, err := scan(ctx, e, readPath, opt, fe)
	res, err = conv.restore(inPath, res, err)
	if err != nil {
		return nil, err
	}
	if res.csv != nil {
		err = writeAtomic(ctx, outPath, func(w io.Writer) error { return res.writeCSV(w) })
	} else {
		for _, s := range res.sheets {
			if ownSheet(s) && s != SheetFactors {
				return nil, newErr(ErrInput, inPath, "the workbook already has a sheet %q: it is an annotated output; annotate the original workbook instead", s)
			}
		}
		if f := fe.takeExcelize(); f != nil {
			f.Close() // opened to evaluate formulas; the writing streams
		}
		if err := checkFile(readPath, lim, nil, true); err != nil {
			err.(*Error).Path = inPath
			return nil, err
		}
		if err := ctx.Err(); err != nil {
			return nil, res.sc.cancelled()
		}
		zr, err := zip.OpenReader(readPath)
		if err != nil {
			return nil, &Error{Code: ErrCorrupt, Path: inPath, Msg: "the workbook cannot be read as a zip: " + err.Error(), Err: err}
		}
		defer zr.Close()
		b, _, err := bookio.OpenPackage(&zr.Reader, lim.maxUnzipped)
		if err != nil {
			return nil, bookError(inPath, err)
		}
		ed, g, err := res.writeWorkbook(b, readPath)
		if err != nil {
			return nil, namePart(err, readPath, inPath, lim)
		}
		defer g.Close()
		err = writeAtomic(ctx, outPath, func(w io.Writer) (err error) {
			defer func() {
				if r := recover(); r != nil { // the temporary file is removed: an error, not a panic, leaves writeAtomic
					err = panicError(inPath, r)
				}
			}()
			if err := ed.Write(w); err != nil {
				var pe *fs.PathError
				if errors.As(err, &pe) {
					return err
				}
				return &Error{Code: ErrCorrupt, Path: inPath, Err: err,
					Msg: "cannot annotate the workbook: " + err.Error() + "; open the workbook in Excel or LibreOffice and save it again"}
			}
			return nil
		})
	}
	if err != nil {
		return nil, err
	}
	res.Report.Output = outPath
	return res.Report, nil
}

// DefaultOutput is IN's name with ".carbon" before the extension; a legacy
// .xls gives ".carbon.xlsx" (the annotated copy is an .xlsx workbook).
func DefaultOutput(in string) string {
	ext := filepath.Ext(in)
	return strings.TrimSuffix(in, ext) + ".carbon" + outputExt(strings.ToLower(ext))
}

func checkOutPath(in, out string) error {
	if out == "" {
		return newErr(ErrInput, in, "no output path given (the default is %s)", DefaultOutput(in))
	}
	inExt, outExt := strings.ToLower(filepath.Ext(in)), strings.ToLower(filepath.Ext(out))
	if want := outputExt(inExt); want != inExt && outExt != want {
		return newErr(ErrInput, out, "the annotated copy of a legacy %s workbook is an %s workbook: name the output with %s (e.g. %s); fluecell writes no %s files",
			inExt, want, want, DefaultOutput(in), inExt)
	}
	if want := outputExt(inExt); outExt != want {
		return newErr(ErrInput, out, "the output must keep the input's extension %q (a workbook's type is in its content, so renaming it breaks it)", inExt)
	}
	ai, err1 := filepath.Abs(in)
	ao, err2 := filepath.Abs(out)
	if err1 == nil && err2 == nil && ai == ao {
		return newErr(ErrInput, out, "the output would replace the input; inputs are never modified: choose another name (default %s)", DefaultOutput(in))
	}
	if si, err := os.Stat(in); err == nil {
		if so, err := os.Stat(out); err == nil && os.SameFile(si, so) {
			return newErr(ErrInput, out, "the output is the input file (a link?); inputs are never modified")
		}
	}
	if st, err := os.Stat(filepath.Dir(out)); err != nil || !st.IsDir() {
		return newErr(ErrIO, out, "the output folder %s does not exist", filepath.Dir(out))
	}
	return nil
}

// writeAtomic writes a temporary file in out's folder, syncs it and renames
// it to out. On any error, or when ctx ends first, the temporary file is
// removed and out is left as it was.
func writeAtomic(ctx context.Context, out string, write func(io.Writer) error) (err error) {
	dir, base := filepath.Split(out)
	if dir == "" {
		dir = "."
	}
	tmp, err := os.CreateTemp(dir, "."+base+".*.tmp")
	if err != nil {
		return &Error{Code: ErrIO, Path: out, Msg: "cannot create the output: " + err.Error(), Err: err}
	}
	name := tmp.Name()
	_ = tmp.Chmod(0o644) // CreateTemp makes it private; an output is an ordinary file
	defer func() {
		if err != nil {
			tmp.Close()
			os.Remove(name)
		}
	}()
	if err = write(tmp); err != nil {
		if _, ok := err.(*Error); ok {
			return err
		}
		return &Error{Code: ErrIO, Path: out, Msg: "cannot write the output: " + err.Error(), Err: err}
	}
	if err = tmp.Sync(); err != nil {
		return &Error{Code: ErrIO, Path: out, Msg: "cannot write the output: " + err.Error(), Err: err}
	}
	if err = tmp.Close(); err != nil {
		return &Error{Code: ErrIO, Path: out, Msg: "cannot write the output: " + err.Error(), Err: err}
	}
	if cerr := ctx.Err(); cerr != nil {
		err = &Error{Code: ErrCancelled, Path: out, Msg: "stopped before the output was written: " + cerr.Error(), Err: cerr}
		return err
	}
	if err = os.Rename(name, out); err != nil {
		return &Error{Code: ErrIO, Path: out, Msg: "cannot write the output: " + err.Error(), Err: err}
	}
	return nil
}

// excelErr wraps an excelize error while adding to the workbook in memory:
// excelize refuses something the workbook holds (a sheet name, a style, a
// part it cannot decode), so it is the input's fault, not a failure to
// write a file.
func excelErr(path, what string, err error) error {
	return &Error{Code: ErrCorrupt, Path: path, Msg: fmt.Sprintf("cannot annotate the workbook: writing %s failed: %v; open the workbook in Excel or LibreOffice and save it again", what, err), Err: err}
}

// namePart names the malformed part behind a failure to write into the
// workbook read from readPath, when there is one.
func namePart(err error, readPath, inPath string, lim limits) error {
	ie, ok := err.(*Error)
	if !ok || ie.Code != ErrCorrupt || ie.Err == nil {
		return err
	}
	if name, perr := firstMalformed(readPath, lim); name != "" {
		e := malformedPart(name, perr)
		e.Path, e.Err = inPath, ie.Err
		return e
	}
	return err
}
