package importer

import (
	"archive/zip"
	"bytes"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"

	"github.com/fluecell/fluecell/importer/bookio"
	"github.com/richardlehane/mscfb"
)

// Error is the error type of Scan and Annotate for inputs that cannot be
// read or written. Code says why; Msg names the file and what would be
// accepted.
type Error struct {
	Code string // one of the Err... codes
	Path string
	Msg  string
	Err  error
}

// Error codes of *Error.
const (
	ErrFormat    = "format"    // not a workbook fluecell reads (.xlsb, .ods, other files; .xls without LibreOffice)
	ErrEncrypted = "encrypted" // a password-protected workbook
	ErrCorrupt   = "corrupt"   // a damaged or truncated zip or part
	ErrTooLarge  = "too-large" // over a size limit (zip-bomb protection)
	ErrNoTable   = "no-table"  // no table with a header row was found
	ErrRule      = "rule"      // a --rule that does not parse or compile
	ErrFactors   = "factors"   // the workbook's own Carbon factors sheet is malformed
	ErrIO        = "io"        // the file cannot be opened or the output not written
	ErrCancelled = "cancelled" // the context ended first (nothing was written)
	ErrInput     = "input"     // a bad option (sheet, output path)
	ErrInternal  = "internal"  // a failure inside fluecell or a library: a bug to report
)

func (e *Error) Error() string {
	if e.Path != "" && !strings.Contains(e.Msg, e.Path) {
		return e.Path + ": " + e.Msg
	}
	return e.Msg
}

func (e *Error) Unwrap() error { return e.Err }

func newErr(code, path, format string, args ...any) *Error {
	return &Error{Code: code, Path: path, Msg: fmt.Sprintf(format, args...)}
}

// format is the kind of input file.
type format uint8

const (
	fmtXLSX format = iota + 1
	fmtCSV
)

var (
	magicZip = []byte("PK\x03\x04")
	magicCFB = []byte{0xD0, 0xCF, 0x11, 0xE0, 0xA1, 0xB1, 0x1A, 0xE1}
)

// sniff decides what the file at path is from its extension and first bytes
// and refuses what fluecell does not read, with a message saying what to do.
func sniff(path string, f *os.File, size int64) (format, error) {
	ext := strings.ToLower(filepath.Ext(path))
	head := make([]byte, 8)
	n, _ := io.ReadFull(f, head)
	head = head[:n]
	if _, err := f.Seek(0, io.SeekStart); err != nil {
		return 0, &Error{Code: ErrIO, Path: path, Msg: err.Error(), Err: err}
	}
	switch {
	case bytes.HasPrefix(head, magicCFB):
		return 0, cfbError(path, f, size)
	case bytes.HasPrefix(head, magicZip) || bytes.HasPrefix(head, []byte("PK\x05\x06")):
		switch ext {
		case ".xlsx", ".xlsm":
			return fmtXLSX, nil
		case ".xlsb":
			return 0, newErr(ErrFormat, path, "a binary workbook (.xlsb) cannot be read: save it as .xlsx (Excel: File > Save As > Excel Workbook) and try again")
		case ".ods":
			return 0, newErr(ErrFormat, path, "an OpenDocument spreadsheet (.ods) cannot be read: save it as .xlsx and try again")
		case ".csv":
			return 0, newErr(ErrFormat, path, "the file is named .csv but is a zip (a workbook?): rename it to .xlsx")
		}
		return 0, newErr(ErrFormat, path, "unsupported file type %q: fluecell reads .xlsx, .xlsm, .xls and .csv", ext)
	}
	switch ext {
	case ".csv":
		return fmtCSV, nil
	case ".xls":
		return 0, newErr(ErrFormat, path, "this .xls file is not a binary Excel workbook either (HTML or XML saved as .xls?): open it in Excel or LibreOffice and save it as .xlsx")
	case ".xlsx", ".xlsm":
		if n == 0 {
			return 0, newErr(ErrCorrupt, path, "the file is empty (0 bytes): it is not a workbook; was the download or copy interrupted?")
		}
		return 0, newErr(ErrCorrupt, path, "the file is not a zip, so not an .xlsx workbook (it starts with %q): it may be damaged, or another format renamed", printable(head))
	}
	return 0, newErr(ErrFormat, path, "unsupported file type %q: fluecell reads .xlsx, .xlsm, .xls and .csv", ext)
}

func printable(b []byte) string {
	return strings.Map(func(r rune) rune {
		if r < 32 || r > 126 {
			return '.'
		}
		return r
	}, string(b))
}

