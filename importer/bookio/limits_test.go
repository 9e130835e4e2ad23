package bookio

import (
	"bytes"
	"io"
	"strings"
	"testing"
)

// TestLimitedPart: the inflated bytes of a part are counted as they come,
// whatever the zip directory says: one byte past the limit fails, naming
// the part, its kind and the limit.
func TestLimitedPart(t *testing.T) {
	lr := &LimitedPart{R: bytes.NewReader(make([]byte, 5000)), Name: "xl/styles.xml", Limit: 4096}
	_, err := io.Copy(io.Discard, lr)
	if err == nil || !strings.Contains(err.Error(), "part xl/styles.xml (styles) unpacks to more than 4.0 kB") {
		t.Fatalf("err = %v, want the styles part over 4.0 kB", err)
	}
	lr = &LimitedPart{R: bytes.NewReader(make([]byte, 4096)), Name: "xl/styles.xml", Limit: 4096}
	if _, err := io.Copy(io.Discard, lr); err != nil {
		t.Fatalf("at the limit: %v", err)
	}
	for name, want := range map[string]PartKind{"xl/sharedStrings.xml": KindSharedStrings, "xl/SharedStrings2.xml": KindSharedStrings,
		"xl/styles.xml": KindStyles, "xl/worksheets/sheet9.xml": KindWorksheet, "xl/worksheets/_rels/sheet1.xml.rels": KindOther,
		"xl/drawings/drawing1.xml": KindDrawing, "xl/charts/chart1.xml": KindDrawing, "xl/media/image1.png": KindOther} {
		if got := KindOf(name); got != want {
			t.Errorf("KindOf(%s) = %s, want %s", name, got, want)
		}
	}
}
