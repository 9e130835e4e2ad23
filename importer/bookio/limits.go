package bookio

import (
	"errors"
	"fmt"
	"io"
	"path"
	"strings"
)

// PartKind is what a part of a workbook package holds, for its size limit.
type PartKind uint8

const (
	KindOther         PartKind = iota // media, properties, macros, anything else
	KindSharedStrings                 // xl/sharedStrings.xml
	KindStyles                        // xl/styles.xml
	KindWorksheet                     // xl/worksheets/*.xml
	KindDrawing                       // drawings, charts, VML
)

func (k PartKind) String() string {
	switch k {
	case KindSharedStrings:
		return "shared strings"
	case KindStyles:
		return "styles"
	case KindWorksheet:
		return "worksheet"
	case KindDrawing:
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

// KindOf classifies a part by its name (as stored in the zip).
func KindOf(name string) PartKind {
	n := strings.ToLower(strings.TrimPrefix(strings.ReplaceAll(name, "\\", "/"), "/"))
	base := path.Base(n)
	switch {
	case strings.HasPrefix(base, "sharedstrings") && strings.HasSuffix(base, ".xml"):
		return KindSharedStrings
	case base == "styles.xml":
		return KindStyles
	case strings.Contains(n, "worksheets/") && !strings.Contains(n, "_rels/"):
		return KindWorksheet
	case strings.Contains(n, "drawings/") || strings.Contains(n, "charts/") || strings.HasSuffix(n, ".vml"):
		return KindDrawing
	}
	return KindOther
}

// PartLimit is the most part name may unpack to, in bytes, with total the
// limit of the whole package (Options.MaxUnzippedBytes).
func PartLimit(name string, total int64) int64 {
	var l int64
	switch KindOf(name) {
	case KindSharedStrings:
		l = maxSharedStringsPart
	case KindStyles:
		l = maxStylesPart
	case KindDrawing:
		l = maxDrawingPart
	case KindWorksheet:
		l = total
	default:
		l = maxOtherPart
	}
	return min(l, total)
}

// PartTooLarge is the error of a part over its limit.
func PartTooLarge(name string, limit int64) error {
	return &tooLarge{fmt.Sprintf("part %s (%s) unpacks to more than %s, the limit for that kind of part (zip-bomb protection)",
		name, KindOf(name), ByteSize(limit))}
}

type tooLarge struct{ msg string }

func (e *tooLarge) Error() string { return e.msg }

// LimitedPart counts the bytes inflated from a part and fails as soon as
// they pass the limit, whatever the zip's directory declares.
type LimitedPart struct {
	R     io.Reader
	Name  string // the part, for the error
	Limit int64  // bytes allowed
	N     int64  // bytes read so far
}

func (l *LimitedPart) Read(b []byte) (int, error) {
	n, err := l.R.Read(b)
	l.N += int64(n)
	if l.N > l.Limit {
		return 0, PartTooLarge(l.Name, l.Limit)
	}
	return n, err
}

// ByteSize writes n bytes for a message: "1.5 MB".
func ByteSize(n int64) string {
	switch {
	case n >= 1<<30:
		return fmt.Sprintf("%.1f GB", float64(n)/(1<<30))
	case n >= 1<<20:
		return fmt.Sprintf("%.1f MB", float64(n)/(1<<20))
	case n >= 1<<10:
		return fmt.Sprintf("%.1f kB", float64(n)/(1<<10))
	}
	return fmt.Sprintf("%d bytes", n)
}

// IsTooLarge reports whether err is a part over its limit (PartTooLarge).
func IsTooLarge(err error) bool {
	var e *tooLarge
	return errors.As(err, &e)
}
