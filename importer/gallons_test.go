package importer

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// A US gallon is 3.785411784 L (NIST SP 811), an imperial gallon 4.54609 L
// (UK Weights and Measures Act 1985).
const lPerImpGal = 4.54609

// TestBareGallonsFinding: a unit column saying "gallons" gets one info
// finding at its first such cell, whatever the number of rows.
func TestBareGallonsFinding(t *testing.T) {
	rep := scanWith(t, "oil.xlsx", "Deliveries", [][]any{
		{"Fuel", "Quantity", "Unit"},
		{"Heating oil", 500, "gallons"},
		{"Heating oil", 450, "gallons"},
		{"Propane", 300, "gallons"},
	}, Options{})
	w := wantFinding(t, rep, "Deliveries", "C2", SevInfo, CodeReadAs)
	if !strings.Contains(w.Message, "US gallons") || !strings.Contains(w.Message, `"gallons": "imperial"`) {
		t.Errorf("C2: %q", w.Message)
	}
	n := 0
	for _, w := range rep.Warnings {
		if w.Code == CodeReadAs {
			n++
		}
	}
	if n != 1 {
		t.Errorf("%d read-as findings, want 1: %s", n, listFindings(rep))
	}
}

// TestImperialGallonsMapping: the mapping's "gallons": "imperial" reads a
// header's bare gallons as imperial: the same diesel gives 4.54609/3.785411784
// times the CO2.
func TestImperialGallonsMapping(t *testing.T) {
	f := newBook(t, "Tanks")
	setRows(t, f, "Tanks", 1, [][]any{
		{"Month", "Diesel (gallons)"},
		{"Jan", 1000},
		{"Feb", 800},
	})
	dir := t.TempDir()
	path := save(t, f, filepath.Join(dir, "tanks.xlsx"))
	us := scanFile(t, path, Options{})
	wantFinding(t, us, "Tanks", "B1", SevInfo, CodeReadAs)
	mpath := filepath.Join(dir, "m.json")
	must(t, os.WriteFile(mpath, []byte(`{"fluecell_mapping": 1, "tables": [], "gallons": "imperial"}`), 0o644))
	m, err := LoadMapping(testEngine(t), mpath)
	if err != nil {
		t.Fatal(err)
	}
	imp := scanFile(t, path, Options{Mapping: m})
	if got, want := imp.Totals.TCO2, us.Totals.TCO2*lPerImpGal/lPerGal; !near(got, want) {
		t.Errorf("imperial %.9g t CO2, want %.9g (US %.9g)", got, want, us.Totals.TCO2)
	}
	if w := wantFinding(t, imp, "Tanks", "B1", SevInfo, CodeReadAs); !strings.Contains(w.Message, "imperial gallons") {
		t.Errorf("B1: %q", w.Message)
	}
}
