package calctest

import (
	"bytes"
	"fmt"
	"net/http"
	"net/http/httptest"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"sync/atomic"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"
)

// writeBook writes a small workbook with excelize: Sheet1 A1 =2*21, A2 3.5, B2 "tonnes",
// B1/C1 WEBSERVICE formulas against url (when not empty), and a second sheet Data with
// A1 =SUM(1,2), B1 the text "=not a formula" and C3 7.
func writeBook(t *testing.T, dir, url string) string {
	t.Helper()
	f := excelize.NewFile()
	defer f.Close()
	must := func(err error) {
		t.Helper()
		if err != nil {
			t.Fatal(err)
		}
	}
	must(f.SetCellFormula("Sheet1", "A1", "2*21"))
	must(f.SetCellValue("Sheet1", "A2", 3.5))
	must(f.SetCellValue("Sheet1", "B2", "tonnes"))
	if url != "" {
		// In a file the function must carry the _xlfn. prefix, or Calc shows #NAME?.
		must(f.SetCellFormula("Sheet1", "B1", fmt.Sprintf(`_xlfn.WEBSERVICE("%s")`, url)))
		must(f.SetCellFormula("Sheet1", "C1", fmt.Sprintf(`VALUE(_xlfn.WEBSERVICE("%s"))*2`, url)))
	}
	_, err := f.NewSheet("Data")
	must(err)
	must(f.SetCellFormula("Data", "A1", "SUM(1,2)"))
	must(f.SetCellValue("Data", "B1", "=not a formula"))
	must(f.SetCellValue("Data", "C3", 7))
	path := filepath.Join(dir, "book.xlsx")
	must(f.SaveAs(path))
	return path
}

// valueServer answers every request with the current body and counts requests.
type valueServer struct {
	body atomic.Value // string
	hits atomic.Int64
}

func (s *valueServer) ServeHTTP(w http.ResponseWriter, r *http.Request) {
	s.hits.Add(1)
	w.Header().Set("Content-Type", "text/plain")
	fmt.Fprint(w, s.body.Load().(string))
}

