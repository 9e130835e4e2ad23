package bookio

import (
	"archive/zip"
	"bufio"
	"fmt"
	"io"
	"path"
	"sort"
	"strconv"
	"strings"
	"time"

	"github.com/klauspost/compress/flate"
)

// Content types and relationship types of the parts bookio adds.
const (
	relWorksheet  = "http://schemas.openxmlformats.org/officeDocument/2006/relationships/worksheet"
	relComments   = "http://schemas.openxmlformats.org/officeDocument/2006/relationships/comments"
	relVML        = "http://schemas.openxmlformats.org/officeDocument/2006/relationships/vmlDrawing"
	ctWorksheet   = "application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml"
	ctComments    = "application/vnd.openxmlformats-officedocument.spreadsheetml.comments+xml"
	ctVML         = "application/vnd.openxmlformats-officedocument.vmlDrawing"
	contentTypes  = "[Content_Types].xml"
	maxEditedPart = 32 << 20 // a part edited whole in memory (workbook, relationships, content types)
)

// Edit collects the changes to a package and writes the new package with
// Write: parts rewritten as streams, parts replaced, parts added, sheets
// added to the workbook, relationships added to parts. Every other part is
// copied as its raw compressed bytes.
type Edit struct {
	b        *Book
	stream   map[string]func(w io.Writer, r io.Reader) error
	late     map[string]func() ([]byte, error)
	add      []addedPart
	taken    map[string]bool // part names in use (lower case)
	override map[string]string
	defaults map[string]string
	sheets   []addedSheet
	rels     map[string][]Relation // relationships added to a part (by the part's name)
	replace  map[string][]byte     // parts replaced whole
	ids      map[string]int        // relationship ids handed out, per part
	sstDone  bool                  // AppendShared has been called

	usedBlocks map[int]bool // VML shape-id blocks in use (shapeBlocks)
}

type addedPart struct {
	name string
	data []byte
}

type addedSheet struct{ name, part string }

// NewEdit starts an edit of the package b.
func NewEdit(b *Book) *Edit {
	e := &Edit{b: b, stream: map[string]func(io.Writer, io.Reader) error{}, late: map[string]func() ([]byte, error){},
		taken: map[string]bool{}, override: map[string]string{}, defaults: map[string]string{}, rels: map[string][]Relation{}, ids: map[string]int{}, replace: map[string][]byte{}}
	for name := range b.files {
		e.taken[strings.ToLower(name)] = true
	}
	return e
}

// Book is the package being edited.
func (e *Edit) Book() *Book { return e.b }

// Rewrite has the part name streamed through fn, which reads the original
// (inflated, within its size limit) and writes the new content.
func (e *Edit) Rewrite(name string, fn func(w io.Writer, r io.Reader) error) {
	e.stream[name] = fn
}

// Replace has the (small) part name replaced by data.
func (e *Edit) Replace(name string, data []byte) { e.replace[name] = data }

// ReplaceLate has the part name replaced by what fn returns; fn is called
// after every other part is written (for a part, such as the styles, that
// the other rewrites add to).
func (e *Edit) ReplaceLate(name string, fn func() ([]byte, error)) {
	e.late[name] = fn
}

// FreeName returns a part name like want (same folder and extension) that
// no part of the package or of the edit has, and reserves it: want itself
// when free, else with a number before the extension changed or added.
func (e *Edit) FreeName(want string) string {
	if !e.taken[strings.ToLower(want)] {
		e.taken[strings.ToLower(want)] = true
		return want
	}
	dir, base := path.Split(want)
	ext := path.Ext(base)
	stem := strings.TrimRight(strings.TrimSuffix(base, ext), "0123456789")
	for n := 1; ; n++ {
		name := dir + stem + strconv.Itoa(n) + ext
		if !e.taken[strings.ToLower(name)] {
			e.taken[strings.ToLower(name)] = true
			return name
		}
	}
}

// AddPart adds a part (its name from FreeName) with its content type.
func (e *Edit) AddPart(name, contentType string, data []byte) {
	e.add = append(e.add, addedPart{name, data})
	if contentType != "" {
		e.override["/"+name] = contentType
	}
}

