package bookio

import (
	"bytes"
	"fmt"
	"path"
	"strings"
)

// Note is a cell comment.
type Note struct {
	Col, Row int
	Text     string // plain text; lines separated by "\n"
}

// AddComments gives the worksheet part sheet the cell comments notes (by
// one author), as Excel stores them: a comments part, a VML drawing with
// one hidden note shape per comment, and the relationships from the sheet
// to both. It returns the relationship id of a new VML drawing, which the
// sheet's rewrite names in its <legacyDrawing> (SheetEdit.LegacyDrawing),
// or "" when the sheet has a VML drawing already: the comments and shapes
// are then added to the sheet's own parts, whose comments stay as they
// are, and a note at a cell that has a comment already is left out.
// The new shapes are numbered in blocks of 1024 ids that no VML drawing of
// the package or earlier call uses, the first at or after shapeBlock (see
// shapeBlocks); a sheet's own drawing lists them in its o:idmap.
func (e *Edit) AddComments(sheet, author string, notes []Note, shapeBlock int) (string, error) {
	cPart, vPart := e.relPart(sheet, "/comments"), e.relPart(sheet, "/vmlDrawing")
	if cPart == "" && vPart == "" {
		return e.newComments(sheet, author, notes, shapeBlock)
	}
	var cData, vData []byte
	var err error
	if cPart != "" {
		if cData, err = e.b.readSmall(cPart); err != nil {
			return "", err
		}
	} else {
		cPart = e.FreeName("xl/comments1.xml")
		cData = []byte(`<?xml version="1.0" encoding="UTF-8" standalone="yes"?>` + "\n" +
			`<comments xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><authors></authors><commentList></commentList></comments>`)
		e.add = append(e.add, addedPart{cPart, nil}) // filled below
		e.override["/"+cPart] = ctComments
		e.AddRel(sheet, relComments, cPart)
	}
	if vPart == "" {
		return "", fmt.Errorf("the sheet %s has comments without their drawing", sheet)
	}
	if vData, err = e.b.readSmall(vPart); err != nil {
		return "", err
	}
	// The authors and the cells that have comments.
	t := NewTok(bytes.NewReader(cData))
	authors, own := 0, map[string]bool{}
	authorID := -1
	for k := t.Next(); k != TokEOF; k = t.Next() {
		switch {
		case k == TokStart && t.Is("author"):
			if !t.Empty {
				if name, err := t.CollectText("author", "", ""); err == nil && name == author && authorID < 0 {
					authorID = authors
				}
			}
			authors++
		case k == TokStart && t.Is("comment"):
			if ref, ok := t.Attr("ref", false); ok {
				own[ref] = true
			}
		}
	}
	if t.Err() != nil {
		return "", fmt.Errorf("%s: %w", cPart, t.Err())
	}
	if authorID < 0 {
		authorID = authors
		if cData, err = insertBeforeEnd(cData, "authors", "<author>"+string(appendEscaped(nil, author, false))+"</author>"); err != nil {
			return "", fmt.Errorf("%s: %w", cPart, err)
		}
	}
	var c, v bytes.Buffer
	if !bytes.Contains(vData, []byte(`_x0000_t202`)) {
		v.WriteString(noteShapeType)
	}
	var add []Note
	for _, note := range notes {
		if !own[CellRef(note.Col, note.Row)] {
			add = append(add, note)
		}
	}
	if len(add) > 0 {
		blocks, err := e.shapeBlocks(shapeBlock, len(add)/shapeBlockSize+1)
		if err != nil {
			return "", err
		}
		for i, note := range add {
			writeNote(&c, &v, note, authorID, blocks[0], i)
		}
		vData = withBlocks(vData, blocks)
	}
	if cData, err = insertBeforeEnd(cData, "commentList", c.String()); err != nil {
		return "", fmt.Errorf("%s: %w", cPart, err)
	}
	if vData, err = insertBeforeEnd(vData, "xml", v.String()); err != nil {
		return "", fmt.Errorf("%s: %w", vPart, err)
	}
	e.Replace(vPart, vData)
	for i := range e.add {
		if e.add[i].name == cPart {
			e.add[i].data = cData
			return "", nil
		}
	}
	e.Replace(cPart, cData)
	return "", nil
}