func TestCalc(t *testing.T) {
	t.Parallel()
	vs := &valueServer{}
	vs.body.Store("12.5")
	srv := httptest.NewServer(vs)
	defer srv.Close()

	dir := t.TempDir()
	book := writeBook(t, dir, srv.URL+"/x")
	before, err := os.ReadFile(book)
	if err != nil {
		t.Fatal(err)
	}

	t0 := time.Now()
	c := Start(t, dir)
	t.Logf("soffice start-up (UNO connected): %v", time.Since(t0).Round(time.Millisecond))

	t.Run("formula and constants", func(t *testing.T) {
		t1 := time.Now()
		got, err := c.Cells(book, "A1", "Sheet1!A2", "B2", "Data!C3", "'Data'!C3", "$A$1")
		if err != nil {
			t.Fatal(err)
		}
		t.Logf("one Cells call (open, recalculate, read, close): %v", time.Since(t1).Round(time.Millisecond))
		want := map[string]string{"A1": "42", "Sheet1!A2": "3.5", "B2": "tonnes", "Data!C3": "7", "'Data'!C3": "7", "$A$1": "42"}
		for k, w := range want {
			if got[k] != w {
				t.Errorf("Cells %s = %q, want %q", k, got[k], w)
			}
		}
		if len(got) != len(want) {
			t.Errorf("Cells returned %d cells, want %d: %v", len(got), len(want), got)
		}
	})

	t.Run("webservice", func(t *testing.T) {
		got, err := c.Cells(book, "B1", "C1")
		if err != nil {
			t.Fatal(err)
		}
		if got["B1"] != "12.5" || got["C1"] != "25" {
			t.Errorf("WEBSERVICE cells = %v, want B1 12.5 and C1 25", got)
		}
		if vs.hits.Load() == 0 {
			t.Errorf("the test server saw no request; Calc did not fetch the link")
		}
		// A second open fetches again: the links are live, not cached in the profile.
		vs.body.Store("40")
		got, err = c.Cells(book, "B1", "C1")
		if err != nil {
			t.Fatal(err)
		}
		if got["B1"] != "40" || got["C1"] != "80" {
			t.Errorf("after the server changed: cells = %v, want B1 40 and C1 80", got)
		}
		t.Logf("server requests for 2 opens x 2 cells: %d", vs.hits.Load())
	})

	t.Run("dump", func(t *testing.T) {
		vs.body.Store("12.5")
		sheets, err := c.Dump(book)
		if err != nil {
			t.Fatal(err)
		}
		if len(sheets) != 2 || sheets[0].Name != "Sheet1" || sheets[1].Name != "Data" {
			t.Fatalf("sheets = %+v, want Sheet1 and Data", sheets)
		}
		s1 := sheets[0].Rows
		if len(s1) != 2 || len(s1[0]) != 3 {
			t.Fatalf("Sheet1 used area %dx%d, want 2 rows x 3 columns: %+v", len(s1), len(s1[0]), s1)
		}
		checks := []struct {
			name string
			got  Cell
			want Cell
		}{
			{"A1", s1[0][0], Cell{Text: "42", Formula: "=2*21", Value: 42, IsNumber: true}},
			{"B1", s1[0][1], Cell{Text: "12.5", Formula: fmt.Sprintf(`=WEBSERVICE("%s/x")`, srv.URL)}},
			{"C1", s1[0][2], Cell{Text: "25", Formula: fmt.Sprintf(`=VALUE(WEBSERVICE("%s/x"))*2`, srv.URL), Value: 25, IsNumber: true}},
			{"A2", s1[1][0], Cell{Text: "3.5", Value: 3.5, IsNumber: true}},
			{"B2", s1[1][1], Cell{Text: "tonnes"}},
			{"C2", s1[1][2], Cell{}},
		}
		for _, ch := range checks {
			if ch.got != ch.want {
				t.Errorf("Sheet1!%s = %+v, want %+v", ch.name, ch.got, ch.want)
			}
		}
		data := sheets[1].Rows
		if len(data) != 3 || len(data[2]) != 3 || data[2][2] != (Cell{Text: "7", Value: 7, IsNumber: true}) ||
			data[0][0] != (Cell{Text: "3", Formula: "=SUM(1;2)", Value: 3, IsNumber: true}) ||
			data[0][1] != (Cell{Text: "=not a formula"}) {
			t.Errorf("Data = %+v, want 3x3 with A1 =SUM(1;2) (Calc's separator), B1 text, C3 = 7", data)
		}
	})

	t.Run("errors", func(t *testing.T) {
		garbage := filepath.Join(dir, "garbage.xlsx")
		if err := os.WriteFile(garbage, []byte("not\x00a\x01workbook"), 0o600); err != nil {
			t.Fatal(err)
		}
		cases := []struct {
			name  string
			path  string
			cells []string
			want  string
		}{
			{"missing file", filepath.Join(dir, "nope.xlsx"), []string{"A1"}, "nope.xlsx: no such file"},
			{"unknown sheet", book, []string{"Nope!A1"}, `no sheet 'Nope'`},
			{"not a cell", book, []string{"A0"}, `'A0' is not a single cell address (want like B2 or Sheet1!B2)`},
			{"range", book, []string{"A1:B2"}, `'A1:B2' is not a single cell address`},
			{"beyond the sheet", book, []string{"ZZZ1"}, `ZZZ1 is outside the sheet`},
			{"empty sheet name", book, []string{"!A1"}, `empty sheet name`},
			{"directory", dir, []string{"A1"}, "no such file"},
			{"not a workbook", garbage, []string{"A1"}, "garbage.xlsx: Calc could not open it"},
		}
		for _, tc := range cases {
			_, err := c.Cells(tc.path, tc.cells...)
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Errorf("%s: err = %v, want it to contain %q", tc.name, err, tc.want)
			}
		}
		// Request errors leave the instance usable.
		if got, err := c.Cells(book, "A1"); err != nil || got["A1"] != "42" {
			t.Errorf("after errors: Cells = %v, %v; want A1 42", got, err)
		}
	})

	t.Run("input untouched", func(t *testing.T) {
		after, err := os.ReadFile(book)
		if err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(before, after) {
			t.Errorf("the workbook changed on disk after being read by Calc")
		}
		entries, err := os.ReadDir(dir)
		if err != nil {
			t.Fatal(err)
		}
		for _, e := range entries {
			if e.Name() != "book.xlsx" && e.Name() != "garbage.xlsx" {
				t.Errorf("Calc left %s in the workbook folder", e.Name())
			}
		}
	})
}

