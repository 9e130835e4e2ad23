package bookio

import (
	"archive/zip"
	"bytes"
	"fmt"
	"path"
	"strconv"
	"strings"
)

// Splice adds to the edit the worksheets of the package src (a small
// workbook built apart, such as one written by excelize, whose styles part
// extends the edited package's: its style ids mean the same), except those
// named in skip: each sheet part with every part it refers to (drawings,
// charts, their relationships), under free names, with its content type,
// and the sheet at the end of the workbook's sheet list. Cells that refer
// to src's shared strings are rewritten as inline strings (rich text
// kept), so the edited package's shared strings stay as they are. Sheets
// come in src's order.
func (e *Edit) Splice(src *zip.Reader, skip map[string]bool) error {
	sb, err := Open(src, 64<<20)
	if err != nil {
		return fmt.Errorf("the added sheets: %w", err)
	}
	ctypes, err := partTypes(sb)
	if err != nil {
		return err
	}
	var sst [][]byte
	if sp := sharedStringsPart(sb); sp != "" {
		if sst, err = rawSST(sb, sp); err != nil {
			return err
		}
	}
	names := map[string]string{} // src part -> new part
	for _, s := range sb.Sheets {
		if skip[s.Name] || s.Part == "" {
			continue
		}
		if err := e.splicePart(sb, s.Part, ctypes, names, sst, true); err != nil {
			return fmt.Errorf("the added sheet %q: %w", s.Name, err)
		}
		e.AddSheet(s.Name, names[s.Part])
	}
	return nil
}

// splicePart copies the part p of sb and what its relationships reach.
func (e *Edit) splicePart(sb *Book, p string, ctypes func(string) string, names map[string]string, sst [][]byte, sheet bool) error {
	if _, done := names[p]; done {
		return nil
	}
	name := e.FreeName(p)
	names[p] = name
	data, err := sb.readSmall(p)
	if err != nil {
		return err
	}
	if sheet && len(sst) > 0 {
		if data, err = inlineStrings(data, sst); err != nil {
			return fmt.Errorf("%s: %w", p, err)
		}
	}
	e.AddPart(name, ctypes(p), data)
	rp := relsPart(p)
	if sb.File(rp) == nil {
		return nil
	}
	rels, err := sb.allRels(rp)
	if err != nil {
		return err
	}
	var out bytes.Buffer
	out.WriteString(`<?xml version="1.0" encoding="UTF-8" standalone="yes"?>` + "\n" +
		`<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">`)
	for _, r := range rels {
		target := r.Target
		if r.Mode != "External" {
			tp := ResolvePart(path.Dir(p), r.Target)
			if sb.File(tp) == nil {
				return fmt.Errorf("%s refers to %s, which is missing", rp, tp)
			}
			if err := e.splicePart(sb, tp, ctypes, names, sst, false); err != nil {
				return err
			}
			target = relTarget(name, names[tp])
		}
		fmt.Fprintf(&out, `<Relationship Id="%s" Type="%s" Target="%s"`, xmlAttr(r.ID), xmlAttr(r.Type), xmlAttr(target))
		if r.Mode != "" {
			fmt.Fprintf(&out, ` TargetMode="%s"`, xmlAttr(r.Mode))
		}
		out.WriteString("/>")
	}
	out.WriteString("</Relationships>")
	e.add = append(e.add, addedPart{relsPart(name), out.Bytes()})
	return nil
}

// partTypes reads the content types of sb: the type of a part by its
// override, else by its extension's default.
func partTypes(sb *Book) (func(string) string, error) {
	data, err := sb.readSmall(contentTypes)
	if err != nil {
		return nil, err
	}
	over, def := map[string]string{}, map[string]string{}
	t := NewTok(bytes.NewReader(data))
	for k := t.Next(); k != TokEOF; k = t.Next() {
		if k != TokStart {
			continue
		}
		ct, _ := t.Attr("ContentType", false)
		if t.Is("Override") {
			pn, _ := t.Attr("PartName", false)
			over[strings.ToLower(strings.TrimPrefix(pn, "/"))] = ct
		}
		if t.Is("Default") {
			ext, _ := t.Attr("Extension", false)
			def[strings.ToLower(ext)] = ct
		}
	}
	if t.Err() != nil {
		return nil, t.Err()
	}
	return func(p string) string {
		if ct, ok := over[strings.ToLower(p)]; ok {
			return ct
		}
		return def[strings.ToLower(strings.TrimPrefix(path.Ext(p), "."))]
	}, nil
}

// sharedStringsPart is the shared strings part of sb ("" when none).
func sharedStringsPart(sb *Book) string {
	rels, err := sb.allRels(relsPart(sb.wbPart))
	if err != nil {
		return ""
	}
	for _, r := range rels {
		if strings.HasSuffix(r.Type, "/sharedStrings") {
			if p := ResolvePart(path.Dir(sb.wbPart), r.Target); sb.File(p) != nil {
				return p
			}
		}
	}
	return ""
}

// rawSST reads the content of each <si> of a shared strings part, as
// written.
func rawSST(sb *Book, part string) ([][]byte, error) {
	data, err := sb.readSmall(part)
	if err != nil {
		return nil, err
	}
	t := NewTok(bytes.NewReader(data))
	t.Verbatim = true
	var out [][]byte
	var cur []byte
	depth, in := 0, false
	for k := t.Next(); k != TokEOF; k = t.Next() {
		switch {
		case !in && k == TokStart && t.Is("si"):
			if t.Empty {
				out = append(out, nil)
				continue
			}
			in, depth, cur = true, 0, nil
		case in && k == TokEnd && depth == 0:
			out = append(out, cur)
			in = false
		case in:
			if k == TokStart && !t.Empty {
				depth++
			}
			if k == TokEnd {
				depth--
			}
			cur = append(cur, t.Raw...)
		}
	}
	return out, t.Err()
}

// inlineStrings rewrites the shared-string cells of a (small) sheet as
// inline strings with the same content.
func inlineStrings(data []byte, sst [][]byte) ([]byte, error) {
	t := NewTok(bytes.NewReader(data))
	t.Verbatim = true
	var out []byte
	for k := t.Next(); k != TokEOF; k = t.Next() {
		if k != TokStart || !t.Is("c") || t.Empty {
			out = append(out, t.Raw...)
			continue
		}
		if v, ok := RawAttr(t.Attrs, "t", false); !ok || string(v) != "s" {
			out = append(out, t.Raw...)
			continue
		}
		out = append(out, replaceAttr(nil, t.Raw, "t", "inlineStr")...)
		// The children: <v>n</v> becomes <is>…</is>.
		for k = t.Next(); k != TokEOF; k = t.Next() {
			if k == TokEnd && t.Is("c") {
				out = append(out, t.Raw...)
				break
			}
			if k == TokStart && t.Is("v") && !t.Empty {
				var num []byte
				for k = t.Next(); k == TokText; k = t.Next() {
					num = append(num, t.Text...)
				}
				i, err := strconv.Atoi(strings.TrimSpace(string(num)))
				if err != nil || i < 0 || i >= len(sst) {
					return nil, fmt.Errorf("shared string %q does not exist", num)
				}
				out = append(out, "<is>"...)
				out = append(out, sst[i]...)
				out = append(out, "</is>"...)
				continue // the </v> just read is dropped
			}
			out = append(out, t.Raw...)
		}
	}
	return out, t.Err()
}

// ReadPart returns the whole content of a (small) part.
func (b *Book) ReadPart(name string) ([]byte, error) { return b.readSmall(name) }
