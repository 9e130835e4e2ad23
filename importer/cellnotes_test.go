package importer

import (
	"context"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// writeNotesBook writes a fuel log whose cells carry findings of each
// severity: C3 an alias (info), D4 a negative quantity (warning), C5 an
// unknown fuel (error, with the user's own comment), C6 an unknown fuel
// (error) in a cell with a number format and a bold red font of its own.
func writeNotesBook(t *testing.T, dir string) string {
	t.Helper()
	f := newBook(t, "Fuel log")
	setRows(t, f, "Fuel log", 1, [][]any{
		{"Site", "Branch", "Fuel", "Quantity", "Unit"},
		{"Kelvale depot", "North", "gas_diesel_oil", 1000, "L"},
		{"Kelvale depot", "North", "Diesel", 1200, "L"},
		{"Kelvale depot", "North", "gas_diesel_oil", -150, "L"},
		{"Kelvale depot", "North", "Disel", 900, "L"},
		{"Kelvale depot", "North", "Dieselx", 800, "L"},
		{"Kelvale depot", "North", "gas_diesel_oil", 1100, "L"},
	})
	fmt := "0.0"
	sid, err := f.NewStyle(&excelize.Style{CustomNumFmt: &fmt, Font: &excelize.Font{Bold: true, Color: "C00000"},
		Border: []excelize.Border{{Type: "left", Color: "000000", Style: 1}}})
	must(t, err)
	must(t, f.SetCellStyle("Fuel log", "C6", "C6", sid))
	must(t, f.SetCellStyle("Fuel log", "D4", "D4", sid))
	must(t, f.AddComment("Fuel log", excelize.Comment{Author: "Ines", Cell: "C5", Text: "checked with the depot"}))
	return save(t, f, filepath.Join(dir, "notes.xlsx"))
}

// noteFindingAt returns the report's warning with code at sheet!cell.
func noteFindingAt(t *testing.T, rep *Report, sheet, cell, code string) Warning {
	t.Helper()
	for _, w := range rep.Warnings {
		if w.Sheet == sheet && w.Cell == cell && w.Code == code {
			return w
		}
	}
	t.Fatalf("no %s finding at %s!%s; findings: %+v", code, sheet, cell, rep.Warnings)
	return Warning{}
}

// TestCellNotes annotates the fuel log and reads the copy back: each cell
// with a finding has fluecell's comment and the fill of its severity, its
// value, number format, font and border unchanged; the user's comment is
// kept as it was.
func TestCellNotes(t *testing.T) {
	dir := t.TempDir()
	in := writeNotesBook(t, dir)
	out := filepath.Join(dir, "notes.carbon.xlsx")
	rep, err := Annotate(context.Background(), testEngine(t), in, out, Options{})
	must(t, err)
	const sh = "Fuel log"
	alias := noteFindingAt(t, rep, sh, "C3", CodeFuelAlias)
	neg := noteFindingAt(t, rep, sh, "D4", CodeValueNegative)
	unk := noteFindingAt(t, rep, sh, "C6", CodeFuelUnknown)
	noteFindingAt(t, rep, sh, "C5", CodeFuelUnknown)
	if alias.Severity != SevInfo || neg.Severity != SevWarning || unk.Severity != SevError {
		t.Fatalf("severities %s %s %s, want info warning error", alias.Severity, neg.Severity, unk.Severity)
	}

	f, err := excelize.OpenFile(out)
	must(t, err)
	defer f.Close()
	cs, err := f.GetComments(sh)
	must(t, err)
	notes := map[string]excelize.Comment{}
	for _, c := range cs {
		notes[c.Cell] = c
	}
	for _, w := range []Warning{alias, neg, unk} {
		c, ok := notes[w.Cell]
		if !ok {
			t.Errorf("%s: no comment", w.Cell)
			continue
		}
		want := w.Severity + " " + w.Code + ": "
		if c.Author != noteAuthor || !strings.Contains(c.Text, want) {
			t.Errorf("%s: comment by %q %q, want fluecell's with %q", w.Cell, c.Author, c.Text, want)
		}
	}
	if c := notes["C5"]; c.Author != "Ines" || c.Text != "checked with the depot" {
		t.Errorf("C5: the user's comment became %q by %q", c.Text, c.Author)
	}
	if c := notes["C2"]; c.Cell != "" {
		t.Errorf("C2 has no finding but a comment %q", c.Text)
	}

	fillOf := func(cell string) (*excelize.Style, string) {
		id, err := f.GetCellStyle(sh, cell)
		must(t, err)
		st, err := f.GetStyle(id)
		must(t, err)
		if len(st.Fill.Color) == 0 {
			return st, ""
		}
		return st, strings.ToUpper(st.Fill.Color[0])
	}
	for cell, want := range map[string]string{"C3": fillInfo, "D4": fillWarning, "C5": fillError, "C6": fillError, "C2": "", "D3": ""} {
		if _, got := fillOf(cell); got != want {
			t.Errorf("%s: fill %q, want %q", cell, got, want)
		}
	}
	for _, cell := range []string{"C6", "D4"} {
		st, _ := fillOf(cell)
		if st.CustomNumFmt == nil || *st.CustomNumFmt != "0.0" {
			t.Errorf("%s: number format %v, want 0.0", cell, st.CustomNumFmt)
		}
		if st.Font == nil || !st.Font.Bold || strings.ToUpper(st.Font.Color) != "C00000" {
			t.Errorf("%s: font %+v, want bold C00000", cell, st.Font)
		}
		if len(st.Border) != 1 || st.Border[0].Type != "left" {
			t.Errorf("%s: border %+v, want the left border", cell, st.Border)
		}
	}
	for cell, want := range map[string]string{"C3": "Diesel", "D4": "-150.0", "C5": "Disel", "C6": "Dieselx"} {
		if v, err := f.GetCellValue(sh, cell); err != nil || v != want {
			t.Errorf("%s: value %q (%v), want %q", cell, v, err, want)
		}
	}

	// The computed cells of a row with no number say why; a computed row
	// has numbers.
	_, outRange, _ := strings.Cut(rep.Tables[0].Output, "!")
	rr, ok := parseRange(outRange)
	if !ok {
		t.Fatalf("output range %q", rep.Tables[0].Output)
	}
	for row, want := range map[int]string{5: "not computed: unknown fuel", 6: "not computed: unknown fuel"} {
		for c := rr.c1; c < rr.c2; c++ {
			if v, _ := f.GetCellValue(sh, cellRef(c, row)); v != want {
				t.Errorf("%s: %q, want %q", cellRef(c, row), v, want)
			}
		}
	}
	for c := rr.c1; c < rr.c2; c++ {
		if ty, _ := f.GetCellType(sh, cellRef(c, 2)); ty != excelize.CellTypeUnset && ty != excelize.CellTypeNumber {
			v, _ := f.GetCellValue(sh, cellRef(c, 2))
			t.Errorf("%s: %q is not a number", cellRef(c, 2), v)
		}
	}

	// openpyxl, another reader, sees the comments and fills too.
	py := requireOpenpyxl(t)
	script := `import sys, openpyxl
ws = openpyxl.load_workbook(sys.argv[1])["Fuel log"]
for ref in ("C3", "D4", "C5", "C6"):
    c = ws[ref]
    print(ref, c.fill.fgColor.rgb[-6:], c.comment.author if c.comment else "-", c.number_format, c.value)
`
	cmd := exec.Command(py, "-c", script, out)
	cmd.Env = noPythonEnv()
	got, err := cmd.CombinedOutput()
	if err != nil {
		t.Fatalf("openpyxl: %v: %s", err, got)
	}
	want := "C3 " + fillInfo + " fluecell General Diesel\n" +
		"D4 " + fillWarning + " fluecell 0.0 -150\n" +
		"C5 " + fillError + " Ines General Disel\n" +
		"C6 " + fillError + " fluecell 0.0 Dieselx\n"
	if string(got) != want {
		t.Errorf("openpyxl reads\n%s\nwant\n%s", got, want)
	}
}

// TestNoteText: several findings at one cell make one comment, most severe
// first, capped in lines and length.
func TestNoteText(t *testing.T) {
	long := strings.Repeat("x", 400)
	ws := []Warning{
		{Severity: SevInfo, Code: "a", Message: "first"},
		{Severity: SevError, Code: "b", Message: long},
		{Severity: SevWarning, Code: "c", Message: "third"},
		{Severity: SevInfo, Code: "d", Message: "fourth"},
		{Severity: SevInfo, Code: "e", Message: "fifth"},
	}
	got := strings.Split(noteText(ws), "\n")
	if len(got) != maxNoteLines+1 {
		t.Fatalf("%d lines, want %d: %q", len(got), maxNoteLines+1, got)
	}
	if !strings.HasPrefix(got[0], "error b: xxx") || len([]rune(got[0])) != maxNoteLine || !strings.HasSuffix(got[0], "…") {
		t.Errorf("line 1 %q: want the error first, cut to %d characters", got[0], maxNoteLine)
	}
	if got[1] != "warning c: third" || got[2] != "info a: first" {
		t.Errorf("lines 2 and 3 %q %q", got[1], got[2])
	}
	if got[3] != "2 more in "+SheetWarnings {
		t.Errorf("last line %q", got[3])
	}
}

// TestMarkSheetBounds: a sheet with more findings than maxCellNotes gets
// that many comments and marks every cell; the cells share a few styles;
// a finding inside a merged range marks the range's first cell, and one
// outside the tables' area is left to Carbon warnings.
func TestMarkSheetBounds(t *testing.T) {
	f := excelize.NewFile()
	defer f.Close()
	const sh = "Sheet1"
	n := maxCellNotes + 50
	var ws []Warning
	for r := 1; r <= n; r++ {
		sev := []string{SevError, SevWarning, SevInfo}[r%3]
		ws = append(ws, Warning{Sheet: sh, Cell: cellRef(1, r), Severity: sev, Code: "x", Message: "m"})
	}
	ws = append(ws, Warning{Sheet: sh, Cell: "D2", Severity: SevWarning, Code: "y", Message: "merged"},
		Warning{Sheet: sh, Cell: "Z9", Severity: SevError, Code: "z", Message: "outside"})
	numStyle, err := f.NewStyle(&excelize.Style{NumFmt: 4})
	must(t, err)
	cells := findingCells([]rangeRef{{3, 1, 4, 2}}, ws, 4, n)
	cache := map[fillKey]int{}
	fill := func(old int, sev string) int {
		k := fillKey{old, sev}
		if id, ok := cache[k]; ok {
			return id
		}
		cache[k] = filledStyle(f, old, sevFill(sev))
		return cache[k]
	}
	marks, notes := markSheet(cells, false)
	if len(notes) != maxCellNotes || len(marks) != n+1 {
		t.Errorf("%d notes, %d marks; want %d and %d", len(notes), len(marks), maxCellNotes, n+1)
	}
	restyle := restyler(fill)
	var last int
	for _, m := range marks {
		old := 0
		if m.Col == 1 {
			old = numStyle
		}
		last = restyle(old, m.Code)
	}
	if len(cache) > 4 {
		t.Errorf("%d derived styles for %d cells, want at most 4", len(cache), n)
	}
	st, err := f.GetStyle(last)
	must(t, err)
	if len(st.Fill.Color) == 0 || st.Fill.Color[0] != sevFill([]string{SevError, SevWarning, SevInfo}[n%3]) || st.NumFmt != 4 {
		t.Errorf("last cell (no comment) fill %v, number format %d", st.Fill.Color, st.NumFmt)
	}
	merged := false
	for _, m := range marks {
		if m.Col == 3 && m.Row == 1 && sevByRank(m.Code) == SevWarning {
			merged = true
		}
		if m.Col > 4 {
			t.Errorf("a finding outside the area was kept: %s", cellRef(m.Col, m.Row))
		}
	}
	if !merged {
		t.Error("the finding in the merged range C1:D2 is not at C1")
	}
	if _, notes := markSheet(cells, true); len(notes) != 0 {
		t.Errorf("a sheet with comments of its own got %d notes", len(notes))
	}
}

// TestFillReasons: a streamed row's computed cells get the reason only when
// there is one.
func TestFillReasons(t *testing.T) {
	vals := []any{nil, nil}
	fillReasons(vals, "")
	if vals[0] != nil || vals[1] != nil {
		t.Errorf("no reason: %v", vals)
	}
	fillReasons(vals, notComputedPrefix+"no unit")
	if vals[0] != "not computed: no unit" || vals[1] != "not computed: no unit" {
		t.Errorf("reason: %v", vals)
	}
}

// TestCellNotesSide: with side sheets the table's own sheet is not
// touched (no comment, no fill); the side sheet's computed cells of a row
// with no number say why.
func TestCellNotesSide(t *testing.T) {
	dir := t.TempDir()
	in := writeNotesBook(t, dir)
	out := filepath.Join(dir, "notes.carbon.xlsx")
	rep, err := Annotate(context.Background(), testEngine(t), in, out, Options{InlineMaxCells: -1})
	must(t, err)
	if rep.Tables[0].Layout != LayoutSideSheet {
		t.Fatalf("layout %s, want %s", rep.Tables[0].Layout, LayoutSideSheet)
	}
	f, err := excelize.OpenFile(out)
	must(t, err)
	defer f.Close()
	cs, err := f.GetComments("Fuel log")
	must(t, err)
	if len(cs) != 1 || cs[0].Author != "Ines" {
		t.Errorf("comments %+v, want the user's only", cs)
	}
	for _, cell := range []string{"C3", "D4", "C5", "C6"} {
		id, err := f.GetCellStyle("Fuel log", cell)
		must(t, err)
		st, err := f.GetStyle(id)
		must(t, err)
		if len(st.Fill.Color) > 0 && ownFill(st.Fill.Color[0]) {
			t.Errorf("%s: filled %v in a sheet left untouched", cell, st.Fill.Color)
		}
	}
	sheet, outRange, _ := strings.Cut(rep.Tables[0].Output, "!")
	rr, ok := parseRange(outRange)
	if !ok {
		t.Fatalf("output range %q", rep.Tables[0].Output)
	}
	// column A repeats the row number, then the computed columns, then source
	for c := rr.c1 + 1; c < rr.c2; c++ {
		if v, _ := f.GetCellValue(sheet, cellRef(c, 5)); v != "not computed: unknown fuel" {
			t.Errorf("%s!%s: %q, want the reason", sheet, cellRef(c, 5), v)
		}
		if v, _ := f.GetCellValue(sheet, cellRef(c, 2)); strings.HasPrefix(v, notComputedPrefix) || v == "" {
			t.Errorf("%s!%s: %q, want a number", sheet, cellRef(c, 2), v)
		}
	}
}
