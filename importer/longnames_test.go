package importer

import (
	"bytes"
	"context"
	"fmt"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

// TestLongFuelNames: 200 distinct fuel cells of 32 kB each among 400 diesel
// rows are no fuel names: each gets a short finding saying why, without a
// spelling suggestion over the whole text; the diesel rows are computed.
// Before the bound, each text was looked up and compared letter by letter
// with every fuel name (1.2 s here for 200 texts, 106 CPU-seconds for 2,000
// through the server) and the finding quoted no reason.
func TestLongFuelNames(t *testing.T) {
	dir := t.TempDir()
	f := newBook(t, "Log")
	rows := [][]any{{"Fuel", "Quantity", "Unit"}}
	for i := 0; i < 600; i++ {
		name := "diesel"
		if i%3 == 2 {
			name = fmt.Sprintf("%d %s", i, strings.Repeat("natural gas ", 32<<10/12))
		}
		rows = append(rows, []any{name, 10, "L"})
	}
	setRows(t, f, "Log", 1, rows)
	in := save(t, f, filepath.Join(dir, "names.xlsx"))
	t0 := time.Now()
	rep, err := Annotate(context.Background(), testEngine(t), in, filepath.Join(dir, "names.carbon.xlsx"), Options{})
	took := time.Since(t0)
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("annotated 200 rows of 32 kB names in %v", took)
	if rep.Computed != 400 {
		t.Errorf("computed %d rows, want the 400 diesel rows", rep.Computed)
	}
	long := 0
	for _, w := range rep.Warnings {
		if w.Code != CodeFuelUnknown {
			continue
		}
		if len(w.Message) > 400 {
			t.Fatalf("a finding of %d bytes: %.200s...", len(w.Message), w.Message)
		}
		if strings.Contains(w.Message, "is not a fuel name: a name is at most 200 characters") {
			long++
		}
	}
	if long == 0 {
		t.Errorf("no finding says a text over 200 characters is not a fuel name: %+v", rep.Warnings)
	}
}

// TestManyMergedRanges: a fuel log of 3,000 rows on a sheet with 40,000
// merged ranges is annotated in seconds, its computed columns beside the
// table (the sheet is rewritten as a stream, whatever its merged ranges;
// with excelize, which looks through every merged range on each cell it
// writes, it took 27.7 s on this machine, not cancellable, and then went
// to a side sheet), clear of the merged ranges, which stay as they were.
func TestManyMergedRanges(t *testing.T) {
	dir := t.TempDir()
	f := newBook(t, "Log")
	rows := [][]any{{"Fuel", "Quantity", "Unit"}}
	for i := 0; i < 3000; i++ {
		rows = append(rows, []any{"diesel", 10, "L"})
	}
	setRows(t, f, "Log", 1, rows)
	p := partsOf(t, save(t, f, filepath.Join(dir, "seed.xlsx")))
	var m strings.Builder
	m.WriteString(`</sheetData><mergeCells count="40000">`)
	for i := 0; i < 40000; i++ {
		r := 1 + i/100*2
		fmt.Fprintf(&m, `<mergeCell ref="%s:%s"/>`, cellRef(10+(i%100)*2, r), cellRef(11+(i%100)*2, r))
	}
	m.WriteString(`</mergeCells>`)
	in := p.replace(t, partSheet, `</sheetData>`, m.String()).write(t, dir, "merges.xlsx")
	t0 := time.Now()
	rep, err := Annotate(context.Background(), testEngine(t), in, filepath.Join(dir, "merges.carbon.xlsx"), Options{})
	took := time.Since(t0)
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("annotated 3,000 rows with 40,000 merged ranges in %v", took)
	if took > 10*time.Second {
		t.Errorf("took %v, want seconds", took)
	}
	if rep.Computed != 3000 || rep.Tables[0].Layout != LayoutInline || !strings.HasPrefix(rep.Tables[0].Output, "Log!D1:") {
		t.Errorf("computed %d, layout %s, output %s: want 3000 rows beside the table from column D", rep.Computed, rep.Tables[0].Layout, rep.Tables[0].Output)
	}
	for _, w := range rep.Warnings {
		if w.Code == CodeColumnsMoved {
			t.Errorf("columns moved: %s", w.Message)
		}
	}
	out := partsOf(t, filepath.Join(dir, "merges.carbon.xlsx"))
	if !bytes.Contains(out[partSheet], []byte(m.String()[len("</sheetData>"):])) {
		t.Error("the merged ranges are not in the output as they were")
	}
}
