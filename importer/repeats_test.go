package importer

import (
	"context"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/fluecell/fluecell/funcs"
)

// TestSameAgainAndParts checks the repeated-series findings on a table of
// series laid out as US state energy statistics print them (one series per
// row, a column per year; invented figures): a series "... excluding ..."
// is a part of the series without the words, even when it comes first, and
// a series given again in another unit is counted once. Only the whole
// series in its first unit, and the other fuel, are computed.
func TestSameAgainAndParts(t *testing.T) {
	csv := "Description,Unit,2019,2020\n" +
		"Distillate fuel oil consumed by the industrial sector excluding refinery fuel,Billion Btu,10,11\n" +
		"Distillate fuel oil consumed by the industrial sector,Billion Btu,100,110\n" +
		"Distillate fuel oil consumed by the industrial sector,Thousand barrels,17,19\n" +
		"Natural gas consumed by the industrial sector,Billion Btu,500,510\n"
	in := filepath.Join(t.TempDir(), "series.csv")
	must(t, os.WriteFile(in, []byte(csv), 0o644))
	e, err := funcs.New()
	must(t, err)
	rep, err := Annotate(context.Background(), e, in, filepath.Join(t.TempDir(), "out.csv"), Options{})
	must(t, err)
	want := map[string]string{
		"A2": "is a part of row 3, which is counted: not added twice",
		"A4": "again, in another unit: counted once, from row 3",
	}
	for _, w := range rep.Warnings {
		if s, ok := want[w.Cell]; ok && w.Code == CodeNotComputed && strings.Contains(w.Message, s) {
			delete(want, w.Cell)
		}
	}
	for cell, s := range want {
		t.Errorf("no finding at %s saying %q", cell, s)
	}
	if rep.Computed != 2 {
		t.Errorf("computed %d rows, want 2 (the whole distillate series and natural gas)", rep.Computed)
	}
}
