package importer

import "github.com/fluecell/fluecell/importer/bookio"

// partKind is what a part of a workbook package holds, for its size limit
// (bookio.PartKind).
type partKind = bookio.PartKind

const (
	kindOther         = bookio.KindOther
	kindSharedStrings = bookio.KindSharedStrings
	kindStyles        = bookio.KindStyles
	kindWorksheet     = bookio.KindWorksheet
	kindDrawing       = bookio.KindDrawing
)

// kindOf classifies a part by its name (as stored in the zip).
func kindOf(name string) partKind { return bookio.KindOf(name) }

// partLimit is the most part name may unpack to, in bytes, with total the
// limit of the whole package (Options.MaxUnzippedBytes).
func partLimit(name string, total int64) int64 { return bookio.PartLimit(name, total) }

// partTooLarge is the error of a part over its limit.
func partTooLarge(name string, limit int64) error { return bookio.PartTooLarge(name, limit) }
