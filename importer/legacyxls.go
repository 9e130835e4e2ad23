package importer

import (
	"bytes"
	"context"
	"errors"
	"github.com/fluecell/fluecell/importer/regfile"
	"io"
	"os"
	"path/filepath"
	"strings"

	"github.com/fluecell/fluecell/funcs"
)

// Legacy Excel 97-2003 workbooks (.xls, BIFF8 in an OLE compound file) are
// read through LibreOffice: converted headless to a temporary .xlsx, which
// is then scanned like any workbook. No Go reader was good enough: of the
// two candidates, github.com/extrame/xls has one release (v0.0.1, 2017) and
// a history of wrong numbers (RK values decoded without their sign), and
// github.com/shakinm/xlsReader's last release is v0.9.12 (2022); neither is
// among the modules vetted for this project.

// openLegacy converts the file at path when its content is a legacy .xls
// workbook, whatever its name, and returns the converted copy (the caller
// calls remove). For any other file, or one it cannot even open, it returns
// nil and no error: scan's sniff then reads or refuses it. Errors are
// *Error: LibreOffice not installed (ErrFormat, naming the Debian package),
// the file over Options.MaxUnzippedBytes (ErrTooLarge), a conversion that
// failed (ErrCorrupt) or ctx ended (ErrCancelled).
func openLegacy(ctx context.Context, path string, lim limits) (*converted, error) {
	return openLegacyWith(ctx, path, lim, findOffice)
}

func openLegacyWith(ctx context.Context, path string, lim limits, find func() (office, bool)) (*converted, error) {
	if !isLegacyXLS(path) {
		return nil, nil
	}
	if st, err := os.Stat(path); err == nil && st.Size() > lim.maxUnzipped {
		return nil, newErr(ErrTooLarge, path, "the .xls workbook is %s, over the limit of %s; raise it (Options.MaxUnzippedBytes) only for files you trust",
			byteSize(st.Size()), byteSize(lim.maxUnzipped))
	}
	o, ok := find()
	if !ok {
		return nil, legacyRefusal(path)
	}
	c, err := o.toXLSX(ctx, path)
	if err != nil {
		if ctx.Err() != nil {
			return nil, &Error{Code: ErrCancelled, Path: path, Msg: "stopped while converting the .xls workbook: " + err.Error(), Err: err}
		}
		return nil, &Error{Code: ErrCorrupt, Path: path, Err: err,
			Msg: "the legacy .xls workbook could not be converted: " + err.Error() + "; the file may be damaged or password-protected: open it in Excel or LibreOffice and save it as .xlsx"}
	}
	return c, nil
}

// isLegacyXLS reports whether the file at path is an OLE compound file
// holding a BIFF workbook stream and no encryption.
func isLegacyXLS(path string) bool {
	f, err := regfile.Open(path)
	if err != nil {
		return false
	}
	defer f.Close()
	st, err := f.Stat()
	if err != nil || !st.Mode().IsRegular() {
		return false
	}
	head := make([]byte, len(magicCFB))
	if _, err := io.ReadFull(f, head); err != nil || !bytes.Equal(head, magicCFB) {
		return false
	}
	encrypted, legacy := cfbContent(f, st.Size())
	return legacy && !encrypted
}

// scanAnyFormat is scan for every input fluecell reads, legacy .xls
// included: an .xls is converted (see openLegacy), the copy scanned and
// removed before it returns. The result and errors name path, and Format
// is "xls". calc may be nil (scan then makes its own evaluator).
func scanAnyFormat(ctx context.Context, e *funcs.Engine, path string, opt Options, calc formulaCalc) (*ScanResult, error) {
	conv, err := openLegacy(ctx, path, opt.limits())
	if err != nil {
		return nil, err
	}
	if conv == nil {
		return scan(ctx, e, path, opt, calc)
	}
	defer conv.remove()
	res, err := scan(ctx, e, conv.Path, opt, calc)
	return conv.restore(path, res, err)
}

// restore makes a scan of the converted copy speak of the original file:
// its path in the result and in errors, and Format "xls". A nil c returns
// res and err as they are.
func (c *converted) restore(path string, res *ScanResult, err error) (*ScanResult, error) {
	if c == nil {
		return res, err
	}
	if res != nil {
		res.Path, res.Format = path, "xls"
	}
	var ie *Error
	if errors.As(err, &ie) {
		if ie.Path == c.Path || ie.Path == "" {
			ie.Path = path
		}
		ie.Msg = strings.ReplaceAll(ie.Msg, c.Path, path)
		ie.Msg = strings.ReplaceAll(ie.Msg, filepath.Dir(c.Path)+string(filepath.Separator), "")
	}
	return res, err
}

// outputExt is the extension of an annotated copy of a file with extension
// inExt (lower case, with the dot): the same, except that a legacy .xls is
// written as .xlsx (fluecell writes no BIFF).
func outputExt(inExt string) string {
	if inExt == ".xls" {
		return ".xlsx"
	}
	return inExt
}
