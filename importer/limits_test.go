package importer

import (
	"archive/zip"
	"bytes"
	"context"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// sstBomb writes a fuel log whose shared strings part holds the log's seven
// strings and then short strings (each tenth one distinct) up to size bytes,
// deflated as the zip writer does; it returns the path and the packed size.
func sstBomb(t *testing.T, dir string, size int) (string, int64) {
	t.Helper()
	p := logParts(t)
	delete(p, partSST)
	path := filepath.Join(dir, "strings.xlsx")
	out, err := os.Create(path)
	must(t, err)
	defer out.Close()
	zw := zip.NewWriter(out)
	for _, name := range []string{partCT, "_rels/.rels", partWB, "xl/_rels/workbook.xml.rels", partStyles, partSheet} {
		w, err := zw.Create(name)
		must(t, err)
		_, err = w.Write(p[name])
		must(t, err)
	}
	w, err := zw.Create(partSST)
	must(t, err)
	var b bytes.Buffer
	b.WriteString(`<?xml version="1.0" encoding="UTF-8"?><sst xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main">`)
	b.WriteString(`<si><t>Fuel</t></si><si><t>Quantity</t></si><si><t>Unit</t></si><si><t>diesel</t></si><si><t>L</t></si><si><t>natural_gas</t></si><si><t>MWh</t></si>`)
	written := 0
	for i := 0; written < size; i++ {
		if i%10 == 0 {
			fmt.Fprintf(&b, "<si><t>site %d</t></si>", i)
		} else {
			b.WriteString("<si><t>site</t></si>")
		}
		if b.Len() > 64<<10 {
			written += b.Len()
			_, err = w.Write(b.Bytes())
			must(t, err)
			b.Reset()
		}
	}
	b.WriteString("</sst>")
	_, err = w.Write(b.Bytes())
	must(t, err)
	must(t, zw.Close())
	st, err := out.Stat()
	must(t, err)
	return path, st.Size()
}

// TestSharedStringsLimit: a shared strings part of 140 MB that packs into a
// zip of a few hundred kB (under the ratio and total limits) is refused by
// Scan and Annotate before anything decodes it, naming the part and the
// limit. Before the per-part limits, Scan read it and Annotate handed it to
// excelize, which decoded it whole (a 300 MB part exhausted the memory).
func TestSharedStringsLimit(t *testing.T) {
	dir := t.TempDir()
	path, packed := sstBomb(t, dir, 140<<20)
	t.Logf("zip of %s with a 140 MB shared strings part", byteSize(packed))
	if packed > 4<<20 {
		t.Fatalf("the zip is %s: the test wants a small file", byteSize(packed))
	}
	e := testEngine(t)
	_, err := Scan(context.Background(), e, path, Options{})
	checkRefusal(t, err, ErrTooLarge, "part xl/sharedStrings.xml (shared strings) unpacks to more than 128.0 MB")
	_, err = Annotate(context.Background(), e, path, filepath.Join(dir, "out.xlsx"), Options{})
	checkRefusal(t, err, ErrTooLarge, "xl/sharedStrings.xml")
}

// TestAnnotateMemoryBudget: shared strings under their part limit but so
// many that excelize would hold far more than the budget (the total limit,
// Options.MaxUnzippedBytes) are refused by Annotate before excelize opens
// the workbook, with the estimate in the message; Scan, which streams them,
// reads the workbook. Before the budget, Annotate went ahead.
func TestAnnotateMemoryBudget(t *testing.T) {
	dir := t.TempDir()
	path, _ := sstBomb(t, dir, 8<<20)
	e := testEngine(t)
	opt := Options{MaxUnzippedBytes: 16 << 20}
	if _, err := Scan(context.Background(), e, path, opt); err != nil {
		t.Fatalf("Scan: %v", err)
	}
	_, err := Annotate(context.Background(), e, path, filepath.Join(dir, "out.xlsx"), opt)
	checkRefusal(t, err, ErrTooLarge, "annotating the workbook would hold about")
	if !strings.Contains(err.Error(), "shared strings (") || !strings.Contains(err.Error(), "16.0 MB") {
		t.Errorf("the message does not name the shared strings and the limit: %v", err)
	}
	if _, err := Annotate(context.Background(), e, path, filepath.Join(dir, "out.xlsx"), Options{}); err != nil {
		t.Errorf("with the default budget: %v", err)
	}
}