// AddSheet adds a worksheet part (already added with AddPart) to the
// workbook's sheet list, after the existing sheets, under name.
func (e *Edit) AddSheet(name, part string) {
	e.sheets = append(e.sheets, addedSheet{name, part})
}

// AddRel adds a relationship from the part from to the part target (zip
// paths) and returns its id.
func (e *Edit) AddRel(from, typ, target string) string {
	id := e.newID(from)
	e.rels[from] = append(e.rels[from], Relation{ID: id, Type: typ, Target: relTarget(from, target)})
	return id
}

// newID is a relationship id the part from does not use.
func (e *Edit) newID(from string) string {
	used := map[string]bool{}
	if rels, err := e.b.allRels(relsPart(from)); err == nil {
		for _, r := range rels {
			used[r.ID] = true
		}
	}
	for {
		e.ids[from]++
		id := "rIdFc" + strconv.Itoa(e.ids[from])
		if !used[id] {
			return id
		}
	}
}

// relsPart is the relationships part of the part name.
func relsPart(name string) string {
	return path.Join(path.Dir(name), "_rels", path.Base(name)+".rels")
}

// relTarget is target written relative to the folder of from.
func relTarget(from, target string) string {
	fd := strings.Split(path.Dir(from), "/")
	td := strings.Split(path.Dir(target), "/")
	if path.Dir(from) == "." {
		fd = nil
	}
	if path.Dir(target) == "." {
		td = nil
	}
	i := 0
	for i < len(fd) && i < len(td) && fd[i] == td[i] {
		i++
	}
	parts := []string{}
	for range fd[i:] {
		parts = append(parts, "..")
	}
	parts = append(parts, td[i:]...)
	parts = append(parts, path.Base(target))
	return strings.Join(parts, "/")
}

// HasRels reports whether the part has relationships of type typ (a
// suffix such as "/comments").
func (e *Edit) HasRels(part, typ string) bool {
	rels, err := e.b.allRels(relsPart(part))
	if err != nil {
		return false
	}
	for _, r := range rels {
		if strings.HasSuffix(r.Type, typ) {
			return true
		}
	}
	return false
}

// Write writes the edited package to w: the parts in their original
// order, rewritten, replaced or copied raw, then the added parts, then the
// late replacements. The zip entries keep their names, times and
// methods.
func (e *Edit) Write(w io.Writer) error {
	bw := bufio.NewWriterSize(w, 256<<10)
	zw := zip.NewWriter(bw)
	zw.RegisterCompressor(zip.Deflate, newDeflater)
	edited, err := e.editedParts()
	if err != nil {
		return err
	}
	var late []*zip.File
	for _, f := range e.b.zr.File {
		name := strings.TrimPrefix(f.Name, "/")
		if _, ok := e.late[name]; ok {
			late = append(late, f)
			continue
		}
		switch {
		case e.stream[name] != nil:
			err = e.rewritePart(zw, f, name)
		case edited[name] != nil:
			err = writePart(zw, f.FileHeader, edited[name])
			delete(edited, name)
		default:
			err = zw.Copy(f)
		}
		if err != nil {
			return fmt.Errorf("part %s: %w", name, err)
		}
	}
	names := make([]string, 0, len(edited))
	for name := range edited {
		names = append(names, name)
	}
	sort.Strings(names) // new relationships parts
	for _, name := range names {
		if err := writePart(zw, zip.FileHeader{Name: name, Method: zip.Deflate, Modified: e.stamp()}, edited[name]); err != nil {
			return err
		}
	}
	for _, p := range e.add {
		if err := writePart(zw, zip.FileHeader{Name: p.name, Method: zip.Deflate, Modified: e.stamp()}, p.data); err != nil {
			return err
		}
	}
	for _, f := range late {
		data, err := e.late[strings.TrimPrefix(f.Name, "/")]()
		if err != nil {
			return err
		}
		if err := writePart(zw, f.FileHeader, data); err != nil {
			return err
		}
	}
	if err := zw.Close(); err != nil {
		return err
	}
	return bw.Flush()
}

// stamp is the time given to added parts: the workbook part's, so that
// the same input gives the same output.
func (e *Edit) stamp() time.Time {
	if f := e.b.File(e.b.wbPart); f != nil {
		return f.Modified
	}
	return time.Time{}
}