func TestOpenpyxl(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	book := writeBook(t, dir, "http://127.0.0.1:1/x")
	sheets := Openpyxl(t, book)
	if len(sheets) != 2 || sheets[0].Name != "Sheet1" || sheets[1].Name != "Data" {
		t.Fatalf("sheets = %+v, want Sheet1 and Data", sheets)
	}
	s1 := sheets[0].Rows
	if len(s1) != 2 || len(s1[0]) != 3 {
		t.Fatalf("Sheet1 %d rows, want 2 x 3: %+v", len(s1), s1)
	}
	// excelize stores no cached results, so formula cells carry only their formula.
	checks := []struct {
		name string
		got  Cell
		want Cell
	}{
		{"A1", s1[0][0], Cell{Formula: "=2*21"}},
		{"B1", s1[0][1], Cell{Formula: `=_xlfn.WEBSERVICE("http://127.0.0.1:1/x")`}},
		{"C1", s1[0][2], Cell{Formula: `=VALUE(_xlfn.WEBSERVICE("http://127.0.0.1:1/x"))*2`}},
		{"A2", s1[1][0], Cell{Text: "3.5", Value: 3.5, IsNumber: true}},
		{"B2", s1[1][1], Cell{Text: "tonnes"}},
		{"C2", s1[1][2], Cell{}},
	}
	for _, ch := range checks {
		if ch.got != ch.want {
			t.Errorf("Sheet1!%s = %+v, want %+v", ch.name, ch.got, ch.want)
		}
	}
	if d := sheets[1].Rows; len(d) != 3 || d[2][2] != (Cell{Text: "7", Value: 7, IsNumber: true}) ||
		d[0][0] != (Cell{Formula: "=SUM(1,2)"}) || d[0][1] != (Cell{Text: "=not a formula"}) {
		t.Errorf("Data = %+v, want A1 =SUM(1,2), B1 text and C3 = 7", d)
	}
}

// TestTwoInstances runs two Calcs at once, as two test binaries running in parallel do.
func TestTwoInstances(t *testing.T) {
	t.Parallel()
	var mu sync.Mutex
	seen := map[string]bool{}
	t.Run("group", func(t *testing.T) {
		for i := range 2 {
			t.Run(fmt.Sprint(i), func(t *testing.T) {
				t.Parallel()
				dir := t.TempDir()
				f := excelize.NewFile()
				defer f.Close()
				if err := f.SetCellFormula("Sheet1", "A1", fmt.Sprintf("%d*10", i+1)); err != nil {
					t.Fatal(err)
				}
				path := filepath.Join(dir, "n.xlsx")
				if err := f.SaveAs(path); err != nil {
					t.Fatal(err)
				}
				c := Start(t, dir)
				mu.Lock()
				for _, k := range []string{fmt.Sprint("port ", c.port), "profile " + c.profile} {
					if seen[k] {
						t.Errorf("both instances use %s", k)
					}
					seen[k] = true
				}
				mu.Unlock()
				for range 3 {
					got, err := c.Cells(path, "A1")
					if err != nil {
						t.Fatal(err)
					}
					if want := fmt.Sprint((i + 1) * 10); got["A1"] != want {
						t.Fatalf("instance %d: A1 = %q, want %q", i, got["A1"], want)
					}
				}
			})
		}
	})
}

// BenchmarkCells measures one open-recalculate-read-close round trip.
func BenchmarkCells(b *testing.B) {
	dir := b.TempDir()
	f := excelize.NewFile()
	if err := f.SetCellFormula("Sheet1", "A1", "2*21"); err != nil {
		b.Fatal(err)
	}
	book := filepath.Join(dir, "b.xlsx")
	if err := f.SaveAs(book); err != nil {
		b.Fatal(err)
	}
	f.Close()
	c := Start(b, dir)
	for b.Loop() {
		if _, err := c.Cells(book, "A1"); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkDump measures Dump of a 500 x 10 sheet, half formulas.
func BenchmarkDump(b *testing.B) {
	dir := b.TempDir()
	f := excelize.NewFile()
	for r := 1; r <= 500; r++ {
		for col := 1; col <= 10; col++ {
			cell, err := excelize.CoordinatesToCellName(col, r)
			if err == nil && col%2 == 0 {
				err = f.SetCellFormula("Sheet1", cell, "ROW()*2/3")
			} else if err == nil {
				err = f.SetCellValue("Sheet1", cell, r*col)
			}
			if err != nil {
				b.Fatal(err)
			}
		}
	}
	book := filepath.Join(dir, "big.xlsx")
	if err := f.SaveAs(book); err != nil {
		b.Fatal(err)
	}
	f.Close()
	c := Start(b, dir)
	for b.Loop() {
		sheets, err := c.Dump(book)
		if err != nil {
			b.Fatal(err)
		}
		if got := sheets[0].Rows[499][1].Text; got != "333.333333333333" {
			b.Fatalf("B500 = %q, want 333.333333333333", got)
		}
	}
}
