package importer

import (
	"archive/zip"
	stdflate "compress/flate"
	"io"
	"strconv"
	"testing"

	kpflate "github.com/klauspost/compress/flate"
)

// BenchmarkDeflateSheet compresses the sheet XML of the 100 000-row fuel
// log (52 MB) with the standard library's compress/flate and with
// github.com/klauspost/compress/flate at level 1, the package's default,
// and 5 (the level archive/zip uses), reporting the time (ns/op, MB/s of
// input) and the compressed size (out-bytes, out-%). Its figures are
// there to choose the deflater of the workbook writer:
//
//	go test ./importer -run XXX -bench DeflateSheet -benchtime 3x
func BenchmarkDeflateSheet(b *testing.B) {
	xml := sheetXML(b, fuelLog100k(b), floorSheet)
	type newWriter func(w io.Writer, level int) (io.WriteCloser, error)
	impls := []struct {
		name  string
		new   newWriter
		deflt int
	}{
		{"stdlib", func(w io.Writer, l int) (io.WriteCloser, error) { return stdflate.NewWriter(w, l) }, stdflate.DefaultCompression},
		{"klauspost", func(w io.Writer, l int) (io.WriteCloser, error) { return kpflate.NewWriter(w, l) }, kpflate.DefaultCompression},
	}
	for _, im := range impls {
		for _, lv := range []struct {
			name  string
			level int
		}{{"1", 1}, {"2", 2}, {"3", 3}, {"4", 4}, {"default", im.deflt}, {"5", 5}} {
			b.Run(im.name+"/level-"+lv.name, func(b *testing.B) {
				b.SetBytes(int64(len(xml)))
				var n countWriter
				for i := 0; i < b.N; i++ {
					n = 0
					w, err := im.new(&n, lv.level)
					if err != nil {
						b.Fatal(err)
					}
					if _, err := w.Write(xml); err != nil {
						b.Fatal(err)
					}
					if err := w.Close(); err != nil {
						b.Fatal(err)
					}
				}
				b.ReportMetric(float64(n), "out-bytes")
				b.ReportMetric(100*float64(n)/float64(len(xml)), "out-%")
			})
		}
	}
}

// countWriter counts the bytes written to it and keeps none.
type countWriter int64

func (c *countWriter) Write(p []byte) (int, error) {
	*c += countWriter(len(p))
	return len(p), nil
}

// sheetXML returns the uncompressed bytes of the part name of the
// workbook at path.
func sheetXML(tb testing.TB, path, name string) []byte {
	tb.Helper()
	zr, err := zip.OpenReader(path)
	if err != nil {
		tb.Fatal(err)
	}
	defer zr.Close()
	for _, f := range zr.File {
		if f.Name != name {
			continue
		}
		rc, err := f.Open()
		if err != nil {
			tb.Fatal(err)
		}
		defer rc.Close()
		b, err := io.ReadAll(rc)
		if err != nil {
			tb.Fatal(err)
		}
		return b
	}
	tb.Fatal(path + " has no part " + name + " (" + strconv.Itoa(len(zr.File)) + " parts)")
	return nil
}
