package importer

import (
	"archive/zip"
	"bytes"
	"fmt"
	"path"
	"strings"

	"github.com/fluecell/fluecell/importer/bookio"
	"github.com/xuri/excelize/v2"
)

// placeholderSheet is the one sheet of the added book before fluecell's
// sheets are added to it; it is left out when they are spliced into the
// annotated workbook. Its name holds characters no real sheet name can
// have next to each other, so it never meets one.
const placeholderSheet = "fluecell placeholder"

// addedBook is a small workbook, held by excelize, in which fluecell
// writes the sheets it adds (summary, warnings, sources, side sheets). It
// starts from the styles part and theme of the workbook being annotated,
// so a style id made in it means the same in that workbook: its styles
// part replaces the workbook's, and its sheets are spliced in
// (bookio.Edit.Splice). The workbook's own sheets are never loaded.
func addedBook(b *bookio.Book) (*excelize.File, string, error) {
	stylesPart, themePart := "", ""
	rels, err := b.Rels(path.Join(path.Dir(b.WorkbookPart()), "_rels", path.Base(b.WorkbookPart())+".rels"))
	if err != nil {
		return nil, "", err
	}
	for _, r := range rels {
		p := bookio.ResolvePart(path.Dir(b.WorkbookPart()), r.Target)
		switch {
		case strings.HasSuffix(r.Type, "/styles"):
			stylesPart = p
		case strings.HasSuffix(r.Type, "/theme"):
			themePart = p
		}
	}
	if stylesPart == "" || b.File(stylesPart) == nil {
		return nil, "", fmt.Errorf("the workbook has no styles part")
	}
	styles, err := b.ReadPart(stylesPart)
	if err != nil {
		return nil, "", err
	}
	var theme []byte
	if themePart != "" && b.File(themePart) != nil {
		if theme, err = b.ReadPart(themePart); err != nil {
			return nil, "", err
		}
	}
	var buf bytes.Buffer
	zw := zip.NewWriter(&buf)
	put := func(name, data string) {
		if w, err := zw.Create(name); err == nil {
			_, _ = w.Write([]byte(data)) // into memory: cannot fail
		}
	}
	const head = `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>` + "\n"
	themeType, themeRel := "", ""
	if theme != nil {
		themeType = `<Override PartName="/xl/theme/theme1.xml" ContentType="application/vnd.openxmlformats-officedocument.theme+xml"/>`
		themeRel = `<Relationship Id="rId3" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/theme" Target="theme/theme1.xml"/>`
		put("xl/theme/theme1.xml", string(theme))
	}
	put("[Content_Types].xml", head+`<Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types">`+
		`<Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/><Default Extension="xml" ContentType="application/xml"/>`+
		`<Override PartName="/xl/workbook.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml"/>`+
		`<Override PartName="/xl/worksheets/sheet1.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml"/>`+
		`<Override PartName="/xl/styles.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.styles+xml"/>`+themeType+`</Types>`)
	put("_rels/.rels", head+`<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">`+
		`<Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/officeDocument" Target="xl/workbook.xml"/></Relationships>`)
	put("xl/workbook.xml", head+`<workbook xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main" xmlns:r="http://schemas.openxmlformats.org/officeDocument/2006/relationships">`+
		`<sheets><sheet name="`+placeholderSheet+`" sheetId="1" r:id="rId1"/></sheets></workbook>`)
	put("xl/_rels/workbook.xml.rels", head+`<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">`+
		`<Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/worksheet" Target="worksheets/sheet1.xml"/>`+
		`<Relationship Id="rId2" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/styles" Target="styles.xml"/>`+themeRel+`</Relationships>`)
	put("xl/worksheets/sheet1.xml", head+`<worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><sheetData/></worksheet>`)
	put("xl/styles.xml", string(styles))
	if err := zw.Close(); err != nil {
		return nil, "", err
	}
	f, err := excelize.OpenReader(&buf)
	if err != nil {
		return nil, "", err
	}
	return f, stylesPart, nil
}

// addedStyles is the styles part of the added book as excelize writes it.
func addedStyles(f *excelize.File) ([]byte, error) {
	buf, err := f.WriteToBuffer()
	if err != nil {
		return nil, err
	}
	zr, err := zip.NewReader(bytes.NewReader(buf.Bytes()), int64(buf.Len()))
	if err != nil {
		return nil, err
	}
	for _, zf := range zr.File {
		if zf.Name == "xl/styles.xml" {
			rc, err := zf.Open()
			if err != nil {
				return nil, err
			}
			defer rc.Close()
			var out bytes.Buffer
			_, err = out.ReadFrom(rc)
			return out.Bytes(), err
		}
	}
	return nil, fmt.Errorf("the added book has no styles part")
}
