package importer

import (
	"archive/zip"

	"github.com/fluecell/fluecell/importer/bookio"
)

// book is an .xlsx/.xlsm package opened for streaming reads (bookio.Book),
// with the importer's names for what it reads.
type book struct {
	*bookio.Book
	sheets  []sheetRef
	sst     []string
	layouts *sheetLayouts // when not nil, what each sheet read holds where (placement.go)
}

// sheetLayouts is recorded while the scan reads the sheets, for placing
// the computed columns without reading the sheets again: per sheet, the
// rightmost column with a value or formula of each row (by row number),
// and the merged ranges.
type sheetLayouts struct {
	right  map[string][]uint16
	merges map[string][]rangeRef
}

// recordLayouts has b record the layout of each sheet it reads into
// res (see sheetLayouts).
func (res *ScanResult) recordLayouts(b *book) {
	b.layouts = &sheetLayouts{right: map[string][]uint16{}, merges: map[string][]rangeRef{}}
	res.layouts = b.layouts
}

// sheetRef is one sheet of the workbook in tab order.
type sheetRef = bookio.SheetRef

// openBook reads the package structure of a zip already checked by sniff,
// and its shared strings.
func openBook(zr *zip.Reader, limit int64) (*book, error) {
	b, err := bookio.Open(zr, limit)
	if err != nil {
		return nil, err
	}
	return &book{Book: b, sheets: b.Sheets, sst: b.SST}, nil
}

// openPackage reads the package structure (parts, sheets) without the
// shared strings, and names the shared-strings part ("" when there is
// none).
func openPackage(zr *zip.Reader, limit int64) (*book, string, error) {
	b, sst, err := bookio.OpenPackage(zr, limit)
	if err != nil {
		return nil, "", err
	}
	return &book{Book: b, sheets: b.Sheets}, sst, nil
}

// file finds a part by name, falling back to a case-insensitive match.
func (b *book) file(name string) *zip.File { return b.File(name) }

// sheet returns the sheet with the given name.
func (b *book) sheet(name string) (sheetRef, bool) { return b.Sheet(name) }

func (b *book) sheetNames() []string { return b.SheetNames() }

// keepMerges returns the merged ranges ms of sheet s as the importer's
// ranges, recorded for the placement of computed columns.
func (b *book) keepMerges(s sheetRef, ms []bookio.Range) []rangeRef {
	out := make([]rangeRef, len(ms))
	for i, m := range ms {
		out[i] = rangeRef{m.C1, m.R1, m.C2, m.R2}
	}
	if b.layouts != nil {
		b.layouts.merges[s.Name] = out
	}
	return out
}
