package importer

import (
	"archive/zip"
	"fmt"
	"io"
	"path"
	"strings"
)

// book is an .xlsx/.xlsm package opened for streaming reads: the zip, the
// sheet list from the workbook part and the shared strings.
type book struct {
	zr     *zip.Reader
	files  map[string]*zip.File // by name; lower-cased names in folded
	folded map[string]*zip.File
	sheets []sheetRef
	sst    []string
	limit  int64 // uncompressed bytes allowed in all (each part: partLimit)
}

// sheetRef is one sheet of the workbook in tab order.
type sheetRef struct {
	Name  string
	Part  string // zip path of the sheet XML, "" when missing
	Kind  string // worksheet, chartsheet, dialogsheet, macrosheet
	State string // "", hidden, veryHidden
}

// openBook reads the package structure of a zip already checked by sniff,
// and its shared strings.
func openBook(zr *zip.Reader, limit int64) (*book, error) {
	b, sstPart, err := openPackage(zr, limit)
	if err != nil {
		return nil, err
	}
	if sstPart != "" {
		if b.sst, err = b.readSST(sstPart); err != nil {
			return nil, err
		}
	}
	return b, nil
}

// openPackage reads the package structure (parts, sheets) without the
// shared strings, and names the shared-strings part ("" when there is
// none).
func openPackage(zr *zip.Reader, limit int64) (*book, string, error) {
	b := &book{zr: zr, files: map[string]*zip.File{}, folded: map[string]*zip.File{}, limit: limit}
	for _, f := range zr.File {
		name := strings.TrimPrefix(f.Name, "/")
		b.files[name] = f
		b.folded[strings.ToLower(name)] = f
	}
	wbPart := "xl/workbook.xml"
	if rels, err := b.rels("_rels/.rels"); err == nil {
		for _, r := range rels {
			if strings.HasSuffix(r.typ, "/officeDocument") {
				wbPart = resolvePart("", r.target)
			}
		}
	}
	if b.file(wbPart) == nil {
		return nil, "", fmt.Errorf("the zip holds no workbook part (%s): it is not an Excel workbook", wbPart)
	}
	rels, err := b.rels(path.Join(path.Dir(wbPart), "_rels", path.Base(wbPart)+".rels"))
	if err != nil {
		return nil, "", err
	}
	byID := map[string]relation{}
	sstPart := ""
	for _, r := range rels {
		byID[r.id] = r
		if strings.HasSuffix(r.typ, "/sharedStrings") {
			sstPart = resolvePart(path.Dir(wbPart), r.target)
		}
	}
	if err := b.readWorkbook(wbPart, byID); err != nil {
		return nil, "", err
	}
	if sstPart == "" && b.file("xl/sharedStrings.xml") != nil {
		sstPart = "xl/sharedStrings.xml"
	}
	if sstPart != "" && b.file(sstPart) == nil {
		sstPart = ""
	}
	return b, sstPart, nil
}

// file finds a part by name, falling back to a case-insensitive match.
func (b *book) file(name string) *zip.File {
	if f := b.files[name]; f != nil {
		return f
	}
	return b.folded[strings.ToLower(name)]
}

// open opens a part for reading, bounded by the per-part limit.
func (b *book) open(name string) (io.ReadCloser, error) {
	f := b.file(name)
	if f == nil {
		return nil, fmt.Errorf("part %s is missing from the zip", name)
	}
	limit := partLimit(name, b.limit)
	if int64(f.UncompressedSize64) > limit || f.UncompressedSize64 > 1<<62 {
		return nil, partTooLarge(name, limit)
	}
	rc, err := f.Open()
	if err != nil {
		return nil, fmt.Errorf("part %s: %v (the zip is corrupt)", name, err)
	}
	return partReader{rc: rc, lr: &limitedPart{r: rc, name: name, limit: limit}, name: name}, nil
}

// partReader names the part in read errors (corrupt deflate data, CRC) and
// counts what it inflates against the part's limit (see partLimit).
type partReader struct {
	rc   io.ReadCloser
	lr   *limitedPart
	name string
}

