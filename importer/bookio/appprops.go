package bookio

import (
	"bytes"
	"strconv"
	"strings"
)

// The extended properties part (docProps/app.xml, ECMA-376 Part 1
// §22.2) names the workbook's sheets twice: TitlesOfParts lists the titles
// of its parts, group after group, and HeadingPairs says what each group
// is and how many titles it has (a name such as "Worksheets", in the
// language of the program that wrote it, and a count):
//
//	<HeadingPairs><vt:vector size="4" baseType="variant">
//	  <vt:variant><vt:lpstr>Worksheets</vt:lpstr></vt:variant><vt:variant><vt:i4>2</vt:i4></vt:variant>
//	  <vt:variant><vt:lpstr>Named Ranges</vt:lpstr></vt:variant><vt:variant><vt:i4>1</vt:i4></vt:variant>
//	</vt:vector></HeadingPairs>
//	<TitlesOfParts><vt:vector size="3" baseType="lpstr">
//	  <vt:lpstr>Fuel log</vt:lpstr><vt:lpstr>Depots</vt:lpstr><vt:lpstr>Print_Area</vt:lpstr>
//	</vt:vector></TitlesOfParts>

const relExtendedProps = "/extended-properties"

// appProps returns the extended properties part with the sheets the edit
// adds listed among the worksheets: their names after the worksheets'
// titles in TitlesOfParts (whose size grows), and the worksheets' count in
// HeadingPairs grown by as many. The worksheets' group is the one whose
// titles are the names of the workbook's worksheets, else the one named
// "Worksheets". It returns no data, leaving the part as it is, when the
// package has no such part, when the part cannot be read or parsed, or
// when its lists do not have that shape (no HeadingPairs or TitlesOfParts,
// counts that do not add up to the titles, no worksheets' group): a
// spreadsheet program reads the sheets from the workbook part, and a list
// edited on a guess would be worse than one that is only short.
func (e *Edit) appProps() (string, []byte) {
	name := ""
	if rels, err := e.b.allRels("_rels/.rels"); err == nil {
		for _, r := range rels {
			if strings.HasSuffix(r.Type, relExtendedProps) && r.Mode != "External" {
				name = ResolvePart("", r.Target)
				break
			}
		}
	}
	if name == "" || e.b.File(name) == nil {
		return "", nil
	}
	data, err := e.b.readSmall(name)
	if err != nil {
		return "", nil
	}
	var added []string
	for _, s := range e.sheets {
		added = append(added, s.name)
	}
	var own []string
	for _, s := range e.b.Sheets {
		if s.Kind == "worksheet" {
			own = append(own, s.Name)
		}
	}
	out, ok := withSheetTitles(data, own, added)
	if !ok {
		return "", nil
	}
	return name, out
}

// appLists is what withSheetTitles reads of an extended properties part:
// offsets into it, and the text of the entries.
type appLists struct {
	groups []appGroup
	titles []appTitle
	vector [2]int // the TitlesOfParts vector's start tag
	vecEnd int    // where its end tag starts
	prefix string // of its lpstr elements ("vt:")
	hasTPV bool   // a TitlesOfParts vector was found
	size   string // its size attribute
	sized  bool   // it has one
}

type appGroup struct {
	name  string
	count int
	text  [2]int // the count's text
}

type appTitle struct {
	text       string
	start, end int // the lpstr element
}

// withSheetTitles adds the names added to the worksheets' group of the
// extended properties data, whose worksheets are own; ok is false when
// the part does not have the expected shape (see appProps).
func withSheetTitles(data []byte, own, added []string) ([]byte, bool) {
	l, ok := readAppLists(data)
	if !ok || !l.hasTPV {
		return nil, false
	}
	total := 0
	for _, g := range l.groups {
		total += g.count
	}
	if total != len(l.titles) {
		return nil, false
	}
	if l.sized && strings.TrimSpace(l.size) != strconv.Itoa(len(l.titles)) {
		return nil, false
	}
	gi, first := -1, 0
	for _, byName := range []bool{false, true} {
		off := 0
		for i, g := range l.groups {
			if byName && g.name == "Worksheets" || !byName && g.count == len(own) && sameTitles(l.titles[off:off+g.count], own) {
				gi, first = i, off
				break
			}
			off += g.count
		}
		if gi >= 0 {
			break
		}
	}
	if gi < 0 {
		return nil, false
	}
	g := l.groups[gi]
	if g.text[1] > l.vector[0] {
		return nil, false // HeadingPairs after TitlesOfParts: not the schema's order
	}
	at := l.vecEnd // where the new titles go
	switch {
	case g.count > 0:
		at = l.titles[first+g.count-1].end
	case first < len(l.titles):
		at = l.titles[first].start
	}
	var ins []byte
	for _, n := range added {
		ins = append(ins, '<')
		ins = append(ins, l.prefix...)
		ins = append(ins, "lpstr>"...)
		ins = appendEscaped(ins, n, false)
		ins = append(ins, "</"...)
		ins = append(ins, l.prefix...)
		ins = append(ins, "lpstr>"...)
	}
	// The edits, in the order of their offsets: the count, the vector's
	// size, the titles.
	var out []byte
	out = append(out, data[:g.text[0]]...)
	out = strconv.AppendInt(out, int64(g.count+len(added)), 10)
	out = append(out, data[g.text[1]:l.vector[0]]...)
	out = replaceAttr(out, data[l.vector[0]:l.vector[1]], "size", strconv.Itoa(len(l.titles)+len(added)))
	out = append(out, data[l.vector[1]:at]...)
	out = append(out, ins...)
	out = append(out, data[at:]...)
	return out, true
}

