package bookio

import (
	"bytes"
	"io"
	"reflect"
	"strings"
	"testing"
)

type tok struct {
	kind        TokKind
	name, attrs string
	empty       bool
	text        string
}

func tokens(t *testing.T, src string, size int) []tok {
	t.Helper()
	x := NewTokSize(strings.NewReader(src), size)
	var out []tok
	for k := x.Next(); k != TokEOF; k = x.Next() {
		tk := tok{kind: k}
		switch k {
		case TokStart:
			tk.name, tk.attrs, tk.empty = string(x.Name), string(x.Attrs), x.Empty
		case TokEnd:
			tk.name = string(x.Name)
		case TokText:
			tk.text = string(x.Text)
		}
		out = append(out, tk)
	}
	if err := x.Err(); err != nil {
		t.Fatalf("size %d: %v", size, err)
	}
	return out
}

// TestTokenizerBuffers reads the same XML through buffers of every small
// size (so that each token crosses a buffer boundary somewhere) and checks
// that the tokens do not change.
func TestTokenizerBuffers(t *testing.T) {
	src := `<?xml version="1.0"?><!-- a comment with <tags> --><x:worksheet xmlns:x="urn:x">` +
		`<x:row r="1" spans="1:3"><x:c r="A1" t="s"><x:v>0</x:v></x:c>` +
		`<x:c r="B1" t='inlineStr' note="a>b"><x:is><x:t xml:space="preserve"> gas &amp; oil </x:t></x:is></x:c>` +
		`<x:c r="C1"><x:f>SUM(A1:B1)&gt;0</x:f><x:v><![CDATA[1<2]]></x:v></x:c></x:row><x:row r="2"/></x:worksheet>`
	want := tokens(t, src, 1<<16)
	if len(want) < 20 {
		t.Fatalf("only %d tokens", len(want))
	}
	for size := 16; size < 80; size++ {
		if got := tokens(t, src, size); !reflect.DeepEqual(got, want) {
			t.Fatalf("buffer %d: tokens differ\n got %+v\nwant %+v", size, got, want)
		}
	}
}

// TestSheetReaderBuffers reads the same sheet through tiny buffers: the
// rows must equal those read through the normal buffer.
func TestSheetReaderBuffers(t *testing.T) {
	xml := []byte(`<?xml version="1.0"?><worksheet xmlns="urn:x"><dimension ref="A1:D3"/><sheetData>` +
		`<row r="1"><c r="A1" t="s"><v>0</v></c><c r="B1" t="inlineStr" s="4"><is><t>gas &amp; oil</t></is></c><c r="D1"><f>1+1</f></c></row>` +
		`<row><c t="b"><v>1</v></c><c/><c t="e"><v>#N/A</v></c><c t="str"><f>A1</f><v></v></c></row>` +
		`<row r="5" spans="1:2"><c r="B5"><v> 2.5 </v></c><c r="C5" t="s"><v>1</v></c></row><row r="6"/></sheetData>` +
		`<mergeCells count="1"><mergeCell ref="A1:B1"/></mergeCells></worksheet>`)
	sst := []string{"Diesel", "m3"}
	read := func(size int) []Row {
		rd := &SheetReader{part: "sheet1.xml", t: NewTokSize(bytes.NewReader(xml), size), rc: io.NopCloser(nil), sst: sst}
		var out []Row
		for {
			r, ok := rd.Next()
			if !ok {
				break
			}
			out = append(out, Row{Num: r.Num, Cells: append([]Cell(nil), r.Cells...)})
		}
		if rd.Err() != nil {
			t.Fatalf("size %d: %v", size, rd.Err())
		}
		return out
	}
	want := []Row{
		{1, []Cell{{Col: 1, Kind: Text, Text: "Diesel"}, {Col: 2, Kind: Text, Text: "gas & oil", Style: 4}, {Col: 4, Formula: true, NoCache: true}}},
		{2, []Cell{{Col: 1, Kind: Bool, Text: "TRUE"}, {Col: 3, Kind: Error, Text: "#N/A"}, {Col: 4, Kind: Text, Formula: true}}},
		{5, []Cell{{Col: 2, Kind: Number, Num: 2.5}, {Col: 3, Kind: Text, Text: "m3"}}},
	}
	if got := read(1 << 16); !reflect.DeepEqual(got, want) {
		t.Fatalf("rows\n got %+v\nwant %+v", got, want)
	}
	for _, size := range []int{16, 17, 23, 31, 64, 101} {
		if got := read(size); !reflect.DeepEqual(got, want) {
			t.Fatalf("buffer %d: rows differ: %+v", size, got)
		}
	}
}

func TestUnescapeAndAttrs(t *testing.T) {
	for in, want := range map[string]string{
		"plain":                 "plain",
		"a &amp; b &lt;c&gt;":   "a & b <c>",
		"&quot;&apos;":          `"'`,
		"&#65;&#x42;&#X43;":     "ABC",
		"&bogus; & &#xZZ;":      "&bogus; & &#xZZ;",
		"no end &amp":           "no end &amp",
		"bad \xff byte":         "bad \uFFFD byte",
		"&#1114112; too large":  "&#1114112; too large",
		"nested &amp;amp; once": "nested &amp; once",
	} {
		if got := Unescape([]byte(in)); got != want {
			t.Errorf("Unescape(%q) = %q, want %q", in, got, want)
		}
	}
	attrs := []byte(` r="A1"  s = '3' t="s" r:id="rId7" xmlns:r="urn:r" note="x>y"`)
	for _, c := range []struct {
		name     string
		prefixed bool
		want     string
		ok       bool
	}{{"r", false, "A1", true}, {"s", false, "3", true}, {"t", false, "s", true}, {"id", true, "rId7", true}, {"id", false, "", false}, {"note", false, "x>y", true}, {"x", false, "", false}} {
		v, ok := RawAttr(attrs, c.name, c.prefixed)
		if ok != c.ok || string(v) != c.want {
			t.Errorf("RawAttr(%s, %v) = %q %v, want %q %v", c.name, c.prefixed, v, ok, c.want, c.ok)
		}
	}
}

func TestTokenizerRefusals(t *testing.T) {
	for _, src := range []string{
		`<!DOCTYPE x [<!ENTITY a "b">]><x>&a;</x>`,
		`<x><y attr="unterminated></x>`,
		`<x><!-- never closed `,
		`<x><![CDATA[ never closed`,
		`<>`,
	} {
		x := NewTok(strings.NewReader(src))
		for x.Next() != TokEOF {
		}
		if x.Err() == nil {
			t.Errorf("%q: no error", src)
		}
	}
}
