package bookio

import (
	"archive/zip"
	"bytes"
	"io"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// The extended properties follow ECMA-376 Part 1 (5th ed., 2021) §22.2
// (HeadingPairs §22.2.2.8, TitlesOfParts §22.2.2.25) with the variant
// types of §22.4 (vector with its size, variant, lpstr, i4); the lists
// below are shaped as Excel writes them (the real workbooks of
// testdata/realworld, such as farm_energy_use_miranowski.xlsx:
// "Worksheets" 1 and "Named Ranges" 2).

const appHead = `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>` + "\n" +
	`<Properties xmlns="http://schemas.openxmlformats.org/officeDocument/2006/extended-properties" xmlns:vt="http://schemas.openxmlformats.org/officeDocument/2006/docPropsVTypes"><Application>Microsoft Excel</Application>`

func pairs(kv ...string) string {
	s := `<HeadingPairs><vt:vector size="` + itoa(len(kv)) + `" baseType="variant">`
	for i := 0; i < len(kv); i += 2 {
		s += `<vt:variant><vt:lpstr>` + kv[i] + `</vt:lpstr></vt:variant><vt:variant><vt:i4>` + kv[i+1] + `</vt:i4></vt:variant>`
	}
	return s + `</vt:vector></HeadingPairs>`
}

func titles(size string, ts ...string) string {
	s := `<TitlesOfParts><vt:vector size="` + size + `" baseType="lpstr">`
	for _, t := range ts {
		s += `<vt:lpstr>` + t + `</vt:lpstr>`
	}
	return s + `</vt:vector></TitlesOfParts>`
}

func itoa(n int) string { return strconv.Itoa(n) }

func TestSheetTitles(t *testing.T) {
	added := []string{"Carbon by fuel", "Sources & notes"}
	addedXML := `<vt:lpstr>Carbon by fuel</vt:lpstr><vt:lpstr>Sources &amp; notes</vt:lpstr>`
	for _, c := range []struct {
		name, in string
		own      []string
		want     string // "" when the part is left as it is
	}{
		{"one group", appHead + pairs("Worksheets", "1") + titles("1", "stb0303") + `</Properties>`, []string{"stb0303"},
			appHead + pairs("Worksheets", "3") + `<TitlesOfParts><vt:vector size="3" baseType="lpstr"><vt:lpstr>stb0303</vt:lpstr>` + addedXML + `</vt:vector></TitlesOfParts></Properties>`},
		{"worksheets and named ranges", appHead + pairs("Worksheets", "1", "Named Ranges", "2") +
			titles("3", "Ag Cons by Use", "'Ag Cons by Use'!Print_Area", "'Ag Cons by Use'!Print_Titles") + `</Properties>`, []string{"Ag Cons by Use"},
			appHead + pairs("Worksheets", "3", "Named Ranges", "2") + `<TitlesOfParts><vt:vector size="5" baseType="lpstr"><vt:lpstr>Ag Cons by Use</vt:lpstr>` + addedXML +
				`<vt:lpstr>'Ag Cons by Use'!Print_Area</vt:lpstr><vt:lpstr>'Ag Cons by Use'!Print_Titles</vt:lpstr></vt:vector></TitlesOfParts></Properties>`},
		{"group named in another language", appHead + pairs("Arbeitsblätter", "2") + titles("2", "Tabelle1", "Depots &amp; yards") + `</Properties>`, []string{"Tabelle1", "Depots & yards"},
			appHead + pairs("Arbeitsblätter", "4") + `<TitlesOfParts><vt:vector size="4" baseType="lpstr"><vt:lpstr>Tabelle1</vt:lpstr><vt:lpstr>Depots &amp; yards</vt:lpstr>` + addedXML + `</vt:vector></TitlesOfParts></Properties>`},
		{"charts first", appHead + pairs("Charts", "1", "Worksheets", "1") + titles("2", "Chart1", "Log") + `</Properties>`, []string{"Log"},
			appHead + pairs("Charts", "1", "Worksheets", "3") + `<TitlesOfParts><vt:vector size="4" baseType="lpstr"><vt:lpstr>Chart1</vt:lpstr><vt:lpstr>Log</vt:lpstr>` + addedXML + `</vt:vector></TitlesOfParts></Properties>`},
		{"stale titles under Worksheets", appHead + pairs("Worksheets", "1") + titles("1", "Old name") + `</Properties>`, []string{"New name"},
			appHead + pairs("Worksheets", "3") + `<TitlesOfParts><vt:vector size="3" baseType="lpstr"><vt:lpstr>Old name</vt:lpstr>` + addedXML + `</vt:vector></TitlesOfParts></Properties>`},
		{"no lists", `<Properties xmlns="http://schemas.openxmlformats.org/officeDocument/2006/extended-properties"><Application>Apache POI</Application></Properties>`, []string{"Sheet1"}, ""},
		{"counts not adding up", appHead + pairs("Worksheets", "2") + titles("1", "Log") + `</Properties>`, []string{"Log"}, ""},
		{"size not the titles", appHead + pairs("Worksheets", "1") + titles("4", "Log") + `</Properties>`, []string{"Log"}, ""},
		{"no worksheets' group", appHead + pairs("Arbeitsblätter", "1") + titles("1", "Other") + `</Properties>`, []string{"Log"}, ""},
		{"count not a number", appHead + pairs("Worksheets", "one") + titles("1", "Log") + `</Properties>`, []string{"Log"}, ""},
		{"truncated", appHead + pairs("Worksheets", "1") + `<TitlesOfParts><vt:vector size="1" baseType="lpstr"><vt:lpstr>Log`, []string{"Log"}, ""},
		{"markup in a title", appHead + pairs("Worksheets", "1") + titles("1", "<b>Log</b>") + `</Properties>`, []string{"Log"}, ""},
	} {
		got, ok := withSheetTitles([]byte(c.in), c.own, added)
		if c.want == "" {
			if ok {
				t.Errorf("%s: edited, want left as it is:\n%s", c.name, got)
			}
			continue
		}
		if !ok || string(got) != c.want {
			t.Errorf("%s:\n got %s\nwant %s", c.name, got, c.want)
		}
	}
}

// TestSpliceAppProps adds two sheets to real workbooks: the extended
// properties list them when the workbook's lists have Excel's shape, and
// stay byte for byte when it has none; excelize and openpyxl open the
// result, and Python's own XML parser reads the lists.
func TestSpliceAppProps(t *testing.T) {
	src := excelize.NewFile()
	defer src.Close()
	if err := src.SetSheetName("Sheet1", "Carbon by fuel"); err != nil {
		t.Fatal(err)
	}
	if _, err := src.NewSheet("Sources & notes"); err != nil {
		t.Fatal(err)
	}
	for _, s := range []string{"Carbon by fuel", "Sources & notes"} {
		if err := src.SetCellValue(s, "A1", "written by the test"); err != nil {
			t.Fatal(err)
		}
	}
	sbuf, err := src.WriteToBuffer()
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		file       string
		wantTitles []string // nil: app.xml unchanged
		wantPairs  []string
	}{
		{"farm_energy_use_miranowski.xlsx", []string{"Ag Cons by Use", "Carbon by fuel", "Sources & notes", "'Ag Cons by Use'!Print_Area", "'Ag Cons by Use'!Print_Titles"},
			[]string{"Worksheets", "3", "Named Ranges", "2"}},
		{"eia_aer_t3_3_consumer_prices.xlsx", []string{"stb0303", "Carbon by fuel", "Sources & notes"}, []string{"Worksheets", "3"}},
		{"desnz_dukes_5_11_2025_power_stations_trimmed.xlsx", nil, nil},
	} {
		t.Run(c.file, func(t *testing.T) {
			in, err := os.ReadFile(filepath.Join("..", "..", "testdata", "realworld", c.file))
			if err != nil {
				t.Fatal(err)
			}
			b := openBytes(t, in)
			e := NewEdit(b)
			szr, err := zip.NewReader(bytes.NewReader(sbuf.Bytes()), int64(sbuf.Len()))
			if err != nil {
				t.Fatal(err)
			}
			if err := e.Splice(szr, nil); err != nil {
				t.Fatal(err)
			}
			var out bytes.Buffer
			if err := e.Write(&out); err != nil {
				t.Fatal(err)
			}
			before, after := partOf(t, in, "docProps/app.xml"), partOf(t, out.Bytes(), "docProps/app.xml")
			if c.wantTitles == nil && !bytes.Equal(before, after) {
				t.Fatalf("app.xml changed:\n%s\n%s", before, after)
			}
			path := filepath.Join(t.TempDir(), "spliced.xlsx")
			if err := os.WriteFile(path, out.Bytes(), 0o644); err != nil {
				t.Fatal(err)
			}
			f, err := excelize.OpenFile(path)
			if err != nil {
				t.Fatal(err)
			}
			defer f.Close()
			if _, err := f.GetAppProps(); err != nil {
				t.Errorf("excelize reads the extended properties: %v", err)
			}
			sheets := f.GetSheetList()
			if n := len(sheets); n < 3 || sheets[n-2] != "Carbon by fuel" || sheets[n-1] != "Sources & notes" {
				t.Errorf("excelize: sheets %v", sheets)
			}
			if c.wantTitles == nil {
				return
			}
			script := `import sys, zipfile, xml.etree.ElementTree as ET, openpyxl
wb = openpyxl.load_workbook(sys.argv[1])
print("|".join(wb.sheetnames[-2:]))
ns = {"p": "http://schemas.openxmlformats.org/officeDocument/2006/extended-properties", "vt": "http://schemas.openxmlformats.org/officeDocument/2006/docPropsVTypes"}
root = ET.fromstring(zipfile.ZipFile(sys.argv[1]).read("docProps/app.xml"))
vec = root.find("p:TitlesOfParts/vt:vector", ns)
titles = [e.text for e in vec.findall("vt:lpstr", ns)]
assert int(vec.get("size")) == len(titles)
print("|".join(titles))
pairs = [v[0].text for v in root.findall("p:HeadingPairs/vt:vector/vt:variant", ns)]
print("|".join(pairs))
`
			res := runOpenpyxl(t, script, path)
			want := "Carbon by fuel|Sources & notes\n" + strings.Join(c.wantTitles, "|") + "\n" + strings.Join(c.wantPairs, "|") + "\n"
			if res != want {
				t.Errorf("python3 reads\n%s\nwant\n%s", res, want)
			}
		})
	}
}

// partOf is the inflated content of a part of a package ("" when absent).
func partOf(t *testing.T, pkg []byte, name string) []byte {
	t.Helper()
	zr, err := zip.NewReader(bytes.NewReader(pkg), int64(len(pkg)))
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range zr.File {
		if f.Name == name {
			rc, err := f.Open()
			if err != nil {
				t.Fatal(err)
			}
			defer rc.Close()
			data, err := io.ReadAll(rc)
			if err != nil {
				t.Fatal(err)
			}
			return data
		}
	}
	return nil
}