// writePart writes data as a new entry like h (name, time, method).
func writePart(zw *zip.Writer, h zip.FileHeader, data []byte) error {
	hdr := &zip.FileHeader{Name: h.Name, Method: h.Method, Modified: h.Modified, Comment: h.Comment}
	if hdr.Method != zip.Store {
		hdr.Method = zip.Deflate
	}
	fw, err := zw.CreateHeader(hdr)
	if err != nil {
		return err
	}
	_, err = fw.Write(data)
	return err
}

// rewritePart streams the part through its rewrite.
func (e *Edit) rewritePart(zw *zip.Writer, f *zip.File, name string) error {
	rc, err := e.b.OpenPart(name)
	if err != nil {
		return err
	}
	defer rc.Close()
	hdr := &zip.FileHeader{Name: f.Name, Method: zip.Deflate, Modified: f.Modified, Comment: f.Comment}
	fw, err := zw.CreateHeader(hdr)
	if err != nil {
		return err
	}
	// Three stages side by side: inflating the original, the rewrite,
	// deflating the result.
	ra := newReadAhead(rc)
	defer ra.Close()
	wb := newWriteBehind(fw)
	err = e.stream[name](wb, ra)
	if cerr := wb.Close(); err == nil {
		err = cerr
	}
	return err
}

// editedParts builds the small parts the edit changes: content types, the
// workbook and its relationships, and the relationships of parts given new
// ones.
func (e *Edit) editedParts() (map[string][]byte, error) {
	out := map[string][]byte{}
	for name, data := range e.replace {
		out[name] = data
	}
	if len(e.override) > 0 || len(e.defaults) > 0 {
		data, err := e.b.readSmall(contentTypes)
		if e.b.File(contentTypes) == nil {
			data, err = inferContentTypes(e.b), nil
		}
		if err != nil {
			return nil, err
		}
		var add strings.Builder
		keys := make([]string, 0, len(e.override))
		for k := range e.override {
			keys = append(keys, k)
		}
		sort.Strings(keys)
		for _, k := range keys {
			fmt.Fprintf(&add, `<Override PartName="%s" ContentType="%s"/>`, xmlAttr(k), xmlAttr(e.override[k]))
		}
		if out[contentTypes], err = insertBeforeEnd(data, "Types", add.String()); err != nil {
			return nil, fmt.Errorf("%s: %w", contentTypes, err)
		}
	}
	wb := e.b.wbPart
	for _, s := range e.sheets {
		e.AddRel(wb, relWorksheet, s.part)
	}
	if len(e.sheets) > 0 {
		data, err := e.b.readSmall(wb)
		if err != nil {
			return nil, err
		}
		maxID := 0
		t := NewTok(strings.NewReader(string(data)))
		relPfx := ""
		for k := t.Next(); k != TokEOF; k = t.Next() {
			if k == TokStart && t.Is("workbook") {
				relPfx = nsPrefix(t.Attrs, nsRel)
			}
			if k == TokStart && t.Is("sheet") {
				if v, ok := t.Attr("sheetId", false); ok {
					if n, err := strconv.Atoi(v); err == nil {
						maxID = max(maxID, n)
					}
				}
			}
		}
		if t.Err() != nil {
			return nil, fmt.Errorf("%s: %w", wb, t.Err())
		}
		rels := e.rels[wb]
		var add strings.Builder
		for i, s := range e.sheets {
			id := rels[len(rels)-len(e.sheets)+i].ID
			ns, p := "", relPfx
			if p == "" {
				p, ns = "r", ` xmlns:r="`+nsRel+`"`
			}
			fmt.Fprintf(&add, `<sheet%s name="%s" sheetId="%d" %s:id="%s"/>`, ns, xmlAttr(s.name), maxID+1+i, p, id)
		}
		if out[wb], err = insertBeforeEnd(data, "sheets", add.String()); err != nil {
			return nil, fmt.Errorf("%s: %w", wb, err)
		}
	}
	if len(e.sheets) > 0 {
		if name, data := e.appProps(); data != nil && out[name] == nil && e.stream[name] == nil && e.late[name] == nil {
			out[name] = data
		}
	}
	for part, rels := range e.rels {
		rp := relsPart(part)
		data, err := e.b.readSmall(rp)
		if err != nil {
			data = []byte(`<?xml version="1.0" encoding="UTF-8" standalone="yes"?>` + "\n" +
				`<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships"></Relationships>`)
		}
		var add strings.Builder
		for _, r := range rels {
			fmt.Fprintf(&add, `<Relationship Id="%s" Type="%s" Target="%s"/>`, xmlAttr(r.ID), xmlAttr(r.Type), xmlAttr(r.Target))
		}
		if out[rp], err = insertBeforeEnd(data, "Relationships", add.String()); err != nil {
			return nil, fmt.Errorf("%s: %w", rp, err)
		}
	}
	return out, nil
}

