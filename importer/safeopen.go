package importer

import (
	"archive/zip"
	"bytes"
	"encoding/xml"
	"errors"
	"fmt"
	"io"
	"runtime/debug"
	"sort"
	"strings"

	"github.com/fluecell/fluecell/importer/bookio"
	"github.com/xuri/excelize/v2"
)

// What excelize holds of a workbook, per byte or per item, measured with
// excelize v2.11 (runtime.MemStats.HeapInuse after opening and writing one
// cell): a part up to excelizeInMemory bytes is kept as it is; the shared
// strings decode to about bytesPerSharedString per string plus twice their
// text (32 MB of short strings: 1.5 million strings, 507 MB); a worksheet it
// loads to about bytesPerSheetByte per byte of XML (1.3 kB per cell of
// about 30 bytes, see formulaEval); the styles to about bytesPerStyleByte.
const (
	excelizeInMemory      = 16 << 20 // excelize.StreamChunkSize: larger sheets and shared strings go to temporary files
	bytesPerSharedString  = 350
	bytesPerSheetByte     = 45
	bytesPerStyleByte     = 10
	maxStructuralPartSize = 32 << 20 // content types, relationships, workbook: read whole to be checked
)

// pkgCheck is what checkPackage learnt of a workbook.
type pkgCheck struct {
	sizes   map[string]int64 // counted uncompressed size of each part (worksheets: declared)
	strings int64            // shared strings (<si> elements)
	styles  string           // the styles part, "" when there is none
	memory  int64            // estimate of what excelize holds, in bytes
	detail  []string         // the largest contributions to memory, for the message
}

// structural reports a part excelize decodes as soon as it opens the
// workbook or writes a cell: a malformed one is named before excelize
// reads it.
func structural(name string) bool {
	n := strings.ToLower(name)
	return n == "[content_types].xml" || strings.HasSuffix(n, ".rels") && !strings.Contains(n, "worksheets/") && !strings.Contains(n, "drawings/") && !strings.Contains(n, "charts/") ||
		n == "xl/workbook.xml" || kindOf(name) == kindStyles
}

// checkPackage inflates every part of the workbook except the worksheets
// (which the package reader streams, counting, and archive/zip caps at
// their declared size) and counts the bytes against the limit of each
// kind of part (partLimit), whatever the zip's directory declares. The
// parts excelize decodes first (content types, relationships, workbook,
// styles) must be well-formed XML, and the styles part must exist with its
// cell formats when the workbook is to be written (write). Then it estimates the memory excelize will hold with the
// worksheets in loaded; over lim.maxUnzipped it refuses. Errors name the
// part; they are *Error (ErrTooLarge, ErrCorrupt) once wrapped by the
// caller with the path.
func checkPackage(zr *zip.Reader, lim limits, loaded map[string]bool, write bool) (*pkgCheck, error) {
	pc := &pkgCheck{sizes: map[string]int64{}}
	var sstSize, stylesSize, sheets int64
	for _, zf := range zr.File {
		name := zf.Name
		limit := partLimit(name, lim.maxUnzipped)
		if zf.UncompressedSize64 > uint64(limit) {
			return nil, &Error{Code: ErrTooLarge, Msg: partTooLarge(name, limit).Error()}
		}
		kind := kindOf(name)
		if kind == kindWorksheet {
			pc.sizes[name] = int64(zf.UncompressedSize64)
			if loaded[strings.TrimPrefix(name, "/")] {
				sheets += int64(zf.UncompressedSize64)
			}
			continue
		}
		// The shared strings are copied as they are into the annotated
		// workbook: a malformed part is named now, not met by Excel.
		keep := (structural(name) || write && kind == kindSharedStrings) && zf.UncompressedSize64 <= maxStructuralPartSize
		n, si, data, err := inflateCounting(zf, limit, kind == kindSharedStrings, keep)
		if err != nil {
			var ie *Error
			if errors.As(err, &ie) {
				return nil, ie
			}
			return nil, &Error{Code: ErrCorrupt, Msg: fmt.Sprintf("part %s cannot be unpacked: %v (the zip is damaged)", name, err), Err: err}
		}
		pc.sizes[name] = n
		switch kind {
		case kindSharedStrings:
			pc.strings += si
			sstSize += n
		case kindStyles:
			pc.styles = name
			stylesSize += n
			if err := checkStyles(name, data); err != nil {
				return nil, err
			}
		}
		if keep && kind != kindStyles {
			if err := wellFormed(data); err != nil {
				return nil, malformedPart(name, err)
			}
		}
	}
	if pc.styles == "" && write {
		return nil, &Error{Code: ErrCorrupt, Msg: "the workbook has no styles part (xl/styles.xml), which Excel and LibreOffice always write: " +
			"it cannot be annotated without changing how its cells look; open it in Excel or LibreOffice and save it again"}
	}
	for _, n := range pc.sizes {
		if n <= excelizeInMemory {
			pc.memory += n // kept as it is; larger worksheets and shared strings go to temporary files
		}
	}
	add := func(what string, n int64) {
		if n > 0 {
			pc.memory += n
			pc.detail = append(pc.detail, fmt.Sprintf("%s about %s", what, byteSize(n)))
		}
	}
	add(fmt.Sprintf("shared strings (%d strings, %s)", pc.strings, byteSize(sstSize)), pc.strings*bytesPerSharedString+2*sstSize)
	add(fmt.Sprintf("styles (%s)", byteSize(stylesSize)), stylesSize*bytesPerStyleByte)
	add(fmt.Sprintf("worksheets written into (%s)", byteSize(sheets)), sheets*bytesPerSheetByte)
	if pc.memory > lim.maxUnzipped {
		sort.Strings(pc.detail)
		return nil, &Error{Code: ErrTooLarge, Msg: fmt.Sprintf("annotating the workbook would hold about %s in memory (%s), over the limit of %s (Options.MaxUnzippedBytes): "+
			"the shared strings are decoded whole; split the workbook, or raise the limit only for files you trust",
			byteSize(pc.memory), strings.Join(pc.detail, "; "), byteSize(lim.maxUnzipped))}
	}
	return pc, nil
}