// relPart is the part the first relationship of type typ (a suffix) of
// part leads to ("" when none).
func (e *Edit) relPart(part, typ string) string {
	rels, err := e.b.allRels(relsPart(part))
	if err != nil {
		return ""
	}
	for _, r := range rels {
		if strings.HasSuffix(r.Type, typ) && r.Mode != "External" {
			if p := ResolvePart(path.Dir(part), r.Target); e.b.File(p) != nil {
				return p
			}
		}
	}
	return ""
}

const noteShapeType = `<v:shapetype id="_x0000_t202" coordsize="21600,21600" o:spt="202" path="m,l,21600r21600,l21600,xe">` +
	`<v:stroke joinstyle="miter"/><v:path gradientshapeok="t" o:connecttype="rect"/></v:shapetype>`

// writeNote writes one comment and its shape (the i-th of the block).
func writeNote(c, v *bytes.Buffer, n Note, author, block, i int) {
	fmt.Fprintf(c, `<comment ref="%s" authorId="%d"><text><t xml:space="preserve">`, CellRef(n.Col, n.Row), author)
	c.Write(appendEscaped(nil, n.Text, false))
	c.WriteString(`</t></text></comment>`)
	fmt.Fprintf(v, `<v:shape id="_x0000_s%d" type="#_x0000_t202" style="position:absolute;margin-left:59.25pt;margin-top:1.5pt;width:225pt;height:90pt;z-index:%d;visibility:hidden" fillcolor="#ffffe1" o:insetmode="auto">`+
		`<v:fill color2="#ffffe1"/><v:shadow on="t" color="black" obscured="t"/><v:path o:connecttype="none"/>`+
		`<v:textbox style="mso-direction-alt:auto"><div style="text-align:left"></div></v:textbox>`+
		`<x:ClientData ObjectType="Note"><x:MoveWithCells/><x:SizeWithCells/><x:Anchor>%d, 15, %d, 2, %d, 15, %d, 4</x:Anchor>`+
		`<x:AutoFill>False</x:AutoFill><x:Row>%d</x:Row><x:Column>%d</x:Column></x:ClientData></v:shape>`,
		block*shapeBlockSize+1+i, i+1, n.Col, max(n.Row-2, 0), n.Col+4, n.Row+5, n.Row-1, n.Col-1)
}

// newComments writes new comments and VML parts for a sheet that has
// neither.
func (e *Edit) newComments(sheet, author string, notes []Note, shapeBlock int) (string, error) {
	blocks, err := e.shapeBlocks(shapeBlock, len(notes)/shapeBlockSize+1)
	if err != nil {
		return "", err
	}
	var c bytes.Buffer
	c.WriteString(`<?xml version="1.0" encoding="UTF-8" standalone="yes"?>` + "\n" +
		`<comments xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><authors><author>`)
	c.Write(appendEscaped(nil, author, false))
	c.WriteString(`</author></authors><commentList>`)
	var v bytes.Buffer
	v.WriteString(`<xml xmlns:v="urn:schemas-microsoft-com:vml" xmlns:o="urn:schemas-microsoft-com:office:office" xmlns:x="urn:schemas-microsoft-com:office:excel">` +
		`<o:shapelayout v:ext="edit"><o:idmap v:ext="edit" data="` + blockList(blocks) + `"/></o:shapelayout>` + noteShapeType)
	for i, n := range notes {
		writeNote(&c, &v, n, 0, blocks[0], i)
	}
	c.WriteString(`</commentList></comments>`)
	v.WriteString(`</xml>`)
	cp := e.FreeName("xl/comments1.xml")
	vp := e.FreeName("xl/drawings/vmlDrawing1.vml")
	e.AddPart(cp, ctComments, c.Bytes())
	e.AddPart(vp, ctVML, v.Bytes())
	e.AddRel(sheet, relComments, cp)
	return e.AddRel(sheet, relVML, vp), nil
}
