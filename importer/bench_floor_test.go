package importer

import (
	"archive/zip"
	"bufio"
	"bytes"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strconv"
	"testing"

	"github.com/xuri/excelize/v2"
)

// The physical floor of annotating a workbook in place: the least work any
// program must do to add one cell to every row of a large sheet. It opens
// the workbook, inflates the one sheet, appends a cell before every </row>
// while the XML streams past (a byte scan, no XML parse), deflates the
// result at archive/zip's level (5), and copies every other part as its raw
// compressed bytes. Annotate is measured against it (BenchmarkAnnotate100k
// beside BenchmarkPhysicalFloor100k; membench_test.go for time and peak
// memory of whole processes). Standard library only.

// floorSheet is the part the fuel-log generator (writeFuelLog) writes its
// one sheet to.
const floorSheet = "xl/worksheets/sheet1.xml"

// physicalFloor rewrites the workbook in into out, appending one numeric
// cell (the row's ordinal) to every row of the part sheet. It returns the
// number of rows seen; an error if in is not a zip, has no part sheet, or
// out cannot be written.
func physicalFloor(in, out, sheet string) (int, error) {
	zr, err := zip.OpenReader(in)
	if err != nil {
		return 0, err
	}
	defer zr.Close()
	f, err := os.Create(out)
	if err != nil {
		return 0, err
	}
	defer f.Close()
	bw := bufio.NewWriterSize(f, 256<<10)
	zw := zip.NewWriter(bw)
	rows, found := 0, false
	for _, zf := range zr.File {
		if zf.Name != sheet {
			// Copy takes the entry's raw compressed bytes (OpenRaw) and
			// writes them with the same header (CreateRaw): no inflate,
			// no deflate.
			if err := zw.Copy(zf); err != nil {
				return 0, err
			}
			continue
		}
		found = true
		src, err := zf.Open()
		if err != nil {
			return 0, err
		}
		dst, err := zw.CreateHeader(&zip.FileHeader{Name: zf.Name, Method: zip.Deflate, Modified: zf.Modified})
		if err != nil {
			src.Close()
			return 0, err
		}
		rows, err = appendCellPerRow(dst, src)
		src.Close()
		if err != nil {
			return 0, fmt.Errorf("%s: %w", zf.Name, err)
		}
	}
	if !found {
		return 0, fmt.Errorf("%s has no part %s", in, sheet)
	}
	if err := zw.Close(); err != nil {
		return 0, err
	}
	if err := bw.Flush(); err != nil {
		return 0, err
	}
	return rows, f.Close()
}

// appendCellPerRow copies the sheet XML from src to dst, inserting
// <c><v>N</v></c> (N = 1, 2, ... the row's ordinal) before every </row>. A
// cell without r= takes the column after the previous cell of its row, so
// the result is valid SpreadsheetML for rows that end with their last cell.
// It returns the number of rows.
func appendCellPerRow(dst io.Writer, src io.Reader) (int, error) {
	tag := []byte("</row>")
	bw := bufio.NewWriterSize(dst, 64<<10)
	buf := make([]byte, 64<<10)
	var cell []byte
	rows, keep := 0, 0
	for {
		n, rerr := src.Read(buf[keep:])
		data := buf[:keep+n]
		for {
			i := bytes.Index(data, tag)
			if i < 0 {
				break
			}
			rows++
			cell = append(cell[:0], "<c><v>"...)
			cell = strconv.AppendInt(cell, int64(rows), 10)
			cell = append(cell, "</v></c></row>"...)
			bw.Write(data[:i])
			bw.Write(cell)
			data = data[i+len(tag):]
		}
		if rerr == io.EOF {
			bw.Write(data)
			return rows, bw.Flush()
		}
		if rerr != nil {
			return rows, rerr
		}
		// Keep the tail that may be the start of a tag cut by the read.
		carry := min(len(data), len(tag)-1)
		bw.Write(data[:len(data)-carry])
		keep = copy(buf, data[len(data)-carry:])
	}
}