// inflateCounting reads a part to its end, counting its bytes against
// limit; it counts the shared-string items when si is asked for and returns
// the bytes when keep is.
func inflateCounting(zf *zip.File, limit int64, si, keep bool) (n, items int64, data []byte, err error) {
	rc, err := zf.Open()
	if err != nil {
		return 0, 0, nil, err
	}
	defer rc.Close()
	lr := &bookio.LimitedPart{R: rc, Name: zf.Name, Limit: limit}
	var buf bytes.Buffer
	chunk := make([]byte, 64<<10)
	for {
		m, rerr := lr.Read(chunk)
		if si {
			items += int64(bytes.Count(chunk[:m], []byte("<si>")) + bytes.Count(chunk[:m], []byte("<si ")) + bytes.Count(chunk[:m], []byte(":si>")) + bytes.Count(chunk[:m], []byte(":si ")))
		}
		if keep {
			buf.Write(chunk[:m])
		}
		if rerr == io.EOF {
			break
		}
		if rerr != nil {
			if strings.Contains(rerr.Error(), "zip-bomb") {
				return lr.N, items, nil, &Error{Code: ErrTooLarge, Msg: rerr.Error()}
			}
			return lr.N, items, nil, rerr
		}
	}
	return lr.N, items, buf.Bytes(), nil
}

// wellFormed decodes data as excelize's XML decoder will: every token, with
// the checks of encoding/xml (UTF-8, character references such as &#0;,
// nesting). An empty part is not well-formed.
func wellFormed(data []byte) error {
	if len(bytes.TrimSpace(data)) == 0 {
		return errors.New("the part is empty")
	}
	d := xml.NewDecoder(bytes.NewReader(data))
	d.Strict = true
	d.CharsetReader = func(label string, input io.Reader) (io.Reader, error) { return input, nil }
	root := false
	for {
		tok, err := d.Token()
		if err == io.EOF {
			if !root {
				return errors.New("the part holds no XML element")
			}
			return nil
		}
		if err != nil {
			return err
		}
		if _, ok := tok.(xml.StartElement); ok {
			root = true
		}
	}
}

// checkStyles checks the styles part: well-formed, a styleSheet, with cell
// formats (cellXfs), without which excelize cannot add a style.
func checkStyles(name string, data []byte) error {
	if err := wellFormed(data); err != nil {
		return malformedPart(name, err)
	}
	var s struct {
		XMLName xml.Name
		CellXfs *struct {
			Xf []struct{} `xml:"xf"`
		} `xml:"cellXfs"`
	}
	if err := xml.Unmarshal(data, &s); err != nil {
		return malformedPart(name, err)
	}
	if s.XMLName.Local != "styleSheet" {
		return malformedPart(name, fmt.Errorf("its root element is <%s>, not <styleSheet>", s.XMLName.Local))
	}
	if s.CellXfs == nil || len(s.CellXfs.Xf) == 0 {
		return malformedPart(name, errors.New("it lists no cell formats (cellXfs)"))
	}
	return nil
}

// malformedPart is the error of a part that is not what it should be.
func malformedPart(name string, err error) *Error {
	return &Error{Code: ErrCorrupt, Err: err,
		Msg: fmt.Sprintf("the workbook's %s part (%s) is malformed: %v; open the workbook in Excel or LibreOffice and save it again", partDescription(name), name, err)}
}

// partDescription names what a part holds, for messages.
func partDescription(name string) string {
	switch n := strings.ToLower(name); {
	case n == "[content_types].xml":
		return "content types"
	case strings.HasSuffix(n, ".rels"):
		return "relationships"
	case n == "xl/workbook.xml":
		return "workbook"
	}
	return kindOf(name).String()
}

