package bookio

import (
	"archive/zip"
	"fmt"
	"io"
	"path"
	"strings"
)

// Book is an .xlsx/.xlsm package opened for streaming reads: the zip, the
// sheet list from the workbook part and the shared strings.
type Book struct {
	zr     *zip.Reader
	files  map[string]*zip.File // by name; lower-cased names in folded
	folded map[string]*zip.File
	Sheets []SheetRef // in tab order
	SST    []string   // the shared strings' texts (nil when opened by OpenPackage)
	limit  int64      // uncompressed bytes allowed in all (each part: PartLimit)
	wbPart string
	// sstPart is the shared strings part ("" when none); sstRel is true
	// when the workbook's relationships name it (else it was found by its
	// usual name only).
	sstPart string
	sstRel  bool
}

// SheetRef is one sheet of the workbook in tab order.
type SheetRef struct {
	Name  string
	Part  string // zip path of the sheet XML, "" when missing
	Kind  string // worksheet, chartsheet, dialogsheet, macrosheet
	State string // "", hidden, veryHidden
}

// Open reads the package structure of a zip already checked by sniff,
// and its shared strings.
func Open(zr *zip.Reader, limit int64) (*Book, error) {
	b, sstPart, err := OpenPackage(zr, limit)
	if err != nil {
		return nil, err
	}
	if sstPart != "" {
		if b.SST, err = b.ReadSST(sstPart); err != nil {
			return nil, err
		}
	}
	return b, nil
}

// OpenPackage reads the package structure (parts, sheets) without the
// shared strings, and names the shared-strings part ("" when there is
// none). It registers bookio's inflater (newInflater) with zr for the
// parts read through it.
func OpenPackage(zr *zip.Reader, limit int64) (*Book, string, error) {
	zr.RegisterDecompressor(zip.Deflate, newInflater)
	b := &Book{zr: zr, files: map[string]*zip.File{}, folded: map[string]*zip.File{}, limit: limit}
	for _, f := range zr.File {
		name := strings.TrimPrefix(f.Name, "/")
		b.files[name] = f
		b.folded[strings.ToLower(name)] = f
	}
	wbPart := "xl/workbook.xml"
	if rels, err := b.Rels("_rels/.rels"); err == nil {
		for _, r := range rels {
			if strings.HasSuffix(r.Type, "/officeDocument") {
				wbPart = ResolvePart("", r.Target)
			}
		}
	}
	b.wbPart = wbPart
	if b.File(wbPart) == nil {
		return nil, "", fmt.Errorf("the zip holds no workbook part (%s): it is not an Excel workbook", wbPart)
	}
	rels, err := b.Rels(path.Join(path.Dir(wbPart), "_rels", path.Base(wbPart)+".rels"))
	if err != nil {
		return nil, "", err
	}
	byID := map[string]Relation{}
	sstPart := ""
	for _, r := range rels {
		byID[r.ID] = r
		if strings.HasSuffix(r.Type, "/sharedStrings") {
			sstPart = ResolvePart(path.Dir(wbPart), r.Target)
			b.sstRel = true
		}
	}
	if err := b.readWorkbook(wbPart, byID); err != nil {
		return nil, "", err
	}
	if sstPart == "" && b.File("xl/sharedStrings.xml") != nil {
		sstPart = "xl/sharedStrings.xml"
	}
	if sstPart != "" && b.File(sstPart) == nil {
		sstPart = ""
	}
	b.sstPart = sstPart
	return b, sstPart, nil
}

// File finds a part by name, falling back to a case-insensitive match.
func (b *Book) File(name string) *zip.File {
	if f := b.files[name]; f != nil {
		return f
	}
	return b.folded[strings.ToLower(name)]
}

// OpenPart opens a part for reading, bounded by the per-part limit.
func (b *Book) OpenPart(name string) (io.ReadCloser, error) {
	f := b.File(name)
	if f == nil {
		return nil, fmt.Errorf("part %s is missing from the zip", name)
	}
	limit := PartLimit(name, b.limit)
	if int64(f.UncompressedSize64) > limit || f.UncompressedSize64 > 1<<62 {
		return nil, PartTooLarge(name, limit)
	}
	rc, err := f.Open()
	if err != nil {
		return nil, fmt.Errorf("part %s: %v (the zip is corrupt)", name, err)
	}
	return partReader{rc: rc, lr: &LimitedPart{R: rc, Name: name, Limit: limit}, name: name}, nil
}

// partReader names the part in read errors (corrupt deflate data, CRC) and
// counts what it inflates against the part's limit (see PartLimit).
type partReader struct {
	rc   io.ReadCloser
	lr   *LimitedPart
	name string
}