// fuelLogN returns an n-row benchmark fuel log (writeFuelLog), generated
// once into the temporary folder under a name that carries n and the
// generator's version; n = 100 000 gives fuelLog100k's file.
func fuelLogN(tb testing.TB, n int) string {
	tb.Helper()
	if n == 100_000 {
		return fuelLog100k(tb)
	}
	path := filepath.Join(os.TempDir(), "fluecell-bench-grebe-fuel-log-"+strconv.Itoa(n/1000)+"k-v1.xlsx")
	if _, err := os.Stat(path); err == nil {
		return path
	}
	tmp := path + ".tmp-" + strconv.Itoa(os.Getpid()) + ".xlsx"
	writeFuelLog(tb, tmp, n)
	if err := os.Rename(tmp, path); err != nil {
		tb.Fatal(err)
	}
	return path
}

// benchFloor runs physicalFloor on the n-row fuel log; the rows it counts
// are the title, the header and the n data rows.
func benchFloor(b *testing.B, n int) {
	in := fuelLogN(b, n)
	out := filepath.Join(b.TempDir(), "floor.xlsx")
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		rows, err := physicalFloor(in, out, floorSheet)
		if err != nil {
			b.Fatal(err)
		}
		if rows != n+2 {
			b.Fatalf("%d rows, want %d", rows, n+2)
		}
	}
}

func BenchmarkPhysicalFloor100k(b *testing.B) { benchFloor(b, 100_000) }

// BenchmarkPhysicalFloor1M needs FLUECELL_BENCH_1M=1: generating the
// 1 000 000-row workbook takes minutes the first time.
func BenchmarkPhysicalFloor1M(b *testing.B) {
	if os.Getenv("FLUECELL_BENCH_1M") == "" {
		b.Skip("set FLUECELL_BENCH_1M=1 to run on the 1 000 000-row workbook")
	}
	benchFloor(b, 1_000_000)
}

// TestPhysicalFloor checks the floor program on a small fuel log: every
// row gets its one cell, excelize reads the result, the original cells
// are unchanged and every other part is the input's bytes.
func TestPhysicalFloor(t *testing.T) {
	dir := t.TempDir()
	in := filepath.Join(dir, "log.xlsx")
	writeFuelLog(t, in, 50)
	out := filepath.Join(dir, "floor.xlsx")
	rows, err := physicalFloor(in, out, floorSheet)
	if err != nil {
		t.Fatal(err)
	}
	if rows != 52 {
		t.Fatalf("%d rows, want 52", rows)
	}
	a, err := excelize.OpenFile(in)
	must(t, err)
	defer a.Close()
	b, err := excelize.OpenFile(out)
	must(t, err)
	defer b.Close()
	ra, err := a.GetRows("Fuel log")
	must(t, err)
	rb, err := b.GetRows("Fuel log")
	must(t, err)
	if len(ra) != len(rb) {
		t.Fatalf("%d rows out, %d in", len(rb), len(ra))
	}
	ord := 0
	for r := range ra {
		if len(ra[r]) == 0 {
			continue // the blank row has no <row> element
		}
		ord++
		want := append(append([]string{}, ra[r]...), strconv.Itoa(ord))
		if fmt.Sprint(rb[r]) != fmt.Sprint(want) {
			t.Errorf("row %d: %q, want %q", r+1, rb[r], want)
		}
	}
	zr, err := zip.OpenReader(in)
	must(t, err)
	defer zr.Close()
	for _, zf := range zr.File {
		if zf.Name != floorSheet && !bytes.Equal(zipPart(t, in, zf.Name), zipPart(t, out, zf.Name)) {
			t.Errorf("part %s changed", zf.Name)
		}
	}
	if _, err := physicalFloor(in, out, "xl/worksheets/none.xml"); err == nil {
		t.Error("a missing sheet part is not an error")
	}
}