// openChecked opens the workbook at path with excelize, after checkPackage
// (loaded: the zip paths of the worksheets excelize will load; write: it is
// opened to be annotated, not only to evaluate formulas), recovering
// a panic inside excelize. Errors are *Error with the path; a malformed part
// is named.
func openChecked(path string, lim limits, loaded map[string]bool, write bool) (f *excelize.File, err error) {
	if err := checkFile(path, lim, loaded, write); err != nil {
		return nil, err
	}
	defer func() {
		if r := recover(); r != nil {
			f, err = nil, panicError(path, r)
		}
	}()
	f, err = excelize.OpenFile(path, excelize.Options{UnzipSizeLimit: lim.maxUnzipped})
	if err != nil {
		return nil, diagnose(path, lim, "cannot open the workbook for writing", err)
	}
	return f, nil
}

// checkFile runs checkPackage on the workbook at path; errors are *Error
// with the path.
func checkFile(path string, lim limits, loaded map[string]bool, write bool) error {
	zr, err := zip.OpenReader(path)
	if err != nil {
		return &Error{Code: ErrCorrupt, Path: path, Msg: "the workbook cannot be read as a zip: " + err.Error(), Err: err}
	}
	defer zr.Close()
	if _, err = checkPackage(&zr.Reader, lim, loaded, write); err != nil {
		ie := err.(*Error)
		ie.Path = path
		return ie
	}
	return nil
}

// diagnose turns an excelize failure on the workbook at path into an
// input error: it looks for the first part that is not well-formed XML
// (structural parts first, then shared strings, worksheets and the rest)
// and names it; otherwise it names excelize's complaint.
func diagnose(path string, lim limits, what string, cause error) *Error {
	if name, perr := firstMalformed(path, lim); name != "" {
		e := malformedPart(name, perr)
		e.Path = path
		e.Err = cause
		return e
	}
	return &Error{Code: ErrCorrupt, Path: path, Err: cause,
		Msg: fmt.Sprintf("%s: %v (a part of the workbook is not as Excel writes it); open the workbook in Excel or LibreOffice and save it again", what, cause)}
}

// firstMalformed returns the first XML part of the workbook at path that
// is not well-formed, with the reason ("" when every part is, or the zip
// cannot be read).
func firstMalformed(path string, lim limits) (string, error) {
	zr, err := zip.OpenReader(path)
	if err != nil {
		return "", nil
	}
	defer zr.Close()
	files := append([]*zip.File(nil), zr.File...)
	rank := func(f *zip.File) int {
		switch {
		case structural(f.Name):
			return 0
		case kindOf(f.Name) == kindSharedStrings:
			return 1
		case kindOf(f.Name) == kindWorksheet:
			return 2
		}
		return 3
	}
	sort.SliceStable(files, func(i, j int) bool { return rank(files[i]) < rank(files[j]) })
	for _, zf := range files {
		n := strings.ToLower(zf.Name)
		if !strings.HasSuffix(n, ".xml") && !strings.HasSuffix(n, ".rels") && !strings.HasSuffix(n, ".vml") {
			continue
		}
		limit := partLimit(zf.Name, lim.maxUnzipped)
		if zf.UncompressedSize64 > uint64(limit) {
			continue
		}
		_, _, data, err := inflateCounting(zf, limit, false, true)
		if err != nil {
			return zf.Name, err
		}
		if err := wellFormed(data); err != nil {
			return zf.Name, err
		}
	}
	return "", nil
}

// panicError is the error for a panic while a workbook was read or written:
// a library (or fluecell) failed on a malformed input. The message names a
// malformed part when one is found; the stack is kept in Err for logs, never
// in the message.
func panicError(path string, r any) *Error {
	if pe, ok := asPageError(r); ok {
		return &Error{Code: ErrIO, Path: path, Msg: pe.Error(), Err: pe}
	}
	cause := fmt.Errorf("panic: %v\n%s", r, debug.Stack())
	if name, perr := firstMalformed(path, limits{maxUnzipped: DefaultMaxUnzippedBytes}); name != "" {
		e := malformedPart(name, perr)
		e.Path, e.Err = path, cause
		return e
	}
	return &Error{Code: ErrCorrupt, Path: path, Err: cause,
		Msg: fmt.Sprintf("the workbook could not be read or written: a part of it is not as Excel writes it (%v); open it in Excel or LibreOffice and save it again", oneLineOf(r))}
}

// oneLineOf is a panic value as one short line.
func oneLineOf(r any) string {
	s := fmt.Sprint(r)
	if i := strings.IndexByte(s, '\n'); i >= 0 {
		s = s[:i]
	}
	if len(s) > 200 {
		s = strings.ToValidUTF8(s[:200], "") + "…"
	}
	return s
}
