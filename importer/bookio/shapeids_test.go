package bookio

import (
	"archive/zip"
	"bytes"
	"io"
	"os"
	"path/filepath"
	"reflect"
	"regexp"
	"sort"
	"strconv"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// The checks below follow the VML of ECMA-376 Part 4 (Transitional
// Migration Features) as Excel writes it, from memory: a drawing's
// <o:idmap data="..."> lists the blocks of 1024 shape ids it uses, shape
// ids are written _x0000_sN with N in those blocks, and no two drawings of
// a workbook share a block.

// commentedBook is a workbook written by excelize whose first sheet has
// two comments (a VML drawing of its own) and whose second has none.
func commentedBook(t *testing.T) []byte {
	t.Helper()
	f := excelize.NewFile()
	defer f.Close()
	if _, err := f.NewSheet("Depots"); err != nil {
		t.Fatal(err)
	}
	for _, c := range []excelize.Comment{
		{Cell: "A1", Author: "Ines Varga", Text: "Readings from the meter at the gate."},
		{Cell: "B3", Author: "Ines Varga", Text: "Estimated: the meter was replaced."},
	} {
		if err := f.AddComment("Sheet1", c); err != nil {
			t.Fatal(err)
		}
	}
	for _, s := range []string{"Sheet1", "Depots"} {
		if err := f.SetSheetRow(s, "A1", &[]any{"Fuel", "Quantity"}); err != nil {
			t.Fatal(err)
		}
	}
	buf, err := f.WriteToBuffer()
	if err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

var (
	reShapeID = regexp.MustCompile(`id="_x0000_s(\d+)"`)
	reIdmap   = regexp.MustCompile(`idmap[^>]*data="([^"]*)"`)
)

// vmlShapes reads every VML part of a package: its idmap blocks and its
// shape ids.
func vmlShapes(t *testing.T, pkg []byte) (blocks map[string][]int, ids map[string][]int) {
	t.Helper()
	zr, err := zip.NewReader(bytes.NewReader(pkg), int64(len(pkg)))
	if err != nil {
		t.Fatal(err)
	}
	blocks, ids = map[string][]int{}, map[string][]int{}
	for _, f := range zr.File {
		if !strings.HasSuffix(f.Name, ".vml") {
			continue
		}
		rc, err := f.Open()
		if err != nil {
			t.Fatal(err)
		}
		data, err := io.ReadAll(rc)
		rc.Close()
		if err != nil {
			t.Fatal(err)
		}
		for _, m := range reIdmap.FindAllSubmatch(data, -1) {
			for _, s := range strings.Split(string(m[1]), ",") {
				n, err := strconv.Atoi(s)
				if err != nil {
					t.Fatalf("%s: idmap data %q", f.Name, m[1])
				}
				blocks[f.Name] = append(blocks[f.Name], n)
			}
		}
		for _, m := range reShapeID.FindAllSubmatch(data, -1) {
			n, _ := strconv.Atoi(string(m[1]))
			ids[f.Name] = append(ids[f.Name], n)
		}
	}
	return blocks, ids
}

// checkShapeIDs: no block in two drawings, every shape id in a block of
// its own drawing, no id twice.
func checkShapeIDs(t *testing.T, pkg []byte) (blocks map[string][]int, ids map[string][]int) {
	t.Helper()
	blocks, ids = vmlShapes(t, pkg)
	owner := map[int]string{}
	for part, bs := range blocks {
		for _, b := range bs {
			if o, dup := owner[b]; dup {
				t.Errorf("block %d is in %s and %s", b, o, part)
			}
			owner[b] = part
		}
	}
	seen := map[int]bool{}
	for part, is := range ids {
		for _, id := range is {
			if seen[id] {
				t.Errorf("shape id %d twice", id)
			}
			seen[id] = true
			if owner[id/1024] != part {
				t.Errorf("%s: shape id %d is in block %d, which its idmap %v does not list", part, id, id/1024, blocks[part])
			}
		}
	}
	return blocks, ids
}

// TestShapeBlocksBesideComments adds comments to both sheets of a workbook
// that already has comments, asking each time for the block its drawing
// uses: the new shapes go to other blocks, the sheet's own drawing lists
// them, and excelize and openpyxl read the old and the new comments.
func TestShapeBlocksBesideComments(t *testing.T) {
	src := commentedBook(t)
	before, beforeIDs := checkShapeIDs(t, src)
	if len(before) != 1 || len(beforeIDs) != 1 {
		t.Fatalf("the input has drawings %v, shapes %v: want one drawing with shapes", before, beforeIDs)
	}
	var taken int
	for _, bs := range before {
		taken = bs[0]
	}
	b := openBytes(t, src)
	e := NewEdit(b)
	s1, _ := b.Sheet("Sheet1")
	s2, _ := b.Sheet("Depots")
	id, err := e.AddComments(s1.Part, "fluecell", []Note{{Col: 1, Row: 1, Text: "left out: A1 has a comment"}, {Col: 2, Row: 1, Text: "Quantity: litres"}}, taken)
	if err != nil || id != "" {
		t.Fatalf("Sheet1: %q %v", id, err)
	}
	var many []Note
	for r := 2; r <= 1100; r++ { // more than one block of shapes
		many = append(many, Note{Col: 2, Row: r, Text: "row " + strconv.Itoa(r)})
	}
	id, err = e.AddComments(s2.Part, "fluecell", many, taken)
	if err != nil || id == "" {
		t.Fatalf("Depots: %q %v", id, err)
	}
	e.Rewrite(s2.Part, func(w io.Writer, r io.Reader) error { return RewriteSheet(w, r, &SheetEdit{LegacyDrawing: id}) })
	var out bytes.Buffer
	if err := e.Write(&out); err != nil {
		t.Fatal(err)
	}
	after, ids := checkShapeIDs(t, out.Bytes())
	if len(after) != 2 {
		t.Fatalf("drawings %v, want two", after)
	}
	for part, bs := range after {
		if len(ids[part]) == 2+1 { // Sheet1's: its own two and one new
			if bs[0] != taken || len(bs) != 2 || bs[1] == taken {
				t.Errorf("%s: blocks %v, want %d and a new one", part, bs, taken)
			}
		} else if len(ids[part]) != len(many) || len(bs) != 2 || bs[1] != bs[0]+1 {
			t.Errorf("%s: %d shapes in blocks %v, want %d in two consecutive blocks", part, len(ids[part]), bs, len(many))
		}
	}

	path := filepath.Join(t.TempDir(), "commented.xlsx")
	if err := os.WriteFile(path, out.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	f, err := excelize.OpenFile(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	got := map[string][]string{}
	for _, s := range []string{"Sheet1", "Depots"} {
		cs, err := f.GetComments(s)
		if err != nil {
			t.Fatal(err)
		}
		for _, c := range cs {
			got[s] = append(got[s], c.Cell)
		}
		sort.Strings(got[s])
	}
	if want := []string{"A1", "B1", "B3"}; !reflect.DeepEqual(got["Sheet1"], want) {
		t.Errorf("excelize: Sheet1 comments at %v, want %v", got["Sheet1"], want)
	}
	if len(got["Depots"]) != len(many) {
		t.Errorf("excelize: %d comments on Depots, want %d", len(got["Depots"]), len(many))
	}

	script := `import sys, openpyxl
wb = openpyxl.load_workbook(sys.argv[1])
for ws in wb.worksheets:
    cells = sorted(c.coordinate for row in ws.iter_rows() for c in row if c.comment)
    print(ws.title, len(cells), cells[:3])
print(wb["Sheet1"]["B1"].comment.text)
`
	res := runOpenpyxl(t, script, path)
	want := "Sheet1 3 ['A1', 'B1', 'B3']\nDepots 1099 ['B10', 'B100', 'B1000']\nQuantity: litres\n"
	if res != want {
		t.Errorf("openpyxl reads\n%s\nwant\n%s", res, want)
	}
}

// TestShapeBlocksReserved: the blocks handed out skip those in use and
// those handed out before, and a run of several is consecutive.
func TestShapeBlocksReserved(t *testing.T) {
	e := &Edit{usedBlocks: map[int]bool{1: true, 1000: true, 1002: true}}
	for _, c := range []struct {
		want, n int
		got     []int
	}{
		{1, 1, []int{2}},
		{1000, 1, []int{1001}},
		{1000, 2, []int{1003, 1004}},
		{1000, 1, []int{1005}},
		{0, 1, []int{3}},
	} {
		got, err := e.shapeBlocks(c.want, c.n)
		if err != nil || !reflect.DeepEqual(got, c.got) {
			t.Errorf("shapeBlocks(%d, %d) = %v %v, want %v", c.want, c.n, got, err, c.got)
		}
	}
	vml := []byte(`<xml><o:shapelayout v:ext="edit"><o:idmap v:ext="edit" data="1,3"/></o:shapelayout><v:shape id="_x0000_s5121" o:spid="_x0000_s7169"/></xml>`)
	if got := idmapBlocks(vml); !reflect.DeepEqual(got, []int{1, 3}) {
		t.Errorf("idmapBlocks = %v", got)
	}
	if got := string(withBlocks(vml, []int{8, 9})); !strings.Contains(got, `data="1,3,8,9"`) {
		t.Errorf("withBlocks: %s", got)
	}
	if got := string(withBlocks([]byte(`<o:idmap v:ext="edit" data=""/>`), []int{8})); got != `<o:idmap v:ext="edit" data="8"/>` {
		t.Errorf("withBlocks on an empty list: %s", got)
	}
}

// TestShapeBlocksRealWorkbook adds comments to every worksheet of a real
// workbook with thirteen VML drawings (ECoS_GHG_Inventory_CY2019.xlsx of
// the development set, when FLUECELL_DEVSET names its folder), each time
// asking for block 1, which the workbook uses: no block is shared, no
// shape id is given twice, and excelize reads every comment.
func TestShapeBlocksRealWorkbook(t *testing.T) {
	dir := os.Getenv("FLUECELL_DEVSET")
	if dir == "" {
		t.Skip("FLUECELL_DEVSET is not set")
	}
	src, err := os.ReadFile(filepath.Join(dir, "ECoS_GHG_Inventory_CY2019.xlsx"))
	if err != nil {
		t.Fatal(err)
	}
	before, _ := checkShapeIDs(t, src)
	if len(before) < 10 {
		t.Fatalf("%d drawings in the input", len(before))
	}
	b := openBytes(t, src)
	e := NewEdit(b)
	note := []Note{{Col: 30, Row: 2, Text: "added by the test"}}
	for _, s := range b.Sheets {
		if s.Kind != "worksheet" {
			continue
		}
		id, err := e.AddComments(s.Part, "fluecell", note, 1)
		if err != nil {
			t.Fatalf("%s: %v", s.Name, err)
		}
		if id != "" {
			e.Rewrite(s.Part, func(w io.Writer, r io.Reader) error { return RewriteSheet(w, r, &SheetEdit{LegacyDrawing: id}) })
		}
	}
	var out bytes.Buffer
	if err := e.Write(&out); err != nil {
		t.Fatal(err)
	}
	after, _ := checkShapeIDs(t, out.Bytes())
	path := filepath.Join(t.TempDir(), "ecos.xlsx")
	if err := os.WriteFile(path, out.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	f, err := excelize.OpenFile(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	for _, s := range b.Sheets {
		if s.Kind != "worksheet" {
			continue
		}
		cs, err := f.GetComments(s.Name)
		if err != nil {
			t.Fatal(err)
		}
		found := false
		for _, c := range cs {
			found = found || c.Cell == "AD2"
		}
		if !found {
			t.Errorf("%s: no comment at AD2 among %d", s.Name, len(cs))
		}
	}
	t.Logf("%d drawings before, %d after", len(before), len(after))
	res := runOpenpyxl(t, `import sys, openpyxl
wb = openpyxl.load_workbook(sys.argv[1])
print(sum(1 for ws in wb.worksheets if ws["AD2"].comment is not None and ws["AD2"].comment.text == "added by the test"), len(wb.worksheets))
`, path)
	if n := strings.Fields(res); len(n) != 2 || n[0] != n[1] {
		t.Errorf("openpyxl: the added comment on %s sheets", res)
	}
}
