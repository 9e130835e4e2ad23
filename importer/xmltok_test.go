package importer

import (
	"bytes"
	"io"
	"reflect"
	"strings"
	"testing"
)

type tok struct {
	kind        tokKind
	name, attrs string
	empty       bool
	text        string
}

func tokens(t *testing.T, src string, size int) []tok {
	t.Helper()
	x := newXMLTokSize(strings.NewReader(src), size)
	var out []tok
	for k := x.next(); k != tokEOF; k = x.next() {
		tk := tok{kind: k}
		switch k {
		case tokStart:
			tk.name, tk.attrs, tk.empty = string(x.name), string(x.attrs), x.empty
		case tokEnd:
			tk.name = string(x.name)
		case tokText:
			tk.text = string(x.text)
		}
		out = append(out, tk)
	}
	if err := x.fail(); err != nil {
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

// TestSheetReaderBuffers reads a generated sheet through tiny buffers: the
// rows must equal those read through the normal buffer.
func TestSheetReaderBuffers(t *testing.T) {
	dir := t.TempDir()
	path := writeMessy(t, dir)
	xml := zipPart(t, path, "xl/worksheets/sheet1.xml")
	sst := sstOf(t, path)
	read := func(size int) []row {
		rd := &sheetReader{part: "sheet1.xml", t: newXMLTokSize(bytes.NewReader(xml), size), rc: io.NopCloser(nil), sst: sst}
		var out []row
		for {
			r, ok := rd.next()
			if !ok {
				break
			}
			out = append(out, copyRow(r))
		}
		if rd.err != nil {
			t.Fatalf("size %d: %v", size, rd.err)
		}
		return out
	}
	want := read(1 << 16)
	if len(want) != 19 {
		t.Fatalf("%d rows", len(want))
	}
	for _, size := range []int{16, 17, 23, 31, 64, 101} {
		if got := read(size); !reflect.DeepEqual(got, want) {
			t.Fatalf("buffer %d: rows differ", size)
		}
	}
	// Formula cells: D18 has no cached value, D20 neither.
	var d18 cell
	for _, r := range want {
		if r.num == 18 {
			d18 = r.at(4)
		}
	}
	if !d18.formula || !d18.noCache || d18.kind != kEmpty {
		t.Errorf("D18 = %+v, want a formula without a cached value", d18)
	}
}

func sstOf(t *testing.T, path string) []string {
	t.Helper()
	x := newXMLTok(bytes.NewReader(zipPart(t, path, "xl/sharedStrings.xml")))
	var out []string
	for k := x.next(); k != tokEOF; k = x.next() {
		if k == tokStart && x.is("si") {
			s, err := x.collectText("si", "t", "rPh")
			must(t, err)
			out = append(out, s)
		}
	}
	return out
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
		if got := unescape([]byte(in)); got != want {
			t.Errorf("unescape(%q) = %q, want %q", in, got, want)
		}
	}
	attrs := []byte(` r="A1"  s = '3' t="s" r:id="rId7" xmlns:r="urn:r" note="x>y"`)
	for _, c := range []struct {
		name     string
		prefixed bool
		want     string
		ok       bool
	}{{"r", false, "A1", true}, {"s", false, "3", true}, {"t", false, "s", true}, {"id", true, "rId7", true}, {"id", false, "", false}, {"note", false, "x>y", true}, {"x", false, "", false}} {
		v, ok := rawAttr(attrs, c.name, c.prefixed)
		if ok != c.ok || string(v) != c.want {
			t.Errorf("rawAttr(%s, %v) = %q %v, want %q %v", c.name, c.prefixed, v, ok, c.want, c.ok)
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
		x := newXMLTok(strings.NewReader(src))
		for x.next() != tokEOF {
		}
		if x.fail() == nil {
			t.Errorf("%q: no error", src)
		}
	}
}