// nsPrefix is the prefix attrs bind to the namespace uri ("" when none).
func nsPrefix(attrs []byte, uri string) string {
	s := string(attrs)
	for {
		i := strings.Index(s, "xmlns:")
		if i < 0 {
			return ""
		}
		s = s[i+len("xmlns:"):]
		j := strings.IndexAny(s, "= \t\r\n")
		if j < 0 {
			return ""
		}
		if v, ok := RawAttr(attrs, s[:j], true); ok && string(v) == uri {
			return s[:j]
		}
	}
}

func xmlAttr(s string) string { return string(appendEscaped(nil, s, true)) }

// insertBeforeEnd inserts text (elements without a prefix, or with the
// element's prefix added to each) before the end tag of the first element
// named name; an empty element <name/> is opened and closed around it.
func insertBeforeEnd(data []byte, name, text string) ([]byte, error) {
	t := NewTok(strings.NewReader(string(data)))
	t.Verbatim = true
	var out []byte
	pfx := ""
	for k := t.Next(); k != TokEOF; k = t.Next() {
		if k == TokStart && t.Is(name) {
			raw := string(t.Raw[1:])
			if i := strings.IndexByte(raw, ':'); i >= 0 && i < len(t.Raw)-1 && !strings.ContainsAny(raw[:i], " \t\r\n/>") {
				pfx = raw[:i+1]
			}
			if t.Empty {
				out = append(out, t.Raw[:len(t.Raw)-2]...)
				out = append(out, '>')
				out = append(out, prefixed(text, pfx)...)
				out = append(out, "</"+pfx+name+">"...)
				return append(out, rest(t)...), t.Err()
			}
		}
		if k == TokEnd && t.Is(name) {
			out = append(out, prefixed(text, pfx)...)
			out = append(out, t.Raw...)
			return append(out, rest(t)...), t.Err()
		}
		out = append(out, t.Raw...)
	}
	if t.Err() != nil {
		return nil, t.Err()
	}
	return nil, fmt.Errorf("no <%s> element", name)
}

// prefixed adds pfx to the element names of text (which has none).
func prefixed(text, pfx string) string {
	if pfx == "" {
		return text
	}
	text = strings.ReplaceAll(text, "</", "\x00")
	text = strings.ReplaceAll(text, "<", "<"+pfx)
	return strings.ReplaceAll(text, "\x00", "</"+pfx)
}

// rest is the remaining input of t, token by token.
func rest(t *Tok) []byte {
	var out []byte
	for k := t.Next(); k != TokEOF; k = t.Next() {
		out = append(out, t.Raw...)
	}
	return out
}

// readSmall reads a part edited whole.
func (b *Book) readSmall(name string) ([]byte, error) {
	f := b.File(name)
	if f == nil {
		return nil, fmt.Errorf("part %s is missing from the zip", name)
	}
	if f.UncompressedSize64 > maxEditedPart {
		return nil, PartTooLarge(name, maxEditedPart)
	}
	rc, err := b.OpenPart(name)
	if err != nil {
		return nil, err
	}
	defer rc.Close()
	return io.ReadAll(io.LimitReader(rc, maxEditedPart+1))
}