func sameTitles(ts []appTitle, names []string) bool {
	for i, t := range ts {
		if t.text != names[i] {
			return false
		}
	}
	return true
}

// readAppLists reads the HeadingPairs and TitlesOfParts of an extended
// properties part; ok is false when it is not well formed enough to edit.
func readAppLists(data []byte) (appLists, bool) {
	var l appLists
	t := NewTok(bytes.NewReader(data))
	t.Verbatim = true
	off := 0 // offset of the current token: the tokens' raw bytes make up the part
	depth := 0
	inHP, inTP := -1, -1 // depth of HeadingPairs, TitlesOfParts
	// An entry being read: a title, a group's name or a group's count.
	const (
		none = iota
		title
		groupName
		groupCount
	)
	entry, entryStart := none, 0
	var text []byte
	var textAt [2]int
	texts := 0
	pending := "" // a group's name, waiting for its count
	havePending := false
	for k := t.Next(); k != TokEOF; k = t.Next() {
		start := off
		off += len(t.Raw)
		if entry != none {
			switch k {
			case TokText:
				if t.CDATA {
					text = appendCDATA(text, t.Text)
				} else {
					text = append(text, t.Text...)
				}
				textAt = [2]int{start, off}
				texts++
				continue
			case TokOther:
				continue
			case TokStart:
				return l, false // markup inside an entry
			}
			// The entry's end tag.
			depth--
			switch entry {
			case title:
				l.titles = append(l.titles, appTitle{text: Unescape(text), start: entryStart, end: off})
			case groupName:
				if havePending {
					return l, false
				}
				pending, havePending = Unescape(text), true
			case groupCount:
				n, err := strconv.Atoi(strings.TrimSpace(string(text)))
				if !havePending || texts != 1 || t.CDATA || err != nil || n < 0 {
					return l, false
				}
				l.groups = append(l.groups, appGroup{name: pending, count: n, text: textAt})
				havePending = false
			}
			entry = none
			continue
		}
		switch k {
		case TokStart:
			name := string(t.Name)
			d := depth + 1
			if t.Empty {
				if inHP >= 0 && d == inHP+3 || inTP >= 0 && d == inTP+2 {
					return l, false // an entry without text
				}
				continue
			}
			depth = d
			switch {
			case name == "HeadingPairs" && inHP < 0 && inTP < 0:
				inHP = d
			case name == "TitlesOfParts" && inTP < 0 && inHP < 0:
				inTP = d
			case inTP >= 0 && d == inTP+1 && name == "vector":
				if l.hasTPV {
					return l, false
				}
				l.hasTPV, l.vector = true, [2]int{start, off}
				l.prefix = rawPrefix(t.Raw)
				if v, ok := RawAttr(t.Attrs, "size", false); ok {
					l.size, l.sized = string(v), true
				}
			case inTP >= 0 && d == inTP+2:
				if name != "lpstr" {
					return l, false
				}
				l.prefix = rawPrefix(t.Raw)
				entry, entryStart = title, start
			case inHP >= 0 && d == inHP+3 && name == "lpstr":
				entry = groupName
			case inHP >= 0 && d == inHP+3 && isIntVariant(name):
				entry = groupCount
			case inHP >= 0 && d == inHP+3:
				return l, false
			}
			if entry != none {
				text, texts = text[:0], 0
			}
		case TokEnd:
			if depth == 0 {
				return l, false
			}
			if inTP >= 0 && depth == inTP+1 && string(t.Name) == "vector" {
				l.vecEnd = start
			}
			if depth == inHP {
				inHP = -1
			}
			if depth == inTP {
				inTP = -1
			}
			depth--
		}
	}
	return l, t.Err() == nil && entry == none && !havePending && depth == 0 && (l.vecEnd > 0 || !l.hasTPV)
}

func isIntVariant(name string) bool {
	switch name {
	case "i1", "i2", "i4", "i8", "int", "ui1", "ui2", "ui4", "ui8", "uint":
		return true
	}
	return false
}

// rawPrefix is the prefix of a raw start tag's name, colon included ("vt:").
func rawPrefix(raw []byte) string {
	n := 1
	for n < len(raw) && !isSpace(raw[n]) && raw[n] != '>' && raw[n] != '/' {
		n++
	}
	if i := bytes.LastIndexByte(raw[1:n], ':'); i >= 0 {
		return string(raw[1 : i+2])
	}
	return ""
}
