package importer

import (
	"github.com/fluecell/fluecell/importer/tables"
	"path/filepath"
	"testing"
)

// A value a statistics table withholds ("Not Available", as in the US EIA
// Monthly Energy Review's CSV tables) leaves its row out with a note at the
// cell, not an error, and does not make the column text.
func TestWithheldValue(t *testing.T) {
	f := newBook(t, "Log")
	setRows(t, f, "Log", 1, [][]any{{"Fuel", "Quantity", "Unit"}, {"natural_gas", "Not Available", "GJ"}, {"natural_gas", 5, "GJ"}})
	rep := scanFile(t, save(t, f, filepath.Join(t.TempDir(), "withheld.xlsx")), Options{})
	if rep.Computed != 1 || rep.Rows != 2 {
		t.Fatalf("computed %d of %d rows, want 1 of 2", rep.Computed, rep.Rows)
	}
	var got []Warning
	for _, w := range rep.Warnings {
		if w.Cell == "B2" {
			got = append(got, w)
		}
	}
	if len(got) != 1 || got[0].Severity != SevInfo || got[0].Code != CodeNotComputed {
		t.Fatalf("findings at B2 = %+v, want one info not-computed", got)
	}
}

func TestMissingMarker(t *testing.T) {
	for _, s := range []string{"Not Available", "NA", "n/a", "--", "(D)", "W"} {
		if !tables.Missing(s) {
			t.Errorf("tables.Missing(%q) = false", s)
		}
	}
	for _, s := range []string{"Natural gas", "12", "pending"} {
		if tables.Missing(s) {
			t.Errorf("tables.Missing(%q) = true", s)
		}
	}
}
