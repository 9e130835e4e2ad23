package demo

import (
	"path/filepath"
	"testing"

	"github.com/xuri/excelize/v2"
)

func TestWrite(t *testing.T) {
	dir := t.TempDir()
	paths, err := Write(filepath.Join(dir, "sub"))
	if err != nil {
		t.Fatal(err)
	}
	if len(paths) != 3 {
		t.Fatalf("%d files", len(paths))
	}
	f, err := excelize.OpenFile(paths[0])
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	if v, _ := f.GetCellValue("Fuel log", "C4"); v != "Fuel" {
		t.Errorf("header C4 = %q", v)
	}
	if v, _ := f.GetCellValue("Fuel log", "D7"); v != "1,250.5" {
		t.Errorf("text number D7 = %q", v)
	}
	if v, _ := f.GetCellFormula("Fuel log", "D20"); v != "D8*0.5" {
		t.Errorf("formula D20 = %q", v)
	}
	// Write again: files are replaced, not appended to.
	if _, err := Write(filepath.Join(dir, "sub")); err != nil {
		t.Fatal(err)
	}
	matches, _ := filepath.Glob(filepath.Join(dir, "sub", "*"))
	if len(matches) != 3 {
		t.Errorf("files after a second write: %v", matches)
	}
}