// cfbError explains a compound file: a legacy .xls or an encrypted
// OOXML workbook (Office stores those as EncryptionInfo + EncryptedPackage).
// A legacy .xls reaches it only when LibreOffice is missing (see
// openLegacy), or through a caller that does not convert.
func cfbError(path string, f *os.File, size int64) error {
	encrypted, legacy := cfbContent(f, size)
	switch {
	case encrypted:
		return newErr(ErrEncrypted, path, "the workbook is encrypted (password-protected): fluecell cannot read it; remove the password (Excel: File > Info > Protect Workbook > Encrypt with Password, clear it) and save it as .xlsx")
	case legacy:
		return legacyRefusal(path)
	}
	return newErr(ErrFormat, path, "an OLE compound file that is neither an .xls workbook nor an encrypted .xlsx: fluecell reads .xlsx, .xlsm, .xls and .csv")
}

// legacyRefusal is the error for a legacy .xls that cannot be converted
// because LibreOffice is not installed.
func legacyRefusal(path string) *Error {
	return newErr(ErrFormat, path, "a legacy Excel 97-2003 workbook (.xls) cannot be read without LibreOffice, which is not installed: "+
		"install LibreOffice (Debian: %s), or open the file in Excel or LibreOffice and save it as .xlsx", officePackage)
}

// cfbContent looks at the streams of an OLE compound file: encrypted is an
// encrypted OOXML workbook, legacy a BIFF workbook (.xls). A file that
// cannot be parsed is neither.
func cfbContent(f io.ReaderAt, size int64) (encrypted, legacy bool) {
	if size > 1<<30 {
		return false, false
	}
	defer func() { _ = recover() }()
	doc, err := mscfb.New(io.NewSectionReader(f, 0, size))
	if err != nil {
		return false, false
	}
	for e, err := doc.Next(); err == nil; e, err = doc.Next() {
		switch e.Name {
		case "EncryptionInfo", "EncryptedPackage":
			encrypted = true
		case "Workbook", "Book":
			legacy = true
		}
	}
	return encrypted, legacy
}

// openZip opens the zip and checks the zip-bomb limits: number of parts and
// total declared uncompressed size (archive/zip refuses to inflate a part
// beyond its declared size, so the declared sizes bound the work).
func openZip(path string, f *os.File, size int64, lim limits) (*zip.Reader, error) {
	zr, err := zip.NewReader(f, size)
	if err != nil {
		if errors.Is(err, zip.ErrFormat) || errors.Is(err, io.ErrUnexpectedEOF) {
			return nil, &Error{Code: ErrCorrupt, Path: path, Err: err,
				Msg: "the workbook is a damaged or truncated zip (" + err.Error() + "): was the download or copy interrupted? Open it in Excel to repair it, or get a fresh copy"}
		}
		return nil, &Error{Code: ErrCorrupt, Path: path, Msg: "the workbook cannot be read as a zip: " + err.Error(), Err: err}
	}
	if len(zr.File) > lim.maxParts {
		return nil, newErr(ErrTooLarge, path, "the zip holds %d parts, over the limit of %d (zip-bomb protection)", len(zr.File), lim.maxParts)
	}
	var total uint64
	for _, zf := range zr.File {
		total += zf.UncompressedSize64
		if total > uint64(lim.maxUnzipped) || zf.UncompressedSize64 > 1<<62 {
			return nil, newErr(ErrTooLarge, path, "the workbook unpacks to more than %s, the limit (zip-bomb protection); raise it (Options.MaxUnzippedBytes) only for files you trust",
				byteSize(lim.maxUnzipped))
		}
		if l := partLimit(zf.Name, lim.maxUnzipped); int64(zf.UncompressedSize64) > l {
			return nil, &Error{Code: ErrTooLarge, Path: path, Msg: partTooLarge(zf.Name, l).Error()}
		}
		if zf.CompressedSize64 > 0 && zf.UncompressedSize64/zf.CompressedSize64 > uint64(lim.maxRatio) && zf.UncompressedSize64 > 16<<20 {
			return nil, newErr(ErrTooLarge, path, "part %s would unpack %d times its packed size (%s), far beyond any real workbook (zip-bomb protection)",
				zf.Name, zf.UncompressedSize64/zf.CompressedSize64, byteSize(int64(zf.UncompressedSize64)))
		}
	}
	return zr, nil
}

// byteSize writes n bytes for a message: "1.5 MB" (bookio.ByteSize).
func byteSize(n int64) string { return bookio.ByteSize(n) }
