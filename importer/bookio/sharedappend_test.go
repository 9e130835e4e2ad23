package bookio

import (
	"bytes"
	"strings"
	"testing"
)

// TestAppendSST: the strings are appended before the end of <sst>, in
// the root's namespace prefix, escaped, with xml:space where a text
// begins or ends with a space; count grows by the references and
// uniqueCount becomes the number of strings, each only when present; the
// bytes before the end tag are the input's.
func TestAppendSST(t *testing.T) {
	texts := []string{"a<b & c", " lead"}
	const added = `<si><t>a&lt;b &amp; c</t></si><si><t xml:space="preserve"> lead</t></si>`
	for _, c := range []struct {
		name, in, want string
		n              int
	}{
		{"counts", `<?xml version="1.0"?>` + "\n" + `<sst xmlns="m" count="7" uniqueCount="2"><si><t>x</t></si><si><r><t>y</t></r></si></sst>`,
			`<?xml version="1.0"?>` + "\n" + `<sst xmlns="m" count="12" uniqueCount="4"><si><t>x</t></si><si><r><t>y</t></r></si>` + added + `</sst>`, 2},
		{"no counts", `<sst xmlns="m"><!-- kept --><si><t>x</t></si></sst>`,
			`<sst xmlns="m"><!-- kept --><si><t>x</t></si>` + added + `</sst>`, 1},
		{"prefixed", `<x:sst xmlns:x="m" uniqueCount="1"><x:si><x:t>x</x:t></x:si></x:sst>`,
			`<x:sst xmlns:x="m" uniqueCount="3"><x:si><x:t>x</x:t></x:si>` + strings.ReplaceAll(strings.ReplaceAll(added, "<", "<x:"), "<x:/", "</x:") + `</x:sst>`, 1},
		{"empty element", `<sst xmlns="m" count="0" uniqueCount="0"/>`,
			`<sst xmlns="m" count="5" uniqueCount="2">` + added + `</sst>`, 0},
	} {
		var out bytes.Buffer
		if err := appendSST(&out, strings.NewReader(c.in), texts, 5, c.n); err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		if out.String() != c.want {
			t.Errorf("%s:\n got %s\nwant %s", c.name, out.String(), c.want)
		}
	}
	var out bytes.Buffer
	if err := appendSST(&out, strings.NewReader(`<worksheet/>`), texts, 1, 0); err == nil {
		t.Error("a part whose root is not <sst> was taken")
	}
}