// allRels reads a relationships part, external targets included.
func (b *Book) allRels(name string) ([]Relation, error) {
	data, err := b.readSmall(name)
	if err != nil {
		return nil, err
	}
	t := NewTok(strings.NewReader(string(data)))
	var out []Relation
	for k := t.Next(); k != TokEOF; k = t.Next() {
		if k == TokStart && t.Is("Relationship") {
			var r Relation
			r.ID, _ = t.Attr("Id", false)
			r.Type, _ = t.Attr("Type", false)
			r.Target, _ = t.Attr("Target", false)
			r.Mode, _ = t.Attr("TargetMode", false)
			out = append(out, r)
		}
	}
	return out, t.Err()
}

// Content types of the parts of a workbook, by folder and name, for a
// package that lacks its content types part (Excel refuses to open one).
var knownTypes = []struct{ prefix, ext, ct string }{
	{"xl/worksheets/", ".xml", ctWorksheet},
	{"xl/chartsheets/", ".xml", "application/vnd.openxmlformats-officedocument.spreadsheetml.chartsheet+xml"},
	{"xl/styles", ".xml", "application/vnd.openxmlformats-officedocument.spreadsheetml.styles+xml"},
	{"xl/sharedstrings", ".xml", "application/vnd.openxmlformats-officedocument.spreadsheetml.sharedStrings+xml"},
	{"xl/theme/", ".xml", "application/vnd.openxmlformats-officedocument.theme+xml"},
	{"xl/drawings/", ".xml", "application/vnd.openxmlformats-officedocument.drawing+xml"},
	{"xl/charts/chart", ".xml", "application/vnd.openxmlformats-officedocument.drawingml.chart+xml"},
	{"xl/comments", ".xml", ctComments},
	{"xl/tables/", ".xml", "application/vnd.openxmlformats-officedocument.spreadsheetml.table+xml"},
	{"docprops/core", ".xml", "application/vnd.openxmlformats-package.core-properties+xml"},
	{"docprops/app", ".xml", "application/vnd.openxmlformats-officedocument.extended-properties+xml"},
	{"xl/vbaproject", ".bin", "application/vnd.ms-office.vbaProject"},
}

// inferContentTypes builds a content types part from the part names.
func inferContentTypes(b *Book) []byte {
	var sb strings.Builder
	sb.WriteString(`<?xml version="1.0" encoding="UTF-8" standalone="yes"?>` + "\n" +
		`<Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types">` +
		`<Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/>` +
		`<Default Extension="xml" ContentType="application/xml"/><Default Extension="vml" ContentType="` + ctVML + `"/>` +
		`<Default Extension="png" ContentType="image/png"/><Default Extension="jpeg" ContentType="image/jpeg"/>` +
		`<Default Extension="emf" ContentType="image/x-emf"/>`)
	names := make([]string, 0, len(b.files))
	for name := range b.files {
		names = append(names, name)
	}
	sort.Strings(names)
	macros := b.File("xl/vbaProject.bin") != nil
	for _, name := range names {
		ct := ""
		low := strings.ToLower(name)
		if name == b.wbPart {
			ct = "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml"
			if macros {
				ct = "application/vnd.ms-excel.sheet.macroEnabled.main+xml"
			}
		}
		for _, k := range knownTypes {
			if ct == "" && strings.HasPrefix(low, k.prefix) && strings.HasSuffix(low, k.ext) && !strings.Contains(low, "_rels/") {
				ct = k.ct
			}
		}
		if ct != "" {
			fmt.Fprintf(&sb, `<Override PartName="/%s" ContentType="%s"/>`, xmlAttr(name), ct)
		}
	}
	sb.WriteString(`</Types>`)
	return []byte(sb.String())
}

// deflateLevel is the compression level of the parts bookio writes.
const deflateLevel = 5

// newDeflater is the compressor of the parts bookio writes:
// github.com/klauspost/compress/flate, which writes the same deflate
// format as the standard library's compress/flate, faster.
func newDeflater(w io.Writer) (io.WriteCloser, error) {
	return flate.NewWriter(w, deflateLevel)
}

// newInflater is the decompressor of the parts bookio reads:
// github.com/klauspost/compress/flate's reader, which decodes the same
// deflate format as the standard library's, about a fifth faster on a
// worksheet (95 ms against 75 ms for 50 MB of sheet XML). The zip reader
// still checks each part's CRC-32 and size.
func newInflater(r io.Reader) io.ReadCloser { return flate.NewReader(r) }
