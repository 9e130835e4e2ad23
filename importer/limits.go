package importer

import (
	"fmt"
	"io"
	"path"
	"strings"
)

// partKind is what a part of a workbook package holds, for its size limit.
type partKind uint8

const (
	kindOther         partKind = iota // media, properties, macros, anything else
	kindSharedStrings                 // xl/sharedStrings.xml
	kindStyles                        // xl/styles.xml
	kindWorksheet                     // xl/worksheets/*.xml
	kindDrawing                       // drawings, charts, VML
)

func (k partKind) String() string {
	switch k {
	case kindSharedStrings:
		return "shared strings"
	case kindStyles:
		return "styles"
	case kindWorksheet:
		return "worksheet"
	case kindDrawing:
		return "drawing"
	}
	return "other"
}

// Per-part limits on the uncompressed size, by kind, each also bounded by
// Options.MaxUnzippedBytes. The shared strings and styles are decoded whole
// into memory by excelize when a workbook is annotated (about 350 bytes per
// shared string and 16 times the part's size for short strings, measured),
// so their limits are far below the total; a worksheet is streamed by the
// package reader and may use the whole total.
const (
	maxSharedStringsPart = 128 << 20
	maxStylesPart        = 32 << 20
	maxDrawingPart       = 64 << 20
	maxOtherPart         = 256 << 20
)

// kindOf classifies a part by its name (as stored in the zip).
func kindOf(name string) partKind {
	n := strings.ToLower(strings.TrimPrefix(strings.ReplaceAll(name, "\\", "/"), "/"))
	base := path.Base(n)
	switch {
	case strings.HasPrefix(base, "sharedstrings") && strings.HasSuffix(base, ".xml"):
		return kindSharedStrings
	case base == "styles.xml":
		return kindStyles
	case strings.Contains(n, "worksheets/") && !strings.Contains(n, "_rels/"):
		return kindWorksheet
	case strings.Contains(n, "drawings/") || strings.Contains(n, "charts/") || strings.HasSuffix(n, ".vml"):
		return kindDrawing
	}
	return kindOther
}

// partLimit is the most part name may unpack to, in bytes, with total the
// limit of the whole package (Options.MaxUnzippedBytes).
func partLimit(name string, total int64) int64 {
	var l int64
	switch kindOf(name) {
	case kindSharedStrings:
		l = maxSharedStringsPart
	case kindStyles:
		l = maxStylesPart
	case kindDrawing:
		l = maxDrawingPart
	case kindWorksheet:
		l = total
	default:
		l = maxOtherPart
	}
	return min(l, total)
}

// partTooLarge is the error of a part over its limit.
func partTooLarge(name string, limit int64) error {
	return fmt.Errorf("part %s (%s) unpacks to more than %s, the limit for that kind of part (zip-bomb protection)",
		name, kindOf(name), byteSize(limit))
}

// limitedPart counts the bytes inflated from a part and fails as soon as
// they pass the limit, whatever the zip's directory declares.
type limitedPart struct {
	r     io.Reader
	name  string
	limit int64
	n     int64
}

func (l *limitedPart) Read(b []byte) (int, error) {
	n, err := l.r.Read(b)
	l.n += int64(n)
	if l.n > l.limit {
		return 0, partTooLarge(l.name, l.limit)
	}
	return n, err
}
