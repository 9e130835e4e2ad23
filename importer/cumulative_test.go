package importer

import (
	"strings"
	"testing"
)

// TestMeterReadingsNotSummed: a log of monthly gas meter readings (the
// register's running count; invented values near 50,000 m3) is not summed:
// 303,380 m3 of "readings" would stand for 4,400 m3 burned. The header says
// why and every row is left out with the reason. A column of monthly
// amounts headed "Reading" whose values rise and fall is computed as
// before (no register runs backwards).
func TestMeterReadingsNotSummed(t *testing.T) {
	readings := [][]any{
		{"Date", "Meter", "Gas meter reading (m3)"},
		{"2025-01-01", "G1", 48210}, {"2025-02-01", "G1", 49630}, {"2025-03-01", "G1", 50890},
		{"2025-04-01", "G1", 51740}, {"2025-05-01", "G1", 52300}, {"2025-06-01", "G1", 52610},
	}
	rep := scanWith(t, "readings.xlsx", "Gas", readings, Options{})
	if rep.Computed != 0 || rep.Rows != 6 {
		t.Fatalf("computed %d of %d rows, want 0 of 6; findings: %s", rep.Computed, rep.Rows, listFindings(rep))
	}
	why, rows := false, 0
	for _, w := range rep.Warnings {
		if w.Cell == "C1" && strings.Contains(w.Message, "holds meter readings") && strings.Contains(w.Message, "6 readings that never fall") {
			why = true
		}
		if w.Code == CodeNotComputed && strings.Contains(w.Message, "a meter reading, not an amount used") {
			rows++
		}
	}
	if !why || rows != 6 {
		t.Errorf("header reason %v, %d row reasons (want 6); findings: %s", why, rows, listFindings(rep))
	}

	monthly := [][]any{
		{"Month", "Gas reading (m3)"},
		{"Jan", 1420}, {"Feb", 1260}, {"Mar", 850}, {"Apr", 560}, {"May", 310},
	}
	if rep := scanWith(t, "monthly.xlsx", "Gas", monthly, Options{}); rep.Computed != 5 {
		t.Errorf("monthly amounts headed Reading: computed %d of %d rows, want 5; findings: %s", rep.Computed, rep.Rows, listFindings(rep))
	}
}