func (p partReader) Read(b []byte) (int, error) {
	n, err := p.lr.Read(b)
	if err != nil && err != io.EOF && !strings.Contains(err.Error(), "zip-bomb") {
		err = fmt.Errorf("part %s: %v (the zip is corrupt or truncated)", p.name, err)
	}
	return n, err
}

func (p partReader) Close() error { return p.rc.Close() }

type relation struct{ id, typ, target, mode string }

// rels reads a relationships part.
func (b *book) rels(name string) ([]relation, error) {
	rc, err := b.open(name)
	if err != nil {
		return nil, err
	}
	defer rc.Close()
	t := newXMLTok(rc)
	var out []relation
	for k := t.next(); k != tokEOF; k = t.next() {
		if k == tokStart && t.is("Relationship") {
			var r relation
			r.id, _ = t.attr("Id", false)
			r.typ, _ = t.attr("Type", false)
			r.target, _ = t.attr("Target", false)
			r.mode, _ = t.attr("TargetMode", false)
			if r.mode != "External" {
				out = append(out, r)
			}
		}
	}
	if err := t.fail(); err != nil {
		return nil, fmt.Errorf("%s: %v", name, err)
	}
	return out, nil
}

// resolvePart turns a relationship target into a zip path.
func resolvePart(dir, target string) string {
	target = strings.ReplaceAll(target, "\\", "/")
	if strings.HasPrefix(target, "/") {
		return strings.TrimPrefix(path.Clean(target), "/")
	}
	return strings.TrimPrefix(path.Clean(path.Join(dir, target)), "/")
}

func (b *book) readWorkbook(part string, byID map[string]relation) error {
	rc, err := b.open(part)
	if err != nil {
		return err
	}
	defer rc.Close()
	t := newXMLTok(rc)
	byPart := map[string]string{} // part -> the first sheet naming it
	for k := t.next(); k != tokEOF; k = t.next() {
		if k != tokStart || !t.is("sheet") {
			continue
		}
		s := sheetRef{Kind: "worksheet"}
		s.Name, _ = t.attr("name", false)
		s.State, _ = t.attr("state", false)
		id, _ := t.attr("id", true)
		if r, ok := byID[id]; ok {
			s.Part = resolvePart(path.Dir(part), r.target)
			if i := strings.LastIndexByte(r.typ, '/'); i >= 0 {
				s.Kind = r.typ[i+1:]
			}
		}
		if s.Part != "" {
			// Two sheets never share a part; a workbook listing one part
			// under many names would have it read once per name.
			if first, dup := byPart[s.Part]; dup {
				return fmt.Errorf("sheets %q and %q both refer to the part %s: the workbook part (%s) is malformed", first, s.Name, s.Part, part)
			}
			byPart[s.Part] = s.Name
		}
		b.sheets = append(b.sheets, s)
	}
	if err := t.fail(); err != nil {
		return fmt.Errorf("%s: %v", part, err)
	}
	if len(b.sheets) == 0 {
		return fmt.Errorf("the workbook lists no sheets")
	}
	return nil
}

// readSST reads the shared strings: the text of each <si>, rich-text runs
// joined, phonetic runs (rPh) left out.
func (b *book) readSST(part string) ([]string, error) {
	rc, err := b.open(part)
	if err != nil {
		return nil, err
	}
	defer rc.Close()
	t := newXMLTok(rc)
	var out []string
	for k := t.next(); k != tokEOF; k = t.next() {
		if k == tokStart && t.is("si") {
			if t.empty {
				out = append(out, "")
				continue
			}
			s, err := t.collectText("si", "t", "rPh")
			if err != nil {
				return nil, fmt.Errorf("%s: %v", part, err)
			}
			out = append(out, s)
		}
	}
	if err := t.fail(); err != nil {
		return nil, fmt.Errorf("%s: %v", part, err)
	}
	return out, nil
}

// sheet returns the sheet with the given name.
func (b *book) sheet(name string) (sheetRef, bool) {
	for _, s := range b.sheets {
		if s.Name == name {
			return s, true
		}
	}
	return sheetRef{}, false
}

func (b *book) sheetNames() []string {
	out := make([]string, len(b.sheets))
	for i, s := range b.sheets {
		out[i] = s.Name
	}
	return out
}