func (p partReader) Read(b []byte) (int, error) {
	n, err := p.lr.Read(b)
	if err != nil && err != io.EOF && !IsTooLarge(err) {
		err = fmt.Errorf("part %s: %v (the zip is corrupt or truncated)", p.name, err)
	}
	return n, err
}

func (p partReader) Close() error { return p.rc.Close() }

// Relation is one relationship of a package part.
type Relation struct{ ID, Type, Target, Mode string }

// Rels reads a relationships part.
func (b *Book) Rels(name string) ([]Relation, error) {
	rc, err := b.OpenPart(name)
	if err != nil {
		return nil, err
	}
	defer rc.Close()
	t := NewTok(rc)
	var out []Relation
	for k := t.Next(); k != TokEOF; k = t.Next() {
		if k == TokStart && t.Is("Relationship") {
			var r Relation
			r.ID, _ = t.Attr("Id", false)
			r.Type, _ = t.Attr("Type", false)
			r.Target, _ = t.Attr("Target", false)
			r.Mode, _ = t.Attr("TargetMode", false)
			if r.Mode != "External" {
				out = append(out, r)
			}
		}
	}
	if err := t.Err(); err != nil {
		return nil, fmt.Errorf("%s: %v", name, err)
	}
	return out, nil
}

// ResolvePart turns a relationship target into a zip path.
func ResolvePart(dir, target string) string {
	target = strings.ReplaceAll(target, "\\", "/")
	if strings.HasPrefix(target, "/") {
		return strings.TrimPrefix(path.Clean(target), "/")
	}
	return strings.TrimPrefix(path.Clean(path.Join(dir, target)), "/")
}

func (b *Book) readWorkbook(part string, byID map[string]Relation) error {
	rc, err := b.OpenPart(part)
	if err != nil {
		return err
	}
	defer rc.Close()
	t := NewTok(rc)
	byPart := map[string]string{} // part -> the first sheet naming it
	for k := t.Next(); k != TokEOF; k = t.Next() {
		if k != TokStart || !t.Is("sheet") {
			continue
		}
		s := SheetRef{Kind: "worksheet"}
		s.Name, _ = t.Attr("name", false)
		s.State, _ = t.Attr("state", false)
		id, _ := t.Attr("id", true)
		if r, ok := byID[id]; ok {
			s.Part = ResolvePart(path.Dir(part), r.Target)
			if i := strings.LastIndexByte(r.Type, '/'); i >= 0 {
				s.Kind = r.Type[i+1:]
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
		b.Sheets = append(b.Sheets, s)
	}
	if err := t.Err(); err != nil {
		return fmt.Errorf("%s: %v", part, err)
	}
	if len(b.Sheets) == 0 {
		return fmt.Errorf("the workbook lists no sheets")
	}
	return nil
}

// ReadSST reads the shared strings: the text of each <si>, rich-text runs
// joined, phonetic runs (rPh) left out.
func (b *Book) ReadSST(part string) ([]string, error) {
	rc, err := b.OpenPart(part)
	if err != nil {
		return nil, err
	}
	defer rc.Close()
	t := NewTok(rc)
	var out []string
	for k := t.Next(); k != TokEOF; k = t.Next() {
		if k == TokStart && t.Is("si") {
			if t.Empty {
				out = append(out, "")
				continue
			}
			s, err := t.CollectText("si", "t", "rPh")
			if err != nil {
				return nil, fmt.Errorf("%s: %v", part, err)
			}
			out = append(out, s)
		}
	}
	if err := t.Err(); err != nil {
		return nil, fmt.Errorf("%s: %v", part, err)
	}
	return out, nil
}

// Sheet returns the sheet with the given name.
func (b *Book) Sheet(name string) (SheetRef, bool) {
	for _, s := range b.Sheets {
		if s.Name == name {
			return s, true
		}
	}
	return SheetRef{}, false
}

// SheetNames are the names of the sheets in tab order.
func (b *Book) SheetNames() []string {
	out := make([]string, len(b.Sheets))
	for i, s := range b.Sheets {
		out[i] = s.Name
	}
	return out
}

// Zip is the package's zip.
func (b *Book) Zip() *zip.Reader { return b.zr }

// WorkbookPart is the zip path of the workbook part (xl/workbook.xml).
func (b *Book) WorkbookPart() string { return b.wbPart }

// Limit is the uncompressed size allowed for the whole package, bytes.
func (b *Book) Limit() int64 { return b.limit }
